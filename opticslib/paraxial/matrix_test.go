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
	// det M = n_in/n_out for un-reduced angles (reference-checks R27;
	// Gerrard & Burch 1975 ch. 2 [from memory]). One multiplication and
	// one division: rel 1e-15.
	const tol = 1e-15
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
	} {
		if got := test.m.Det(); !scalar.EqualWithinAbsOrRel(got, test.want, 0, tol) {
			t.Errorf("%s: Det() = %.17g, want %.17g", test.name, got, test.want)
		}
	}
}

func TestSingleSurfaceR27(t *testing.T) {
	// reference-checks R27 [X]: n1 = 1, n2 = 1.5, R = 10 mm. Analytic:
	// det = n1/n2 = 2/3, rear focal distance f' = n2R/(n2−n1) = 30 mm,
	// front focal position −n1R/(n2−n1) = −20 mm, principal points at the
	// vertex, nodal points at the centre of curvature (z = R = 10 mm).
	// Cardinal-point formulas from the matrix (derived here for un-reduced
	// angles): rear focus −A/C, front focus D/C, front principal plane
	// (D−det)/C, rear (1−A)/C, front nodal (D−1)/C, rear nodal (D−1)/C·A−B.
	// A handful of operations on O(100) numbers: abs 1e-15 m, rel 1e-13.
	const abs, rel = 1e-15, 1e-13
	s := mustBuild(t, NewBuilder().Interface(10*mm, 1.5))
	m := s.Matrix()
	det := m.Det()
	for _, test := range []struct {
		name      string
		got, want float64
	}{
		{"det", det, 2.0 / 3},
		{"rear focus −A/C", -m.A / m.C, 0.030},
		{"front focus D/C", m.D / m.C, -0.020},
		{"front principal (D−det)/C", (m.D - det) / m.C, 0},
		{"rear principal (1−A)/C", (1 - m.A) / m.C, 0},
		{"front nodal (D−1)/C", (m.D - 1) / m.C, 0.010},
		{"rear nodal A(D−1)/C−B", m.A*(m.D-1)/m.C - m.B, 0.010},
		{"IndexOut", s.IndexOut(), 1.5},
	} {
		if !scalar.EqualWithinAbsOrRel(test.got, test.want, abs, rel) {
			t.Errorf("R27 %s = %.17g, want %.17g", test.name, test.got, test.want)
		}
	}
}

func TestAfocalAndImagingR31(t *testing.T) {
	// reference-checks R31 [X]. The products involve O(10) entries, so
	// rounding is ~1e-15 absolute; B = 0 cases are limited by cancellation
	// of 0.45 − 0.45 (R31 quotes 2.8e-17), so abs 1e-15 is used.
	const abs, rel = 1e-15, 1e-14
	for _, test := range []struct {
		name string
		b    *Builder
		want Matrix
	}{
		{
			// Kepler telescope f1 = 0.1 m, f2 = 0.3 m, separation f1+f2.
			"Kepler", NewBuilder().ThinLens(0.1).Space(0.4).ThinLens(0.3),
			Matrix{A: -3, B: 0.4, C: 0, D: -1.0 / 3},
		},
		{
			"2f-2f", NewBuilder().Space(0.2).ThinLens(0.1).Space(0.2),
			Matrix{A: -1, B: 0, C: -10, D: -1},
		},
		{
			// 1/s_o + 1/s_i = 1/f: s_o = 0.15 m, f = 0.1 m, s_i = 0.3 m.
			"so=0.15", NewBuilder().Space(0.15).ThinLens(0.1).Space(0.3),
			Matrix{A: -2, B: 0, C: -10, D: -0.5},
		},
	} {
		s := mustBuild(t, test.b)
		got := s.Matrix()
		if !abcdEqualApprox(got, test.want, abs, rel) {
			t.Errorf("R31 %s: Matrix() = %+v, want %+v", test.name, got, test.want)
			continue
		}
		// D = 1/A for det = 1 with C = 0 or B = 0.
		if !scalar.EqualWithinAbsOrRel(got.D, 1/got.A, abs, rel) {
			t.Errorf("R31 %s: D = %g, want 1/A = %g", test.name, got.D, 1/got.A)
		}
	}
}

