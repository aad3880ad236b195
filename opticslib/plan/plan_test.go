package plan

// Layout tests: the fold geometry against the law of reflection and
// analytic paths, positions against the cumulative path lengths, hole
// snapping, the checks on constructed cases, and bad input.

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

// Tolerances. Positions are sums of a few products of lengths below 1 m
// with sines and cosines: rounding ~1e-16 m per step, 1e-12 m (1 pm) is
// far above it and far below anything on a bench. Angles come from a few
// additions of numbers below 2π and an atan2: 1e-12 rad.
const (
	posTol   = 1e-12
	angleTol = 1e-12
)

func mustBuild(t testing.TB, b *paraxial.Builder) paraxial.System {
	t.Helper()
	sys, err := b.Build()
	if err != nil {
		t.Fatalf("Build: %v", err)
	}
	return sys
}

func mustLay(t testing.TB, sys paraxial.System, s Spec) Plan {
	t.Helper()
	p, err := Lay(sys, s)
	if err != nil {
		t.Fatalf("Lay: %v", err)
	}
	return p
}

func near(a, b Point, tol float64) bool {
	return math.Abs(float64(a.X-b.X)) <= tol && math.Abs(float64(a.Y-b.Y)) <= tol
}

// angleDiff returns a − b reduced to (−π, π].
func angleDiff(a, b float64) float64 {
	d := math.Mod(a-b, 2*math.Pi)
	if d > math.Pi {
		d -= 2 * math.Pi
	}
	if d <= -math.Pi {
		d += 2 * math.Pi
	}
	return d
}

func part(t *testing.T, p Plan, name string) Part {
	t.Helper()
	for _, pt := range p.Parts {
		if pt.Name == name {
			return pt
		}
	}
	t.Fatalf("no part %q in the plan", name)
	return Part{}
}

// TestFold45: a single 45° mirror turns the beam by exactly 90° (the law
// of reflection: 180° − 2·45°), to the left or the right as given, with
// the face normal bisecting the reversed arriving beam and the leaving
// one (135° for a left turn from +x, 225° for a right one).
func TestFold45(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(100*mm).FlatMirror(45*units.Degree).Label("M").Space(200*mm))
	for _, test := range []struct {
		turn           Turn
		start, end     Point
		out, normalDeg float64
	}{
		{Left, Point{X: 100 * mm, Y: 100 * mm}, Point{X: 200 * mm, Y: 300 * mm}, 90, 135},
		{Right, Point{X: 100 * mm, Y: 300 * mm}, Point{X: 200 * mm, Y: 100 * mm}, 270, 225},
	} {
		p := mustLay(t, sys, Spec{Board: MetricBoard(600*mm, 600*mm), Start: test.start, Folds: map[string]Turn{"M": test.turn}})
		m := part(t, p, "M")
		if d := angleDiff(float64(m.Out-m.In), math.Pi/2); test.turn == Left && math.Abs(d) > angleTol {
			t.Errorf("%v: Out − In = %g°, want 90°", test.turn, (m.Out - m.In).Degrees())
		}
		if d := angleDiff(float64(m.Out), test.out*math.Pi/180); math.Abs(d) > angleTol {
			t.Errorf("%v: Out = %g°, want %g°", test.turn, m.Out.Degrees(), test.out)
		}
		if d := angleDiff(float64(m.Normal), test.normalDeg*math.Pi/180); math.Abs(d) > angleTol {
			t.Errorf("%v: Normal = %g°, want %g°", test.turn, m.Normal.Degrees(), test.normalDeg)
		}
		if end, _ := p.At(p.Length); !near(end, test.end, posTol) {
			t.Errorf("%v: path ends at %v, want %v", test.turn, end, test.end)
		}
		if len(p.Warnings) != 0 {
			t.Errorf("%v: warnings %v, want none", test.turn, p.Warnings)
		}
	}
}

