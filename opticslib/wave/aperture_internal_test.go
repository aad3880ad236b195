package wave

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestDiscCover(t *testing.T) {
	// The pixel coverage of a disc is an exact area (no outside
	// reference: geometry). Checks: (1) summed over every pixel of a
	// grid it is the disc area πa² (rel 1e-12; the inclusion–exclusion of
	// corner areas ~a² loses about log10(a²/d²) digits, here ≤ 4); (2) a
	// disc much larger than the pixel acts as a straight edge, coverage
	// (e + d/2)/d for an edge at x = e (the arc's sagitta removes
	// d/(24R) = 4.2e-6 of the pixel at R = 1e4 d, and the rounding of
	// areas ~R² = 1e8 d² adds ~1e-8: tolerance 1e-5; before the corner
	// areas used atan2, asin(t/a) near t = a was off by 6e-5 here);
	// (3) a pixel wholly inside or
	// outside is exactly 1 or 0. Random centres and radii (seeded).
	rng := rand.New(rand.NewPCG(1, 1))
	for range 20 {
		d := 1.0
		a := 2 + 30*rng.Float64()
		cx, cy := rng.Float64()-0.5, rng.Float64()-0.5
		n := int(2*a) + 6
		s := 0.0
		for j := -n; j <= n; j++ {
			for i := -n; i <= n; i++ {
				s += discCover(float64(i)-cx, float64(j)-cy, d, a)
			}
		}
		if !scalar.EqualWithinRel(s, math.Pi*a*a, 1e-12) {
			t.Errorf("Σ coverage (a = %g, centre (%g, %g)) = %.15g, want πa² = %.15g", a, cx, cy, s, math.Pi*a*a)
		}
	}
	const R = 1e4
	for _, e := range []float64{-0.4, -0.1, 0, 0.25, 0.45} {
		// Disc centred at (e − R, 0): its edge crosses the pixel at x ≈ e.
		got := discCover(R-e, 0, 1, R)
		if want := e + 0.5; !scalar.EqualWithinAbs(got, want, 1e-5) {
			t.Errorf("straight-edge coverage at e = %g: %.9g, want %.9g", e, got, want)
		}
	}
	if got := discCover(0, 0, 1, 0.71); got != 1 {
		t.Errorf("pixel inside the disc: coverage %g, want 1", got)
	}
	if got := discCover(3, 0, 1, 2.5); got != 0 {
		t.Errorf("pixel outside the disc: coverage %g, want 0", got)
	}
	if got := discCover(0, 0, 1, 0.5); !scalar.EqualWithinRel(got, math.Pi/4, 1e-14) {
		t.Errorf("inscribed disc: coverage %.15g, want π/4", got)
	}
}
