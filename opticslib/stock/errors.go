package stock

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]:
var (
	// ErrInput: a malformed stock file or lens: a missing or unknown
	// column, a cell that is not a number, a unit that does not fit, a
	// kind that does not match the radii.
	ErrInput = errors.New("stock: bad input")
	// ErrNotPhysical: a lens that cannot be made: no power, a radius
	// smaller than half the diameter, a negative edge thickness, an index
	// not above 1.
	ErrNotPhysical = errors.New("stock: not physical")
	// ErrEmpty: a stock with no lenses, or fewer than a search needs.
	ErrEmpty = errors.New("stock: empty stock")
	// ErrBounds: search bounds that are invalid or leave no room for a
	// solution (the length budget is used up before the first gap).
	ErrBounds = errors.New("stock: invalid bounds")
	// ErrNoCandidate: no combination of the stock meets the conditions
	// and goals of a search within its bounds.
	ErrNoCandidate = errors.New("stock: no combination meets the goals")
)

// ParamError is the error of this package. Where names the input ("drawer.csv
// line 12", "lens \"PCX-050-A\"", "search", "goal \"output radius\""),
// Param the column, field or parameter, Value the offending value (a
// units.Length prints with its unit; text is quoted), Reason the
// requirement it fails; Err is the wrapped sentinel or cause.
type ParamError struct {
	Where  string
	Param  string
	Value  any
	Reason string
	Err    error
}

// Error implements the error interface: "stock: where: param = value
// unit: reason: cause".
func (e *ParamError) Error() string {
	return errtext.Message("stock", e.Where, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns the wrapped error.
func (e *ParamError) Unwrap() error { return e.Err }
