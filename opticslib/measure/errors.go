package measure

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError].
var (
	// ErrTooFewPoints: fewer measurements than the method needs.
	ErrTooFewPoints = errors.New("measure: too few points")
	// ErrInput: a malformed file or column, a missing column, a unit
	// that is not understood or does not fit the quantity.
	ErrInput = errors.New("measure: bad input")
	// ErrNotPhysical: a width or power that cannot be (zero, negative,
	// not finite), or a fit whose result is not a beam (a caustic that
	// opens downwards, a negative M² term).
	ErrNotPhysical = errors.New("measure: not physical")
)

// ParamError is the error of a bad measurement or parameter: it names
// where (a file and line, or a parameter), the value with its unit, and
// the requirement.
type ParamError struct {
	// Where names the input: "widths.csv line 7", "knife-edge scan",
	// "profile image".
	Where string
	// Param names the parameter or column, for example "column d_um".
	Param string
	// Value is the offending value in SI units (a units.Length, a
	// float64, an int, a string) or nil.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is a wrapped sentinel or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("measure", e.Where, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }
