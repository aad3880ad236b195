package stock_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/units"
)

const (
	mm = units.Millimeter
	nm = units.Nanometer
)

// shapeKind returns the kind of a singlet of curvatures c1, c2 and focal
// length f.
func shapeKind(c1, c2, f float64) stock.Kind {
	switch {
	case c1 == 0 || c2 == 0:
		if f > 0 {
			return stock.PlanoConvex
		}
		return stock.PlanoConcave
	case c1*c2 > 0:
		return stock.Meniscus
	case c1 > 0:
		return stock.Biconvex
	}
	return stock.Biconcave
}

// The thick-lens lensmaker's equation and the principal planes against
// package paraxial's thick lens: the same lens built from its two
// surfaces and the glass, its EFL and H, H′ from the system matrix
// (paraxial.System.Cardinal). Outside reference: the matrix product of
// the refraction and transfer matrices (A. Gerrard & J. M. Burch,
// Introduction to Matrix Methods in Optics, Wiley 1975, ch. II [from
// memory]), which the closed forms are an expansion of. Tolerance: both
// sides take a handful of roundings; where c1 − c2 nearly cancels (a
// weak meniscus) the rounding grows by (|c1| + |c2|)/|c1 − c2 + …|, so
// the relative tolerance is 1e-13 times that factor.
func TestLensmakerAgainstParaxial(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	worst, compared := 0.0, 0
	defer func() { t.Logf("%d lenses: largest |Δf|/f = %.3g", compared, worst) }()
	for i := range 500 {
		curv := func() float64 {
			if rng.IntN(6) == 0 {
				return 0
			}
			r := (10 + 490*rng.Float64()) * 1e-3
			if rng.IntN(2) == 0 {
				r = -r
			}
			return 1 / r
		}
		c1, c2 := curv(), curv()
		if c1 == 0 && c2 == 0 {
			continue
		}
		r := func(c float64) units.Length {
			if c == 0 {
				return paraxial.Flat
			}
			return units.Length(1 / c)
		}
		n := 1.4 + 0.6*rng.Float64()
		th := units.Length(1e-3 + 9e-3*rng.Float64())
		f := stock.LensmakerFocal(r(c1), r(c2), th, n)
		sys, err := paraxial.NewBuilder().ThickLens(r(c1), r(c2), th, n).Build()
		if err != nil {
			t.Fatalf("case %d: %v", i, err)
		}
		card, err := sys.Cardinal(paraxial.Tangential)
		if err != nil || card.Afocal {
			continue
		}
		amp := (math.Abs(c1) + math.Abs(c2)) * (n - 1) * math.Abs(float64(f))
		compared++
		worst = max(worst, math.Abs(float64(f-card.EFL)/float64(card.EFL)))
		if !scalar.EqualWithinRel(float64(f), float64(card.EFL), 1e-13*max(1, amp)) {
			t.Errorf("case %d: LensmakerFocal(%v, %v, %v, %v) = %v, want paraxial EFL %v", i, r(c1), r(c2), th, n, f, card.EFL)
		}
		l, err := stock.LensFromSpec(stock.Spec{Label: "L", Kind: shapeKind(c1, c2, float64(f)), R1: r(c1), R2: r(c2), Thickness: th,
			Diameter: 2 * mm, Index: n, Count: 1})
		if err != nil {
			t.Errorf("case %d: LensFromSpec: %v", i, err)
			continue
		}
		front, back := l.PrincipalPlanes()
		// Positions: the front vertex at z = 0, the back vertex at z = t.
		if !scalar.EqualWithinAbsOrRel(float64(front), float64(card.FrontPrincipalPlane), 1e-15*max(1, amp), 1e-11) ||
			!scalar.EqualWithinAbsOrRel(float64(th+back), float64(card.RearPrincipalPlane), 1e-15*max(1, amp), 1e-11) {
			t.Errorf("case %d: PrincipalPlanes = %v, %v (H′ at %v), want H at %v, H′ at %v", i, front, back, th+back, card.FrontPrincipalPlane, card.RearPrincipalPlane)
		}
		if th, err := l.Thick("L"); err != nil {
			t.Errorf("case %d: Thick: %v", i, err)
		} else if c, err := th.Cardinal(paraxial.Tangential); err != nil || !scalar.EqualWithinRel(float64(c.EFL), float64(l.Focal), 1e-13*max(1, amp)) {
			t.Errorf("case %d: Thick EFL = %v (%v), want %v", i, c.EFL, err, l.Focal)
		}
	}
}

// A lens given by its focal length gets the radii of its kind's shape;
// fed back into the lensmaker's equation they must give the focal length
// again (an identity of the construction; tolerance: a few roundings,
// 1e-13 relative).
func TestLensFromSpecShape(t *testing.T) {
	for _, test := range []struct {
		kind   stock.Kind
		f, ct  units.Length
		n      float64
		wantQ  float64
		facing string
	}{
		{stock.PlanoConvex, 50 * mm, 0, 1.5168, 1, "curved side first"},
		{stock.PlanoConvex, 50 * mm, 5.3 * mm, 1.5168, 1, "curved side first"},
		{stock.PlanoConcave, -75 * mm, 3 * mm, 1.4585, 1, "curved side first"},
		{stock.Biconvex, 100 * mm, 0, 1.5168, 0, ""},
		{stock.Biconvex, 100 * mm, 4 * mm, 1.7847, 0, ""},
		{stock.Biconcave, -50 * mm, 2.5 * mm, 1.5168, 0, ""},
	} {
		l, err := stock.LensFromSpec(stock.Spec{Label: "L", Kind: test.kind, Focal: test.f, Thickness: test.ct, Diameter: 25.4 * mm, Index: test.n, Count: 1})
		if err != nil {
			t.Errorf("%v f = %v: %v", test.kind, test.f, err)
			continue
		}
		if f := stock.LensmakerFocal(l.R1, l.R2, l.Thickness, l.Index); !scalar.EqualWithinRel(float64(f), float64(test.f), 1e-13) {
			t.Errorf("%v f = %v ct = %v: radii %v, %v give f = %v", test.kind, test.f, test.ct, l.R1, l.R2, f)
		}
		if q := l.ShapeFactor(); !scalar.EqualWithinAbs(q, test.wantQ, 1e-12) {
			t.Errorf("%v: ShapeFactor = %v, want %v", test.kind, q, test.wantQ)
		}
		r := l.Reversed()
		if q := r.ShapeFactor(); !scalar.EqualWithinAbs(q, -test.wantQ, 1e-12) || r.Focal != l.Focal {
			t.Errorf("%v: Reversed ShapeFactor = %v, f = %v; want %v, %v", test.kind, q, r.Focal, -test.wantQ, l.Focal)
		}
		if rr := r.Reversed(); rr.R1 != l.R1 || rr.R2 != l.R2 {
			t.Errorf("%v: Reversed twice = %v, %v, want %v, %v", test.kind, rr.R1, rr.R2, l.R1, l.R2)
		}
		if got := l.Facing(); got != test.facing {
			t.Errorf("%v: Facing = %q, want %q", test.kind, got, test.facing)
		}
	}
	// Coddington's q of a meniscus is beyond ±1; of an achromat NaN.
	l, err := stock.LensFromSpec(stock.Spec{Label: "M", Kind: stock.Meniscus, R1: 38.6 * mm, R2: 100 * mm, Thickness: 4 * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 1})
	if err != nil {
		t.Fatal(err)
	}
	if q := l.ShapeFactor(); !scalar.EqualWithinRel(q, (100+38.6)/(100-38.6), 1e-12) {
		t.Errorf("meniscus ShapeFactor = %v, want (R2 + R1)/(R2 − R1) = %v", q, (100+38.6)/(100-38.6))
	}
	a, _ := stock.LensFromSpec(stock.Spec{Label: "A", Kind: stock.Achromat, Focal: 100 * mm, Diameter: 25.4 * mm, Count: 1})
	if q := a.ShapeFactor(); !math.IsNaN(q) {
		t.Errorf("achromat ShapeFactor = %v, want NaN", q)
	}
}

