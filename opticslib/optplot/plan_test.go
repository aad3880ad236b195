package optplot

// Table-plan rendering tests: byte-identical SVG (golden files), what the
// drawing contains, equal scales, bad input. The geometry drawn is tested
// in package plan against the law of reflection and analytic paths.

import (
	"errors"
	"flag"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/plan"
	"github.com/beamnote/beamnote/opticslib/units"
)

var planDir = flag.String("plandir", "", "also write the table-plan figures as SVG to this directory")

// foldedExpander is an invented bench on a 900 × 600 mm metric board: a
// 1064 nm laser with a 1.2 mm waist, a 3× Kepler expander folded into a
// Z by two 45° mirrors, an iris and a focusing lens onto a target.
func foldedExpander(t testing.TB) plan.Plan {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(150 * mm).
		ThinLens(50 * mm).Label("L1").Aperture(paraxial.HalfInchOptic()).
		Space(25 * mm).
		FlatMirror(45 * units.Degree).Label("M1").Aperture(paraxial.OneInchOptic()).
		Space(100 * mm).
		FlatMirror(45 * units.Degree).Label("M2").Aperture(paraxial.OneInchOptic()).
		Space(75 * mm).
		ThinLens(150 * mm).Label("L2").Aperture(paraxial.ClearDiameter(45 * mm)).
		Space(150 * mm).
		Diaphragm(paraxial.ClearDiameter(12 * mm)).Label("iris").
		Space(100 * mm).
		FlatMirror(45 * units.Degree).Label("M3").Aperture(paraxial.ClearDiameter(45 * mm)).
		Space(150 * mm).
		ThinLens(200 * mm).Label("L3").Aperture(paraxial.ClearDiameter(45 * mm)).
		Space(200 * mm).
		Build()
	if err != nil {
		t.Fatalf("Build: %v", err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1.2 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	p, err := plan.Lay(sys, plan.Spec{
		Board: plan.MetricBoard(900*mm, 600*mm),
		Start: plan.Point{X: 37.5 * mm, Y: 112.5 * mm},
		Folds: map[string]plan.Turn{"M1": plan.Left, "M2": plan.Right, "M3": plan.Left},
		Beam:  in,
	})
	if err != nil {
		t.Fatalf("Lay: %v", err)
	}
	return p
}

// crowdedBench is an invented bench with mistakes on a 24 × 18 in
// imperial board: a diverging lens 8 mm before a fold mirror (the mounts
// collide), a U-turn whose two 1 in mirrors sit 1 in apart (they collide
// too) and whose returning beam crosses the 2 in lens of the way out, and
// an iris placed beyond the board's edge, where the beam runs off it.
func crowdedBench(t testing.TB) plan.Plan {
	t.Helper()
	in := units.Inch
	sys, err := paraxial.NewBuilder().
		Space(2*in).
		Plate(3*mm, 1.45, 0).Label("W1").
		Space(4 * in).
		ThinLens(100 * mm).Label("L1").Aperture(paraxial.ClearDiameter(45 * mm)).
		Space(8 * in).
		ThinLens(-50 * mm).Label("L2").
		Space(8 * mm).
		FlatMirror(45 * units.Degree).Label("M1").
		Space(1 * in).
		FlatMirror(45 * units.Degree).Label("M2").
		Space(16 * in).
		Diaphragm(paraxial.ClearDiameter(3 * mm)).Label("iris").
		Space(3 * in).
		Build()
	if err != nil {
		t.Fatalf("Build: %v", err)
	}
	p, err := plan.Lay(sys, plan.Spec{
		Board: plan.ImperialBoard(24*in, 18*in),
		Start: plan.Point{X: 1.5 * in, Y: 2.5 * in},
		Folds: map[string]plan.Turn{"M1": plan.Left, "M2": plan.Left},
	})
	if err != nil {
		t.Fatalf("Lay: %v", err)
	}
	return p
}

// smallBench is an invented 300 × 150 mm metric breadboard at a larger
// scale, one part of each kind: a cylindrical lens, a window at 20°, a
// diverging and a converging lens, an iris and a 30° fold mirror, with a
// 2 mm beam.
func smallBench(t testing.TB) plan.Plan {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(25*mm).
		CylindricalLens(100*mm, paraxial.Sagittal).Label("C1").Aperture(paraxial.ClearDiameter(10*mm)).
		Space(30*mm).
		Plate(5*mm, 1.5, 20*units.Degree).Label("W").
		Space(30 * mm).
		ThinLens(-40 * mm).Label("L1").Aperture(paraxial.HalfInchOptic()).
		Space(40 * mm).
		ThinLens(120 * mm).Label("L2").Aperture(paraxial.OneInchOptic()).
		Space(40 * mm).
		Diaphragm(paraxial.ClearDiameter(10 * mm)).Label("iris").
		Space(35 * mm).
		FlatMirror(30 * units.Degree).Label("M1").Aperture(paraxial.OneInchOptic()).
		Space(60 * mm).
		Build()
	if err != nil {
		t.Fatalf("Build: %v", err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 2 * mm, Wavelength: 780 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	p, err := plan.Lay(sys, plan.Spec{
		Board: plan.MetricBoard(300*mm, 150*mm),
		Start: plan.Point{X: 12.5 * mm, Y: 37.5 * mm},
		Folds: map[string]plan.Turn{"M1": plan.Left},
		Beam:  in,
	})
	if err != nil {
		t.Fatalf("Lay: %v", err)
	}
	return p
}

func planSmallSVG(t testing.TB) []byte {
	return planSVG(t, smallBench(t), "plan_small.svg", Title("One of each part"))
}

func planSVG(t testing.TB, p plan.Plan, name string, opts ...Option) []byte {
	t.Helper()
	f, err := Plan(p, opts...)
	if err != nil {
		t.Fatalf("Plan: %v", err)
	}
	svg := mustSVG(t, f)
	if *planDir != "" {
		if err := os.WriteFile(filepath.Join(*planDir, name), svg, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return svg
}

func planExpanderSVG(t testing.TB) []byte {
	return planSVG(t, foldedExpander(t), "plan_expander.svg", Title("Folded 3× expander"))
}

func planCrowdedSVG(t testing.TB) []byte {
	return planSVG(t, crowdedBench(t), "plan_crowded.svg", Title("Crowded bench"))
}

func TestPlanGoldenSVG(t *testing.T) {
	checkGolden(t, "plan_expander.svg", planExpanderSVG)
	checkGolden(t, "plan_crowded.svg", planCrowdedSVG)
	checkGolden(t, "plan_small.svg", planSmallSVG)
}

// TestPlanContent: the labels, hole numbers, scale bar and warnings are
// drawn, and the caption lists every warning.
func TestPlanContent(t *testing.T) {
	svg := string(planExpanderSVG(t))
	for _, want := range []string{"Folded 3× expander", ">L1<", ">M3<", ">iris<", ">36<", ">24<", ">100 mm<", "1/e² band, to scale", "beam axis"} {
		if !strings.Contains(svg, want) {
			t.Errorf("expander plan SVG does not contain %q", want)
		}
	}
	p := crowdedBench(t)
	var checks []string
	for _, w := range p.Warnings {
		checks = append(checks, w.Check.String())
	}
	if got, want := strings.Join(checks, ", "), "collision, collision, off board, beam through part, beam off board"; got != want {
		t.Fatalf("crowded bench: warnings %s, want %s:\n%v", got, want, p.Warnings.Table())
	}
	f, err := Plan(p)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range p.Warnings {
		if !strings.Contains(f.Caption, w.Text) {
			t.Errorf("caption does not list %q", w.Text)
		}
	}
	svg = string(mustSVG(t, f))
	for _, want := range []string{`"L2" and "M1" collide`, `passes through "L1"`, ">2 in<", ">warning<", "stroke:#D23C1E"} {
		if !strings.Contains(svg, strings.ReplaceAll(want, `"`, "&#34;")) {
			t.Errorf("crowded plan SVG does not contain %q", want)
		}
	}
}

// TestPlanEqualScale: whatever the figure's size, a part drawn is as
// long on the canvas in x as in y. The board's outline is the first
// filled path: its width over its height equals the board's.
func TestPlanEqualScale(t *testing.T) {
	p := foldedExpander(t)
	re := regexp.MustCompile(`<path d="M([-0-9.e]+),([-0-9.e]+)L([-0-9.e]+),([-0-9.e]+)L([-0-9.e]+),([-0-9.e]+)L([-0-9.e]+),([-0-9.e]+)Z" style="fill:#F2F1ED`)
	for _, size := range [][2]vg.Length{{16 * vg.Centimeter, 9 * vg.Centimeter}, {10 * vg.Centimeter, 20 * vg.Centimeter}, {30 * vg.Centimeter, 8 * vg.Centimeter}} {
		f, err := Plan(p, Size(size[0], size[1]))
		if err != nil {
			t.Fatal(err)
		}
		m := re.FindStringSubmatch(string(mustSVG(t, f)))
		if m == nil {
			t.Fatalf("size %v: board outline not found", size)
		}
		var v [8]float64
		for i := range v {
			v[i] = atof(t, m[i+1])
		}
		w, h := math.Abs(v[2]-v[0]), math.Abs(v[5]-v[3])
		// The SVG writes 5 significant digits: 1e-4 relative.
		if got, want := w/h, float64(p.Board.SizeX/p.Board.SizeY); math.Abs(got-want) > 1e-3*want {
			t.Errorf("size %v: board drawn %g × %g pt, aspect %g, want %g", size, w, h, got, want)
		}
	}
}

func TestPlanErrors(t *testing.T) {
	good := foldedExpander(t)
	noSeg := good
	noSeg.Segments = nil
	badBoard := good
	badBoard.Board.SizeX = -1
	nanPart := good
	nanPart.Parts = append([]plan.Part(nil), good.Parts...)
	nanPart.Parts[0].At.X = units.Length(math.NaN())
	for _, test := range []struct {
		name string
		p    plan.Plan
		opts []Option
		want error
	}{
		{"zero plan", plan.Plan{}, nil, ErrPlan},
		{"no segments", noSeg, nil, ErrPlan},
		{"bad board", badBoard, nil, ErrPlan},
		{"NaN part", nanPart, nil, ErrPlan},
		{"bad size", good, []Option{Size(-1, 1)}, ErrOption},
	} {
		if _, err := Plan(test.p, test.opts...); !errors.Is(err, test.want) {
			t.Errorf("%s: Plan error = %v, want %v", test.name, err, test.want)
		}
	}
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func BenchmarkPlanSVG(b *testing.B) {
	p := foldedExpander(b)
	b.ReportAllocs()
	for b.Loop() {
		f, err := Plan(p)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := f.SVG(); err != nil {
			b.Fatal(err)
		}
	}
}
