package beam

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mat"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// SafetyNote is the laser-safety caution that accompanies every display of
// irradiance or focused power. [Irradiance] carries it and
// [Irradiance.Summary] ends with it; notebooks and tables that show
// irradiance should show it too.
const SafetyNote = "Laser safety: focused beams reach hazardous irradiance at powers far below " +
	"those of most laboratory lasers, and lenses and windows throw stray reflections. " +
	"These numbers are beam-optics estimates, not exposure limits and not a safety clearance. " +
	"Follow your local laser-safety rules and the instructions of your responsible laser " +
	"safety officer, and wear the eyewear they specify."

// DefaultMinTransmission is the transmitted fraction below which
// [Clipping] flags an opening when no threshold is given: 99 %. An
// aperture of radius 1.5 W passes 98.9 % and one of radius πW/2 (diameter
// πW) passes 99.3 % (R09 of the project's reference checks; the "πW
// aperture" rule is attributed to Siegman, Lasers, §17.1 [from memory];
// the 99 % threshold itself is common practice, no single source).
const DefaultMinTransmission = 0.99

// CircularTransmission returns the fraction of the power of a centred
// Gaussian beam, with 1/e² radii wx and wy (metres) along its principal
// axes, that passes a circular aperture of radius a (metres). For a round
// beam (wx = wy = w) it is the closed form
//
//	T = 1 − exp(−2a²/w²)
//
// (Siegman, Lasers, §17.1 [from memory]). For an elliptical beam it is the
// chord integral of [Transmission] (Gauss–Legendre along the wider axis of
// the beam, erf across the narrower one), which stays accurate at any
// ellipticity. For M² > 1 the result treats the beam as a Gaussian of the
// same radii, an approximation.
//
// Special cases are:
//
//	CircularTransmission(a ≤ 0, wx, wy) = 0
//	CircularTransmission(+Inf, wx, wy) = 1
//	CircularTransmission(a, wx, wy) = NaN if wx or wy is not positive, or any argument is NaN
func CircularTransmission(a, wx, wy units.Length) float64 {
	A, X, Y := float64(a), float64(wx), float64(wy)
	switch {
	case math.IsNaN(A) || !(X > 0) || !(Y > 0):
		return math.NaN()
	case A <= 0:
		return 0
	case math.IsInf(A, 1):
		return 1
	}
	if X == Y {
		return -math.Expm1(-2 * (A / X) * (A / X))
	}
	return circleTransmission(A, 0, 0, X, Y)
}

// Transmission returns the fraction of the power of a Gaussian beam with
// 1/e² radii wx (tangential) and wy (sagittal), centred on the axis, that
// passes the opening o of a part met at angle of incidence tilt in the
// tangential plane. The opening is a shape on the part's surface; the
// beam's footprint there has the semi-axes wx/cos θ and wy, so no
// projection is entered by hand.
//
//   - A centred circle: [CircularTransmission](a, wx/cos θ, wy).
//   - An offset circle, centre (cx, cy) on the part: with x = cx + a sin t,
//     T = ∫ a cos t · p(x; wx′) · ½[erf(√2(cy + a cos t)/wy) −
//     erf(√2(cy − a cos t)/wy)] dt over t ∈ [−π/2, π/2], p the normalised
//     marginal √(2/π)/wx′·exp(−2x²/wx′²) of the intensity exp(−2x²/wx′² −
//     2y²/wy²) (Siegman, Lasers, §17.1 [from memory] for the Gaussian), by
//     Gauss–Legendre quadrature (gonum integrate/quad), the node count
//     doubled until two estimates agree to 1e-13.
//   - A slit of half-width a across x, centred at cx: ½[erf(√2(a − cx)/wx′)
//   - erf(√2(a + cx)/wx′)], and likewise across y.
//
// An unlimited opening passes 1. For M² > 1 the result treats the beam as
// a Gaussian of the same radii, an approximation. It returns NaN for a
// non-positive or NaN beam radius, a tilt that is not finite or not below
// 90°, and an invalid opening ([paraxial.Opening.Validate]).
func Transmission(o paraxial.Opening, tilt units.Angle, wx, wy units.Length) float64 {
	X, Y := float64(wx), float64(wy)
	if !(X > 0) || !(Y > 0) || !finite(float64(tilt)) || math.Abs(float64(tilt)) >= math.Pi/2 || o.Validate() != nil {
		return math.NaN()
	}
	if !o.Limited() {
		return 1
	}
	X /= math.Cos(float64(tilt))
	a, cx, cy := float64(o.Radius), float64(o.OffsetX), float64(o.OffsetY)
	if o.Shape == paraxial.Slit {
		w, c := X, cx
		if o.Across == paraxial.Sagittal {
			w, c = Y, cy
		}
		k := math.Sqrt2 / w
		return clamp01(0.5 * (math.Erf(k*(a-c)) + math.Erf(k*(a+c))))
	}
	if cx == 0 && cy == 0 && X == Y {
		return CircularTransmission(o.Radius, units.Length(X), units.Length(Y))
	}
	return circleTransmission(a, cx, cy, X, Y)
}

