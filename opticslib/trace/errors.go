package trace

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]; test for them with errors.Is.
var (
	// ErrNotBuilt: the zero System, not made by [New] or [FromParaxial].
	ErrNotBuilt = errors.New("trace: system not built (use trace.New or trace.FromParaxial)")
	// ErrNotTraceable: a paraxial element that has no real-ray model (a
	// cylindrical lens, a user matrix, a tilted mirror or plate, a slit or
	// an off-centre opening).
	ErrNotTraceable = errors.New("trace: element has no real-ray model")
	// ErrIndex: a medium's refractive index could not be computed or is
	// not a finite number ≥ 1e-3 at the wavelength.
	ErrIndex = errors.New("trace: refractive index not available")
)

// ParamError reports an invalid surface, medium or wavelength. Its
// message has the one form of the optics packages,
//
//	trace: subject: parameter = value unit: reason: cause
//
// for example
//
//	trace: surface 3 "L1 back": radius R = 0 m: ...
type ParamError struct {
	// Subject names where the problem is (`surface 2 "L1 front"`,
	// `ThickLens "L1" (call 3)`) or is empty.
	Subject string
	// Param names the parameter with its symbol.
	Param string
	// Value is the offending value in SI units or nil.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is a wrapped sentinel or the medium's own error, or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("trace", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }
