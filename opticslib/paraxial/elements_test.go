package paraxial

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/units"
)

func TestReducedRoundTrip(t *testing.T) {
	// Reduced-angle form (y, nθ): a gap d in index n has B = d/n (reduced
	// thickness, Gerrard & Burch 1975 [from memory]); converting back is
	// the identity. One multiplication/division per entry: rel 1e-15.
	m := Space(0.3)
	r := m.Reduced(1.5, 1.5)
	if !scalar.EqualWithinAbsOrRel(r.B, 0.2, 0, 1e-15) {
		t.Errorf("Space(0.3).Reduced(1.5, 1.5).B = %g, want 0.2", r.B)
	}
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 100 {
		b, _ := randomBuilder(rng, 1+rng.IntN(10))
		s := mustBuild(t, b)
		got := MatrixFromReduced(s.Matrix().Reduced(s.IndexIn(), s.IndexOut()), s.IndexIn(), s.IndexOut())
		if !abcdEqualApprox(got, s.Matrix(), 1e-300, 1e-14) {
			t.Errorf("case %d: round trip = %+v, want %+v", i, got, s.Matrix())
		}
		if d := s.Matrix().Reduced(s.IndexIn(), s.IndexOut()).Det(); !scalar.EqualWithinAbsOrRel(d, 1, 1e-10, 1e-10) {
			t.Errorf("case %d: reduced det = %.15g, want 1", i, d)
		}
	}
}

func TestMatrixBetweenProperty(t *testing.T) {
	// Composition identity: MatrixTo(z1).Then(MatrixBetween(z1, z2)) = MatrixTo(z2)
	// for z1 ≤ z2 (analytic: the product of the element matrices is
	// associative). Rounding over ≤ 20 products of entries up to ~1e3: abs
	// 1e-10 scaled by the entry size, rel 1e-10.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 300 {
		b, _ := randomBuilder(rng, 1+rng.IntN(15))
		s := mustBuild(t, b)
		l := float64(s.Length())
		z1 := units.Length((rng.Float64()*1.4 - 0.2) * l)
		if i%7 == 0 && s.Len() > 1 {
			z1 = s.elems[s.Len()/2].Z // exactly at an element
		}
		z2 := z1 + units.Length(rng.Float64()*0.8*l)
		for _, p := range []Plane{Tangential, Sagittal} {
			m12, err := s.MatrixBetween(z1, z2, p)
			if err != nil {
				t.Errorf("case %d: MatrixBetween error: %v", i, err)
				continue
			}
			m1, _ := s.matrixTo(z1, p)
			m2, _ := s.matrixTo(z2, p)
			got := m1.Then(m12)
			scale := math.Abs(m2.A) + math.Abs(m2.B) + math.Abs(m2.C) + math.Abs(m2.D) + 1
			if !abcdEqualApprox(got, m2, 1e-12*scale, 1e-10) {
				t.Errorf("case %d: Between(%v, %v)·To(z1) = %+v, want To(z2) = %+v", i, z1, z2, got, m2)
			}
			// Trace from z1 (which includes surfaces at z1) agrees with
			// the matrix when no surface sits at z1.
			r := Ray{Y: 1e-3, Theta: 2e-3}
			steps, err := s.Trace(r, z1, z2, p, nil)
			if err != nil {
				t.Errorf("case %d: Trace error: %v", i, err)
				continue
			}
			end := steps[len(steps)-1]
			onSurface := false
			for _, e := range s.elems {
				if e.IsSurface() && e.Z == z1 {
					onSurface = true
				}
			}
			if onSurface {
				continue
			}
			want := m12.Apply(r)
			if end.Z != z2 && !(z2 <= 0 && end.Z == z2) {
				if !(len(steps) > 0 && scalar.EqualWithinAbsOrRel(float64(end.Z), float64(z2), 1e-15, 1e-12)) {
					t.Errorf("case %d: last step at %v, want %v", i, end.Z, z2)
				}
			}
			if !scalar.EqualWithinAbsOrRel(float64(end.Ray.Y), float64(want.Y), 1e-12*scale*1e-3, 1e-9) ||
				!scalar.EqualWithinAbsOrRel(float64(end.Ray.Theta), float64(want.Theta), 1e-12*scale*1e-3, 1e-9) {
				t.Errorf("case %d: Trace end ray = %+v, matrix gives %+v", i, end.Ray, want)
			}
		}
	}
	s := mustBuild(t, NewBuilder().Space(1))
	if _, err := s.MatrixBetween(0.5, 0.2, 0); err != ErrOrder {
		t.Errorf("MatrixBetween(0.5, 0.2) error = %v, want ErrOrder", err)
	}
	if _, err := s.MatrixBetween(units.Length(math.NaN()), 0.2, 0); err != ErrNonFinite {
		t.Errorf("MatrixBetween(NaN, 0.2) error = %v, want ErrNonFinite", err)
	}
}

func TestTraceAllocs(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(0.1).ThinLens(0.05).Aperture(0.01).Space(0.2).ThickLens(0.05, -0.05, 0.005, 1.5).Space(0.1))
	dst := make([]Step, 0, 16)
	allocs := testing.AllocsPerRun(100, func() {
		var err error
		dst, err = s.Trace(Ray{Y: 1e-3}, 0, 0.5, Tangential, dst)
		if err != nil {
			t.Fatal(err)
		}
	})
	if allocs != 0 {
		t.Errorf("Trace with capacity allocates %v times per ray, want 0", allocs)
	}
	if _, err := s.Trace(Ray{Y: units.Length(math.Inf(1))}, 0, 1, 0, dst); err != ErrNonFinite {
		t.Errorf("Trace(Inf ray) error = %v, want ErrNonFinite", err)
	}
	if _, err := s.Trace(Ray{}, 1, 0, 0, dst); err != ErrOrder {
		t.Errorf("Trace(from > to) error = %v, want ErrOrder", err)
	}
}

