package trace_test

import (
	"errors"
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/trace"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestFromParaxialFocus checks that a thick plano-convex lens from the
// paraxial builder, traced with a near-axis real ray, focuses where the
// paraxial trace puts the back focus (the paraxial limit of the exact
// trace; Welford, Aberrations of Optical Systems, 1986, §2.3 [from
// memory]). A ray at h = 1 µm carries spherical aberration of order
// (h/f)² ≈ 1e-10 of f, hence the 1e-9 relative tolerance.
func TestFromParaxialFocus(t *testing.T) {
	b := paraxial.NewBuilder().Space(20*mm).ThickLens(51.68*mm, paraxial.Flat, 4*mm, 1.5168).Label("L1").Space(150 * mm)
	p, err := b.Build()
	if err != nil {
		t.Fatal(err)
	}
	s, err := trace.FromParaxial(p, trace.Media{})
	if err != nil {
		t.Fatal(err)
	}
	if s.Len() != 2 || float64(s.Vertex(0)) != 20e-3 || !scalar.EqualWithinAbs(float64(s.Vertex(2)), 174e-3, 1e-15) {
		t.Fatalf("surfaces %d, vertex 0 at %v, image at %v", s.Len(), s.Vertex(0), s.Vertex(2))
	}
	card, err := p.Cardinal(paraxial.Tangential)
	if err != nil {
		t.Fatal(err)
	}
	r, st, _, err := s.TraceRay(lambda, trace.RayFromAngles(0, 1e-6, 0, 0, 0))
	if err != nil || st != trace.OK {
		t.Fatal(st, err)
	}
	got := axisCrossing(r)
	want := float64(card.RearFocalPoint)
	if !scalar.EqualWithinRel(got, want, 1e-9) {
		t.Errorf("near-axis crossing at %.9f m, paraxial back focus %.9f m", got, want)
	}
}

// TestFromParaxialRefuses checks the elements without a real-ray model.
func TestFromParaxialRefuses(t *testing.T) {
	p, err := paraxial.NewBuilder().Space(10*mm).CylindricalLens(50*mm, paraxial.Tangential).Label("cyl").Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	_, err = trace.FromParaxial(p, trace.Media{})
	if !errors.Is(err, trace.ErrNotTraceable) {
		t.Fatalf("cylindrical lens: err = %v, want ErrNotTraceable", err)
	}
	t.Log(err)
}

// TestFromParaxialMirror checks a concave mirror from the builder: the
// light comes back towards −z and a paraxial ray crosses the axis at the
// focus f = R/2 before the mirror (the mirror equation); the exact
// crossing differs by the sphere's aberration R/2·(1/cos θ − 1) ≈ 1.25e-12 m
// at h = 1 µm (reference-checks R35), inside the 1e-11 m tolerance.
func TestFromParaxialMirror(t *testing.T) {
	p, err := paraxial.NewBuilder().Space(100*mm).ConcaveMirror(200*mm, 0).Space(100 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	s, err := trace.FromParaxial(p, trace.Media{})
	if err != nil {
		t.Fatal(err)
	}
	r, st, _, err := s.TraceRay(lambda, trace.RayFromAngles(0, 1e-6, 0, 0, 0))
	if err != nil || st != trace.OK {
		t.Fatal(st, err)
	}
	if got := axisCrossing(r); !scalar.EqualWithinAbs(got, 0, 1e-11) || math.Signbit(r.Direction.Z) == false {
		t.Errorf("crossing at z = %v m (want 0: f = 100 mm before the mirror at 100 mm), direction %v", got, r.Direction)
	}
}

// TestFromParaxialGlass checks that a thick lens's material fills its
// glass only: the medium after the back surface is the air again, and the
// lens focuses where the paraxial trace with the material's indices puts
// it (compared with the same lens given the material's index as a number).
func TestFromParaxialGlass(t *testing.T) {
	glass := trace.Index(1.6)
	for _, flat := range []bool{false, true} {
		b := paraxial.NewBuilder().Space(20 * mm)
		if flat {
			b.ThickLens(paraxial.Flat, -30*mm, 5*mm, 1.5)
		} else {
			b.ThickLens(30*mm, paraxial.Flat, 5*mm, 1.5)
		}
		p, err := b.Label("L1").Space(60 * mm).Build()
		if err != nil {
			t.Fatal(err)
		}
		s, err := trace.FromParaxial(p, trace.Media{Glass: map[string]trace.Medium{"L1": glass}})
		if err != nil {
			t.Fatal(err)
		}
		if got := s.MediumAfter(1).Name(); got != "n = 1" {
			t.Errorf("flat first %v: medium after the back surface %q, want the air", flat, got)
		}
		if got := s.MediumAfter(0).Name(); got != "n = 1.6" {
			t.Errorf("flat first %v: glass %q, want n = 1.6", flat, got)
		}
	}
}

// TestTable checks the surface table of a system from the builder: one row
// per surface and the image plane, positions in mm.
func TestTable(t *testing.T) {
	p, err := paraxial.NewBuilder().Space(20*mm).ThickLens(30*mm, paraxial.Flat, 5*mm, 1.5).Label("L1").Space(60 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	s, err := trace.FromParaxial(p, trace.Media{})
	if err != nil {
		t.Fatal(err)
	}
	tb := s.Table()
	if err := tb.Validate(); err != nil || len(tb.Rows) != 3 {
		t.Fatalf("table %v rows, err %v:\n%s", len(tb.Rows), err, tb.Text())
	}
	if got := tb.Cell(1, 3); got != "25.000" {
		t.Errorf("back vertex z = %q mm, want 25.000", got)
	}
	if got := tb.Cell(2, 3); got != "85.000" {
		t.Errorf("image plane z = %q mm, want 85.000", got)
	}
}