// TestReflectionLaw: for any angle of incidence and side, the leaving
// direction is the arriving one reflected about the face normal,
//
//	d_out = d_in − 2(d_in·n)n
//
// (the vector form of the law of reflection), the beams meet the normal
// at θ on either side (|d_in·n| = cos θ), and a left fold turns
// counterclockwise (d_in × d_out > 0).
func TestReflectionLaw(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 13))
	for i := range 200 {
		theta := units.Angle(r.Float64() * 1.5) // up to 86°
		turn := Left
		if r.IntN(2) == 1 {
			turn = Right
		}
		dir := units.Angle(2 * math.Pi * r.Float64())
		sys := mustBuild(t, paraxial.NewBuilder().Space(50*mm).FlatMirror(theta).Label("M").Space(50*mm))
		p := mustLay(t, sys, Spec{Board: MetricBoard(300*mm, 300*mm), Start: Point{X: 150 * mm, Y: 150 * mm}, Direction: dir, Folds: map[string]Turn{"M": turn}})
		m := part(t, p, "M")
		din, dout, n := unit(float64(m.In)), unit(float64(m.Out)), unit(float64(m.Normal))
		want := din.sub(n.scale(2 * dot(din, n)))
		if dout.sub(want).norm() > angleTol {
			t.Errorf("case %d (θ %g°, %v): d_out = %v, reflection gives %v", i, theta.Degrees(), turn, dout, want)
		}
		if c := math.Abs(dot(din, n)); math.Abs(c-math.Cos(float64(theta))) > angleTol {
			t.Errorf("case %d: |d_in·n| = %g, want cos θ = %g", i, c, math.Cos(float64(theta)))
		}
		if dot(dout, n) < 0 {
			t.Errorf("case %d: the normal points away from the leaving beam", i)
		}
		if s := cross(din, dout); (turn == Left) != (s > 0) {
			t.Errorf("case %d: %v fold has d_in × d_out = %g", i, turn, s)
		}
	}
}

// TestZFold: two 45° mirrors folding left then right (a Z, or a
// periscope laid flat) give a beam parallel to the input, offset by the
// mirror spacing; left then left give an antiparallel beam (a U).
func TestZFold(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(200*mm).FlatMirror(45*units.Degree).Label("M1").
		Space(75*mm).FlatMirror(45*units.Degree).Label("M2").Space(150*mm))
	start := Point{X: 50 * mm, Y: 100 * mm}
	for _, test := range []struct {
		second Turn
		end    Point
		dir    float64
	}{
		{Right, Point{X: 400 * mm, Y: 175 * mm}, 0},
		{Left, Point{X: 100 * mm, Y: 175 * mm}, math.Pi},
	} {
		p := mustLay(t, sys, Spec{Board: MetricBoard(600*mm, 300*mm), Start: start, Folds: map[string]Turn{"M1": Left, "M2": test.second}})
		end, dir := p.At(p.Length)
		if !near(end, test.end, posTol) {
			t.Errorf("M2 %v: end %v, want %v", test.second, end, test.end)
		}
		if math.Abs(angleDiff(float64(dir), test.dir)) > angleTol {
			t.Errorf("M2 %v: end direction %g°, want %g°", test.second, dir.Degrees(), test.dir*180/math.Pi)
		}
		// The offset of the output line from the input line is the
		// mirror spacing, 75 mm.
		if off := float64(end.Y - start.Y); math.Abs(off-0.075) > posTol {
			t.Errorf("M2 %v: lateral offset %g m, want 0.075", test.second, off)
		}
	}
}