// circleTransmission is the power fraction of the Gaussian with 1/e²
// radii X, Y (centred) inside the circle of radius a centred at (cx, cy):
// the chord integral of [Transmission], taken along the wider axis of the
// beam so that the narrow one is done by erf in closed form.
func circleTransmission(a, cx, cy, X, Y float64) float64 {
	if X > Y {
		cx, cy, X, Y = cy, cx, Y, X
	}
	// Now Y ≥ X: integrate along y, erf across x.
	d := math.Hypot(cx, cy)
	wmax := Y
	switch {
	case d+12*wmax <= a:
		return 1 // the beam lies inside to exp(−288): below float64 resolution
	case d-a >= 12*wmax:
		return 0
	}
	kx := math.Sqrt2 / X
	f := func(t float64) float64 {
		st, ct := math.Sincos(t)
		y := cy + a*st
		h := a * ct
		py := math.Sqrt(2/math.Pi) / Y * math.Exp(-2*(y/Y)*(y/Y))
		return a * ct * py * 0.5 * (math.Erf(kx*(cx+h)) - math.Erf(kx*(cx-h)))
	}
	n := 64
	est := quad.Fixed(f, -math.Pi/2, math.Pi/2, n, quad.Legendre{}, 0)
	for n < 1<<16 {
		n *= 2
		next := quad.Fixed(f, -math.Pi/2, math.Pi/2, n, quad.Legendre{}, 0)
		done := math.Abs(next-est) <= 1e-13*math.Max(math.Abs(next), 1e-300)
		est = next
		if done {
			break
		}
	}
	return clamp01(est)
}

func clamp01(v float64) float64 { return math.Min(1, math.Max(0, v)) }

// Clip is the clipping check of one clear aperture along the path.
type Clip struct {
	// Element is the index of the element in the system, Name how
	// messages name it ([paraxial.Element.Name]) and Label its label.
	Element     int
	Name, Label string
	// Kind is the element kind; a tube is KindSpace.
	Kind paraxial.Kind
	// Z is the position of the checked plane, in metres: the element's
	// position, or for a tube the plane along it where the least power
	// passes.
	Z units.Length
	// Opening is the clear aperture and Tilt the angle of incidence of the
	// part.
	Opening paraxial.Opening
	Tilt    units.Angle
	// W and WY are the beam radii in x and y at Z, across the beam.
	W, WY units.Length
	// Transmission is the fraction of the power the opening passes,
	// [Transmission](Opening, Tilt, W, WY).
	Transmission float64
	// MinTransmission is the threshold the check used: the opening's own
	// (OwnThreshold true, a pinhole or slit meant to clip) or the path's.
	MinTransmission float64
	OwnThreshold    bool
	// Low is true when Transmission < MinTransmission.
	Low bool
}

// Footprint returns the x semi-axis of the beam's footprint on the part,
// W/cos(Tilt) in metres; W at normal incidence.
func (c Clip) Footprint() units.Length { return c.W / units.Length(math.Cos(float64(c.Tilt))) }

// Warning returns a one-line warning when the opening passes less than
// the threshold, for example
//
//	FlatMirror "M1" (call 8) at z = 223 mm: Ø 9 mm at 45° passes 93.59 % of the beam (wx = 3.1 mm, footprint 4.38 mm, wy = 3.1 mm), below 99.00 %
//
// and "" otherwise.
func (c Clip) Warning() string {
	if !c.Low {
		return ""
	}
	w := "w = " + short(c.W)
	if c.Tilt != 0 {
		w = "wx = " + short(c.W) + ", footprint " + short(c.Footprint()) + ", wy = " + short(c.WY)
	} else if short(c.WY) != short(c.W) {
		w = "wx = " + short(c.W) + ", wy = " + short(c.WY)
	}
	what := "Ø " + short(c.Opening.Diameter())
	if c.Opening.Shape == paraxial.Slit {
		what = short(c.Opening.Diameter()) + " slit"
	}
	if c.Tilt != 0 {
		what += " at " + strconv.FormatFloat(c.Tilt.Degrees(), 'g', 4, 64) + "°"
	}
	if c.Opening.OffsetX != 0 || c.Opening.OffsetY != 0 {
		what += " offset (" + short(c.Opening.OffsetX) + ", " + short(c.Opening.OffsetY) + ")"
	}
	own := ""
	if c.OwnThreshold {
		own = " (its own threshold)"
	}
	return c.Name + " at z = " + c.Z.String() + ": " + what + " passes " + percent(c.Transmission) + " of the beam (" + w + "), below " + percent(c.MinTransmission) + own
}

