package plan

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError] (test with errors.Is):
var (
	// ErrBoard: a board size, pitch or margin that is not positive and
	// finite, or a grid other than Metric and Imperial.
	ErrBoard = errors.New("plan: invalid board")
	// ErrStart: a start point off the board or a start direction that is
	// not finite.
	ErrStart = errors.New("plan: invalid start")
	// ErrLabel: a label in [Spec.Folds] or [Spec.Mounts] that names no
	// part of the system (or, in Folds, names something other than one
	// mirror).
	ErrLabel = errors.New("plan: unknown label")
	// ErrFold: a mirror met off normal incidence whose fold direction
	// ([Left] or [Right]) is not given, or a fold value other than the
	// two constants.
	ErrFold = errors.New("plan: fold direction missing or invalid")
	// ErrMount: a mount size that is negative or not finite.
	ErrMount = errors.New("plan: invalid mount size")
	// ErrSystem: a system that is not built or has no parts to place.
	ErrSystem = errors.New("plan: nothing to lay out")
)

// ParamError is the error of this package. Its message has the library's
// one format,
//
//	plan: subject: parameter = value unit: reason: cause
//
// for example
//
//	plan: board: size x = -600 mm: must be positive and finite: plan: invalid board
//
// Subject names the part or setting ("board", "start", `mirror "M2"`),
// Param the parameter, Value its value (a units.Length or units.Angle is
// printed with its unit), Reason what is required, and Err the wrapped
// sentinel or cause.
type ParamError struct {
	Subject string
	Param   string
	Value   any
	Reason  string
	Err     error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("plan", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns the wrapped error.
func (e *ParamError) Unwrap() error { return e.Err }