func TestEdits(t *testing.T) {
	tele := mustBuild(t, NewBuilder().ThinLens(50*mm).Label("T1").Space(150*mm).ThinLens(100*mm).Label("T2"))
	s := mustBuild(t, NewBuilder().Space(20*mm).Append(tele).Space(30*mm).Append(tele).Space(40*mm).Label("tail"))
	if s.Len() != 9 || !scalar.EqualWithinAbsOrRel(float64(s.Length()), 0.39, 0, 1e-15) {
		t.Fatalf("telescope twice: Len %d, Length %v; want 9, 390 mm", s.Len(), s.Length())
	}
	// Two 2× telescopes in series magnify 4× (A = (−2)² = 4; Kogelnik & Li
	// table I products). rel 1e-14.
	if c, err := s.Cardinal(0); err != nil || !c.Afocal || !scalar.EqualWithinAbsOrRel(c.TransverseMagnification, 4, 0, 1e-14) {
		t.Errorf("telescope twice: Cardinal = %+v, %v; want afocal with A = 4", c, err)
	}
	before := s.Matrix()
	w, err := s.WithSpace(4, 80*mm)
	if err != nil {
		t.Fatalf("WithSpace error: %v", err)
	}
	if s.Matrix() != before || s.Element(4).Length != 30*mm {
		t.Errorf("WithSpace modified the original system")
	}
	if got := w.Element(5).Z; !scalar.EqualWithinAbsOrRel(float64(got), 0.25, 0, 1e-15) {
		t.Errorf("after WithSpace, element 5 at %v, want 250 mm", got)
	}
	if _, err := s.WithSpace(1, 1); err == nil || !strings.Contains(err.Error(), "element 1 is a thin lens, not a space") {
		t.Errorf("WithSpace(thin lens) error = %v", err)
	}
	if _, err := s.WithSpace(0, -1); err == nil || !strings.Contains(err.Error(), "length d = -1 m") {
		t.Errorf("WithSpace(-1) error = %v", err)
	}
	// Swap the first T1 for a thick lens.
	i, j, ok := s.Lookup("T1")
	if !ok || i != 1 || j != 2 {
		t.Fatalf("Lookup(T1) = %d, %d, %v; want 1, 2, true", i, j, ok)
	}
	thick := mustBuild(t, NewBuilder().ThickLens(51*mm, Flat, 4*mm, 1.5168).Label("T1 thick"))
	r, err := s.Replace(i, j, thick)
	if err != nil {
		t.Fatalf("Replace error: %v", err)
	}
	if r.Len() != 11 || len(r.Components()) != 1 || r.Components()[0].First != 1 || s.Len() != 9 {
		t.Errorf("Replace: Len %d, components %+v; original Len %d", r.Len(), r.Components(), s.Len())
	}
	if k, l, ok := r.Lookup("T1 thick"); !ok || k != 1 || l != 4 {
		t.Errorf("Lookup(thick) = %d, %d, %v; want 1, 4, true", k, l, ok)
	}
	// Cutting through the thick lens is refused.
	if _, err := r.Replace(2, 3, System{}); !errors.Is(err, ErrSplitComponent) {
		t.Errorf("Replace through a component: error = %v, want ErrSplitComponent", err)
	}
	// Putting glass where air is expected is refused.
	glass := mustBuild(t, NewBuilder().Interface(0.1, 1.5))
	if _, err := s.Replace(1, 2, glass); !errors.Is(err, ErrIndexChange) {
		t.Errorf("Replace with index change: error = %v, want ErrIndexChange", err)
	}
	// Deleting a lens keeps the rest.
	d, err := r.Replace(1, 4, System{})
	if err != nil || d.Len() != 8 || len(d.Components()) != 0 {
		t.Errorf("delete: Len %d, comps %d, err %v", d.Len(), len(d.Components()), err)
	}
}

func TestTables(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(10*mm).ThickLens(50*mm, Flat, 4*mm, 1.5).Label("L<1>").Aperture(12*mm).Space(90*mm).Mirror(-200*mm, 10*units.Degree))
	p := s.Prescription()
	txt := p.Text()
	for _, want := range []string{"Prescription", "spherical interface (thick lens)", "L<1>", "R 50.000", "flat", "12.000", "mirror", "R -200.000", "10.00"} {
		if !strings.Contains(txt, want) {
			t.Errorf("Prescription().Text() lacks %q:\n%s", want, txt)
		}
	}
	h := p.HTML()
	if !strings.Contains(h, "L&lt;1&gt;") || strings.Contains(h, "L<1>") || !strings.HasPrefix(h, `<table class="paraxial-table">`) {
		t.Errorf("HTML() does not escape cells: %s", h)
	}
	c, _ := s.Cardinal(0)
	if ct := c.Table().Text(); !strings.Contains(ct, "EFL (mm)") || !strings.Contains(ct, "rear nodal point") {
		t.Errorf("Cardinal table:\n%s", ct)
	}
	for _, r := range p.Rows {
		if len(r) != len(p.Header) {
			t.Errorf("row %v has %d cells, header %d", r, len(r), len(p.Header))
		}
	}
}
