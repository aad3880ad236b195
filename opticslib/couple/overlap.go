package couple

import (
	"math"
	"math/cmplx"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// OneDecibel is the fraction of the power left after a loss of 1 dB,
// 10^(−1/10) = 0.794328…, the usual level for alignment tolerances
// (common practice, no single source).
const OneDecibel = 0.79432823472428150207

// Misalignment is the lateral offset and the tilt of the second beam's
// axis relative to the first one's at the common plane: DX and DY in
// metres, TiltX (the axis turning towards +x in the x–z plane) and TiltY
// in radians, measured in the medium of the beams. The tilt pivots at the
// plane. The zero value is perfect alignment. The efficiency is even in
// the misalignment taken as a whole, so it does not matter which beam is
// called the first.
type Misalignment struct {
	DX, DY       units.Length
	TiltX, TiltY units.Angle
}

func (m Misalignment) validate() error {
	for _, v := range []struct {
		name string
		v    any
		f    float64
	}{{"offset DX", m.DX, float64(m.DX)}, {"offset DY", m.DY, float64(m.DY)},
		{"tilt TiltX", m.TiltX, float64(m.TiltX)}, {"tilt TiltY", m.TiltY, float64(m.TiltY)}} {
		if math.IsNaN(v.f) || math.IsInf(v.f, 0) {
			return &ParamError{Subject: "misalignment", Param: v.name, Value: v.v, Reason: "must be finite"}
		}
	}
	if a := math.Max(math.Abs(float64(m.TiltX)), math.Abs(float64(m.TiltY))); a > float64(beam.MaxDivergence) {
		return &ParamError{Subject: "misalignment", Param: "tilt", Value: units.Angle(a), Reason: "must be at most 0.5 rad (the paraxial range)"}
	}
	return nil
}

// Axis is the coupling in one transverse direction (x tangential or y
// sagittal).
type Axis struct {
	// Efficiency is this direction's factor ηx (or ηy) of the power
	// coupling, with the misalignment.
	Efficiency float64
	// Aligned is the factor without offset and tilt: the mismatch of
	// size, waist position and curvature alone.
	Aligned float64
	// Offset, Tilt and Cross are the coefficients of the exponent of the
	// misalignment factor,
	//
	//	η/η_aligned = exp(−Offset·d² − Tilt·θ² − Cross·d·θ)
	//
	// in 1/m², 1/rad² and 1/(m·rad): exact, since the overlap of
	// Gaussians is Gaussian in d and θ. For equal waists w at a common
	// waist plane Offset = 1/w² and Tilt = (kw/2)² (R40 of the project's
	// reference checks), and Cross = 0.
	Offset, Tilt, Cross float64
	// M2 is the M² of the partially coherent beam of the pair in this
	// direction, 1 when both are TEM₀₀.
	M2 float64
}

// Coupling is the power coupling efficiency of two beams at a plane.
type Coupling struct {
	// Efficiency is η = ηx·ηy in [0, 1].
	Efficiency float64
	// Aligned is η without the misalignment.
	Aligned float64
	// X and Y are the factors per direction.
	X, Y Axis
	// Misalignment is the misalignment the efficiency was computed for.
	Misalignment Misalignment
	// Bound is the most any alignment and mode size could give under the
	// model: 1 for two TEM₀₀ beams, Π 2/(M² + 1) under the Gaussian
	// Schell model (see the package documentation).
	Bound float64
	// Model names the model: "TEM00 overlap (exact)" or the Gaussian
	// Schell-model estimate with the M² values.
	Model string
}

// LossDB returns the coupling loss −10·log10 η in dB (+Inf for η = 0).
func (c Coupling) LossDB() float64 { return -10 * math.Log10(c.Efficiency) }

// OffsetTolerance returns the lateral offsets in x and in y, each alone
// (the other errors as given removed), that reduce the aligned
// efficiency to the given fraction of it, in metres:
//
//	d = √(ln(1/fraction)/Offset)
//
// from the exact Gaussian form of [Axis]. Use [OneDecibel] for the 1 dB
// tolerance; for equal waists w it is w·√(ln 10^0.1) = 0.480 w. It returns
// a *ParamError unless 0 < fraction < 1.
func (c Coupling) OffsetTolerance(fraction float64) (x, y units.Length, err error) {
	l, err := logDrop(fraction)
	if err != nil {
		return 0, 0, err
	}
	return units.Length(math.Sqrt(l / c.X.Offset)), units.Length(math.Sqrt(l / c.Y.Offset)), nil
}

// TiltTolerance returns the tilts in x and in y, each alone, that reduce
// the aligned efficiency to the given fraction of it, in radians:
//
//	θ = √(ln(1/fraction)/Tilt)
//
// For equal waists w at a common waist plane the 1 dB tolerance is
// 0.480·2/(kw) = 0.480 θ0, θ0 = λ/(πw) the far-field half-angle. It returns
// a *ParamError unless 0 < fraction < 1.
func (c Coupling) TiltTolerance(fraction float64) (x, y units.Angle, err error) {
	l, err := logDrop(fraction)
	if err != nil {
		return 0, 0, err
	}
	return units.Angle(math.Sqrt(l / c.X.Tilt)), units.Angle(math.Sqrt(l / c.Y.Tilt)), nil
}

func logDrop(fraction float64) (float64, error) {
	if !(fraction > 0 && fraction < 1) {
		return 0, &ParamError{Param: "remaining fraction", Value: fraction, Reason: "must lie strictly between 0 and 1"}
	}
	return -math.Log(fraction), nil
}

// axisBeam is one transverse direction of a beam at the plane: the field
// (or, for M² > 1, the coherent factor of the cross-spectral density)
// exp(−a x²) and the coherence term exp(−g (x1 − x2)²).
type axisBeam struct {
	a  complex128 // 1/W² + ik/(2R), 1/m²
	g  float64    // (M⁴ − 1)/(2W²), 1/m²; 0 for TEM₀₀
	m2 float64
}

// axisOf returns the direction g of a beam, with k = 2πn/λ0:
// Re a = 1/W² = (k/2)·Im(−1/q)/M² (W the real radius, q the embedded
// beam's parameter) and Im a = (k/2)·Re(1/q) = k/(2R).
func axisOf(g beam.Gaussian, k float64) axisBeam {
	inv := 1 / g.Q
	m2 := g.BeamQuality()
	re := -k / 2 * imag(inv) / m2
	return axisBeam{a: complex(re, k/2*real(inv)), g: (m2*m2 - 1) * re / 2, m2: m2}
}

// axisCoupling returns the coupling of src (possibly partially coherent)
// into the TEM₀₀ mode dst in one direction, with src offset by d and
// tilted by θ:
//
//	η = ∫∫ t*(x1) W(x1, x2) t(x2) dx1 dx2 / (∫W(x, x) dx · ∫|t|² dx)
//
// with W(x1, x2) = u(x1)u*(x2)exp(−g(x1 − x2)²), u(x) = exp(−a(x − d)² −
// ikθx), t(x) = exp(−b x²). The exponent is −xᵀMx + Jᵀx + c0 with
//
//	M = [[a + b* + g, −g], [−g, a* + b + g]],  J = d(2a, 2a*) + θ(−ik, ik),
//	c0 = −2 Re(a) d²
//
// and ∫exp(−xᵀMx + Jᵀx)d²x = π/√det M · exp(JᵀM⁻¹J/4); the result is real
// and positive (W is Hermitian and positive), so its modulus is taken.
// For g = 0 it is the coherent overlap |∫t*u|²/(∫|u|²∫|t|²).
func axisCoupling(src, dst axisBeam, k float64, d units.Length, th units.Angle) Axis {
	a, b, g := src.a, dst.a, complex(src.g, 0)
	m11 := a + cmplx.Conj(b) + g
	m22 := cmplx.Conj(a) + b + g
	det := m11*m22 - g*g
	// M⁻¹ = [[m22, g], [g, m11]]/det; f(u, v) = uᵀM⁻¹v.
	f := func(u1, u2, v1, v2 complex128) complex128 {
		return (u1*m22*v1 + u1*g*v2 + u2*g*v1 + u2*m11*v2) / det
	}
	jd1, jd2 := 2*a, 2*cmplx.Conj(a)
	jt1, jt2 := complex(0, -k), complex(0, k)
	ax := Axis{
		Aligned: 2 * math.Sqrt(real(a)*real(b)) / math.Sqrt(cmplx.Abs(det)),
		Offset:  2*real(a) - real(f(jd1, jd2, jd1, jd2))/4,
		Tilt:    -real(f(jt1, jt2, jt1, jt2)) / 4,
		Cross:   -real(f(jd1, jd2, jt1, jt2)) / 2,
		M2:      src.m2,
	}
	// η ≤ 1 by the Cauchy–Schwarz inequality; matched beams reach
	// 1 + a few ulp in the arithmetic above, which is rounding.
	ax.Aligned = math.Min(ax.Aligned, 1)
	dd, tt := float64(d), float64(th)
	ax.Efficiency = math.Min(ax.Aligned*math.Exp(-(ax.Offset*dd*dd+ax.Tilt*tt*tt+ax.Cross*dd*tt)), 1)
	return ax
}

// pair is a validated pair of beams, both as astigmatic beams.
type pair struct {
	a, b beam.Astigmatic
	k    float64
}

func asAstigmatic(in beam.Input, name string) (beam.Astigmatic, error) {
	var ast beam.Astigmatic
	switch v := in.(type) {
	case beam.Gaussian:
		ast = beam.Astigmatic{X: v, Y: v}
	case beam.Astigmatic:
		ast = v
	default:
		return ast, &ParamError{Subject: name, Reason: "is nil"}
	}
	if err := ast.Validate(); err != nil {
		return ast, &ParamError{Subject: name, Err: err}
	}
	return ast, nil
}

func newPair(a, b beam.Input) (pair, error) {
	pa, err := asAstigmatic(a, "beam a")
	if err != nil {
		return pair{}, err
	}
	pb, err := asAstigmatic(b, "beam b")
	if err != nil {
		return pair{}, err
	}
	la, lb := float64(pa.X.Wavelength), float64(pb.X.Wavelength)
	if math.Abs(la-lb) > 1e-12*la {
		return pair{}, &ParamError{Subject: "beam b", Param: "vacuum wavelength λ0", Value: pb.X.Wavelength,
			Reason: "differs from beam a's " + pa.X.Wavelength.String(), Err: ErrMismatch}
	}
	if math.Abs(pa.X.Index-pb.X.Index) > 1e-12*pa.X.Index {
		return pair{}, &ParamError{Subject: "beam b", Param: "index n", Value: pb.X.Index,
			Reason: "differs from beam a's " + strconv.FormatFloat(pa.X.Index, 'g', -1, 64), Err: ErrMismatch}
	}
	return pair{a: pa, b: pb, k: 2 * math.Pi * pa.X.Index / la}, nil
}

func (p pair) couple(m Misalignment) (Coupling, error) {
	if err := m.validate(); err != nil {
		return Coupling{}, err
	}
	one := func(ga, gb beam.Gaussian, d units.Length, th units.Angle, plane string) (Axis, error) {
		src, dst := axisOf(ga, p.k), axisOf(gb, p.k)
		if src.m2 > 1 && dst.m2 > 1 {
			return Axis{}, &ParamError{Subject: plane, Param: "M² of beam b", Value: dst.m2,
				Reason: "beam a has M² = " + strconv.FormatFloat(src.m2, 'g', -1, 64), Err: ErrTwoPartial}
		}
		if dst.m2 > 1 {
			src, dst = dst, src
		}
		return axisCoupling(src, dst, p.k, d, th), nil
	}
	x, err := one(p.a.X, p.b.X, m.DX, m.TiltX, "x (tangential)")
	if err != nil {
		return Coupling{}, err
	}
	y, err := one(p.a.Y, p.b.Y, m.DY, m.TiltY, "y (sagittal)")
	if err != nil {
		return Coupling{}, err
	}
	c := Coupling{
		Efficiency:   x.Efficiency * y.Efficiency,
		Aligned:      x.Aligned * y.Aligned,
		X:            x,
		Y:            y,
		Misalignment: m,
		Bound:        2 / (x.M2 + 1) * 2 / (y.M2 + 1),
		Model:        "TEM00 overlap (exact)",
	}
	if x.M2 > 1 || y.M2 > 1 {
		c.Model = "Gaussian Schell model, M² = " + strconv.FormatFloat(x.M2, 'g', 4, 64) + " × " +
			strconv.FormatFloat(y.M2, 'g', 4, 64) + " (estimate)"
	}
	for _, v := range []float64{c.Efficiency, c.Aligned, x.Offset, x.Tilt, y.Offset, y.Tilt} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Coupling{}, &ParamError{Param: "overlap", Value: v, Reason: "not finite (extreme beam parameters)"}
		}
	}
	return c, nil
}

