package couple

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]; test for them with errors.Is.
var (
	// ErrMismatch: the two beams do not share the vacuum wavelength and
	// the refractive index, so their overlap at one plane is not defined.
	ErrMismatch = errors.New("couple: the beams must have the same vacuum wavelength and index")
	// ErrTwoPartial: both beams have M² > 1; one of them must be a mode
	// (TEM₀₀) for the coupling to be defined.
	ErrTwoPartial = errors.New("couple: both beams have M² > 1; one must be a TEM₀₀ mode")
	// ErrNotSingleMode: the V-number is above the LP₁₁ cut-off 2.405, so
	// the fibre guides more than one mode at this wavelength.
	ErrNotSingleMode = errors.New("couple: V-number above the LP11 cut-off 2.405 (not single-mode at this wavelength)")
	// ErrOutsideFit: the V-number is below the range of Marcuse's fit.
	ErrOutsideFit = errors.New("couple: V-number below 1.2, outside the range of Marcuse's fit")
	// ErrNoSolution: a mode-matching closed form has no physical
	// solution (the lens is too weak, or the solutions fall outside the
	// path), or [Solve] cannot reach the Problem's MinEfficiency inside
	// its bounds or under the model's bound for M² > 1.
	ErrNoSolution = errors.New("couple: no mode-matching solution")
)

// ParamError reports an invalid parameter or a problem without solution.
// Its message has the one form of the optics packages,
//
//	couple: subject: parameter = value unit: reason: cause
//
// for example
//
//	couple: fibre: mode-field diameter MFD = -5 µm: must be positive and finite
type ParamError struct {
	// Subject names where the problem is ("beam a", "fibre", `lens "L1"`)
	// or is empty.
	Subject string
	// Param names the parameter with its symbol.
	Param string
	// Value is the offending value in SI units (units.Length,
	// units.Angle, float64, int) or nil.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is a wrapped sentinel of this package or of package beam or
	// paraxial, or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("couple", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }
