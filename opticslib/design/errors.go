package design

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]:
var (
	// ErrBounds: a variable's bounds are empty, reversed or not finite.
	ErrBounds = errors.New("design: invalid bounds")
	// ErrNoBracket: a root search's interval does not bracket a sign
	// change of the function.
	ErrNoBracket = errors.New("design: no sign change in the interval")
	// ErrGoal: a goal's value could not be computed for a system.
	ErrGoal = errors.New("design: goal not computable")
	// ErrNotFinite: a function returned NaN or ±Inf.
	ErrNotFinite = errors.New("design: value not finite")
	// ErrInfeasible: no value within the bounds meets the goals: a root
	// search ([SolveOne]) found no root inside the variable's bounds, or
	// the minimiser ([Minimize]) converged to a point that misses goals
	// (the bounds exclude the solution, or the goals conflict).
	ErrInfeasible = errors.New("design: goals not met within the bounds")
	// ErrNotConverged: the minimiser stopped before it converged (its
	// evaluation limit, or a failure of the method) and its best point
	// misses goals.
	ErrNotConverged = errors.New("design: optimiser did not converge")
)

// ParamError is the error of this package: Subject names the goal or
// variable ("goal \"output waist\"", "variable \"gap\""), Param the
// parameter, Value its value (with its unit when it is a units type), and
// Reason what is wrong; Err is the wrapped sentinel or cause.
type ParamError struct {
	Subject string
	Param   string
	Value   any
	Reason  string
	Err     error
}

// Error implements the error interface: "design: subject: param = value
// unit: reason: cause".
func (e *ParamError) Error() string {
	return errtext.Message("design", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns the wrapped error.
func (e *ParamError) Unwrap() error { return e.Err }

func fmtG(v float64) string { return errtext.Value(v) }