// TestCumulativePositions: on a random folded path, every segment is as
// long on the board as along the path, consecutive segments join, they
// add up to the system's length, and each part sits at its path position
// along its segment.
func TestCumulativePositions(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 13))
	for c := range 50 {
		b := paraxial.NewBuilder()
		folds := map[string]Turn{}
		nm := 0
		for k := range 8 {
			b.Space(units.Length(10+190*r.Float64()) * mm)
			switch r.IntN(3) {
			case 0:
				nm++
				l := "M" + string(rune('0'+nm))
				b.FlatMirror(units.Angle(1.4 * r.Float64())).Label(l)
				folds[l] = Turn(1 + r.IntN(2))
			case 1:
				b.ThinLens(units.Length(50+100*r.Float64()) * mm).Label("L" + string(rune('0'+k)))
			default:
				b.Plate(5*mm, 1.5, units.Angle(0.5*r.Float64())).Label("P" + string(rune('0'+k)))
			}
		}
		b.Space(100 * mm)
		sys := mustBuild(t, b)
		p := mustLay(t, sys, Spec{Board: MetricBoard(5000*mm, 5000*mm), Start: Point{X: 2500 * mm, Y: 2500 * mm}, Direction: 0.3, Folds: folds})
		total := 0.0
		for k, s := range p.Segments {
			l := s.To.vec().sub(s.From.vec()).norm()
			if math.Abs(l-float64(s.Z1-s.Z0)) > posTol {
				t.Errorf("case %d segment %d: board length %g m, path length %g m", c, k, l, float64(s.Z1-s.Z0))
			}
			if k > 0 && (p.Segments[k-1].To != s.From || p.Segments[k-1].Z1 != s.Z0) {
				t.Errorf("case %d: segment %d does not start where %d ends", c, k, k-1)
			}
			total += float64(s.Z1 - s.Z0)
		}
		if math.Abs(total-float64(sys.Length())) > posTol {
			t.Errorf("case %d: segments add to %g m, system length %g m", c, total, float64(sys.Length()))
		}
		for _, pt := range p.Parts {
			s := p.Segments[pt.Segment]
			if d := pt.At.vec().sub(s.From.vec()).norm(); math.Abs(d-float64(pt.Center-s.Z0)) > posTol {
				t.Errorf("case %d %s: %g m from its segment's start, path says %g m", c, pt.Name, d, float64(pt.Center-s.Z0))
			}
		}
	}
}

// TestHoles: hole counts and the nearest hole with its offset, for a
// metric and an imperial board (the grids of MetricBoard and
// ImperialBoard: first hole half a pitch from the edges).
func TestHoles(t *testing.T) {
	for _, test := range []struct {
		b          Board
		cols, rows int
	}{
		{MetricBoard(600*mm, 900*mm), 24, 36},
		{MetricBoard(610*mm, 300*mm), 24, 12},
		{ImperialBoard(24*units.Inch, 36*units.Inch), 24, 36},
		{MetricBoard(10*mm, 10*mm), 1, 1},
	} {
		if c, r := test.b.Holes(); c != test.cols || r != test.rows {
			t.Errorf("%v: Holes() = %d, %d, want %d, %d", test.b, c, r, test.cols, test.rows)
		}
	}
	in := units.Inch
	for _, test := range []struct {
		b        Board
		p        Point
		col, row int
		off      Point
	}{
		{MetricBoard(600*mm, 900*mm), Point{X: 12.5 * mm, Y: 12.5 * mm}, 1, 1, Point{}},
		{MetricBoard(600*mm, 900*mm), Point{X: 101 * mm, Y: 40 * mm}, 5, 2, Point{X: -11.5 * mm, Y: 2.5 * mm}},
		{MetricBoard(600*mm, 900*mm), Point{X: 587.5 * mm, Y: 887.5 * mm}, 24, 36, Point{}},
		{MetricBoard(600*mm, 900*mm), Point{X: -50 * mm, Y: 2000 * mm}, 1, 36, Point{X: -62.5 * mm, Y: 1112.5 * mm}},
		{ImperialBoard(24*in, 36*in), Point{X: 3.2 * in, Y: 5.7 * in}, 4, 6, Point{X: -0.3 * in, Y: 0.2 * in}},
	} {
		h := test.b.Nearest(test.p)
		if h.Col != test.col || h.Row != test.row || !near(h.Offset, test.off, posTol) {
			t.Errorf("%v: Nearest(%v) = col %d row %d offset %v, want %d, %d, %v", test.b, test.p, h.Col, h.Row, h.Offset, test.col, test.row, test.off)
		}
		if back := (Point{X: h.At.X + h.Offset.X, Y: h.At.Y + h.Offset.Y}); !near(back, test.p, posTol) {
			t.Errorf("hole + offset = %v, want %v", back, test.p)
		}
	}
}

