// Package boxmin minimises a cost over a box of bounds with gonum's
// Nelder–Mead simplex from several starts: the bounded coordinate and the
// multi-start driver that the lens-placement and design solvers share.
//
// Each bounded variable x ∈ [lo, hi] is searched through an unconstrained
// coordinate u by the smooth map
//
//	x(u) = lo + (hi − lo)(1 − cos u)/2,
//
// which reaches both bounds (at u = 0 and π) and never leaves them, so
// that an unconstrained minimiser searches the box (removing bounds by a
// change of variables: common practice, no single source).
package boxmin

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/optimize"
)

// Range is a variable's bounds [Lo, Hi] in its own unit.
type Range struct{ Lo, Hi float64 }

// At returns x(u) = Lo + (Hi − Lo)(1 − cos u)/2, clamped to [Lo, Hi]
// against rounding.
func (r Range) At(u float64) float64 {
	x := r.Lo + (r.Hi-r.Lo)*(1-math.Cos(u))/2
	return min(max(x, r.Lo), r.Hi)
}

// Fraction returns (1 − cos u)/2, the fraction of the range at which u
// places the variable: 0 at Lo, 1 at Hi.
func Fraction(u float64) float64 { return (1 - math.Cos(u)) / 2 }

// U returns the coordinate u ∈ [0, π] that places a variable at the
// fraction t of its range (t clamped to [0, 1]): u = arccos(1 − 2t).
func U(t float64) float64 { return math.Acos(1 - 2*min(max(t, 0), 1)) }

// Settings configures [Search].
type Settings struct {
	// Evaluations is the cost evaluations allowed to each run.
	Evaluations int
	// Converger returns the convergence test of a run (a new one per run:
	// gonum's convergers keep state).
	Converger func() optimize.Converger
	// Usable, when set, is asked about each start before its run: a start
	// for which it returns false is skipped.
	Usable func(u0 []float64) bool
	// StopAtZero ends the search at the first run whose cost is 0.
	StopAtZero bool
	// Polish runs once more from the best point when its cost is above 0
	// (a restarted simplex escapes a collapsed one) and keeps the result
	// when it is no worse.
	Polish bool
}

// Best is the outcome of [Search].
type Best struct {
	// U is the best point, F its cost and Status the status of the run
	// that found it.
	U      []float64
	F      float64
	Status optimize.Status
	// Start is the index of the start the best run began from.
	Start int
	// Polished is true when the polishing run gave the best point.
	Polished bool
	// Runs counts the Nelder–Mead runs.
	Runs int
}

// Search minimises f from each start with Nelder–Mead and returns the
// lowest cost found. ok is false when no run returned a point (every
// start failed, or there were no starts). f must be finite where it can
// be computed; return a large finite cost where it cannot, so that the
// simplex moves away.
func Search(f func(u []float64) float64, starts [][]float64, s Settings) (b Best, ok bool) {
	prob := optimize.Problem{Func: f}
	run := func(u0 []float64) *optimize.Result {
		b.Runs++
		res, err := optimize.Minimize(prob, u0, &optimize.Settings{FuncEvaluations: s.Evaluations, Converger: s.Converger()}, &optimize.NelderMead{})
		if res == nil || (err != nil && len(res.X) == 0) {
			return nil
		}
		return res
	}
	b.F = math.Inf(1)
	for i, u0 := range starts {
		if s.Usable != nil && !s.Usable(u0) {
			continue
		}
		res := run(u0)
		if res == nil {
			continue
		}
		if res.F < b.F {
			b.U, b.F, b.Status, b.Start = slices.Clone(res.X), res.F, res.Status, i
		}
		if s.StopAtZero && b.F == 0 {
			break
		}
	}
	if b.U == nil {
		return b, false
	}
	if s.Polish && b.F > 0 {
		if res := run(slices.Clone(b.U)); res != nil && res.F <= b.F {
			b.U, b.F, b.Status, b.Polished = slices.Clone(res.X), res.F, res.Status, true
		}
	}
	return b, true
}
