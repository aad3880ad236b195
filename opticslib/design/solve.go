package design

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// DefaultScanIntervals is the number of equal intervals [SolveOne] scans
// a variable's bounds in, when [ScanSettings] does not say.
const DefaultScanIntervals = 200

// ScanSettings tunes [SolveOne]; a nil *ScanSettings, or a zero field,
// means the default.
type ScanSettings struct {
	// Intervals is the number of equal intervals the bounds are scanned
	// in for sign changes (default [DefaultScanIntervals]). Two roots
	// closer together than (Max − Min)/Intervals may be missed, and so is
	// a root where the miss touches zero without changing sign.
	Intervals int
	// XTol is the tolerance of each root in the variable, in metres
	// (default 1e-12 of the larger magnitude of the bounds, at least
	// 1 fm).
	XTol units.Length
}

// Roots is the result of [SolveOne]: every value of the variable, within
// its bounds, at which the goal's value equals its aim.
type Roots struct {
	// Variable is the variable solved for and Goal the goal solved.
	Variable Variable
	Goal     Goal
	// Values are the roots in increasing order, in metres.
	Values []units.Length
	// Systems are the systems at the roots, and Evaluations each judged
	// against every goal of the problem (the solved goal first).
	Systems     []paraxial.System
	Evaluations []Evaluation
	// FuncEvaluations counts the systems built and measured by the scan
	// and the root searches.
	FuncEvaluations int
}

// SolveOne solves a single condition: p must have exactly one variable,
// and its first goal is solved for (further goals are evaluated at each
// root and reported, not solved). The condition is a zero of the goal's
// signed miss from its aim,
//
//	m(x) = value(x) − aim,
//
// where the aim is the wanted value of a Near goal, the middle of a
// Between goal's range, or the limit of an AtLeast or AtMost goal. The
// variable's bounds [Min, Max] are scanned at Intervals + 1 equally
// spaced values for sign changes, and each bracketed sign change is
// refined by Brent's method ([Root]) to XTol. A practitioner's "the
// spacing that puts the waist on the far wall" can have two roots, on
// either side of the spacing that puts the waist farthest out (S. A.
// Self, "Focusing of spherical Gaussian beams", Appl. Opt. 22, 658–661
// (1983): the waist distance behind a lens has a maximum); all are
// returned, in increasing order.
//
// Scan points where the goal cannot be computed (an image at infinity,
// no real waist) are skipped, and a sign change across a pole (the value
// jumps through infinity, as an image distance does when the object
// crosses a focal plane) is not a root: it is dropped when the miss at
// the converged point exceeds the smaller miss at the bracket's ends.
//
// It returns a *ParamError for an invalid problem ([Problem.Validate]),
// for a number of variables other than one, and, wrapping
// [ErrInfeasible], when no root lies within the bounds: the message names
// the goal, the variable and its bounds, and gives the goal's value at
// both bounds and the range of values the scan met.
func SolveOne(p Problem, s *ScanSettings) (Roots, error) {
	if err := p.Validate(); err != nil {
		return Roots{}, err
	}
	if len(p.Variables) != 1 {
		return Roots{}, &ParamError{Param: "number of variables", Value: len(p.Variables), Reason: "SolveOne solves for exactly one; use Minimize for several"}
	}
	v, g := p.Variables[0], p.Goals[0]
	gname := "goal " + errtext.Quote(g.Name)
	if v.Min == v.Max {
		return Roots{}, v.fail("bounds", "["+v.Min.String()+", "+v.Max.String()+"]", "are one value: nothing to solve for "+gname, ErrBounds)
	}
	n := DefaultScanIntervals
	lo, hi := float64(v.Min), float64(v.Max)
	xtol := max(1e-12*math.Max(math.Abs(lo), math.Abs(hi)), 1e-15)
	if s != nil {
		if s.Intervals < 0 || s.Intervals > 1<<20 {
			return Roots{}, &ParamError{Param: "ScanSettings.Intervals", Value: s.Intervals, Reason: "must be 0 (default) to 1048576"}
		}
		if s.Intervals > 0 {
			n = s.Intervals
		}
		if s.XTol < 0 || math.IsNaN(float64(s.XTol)) || math.IsInf(float64(s.XTol), 0) {
			return Roots{}, &ParamError{Param: "ScanSettings.XTol", Value: s.XTol, Reason: "must be 0 (default) or positive and finite"}
		}
		if s.XTol > 0 {
			xtol = float64(s.XTol)
		}
	}
	aim := g.aim()
	r := Roots{Variable: v, Goal: g}
	// miss builds the system at x and returns the goal's target and its
	// signed miss from the aim.
	miss := func(x float64) (float64, target.Target, error) {
		r.FuncEvaluations++
		sys, err := p.Apply([]units.Length{units.Length(x)})
		if err != nil {
			return 0, target.Target{}, err
		}
		t, err := g.Target(sys)
		if err != nil {
			return 0, target.Target{}, err
		}
		m := t.Value - aim
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return 0, t, &ParamError{Subject: gname, Param: "value", Value: t.ValueText(), Reason: "is not finite", Err: ErrNotFinite}
		}
		return m, t, nil
	}
	f := func(x float64) (float64, error) { m, _, err := miss(x); return m, err }
	type point struct {
		x, m float64
		t    target.Target
		err  error
	}
	pts := make([]point, n+1)
	for i := range pts {
		x := lo + (hi-lo)*float64(i)/float64(n)
		if i == n {
			x = hi
		}
		m, t, err := miss(x)
		pts[i] = point{x, m, t, err}
	}
	var roots, poles []float64
	for i, pt := range pts {
		if pt.err != nil {
			continue
		}
		if pt.m == 0 {
			roots = append(roots, pt.x)
			continue
		}
		if i == 0 || pts[i-1].err != nil || pts[i-1].m == 0 || (pts[i-1].m > 0) == (pt.m > 0) {
			continue
		}
		a := pts[i-1]
		x, err := Root(f, a.x, pt.x, xtol)
		if err != nil {
			// The goal cannot be computed somewhere inside the bracket:
			// no continuous sign change there.
			continue
		}
		mx, err := f(x)
		if err != nil || math.Abs(mx) > math.Min(math.Abs(a.m), math.Abs(pt.m)) {
			poles = append(poles, x)
			continue
		}
		roots = append(roots, x)
	}
	if len(roots) == 0 {
		var seen []target.Target
		for _, pt := range pts {
			if pt.err == nil {
				seen = append(seen, pt.t)
			}
		}
		return Roots{}, noRoot(v, gname, g, pts[0].t, pts[0].err, pts[n].t, pts[n].err, seen, poles)
	}
	for _, x := range roots {
		sys, err := p.Apply([]units.Length{units.Length(x)})
		if err != nil {
			return Roots{}, err
		}
		e, err := p.Evaluate(sys)
		if err != nil {
			return Roots{}, err
		}
		r.Values = append(r.Values, units.Length(x))
		r.Systems = append(r.Systems, sys)
		r.Evaluations = append(r.Evaluations, e)
	}
	return r, nil
}

