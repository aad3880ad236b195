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

// The zero System is not an empty system: every analysis says so instead
// of returning the results of a system that was never built.
func TestUnbuiltSystem(t *testing.T) {
	var s System
	for _, test := range []struct {
		name string
		err  error
	}{
		{"Validate", s.Validate()},
		{"Cardinal", func() error { _, err := s.Cardinal(Tangential); return err }()},
		{"Image", func() error { _, err := s.Image(0, Tangential); return err }()},
		{"ObjectFor", func() error { _, err := s.ObjectFor(-1, Tangential); return err }()},
		{"Stops", func() error { _, err := s.Stops(ObjectAt(0), Tangential); return err }()},
		{"MatrixTo", func() error { _, err := s.MatrixTo(0, Tangential); return err }()},
		{"MatrixBetween", func() error { _, err := s.MatrixBetween(0, 1, Sagittal); return err }()},
		{"Trace", func() error { _, err := s.Trace(Ray{}, 0, 1, Tangential, nil); return err }()},
		{"Fan", func() error { _, err := s.Fan(Stops{}, Field{}, 3, 1); return err }()},
		{"Part", func() error { _, err := s.Part("L1"); return err }()},
		{"Reverse", func() error { _, err := s.Reverse(); return err }()},
	} {
		if !errors.Is(test.err, ErrNotBuilt) {
			t.Errorf("%s on the zero System: error = %v, want ErrNotBuilt", test.name, test.err)
		}
	}
	if n := 0; func() bool {
		for range s.Walk(0, 1) {
			n++
		}
		return n != 0
	}() {
		t.Errorf("Walk over the zero System yielded %d pieces, want 0", n)
	}
}

// An unknown Plane value is an error in the analyses and a panic in the
// accessors, never read silently as Tangential.
func TestUnknownPlane(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(0.1).ThinLens(0.1).Aperture(ClearRadius(0.01)).Space(0.1))
	bad := Plane(2)
	for _, test := range []struct {
		name string
		err  error
	}{
		{"Cardinal", func() error { _, err := s.Cardinal(bad); return err }()},
		{"Image", func() error { _, err := s.Image(0, bad); return err }()},
		{"Stops", func() error { _, err := s.Stops(ObjectAt(0), bad); return err }()},
		{"MatrixTo", func() error { _, err := s.MatrixTo(0.1, bad); return err }()},
		{"Trace", func() error { _, err := s.Trace(Ray{}, 0, 0.2, bad, nil); return err }()},
		{"CylindricalLens", func() error { _, err := NewBuilder().CylindricalLens(0.1, bad).Build(); return err }()},
	} {
		if !errors.Is(test.err, ErrPlane) {
			t.Errorf("%s(Plane(2)): error = %v, want ErrPlane", test.name, test.err)
		}
	}
	defer func() {
		if r := recover(); r == nil || !strings.Contains(r.(string), "Plane(2) is neither Tangential nor Sagittal") {
			t.Errorf("Matrix(Plane(2)) recovered %v, want a panic naming the plane", r)
		}
	}()
	s.Matrix(bad)
}

// A round part met at θ limits the tangential plane to a·cos θ: the
// projection of a circle of radius a on a plane tilted by θ (analytic
// geometry), and the sagittal plane to a. A 10 mm round mirror (clear
// radius 4.5 mm) at 45° is the stop of a collimated pencil with a
// tangential half-opening of 3.182 mm.
func TestTiltedStop(t *testing.T) {
	const mm = units.Millimeter
	s := mustBuild(t, NewBuilder().Space(50*mm).FlatMirror(45*units.Degree).Label("M1").Aperture(ClearRadius(4.5*mm)).Space(100*mm))
	for _, test := range []struct {
		p    Plane
		want float64
	}{
		{Tangential, 4.5e-3 * math.Cos(math.Pi/4)},
		{Sagittal, 4.5e-3},
	} {
		a, err := s.Stops(ObjectAtInfinity(), test.p)
		if err != nil {
			t.Errorf("%v: Stops error: %v", test.p, err)
			continue
		}
		// One cosine and one product: rel 1e-15.
		if !scalar.EqualWithinAbsOrRel(float64(a.StopRadius), test.want, 0, 1e-15) || a.StopName != "M1" {
			t.Errorf("%v: stop %s, half-opening %v; want M1, %g m", test.p, a.StopName, a.StopRadius, test.want)
		}
	}
	// A ray at 4 mm passes in y (sagittal) and is blocked in x.
	for _, test := range []struct {
		p       Plane
		blocked bool
	}{{Tangential, true}, {Sagittal, false}} {
		steps, err := s.Trace(Ray{Y: 4 * mm}, 0, s.Length(), test.p, nil)
		if err != nil {
			t.Fatal(err)
		}
		if steps[2].Blocked != test.blocked {
			t.Errorf("%v: ray at 4 mm blocked = %v at the 45° mirror, want %v", test.p, steps[2].Blocked, test.blocked)
		}
	}
}

