package polar

import (
	"math"

	"gonum.org/v1/gonum/optimize"

	"github.com/beamnote/beamnote/opticslib/units"
)

// linearTol is the relative size of S3/S0 below which light counts as
// linear for [QuarterWaveForCircular], and of √(S1²+S2²)/S0 below which it
// counts as circular (no azimuth) for [HalfWaveForAzimuth]: far above the
// 1e-16 that rounding leaves in a state made by the package's elements,
// far below any deliberate ellipticity (1e-9 is χ = 2.9e-8°).
const linearTol = 1e-9

// HalfWaveForAzimuth returns the fast-axis angle θ of a half-wave plate
// that turns the light in so that its ellipse's azimuth becomes the wanted
// one. Closed form: a half-wave plate mirrors the azimuth about its fast
// axis, ψ' = 2θ − ψ ([HalfWave]), so
//
//	θ = (ψ + ψ')/2,   reduced to (−45°, 45°]
//
// (the plate's matrix repeats, up to sign, every 90°). The ellipticity
// keeps its size and reverses its sign. It returns a [*ParamError] for a
// non-finite angle, an input without light ([ErrNoLight]) or circular
// input, which has no azimuth ([ErrUnreachable]).
func HalfWaveForAzimuth(in Jones, azimuth units.Angle) (units.Angle, error) {
	if err := checkState("HalfWaveForAzimuth", "input", in, true); err != nil {
		return 0, err
	}
	if err := checkAngle("HalfWaveForAzimuth", "wanted azimuth ψ'", azimuth); err != nil {
		return 0, err
	}
	s := in.Stokes()
	if math.Hypot(s.S1, s.S2) <= linearTol*s.S0 {
		return 0, &ParamError{Element: "HalfWaveForAzimuth", Param: "input", Value: in.String(), Reason: "circular light has no azimuth for a half-wave plate to turn", Err: ErrUnreachable}
	}
	return reduce(float64(s.Ellipse().Azimuth+azimuth)/2, math.Pi/2), nil
}

// HalfWaveForSplit returns the fast-axis angle θ of a half-wave plate
// that sends the wanted fraction f of the power of in along x: the p
// port of a following [PolarizingBeamSplitter] (ideal), the rest, 1 − f,
// along y to the s port. Closed form: after the plate the azimuth is
// ψ' = 2θ − ψ and the ellipticity |χ| is unchanged, and the power along x
// is
//
//	f = (1 + cos 2χ cos 2ψ')/2    (Malus's law for elliptical light)
//
// so ψ' = ½ acos((2f − 1)/cos 2χ) ∈ [0°, 90°] and θ = (ψ + ψ')/2, reduced
// to (−45°, 45°]. The other solution, ψ' → −ψ', is θ − ψ'. Linear light
// reaches every f; elliptical light only |2f − 1| ≤ cos 2χ (circular
// light only f = ½, for any θ).
//
// It returns a [*ParamError] for f outside [0, 1] or NaN, an input
// without light ([ErrNoLight]), or a fraction the input's ellipticity
// cannot give ([ErrUnreachable]).
func HalfWaveForSplit(in Jones, fraction float64) (units.Angle, error) {
	if err := checkState("HalfWaveForSplit", "input", in, true); err != nil {
		return 0, err
	}
	if math.IsNaN(fraction) || fraction < 0 || fraction > 1 {
		return 0, &ParamError{Element: "HalfWaveForSplit", Param: "fraction along x f", Value: fraction, Reason: "must be in [0, 1]"}
	}
	s := in.Stokes()
	lin := math.Hypot(s.S1, s.S2) / s.S0 // cos 2χ
	want := 2*fraction - 1
	if math.Abs(want) > lin*(1+1e-12)+1e-15 {
		lo, hi := (1-lin)/2, (1+lin)/2
		return 0, &ParamError{Element: "HalfWaveForSplit", Param: "fraction along x f", Value: fraction,
			Reason: "elliptical input (cos 2χ = " + formatG(lin) + ") reaches only f in [" + formatG(lo) + ", " + formatG(hi) + "]", Err: ErrUnreachable}
	}
	c := 1.0
	if lin > 0 {
		c = math.Max(-1, math.Min(1, want/lin))
	}
	psiOut := math.Acos(c) / 2
	return reduce((float64(s.Ellipse().Azimuth)+psiOut)/2, math.Pi/2), nil
}