// noRoot returns the error of a root search that found no root: the goal,
// the variable with its bounds, the values at both bounds and the range
// of values the scan met.
func noRoot(v Variable, gname string, g Goal, tlo target.Target, elo error, thi target.Target, ehi error, seen []target.Target, poles []float64) error {
	at := func(t target.Target, err error, bound string) string {
		if err != nil {
			return "not computable at " + bound + " (" + err.Error() + ")"
		}
		return t.ValueText() + " at " + bound
	}
	reason := "no root for " + v.Name() + " within its bounds [" + v.Min.String() + ", " + v.Max.String() + "]: the value is " +
		at(tlo, elo, "Min") + " and " + at(thi, ehi, "Max")
	if len(seen) == 0 {
		reason += "; the goal is not computable anywhere in the scan"
	} else {
		lo, hi := seen[0], seen[0]
		for _, t := range seen {
			if t.Value < lo.Value {
				lo = t
			}
			if t.Value > hi.Value {
				hi = t
			}
		}
		reason += " (" + lo.ValueText() + " … " + hi.ValueText() + " over the scan)"
	}
	reason += ", wanted " + g.Wanted()
	if len(poles) > 0 {
		reason += "; the value jumps through infinity near " + v.Name() + " = " + units.Length(poles[0]).String() + ", which is a pole, not a root"
	}
	return &ParamError{Subject: gname, Reason: reason + "; widen the bounds or change the goal", Err: ErrInfeasible}
}

// Table returns one row per root: the variable's value, the solved
// goal's value and whether every goal of the problem is met there.
func (r Roots) Table() table.Table {
	u, sym := table.LengthUnit(r.Values...)
	t := table.Table{
		Caption: "Roots of goal " + errtext.Quote(r.Goal.Name) + " (aim: wanted " + r.Goal.Wanted() + ") for " + r.Variable.Name() +
			" in [" + r.Variable.Min.String() + ", " + r.Variable.Max.String() + "]",
		Header: []string{"root", r.Variable.Name() + " (" + sym + ")", r.Goal.Name, "every goal met"},
	}
	for i, x := range r.Values {
		e := r.Evaluations[i]
		met := "yes"
		if !e.Met() {
			met = "no: " + missedNames(e)
		}
		t.Rows = append(t.Rows, []string{strconv.Itoa(i + 1), table.Sig(float64(x/u), 7), e.Targets[0].ValueText(), met})
	}
	return t
}

// String returns the table as text.
func (r Roots) String() string { return r.Table().Text() }

// missedNames lists the goals e misses, quoted, separated by commas.
func missedNames(e Evaluation) string {
	s := ""
	for _, t := range e.Targets {
		if !t.Met() {
			if s != "" {
				s += ", "
			}
			s += errtext.Quote(t.Name)
		}
	}
	return s
}
