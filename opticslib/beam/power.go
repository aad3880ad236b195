package beam

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
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
// [Apertures] flags an element when no threshold is given: 99 %. An
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
// (Siegman, Lasers, §17.1 [from memory]). For an elliptical beam the
// radial integral is done in closed form and the angular one numerically:
//
//	T = 1/(2π wx wy) ∫₀^{2π} (1 − exp(−2a² k(φ)))/k(φ) dφ,
//	k(φ) = cos²φ/wx² + sin²φ/wy²
//
// with the trapezoidal rule, which converges exponentially for this smooth
// periodic integrand (L. N. Trefethen & J. A. C. Weideman, "The
// exponentially convergent trapezoidal rule", SIAM Rev. 56, 385–458 (2014)
// [from memory]); the step is halved until two estimates agree to 1e-14.
// For M² > 1 the result treats the beam as a Gaussian of the same radii,
// an approximation.
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
	a2 := A * A
	f := func(phi float64) float64 {
		c, s := math.Cos(phi), math.Sin(phi)
		k := float64(c*c)/(X*X) + float64(s*s)/(Y*Y)
		return -math.Expm1(-2*a2*k) / k
	}
	// Quarter period [0, π/2] by symmetry; trapezoid with ends weighted ½.
	n := 16
	h := math.Pi / 2 / float64(n)
	sum := 0.5 * (f(0) + f(math.Pi/2))
	for i := 1; i < n; i++ {
		sum += f(float64(i) * h)
	}
	est := sum * h
	for n < 1<<20 {
		// Halve the step: add the midpoints.
		h /= 2
		for i := 1; i < 2*n; i += 2 {
			sum += f(float64(i) * h)
		}
		n *= 2
		next := sum * h
		done := math.Abs(next-est) <= 1e-14*math.Abs(next)
		est = next
		if done {
			break
		}
	}
	t := 4 * est / (2 * math.Pi * X * Y)
	return math.Min(1, math.Max(0, t))
}

// Clip is the aperture check of one element with a clear aperture.
type Clip struct {
	// Element is the index of the element in the system.
	Element int
	// Label is the element's label, or a description such as
	// "element 3 (thin lens)" when it has none.
	Label string
	// Z is the element's entrance position in metres.
	Z units.Length
	// Aperture is the clear-aperture radius in metres.
	Aperture units.Length
	// W and WY are the beam radii in x and y at the element, in metres
	// (the larger of the entrance and exit values for a thick element).
	W, WY units.Length
	// Transmission is the fraction of the power passed by the aperture,
	// [CircularTransmission](Aperture, W, WY).
	Transmission float64
	// MinTransmission is the threshold the check used.
	MinTransmission float64
	// Low is true when Transmission < MinTransmission.
	Low bool
}

// Warning returns a one-line warning when the aperture passes less than
// the threshold, for example
//
//	L2 (z = 200 mm): clear aperture radius 4 mm passes 96.42 % of the beam (w = 3.1 mm), below 99.00 %
//
// and "" otherwise.
func (c Clip) Warning() string {
	if !c.Low {
		return ""
	}
	w := "w = " + short(c.W)
	if short(c.WY) != short(c.W) {
		w = "wx = " + short(c.W) + ", wy = " + short(c.WY)
	}
	return c.Label + " (z = " + c.Z.String() + "): clear aperture radius " + c.Aperture.String() +
		" passes " + percent(c.Transmission) + " of the beam (" + w + "), below " + percent(c.MinTransmission)
}

// percent formats a fraction as a percentage with two decimals, or more
// (up to six) when needed to tell a value below 100 % from 100 %.
func percent(f float64) string {
	p := 100 * f
	prec := 2
	for prec < 6 && p < 100 && strconv.FormatFloat(p, 'f', prec, 64) == "100."+zeros(prec) {
		prec++
	}
	return strconv.FormatFloat(p, 'f', prec, 64) + " %"
}

func zeros(n int) string {
	b := make([]byte, n)
	for i := range b {
		b[i] = '0'
	}
	return string(b)
}