// Overlap returns the power coupling efficiency of beams a and b given at
// the same plane, with b's axis offset and tilted by m relative to a's
// (see the package documentation for the overlap integral and the model
// for M² > 1):
//
//	η = ηx·ηy,  ηx = |∫u_a* u_b dx|²/(∫|u_a|²dx ∫|u_b|²dx)
//
// Each may be a [beam.Gaussian] (round) or a [beam.Astigmatic] beam; the
// x parts couple with each other and the y parts with each other, so the
// principal axes of both beams must be x and y. The result is symmetric
// in a and b. It is exact for TEM₀₀ beams (Joyce & DeLoach 1984 [from
// memory]; R13 and R40 of the project's reference checks are its special
// cases).
//
// It returns a *ParamError for an invalid beam or misalignment (a tilt
// beyond [beam.MaxDivergence]), for beams of different vacuum wavelength
// or index (wrapping [ErrMismatch]), and when both beams have M² > 1 in
// one direction ([ErrTwoPartial]).
func Overlap(a, b beam.Input, m Misalignment) (Coupling, error) {
	p, err := newPair(a, b)
	if err != nil {
		return Coupling{}, err
	}
	return p.couple(m)
}

// OverlapSeparated is [Overlap] for beam a given at one plane and beam b
// given at a plane a distance gap (metres, positive when b's plane lies
// after a's, finite) further along the axis in the same homogeneous
// medium: a is carried to b's plane by q → q + gap (Kogelnik & Li 1966),
// and m is the misalignment at b's plane.
func OverlapSeparated(a, b beam.Input, gap units.Length, m Misalignment) (Coupling, error) {
	if math.IsNaN(float64(gap)) || math.IsInf(float64(gap), 0) {
		return Coupling{}, &ParamError{Param: "gap", Value: gap, Reason: "must be finite"}
	}
	p, err := newPair(a, b)
	if err != nil {
		return Coupling{}, err
	}
	s := paraxial.Space(gap)
	p.a = p.a.Transform(s, s, p.a.X.Index)
	return p.couple(m)
}