// TestCollision: a lens 5 mm before a 45° fold mirror overlaps the
// mirror's mount (the lens holder is 6 mm deep on each side of the beam
// and the mirror's face reaches 14.6 mm back along the beam at 45°); at
// 60 mm they are clear.
func TestCollision(t *testing.T) {
	for _, test := range []struct {
		gap     units.Length
		collide bool
	}{{5 * mm, true}, {60 * mm, false}} {
		sys := mustBuild(t, paraxial.NewBuilder().Space(100*mm).ThinLens(100*mm).Label("L").Space(test.gap).
			FlatMirror(45*units.Degree).Label("M").Space(100*mm))
		p := mustLay(t, sys, Spec{Board: MetricBoard(600*mm, 600*mm), Start: Point{X: 50 * mm, Y: 100 * mm}, Folds: map[string]Turn{"M": Left}})
		ws := p.Warnings.Of(Collision)
		if got := len(ws) == 1; got != test.collide {
			t.Errorf("gap %v: collisions %v, want collide = %v", test.gap, ws, test.collide)
			continue
		}
		if test.collide {
			w := ws[0]
			if w.Parts[0] != 0 || w.Parts[1] != 1 || !strings.Contains(w.Text, `"L" and "M" collide`) || !(w.Amount > 0) {
				t.Errorf("collision warning %+v", w)
			}
			// The place lies inside both footprints.
			if !p.Parts[0].Footprint.Contains(w.At) || !p.Parts[1].Footprint.Contains(w.At) {
				t.Errorf("collision at %v lies outside a footprint", w.At)
			}
		}
	}
}

// TestBeamThrough: a U-turn (two 45° left folds 10 mm apart) sends the
// returning beam at y = 110 mm through the lens holder at x = 300 mm on
// the way out (footprint x 294…306 mm, y 81.3…118.7 mm): it enters at
// x = 306 mm and runs 12 mm inside.
func TestBeamThrough(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(200*mm).ThinLens(100*mm).Label("L1").Space(200*mm).
		FlatMirror(45*units.Degree).Label("M1").Space(10*mm).FlatMirror(45*units.Degree).Label("M2").Space(400*mm))
	p := mustLay(t, sys, Spec{Board: MetricBoard(900*mm, 600*mm), Start: Point{X: 100 * mm, Y: 100 * mm}, Folds: map[string]Turn{"M1": Left, "M2": Left}})
	ws := p.Warnings.Of(BeamThrough)
	if len(ws) != 1 {
		t.Fatalf("BeamThrough warnings %v, want one", ws)
	}
	w := ws[0]
	if p.Parts[w.Parts[0]].Name != "L1" || w.Segment != 2 {
		t.Errorf("warning %+v, want L1 on segment 3", w)
	}
	if !near(w.At, Point{X: 306 * mm, Y: 110 * mm}, 1e-9) || math.Abs(float64(w.Amount-12*mm)) > 1e-9 {
		t.Errorf("enters at %v for %v, want (306, 110) mm for 12 mm", w.At, w.Amount)
	}
	if !strings.Contains(w.Text, `passes through "L1" for 12.0 mm from (306.0, 110.0) mm`) {
		t.Errorf("text %q", w.Text)
	}
}

