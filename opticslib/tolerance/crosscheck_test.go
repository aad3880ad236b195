package tolerance_test

// Cross-check of the Monte Carlo statistics against numpy on the same
// build values (testdata/crosscheck/tolerance_stats.py): mean and sample
// standard deviation, the 5/50/95 % points (numpy's
// "interpolated_inverted_cdf", the definition gonum's LinInterp
// implements), the histogram counts with the same edges, and the number
// of builds within the wanted range. The test skips when the interpreter
// or the modules are missing; CI has them.

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/tolerance"
)

type xcGoal struct {
	Values []float64 `json:"values"`
	Edges  []float64 `json:"edges"`
	Lo     *float64  `json:"lo"`
	Hi     *float64  `json:"hi"`
}

type xcStats struct {
	Mean, Std, Min, Max float64
	P05, P50, P95       float64
	Counts              []int
	Met                 int
}

func TestCrossCheckStatistics(t *testing.T) {
	st := routesStudy(t)
	r := run(t, st, tolerance.Options{Trials: 5000, Seed: 17})
	var in struct {
		Goals []xcGoal `json:"goals"`
	}
	var hs []tolerance.Histogram
	for i, g := range r.Goals {
		h, err := r.Histogram(g.Name, 0)
		if err != nil {
			t.Fatal(err)
		}
		hs = append(hs, h)
		x := xcGoal{Edges: h.Edges}
		for _, v := range r.Values[i] {
			if !math.IsNaN(v) {
				x.Values = append(x.Values, v)
			}
		}
		if lo := g.Lo; !math.IsInf(lo, 0) {
			x.Lo = &lo
		}
		if hi := g.Hi; !math.IsInf(hi, 0) {
			x.Hi = &hi
		}
		in.Goals = append(in.Goals, x)
	}
	var out struct {
		Reference string    `json:"reference"`
		Goals     []xcStats `json:"goals"`
	}
	pyref.Run(t, "tolerance_stats.py", in, &out)
	if out.Reference == "" || len(out.Goals) != len(r.Goals) {
		t.Fatalf("reference returned %d goals, want %d", len(out.Goals), len(r.Goals))
	}
	for i, g := range r.Goals {
		want := out.Goals[i]
		// Tolerances: the mean sums in another order (numpy pairwise,
		// gonum in sequence): 1e-13 relative for 5000 values; the
		// standard deviation is a difference of sums, 1e-10 relative
		// of it allows a spread 1000 times below the mean (the waist
		// position's σ is the compensator's residual, 1e-16 m on
		// 0.44 m, so it gets an absolute 1e-18 m); the percentiles and
		// extremes are the same interpolation of the same sorted values,
		// to rounding.
		for _, c := range []struct {
			name      string
			got, want float64
			abs, rel  float64
		}{
			{"mean", g.Mean, want.Mean, 0, 1e-13},
			{"std", g.Std, want.Std, 1e-18, 1e-10},
			{"min", g.Min, want.Min, 0, 0},
			{"max", g.Max, want.Max, 0, 0},
			{"5 %", g.P05, want.P05, 0, 1e-14},
			{"median", g.P50, want.P50, 0, 1e-14},
			{"95 %", g.P95, want.P95, 0, 1e-14},
		} {
			if !scalar.EqualWithinAbsOrRel(c.got, c.want, c.abs, c.rel) {
				t.Errorf("%s: %s = %.17g, numpy %.17g", g.Name, c.name, c.got, c.want)
			}
		}
		for k, c := range hs[i].Counts {
			if k >= len(want.Counts) || c != want.Counts[k] {
				t.Errorf("%s: histogram counts %v, numpy %v", g.Name, hs[i].Counts, want.Counts)
				break
			}
		}
		if g.Yield.Met != want.Met {
			t.Errorf("%s: %d builds met, numpy counts %d within [%g, %g]", g.Name, g.Yield.Met, want.Met, g.Lo, g.Hi)
		}
	}
}