func TestThickLensR30(t *testing.T) {
	// reference-checks R30 [X]. Values are quoted to 1e-6 mm, so the
	// tolerance against the quoted numbers is abs 6e-10 m (half a unit in
	// the last quoted digit plus margin). Against the closed forms the
	// matrix method is exact up to rounding: rel 1e-12.
	const quoted, rel = 6e-10, 1e-12
	// Thick-lens lensmaker formula (Hecht, Optics, §6.2 [from memory]):
	//	1/f = (n−1)[1/R1 − 1/R2 + (n−1)d/(n R1 R2)]
	lensmaker := func(n, r1, r2, d float64) float64 {
		return 1 / ((n - 1) * (1/r1 - 1/r2 + (n-1)*d/(n*r1*r2)))
	}
	for _, test := range []struct {
		name                string
		n, r1, r2, d        float64
		efl, bfl, principal float64 // principal: front principal plane inside first vertex
	}{
		{"equi-biconvex N-BK7-like", 1.5168, 0.050, -0.050, 0.005, 49.212999e-3, 47.536227e-3, 1.676772e-3},
		// Ball lens D = 10 mm: EFL = nD/(4(n−1)) = 7.5 mm, BFL = 2.5 mm,
		// principal planes at the centre (5 mm inside each vertex).
		{"ball", 1.5, 0.005, -0.005, 0.010, 7.5e-3, 2.5e-3, 5e-3},
	} {
		s := mustBuild(t, NewBuilder().Interface(units.Length(test.r1), test.n).Space(units.Length(test.d)).Interface(units.Length(test.r2), 1))
		m := s.Matrix()
		efl := -1 / m.C
		bfl := -m.A / m.C
		front := (m.D - m.Det()) / m.C
		rear := (1 - m.A) / m.C
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"EFL", efl, test.efl},
			{"BFL", bfl, test.bfl},
			{"front principal", front, test.principal},
			{"rear principal", rear, -test.principal},
		} {
			if !scalar.EqualWithinAbsOrRel(c.got, c.want, quoted, 0) {
				t.Errorf("R30 %s: %s = %.9g m, want %.9g m", test.name, c.what, c.got, c.want)
			}
		}
		if want := lensmaker(test.n, test.r1, test.r2, test.d); !scalar.EqualWithinAbsOrRel(efl, want, 0, rel) {
			t.Errorf("R30 %s: EFL = %.17g, lensmaker %.17g", test.name, efl, want)
		}
		if det := m.Det(); !scalar.EqualWithinAbsOrRel(det, 1, 0, 1e-12) {
			// R27: a full lens in air has det = 1 (to 1e-12).
			t.Errorf("R30 %s: Det() = %.17g, want 1", test.name, det)
		}
	}
}

func TestPlateR32(t *testing.T) {
	// reference-checks R32 [X]: a plane-parallel plate t = 10 mm, n = 1.5
	// in air acts paraxially as an air gap t/n, so it shifts an image by
	// Δ = t(1 − 1/n) = 3.3333 mm (quoted to 1e-4 mm: abs 1e-7 m against
	// the quoted value, rel 1e-14 against the formula).
	const t10, n = 10 * mm, 1.5
	s := mustBuild(t, NewBuilder().PlanarInterface(n).Space(t10).PlanarInterface(1))
	m := s.Matrix()
	shift := float64(t10) - m.B
	if !scalar.EqualWithinAbsOrRel(shift, 3.3333e-3, 1e-7, 0) {
		t.Errorf("R32 plate shift t − B = %.9g m, want 3.3333e-3 m", shift)
	}
	if want := float64(t10) * (1 - 1/n); !scalar.EqualWithinAbsOrRel(shift, want, 0, 1e-14) {
		t.Errorf("R32 plate shift = %.17g, want t(1−1/n) = %.17g", shift, want)
	}
	// Snell invariance across parallel planar layers: the exit ray is
	// parallel to the incident ray (D = 1, C = 0 to rounding).
	if !abcdEqualApprox(Matrix{A: m.A, C: m.C, D: m.D}, Matrix{A: 1, D: 1}, 1e-15, 1e-15) {
		t.Errorf("R32 plate A, C, D = %g, %g, %g, want 1, 0, 1", m.A, m.C, m.D)
	}
	// Lateral displacement: exact t sinθ[1 − cosθ/√(n² − sin²θ)] = 1.938138
	// mm at 30° (R32); paraxially the matrix gives (t − B)θ, which must agree
	// with the exact formula to relative order θ² at θ = 1 mrad (tol 1e-5).
	exact := func(th float64) float64 {
		s, c := math.Sin(th), math.Cos(th)
		return float64(t10) * s * (1 - c/math.Sqrt(n*n-s*s))
	}
	if got := exact(30 * math.Pi / 180); !scalar.EqualWithinAbsOrRel(got, 1.938138e-3, 1e-9, 0) {
		t.Errorf("R32 exact displacement at 30° = %.9g m, want 1.938138e-3 m", got)
	}
	th := 1e-3
	r := m.Apply(Ray{Theta: units.Angle(th)})
	paraxialShift := th*float64(t10) - float64(r.Y) // displacement of the exit ray at the exit plane
	if !scalar.EqualWithinAbsOrRel(paraxialShift, exact(th), 0, 1e-5) {
		t.Errorf("R32 paraxial displacement at 1 mrad = %.9g, exact %.9g", paraxialShift, exact(th))
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
		m := s.Matrix()
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
		{205 * mm, s.Matrix(), 1},
		{215 * mm, s.Matrix().Then(Space(10 * mm)), 1},
	} {
		got, err := s.MatrixTo(test.z)
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
		if _, err := s.MatrixTo(units.Length(z)); err != ErrNonFinite {
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
	if s.MatrixY() != s.Matrix() {
		t.Errorf("MatrixY() = %+v, want Matrix() = %+v for symmetric elements", s.MatrixY(), s.Matrix())
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