// QuarterWaveForCircular returns the fast-axis angle θ of a quarter-wave
// plate that turns the linear light in into circular light of the wanted
// handedness. Closed form ([QuarterWave]): the fast axis at 45° to the
// light's azimuth ψ,
//
//	Right: θ = ψ + 45°,   Left: θ = ψ − 45°,   reduced to (−90°, 90°]
//
// Only linear light becomes exactly circular: on the Poincaré sphere a
// quarter-wave plate turns states by 90° about an axis on the equator,
// which brings only equator points (linear states) to a pole. It returns a
// [*ParamError] for another Handedness value, an input without light
// ([ErrNoLight]) or elliptical input, |S3/S0| > 1e-9 ([ErrUnreachable]; use
// [PlateForMaxPower] with a circular analyser for the best a plate can
// do).
func QuarterWaveForCircular(in Jones, h Handedness) (units.Angle, error) {
	if err := checkState("QuarterWaveForCircular", "input", in, true); err != nil {
		return 0, err
	}
	var offset float64
	switch h {
	case Right:
		offset = math.Pi / 4
	case Left:
		offset = -math.Pi / 4
	default:
		return 0, &ParamError{Element: "QuarterWaveForCircular", Param: "handedness", Value: int(h), Reason: "must be Right or Left"}
	}
	s := in.Stokes()
	if math.Abs(s.S3) > linearTol*s.S0 {
		return 0, &ParamError{Element: "QuarterWaveForCircular", Param: "input ellipticity angle χ", Value: s.Ellipse().Ellipticity,
			Reason: "a quarter-wave plate makes circular light only from linear light", Err: ErrUnreachable}
	}
	return reduce(float64(s.Ellipse().Azimuth)+offset, math.Pi), nil
}

// Setting is a waveplate orientation found by [PlateForMaxPower] or
// [PlateForMinPower].
type Setting struct {
	// FastAxis is the fast-axis angle θ from x, in [0°, 180°).
	FastAxis units.Angle
	// Fraction is the power after the following elements over the power
	// of the input (dimensionless).
	Fraction float64
	// Power is Fraction times the input power, in the caller's unit.
	Power float64
}

// PlateForMaxPower returns the fast-axis angle of a retarder of
// retardance Γ ([Retarder]), placed in the beam in, that maximises the
// power after the elements that follow it, given as one matrix (for
// example an analyser [Polarizer], or a [Ports] matrix of a beam
// splitter).
//
// There is no closed form for a general Γ and analyser, so the angle is
// found numerically with gonum/optimize (BFGS, with the analytic
// derivative of the power in θ). The power is a trigonometric polynomial
// of degree 2 in 2θ, so it has at most two maxima per 180°; the search
// starts from 16 angles 11.25° apart, and the best result wins (the
// smallest angle among results within 1e-12 of the best fraction, so the
// answer is deterministic). The closed forms of [HalfWaveForAzimuth],
// [HalfWaveForSplit] and [QuarterWaveForCircular] cover the half- and
// quarter-wave cases with a linear input. When the power does not depend
// on θ (Γ = 0, or circular light into a half-wave plate, which leaves it
// in the opposite circular state at every θ), θ = 0 is returned.
//
// It returns a [*ParamError] for an input without light ([ErrNoLight]),
// non-finite input or elements, a non-finite retardance, or a failure of
// the optimizer (wrapped).
func PlateForMaxPower(in Jones, retardance units.Angle, after JonesMatrix) (Setting, error) {
	return plateSearch("PlateForMaxPower", in, retardance, after, -1)
}

// PlateForMinPower is [PlateForMaxPower] for the smallest power after the
// following elements: the waveplate angle that best nulls a port or
// extinguishes the light at an analyser.
func PlateForMinPower(in Jones, retardance units.Angle, after JonesMatrix) (Setting, error) {
	return plateSearch("PlateForMinPower", in, retardance, after, 1)
}

// plateSearch minimises sign·fraction(θ) with gonum/optimize from a set
// of starting angles.
func plateSearch(name string, in Jones, retardance units.Angle, after JonesMatrix, sign float64) (Setting, error) {
	if err := checkState(name, "input", in, true); err != nil {
		return Setting{}, err
	}
	if err := checkAngle(name, "retardance Γ", retardance); err != nil {
		return Setting{}, err
	}
	if err := checkMatrix(name, "following elements", after); err != nil {
		return Setting{}, err
	}
	p0 := in.Power()
	gamma := float64(retardance)
	sg := math.Sin(gamma / 2)
	// fraction(θ) = |A W(θ) v|²/|v|² and its derivative
	// 2 Re((A W v)ᴴ A W'(θ) v)/|v|², with W' = 2i sin(Γ/2) [[−sin 2θ, cos 2θ], [cos 2θ, sin 2θ]].
	frac := func(theta float64) float64 {
		return retarder(theta, gamma).Then(after).Apply(in).Power() / p0
	}
	problem := optimize.Problem{
		Func: func(x []float64) float64 { return sign * frac(x[0]) },
		Grad: func(grad, x []float64) {
			out := retarder(x[0], gamma).Then(after).Apply(in)
			s2, c2 := math.Sincos(2 * x[0])
			dw := JonesMatrix{XX: complex(0, -2*sg*s2), XY: complex(0, 2*sg*c2), YX: complex(0, 2*sg*c2), YY: complex(0, 2*sg*s2)}
			d := dw.Then(after).Apply(in)
			dot := conj(out.X)*d.X + conj(out.Y)*d.Y
			grad[0] = sign * 2 * real(dot) / p0
		},
	}
	settings := &optimize.Settings{
		GradientThreshold: 1e-13,
		Converger:         &optimize.FunctionConverge{Absolute: 1e-15, Iterations: 20},
		MajorIterations:   200,
	}
	const starts = 16
	best := Setting{Fraction: math.NaN()}
	var lastErr error
	for k := range starts {
		x0 := float64(k) * math.Pi / starts
		res, err := optimize.Minimize(problem, []float64{x0}, settings, &optimize.BFGS{})
		if res == nil || len(res.X) != 1 || !finite(res.X[0]) {
			lastErr = err
			continue
		}
		theta := reduce0(res.X[0], math.Pi)
		f := frac(theta)
		switch {
		case math.IsNaN(best.Fraction), sign*(f-best.Fraction) < -1e-12:
			best = Setting{FastAxis: units.Angle(theta), Fraction: f}
		case math.Abs(f-best.Fraction) <= 1e-12 && theta < float64(best.FastAxis):
			best = Setting{FastAxis: units.Angle(theta), Fraction: f}
		}
	}
	if math.IsNaN(best.Fraction) {
		return Setting{}, &ParamError{Element: name, Param: "retardance Γ", Value: retardance, Reason: "the optimizer found no angle", Err: lastErr}
	}
	if math.Abs(frac(0)-best.Fraction) <= 1e-12 && flat(frac) {
		best = Setting{FastAxis: 0, Fraction: frac(0)}
	}
	best.Power = best.Fraction * p0
	return best, nil
}

// flat reports whether f varies by at most 1e-12 over 8 angles across
// 180°: a power that does not depend on the plate's angle.
func flat(f func(float64) float64) bool {
	f0 := f(0)
	for k := 1; k < 8; k++ {
		if math.Abs(f(float64(k)*math.Pi/8)-f0) > 1e-12 {
			return false
		}
	}
	return true
}

// reduce returns x reduced modulo period into (−period/2, period/2].
func reduce(x, period float64) units.Angle {
	r := math.Mod(x, period)
	if r > period/2 {
		r -= period
	} else if r <= -period/2 {
		r += period
	}
	return units.Angle(r)
}

// reduce0 returns x reduced modulo period into [0, period).
func reduce0(x, period float64) float64 {
	r := math.Mod(x, period)
	if r < 0 {
		r += period
	}
	if r >= period {
		r = 0
	}
	return r
}
