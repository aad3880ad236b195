package paraxial

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

// abcdEqualApprox reports whether every entry of got and want agrees within
// abs or rel (scalar.EqualWithinAbsOrRel).
func abcdEqualApprox(got, want Matrix, abs, rel float64) bool {
	return scalar.EqualWithinAbsOrRel(got.A, want.A, abs, rel) &&
		scalar.EqualWithinAbsOrRel(got.B, want.B, abs, rel) &&
		scalar.EqualWithinAbsOrRel(got.C, want.C, abs, rel) &&
		scalar.EqualWithinAbsOrRel(got.D, want.D, abs, rel)
}

func mustBuild(t testing.TB, b *Builder) System {
	t.Helper()
	s, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	return s
}

func TestThenApply(t *testing.T) {
	// Analytic identity: (N·M)r = N(Mr), and matrix products are
	// associative. Entries are O(1..10), so rounding is a few ulps; rel
	// 1e-14 leaves a wide margin while catching a transposed product.
	const tol = 1e-14
	a := Space(120 * mm)
	b := ThinLens(50 * mm)
	c := SphericalInterface(20*mm, 1, 1.5)
	r := Ray{Y: 2 * mm, Theta: 3 * units.Milliradian}
	got := a.Then(b).Apply(r)
	want := b.Apply(a.Apply(r))
	if !scalar.EqualWithinAbsOrRel(float64(got.Y), float64(want.Y), 0, tol) ||
		!scalar.EqualWithinAbsOrRel(float64(got.Theta), float64(want.Theta), 0, tol) {
		t.Errorf("a.Then(b).Apply(r) = %+v, want %+v", got, want)
	}
	if l, r := a.Then(b).Then(c), a.Then(b.Then(c)); !abcdEqualApprox(l, r, 0, tol) {
		t.Errorf("(a·b)·c = %+v, want a·(b·c) = %+v", l, r)
	}
	if got := Identity().Then(c); got != c {
		t.Errorf("Identity().Then(c) = %+v, want %+v", got, c)
	}
	if got := c.Then(Identity()); got != c {
		t.Errorf("c.Then(Identity()) = %+v, want %+v", got, c)
	}
	// Ordering: a space then a lens differs from a lens then a space.
	// Space d then lens f: C = -1/f, D = 1 - d/f (Kogelnik & Li 1966, table I).
	sl := Space(100 * mm).Then(ThinLens(100 * mm))
	if want := (Matrix{A: 1, B: 0.1, C: -10, D: 0}); !abcdEqualApprox(sl, want, 1e-15, tol) {
		t.Errorf("Space(100 mm).Then(ThinLens(100 mm)) = %+v, want %+v", sl, want)
	}
}

func TestElementDeterminants(t *testing.T) {
	// det M = n_in/n_out for un-reduced angles, in both planes
	// (reference-checks R27; Gerrard & Burch 1975 ch. 2 [from memory]).
	// A few products, a division and for the tilted elements a cosine and a
	// square root: a few ulps, so rel 1e-14.
	const tol = 1e-14
	mx, my := Mirror(-0.2, 0.4)
	cx, cy := CylindricalLens(0.05, Sagittal)
	tx, ty := TiltedPlanarInterface(1, 1.7, 0.6)
	bx, by := TiltedPlanarInterface(1.7, 1.2, 0.3)
	for _, test := range []struct {
		name string
		m    Matrix
		want float64
	}{
		{"Space", Space(1.234), 1},
		{"ThinLens", ThinLens(-0.2), 1},
		{"SphericalInterface", SphericalInterface(10*mm, 1, 1.5), 1 / 1.5},
		{"SphericalInterface back", SphericalInterface(-10*mm, 1.5, 1), 1.5},
		{"PlanarInterface", PlanarInterface(1.33, 1.7), 1.33 / 1.7},
		{"Identity", Identity(), 1},
		{"Mirror X", mx, 1}, {"Mirror Y", my, 1},
		{"Cylinder X", cx, 1}, {"Cylinder Y", cy, 1},
		{"Tilted X", tx, 1 / 1.7}, {"Tilted Y", ty, 1 / 1.7},
		{"Tilted back X", bx, 1.7 / 1.2}, {"Tilted back Y", by, 1.7 / 1.2},
		{"ThickLens in water", ThickLens(0.03, -0.08, 0.004, 1.6, 1.33), 1},
		{"Reduced interface", SphericalInterface(0.02, 1, 1.5).Reduced(1, 1.5), 1},
		{"Reverse interface", SphericalInterface(0.02, 1, 1.5).Reverse(), 1.5},
	} {
		if got := test.m.Det(); !scalar.EqualWithinAbsOrRel(got, test.want, 0, tol) {
			t.Errorf("%s: Det() = %.17g, want %.17g", test.name, got, test.want)
		}
	}
}

