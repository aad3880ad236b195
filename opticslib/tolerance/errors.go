package tolerance

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]:
var (
	// ErrDistribution: a tolerance's width is not positive and finite,
	// its shape is unknown, or its unit does not suit the perturbation.
	ErrDistribution = errors.New("tolerance: invalid distribution")
	// ErrPerturbation: a perturbation names no part of the right kind, or
	// is given twice.
	ErrPerturbation = errors.New("tolerance: invalid perturbation")
	// ErrCompensator: the compensator's variable or goal is unusable.
	ErrCompensator = errors.New("tolerance: invalid compensator")
	// ErrFast: a fast measure is missing its beam, names no goal, or
	// disagrees with its goal's own measure.
	ErrFast = errors.New("tolerance: invalid fast measure")
	// ErrTrial: one trial's system could not be built or measured (a
	// part pushed through its neighbour, a beam that no longer
	// propagates); Monte Carlo counts such trials as failed builds.
	ErrTrial = errors.New("tolerance: trial not computable")
	// ErrOptions: a Monte Carlo option is out of range.
	ErrOptions = errors.New("tolerance: invalid option")
)

// ParamError is the error of this package: Subject names the perturbation,
// goal or option ("placement \"L1\"", "goal \"output waist\""), Param the
// parameter, Value its value (with its unit when it is a units type), and
// Reason what is wrong; Err is the wrapped sentinel or cause.
type ParamError struct {
	Subject string
	Param   string
	Value   any
	Reason  string
	Err     error
}

// Error implements the error interface: "tolerance: subject: param =
// value unit: reason: cause".
func (e *ParamError) Error() string {
	return errtext.Message("tolerance", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns the wrapped error.
func (e *ParamError) Unwrap() error { return e.Err }

// because returns an error that is the sentinel s for errors.Is and
// reads as the cause: the message names the cause once, on one line
// (errors.Join would put the sentinel's text and a newline before it).
// A nil cause gives s itself.
func because(s, cause error) error {
	if cause == nil {
		return s
	}
	return &causeError{s: s, cause: cause}
}

type causeError struct{ s, cause error }

func (e *causeError) Error() string   { return e.cause.Error() }
func (e *causeError) Unwrap() []error { return []error{e.s, e.cause} }