// TestBeamGrazes: a returning beam whose axis passes 2 mm beside the
// holder of a window (a plate at normal incidence, which leaves the beam
// as it is), with a 1/e² radius of 3 mm (a 3 mm waist at 1064 nm, zR =
// πw0²/λ = 26.6 m, so w stays 3 mm to 1e-4 over the bench), cuts 1 mm
// into it: a BeamGrazes warning, and a clearance of −1 mm. Without a
// beam the clearance is the axis's 2 mm and nothing is flagged.
func TestBeamGrazes(t *testing.T) {
	// The holder is 37.4 mm wide (a 1 in optic + 2 × 6 mm): its edge is
	// at y = 300 + 18.7 mm; the return leg runs at y = 300 + 20.7 mm.
	sys := mustBuild(t, paraxial.NewBuilder().Space(100*mm).Plate(3*mm, 1.5, 0).Label("W1").Space(200*mm).
		FlatMirror(45*units.Degree).Label("M1").Space(20.7*mm).FlatMirror(45*units.Degree).Label("M2").Space(400*mm))
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 3 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	spec := Spec{Board: MetricBoard(900*mm, 600*mm), Start: Point{X: 100 * mm, Y: 300 * mm}, Folds: map[string]Turn{"M1": Left, "M2": Left}}
	dry := mustLay(t, sys, spec)
	if l := part(t, dry, "W1"); math.Abs(float64(l.Clearance-2*mm)) > 1e-9 || l.ClearSegment != 2 {
		t.Errorf("without beam: W1 clearance %v on segment %d, want 2 mm on 2", l.Clearance, l.ClearSegment)
	}
	if n := len(dry.Warnings.Of(BeamGrazes)) + len(dry.Warnings.Of(BeamThrough)); n != 0 {
		t.Errorf("without beam: %d beam warnings, want 0", n)
	}
	spec.Beam = in
	wet := mustLay(t, sys, spec)
	l := part(t, wet, "W1")
	// w(z) = 3 mm·√(1 + (z/zR)²) grows by 2e-4 relative over 0.8 m, and
	// the piecewise clearance takes the larger radius of each piece:
	// 1 µm.
	if math.Abs(float64(l.Clearance+1*mm)) > 1e-6 {
		t.Errorf("with beam: W1 clearance %v, want −1 mm", l.Clearance)
	}
	ws := wet.Warnings.Of(BeamGrazes)
	if len(ws) != 1 || wet.Parts[ws[0].Parts[0]].Name != "W1" || !strings.Contains(ws[0].Text, `into "W1"`) {
		t.Errorf("BeamGrazes warnings %v, want one for W1", ws)
	}
}

// TestOffBoard: a lens at the start 10 mm from the front edge reaches
// 8.7 mm beyond it (half of its 37.4 mm holder is 18.7 mm); a path that
// runs on past the right edge is flagged where it leaves, at x = 600 mm,
// 500 mm along the path.
func TestOffBoard(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().ThinLens(100*mm).Label("L").Space(700*mm))
	p := mustLay(t, sys, Spec{Board: MetricBoard(600*mm, 600*mm), Start: Point{X: 100 * mm, Y: 10 * mm}})
	off := p.Warnings.Of(OffBoard)
	if len(off) != 1 || math.Abs(float64(off[0].Amount-8.7*mm)) > 1e-9 || !strings.Contains(off[0].Text, "front edge (y = 0)") {
		t.Errorf("OffBoard warnings %v, want L 8.7 mm beyond the front edge", off)
	}
	leave := p.Warnings.Of(BeamOffBoard)
	if len(leave) != 1 || !near(leave[0].At, Point{X: 600 * mm, Y: 10 * mm}, 1e-9) || !strings.Contains(leave[0].Text, "z = 500.0 mm") {
		t.Errorf("BeamOffBoard warnings %v, want one at (600, 10) mm, z = 500 mm", leave)
	}
}

