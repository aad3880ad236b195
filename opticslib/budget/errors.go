package budget

import (
	"errors"
	"math"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError].
var (
	// ErrConflict: two surface statements ([Builder.AR], [Builder.Mirror],
	// [Builder.Split]) on one part, or two couplings at one label.
	ErrConflict = errors.New("budget: the part already has a statement of this kind")
	// ErrNoSurface: a surface statement on a part without the surface it
	// needs (an AR coating on a part with no refracting surface or lens, a
	// reflectance or split on a lone space).
	ErrNoSurface = errors.New("budget: the part has no surface for this statement")
	// ErrActive: an inserted Jones matrix that would add power (largest
	// singular value above 1); the elements of a budget are passive.
	ErrActive = errors.New("budget: the matrix amplifies; a passive element has power gain ≤ 1")
)

// ParamError reports an invalid statement, input or result of a power
// budget. Its message has the form
//
//	budget: Mirror "M1" (call 2): reflectance R = 1.2: must be in [0, 1]
//	budget: input: power P0 = -0.01 W: must be positive and finite
//
// naming the builder call and its label (or the input, or the element of
// the system), the parameter and the value with its unit (see package
// internal/errtext).
type ParamError struct {
	// Subject names the builder call with its label and number
	// (`Mirror "M1" (call 2)`), "input", or an element of the system
	// ([paraxial.Element.Name]).
	Subject string
	// Param names the parameter with its symbol, for example
	// "reflectance R".
	Param string
	// Value is the offending value: a float64, a string (a label, quoted,
	// or a power with its unit), a units.Length, a complex128; nil when
	// there is none.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is a wrapped sentinel ([ErrConflict], [ErrNoSurface],
	// [ErrActive], [paraxial.ErrNoLabel], [paraxial.ErrAmbiguousLabel],
	// [paraxial.ErrNotBuilt]) or an error of package beam or polar; nil
	// when there is none.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("budget", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// watts formats a power in W for an error message, all digits.
func watts(p float64) string { return errtext.Value(p) + " W" }