// percent formats a fraction as a percentage with two decimals, or more
// (up to six) when needed to tell a value below 100 % from 100 %.
func percent(f float64) string {
	p := 100 * f
	prec := 2
	for prec < 6 && p < 100 && strconv.FormatFloat(p, 'f', prec, 64) == "100."+strings.Repeat("0", prec) {
		prec++
	}
	return strconv.FormatFloat(p, 'f', prec, 64) + " %"
}

// tubeSamples is the number of planes at which a tube (an aperture on a
// space) is sampled besides its two ends. Each beam radius is convex along
// a gap (Kogelnik & Li 1966), so for a round beam the ends decide; for an
// astigmatic beam the worst plane can lie inside, and 63 planes place it
// to 1/64 of the tube.
const tubeSamples = 63

// Clipping checks every clear aperture of sys (Element.Aperture limited):
// the fraction of the power of the beam in, centred on the axis, that each
// opening passes ([Transmission], with the beam radii there and the part's
// tilt), in element order; a surface is checked with the beam arriving at
// it. A tube (an aperture on a space) is checked along its whole length,
// at both ends and 63 planes between (exact for a round beam, whose radius
// is largest at an end), and reported at its worst plane. An opening is
// flagged (Low) below its own threshold (paraxial.Opening.MinTransmission,
// for a pinhole or slit whose job is to clip) or else below
// minTransmission; minTransmission = 0 means [DefaultMinTransmission]
// (99 %), otherwise it must lie in (0, 1].
//
// It returns a [*ParamError] for a bad threshold, and the errors of [At]
// for a bad beam or system.
func Clipping(sys paraxial.System, in Input, minTransmission float64) (Clips, error) {
	if minTransmission == 0 {
		minTransmission = DefaultMinTransmission
	}
	if !(minTransmission > 0 && minTransmission <= 1) {
		return nil, &ParamError{Param: "minimum transmission", Value: minTransmission, Reason: "must be in (0, 1], or 0 for the default 0.99"}
	}
	a, err := checkInput(sys, in)
	if err != nil {
		return nil, err
	}
	var out Clips
	for pc := range sys.Walk(0, sys.Length()) {
		e := sys.Element(pc.Element)
		next := a.Transform(pc.X, pc.Y, pc.IndexOut)
		if !e.Aperture.Limited() {
			a = next
			continue
		}
		c := Clip{Element: pc.Element, Name: e.Name(), Label: e.Label, Kind: e.Kind, Z: e.Z, Opening: e.Aperture, Tilt: e.Tilt, MinTransmission: minTransmission}
		if t := e.Aperture.MinTransmission; t > 0 {
			c.MinTransmission, c.OwnThreshold = t, true
		}
		consider := func(z units.Length, b Astigmatic) {
			wx, wy := b.X.Radius(), b.Y.Radius()
			t := Transmission(e.Aperture, e.Tilt, wx, wy)
			if c.W == 0 || t < c.Transmission {
				c.Z, c.W, c.WY, c.Transmission = z, wx, wy, t
			}
		}
		if e.Kind == paraxial.KindSpace {
			d := float64(pc.To - pc.From)
			for k := range tubeSamples + 2 {
				f := d * float64(k) / float64(tubeSamples+1)
				consider(pc.From+units.Length(f), a.Transform(paraxial.Space(units.Length(f)), paraxial.Space(units.Length(f)), a.X.Index))
			}
		} else {
			// A surface: the arriving beam, in the frame of its angle of
			// incidence (a tilted interface rescales the tangential radius
			// by cos θ′/cos θ; the footprint on the surface is the same
			// seen from either side).
			consider(e.Z, a)
		}
		if !finite(float64(c.W)) || !finite(float64(c.WY)) || math.IsNaN(c.Transmission) {
			return nil, ErrOverflow
		}
		c.Low = c.Transmission < c.MinTransmission
		out = append(out, c)
		a = next
	}
	return out, nil
}

