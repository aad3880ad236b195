package paraxial

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// ErrNoElement is returned (wrapped in an [*ElementError]) by
// [Builder.Build] when [Builder.Label] or [Builder.Aperture] was called
// before any element was added.
var ErrNoElement = errors.New("no element to modify")

// ErrMediumAfterElements is returned (wrapped in an [*ElementError]) when
// [Builder.Medium] is called after elements were added; a change of medium
// inside a system needs an interface.
var ErrMediumAfterElements = errors.New("medium can only be set before the first element; use an interface to change index")

// ErrNotBuilt is returned by the analyses, the edits and the beam
// functions for the zero [System] value, which no [Builder.Build] made
// (typically the System returned beside a Build error that was not
// checked).
var ErrNotBuilt = errors.New("paraxial: system not built (the zero System value); use Builder.Build and check its error")

// ErrPlane is returned (wrapped in an [*ElementError] by the builder) for a
// [Plane] value other than Tangential and Sagittal.
var ErrPlane = errors.New("paraxial: plane must be Tangential or Sagittal")

// ErrAmbiguousLabel is returned (wrapped in an [*ElementError]) by the
// edits and lookups by label when the label names two separate parts.
var ErrAmbiguousLabel = errors.New("the label names more than one part")

// ErrNoLabel is returned (wrapped in an [*ElementError]) by the edits and
// lookups by label when no element carries the label.
var ErrNoLabel = errors.New("no element has this label")

// ElementError reports an invalid parameter of one builder call, or an
// edit or analysis that cannot be done on one part of a system. Its
// message names the builder call and its label, the parameter and the
// value with its unit:
//
//	paraxial: ThickLens "L2" (call 4): front radius R1 = 0 m: must be nonzero and not NaN (use paraxial.Flat for a flat side)
//	paraxial: ConcaveMirror "M1" (call 6): angle of incidence θ = 95° (1.65806 rad): must be finite with |θ| < 90°
//
// Test for the sentinels it wraps with errors.Is.
type ElementError struct {
	// Method is the [Builder] method of the call ("ThickLens"), or the
	// [System] method of an edit or analysis ("Move", "Stops").
	Method string
	// Call is the number of the builder call, counted from 1; 0 when the
	// error is not about one call.
	Call int
	// Label is the label of the part, or "".
	Label string
	// Index is the index in [System.Elements] of the (first) element
	// concerned, or the index it would have had; −1 if none. Messages do
	// not print it (a thick lens is three elements).
	Index int
	// Kind is the kind of the element or component.
	Kind Kind
	// Param names the parameter with its symbol, Value is the rejected
	// value in SI units as a units.Length, units.Angle, float64 or int
	// (printed with its unit), Reason what is required.
	Param  string
	Value  any
	Reason string
	// Err is a wrapped sentinel such as [ErrNoElement] or [ErrOverflow],
	// or nil.
	Err error
}

// Error implements the error interface.
func (e *ElementError) Error() string {
	return errtext.Message("paraxial", callName(e.Method, e.Label, e.Call, e.Kind), e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ElementError) Unwrap() error { return e.Err }

// elementError returns an error about element i (e) of a built system;
// the caller fills in Param, Value, Reason or Err.
func elementError(i int, e Element) *ElementError {
	return &ElementError{Method: e.Method, Call: e.Call, Label: e.Label, Index: i, Kind: e.Kind}
}
