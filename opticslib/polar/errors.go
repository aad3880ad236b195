package polar

import (
	"errors"
	"math"
	"math/cmplx"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Sentinel errors, wrapped by [*ParamError].
var (
	// ErrUnreachable: the wanted output cannot be made with the element a
	// solver was asked about (circular light from elliptical light with a
	// quarter-wave plate, a power split beyond what a half-wave plate can
	// give, the azimuth of circular light).
	ErrUnreachable = errors.New("polar: the wanted state cannot be reached with this element")
	// ErrNoLight: an input with zero power, where a power fraction or a
	// polarization state is asked for.
	ErrNoLight = errors.New("polar: no light (zero power)")
)

// ParamError reports an invalid parameter of an element, a state or a
// solver. Its message has the form
//
//	polar: PartialPolarizer: extinction ratio Tmax/Tmin = 0.001: must be ≥ 1 …
//	polar: HalfWave: fast axis θ = NaN° (NaN rad): must be finite
//
// naming the function (the element), the parameter, and the value in its
// unit (angles in degrees and radians, see package internal/errtext).
type ParamError struct {
	// Element names the function or element, for example "HalfWave",
	// "Interface" or "Trace".
	Element string
	// Param names the parameter with its symbol, for example "fast axis θ".
	Param string
	// Value is the offending value in SI units: a units.Angle, a float64,
	// a complex128, an int or a string; nil when there is none.
	Value any
	// Reason states the requirement that Value fails, or is empty.
	Reason string
	// Err is a wrapped sentinel ([ErrUnreachable], [ErrNoLight]), an error
	// of gonum/optimize, or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("polar", e.Element, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func finiteC(z complex128) bool { return !cmplx.IsNaN(z) && !cmplx.IsInf(z) }

// checkAngle returns a *ParamError unless a is finite.
func checkAngle(element, param string, a units.Angle) error {
	if !finite(float64(a)) {
		return &ParamError{Element: element, Param: param, Value: a, Reason: "must be finite"}
	}
	return nil
}

// checkIndex returns a *ParamError unless n is finite and positive.
func checkIndex(element, param string, n float64) error {
	if !finite(n) || n <= 0 {
		return &ParamError{Element: element, Param: param, Value: n, Reason: "must be positive and finite"}
	}
	return nil
}

// checkExtinction returns a *ParamError unless er is a power extinction
// ratio Tmax/Tmin in [1, +Inf].
func checkExtinction(element, param string, er float64) error {
	if math.IsNaN(er) || er < 1 {
		reason := "must be ≥ 1 (Tmax/Tmin, for example 1000 for 1000:1; +Inf for an ideal part)"
		if er > 0 && er < 1 {
			reason += "; a ratio given as Tmin/Tmax is its reciprocal, 1/" + errtext.Value(er)
		}
		return &ParamError{Element: element, Param: param, Value: er, Reason: reason}
	}
	return nil
}

// checkState returns a *ParamError unless v has finite components and,
// when needPower, a positive power.
func checkState(element, param string, v Jones, needPower bool) error {
	if !finiteC(v.X) || !finiteC(v.Y) {
		return &ParamError{Element: element, Param: param, Value: v.String(), Reason: "components must be finite"}
	}
	if p := v.Power(); needPower && !(p > 0) {
		return &ParamError{Element: element, Param: param, Value: v.String(), Reason: "must carry light", Err: ErrNoLight}
	} else if !finite(p) {
		return &ParamError{Element: element, Param: param, Value: v.String(), Reason: "power |Ex|²+|Ey|² overflows"}
	}
	return nil
}

// checkMatrix returns a *ParamError unless m has finite entries.
func checkMatrix(element, param string, m JonesMatrix) error {
	for _, z := range [4]complex128{m.XX, m.XY, m.YX, m.YY} {
		if !finiteC(z) {
			return &ParamError{Element: element, Param: param, Value: z, Reason: "entries must be finite"}
		}
	}
	return nil
}