// Clipping is [Clipping] for the system and input beam that c was
// sampled from ([Sample], [SampleRange]); it returns a [*ParamError] for a
// caustic made otherwise.
func (c Caustic) Clipping(minTransmission float64) (Clips, error) {
	if c.sys.Validate() != nil {
		return nil, &ParamError{Param: "caustic", Reason: "need a caustic made by Sample or SampleRange"}
	}
	return Clipping(c.sys, c.in, minTransmission)
}

// PeakIrradiance returns the on-axis peak irradiance of a Gaussian beam of
// power P (watts) with 1/e² radii wx and wy (metres), in W/m²:
//
//	I0 = 2P/(π wx wy)
//
// which is 2P/(πw²) for a round beam (Kogelnik & Li 1966; R09: P = 1 mW,
// w = 1 mm gives 636.6198 W/m²). For M² > 1 it is the value of a Gaussian
// of the same radii, an estimate. It is pure arithmetic (IEEE-754 for
// zero or non-finite input); [Caustic.Irradiance] validates its input.
// Show [SafetyNote] with any value it returns.
func PeakIrradiance(power float64, wx, wy units.Length) float64 {
	return 2 * power / (math.Pi * float64(wx) * float64(wy))
}

// Irradiance is the on-axis peak irradiance along a sampled caustic for
// a given power. Note is always [SafetyNote]: display it with the values.
type Irradiance struct {
	// Power is the beam power in watts.
	Power float64
	// Z holds the sample positions (the caustic's Z).
	Z []units.Length
	// Peak holds 2P/(π wx wy) at each sample, in W/m².
	Peak []float64
	// Max is the largest on-axis peak irradiance anywhere in the
	// caustic's range, in W/m², found at MaxZ where the beam radii are
	// MaxW and MaxWY. It is exact, not the largest sample: within each
	// homogeneous stretch the smallest product wx·wy is found in closed
	// form (see [Caustic.Irradiance]).
	Max         float64
	MaxZ        units.Length
	MaxW, MaxWY units.Length
	// Note is [SafetyNote]; show it wherever the values are shown.
	Note string
}

// Irradiance returns the on-axis peak irradiance 2P/(π wx wy) along c for
// a beam of power P = power watts ([PeakIrradiance]) at every sample, and
// its exact maximum over the sampled range, with [SafetyNote] attached.
//
// The maximum is found per homogeneous stretch. With wx² = Wx²(1 + X²),
// X = (z − zx)/zRx, and likewise y, the product wx·wy is smallest where
//
//	d/dz [(1 + X²)(1 + Y²)] = 0:   X(1 + Y²)/zRx + Y(1 + X²)/zRy = 0
//
// a cubic in z whose real roots lie between the x and y foci (outside
// them both terms have one sign); it is solved as the eigenvalues of its
// companion matrix (gonum mat.Eigen), polished by Newton steps, and the
// roots inside the stretch are compared with its ends. For a round beam
// the root is the focus itself (Kogelnik & Li 1966 for w(z)).
//
// It returns a [*ParamError] unless power is positive and finite or if c
// was not made by [Sample] or [SampleRange], and [ErrOverflow] if c holds
// a zero or non-finite radius.
func (c Caustic) Irradiance(power float64) (Irradiance, error) {
	if !finite(power) || !(power > 0) {
		return Irradiance{}, &ParamError{Param: "power P (W)", Value: power, Reason: "must be positive and finite"}
	}
	n := len(c.Z)
	if n == 0 || len(c.W) != n || len(c.WY) != n || c.sys.Validate() != nil {
		return Irradiance{}, &ParamError{Param: "caustic samples", Value: n, Reason: "need a caustic made by Sample or SampleRange"}
	}
	ir := Irradiance{Power: power, Z: c.Z, Peak: make([]float64, n), Max: math.Inf(-1), Note: SafetyNote}
	for i := range n {
		v := PeakIrradiance(power, c.W[i], c.WY[i])
		if !finite(v) || !(v > 0) {
			return Irradiance{}, ErrOverflow
		}
		ir.Peak[i] = v
	}
	z0, z1 := float64(c.Z[0]), float64(c.Z[n-1])
	consider := func(z float64, b Astigmatic) {
		wx, wy := b.X.Radius(), b.Y.Radius()
		if v := PeakIrradiance(power, wx, wy); v > ir.Max {
			ir.Max, ir.MaxZ, ir.MaxW, ir.MaxWY = v, units.Length(z), wx, wy
		}
	}
	segments(c.sys, c.in, z0, z1, func(sg segment) bool {
		s, e := math.Max(sg.s, z0), math.Min(sg.e, z1)
		if e < s {
			return true
		}
		at := func(z float64) Astigmatic {
			d := units.Length(z - sg.s)
			return sg.b.Transform(paraxial.Space(d), paraxial.Space(d), sg.b.X.Index)
		}
		consider(s, at(s))
		consider(e, at(e))
		for _, z := range narrowestProduct(sg.b, sg.s) {
			if z > s && z < e {
				consider(z, at(z))
			}
		}
		return true
	})
	if !finite(ir.Max) || !(ir.Max > 0) {
		return Irradiance{}, ErrOverflow
	}
	return ir, nil
}

