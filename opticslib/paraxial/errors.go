package paraxial

import (
	"errors"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNoElement is returned (wrapped in an [*ElementError]) by
// [Builder.Build] when [Builder.Label] or [Builder.Aperture] was called
// before any element was added.
var ErrNoElement = errors.New("no element to modify")

// ErrMediumAfterElements is returned (wrapped in an [*ElementError]) when
// [Builder.Medium] is called after elements were added; a change of medium
// inside a system needs an interface.
var ErrMediumAfterElements = errors.New("medium can only be set before the first element; use an interface to change index")

// ElementError reports an invalid parameter of one element given to a
// [Builder]. Its message has the form
//
//	paraxial: element 3 (thin lens): focal length f = 0 m: must be nonzero and finite
//
// Index is the 0-based element number (the number the element would have
// had if it had been accepted); Kind its type; Param the parameter name with
// its symbol; Value the rejected value in SI units (metres for lengths);
// Reason what is required. Err, when not nil, is a sentinel such as
// [ErrNoElement] and is returned by Unwrap.
type ElementError struct {
	Index  int
	Kind   Kind
	Op     string // builder method, used when the error is not about an element parameter
	Param  string
	Value  float64
	Length bool // Value is a length in metres, printed with units.Length
	Reason string
	Err    error
}

// Error implements the error interface.
func (e *ElementError) Error() string {
	s := "paraxial: element " + strconv.Itoa(e.Index)
	if e.Op != "" {
		s = "paraxial: " + e.Op + " at element " + strconv.Itoa(e.Index)
	} else {
		s += " (" + e.Kind.String() + ")"
	}
	if e.Param != "" {
		s += ": " + e.Param + " = "
		if e.Length {
			s += units.Length(e.Value).String()
		} else {
			s += strconv.FormatFloat(e.Value, 'g', -1, 64)
		}
	}
	if e.Reason != "" {
		s += ": " + e.Reason
	}
	if e.Err != nil {
		s += ": " + strings.TrimPrefix(e.Err.Error(), "paraxial: ")
	}
	return s
}

// Unwrap returns e.Err.
func (e *ElementError) Unwrap() error { return e.Err }
