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
		got := MatrixFromReduced(s.Matrix(Tangential).Reduced(s.IndexIn(), s.IndexOut()), s.IndexIn(), s.IndexOut())
		if !abcdEqualApprox(got, s.Matrix(Tangential), 1e-300, 1e-14) {
			t.Errorf("case %d: round trip = %+v, want %+v", i, got, s.Matrix(Tangential))
		}
		if d := s.Matrix(Tangential).Reduced(s.IndexIn(), s.IndexOut()).Det(); !scalar.EqualWithinAbsOrRel(d, 1, 1e-10, 1e-10) {
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
			m1, _ := s.MatrixTo(z1, p)
			m2, _ := s.MatrixTo(z2, p)
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
	s := mustBuild(t, NewBuilder().Space(0.1).ThinLens(0.05).Aperture(ClearRadius(0.01)).Space(0.2).ThickLens(0.05, -0.05, 0.005, 1.5).Space(0.1))
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
	before := s.Matrix(Tangential)
	// The same telescope appended twice: its labels are ambiguous until
	// the copies are named.
	if _, err := s.Part("T1"); !errors.Is(err, ErrAmbiguousLabel) || !strings.Contains(err.Error(), `the second is Append/ThinLens "T1" (call 4)`) {
		t.Errorf("Part(T1) with two copies: error = %v, want ErrAmbiguousLabel naming the second", err)
	}
	sp := mustBuild(t, NewBuilder().Space(20*mm).Append(tele).Label("A").Space(30*mm).Label("gap").Append(tele).Label("B").Space(40*mm).Label("tail"))
	w, err := sp.WithSpace("gap", 80*mm)
	if err != nil {
		t.Fatalf("WithSpace error: %v", err)
	}
	if sp.Matrix(Tangential) != before || sp.Element(4).Length != 30*mm {
		t.Errorf("WithSpace modified the original system")
	}
	if got := w.Element(5).Z; !scalar.EqualWithinAbsOrRel(float64(got), 0.25, 0, 1e-15) {
		t.Errorf("after WithSpace, element 5 at %v, want 250 mm", got)
	}
	if _, err := sp.WithSpace("A/T1", 1); err == nil || !strings.Contains(err.Error(), `Append/ThinLens "A/T1" (call 2): WithSpace: the part is a thin lens, not a single space`) {
		t.Errorf("WithSpace(thin lens) error = %v", err)
	}
	if _, err := sp.WithSpace("gap", -1); err == nil || !strings.Contains(err.Error(), `Space "gap" (call 3): length d = -1 m`) {
		t.Errorf("WithSpace(-1) error = %v", err)
	}
	if _, err := sp.WithSpace("L9", 1); !errors.Is(err, ErrNoLabel) || !strings.Contains(err.Error(), `labels are "A/T1", "A", "A/T2", "gap", "B/T1", "B", "B/T2", "tail"`) {
		t.Errorf("WithSpace(unknown label) error = %v, want ErrNoLabel listing the labels", err)
	}
	// The whole assembly by its name, a part of it by name/part.
	if pt, err := sp.Part("B"); err != nil || pt.First != 5 || pt.Last != 7 {
		t.Errorf("Part(B) = %+v, %v; want elements 5–7", pt, err)
	}
	pt, err := sp.Part("A/T1")
	if err != nil || pt.First != 1 || pt.Last != 1 || pt.Z != 20*mm || pt.End != 20*mm {
		t.Fatalf("Part(A/T1) = %+v, %v; want element 1 at 20 mm", pt, err)
	}
	// Swap the first T1 for a thick lens.
	thick := mustBuild(t, NewBuilder().ThickLens(51*mm, Flat, 4*mm, 1.5168).Label("T1 thick"))
	r, err := sp.Replace("A/T1", thick)
	if err != nil {
		t.Fatalf("Replace error: %v", err)
	}
	if r.Len() != 11 || len(r.Components()) != 1 || r.Components()[0].First != 1 || sp.Len() != 9 {
		t.Errorf("Replace: Len %d, components %+v; original Len %d", r.Len(), r.Components(), sp.Len())
	}
	if pt, err := r.Part("T1 thick"); err != nil || pt.First != 1 || pt.Last != 3 || !scalar.EqualWithinAbsOrRel(float64(pt.End-pt.Z), 4e-3, 0, 1e-12) {
		t.Errorf("Part(thick) = %+v, %v; want elements 1–3, 4 mm long", pt, err)
	}
	// Putting glass where air is expected is refused.
	glass := mustBuild(t, NewBuilder().Interface(0.1, 1.5))
	if _, err := sp.Replace("A/T1", glass); !errors.Is(err, ErrIndexChange) {
		t.Errorf("Replace with index change: error = %v, want ErrIndexChange", err)
	}
	if _, err := sp.Replace("A/T1", System{}); !errors.Is(err, ErrNotBuilt) {
		t.Errorf("Replace with an unbuilt system: error = %v, want ErrNotBuilt", err)
	}
	// Deleting a lens keeps the rest.
	empty := mustBuild(t, NewBuilder())
	d, err := r.Replace("T1 thick", empty)
	if err != nil || d.Len() != 8 || len(d.Components()) != 0 {
		t.Errorf("delete: Len %d, comps %d, err %v", d.Len(), len(d.Components()), err)
	}
	if _, err := NewBuilder().ThinLens(0.1).Label("a/b").Build(); err == nil || !strings.Contains(err.Error(), `must not contain "/"`) {
		t.Errorf(`Label("a/b") error = %v, want a "/" error`, err)
	}
}