// Apertures checks every element of sys that has a clear aperture
// (Element.Aperture > 0): it returns, in element order, the fraction of
// the power of the centred beam in that the aperture passes
// ([CircularTransmission] with the beam radii at the element) and flags
// the elements that pass less than minTransmission. minTransmission = 0
// means [DefaultMinTransmission] (99 %); otherwise it must lie in (0, 1].
//
// It returns a [*ParamError] for a bad threshold, and the errors of
// [Sample] for a bad beam.
func Apertures(sys paraxial.System, in Input, minTransmission float64) ([]Clip, error) {
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
	var out []Clip
	for i, e := range sys.Elements() {
		next := a.Transform(e.X, e.Y, e.IndexOut)
		if e.Kind == paraxial.KindSpace {
			a = next
			continue
		}
		if e.Aperture > 0 {
			wx := max(a.X.Radius(), next.X.Radius())
			wy := max(a.Y.Radius(), next.Y.Radius())
			if !finite(float64(wx)) || !finite(float64(wy)) {
				return nil, ErrOverflow
			}
			label := e.Label
			if label == "" {
				label = "element " + strconv.Itoa(i) + " (" + e.Kind.String() + ")"
			}
			t := CircularTransmission(e.Aperture, wx, wy)
			out = append(out, Clip{
				Element: i, Label: label, Z: e.Z, Aperture: e.Aperture,
				W: wx, WY: wy, Transmission: t, MinTransmission: minTransmission,
				Low: t < minTransmission,
			})
		}
		a = next
	}
	return out, nil
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
	// Z holds the sample positions in metres (the caustic's Z).
	Z []float64
	// Peak holds 2P/(π wx wy) at each sample, in W/m².
	Peak []float64
	// Max is the largest value of Peak, in W/m², found at MaxZ (metres)
	// where the beam radii are MaxW and MaxWY (metres). The caustic
	// samples every real waist, so for a round beam Max is exact; for a
	// beam with separate x and y foci the true maximum of 1/(wx wy) lies
	// between them and Max is the largest sampled value.
	Max         float64
	MaxZ        units.Length
	MaxW, MaxWY units.Length
	// Note is [SafetyNote]; show it wherever the values are shown.
	Note string
}

// Irradiance returns the on-axis peak irradiance 2P/(π wx wy) along c for
// a beam of power P = power watts ([PeakIrradiance]), with [SafetyNote]
// attached. It returns a [*ParamError] unless power is positive and
// finite, and [ErrOverflow] if c holds a zero or non-finite radius.
func (c Caustic) Irradiance(power float64) (Irradiance, error) {
	if !finite(power) || !(power > 0) {
		return Irradiance{}, &ParamError{Param: "power P (W)", Value: power, Reason: "must be positive and finite"}
	}
	n := len(c.Z)
	if n == 0 || len(c.W) != n || len(c.WY) != n {
		return Irradiance{}, &ParamError{Param: "caustic samples", Value: float64(n), Reason: "need matching Z, W and WY; use Sample"}
	}
	ir := Irradiance{Power: power, Z: c.Z, Peak: make([]float64, n), Max: math.Inf(-1), Note: SafetyNote}
	for i := range n {
		v := PeakIrradiance(power, units.Length(c.W[i]), units.Length(c.WY[i]))
		if !finite(v) || !(v > 0) {
			return Irradiance{}, ErrOverflow
		}
		ir.Peak[i] = v
		if v > ir.Max {
			ir.Max, ir.MaxZ, ir.MaxW, ir.MaxWY = v, units.Length(c.Z[i]), units.Length(c.W[i]), units.Length(c.WY[i])
		}
	}
	return ir, nil
}

// Summary returns a short text: the power, the largest peak irradiance,
// where it occurs and the beam radius there, followed by [SafetyNote] on
// a new paragraph, for example
//
//	Peak irradiance 2P/(π wx wy) for P = 20 mW: at most 6.37e+07 W/m² (6.37e+03 W/cm²) at z = 312 mm, where w = 14.1 µm.
//
//	Laser safety: …
func (ir Irradiance) Summary() string {
	w := "w = " + short(ir.MaxW)
	if short(ir.MaxW) != short(ir.MaxWY) {
		w = "wx = " + short(ir.MaxW) + " and wy = " + short(ir.MaxWY)
	}
	return "Peak irradiance 2P/(π wx wy) for P = " + watts(ir.Power) + ": at most " +
		strconv.FormatFloat(ir.Max, 'e', 2, 64) + " W/m² (" + strconv.FormatFloat(ir.Max*1e-4, 'g', 3, 64) +
		" W/cm²) at z = " + ir.MaxZ.String() + ", where " + w + ".\n\n" + SafetyNote
}

// watts formats a power in W, mW or µW with four significant digits.
func watts(p float64) string {
	switch a := math.Abs(p); {
	case a >= 1:
		return strconv.FormatFloat(p, 'g', 4, 64) + " W"
	case a >= 1e-3:
		return strconv.FormatFloat(p*1e3, 'g', 4, 64) + " mW"
	default:
		return strconv.FormatFloat(p*1e6, 'g', 4, 64) + " µW"
	}
}

// short formats a length with three significant digits in the unit that
// [units.Length.String] would choose, for example "3 mm" or "16.9 µm".
func short(l units.Length) string {
	v := math.Abs(float64(l))
	switch {
	case v >= 1 || v == 0 || !finite(v):
		return strconv.FormatFloat(float64(l), 'g', 3, 64) + " m"
	case v >= 1e-3:
		return strconv.FormatFloat(l.Millimeters(), 'g', 3, 64) + " mm"
	case v >= 1e-6:
		return strconv.FormatFloat(l.Micrometers(), 'g', 3, 64) + " µm"
	}
	return strconv.FormatFloat(l.Nanometers(), 'g', 3, 64) + " nm"
}