// randomBuilder returns a builder with n random elements drawn from rng:
// spaces 0–200 mm, thin lenses |f| 20–500 mm, spherical interfaces |R|
// 5–200 mm and planar interfaces, indices 1–2. It also returns the product
// of the element determinants.
func randomBuilder(rng *rand.Rand, n int) (*Builder, float64) {
	b := NewBuilder().Medium(1 + rng.Float64())
	nCur := b.n
	prod := 1.0
	sign := func() float64 {
		if rng.IntN(2) == 0 {
			return -1
		}
		return 1
	}
	for range n {
		switch rng.IntN(4) {
		case 0:
			b.Space(units.Length(0.2 * rng.Float64()))
		case 1:
			b.ThinLens(units.Length(sign() * (0.02 + 0.48*rng.Float64())))
		case 2:
			n2 := 1 + rng.Float64()
			b.Interface(units.Length(sign()*(0.005+0.195*rng.Float64())), n2)
			prod *= SphericalInterface(1, nCur, n2).Det()
			nCur = n2
		case 3:
			n2 := 1 + rng.Float64()
			b.PlanarInterface(n2)
			prod *= PlanarInterface(nCur, n2).Det()
			nCur = n2
		}
	}
	return b, prod
}

func TestDetProperty(t *testing.T) {
	// Property (analytic identity): det(M_N⋯M_1) = Π det M_i = n_in/n_out.
	// Rounding in a product of N matrices grows like N·ε·(|AD| + |BC|),
	// which bounds the error of AD − BC; use 4N·ε times that scale.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 200 {
		n := 1 + rng.IntN(20)
		b, prod := randomBuilder(rng, n)
		s := mustBuild(t, b)
		m := s.Matrix(Tangential)
		scale := math.Abs(m.A*m.D) + math.Abs(m.B*m.C)
		abs := 4 * float64(n) * 0x1p-52 * scale
		if got := m.Det(); !scalar.EqualWithinAbsOrRel(got, prod, abs, 1e-13) {
			t.Errorf("case %d (%d elements): Det() = %.17g, product of dets %.17g", i, n, got, prod)
			continue
		}
		if want := s.IndexIn() / s.IndexOut(); !scalar.EqualWithinAbsOrRel(prod, want, 0, 1e-13) {
			t.Errorf("case %d: product of dets = %.17g, n_in/n_out = %.17g", i, prod, want)
		}
	}
}

func TestMatrixTo(t *testing.T) {
	// MatrixTo against hand-composed products of the element matrices
	// (Kogelnik & Li 1966, table I). Entries are O(10); rel 1e-14.
	const abs, rel = 1e-15, 1e-14
	s := mustBuild(t, NewBuilder().
		Space(100*mm).
		ThinLens(50*mm).Label("L1").
		Space(30*mm).
		Interface(20*mm, 1.5).Label("front").
		Space(5*mm).
		PlanarInterface(1).
		Space(70*mm))
	if got, want := s.Length(), 205*mm; !scalar.EqualWithinAbsOrRel(float64(got), float64(want), 0, 1e-15) {
		t.Errorf("Length() = %v, want %v", got, want)
	}
	l1 := Space(100 * mm).Then(ThinLens(50 * mm))
	front := l1.Then(Space(30 * mm)).Then(SphericalInterface(20*mm, 1, 1.5))
	back := front.Then(Space(5 * mm)).Then(PlanarInterface(1.5, 1))
	for _, test := range []struct {
		z    units.Length
		want Matrix
		n    float64
	}{
		{-10 * mm, Space(-10 * mm), 1},
		{0, Identity(), 1},
		{40 * mm, Space(40 * mm), 1},
		{100 * mm, l1, 1}, // surfaces at z are included
		{110 * mm, l1.Then(Space(10 * mm)), 1},
		{130 * mm, front, 1.5},
		{132 * mm, front.Then(Space(2 * mm)), 1.5},
		{135 * mm, back, 1},
		{205 * mm, s.Matrix(Tangential), 1},
		{215 * mm, s.Matrix(Tangential).Then(Space(10 * mm)), 1},
	} {
		got, err := s.MatrixTo(test.z, Tangential)
		if err != nil {
			t.Errorf("MatrixTo(%v) error: %v", test.z, err)
			continue
		}
		if !abcdEqualApprox(got, test.want, abs, rel) {
			t.Errorf("MatrixTo(%v) = %+v, want %+v", test.z, got, test.want)
		}
		if n := s.IndexAt(test.z); n != test.n {
			t.Errorf("IndexAt(%v) = %g, want %g", test.z, n, test.n)
		}
	}
	for _, z := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		if _, err := s.MatrixTo(units.Length(z), Tangential); err != ErrNonFinite {
			t.Errorf("MatrixTo(%g) error = %v, want ErrNonFinite", z, err)
		}
	}
	e := s.Element(1)
	if e.Kind != KindThinLens || e.Label != "L1" || e.Z != 100*mm || e.Focal != 50*mm {
		t.Errorf("Element(1) = %+v, want thin lens L1 at 100 mm, f = 50 mm", e)
	}
	if got := s.Element(3); got.Radius != 20*mm || got.IndexIn != 1 || got.IndexOut != 1.5 {
		t.Errorf("Element(3) = %+v, want R = 20 mm, n 1 → 1.5", got)
	}
	els := s.Elements()
	els[1].Label = "changed"
	if s.Element(1).Label != "L1" {
		t.Errorf("Elements() returned an alias of the system's elements")
	}
	if s.Matrix(Sagittal) != s.Matrix(Tangential) {
		t.Errorf("MatrixY() = %+v, want Matrix() = %+v for symmetric elements", s.Matrix(Sagittal), s.Matrix(Tangential))
	}
}

func TestElementPanics(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(1))
	for _, i := range []int{-1, 1} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("Element(%d) did not panic", i)
				}
			}()
			s.Element(i)
		}()
	}
}