// TestParts: components, labelled runs and surface-by-surface lenses are
// single parts; mounts can be overridden; a tilted plate's footprint is
// turned by its angle; a mirror at normal incidence needs no fold and
// sends the beam back.
func TestParts(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(50*mm).
		ThickLens(100*mm, -100*mm, 6*mm, 1.5).Label("TL").Space(50*mm).
		Interface(80*mm, 1.5).Space(5*mm).PlanarInterface(1).Space(50*mm).
		Plate(3*mm, 1.5, 10*units.Degree).Label("W").Space(50*mm).
		Diaphragm(paraxial.ClearDiameter(5*mm)).Label("iris").Space(50*mm).
		FlatMirror(0).Label("back").Space(100*mm))
	p := mustLay(t, sys, Spec{Board: MetricBoard(900*mm, 600*mm), Start: Point{X: 400 * mm, Y: 300 * mm},
		Mounts: map[string]Mount{"iris": {Width: 60 * mm}}})
	var names []string
	for _, pt := range p.Parts {
		names = append(names, pt.Name+":"+pt.Kind.String())
	}
	if got, want := strings.Join(names, ", "), "TL:thick lens, Interface (call 4):thick lens, W:plate, iris:diaphragm, back:mirror"; got != want {
		t.Errorf("parts %s, want %s", got, want)
	}
	iris := part(t, p, "iris")
	if iris.Footprint.Width != 60*mm || iris.Footprint.Depth != irisDepth {
		t.Errorf("iris footprint %v × %v, want 60 mm wide (override), %v deep", iris.Footprint.Width, iris.Footprint.Depth, irisDepth)
	}
	w := part(t, p, "W")
	if math.Abs(angleDiff(float64(w.Normal), float64(10*units.Degree))) > angleTol || w.Footprint.Axis != w.Normal {
		t.Errorf("plate normal %g°, want 10°", w.Normal.Degrees())
	}
	back := part(t, p, "back")
	if math.Abs(angleDiff(float64(back.Out), math.Pi)) > angleTol {
		t.Errorf("normal-incidence mirror sends the beam to %g°, want 180°", back.Out.Degrees())
	}
	tl := part(t, p, "TL")
	if tl.Z != 50*mm || math.Abs(float64(tl.End-56*mm)) > 1e-15 || math.Abs(float64(tl.Center-53*mm)) > 1e-15 {
		t.Errorf("TL at %v…%v (centre %v), want 50…56 mm", tl.Z, tl.End, tl.Center)
	}
}

func TestDefaultMount(t *testing.T) {
	for _, test := range []struct {
		k    paraxial.Kind
		d, t units.Length
		want Mount
	}{
		{paraxial.KindThinLens, 25.4 * mm, 0, Mount{Width: 37.4 * mm, Depth: 12 * mm}},
		{paraxial.KindThickLens, 50.8 * mm, 10 * mm, Mount{Width: 62.8 * mm, Depth: 16 * mm}},
		{paraxial.KindMirror, 25.4 * mm, 0, Mount{Width: 41.4 * mm, Depth: 32 * mm}},
		{paraxial.KindDiaphragm, 5 * mm, 0, Mount{Width: 40 * mm, Depth: 10 * mm}},
		{paraxial.KindDiaphragm, 30 * mm, 0, Mount{Width: 50 * mm, Depth: 10 * mm}},
	} {
		got := DefaultMount(test.k, test.d, test.t)
		if math.Abs(float64(got.Width-test.want.Width)) > 1e-15 || math.Abs(float64(got.Depth-test.want.Depth)) > 1e-15 {
			t.Errorf("DefaultMount(%v, %v, %v) = %+v, want %+v", test.k, test.d, test.t, got, test.want)
		}
	}
}