// AxialCoupling returns the power coupling of two round TEM₀₀ beams on
// a common axis with waist radii w1 and w2 (metres) whose waists are dz
// apart (metres), at vacuum wavelength λ0 in a medium of index n:
//
//	η = 4 / [(w1/w2 + w2/w1)² + (λΔz/(π w1 w2))²],   λ = λ0/n
//
// (Kogelnik 1964 [from memory]; R13 of the project's reference checks).
// With dz = 0 it is the pure size mismatch 4w1²w2²/(w1² + w2²)²; equal
// waists dz = zR apart give 0.8 and 2zR apart 0.5. The efficiency is the
// same at every plane. It is pure arithmetic: NaN for a non-positive,
// NaN or infinite waist, wavelength or index, or a non-finite dz.
func AxialCoupling(w1, w2, dz, wavelength units.Length, n float64) float64 {
	if !(w1 > 0 && w2 > 0 && wavelength > 0 && n > 0) || bad(float64(w1), float64(w2), float64(dz), float64(wavelength), n) {
		return math.NaN()
	}
	r := float64(w1 / w2)
	s := float64(wavelength) / n * float64(dz) / (math.Pi * float64(w1) * float64(w2))
	return 4 / ((r+1/r)*(r+1/r) + s*s)
}

// WaistPlaneCoupling returns the power coupling of two round TEM₀₀
// beams whose waists, of radii w1 and w2 (metres), lie in the same plane,
// with their axes offset by d (metres) and tilted by θ (radians, in the
// medium) in one direction, at vacuum wavelength λ0 in a medium of index
// n:
//
//	η = (2w1w2/(w1² + w2²))² · exp(−2d²/(w1² + w2²)) · exp(−(kθ)² w1²w2²/(2(w1² + w2²)))
//
// with k = 2πn/λ0, that is exp(−2(πnθ/λ0)² w1²w2²/(w1² + w2²)) (D.
// Marcuse, Bell Syst. Tech. J. 56, 703 (1977) [from memory]; R40 of the
// project's reference checks). Equal waists give exp(−d²/w²) and
// exp(−(kwθ/2)²). It is pure arithmetic: NaN for non-positive or
// non-finite waists, wavelength or index, or non-finite d or θ.
func WaistPlaneCoupling(w1, w2, d units.Length, tilt units.Angle, wavelength units.Length, n float64) float64 {
	if !(w1 > 0 && w2 > 0 && wavelength > 0 && n > 0) || bad(float64(w1), float64(w2), float64(d), float64(tilt), float64(wavelength), n) {
		return math.NaN()
	}
	a, b := float64(w1)*float64(w1), float64(w2)*float64(w2)
	k := 2 * math.Pi * n / float64(wavelength)
	th, dd := float64(tilt), float64(d)
	size := 2 * float64(w1) * float64(w2) / (a + b)
	return size * size * math.Exp(-2*dd*dd/(a+b)) * math.Exp(-k*k*th*th*a*b/(2*(a+b)))
}

func bad(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return true
		}
	}
	return false
}
