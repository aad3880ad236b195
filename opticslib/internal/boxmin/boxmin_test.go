package boxmin

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/optimize"
)

// TestRange: the map x(u) = lo + (hi − lo)(1 − cos u)/2 never leaves
// [lo, hi] for any u, and inverts the fraction t to rounding (arccos and
// cos: a few 1e-16 of the range, 1e-12 allowed near the bounds, where
// arccos is steep).
func TestRange(t *testing.T) {
	b := Range{Lo: 0.15, Hi: 0.25}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 1000 {
		u := (rng.Float64() - 0.5) * 1e6
		if x := b.At(u); !(x >= b.Lo && x <= b.Hi) {
			t.Fatalf("at(%g) = %.17g, outside [%g, %g]", u, x, b.Lo, b.Hi)
		}
		tf := rng.Float64()
		if x := b.At(U(tf)); math.Abs(x-(b.Lo+tf*(b.Hi-b.Lo))) > 1e-12*(b.Hi-b.Lo) {
			t.Errorf("at(from(%g)) = %.17g, want %.17g", tf, x, b.Lo+tf*(b.Hi-b.Lo))
		}
	}
	for _, tf := range []float64{-1, 0, 1, 2} {
		if x := b.At(U(tf)); x != min(max(b.Lo+min(max(tf, 0), 1)*(b.Hi-b.Lo), b.Lo), b.Hi) {
			t.Errorf("at(from(%g)) = %.17g, want the bound", tf, x)
		}
	}
}

// TestSearch: from two starts, Nelder–Mead finds the minimum of a
// quadratic bowl inside the box, x = (0.3, 0.7) of the ranges [0, 1] (an
// analytic minimum), to 1e-6; StopAtZero ends at the first start whose
// cost is 0; a start that Usable rejects is not run.
func TestSearch(t *testing.T) {
	box := []Range{{0, 1}, {0, 1}}
	bowl := func(u []float64) float64 {
		x, y := box[0].At(u[0]), box[1].At(u[1])
		return (x-0.3)*(x-0.3) + (y-0.7)*(y-0.7)
	}
	conv := func() optimize.Converger {
		return &optimize.FunctionConverge{Absolute: 1e-18, Relative: 1e-12, Iterations: 50}
	}
	starts := [][]float64{{U(0.9), U(0.1)}, {U(0.5), U(0.5)}}
	b, ok := Search(bowl, starts, Settings{Evaluations: 2000, Converger: conv, Polish: true})
	if !ok {
		t.Fatal("Search found nothing")
	}
	if x, y := box[0].At(b.U[0]), box[1].At(b.U[1]); math.Abs(x-0.3) > 1e-6 || math.Abs(y-0.7) > 1e-6 {
		t.Errorf("minimum at (%g, %g), want (0.3, 0.7)", x, y)
	}
	if b.Runs < 2 {
		t.Errorf("Runs = %d, want at least one per start", b.Runs)
	}
	zero := func(u []float64) float64 { return 0 }
	if b, _ := Search(zero, starts, Settings{Evaluations: 100, Converger: conv, StopAtZero: true}); b.Runs != 1 || b.Start != 0 {
		t.Errorf("StopAtZero: Runs = %d, Start = %d, want 1 run from start 0", b.Runs, b.Start)
	}
	skipFirst := func(u0 []float64) bool { return u0[0] != starts[0][0] }
	if b, _ := Search(zero, starts, Settings{Evaluations: 100, Converger: conv, Usable: skipFirst}); b.Runs != 1 || b.Start != 1 {
		t.Errorf("Usable: Runs = %d, Start = %d, want 1 run from start 1", b.Runs, b.Start)
	}
	if _, ok := Search(zero, starts, Settings{Evaluations: 100, Converger: conv, Usable: func([]float64) bool { return false }}); ok {
		t.Error("Search with no usable start reported a result")
	}
}