// TestErrors: bad input is an error naming the setting and the value
// with its unit, wrapping the sentinel.
func TestErrors(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(100*mm).ThinLens(50*mm).Label("L1").Space(100*mm).
		FlatMirror(45*units.Degree).Label("M1").Space(100*mm))
	unlabelled := mustBuild(t, paraxial.NewBuilder().Space(100*mm).FlatMirror(30*units.Degree).Space(100*mm))
	spaces := mustBuild(t, paraxial.NewBuilder().Space(100*mm))
	board := MetricBoard(600*mm, 600*mm)
	start := Point{X: 100 * mm, Y: 100 * mm}
	ok := map[string]Turn{"M1": Left}
	nan := units.Length(math.NaN())
	for _, test := range []struct {
		name string
		sys  paraxial.System
		spec Spec
		want error
		text string
	}{
		{"unbuilt", paraxial.System{}, Spec{Board: board, Start: start}, paraxial.ErrNotBuilt, "system"},
		{"no parts", spaces, Spec{Board: board, Start: start}, ErrSystem, "parts = 0"},
		{"negative size", sys, Spec{Board: MetricBoard(-600*mm, 600*mm), Start: start, Folds: ok}, ErrBoard, "size x = -600 mm"},
		{"NaN size", sys, Spec{Board: MetricBoard(600*mm, nan), Start: start, Folds: ok}, ErrBoard, "size y = NaN"},
		{"zero size", sys, Spec{Board: MetricBoard(0, 600*mm), Start: start, Folds: ok}, ErrBoard, "size x = 0 m"},
		{"bad grid", sys, Spec{Board: Board{SizeX: 1, SizeY: 1, Grid: 5, Pitch: 1, Margin: 0}, Start: start, Folds: ok}, ErrBoard, "grid = 5"},
		{"start off", sys, Spec{Board: board, Start: Point{X: 950 * mm, Y: 100 * mm}, Folds: ok}, ErrStart, "position x = 950 mm"},
		{"start off y", sys, Spec{Board: board, Start: Point{X: 100 * mm, Y: -1 * mm}, Folds: ok}, ErrStart, "position y = -1 mm"},
		{"NaN start", sys, Spec{Board: board, Start: Point{X: nan, Y: 0}, Folds: ok}, ErrStart, "position x = NaN"},
		{"NaN direction", sys, Spec{Board: board, Start: start, Direction: units.Angle(math.NaN()), Folds: ok}, ErrStart, "direction"},
		{"missing fold", sys, Spec{Board: board, Start: start}, ErrFold, `mirror "M1": angle of incidence θ = 45°`},
		{"unlabelled mirror", unlabelled, Spec{Board: board, Start: start}, ErrFold, "FlatMirror (call 2)"},
		{"bad turn", sys, Spec{Board: board, Start: start, Folds: map[string]Turn{"M1": 7}}, ErrFold, "fold = 7"},
		{"unknown fold", sys, Spec{Board: board, Start: start, Folds: map[string]Turn{"M1": Left, "M9": Left}}, ErrLabel, `label = "M9": no mirror has this label; the mirror labels are "M1"`},
		{"fold on a lens", sys, Spec{Board: board, Start: start, Folds: map[string]Turn{"M1": Left, "L1": Left}}, ErrLabel, "not a mirror"},
		{"unknown mount", sys, Spec{Board: board, Start: start, Folds: ok, Mounts: map[string]Mount{"L9": {}}}, ErrLabel, `"L9": no part has this label; the part labels are "L1", "M1"`},
		{"bad mount", sys, Spec{Board: board, Start: start, Folds: ok, Mounts: map[string]Mount{"L1": {Width: -1 * mm}}}, ErrMount, "width = -1 mm"},
		{"samples", sys, Spec{Board: board, Start: start, Folds: ok, Samples: 1}, nil, "sample count = 1"},
		{"bad beam", sys, Spec{Board: board, Start: start, Folds: ok, Beam: beam.Gaussian{}}, nil, "beam"},
	} {
		_, err := Lay(test.sys, test.spec)
		if err == nil {
			t.Errorf("%s: Lay error = nil", test.name)
			continue
		}
		if test.want != nil && !errors.Is(err, test.want) {
			t.Errorf("%s: error %v, want it to wrap %v", test.name, err, test.want)
		}
		var pe *ParamError
		if !errors.As(err, &pe) || !strings.Contains(err.Error(), test.text) || !strings.HasPrefix(err.Error(), "plan: ") {
			t.Errorf("%s: error %q, want a *ParamError containing %q", test.name, err, test.text)
		}
	}
}

