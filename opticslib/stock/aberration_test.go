package stock_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Coddington's best shape for a collimated input, q = 2(n² − 1)/(n + 2):
// 0.714 for n = 1.5 (W. J. Smith, Modern Optical Engineering, ch. 6
// [from memory]), and it is the minimum of SphericalSeidel in q (checked
// on both sides; the formula is a parabola in q, so this is exact up to
// rounding).
func TestBestShape(t *testing.T) {
	if q := stock.BestShape(1.5, -1); !scalar.EqualWithinAbs(q, 0.7142857142857143, 1e-15) {
		t.Errorf("BestShape(1.5, −1) = %v, want 2(n²−1)/(n+2) = 0.714286", q)
	}
	for _, n := range []float64{1.4585, 1.5168, 1.7847} {
		for _, c := range []float64{-1, -0.5, 0, 0.7, 1} {
			q := stock.BestShape(n, c)
			s := func(q float64) float64 {
				return float64(stock.SphericalSeidel(units.Millimeter, 50*units.Millimeter, n, q, c))
			}
			if s(q-1e-3) <= s(q) || s(q+1e-3) <= s(q) {
				t.Errorf("n = %v, C = %v: S_I(%v) = %v is not below S_I(q ± 0.001) = %v, %v", n, c, q, s(q), s(q-1e-3), s(q+1e-3))
			}
		}
	}
}

// A plano-convex lens for a collimated beam: flat side first (q = −1) has
// about 4 times the spherical aberration of curved side first (q = +1)
// at n ≈ 1.5 ([from memory]; Smith, ch. 6). From the formula the ratio is
// exactly 27/7 = 3.857 at n = 1.5 (a closed form, so the tolerance is
// rounding); for N-BK7 it is 3.928, and the exact real-ray trace of
// TestSphericalAgainstRayTrace gives 3.930 at y = f/200.
func TestPlanoConvexRatio(t *testing.T) {
	s := func(n, q float64) float64 {
		return float64(stock.SphericalSeidel(units.Millimeter, 100*units.Millimeter, n, q, -1))
	}
	if r := s(1.5, -1) / s(1.5, 1); !scalar.EqualWithinRel(r, 27.0/7, 1e-14) {
		t.Errorf("n = 1.5: S_I(flat first)/S_I(curved first) = %v, want 27/7 = %.6f", r, 27.0/7)
	}
	r := s(1.5168, -1) / s(1.5168, 1)
	if r < 3.5 || r > 4.5 {
		t.Errorf("N-BK7: ratio = %v, want about 4", r)
	}
	t.Logf("N-BK7 plano-convex ratio flat first / curved first = %.4f", r)
}

// Identities of the Seidel formula: S_I scales as y⁴ and as 1/f³
// (Welford 1986, §7.3 [from memory]); turning the lens round and reversing
// the light (q → −q, C → −C) leaves it unchanged; a negative lens of the
// same shape has the opposite sign; and a plano-convex lens's Lens.Seidel
// equals the formula with its shape factor.
func TestSeidelIdentities(t *testing.T) {
	const mm = units.Millimeter
	base := float64(stock.SphericalSeidel(2*mm, 80*mm, 1.5168, 0.4, -0.3))
	for _, test := range []struct {
		name string
		got  units.Length
		want float64
	}{
		{"y⁴", stock.SphericalSeidel(4*mm, 80*mm, 1.5168, 0.4, -0.3), 16 * base},
		{"1/f³", stock.SphericalSeidel(2*mm, 160*mm, 1.5168, 0.4, -0.3), base / 8},
		{"reverse", stock.SphericalSeidel(2*mm, 80*mm, 1.5168, -0.4, 0.3), base},
		{"negative", stock.SphericalSeidel(2*mm, -80*mm, 1.5168, 0.4, -0.3), -base},
	} {
		if !scalar.EqualWithinRel(float64(test.got), test.want, 1e-14) {
			t.Errorf("%s: S_I = %v, want %v", test.name, test.got, test.want)
		}
	}
	l, err := stock.LensFromSpec(stock.Spec{Label: "P", Kind: stock.PlanoConvex, Focal: 80 * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 1})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := l.Seidel(2*mm, -1), stock.SphericalSeidel(2*mm, 80*mm, 1.5168, 1, -1); !scalar.EqualWithinRel(float64(got), float64(want), 1e-14) {
		t.Errorf("Lens.Seidel = %v, want %v", got, want)
	}
	if got := stock.Conjugate(80*mm, 0); got != -1 {
		t.Errorf("Conjugate(f, 0) = %v, want −1 (collimated input)", got)
	}
	if got := stock.Conjugate(80*mm, 1/0.08); !scalar.EqualWithinAbs(got, 1, 1e-15) {
		t.Errorf("Conjugate(f, 1/f) = %v, want +1 (source in the front focal plane)", got)
	}
	// Balanced RMS of W040 ρ⁴: W040/(6√5) (Born & Wolf §9.2 [from
	// memory]); checked against the variance of W040(ρ⁴ − ρ²) over the
	// unit disc by a midpoint sum in ρ (weight 2ρ dρ), 1e-6 relative for
	// 10⁵ steps.
	const n = 100000
	var m1, m2 float64
	for i := range n {
		r := (float64(i) + 0.5) / n
		w := r*r*r*r - r*r
		m1 += w * 2 * r / n
		m2 += w * w * 2 * r / n
	}
	if got, want := float64(stock.SphericalRMS(8)), math.Sqrt(m2-m1*m1); !scalar.EqualWithinRel(got, want, 1e-6) {
		t.Errorf("SphericalRMS(S_I = 8 m) = %v m, want √var(ρ⁴ − ρ²) = %v m", got, want)
	}
}
