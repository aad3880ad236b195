package tolerance_test

// Benchmarks (STYLE rule 14) and the allocation check of the fast route;
// no timings are asserted.

import (
	"context"
	"strconv"
	"testing"
	"time"

	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/tolerance"
)

// BenchmarkMonteCarlo runs 10⁵ builds of the five-lens relay (eleven
// elements, ten perturbations: a placement and a focal error per lens,
// two goals on the output waist), on one and two workers, by the fast
// route, with and without a compensator, and 10³ builds by the generic
// route (systems rebuilt) for comparison. ns/build is the wall time per
// build.
func BenchmarkMonteCarlo(b *testing.B) {
	plain := relayStudy(b, 0.1*mm, 0.01)
	comp := plain
	comp.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 130*mm, 170*mm), Goal: "focus z"}
	for _, c := range []struct {
		name    string
		st      tolerance.Study
		trials  int
		generic bool
	}{
		{"fast", plain, 100000, false},
		{"fast+compensator", comp, 100000, false},
		{"generic", plain, 1000, true},
	} {
		for _, w := range []int{1, 2} {
			b.Run(c.name+"/workers="+strconv.Itoa(w), func(b *testing.B) {
				o := tolerance.Options{Trials: c.trials, Seed: 1, Workers: w, Generic: c.generic}
				b.ReportAllocs()
				var spent time.Duration
				for b.Loop() {
					t0 := time.Now()
					if _, err := c.st.MonteCarlo(context.Background(), o); err != nil {
						b.Fatal(err)
					}
					spent += time.Since(t0)
				}
				b.ReportMetric(float64(spent.Nanoseconds())/float64(b.N)/float64(c.trials), "ns/build")
			})
		}
	}
}

// BenchmarkSensitivity: the slopes of the relay's two goals against its
// ten errors (21 builds by the generic route).
func BenchmarkSensitivity(b *testing.B) {
	st := relayStudy(b, 0.1*mm, 0.01)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := st.Sensitivity(); err != nil {
			b.Fatal(err)
		}
	}
}

// TestAllocationsPerBuild: the fast route allocates per run (the value
// tables, the workers' buffers, the statistics), not per build: 20 000
// more builds add fewer than 0.01 allocations each.
func TestAllocationsPerBuild(t *testing.T) {
	st := relayStudy(t, 0.1*mm, 0.01)
	st.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 130*mm, 170*mm), Goal: "focus z"}
	allocs := func(n int) float64 {
		return testing.AllocsPerRun(3, func() {
			if _, err := st.MonteCarlo(context.Background(), tolerance.Options{Trials: n, Seed: 1, Workers: 2}); err != nil {
				t.Fatal(err)
			}
		})
	}
	small, large := allocs(1000), allocs(21000)
	if per := (large - small) / 20000; per > 0.01 {
		t.Errorf("fast route: %.0f allocations for 1000 builds, %.0f for 21000: %.3f per build, want ≈ 0", small, large, per)
	}
}