// Move shifts a part between its neighbours and keeps every other
// position, the end plane included (a what-if edit; checked against the
// positions it must leave alone, no outside source needed).
func TestMove(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(100*mm).ThinLens(50*mm).Label("L1").Space(200*mm).ThinLens(100*mm).Label("L2").Space(300*mm))
	m, err := s.Move("L2", -5*mm)
	if err != nil {
		t.Fatalf("Move error: %v", err)
	}
	near := func(a, b units.Length) bool { return scalar.EqualWithinAbsOrRel(float64(a), float64(b), 1e-15, 0) }
	if !near(m.Length(), s.Length()) || !near(m.Element(3).Z, 295*mm) || m.Element(1).Z != 100*mm || !near(m.Element(4).Length, 305*mm) {
		t.Errorf("Move(L2, −5 mm): length %v, L2 at %v, L1 at %v, last gap %v; want 600, 295, 100, 305 mm",
			m.Length(), m.Element(3).Z, m.Element(1).Z, m.Element(4).Length)
	}
	if _, err := s.Move("L2", 400*mm); err == nil || !strings.Contains(err.Error(), `ThinLens "L2" (call 4): shift dz = 400 mm: Move: leaves a negative gap`) {
		t.Errorf("Move past the end: error = %v", err)
	}
	if _, err := s.Move("L2", units.Length(math.NaN())); err == nil {
		t.Errorf("Move(NaN): no error")
	}
	edge := mustBuild(t, NewBuilder().ThinLens(50*mm).Label("front").Space(10*mm))
	if _, err := edge.Move("front", 1*mm); err == nil || !strings.Contains(err.Error(), "no space before") {
		t.Errorf("Move of the first element: error = %v, want 'no space before'", err)
	}
}

func TestTables(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(10*mm).ThickLens(50*mm, Flat, 4*mm, 1.5).Label("L<1>").Aperture(ClearRadius(12*mm)).Space(90*mm).ConcaveMirror(200*mm, 10*units.Degree))
	p := s.Table()
	txt := p.Text()
	for _, want := range []string{"Prescription", "spherical interface (thick lens)", "L<1>", "R 50.000", "flat", "Ø 24.000", "mirror", "concave, R 200.000", "10.00", "2 ThickLens", "4 ConcaveMirror"} {
		if !strings.Contains(txt, want) {
			t.Errorf("Table().Text() lacks %q:\n%s", want, txt)
		}
	}
	c, _ := s.Cardinal(0)
	if ct := c.Table().Text(); !strings.Contains(ct, "EFL (mm)") || !strings.Contains(ct, "rear nodal point") || !strings.Contains(ct, "BFL, last vertex→F' (mm)") {
		t.Errorf("Cardinal table:\n%s", ct)
	}
	for _, r := range p.Rows {
		if len(r) != len(p.Header) {
			t.Errorf("row %v has %d cells, header %d", r, len(r), len(p.Header))
		}
	}
}