// TestTable: the table is in the board's unit, names the holes and the
// fold, and is the same on every call.
func TestTable(t *testing.T) {
	sys := mustBuild(t, paraxial.NewBuilder().Space(4*units.Inch).ThinLens(100*mm).Label("L1").Space(4*units.Inch).
		FlatMirror(45*units.Degree).Label("M1").Space(6*units.Inch))
	p := mustLay(t, sys, Spec{Board: ImperialBoard(24*units.Inch, 18*units.Inch), Start: Point{X: 2.5 * units.Inch, Y: 3.5 * units.Inch}, Folds: map[string]Turn{"M1": Right}})
	tb := p.Table()
	if err := tb.Validate(); err != nil {
		t.Fatal(err)
	}
	text := tb.Text()
	for _, want := range []string{"x (in)", "dx (in)", "1/4-20 on 1 in", "6.50", "3.50", "7, 4", "mirror 45° right", "0.0 → 270.0", "225.0"} {
		if !strings.Contains(text, want) {
			t.Errorf("table does not contain %q:\n%s", want, text)
		}
	}
	if again := p.Table().Text(); again != text {
		t.Error("two calls of Table differ")
	}
	if got := degrees(units.Angle(2*math.Pi - 1e-12)); got != "0.0" {
		t.Errorf("degrees(2π − ε) = %q, want 0.0", got)
	}
}

// FuzzLay: any start, direction and fold angles give a plan or an
// error, never a panic, and a plan has finite positions.
func FuzzLay(f *testing.F) {
	f.Add(0.1, 0.1, 0.0, 0.785, 0.785, 0.2, 0.1, uint8(0))
	f.Add(0.5, 0.3, 3.0, 0.1, 1.5, 0.0, 1.0, uint8(3))
	f.Add(-1.0, 0.3, 1e300, 0.0, 0.0, 0.1, 0.1, uint8(1))
	f.Fuzz(func(t *testing.T, x, y, dir, a1, a2, d1, d2 float64, turns uint8) {
		if !(math.Abs(a1) < 1.5) || !(math.Abs(a2) < 1.5) || !(d1 >= 0 && d1 < 10) || !(d2 >= 0 && d2 < 10) {
			return
		}
		sys, err := paraxial.NewBuilder().Space(units.Length(d1)).FlatMirror(units.Angle(a1)).Label("A").
			ThinLens(0.1).Label("L").Space(units.Length(d2)).FlatMirror(units.Angle(a2)).Label("B").Space(0.1).Build()
		if err != nil {
			return
		}
		folds := map[string]Turn{"A": Turn(1 + turns&1), "B": Turn(1 + turns>>1&1)}
		p, err := Lay(sys, Spec{Board: MetricBoard(1, 1), Start: Point{X: units.Length(x), Y: units.Length(y)}, Direction: units.Angle(dir), Folds: folds})
		if err != nil {
			return
		}
		for _, pt := range p.Parts {
			for _, v := range []float64{float64(pt.At.X), float64(pt.At.Y), float64(pt.Out), float64(pt.Normal), float64(pt.Clearance)} {
				if !finite(v) {
					t.Fatalf("part %s: a non-finite value in %+v", pt.Name, pt)
				}
			}
		}
		_ = p.Table().Text()
	})
}

func BenchmarkLay(b *testing.B) {
	bld := paraxial.NewBuilder()
	folds := map[string]Turn{}
	for k := range 10 {
		bld.Space(60 * mm).ThinLens(100 * mm).Label("L" + string(rune('a'+k))).Space(60 * mm).FlatMirror(45 * units.Degree).Label("M" + string(rune('a'+k)))
		folds["M"+string(rune('a'+k))] = Turn(1 + k%2)
	}
	sys := mustBuild(b, bld.Space(100*mm))
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		b.Fatal(err)
	}
	spec := Spec{Board: MetricBoard(2000*mm, 2000*mm), Start: Point{X: 200 * mm, Y: 200 * mm}, Folds: folds, Beam: in}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Lay(sys, spec); err != nil {
			b.Fatal(err)
		}
	}
}