// An opening offset by dx passes heights in [dx − a, dx + a]; a slit
// limits only the plane it cuts across.
func TestOffsetAndSlitLimits(t *testing.T) {
	const mm = units.Millimeter
	s := mustBuild(t, NewBuilder().Space(10*mm).Diaphragm(ClearRadius(1*mm).Offset(0.5*mm, 0)).Space(10*mm).
		Diaphragm(SlitOfWidth(4*mm, Sagittal)).Space(10*mm))
	// Circle of radius 1 mm centred at x = 0.5 mm: in x it passes
	// [−0.5, 1.5] mm; in y its chord through the axis has the half-length
	// √(a² − dx²) = 0.866 mm (analytic geometry).
	for _, test := range []struct {
		y       units.Length
		p       Plane
		blocked bool
	}{
		{1.4 * mm, Tangential, false}, {-0.6 * mm, Tangential, true}, {-0.4 * mm, Tangential, false},
		{0.85 * mm, Sagittal, false}, {-0.88 * mm, Sagittal, true},
	} {
		steps, err := s.Trace(Ray{Y: test.y}, 0, s.Length(), test.p, nil)
		if err != nil {
			t.Fatal(err)
		}
		if got := steps[2].Blocked; got != test.blocked {
			t.Errorf("%v ray at %v: blocked %v, want %v", test.p, test.y, got, test.blocked)
		}
	}
	// The slit (4 mm wide across y) blocks y = 2.5 mm but not x = 2.5 mm.
	for _, test := range []struct {
		p       Plane
		blocked bool
	}{{Sagittal, true}, {Tangential, false}} {
		steps, _ := s.Trace(Ray{Y: 2.5 * mm}, 15*mm, s.Length(), test.p, nil)
		if steps[2].Blocked != test.blocked {
			t.Errorf("%v: ray at 2.5 mm through a 4 mm slit across y: blocked %v, want %v", test.p, steps[2].Blocked, test.blocked)
		}
	}
}

func TestFanLimit(t *testing.T) {
	s := mustBuild(t, NewBuilder().ThinLens(0.1).Aperture(ClearRadius(0.01)).Space(0.2))
	a, err := s.Stops(ObjectAt(-0.2), Tangential)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{0, MaxFanRays + 1, 1 << 40} {
		if _, err := s.Fan(a, Field{}, n, 0.2); err == nil || !strings.Contains(err.Error(), "ray count n") {
			t.Errorf("Fan(n = %d) error = %v, want a ray-count error", n, err)
		}
	}
}

// Walk's pieces tile [from, to] without gaps or overlaps, and their
// matrices compose to MatrixBetween (associativity of the matrix product;
// the walk and MatrixBetween share no code but the walker). Seeded
// random systems; rel 1e-12 for ≤ 40 products.
func TestWalkTiles(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 200 {
		b, _ := randomBuilder(rng, 1+rng.IntN(12))
		s := mustBuild(t, b)
		l := float64(s.Length())
		from := units.Length((rng.Float64()*1.4 - 0.2) * l)
		to := from + units.Length(rng.Float64()*l)
		pos := from
		m := Identity()
		first := true
		for pc := range s.Walk(from, to) {
			if pc.From != pos && !(first && pc.From == from) {
				t.Errorf("case %d: piece %d starts at %v, previous ended at %v", i, pc.Element, pc.From, pos)
			}
			first = false
			if pc.Kind != KindSpace && pc.From == from && from >= 0 {
				pos = pc.To
				continue // MatrixBetween excludes surfaces at its start plane
			}
			m = m.Then(pc.X)
			pos = pc.To
		}
		if pos != to && !(s.Length() == to) {
			t.Errorf("case %d: walk ends at %v, want %v", i, pos, to)
		}
		want, err := s.MatrixBetween(from, to, Tangential)
		if err != nil {
			continue
		}
		if !abcdEqualApprox(m, want, 1e-12, 1e-12) {
			t.Errorf("case %d: pieces compose to %+v, MatrixBetween = %+v", i, m, want)
		}
	}
}

