package design

import (
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/boxmin"
	"gonum.org/v1/gonum/optimize"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Defaults of [Settings].
const (
	// DefaultRandomStarts is the number of seeded random starts of
	// [Minimize].
	DefaultRandomStarts = 4
	// DefaultSeed seeds the random starts.
	DefaultSeed = 1
)

// Settings tunes [Minimize]; a nil *Settings, or a zero field, means the
// default.
type Settings struct {
	// RandomStarts is the number of seeded random starts tried after the
	// start point and the grid (default [DefaultRandomStarts]; a negative
	// value means none).
	RandomStarts int
	// Seed seeds the random starts (math/rand/v2 PCG with seeds Seed and
	// 0x64657369676e; default [DefaultSeed]): the same seed gives the same
	// starts and the same solution.
	Seed uint64
	// FuncEvaluations bounds the cost evaluations of each Nelder–Mead
	// run (default 600 + 300 per free variable).
	FuncEvaluations int
}

// ActiveBound says where a solved variable lies in its bounds.
type ActiveBound int

// Where a variable lies.
const (
	// Inside: strictly between Min and Max.
	Inside ActiveBound = iota
	// AtMin and AtMax: at the bound, within 1e-6 of the range (the
	// solution may lie beyond it).
	AtMin
	AtMax
	// Fixed: Min = Max, not varied.
	Fixed
)

// String returns "inside", "at Min", "at Max" or "fixed".
func (b ActiveBound) String() string {
	switch b {
	case Inside:
		return "inside"
	case AtMin:
		return "at Min"
	case AtMax:
		return "at Max"
	case Fixed:
		return "fixed"
	}
	return "ActiveBound(" + strconv.Itoa(int(b)) + ")"
}

// VariableValue is a variable of a [Solution] with its value (metres) and
// where the value lies in the bounds.
type VariableValue struct {
	Variable Variable
	Value    units.Length
	Bound    ActiveBound
}

// Solution is the result of [Minimize].
type Solution struct {
	// System is the starting system with the variables set to Values.
	System paraxial.System
	// Values holds each variable's value, in the order of the problem.
	Values []VariableValue
	// Evaluation judges System against the goals (the targets to record).
	Evaluation Evaluation
	// Status is how gonum/optimize's run that gave the solution ended:
	// optimize.FunctionThreshold when the cost reached zero (every goal
	// met), optimize.FunctionConvergence when the cost stopped decreasing
	// (a local minimum), optimize.FunctionEvaluationLimit when the run
	// was cut off; optimize.NotTerminated when nothing was varied.
	Status optimize.Status
	// Runs is the number of Nelder–Mead runs and FuncEvaluations the
	// number of cost evaluations over all of them.
	Runs, FuncEvaluations int
	// Start names the start of the run that gave the solution: "start
	// point", "grid 3 of 9", "random 2 of 4", "polish" (a restart from the
	// best point).
	Start string
	// Centred is true when the solution was moved towards the centres of
	// the Near and Between ranges after every goal was met (see
	// [Minimize]).
	Centred bool
}

// Met reports whether every goal is met.
func (s Solution) Met() bool { return s.Evaluation.Met() }

// Converged reports whether the run that gave the solution ended by
// meeting every goal or by convergence, not by a limit or a failure.
func (s Solution) Converged() bool { return s.Runs == 0 || !s.Status.Early() }

// Stopped says why the run that gave the solution stopped, in words.
func (s Solution) Stopped() string {
	switch s.Status {
	case optimize.NotTerminated:
		if s.Runs == 0 {
			return "no free variable, evaluated only"
		}
	case optimize.FunctionThreshold:
		return "every goal met (cost 0)"
	case optimize.FunctionConvergence:
		return "the cost stopped decreasing"
	case optimize.FunctionEvaluationLimit:
		return "the evaluation limit was reached"
	}
	return s.Status.String()
}

// Table returns the solution: one row per variable (value, bounds, where
// it lies), then one per goal (value, wanted range, met or by how much
// missed), with the cost and how the optimiser ended in the caption.
func (s Solution) Table() table.Table {
	e := s.Evaluation
	head := "every goal met"
	if !e.Met() {
		n := 0
		for _, t := range e.Targets {
			if !t.Met() {
				n++
			}
		}
		head = strconv.Itoa(n) + " of " + strconv.Itoa(len(e.Targets)) + " goals missed"
	}
	how := "Nelder–Mead (gonum/optimize), " + runs(s.Runs) + ", " + strconv.Itoa(s.FuncEvaluations) + " evaluations, best from " + s.Start + ", stopped: " + s.Stopped()
	if s.Runs == 0 {
		how = s.Stopped()
	}
	if s.Centred {
		how += ", centred in the wanted ranges"
	}
	t := table.Table{
		Caption: "Solution: " + head + " (cost Σ w r² = " + table.Sig(e.Cost, 4) + "); " + how,
		Header:  []string{"", "name", "value", "wanted or bounds", "note"},
	}
	for _, v := range s.Values {
		u, sym := table.LengthUnit(v.Variable.Min, v.Variable.Max, v.Value)
		note := ""
		if v.Bound != Inside {
			note = v.Bound.String()
		}
		t.Rows = append(t.Rows, []string{"variable", v.Variable.Name(), table.Sig(float64(v.Value/u), 7) + " " + sym,
			table.Sig(float64(v.Variable.Min/u), 6) + " … " + table.Sig(float64(v.Variable.Max/u), 6) + " " + sym, note})
	}
	for _, tg := range e.Targets {
		note := "met"
		if !tg.Met() {
			note = "MISSED: " + tg.Problem()
		}
		t.Rows = append(t.Rows, []string{"goal", tg.Name, tg.ValueText(), tg.Wanted(), note})
	}
	return t
}

// String returns the table as text.
func (s Solution) String() string { return s.Table().Text() }

// uncomputable is the cost Minimize gives a point where a goal cannot be
// computed or a variable not applied: far above any cost of a computable
// point, and finite, so that Nelder–Mead moves away from it.
const uncomputable = 1e30

// metConverger ends a run as soon as the cost is zero (every goal met,
// status optimize.FunctionThreshold), and otherwise when the cost stops
// decreasing (optimize.FunctionConverge).
type metConverger struct{ optimize.FunctionConverge }

func (c *metConverger) Converged(l *optimize.Location) optimize.Status {
	if l.F == 0 {
		return optimize.FunctionThreshold
	}
	return c.FunctionConverge.Converged(l)
}

// objective returns Σ wᵢ rᵢ² over the goals for sys, with the residuals
// of [Goal.Residual], or, centred, measured from the middle of each Near
// and Between range.
func (p Problem) objective(sys paraxial.System, centred bool) (float64, error) {
	c := 0.0
	for _, g := range p.Goals {
		t, err := g.Target(sys)
		if err != nil {
			return 0, err
		}
		r := g.Residual(t)
		if centred {
			r = g.centred(t)
		}
		if math.IsNaN(r) || math.IsInf(r, 0) {
			return 0, &ParamError{Subject: "goal " + errtext.Quote(g.Name), Param: "value", Value: t.ValueText(), Reason: t.Problem(), Err: ErrNotFinite}
		}
		c += g.Weight * r * r
	}
	return c, nil
}

// Minimize finds values of the variables within their bounds that
// minimise the problem's cost Σ wᵢ rᵢ² ([Problem.Evaluate]), zero
// exactly when every goal is met, with gonum/optimize's Nelder–Mead
// method. Each free variable (Min < Max) is searched through the smooth
// bounded map x = Min + (Max − Min)(1 − cos u)/2, so every point tried
// lies within the bounds and a bound can be reached.
//
// # Starts
//
// Nelder–Mead finds a local minimum; several starts, in this order and
// the same for the same problem and settings, look for the best one:
//
//  1. the start point: the variables' values in the starting system
//     ([Problem.Start]), moved into the central 98 % of each range;
//  2. a grid at the fractions 1/6, 1/2 and 5/6 of each range: all 3ⁿ
//     points for n ≤ 3 free variables, the centre and the 2ⁿ corners
//     (1/6 or 5/6) for 4 ≤ n ≤ 6, the centre alone beyond;
//  3. Settings.RandomStarts points uniform in the bounds, from a PCG
//     generator seeded with Settings.Seed.
//
// The search stops at the first run that meets every goal; otherwise the
// best run is restarted once from its end point ("polish"). A start where
// the cost cannot be computed is skipped; a point where it cannot be
// computed during a run costs 1e30.
//
// When every goal is met, a last run moves the solution towards the
// middles of the Near and Between ranges (the same cost with each
// residual measured from the wanted value, not from the range's edge),
// and keeps the point it reaches only if every goal is still met: a
// design at the edge of its tolerance has no margin for placement
// errors.
//
// # Errors
//
// It returns a *ParamError for an invalid problem ([Problem.Validate]).
// When the best point misses goals, it returns the [Solution] together
// with a *ParamError that names each missed goal, its value, its wanted
// range and by how much it misses, wrapping
//
//   - [ErrInfeasible] when the run converged: with the variables that sit
//     at a bound, when any does (the bounds exclude every solution the
//     search found: widen them), and otherwise saying that the goals
//     conflict within the bounds (the solution is the best compromise of
//     the weighted cost);
//   - [ErrNotConverged] when the run was cut off by its evaluation limit
//     or failed (raise Settings.FuncEvaluations).
//
// When no start can be computed it returns the error of the first
// ([Problem.Evaluate]: the goal that cannot be computed).
func Minimize(p Problem, s *Settings) (Solution, error) {
	if err := p.Validate(); err != nil {
		return Solution{}, err
	}
	cfg := Settings{RandomStarts: DefaultRandomStarts, Seed: DefaultSeed}
	if s != nil {
		if s.RandomStarts != 0 {
			cfg.RandomStarts = max(s.RandomStarts, 0)
		}
		if s.Seed != 0 {
			cfg.Seed = s.Seed
		}
		if s.FuncEvaluations < 0 {
			return Solution{}, &ParamError{Param: "Settings.FuncEvaluations", Value: s.FuncEvaluations, Reason: "must be 0 (default) or positive"}
		}
		cfg.FuncEvaluations = s.FuncEvaluations
	}
	x0, err := p.Start()
	if err != nil {
		return Solution{}, err
	}
	var free []int
	var maps []boxmin.Range
	for i, v := range p.Variables {
		if v.Min < v.Max {
			free = append(free, i)
			maps = append(maps, boxmin.Range{Lo: float64(v.Min), Hi: float64(v.Max)})
		}
	}
	n := len(free)
	if cfg.FuncEvaluations == 0 {
		cfg.FuncEvaluations = 600 + 300*n
	}
	values := func(u []float64) []units.Length {
		x := slices.Clone(x0)
		for k, i := range free {
			x[i] = units.Length(maps[k].At(u[k]))
		}
		return x
	}
	sol := Solution{Start: "no free variable"}
	cost := func(u []float64, centred bool) (float64, error) {
		sol.FuncEvaluations++
		sys, err := p.Apply(values(u))
		if err != nil {
			return 0, err
		}
		return p.objective(sys, centred)
	}
	var bestU []float64
	if n > 0 {
		starts, labels := p.starts(x0, free, maps, cfg)
		search := func(starts [][]float64, usable func([]float64) bool, centred, polish bool) (boxmin.Best, bool) {
			b, ok := boxmin.Search(func(u []float64) float64 {
				c, err := cost(u, centred)
				if err != nil {
					return uncomputable
				}
				return c
			}, starts, boxmin.Settings{
				Evaluations: cfg.FuncEvaluations,
				Converger: func() optimize.Converger {
					return &metConverger{optimize.FunctionConverge{Absolute: 1e-18, Relative: 1e-12, Iterations: 50}}
				},
				Usable:     usable,
				StopAtZero: true,
				Polish:     polish,
			})
			sol.Runs += b.Runs
			return b, ok
		}
		// Starts where the cost cannot be computed are skipped; the first
		// one's error is returned when no start can be.
		var firstErr error
		usable := func(u0 []float64) bool {
			_, err := cost(u0, false)
			if err != nil && firstErr == nil {
				sys, aerr := p.Apply(values(u0))
				if aerr != nil {
					firstErr = aerr
				} else if _, eerr := p.Evaluate(sys); eerr != nil {
					firstErr = eerr
				} else {
					firstErr = err
				}
			}
			return err == nil
		}
		best, ok := search(starts, usable, false, true)
		if !ok {
			if firstErr != nil {
				return Solution{}, firstErr
			}
			return Solution{}, &ParamError{Param: "starts", Value: len(starts), Reason: "every Nelder–Mead run failed", Err: ErrNotConverged}
		}
		bestU, sol.Status, sol.Start = best.U, best.Status, labels[best.Start]
		if best.Polished {
			sol.Start += ", polish"
		}
		if best.F == 0 && p.twoSided() {
			if c, ok := search([][]float64{slices.Clone(bestU)}, nil, true, false); ok {
				if f, err := cost(c.U, false); err == nil && f == 0 {
					bestU, sol.Centred = c.U, true
				}
			}
		}
	}
	x := x0
	if bestU != nil {
		x = values(bestU)
	}
	if sol.System, err = p.Apply(x); err != nil {
		return Solution{}, err
	}
	if sol.Evaluation, err = p.Evaluate(sol.System); err != nil {
		return Solution{}, err
	}
	for i, v := range p.Variables {
		vv := VariableValue{Variable: v, Value: x[i]}
		tol := 1e-6 * float64(v.Max-v.Min)
		switch {
		case v.Min == v.Max:
			vv.Bound = Fixed
		case float64(x[i]-v.Min) <= tol:
			vv.Bound = AtMin
		case float64(v.Max-x[i]) <= tol:
			vv.Bound = AtMax
		}
		sol.Values = append(sol.Values, vv)
	}
	if sol.Met() {
		return sol, nil
	}
	return sol, sol.missError()
}

// twoSided reports whether a goal is a Near or Between goal.
func (p Problem) twoSided() bool {
	for _, g := range p.Goals {
		if g.spec.Hi-g.spec.Lo < math.Inf(1) {
			return true
		}
	}
	return false
}

// starts returns Minimize's starting points in the unconstrained
// coordinates, and their names.
func (p Problem) starts(x0 []units.Length, free []int, maps []boxmin.Range, cfg Settings) ([][]float64, []string) {
	n := len(free)
	var us [][]float64
	var labels []string
	at := func(ts []float64) []float64 {
		u := make([]float64, n)
		for k := range u {
			u[k] = boxmin.U(ts[k])
		}
		return u
	}
	ts := make([]float64, n)
	for k, i := range free {
		ts[k] = min(max(float64(x0[i])-maps[k].Lo, 0)/(maps[k].Hi-maps[k].Lo), 1)
		ts[k] = min(max(ts[k], 0.01), 0.99)
	}
	us, labels = append(us, at(ts)), append(labels, "start point")
	var grid [][]float64
	switch {
	case n <= 3:
		total := 1
		for range n {
			total *= 3
		}
		for c := range total {
			t := make([]float64, n)
			for k := range t {
				t[k] = (1 + 2*float64(c%3)) / 6
				c /= 3
			}
			grid = append(grid, t)
		}
	case n <= 6:
		centre := make([]float64, n)
		for k := range centre {
			centre[k] = 0.5
		}
		grid = append(grid, centre)
		for c := range 1 << n {
			t := make([]float64, n)
			for k := range t {
				t[k] = 1.0 / 6
				if c&(1<<k) != 0 {
					t[k] = 5.0 / 6
				}
			}
			grid = append(grid, t)
		}
	default:
		centre := make([]float64, n)
		for k := range centre {
			centre[k] = 0.5
		}
		grid = append(grid, centre)
	}
	for i, t := range grid {
		us, labels = append(us, at(t)), append(labels, "grid "+strconv.Itoa(i+1)+" of "+strconv.Itoa(len(grid)))
	}
	rng := rand.New(rand.NewPCG(cfg.Seed, 0x64657369676e))
	for i := range cfg.RandomStarts {
		t := make([]float64, n)
		for k := range t {
			t[k] = rng.Float64()
		}
		us, labels = append(us, at(t)), append(labels, "random "+strconv.Itoa(i+1)+" of "+strconv.Itoa(cfg.RandomStarts))
	}
	return us, labels
}

// missError returns the error of a solution that misses goals (see
// [Minimize]).
func (s Solution) missError() error {
	var names, misses []string
	for _, t := range s.Evaluation.Targets {
		if !t.Met() {
			names = append(names, errtext.Quote(t.Name))
			misses = append(misses, errtext.Quote(t.Name)+" = "+t.ValueText()+" (wanted "+t.Wanted()+") "+t.Problem())
		}
	}
	subject := "goal " + names[0]
	if len(names) > 1 {
		subject = "goals " + strings.Join(names, ", ")
	}
	reason := "missed: " + strings.Join(misses, "; ")
	if !s.Converged() {
		return &ParamError{Subject: subject, Reason: reason + ": the optimiser stopped (" + s.Stopped() + " after " + strconv.Itoa(s.FuncEvaluations) +
			" evaluations in " + runs(s.Runs) + ") before it converged; raise Settings.FuncEvaluations", Err: ErrNotConverged}
	}
	var bounds []string
	for _, v := range s.Values {
		switch v.Bound {
		case AtMin:
			bounds = append(bounds, v.Variable.Name()+" is at its bound Min = "+v.Variable.Min.String())
		case AtMax:
			bounds = append(bounds, v.Variable.Name()+" is at its bound Max = "+v.Variable.Max.String())
		}
	}
	how := " (Nelder–Mead converged, " + runs(s.Runs) + ")"
	if s.Runs == 0 {
		how = " (no free variable)"
	}
	switch {
	case len(bounds) > 0:
		reason += "; " + strings.Join(bounds, "; ") + ": the bounds exclude every solution found" + how + "; widen them"
	case len(s.Evaluation.Targets) == 1:
		reason += "; no variable is at a bound: the value found is the closest to the goal within the bounds (a minimum of the cost)" + how
	default:
		reason += "; no variable is at a bound: the goals conflict within the bounds, and this is the best compromise of the weighted cost found" + how
	}
	return &ParamError{Subject: subject, Reason: reason, Err: ErrInfeasible}
}

// runs returns "1 run" or "n runs".
func runs(n int) string {
	if n == 1 {
		return "1 run"
	}
	return strconv.Itoa(n) + " runs"
}