// Bad lenses: each error names the field, shows the value with its unit
// and wraps the sentinel.
func TestLensFromSpecErrors(t *testing.T) {
	ok := stock.Spec{Label: "PCX-050-A", Kind: stock.PlanoConvex, Focal: 50 * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 1}
	for _, test := range []struct {
		name string
		edit func(s *stock.Spec)
		want []string
		err  error
	}{
		{"no label", func(s *stock.Spec) { s.Label = " " }, []string{"Label", "empty"}, stock.ErrInput},
		{"no kind", func(s *stock.Spec) { s.Kind = 0 }, []string{"Kind = 0", "plano-convex"}, stock.ErrInput},
		{"diameter", func(s *stock.Spec) { s.Diameter = -25.4 * mm }, []string{"Diameter = -25.4 mm", "positive"}, stock.ErrInput},
		{"count", func(s *stock.Spec) { s.Count = 0 }, []string{"Count = 0", "from 1"}, stock.ErrInput},
		{"index", func(s *stock.Spec) { s.Index = 0.9 }, []string{"Index = 0.9", "above 1"}, stock.ErrNotPhysical},
		{"material", func(s *stock.Spec) { s.Material = "unobtainium" }, []string{`Material = "unobtainium"`, "N-BK7"}, stock.ErrInput},
		{"no index", func(s *stock.Spec) { s.Material = "" }, []string{"Index", "material"}, stock.ErrInput},
		{"achromat radii", func(s *stock.Spec) { s.Kind, s.R1, s.R2 = stock.Achromat, 50*mm, -50*mm }, []string{"R1 = 50 mm", "achromat"}, stock.ErrInput},
		{"one radius", func(s *stock.Spec) { s.Focal, s.R1, s.Thickness = 0, 25.8*mm, 3*mm }, []string{"R2 = 0 m", "other radius"}, stock.ErrInput},
		{"no thickness", func(s *stock.Spec) { s.Focal, s.R1, s.R2 = 0, 25.8*mm, paraxial.Flat }, []string{"Thickness", "centre thickness"}, stock.ErrInput},
		{"disagree", func(s *stock.Spec) { s.R1, s.R2, s.Thickness = 30*mm, paraxial.Flat, 3*mm }, []string{"Focal = 50 mm", "58.0495 mm"}, stock.ErrInput},
		{"kind mismatch", func(s *stock.Spec) { s.Kind, s.Focal, s.R1, s.R2, s.Thickness = stock.Biconvex, 0, 50*mm, 50*mm, 3*mm }, []string{"Kind = biconvex", "R1 > 0 and R2 < 0"}, stock.ErrInput},
		{"sign", func(s *stock.Spec) { s.Focal = -50 * mm }, []string{"Focal = -50 mm", "positive focal length"}, stock.ErrInput},
		{"meniscus", func(s *stock.Spec) { s.Kind = stock.Meniscus }, []string{"R1", "meniscus"}, stock.ErrInput},
		{"too curved", func(s *stock.Spec) { s.Focal = 10 * mm }, []string{"Focal = 10 mm", "radius of 5.168 mm", "half the diameter 12.7 mm"}, stock.ErrNotPhysical},
		{"edge", func(s *stock.Spec) { s.Kind, s.Focal, s.Thickness = stock.Biconvex, 25*mm, 1*mm }, []string{"Thickness = 1 mm", "negative edge thickness"}, stock.ErrNotPhysical},
		{"no power", func(s *stock.Spec) { s.Focal, s.R1, s.R2, s.Thickness = 0, paraxial.Flat, paraxial.Flat, 3*mm }, []string{"R1 = +Inf m", "no power"}, stock.ErrNotPhysical},
		{"NaN focal", func(s *stock.Spec) { s.Focal = units.Length(math.NaN()) }, []string{"Focal = NaN m", "finite"}, stock.ErrInput},
	} {
		s := ok
		test.edit(&s)
		_, err := stock.LensFromSpec(s)
		if err == nil {
			t.Errorf("%s: LensFromSpec(%+v) = nil error", test.name, s)
			continue
		}
		for _, w := range test.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q does not contain %q", test.name, err, w)
			}
		}
		if !errors.Is(err, test.err) {
			t.Errorf("%s: error %q does not wrap %v", test.name, err, test.err)
		}
		var pe *stock.ParamError
		if !errors.As(err, &pe) {
			t.Errorf("%s: error %T is not a *stock.ParamError", test.name, err)
		}
	}
	if _, err := stock.LensFromSpec(ok); err != nil {
		t.Errorf("LensFromSpec(%+v) = %v", ok, err)
	}
}

