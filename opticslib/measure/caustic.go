package measure

import (
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Weighting selects the weights of the hyperbolic fit of [FitCaustic].
type Weighting int

const (
	// AutoWeighting, the zero value, weights by the width uncertainties
	// when the scan has them ([UncertaintyWeighted]) and fits unweighted
	// otherwise ([Unweighted]).
	AutoWeighting Weighting = iota
	// Unweighted is the plain least-squares fit of d² of ISO 11146-1.
	// Every plane counts the same in d², so a far plane, whose d² and
	// whose error in d² are largest, pulls hardest: an unweighted fit
	// favours the far planes. The uncertainties come from the residual
	// scatter, which this assumes to be the same in d² at every plane.
	Unweighted
	// UncertaintyWeighted weights each plane by 1/σ(d²)², with
	// σ(d²) = 2d·σd from the stated width uncertainty σd, and takes the
	// uncertainties as absolute (the covariance is not rescaled by the
	// residuals; the fit warns when χ² does not fit them). d in σ(d²) is
	// the fitted diameter at the plane (iteratively reweighted: the
	// measured one in a first pass), because weights from the measured
	// widths favour the planes whose noise came out negative and bias d0
	// and M² low.
	UncertaintyWeighted
	// RelativeWeighted weights as if every width had the same relative
	// uncertainty, σ(d²) ∝ d² (the fitted d², as for
	// UncertaintyWeighted), for scans without stated uncertainties whose
	// error grows with the width (a camera's pixel and baseline errors
	// scale with the spot); the uncertainties come from the residual
	// scatter.
	RelativeWeighted
)

// String describes the weighting in words.
func (w Weighting) String() string {
	switch w {
	case AutoWeighting:
		return "automatic (by the uncertainties if given)"
	case Unweighted:
		return "unweighted least squares on d² (ISO 11146-1)"
	case UncertaintyWeighted:
		return "weighted by the stated width uncertainties, σ(d²) = 2d·σd"
	case RelativeWeighted:
		return "weighted for equal relative width errors, σ(d²) ∝ d²"
	}
	return "Weighting(" + strconv.Itoa(int(w)) + ")"
}

// CausticOptions are the settings of [FitCaustic].
type CausticOptions struct {
	// Wavelength is the vacuum wavelength λ0 in metres (required: M² and
	// the beam need it).
	Wavelength units.Length
	// Index is the refractive index of the medium of the scan; 0 means 1.
	Index float64
	// Weighting selects the weights; the zero value is [AutoWeighting].
	Weighting Weighting
	// RailMin and RailMax bound the positions, on the scan's z axis, at
	// which the fit may propose new planes (the travel of the rail); both
	// zero means no bound. They are swapped if given in reverse order.
	RailMin, RailMax units.Length
}

// Uncertain is a value with its standard uncertainty (one standard
// deviation, GUM's u), in the unit of T.
type Uncertain[T units.Length | units.Angle | float64] struct {
	Value, Sigma T
}

// String formats u as "253.1 ± 1.2 µm": the uncertainty with two
// significant digits and the value to the same decimal, lengths and
// angles in the unit that suits the value.
func (u Uncertain[T]) String() string {
	v, s := float64(u.Value), float64(u.Sigma)
	switch any(u.Value).(type) {
	case units.Length:
		scale, sym := causticLengthUnit(v)
		return causticPM(v/scale, s/scale) + " " + sym
	case units.Angle:
		scale, sym := causticAngleUnit(v)
		return causticPM(v/scale, s/scale) + " " + sym
	}
	return causticPM(v, s)
}

// causticLengthUnit returns the unit that suits the length v, as
// table.LengthSig chooses it.
func causticLengthUnit(v float64) (float64, string) {
	switch a := math.Abs(v); {
	case a >= 1:
		return 1, "m"
	case a >= 1e-3:
		return 1e-3, "mm"
	case a >= 1e-6 || a == 0:
		return 1e-6, "µm"
	}
	return 1e-9, "nm"
}

// causticAngleUnit returns the unit that suits the angle v, as
// units.Angle.String chooses it.
func causticAngleUnit(v float64) (float64, string) {
	switch a := math.Abs(v); {
	case a >= 1:
		return 1, "rad"
	case a >= 1e-3 || a == 0:
		return 1e-3, "mrad"
	}
	return 1e-6, "µrad"
}

// causticPM formats v ± s with s to two significant digits and v to the
// same decimal; when that would print more than nine digits of v (a
// noise-free fit), v gets nine significant digits and s two.
func causticPM(v, s float64) string {
	if !causticFinite(v) || !causticFinite(s) {
		return table.Sig(v, 4) + " ± " + table.Sig(s, 2)
	}
	if s == 0 {
		return table.Sig(v, 6) + " ± 0"
	}
	dec := 1 - int(math.Floor(math.Log10(s)))
	if v != 0 && dec+int(math.Floor(math.Log10(math.Abs(v))))+1 > 9 {
		return table.Sig(v, 9) + " ± " + table.Sig(s, 2)
	}
	if dec >= 0 {
		return table.Fixed(v, dec) + " ± " + table.Fixed(s, dec)
	}
	p := math.Pow(10, float64(-dec))
	return table.Fixed(math.Round(v/p)*p, 0) + " ± " + table.Fixed(math.Round(s/p)*p, 0)
}

// AxisFit is the hyperbolic fit of one axis of a caustic scan (ISO
// 11146-1): the waist, the Rayleigh length, the divergence and M², each
// with its standard uncertainty from the covariance of the fit. Widths
// are radii of the scan's [WidthKind] (second-moment radii 2σ or 1/e²
// radii): W0 = d0/2.
type AxisFit struct {
	// Axis is "x", "y" or "round".
	Axis string
	// Planes is the number of planes fitted.
	Planes int
	// W0 is the waist radius, Z0 the waist position on the scan's z axis,
	// RayleighRange zR = W0/θ, all in metres.
	W0, Z0, RayleighRange Uncertain[units.Length]
	// Divergence is the full far-field angle Θ = 2θ (edge to edge of the
	// diameter, the divergence of ISO 11146-1), in radians.
	Divergence Uncertain[units.Angle]
	// M2 is the beam propagation ratio M² = π n W0 θ/λ0.
	M2 Uncertain[float64]
	// Residual is the root-mean-square difference between the measured
	// and the fitted radii, in metres.
	Residual units.Length
	// A, B and C are the coefficients of the hyperbola of ISO 11146-1,
	//
	//	d²(z) = A + B z + C z²
	//
	// for the diameter d = 2w on the scan's z axis, in m², m and 1, and
	// Covariance their covariance matrix (in the same units, squared).
	A, B, C    float64
	Covariance [3][3]float64
	// ChiSquare is Σ((d² − fit)/σ(d²))² for a fit weighted by the stated
	// uncertainties and zero otherwise; DOF = Planes − 3 in both cases.
	ChiSquare float64
	DOF       int
	// Check is the measurement-plane rule of ISO 11146-1 applied to this
	// axis's planes, with the fitted waist and Rayleigh length.
	Check PlaneCheck
	// Proposal holds plane positions for a better measurement of this
	// axis, from the fitted waist (see [ProposePlanes]).
	Proposal []units.Length

	params causticParams
}

// CausticFit is the result of [FitCaustic]: the fitted axes, what was
// fitted and how, and the warnings of the fit. [CausticFit.Beam] turns it
// into a beam of package beam; [CausticFit.Table] and
// [CausticFit.String] show it.
type CausticFit struct {
	// Source names the scan.
	Source string
	// Round is true for a round beam: X holds its one axis (named
	// "round") and Y is the zero value.
	Round bool
	X, Y  AxisFit
	// Kind is what the widths were; W0 and the residuals are its radii.
	Kind WidthKind
	// Wavelength is the vacuum wavelength λ0 and Index the index of the
	// medium of the scan.
	Wavelength units.Length
	Index      float64
	// Weighting is the weighting used (never AutoWeighting).
	Weighting Weighting
	// Scaled is true when the covariance was scaled by the residual
	// variance χ²/(n − 3) (no stated uncertainties, or RelativeWeighted)
	// and false when the stated uncertainties were taken as absolute.
	Scaled bool
	// Warnings holds what the user should know about the fit: the plane
	// rule of ISO 11146-1 and what to add, 1/e² widths, a χ² that does
	// not fit the stated uncertainties, M² below 1. It is empty for a
	// measurement that follows ISO 11146-1 and fits its uncertainties.
	Warnings []string
	// Proposal holds plane positions for a better measurement, from the
	// fitted waist and Rayleigh length of every axis (see
	// [ProposePlanes]), on the scan's z axis.
	Proposal []units.Length
}

// Axes returns the fitted axes: the round axis, or x and y.
func (f CausticFit) Axes() []AxisFit {
	if f.Round {
		return []AxisFit{f.X}
	}
	return []AxisFit{f.X, f.Y}
}

// causticParams is the fit in the centred and scaled coordinate
// t = (z − zc)/s, in which the normal equations are well conditioned:
// w² = α + β t + γ t² for the radius w in metres.
type causticParams struct {
	p     [3]float64
	cov   [3][3]float64
	zc, s float64
	k     float64 // π n/λ0, so that M² = k W0 θ
}

// causticDerived are the beam parameters of a fit: W0, z0, zR, Θ, M².
const (
	causticW0 = iota
	causticZ0
	causticZR
	causticTheta
	causticM2
	causticDerivedN
)

// derive returns W0, z0, zR, Θ and M² of the hyperbola p and their
// gradients with respect to p (α, β, γ), from
//
//	w² = W0² + θ²(z − z0)²  ⇔  α = W0² + γ t0², β = −2γ t0, γ = (θ s)²
//
// so t0 = −β/(2γ), W0² = α − β²/(4γ), θ = √γ/s, zR = W0/θ, Θ = 2θ and
// M² = π n W0 θ/λ0 (ISO 11146-1, clause 9, written for radii). ok is
// false if γ ≤ 0 or 4αγ − β² ≤ 0.
func (c causticParams) derive(p [3]float64) (v [causticDerivedN]float64, g [causticDerivedN][3]float64, ok bool) {
	a, b, gm := p[0], p[1], p[2]
	if !(gm > 0) || !(4*a*gm-b*b > 0) {
		return v, g, false
	}
	s := c.s
	t0 := -b / (2 * gm)
	w2 := a - b*b/(4*gm)
	w0 := math.Sqrt(w2)
	th := math.Sqrt(gm) / s
	v[causticW0] = w0
	v[causticZ0] = c.zc + s*t0
	v[causticTheta] = 2 * th
	v[causticZR] = w0 / th
	v[causticM2] = c.k * w0 * th
	gw2 := [3]float64{1, -b / (2 * gm), b * b / (4 * gm * gm)}
	gth := [3]float64{0, 0, 1 / (2 * s * math.Sqrt(gm))}
	for j := range 3 {
		gw0 := gw2[j] / (2 * w0)
		g[causticW0][j] = gw0
		g[causticTheta][j] = 2 * gth[j]
		g[causticZR][j] = gw0/th - w0*gth[j]/(th*th)
		g[causticM2][j] = c.k * (th*gw0 + w0*gth[j])
	}
	g[causticZ0] = [3]float64{0, -s / (2 * gm), s * b / (2 * gm * gm)}
	return v, g, true
}

// sigma returns √(gᵀ Σ g).
func (c causticParams) sigma(g [3]float64) float64 {
	var v float64
	for i := range 3 {
		for j := range 3 {
			v += g[i] * c.cov[i][j] * g[j]
		}
	}
	return math.Sqrt(math.Max(v, 0))
}

// FitCaustic fits the hyperbola of ISO 11146-1 to each axis of the scan,
//
//	d²(z) = A + B z + C z²
//
// by linear least squares (QR factorisation, gonum/mat) in the centred
// coordinate t = (z − zc)/s, weighted as opt.Weighting says (a weighted
// fit is repeated with the weights of the fitted curve until the
// coefficients settle, see [UncertaintyWeighted]), and derives
//
//	z0 = −B/(2C),  d0 = √(4AC − B²)/(2√C),  Θ = √C,
//	zR = √(4AC − B²)/(2C),  M² = (π n/(8λ0)) √(4AC − B²)
//
// (ISO 11146-1:2005, clause 9; reference-checks R16), reported as the
// waist radius W0 = d0/2, the full divergence Θ and M². Each value's
// standard uncertainty is propagated linearly (analytic gradients) from
// the covariance of the coefficients: with stated uncertainties (
// [UncertaintyWeighted]) the covariance (Aᵀ W A)⁻¹ as it is; otherwise
// that covariance scaled by the residual variance χ²/(n − 3), as
// [CausticFit.Scaled] says.
//
// It warns, in [CausticFit.Warnings], when the planes break the rule of
// ISO 11146-1 ([CheckPlanes]) and proposes planes for a better
// measurement ([ProposePlanes]); when the widths are 1/e² widths; when
// χ² is far from what the stated uncertainties predict (below 0.1 % or
// above 99.9 % of the χ² distribution); when the divergence lies beyond
// the paraxial range of package beam; and when M² < 1.
//
// It returns the errors of [WidthScan.Validate]; a [*ParamError] wrapping
// [ErrInput] for a missing or non-positive wavelength, a bad index, rail
// or weighting, or UncertaintyWeighted without uncertainties; and one
// wrapping [ErrNotPhysical] when an axis's fit is not a beam: C ≤ 0 (a
// caustic that opens downwards) or 4AC − B² ≤ 0 (no real waist), or its
// numbers leave the float64 range.
func FitCaustic(s WidthScan, opt CausticOptions) (CausticFit, error) {
	if err := s.Validate(); err != nil {
		return CausticFit{}, err
	}
	src := s.source()
	n := opt.Index
	if n == 0 {
		n = 1
	}
	switch {
	case !causticFinite(float64(opt.Wavelength)) || opt.Wavelength <= 0:
		return CausticFit{}, &ParamError{Where: src, Param: "Wavelength λ0", Value: opt.Wavelength, Reason: "must be positive and finite (the vacuum wavelength; M² needs it)", Err: ErrInput}
	case !causticFinite(n) || n <= 0:
		return CausticFit{}, &ParamError{Where: src, Param: "Index", Value: opt.Index, Reason: "must be positive and finite (0 means 1)", Err: ErrInput}
	case !causticFinite(float64(opt.RailMin)) || !causticFinite(float64(opt.RailMax)):
		return CausticFit{}, &ParamError{Where: src, Param: "RailMin, RailMax", Value: opt.RailMax, Reason: "must be finite (both zero for no bound)", Err: ErrInput}
	case opt.Weighting < AutoWeighting || opt.Weighting > RelativeWeighted:
		return CausticFit{}, &ParamError{Where: src, Param: "Weighting", Value: int(opt.Weighting), Reason: "is not a Weighting", Err: ErrInput}
	}
	hasSigma := s.SigmaRound != nil || s.SigmaX != nil
	wt := opt.Weighting
	if wt == AutoWeighting {
		wt = Unweighted
		if hasSigma {
			wt = UncertaintyWeighted
		}
	}
	if wt == UncertaintyWeighted && !hasSigma {
		return CausticFit{}, &ParamError{Where: src, Param: "Weighting", Value: wt.String(), Reason: "the scan has no width uncertainties", Err: ErrInput}
	}
	f := CausticFit{Source: src, Round: len(s.Round) > 0, Kind: s.Kind, Wavelength: opt.Wavelength, Index: n, Weighting: wt, Scaled: wt != UncertaintyWeighted}
	type axisData struct {
		name string
		w, u []units.Length
	}
	axes := []axisData{{"x", s.X, s.SigmaX}, {"y", s.Y, s.SigmaY}}
	if f.Round {
		axes = []axisData{{"round", s.Round, s.SigmaRound}}
	}
	toRadius := 1.0
	if s.Kind.diameter() {
		toRadius = 0.5
	}
	railMin, railMax := opt.RailMin, opt.RailMax
	if railMin > railMax {
		railMin, railMax = railMax, railMin
	}
	var fits []AxisFit
	for _, ax := range axes {
		z, w := make([]float64, len(s.Z)), make([]float64, len(s.Z))
		var u []float64
		if ax.u != nil && wt == UncertaintyWeighted {
			u = make([]float64, len(s.Z))
		}
		for i := range s.Z {
			z[i], w[i] = float64(s.Z[i]), toRadius*float64(ax.w[i])
			if u != nil {
				u[i] = toRadius * float64(ax.u[i])
			}
		}
		a, err := causticFitAxis(src, ax.name, z, w, u, wt, math.Pi*n/float64(opt.Wavelength))
		if err != nil {
			return CausticFit{}, err
		}
		a.Check = CheckPlanes(s.Z, a.Z0.Value, a.RayleighRange.Value)
		a.Proposal = ProposePlanes(a.Z0.Value, a.RayleighRange.Value, railMin, railMax)
		fits = append(fits, a)
	}
	f.X = fits[0]
	if !f.Round {
		f.Y = fits[1]
	}
	f.Proposal = causticProposeAxes(fits, railMin, railMax)
	f.Warnings = f.causticWarnings(railMin, railMax)
	return f, nil
}

// causticFitAxis fits w² = α + β t + γ t² to the radii w (metres) at z
// (metres), with radius uncertainties u for UncertaintyWeighted; k is
// π n/λ0.
func causticFitAxis(src, axis string, z, w, u []float64, wt Weighting, k float64) (AxisFit, error) {
	np := len(z)
	zmin, zmax := z[0], z[0]
	for _, v := range z {
		zmin, zmax = math.Min(zmin, v), math.Max(zmax, v)
	}
	c := causticParams{zc: zmin/2 + zmax/2, s: zmax/2 - zmin/2, k: k}
	// Weights from the fitted radii ŵ (the measured ones in a first pass):
	// weights from the measured radii favour the planes that came out
	// narrow and bias W0 and M² low (by a few σ², relative, for a relative
	// width error σ: −0.2 % in M² at σ = 2 % in TestFitCausticNoisyStatistics
	// before this was done).
	wfit := slices.Clone(w)
	var (
		cov mat.SymDense
		rss float64
	)
	passes := 1
	if wt == UncertaintyWeighted || wt == RelativeWeighted {
		passes = causticReweightPasses
	}
	for pass := range passes {
		p, r, cv, err := causticSolve(z, w, u, wfit, wt, c.zc, c.s)
		if err != nil {
			return AxisFit{}, &ParamError{Where: src + ", " + axis + " axis", Param: "planes", Reason: "too close together to fit a hyperbola (" + err.Error() + ")", Err: ErrInput}
		}
		done := pass > 0 && math.Abs(p[0]-c.p[0]) <= 1e-13*math.Abs(p[0]) && math.Abs(p[1]-c.p[1]) <= 1e-13*math.Abs(p[0]) && math.Abs(p[2]-c.p[2]) <= 1e-13*math.Abs(p[2])
		c.p, rss, cov = p, r, cv
		if done {
			break
		}
		ok := true
		for i := range np {
			t := (z[i] - c.zc) / c.s
			y := p[0] + p[1]*t + p[2]*t*t
			if !(y > 0) {
				ok = false // not a beam; the physical check below says so
				break
			}
			wfit[i] = math.Sqrt(y)
		}
		if !ok {
			break
		}
	}
	dof := np - 3
	scale := 1.0
	if wt != UncertaintyWeighted {
		scale = rss / float64(dof)
	}
	for i := range 3 {
		for j := range 3 {
			c.cov[i][j] = scale * cov.At(i, j)
		}
	}
	// ISO coefficients of d² = 4w² in z: d² = 4α + 4β(z−zc)/s + 4γ(z−zc)²/s².
	zc, s := c.zc, c.s
	T := [3][3]float64{
		{4, -4 * zc / s, 4 * zc * zc / (s * s)},
		{0, 4 / s, -8 * zc / (s * s)},
		{0, 0, 4 / (s * s)},
	}
	a := AxisFit{Axis: axis, Planes: np, DOF: dof, params: c}
	a.A = T[0][0]*c.p[0] + T[0][1]*c.p[1] + T[0][2]*c.p[2]
	a.B = T[1][1]*c.p[1] + T[1][2]*c.p[2]
	a.C = T[2][2] * c.p[2]
	for i := range 3 {
		for j := range 3 {
			var v float64
			for k := range 3 {
				for l := range 3 {
					v += T[i][k] * c.cov[k][l] * T[j][l]
				}
			}
			a.Covariance[i][j] = v
		}
	}
	where := src + ", " + axis + " axis"
	overflow := &ParamError{Where: where, Param: "fit", Reason: "the numbers leave the float64 range (positions or widths of extreme size?)", Err: ErrNotPhysical}
	for i := range 3 {
		if !causticFinite(c.p[i]) || !causticFinite(c.cov[i][i]) {
			return AxisFit{}, overflow
		}
	}
	v, g, ok := c.derive(c.p)
	if !ok {
		if !(c.p[2] > 0) {
			return AxisFit{}, &ParamError{Where: where, Param: "hyperbola coefficient C", Value: a.C,
				Reason: "d² = A + Bz + Cz² needs C > 0; this fit opens downwards (the widths shrink away from the middle of the scan, which no beam does): check that z and the widths are in matching rows, units and kinds", Err: ErrNotPhysical}
		}
		// 4AC − B² = 16(4αγ − β²)/s², from the centred coefficients, so that
		// the sign shown is the one tested.
		return AxisFit{}, &ParamError{Where: where, Param: "4AC − B² (m²)", Value: 16 * (4*c.p[0]*c.p[2] - c.p[1]*c.p[1]) / (s * s),
			Reason: "must be positive: the fitted curve has no real waist (the widths fall on a line, or on a curve narrower than any beam); scan through the waist and check the data", Err: ErrNotPhysical}
	}
	a.W0 = Uncertain[units.Length]{units.Length(v[causticW0]), units.Length(c.sigma(g[causticW0]))}
	a.Z0 = Uncertain[units.Length]{units.Length(v[causticZ0]), units.Length(c.sigma(g[causticZ0]))}
	a.RayleighRange = Uncertain[units.Length]{units.Length(v[causticZR]), units.Length(c.sigma(g[causticZR]))}
	a.Divergence = Uncertain[units.Angle]{units.Angle(v[causticTheta]), units.Angle(c.sigma(g[causticTheta]))}
	a.M2 = Uncertain[float64]{v[causticM2], c.sigma(g[causticM2])}
	var sq float64
	for i := range np {
		t := (z[i] - zc) / s
		d := w[i] - math.Sqrt(c.p[0]+c.p[1]*t+c.p[2]*t*t)
		sq += d * d
	}
	a.Residual = units.Length(math.Sqrt(sq / float64(np)))
	for _, x := range []float64{float64(a.W0.Value), float64(a.W0.Sigma), float64(a.Z0.Value), float64(a.Z0.Sigma), float64(a.RayleighRange.Value), float64(a.RayleighRange.Sigma),
		float64(a.Divergence.Value), float64(a.Divergence.Sigma), a.M2.Value, a.M2.Sigma, float64(a.Residual), a.A, a.B, a.C} {
		if !causticFinite(x) {
			return AxisFit{}, overflow
		}
	}
	if !(a.W0.Value > 0 && a.RayleighRange.Value > 0) {
		return AxisFit{}, &ParamError{Where: where, Param: "waist radius W0", Value: a.W0.Value, Reason: "must be positive (the fit underflowed: positions or widths of extreme size?)", Err: ErrNotPhysical}
	}
	if wt == UncertaintyWeighted {
		a.ChiSquare = rss
	}
	return a, nil
}

// causticReweightPasses bounds the reweighting passes of a weighted fit;
// they converge in three or four (the weights change by the relative
// residuals).
const causticReweightPasses = 8

// causticSolve solves the weighted least-squares problem of w² on
// (1, t, t²), t = (z − zc)/s, with weights from the radii wfit, and returns
// the coefficients, the weighted residual sum of squares and the unscaled
// covariance (AᵀWA)⁻¹ = R⁻¹R⁻ᵀ from the QR factorisation.
func causticSolve(z, w, u, wfit []float64, wt Weighting, zc, s float64) ([3]float64, float64, mat.SymDense, error) {
	np := len(z)
	var p [3]float64
	var cov mat.SymDense
	A := mat.NewDense(np, 3, nil)
	y := mat.NewDense(np, 1, nil)
	for i := range np {
		r := 1.0
		switch wt {
		case UncertaintyWeighted:
			r = 1 / (2 * wfit[i] * u[i]) // 1/σ(w²), σ(w²) = 2w·σw
		case RelativeWeighted:
			r = 1 / (wfit[i] * wfit[i])
		}
		t := (z[i] - zc) / s
		A.SetRow(i, []float64{r, r * t, r * t * t})
		y.Set(i, 0, r*w[i]*w[i])
	}
	var qr mat.QR
	qr.Factorize(A)
	var sol mat.Dense
	if err := qr.SolveTo(&sol, false, y); err != nil {
		return p, 0, cov, err
	}
	for j := range 3 {
		p[j] = sol.At(j, 0)
	}
	var rss float64
	for i := range np {
		e := y.At(i, 0) - (A.At(i, 0)*p[0] + A.At(i, 1)*p[1] + A.At(i, 2)*p[2])
		rss += e * e
	}
	var rfull mat.Dense
	qr.RTo(&rfull)
	rt := mat.NewTriDense(3, mat.Upper, nil)
	for i := range 3 {
		for j := i; j < 3; j++ {
			rt.SetTri(i, j, rfull.At(i, j))
		}
	}
	var ri mat.TriDense
	if err := ri.InverseTri(rt); err != nil {
		return p, 0, cov, err
	}
	cov.SymOuterK(1, &ri)
	return p, rss, cov, nil
}

// causticWarnings collects the warnings of f.
func (f CausticFit) causticWarnings(railMin, railMax units.Length) []string {
	var out []string
	axes := f.Axes()
	prefix := func(a AxisFit) string {
		if f.Round {
			return ""
		}
		return a.Axis + ": "
	}
	if f.Kind.definition() == OneOverE2Widths {
		out = append(out, "the widths are 1/e² widths: ISO 11146-1 defines the waist, divergence and M² on second-moment (D4σ) widths; these results equal ISO's for a TEM₀₀-like beam only")
	}
	bad := false
	for _, a := range axes {
		for _, p := range a.Check.Problems {
			out = append(out, prefix(a)+p)
			bad = true
		}
	}
	if bad {
		out = append(out, "planes proposed from this fit for the next scan (about half within one Rayleigh length of the waist, half beyond two): "+causticPlaneList(f.Proposal))
		for _, a := range axes {
			if c := CheckPlanes(a.Proposal, a.Z0.Value, a.RayleighRange.Value); !c.OK() && (railMin != 0 || railMax != 0) {
				out = append(out, prefix(a)+"the rail ("+table.LengthSig(railMin, 4)+" … "+table.LengthSig(railMax, 4)+") cannot hold the planes ISO 11146-1 asks for around this waist: make an accessible waist with a long-focal-length, low-aberration lens (its spherical aberration raises the apparent M²) or extend the rail")
			}
		}
	}
	for _, a := range axes {
		if f.Weighting == UncertaintyWeighted && a.DOF > 0 {
			chi := distuv.ChiSquared{K: float64(a.DOF)}
			red := table.Sig(a.ChiSquare/float64(a.DOF), 3)
			switch {
			case chi.Survival(a.ChiSquare) < 1e-3:
				out = append(out, prefix(a)+"the residuals are larger than the stated uncertainties predict (χ²/ν = "+red+", ν = "+strconv.Itoa(a.DOF)+", probability below 0.1 %): the uncertainties are too small or the caustic is not a hyperbola (aberrations, a changing beam); the reported uncertainties take the stated ones as given")
			case chi.CDF(a.ChiSquare) < 1e-3:
				out = append(out, prefix(a)+"the residuals are much smaller than the stated uncertainties predict (χ²/ν = "+red+", ν = "+strconv.Itoa(a.DOF)+"): the stated uncertainties look too large, and so do the reported ones")
			}
		}
		if th := a.Divergence.Value / 2; th > beam.MaxDivergence {
			out = append(out, prefix(a)+"the half-divergence Θ/2 = "+table.AngleSig(th, 3)+" exceeds "+table.AngleSig(beam.MaxDivergence, 3)+", the paraxial range of package beam: the fit cannot become a beam (check the units of z and of the widths)")
		}
		if a.M2.Value < 1 {
			out = append(out, prefix(a)+"M² = "+a.M2.String()+" is below 1, which no beam has: check the wavelength ("+table.LengthSig(f.Wavelength, 4)+"), the width kind ("+f.Kind.String()+") and the calibration of the widths; the beam of this fit uses M² = 1")
		}
	}
	return out
}

// causticPlaneList formats positions as "12.4, 14, 20.2 mm" in one unit,
// with as many decimals as the smallest gap between them needs.
func causticPlaneList(zs []units.Length) string {
	if len(zs) == 0 {
		return "none"
	}
	u, sym := table.LengthUnit(zs...)
	gap := math.Inf(1)
	for i := 1; i < len(zs); i++ {
		if d := float64((zs[i] - zs[i-1]) / u); d > 0 {
			gap = math.Min(gap, d)
		}
	}
	dec := 0
	if !math.IsInf(gap, 1) {
		dec = min(12, max(0, int(math.Ceil(-math.Log10(gap)-1e-9))))
	}
	s := ""
	for i, z := range zs {
		if i > 0 {
			s += ", "
		}
		s += table.Fixed(float64(z/u), dec)
	}
	return s + " " + sym
}