// narrowestProduct returns the stationary points of wx(z)·wy(z) for the
// beam b given at position s (metres) in a homogeneous medium: the real
// roots of X(1 + Y²)/zRx + Y(1 + X²)/zRy = 0 (see [Caustic.Irradiance]).
func narrowestProduct(b Astigmatic, s float64) []float64 {
	zx, zy := s-real(b.X.Q), s-real(b.Y.Q)
	rx, ry := imag(b.X.Q), imag(b.Y.Q)
	if zx == zy {
		return []float64{zx}
	}
	// Work in u = (z − zm)/L so that the coefficients are of order one.
	zm := (zx + zy) / 2
	l := math.Max(math.Abs(zx-zy), math.Min(rx, ry))
	ax, ay := l/rx, l/ry // X = ax(u − ux), Y = ay(u − uy)
	ux, uy := (zx-zm)/l, (zy-zm)/l
	// f(u) = ax·X·(1 + Y²) + ay·Y·(1 + X²) as a cubic c0 + c1 u + c2 u² + c3 u³.
	X := [2]float64{-ax * ux, ax}
	Y := [2]float64{-ay * uy, ay}
	sq := func(p [2]float64) [3]float64 { return [3]float64{1 + p[0]*p[0], 2 * p[0] * p[1], p[1] * p[1]} }
	mul := func(p [2]float64, q [3]float64) [4]float64 {
		return [4]float64{p[0] * q[0], p[0]*q[1] + p[1]*q[0], p[0]*q[2] + p[1]*q[1], p[1] * q[2]}
	}
	f1, f2 := mul(X, sq(Y)), mul(Y, sq(X))
	var c [4]float64
	for i := range c {
		c[i] = ax*f1[i] + ay*f2[i]
	}
	poly := func(u float64) (v, d float64) {
		return c[0] + u*(c[1]+u*(c[2]+u*c[3])), c[1] + u*(2*c[2]+u*3*c[3])
	}
	// Companion matrix of u³ + (c2/c3)u² + (c1/c3)u + c0/c3.
	comp := mat.NewDense(3, 3, []float64{
		0, 0, -c[0] / c[3],
		1, 0, -c[1] / c[3],
		0, 1, -c[2] / c[3],
	})
	var eig mat.Eigen
	if !eig.Factorize(comp, mat.EigenNone) {
		return nil
	}
	var out []float64
	for _, r := range eig.Values(nil) {
		if math.Abs(imag(r)) > 1e-6*(1+math.Abs(real(r))) {
			continue
		}
		u := real(r)
		for range 3 { // Newton polish
			v, d := poly(u)
			if d == 0 {
				break
			}
			u -= v / d
		}
		out = append(out, zm+u*l)
	}
	return out
}

// Summary returns a short text: the power, the highest peak irradiance in
// the sampled range, where it occurs and the beam radius there, followed
// by [SafetyNote] on a new paragraph, for example
//
//	Peak irradiance 2P/(π wx wy) for P = 20 mW: highest 6.37e+07 W/m² (6.37e+03 W/cm²), at z = 312 mm where w = 14.1 µm.
//
//	Laser safety: …
func (ir Irradiance) Summary() string {
	w := "w = " + short(ir.MaxW)
	if short(ir.MaxW) != short(ir.MaxWY) {
		w = "wx = " + short(ir.MaxW) + " and wy = " + short(ir.MaxWY)
	}
	return "Peak irradiance 2P/(π wx wy) for P = " + table.Power(ir.Power) + ": highest " +
		strconv.FormatFloat(ir.Max, 'e', 2, 64) + " W/m² (" + strconv.FormatFloat(ir.Max*1e-4, 'g', 3, 64) +
		" W/cm²), at z = " + ir.MaxZ.String() + " where " + w + ".\n\n" + SafetyNote
}

// short formats a length with three significant digits in the unit that
// suits it, for example "3 mm" or "16.9 µm".
func short(l units.Length) string { return table.LengthSig(l, 3) }