// The glasses and their nd (SCHOTT data sheets; Malitson 1965; [from
// memory]) and the names accepted.
func TestGlassIndex(t *testing.T) {
	for _, test := range []struct {
		name, canonical string
		nd              float64
	}{
		{"N-BK7", "N-BK7", 1.5168}, {"bk7", "N-BK7", 1.5168}, {"Fused Silica", "fused silica", 1.4585},
		{"UVFS", "fused silica", 1.4585}, {"n_sf11", "N-SF11", 1.7847},
	} {
		nd, c, ok := stock.GlassIndex(test.name)
		if !ok || nd != test.nd || c != test.canonical {
			t.Errorf("GlassIndex(%q) = %v, %q, %v; want %v, %q, true", test.name, nd, c, ok, test.nd, test.canonical)
		}
	}
	if _, _, ok := stock.GlassIndex("N-BAF10"); ok {
		t.Errorf("GlassIndex(N-BAF10) ok, want not known")
	}
}

// Kinds print as a stock file writes them and parse back.
func TestKind(t *testing.T) {
	for k := stock.PlanoConvex; k <= stock.Achromat; k++ {
		if got, ok := stock.ParseKind(k.String()); !ok || got != k {
			t.Errorf("ParseKind(%q) = %v, %v", k.String(), got, ok)
		}
	}
	for s, want := range map[string]stock.Kind{"Plano Convex": stock.PlanoConvex, "planoconcave": stock.PlanoConcave, "achromatic doublet": stock.Achromat, "negative meniscus": stock.Meniscus} {
		if got, ok := stock.ParseKind(s); !ok || got != want {
			t.Errorf("ParseKind(%q) = %v, %v; want %v", s, got, ok, want)
		}
	}
	if _, ok := stock.ParseKind("lens"); ok {
		t.Errorf(`ParseKind("lens") ok`)
	}
}

// The thin and thick models carry the clear aperture: 90 % of the
// diameter (ClearFraction, common practice).
func TestModels(t *testing.T) {
	l, err := stock.LensFromSpec(stock.Spec{Label: "BCX", Kind: stock.Biconvex, R1: 102.4 * mm, R2: -102.4 * mm, Thickness: 3.6 * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, build := range []func(string) (paraxial.System, error){l.Thin, l.Thick} {
		sys, err := build("L1")
		if err != nil {
			t.Fatal(err)
		}
		e := sys.Element(0)
		if !scalar.EqualWithinRel(float64(e.Aperture.Diameter()), 0.9*25.4e-3, 1e-15) || e.Label != "L1" {
			t.Errorf("element %s: aperture Ø %v, want 22.86 mm", e.Name(), e.Aperture.Diameter())
		}
	}
	a, _ := stock.LensFromSpec(stock.Spec{Label: "A", Kind: stock.Achromat, Focal: 100 * mm, Diameter: 25.4 * mm, Count: 1})
	if _, err := a.Thick("A"); !errors.Is(err, stock.ErrInput) {
		t.Errorf("achromat Thick error = %v, want ErrInput", err)
	}
	if _, err := (stock.Lens{}).Thin("L"); err == nil {
		t.Errorf("zero Lens Thin: no error")
	}
}