// A plate at Brewster's angle (n = 1.5, tan θ = n) with a 3 mm clear
// radius: the opening limits the tangential plane to 3 mm·cos θ = 1.664 mm
// in the frame of the arriving beam (analytic geometry; Brewster's angle
// per Born & Wolf, Principles of Optics, 7th ed., §1.5 [from memory]). The
// exit surface, seen from inside the glass, gives the same limit, so the
// front surface is the stop (ties go to the first).
func TestTiltedPlateStop(t *testing.T) {
	const mm = units.Millimeter
	th := units.Angle(math.Atan(1.5))
	s := mustBuild(t, NewBuilder().Space(10*mm).Plate(5*mm, 1.5, th).Label("window").Aperture(ClearRadius(3*mm)).Space(10*mm))
	a, err := s.Stops(ObjectAtInfinity(), Tangential)
	if err != nil {
		t.Fatal(err)
	}
	want := 3e-3 * math.Cos(float64(th))
	// Two products and a cosine: rel 1e-12.
	if !scalar.EqualWithinAbsOrRel(float64(a.Entrance.Radius), want, 0, 1e-12) || a.Stop != 1 {
		t.Errorf("Brewster window: stop element %d, entrance pupil radius %v; want element 1, %g m", a.Stop, a.Entrance.Radius, want)
	}
	for _, test := range []struct {
		y       units.Length
		blocked bool
	}{{1.6 * mm, false}, {1.7 * mm, true}} {
		steps, err := s.Trace(Ray{Y: test.y}, 0, s.Length(), Tangential, nil)
		if err != nil {
			t.Fatal(err)
		}
		any := false
		for _, st := range steps {
			any = any || st.Blocked
		}
		if any != test.blocked {
			t.Errorf("ray at %v through the Brewster window: blocked %v, want %v", test.y, any, test.blocked)
		}
	}
}

// An opening offset so far that the axis lies outside it passes no
// paraxial pencil: Stops says so instead of returning an f-number of ∞.
func TestAxisOutsideOpening(t *testing.T) {
	const mm = units.Millimeter
	s := mustBuild(t, NewBuilder().Space(10*mm).ThinLens(50*mm).Label("L").Aperture(ClearRadius(1*mm).Offset(2*mm, 0)).Space(50*mm))
	if _, err := s.Stops(ObjectAtInfinity(), Tangential); !errors.Is(err, ErrAxisOutside) || !strings.Contains(err.Error(), `ThinLens "L" (call 2)`) {
		t.Errorf("Stops with the axis outside the opening: error = %v, want ErrAxisOutside naming the lens", err)
	}
}

func TestOpeningValidate(t *testing.T) {
	if _, _, ok := ClearRadius(1e-3).Limits(Plane(9), 0); ok {
		t.Errorf("Limits(Plane(9)) ok = true, want false")
	}
	for _, o := range []Opening{ClearRadius(-1), {Shape: Shape(7), Radius: 1}, SlitOfWidth(1, Plane(4)), ClearRadius(1).WithMinTransmission(2)} {
		if o.Validate() == nil {
			t.Errorf("Validate(%+v) = nil, want an error", o)
		}
	}
	if (Opening{}).Validate() != nil || OneInchOptic().Validate() != nil {
		t.Errorf("valid openings rejected")
	}
	// 10 rays through 10⁶ steps' worth of elements.
	b := NewBuilder()
	for range 200 {
		b.Space(1e-3).ThinLens(0.1)
	}
	s := mustBuild(t, b.Aperture(ClearRadius(0.01)))
	a, err := s.Stops(ObjectAtInfinity(), Tangential)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := s.Fan(a, Field{}, MaxFanRays, s.Length()); err == nil || !strings.Contains(err.Error(), "steps") {
		t.Errorf("Fan of 10⁴ rays through 400 elements: error = %v, want a step-count error", err)
	}
}
