package design

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBoundedMap: the map x(u) = lo + (hi − lo)(1 − cos u)/2 never leaves
// [lo, hi] for any u, and inverts the fraction t to rounding (arccos and
// cos: a few 1e-16 of the range, 1e-12 allowed near the bounds, where
// arccos is steep).
func TestBoundedMap(t *testing.T) {
	b := bounded{lo: 0.15, hi: 0.25}
	rng := rand.New(rand.NewPCG(3, 4))
	for range 1000 {
		u := (rng.Float64() - 0.5) * 1e6
		if x := b.at(u); !(x >= b.lo && x <= b.hi) {
			t.Fatalf("at(%g) = %.17g, outside [%g, %g]", u, x, b.lo, b.hi)
		}
		tf := rng.Float64()
		if x := b.at(b.from(tf)); math.Abs(x-(b.lo+tf*(b.hi-b.lo))) > 1e-12*(b.hi-b.lo) {
			t.Errorf("at(from(%g)) = %.17g, want %.17g", tf, x, b.lo+tf*(b.hi-b.lo))
		}
	}
	for _, tf := range []float64{-1, 0, 1, 2} {
		if x := b.at(b.from(tf)); x != min(max(b.lo+min(max(tf, 0), 1)*(b.hi-b.lo), b.lo), b.hi) {
			t.Errorf("at(from(%g)) = %.17g, want the bound", tf, x)
		}
	}
}
