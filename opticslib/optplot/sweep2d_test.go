package optplot

// Tests of the 2-D sweep figure: it builds, renders byte-identical SVG
// (also where the goal band has two separate edges at one level, which
// gonum's contour plotter collects in a map), states what is shaded, and
// refuses sweeps it cannot draw. The expander and laser are invented.

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/units"
)

// demoGrid sweeps a 4× Keplerian expander (f1 = 50 mm, f2 = 200 mm) for
// an invented 633 nm alignment laser with a 0.25 mm waist at the input
// plane over the laser-to-L1 distance and the lens gap: the output waist
// radius and the output waist's distance behind L2 (the collimation
// quantity), n × m cases.
func demoGrid(t testing.TB, n, m int) (sweep.GridResult, design.Goal, design.Goal) {
	t.Helper()
	const mm = units.Millimeter
	laser, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.25 * mm, Wavelength: 633 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	build := func(s1, gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(s1).ThinLens(50 * mm).Label("L1").Space(gap).ThinLens(200 * mm).Label("L2").Space(300 * mm).Build()
	}
	w0 := design.Near("output w0", design.WaistRadius(laser), 0.95*mm, 0.03*mm)
	coll := design.Near("waist behind L2", design.WaistAfter(laser, "L2"), 200*mm, 100*mm)
	r, err := sweep.Grid(sweep.Param{Name: "laser to L1", Values: sweep.Steps(10*mm, 150*mm, n)},
		sweep.Param{Name: "lens gap", Values: sweep.Steps(240*mm, 256*mm, m)}, build,
		sweep.OfGoal(w0), sweep.OfGoal(coll))
	if err != nil {
		t.Fatal(err)
	}
	return r, w0, coll
}

// TestSweep2DFigure: the axes name the parameters in mm, the scale bar
// the quantity; the key and caption say what is outlined and faded; the
// share of grid points in the band is the count of values in the goal's
// range (counted here independently from the sweep's data).
func TestSweep2DFigure(t *testing.T) {
	r, w0, coll := demoGrid(t, 24, 18)
	q, _ := r.Find("output w0")
	lo, hi := w0.Range()
	in := 0
	for _, v := range r.Data[q] {
		if v >= lo && v <= hi {
			in++
		}
	}
	checkFigures(t, []figureCase{
		{name: "sweep2d w0", make: func() (Figure, error) { return Sweep2D(r, "output w0", BandOf(w0)) },
			svg:     []string{"laser to L1 (mm)", "lens gap (mm)", "output w0 (mm)", "goal band: output w0 950 ± 30 µm", "outside the band (faded)", "What if the laser to L1 and the lens gap change: output w0"},
			prefix:  []string{"What if the laser to L1 and the lens gap change: output w0: output w0 (mm) against laser to L1 (mm) and lens gap (mm) (24 × 18 cases)"},
			caption: []string{"(dark ink)", "(pale cream)", "The goal band output w0 950 ± 30 µm is outlined", strconv.Itoa(in) + " of 432 grid points"}},
		{name: "sweep2d collimation", make: func() (Figure, error) {
			return Sweep2D(r, "waist behind L2", BandOf(coll), Title("Where the expander collimates"))
		},
			svg:    []string{"Where the expander collimates", "waist behind L2 (mm)", "goal band: waist behind L2 200 ± 100 mm"},
			prefix: []string{"Where the expander collimates: "}},
		{name: "sweep2d no band", make: func() (Figure, error) { return Sweep2D(r, "output w0", nil) },
			caption: []string{"from "}},
		{name: "sweep2d one-sided", make: func() (Figure, error) {
			return Sweep2D(r, "output w0", &GoalBand{Label: "w0 ≤ 0.9 mm", Lo: math.Inf(-1), Hi: 0.9e-3})
		},
			svg: []string{"goal band: w0 ≤ 0.9 mm"}},
	})
	f, err := Sweep2D(r, "output w0", nil)
	if err != nil {
		t.Fatal(err)
	}
	if svg := mustSVG(t, f); bytes.Contains(svg, []byte("goal band")) || strings.Contains(f.Caption, "goal band") {
		t.Errorf("a figure without a band mentions one")
	}
}

// TestSweep2DContourOrder: the collimation band of demoGrid has edges at
// both levels and, in the w0 map, two separate pieces at one level;
// twenty renderings (fresh figures each time) give the same bytes,
// which plotter.Contour's map of paths alone would not guarantee.
func TestSweep2DContourOrder(t *testing.T) {
	r, w0, _ := demoGrid(t, 30, 24)
	var first []byte
	for i := range 20 {
		f, err := Sweep2D(r, "output w0", BandOf(w0))
		if err != nil {
			t.Fatal(err)
		}
		svg := mustSVG(t, f)
		if i == 0 {
			first = svg
		} else if !bytes.Equal(svg, first) {
			t.Fatalf("rendering %d differs from the first (%d vs %d bytes)", i+1, len(svg), len(first))
		}
	}
}

// TestSweep2DGoldenSVG: the output waist map with its goal band against
// its golden file.
func TestSweep2DGoldenSVG(t *testing.T) {
	checkGolden(t, "sweep2d_expander.svg", func(tb testing.TB) []byte {
		r, w0, _ := demoGrid(tb, 24, 18)
		f, err := Sweep2D(r, "output w0", BandOf(w0))
		if err != nil {
			tb.Fatal(err)
		}
		return mustSVG(tb, f)
	})
}

// TestSweep2DErrors: sweeps and bands the figure cannot draw are
// *ParamError values wrapping ErrGrid, naming the parameter at fault.
func TestSweep2DErrors(t *testing.T) {
	r, _, _ := demoGrid(t, 3, 3)
	thin, _, _ := demoGrid(t, 1, 3)
	short := r
	short.Data = [][]float64{r.Data[0][:4], r.Data[1]}
	nan := r
	nan.Data = [][]float64{append([]float64{math.NaN()}, r.Data[0][1:]...), r.Data[1]}
	for _, test := range []struct {
		name string
		r    sweep.GridResult
		q    string
		band *GoalBand
		want string
	}{
		{"unknown quantity", r, "w1", nil, `quantity = w1: is not in the sweep, which has "output w0", "waist behind L2"`},
		{"one value", thin, "output w0", nil, `parameter "laser to L1" values = 1: need at least 2`},
		{"short data", short, "output w0", nil, "must hold 9 values per quantity"},
		{"NaN", nan, "output w0", nil, "value at laser to L1 = 10 mm, lens gap = 240 mm = NaN: must be finite"},
		{"reversed band", r, "output w0", &GoalBand{Label: "w0", Lo: 2e-3, Hi: 1e-3}, `band "w0" = 0.002 … 0.001: must be a range lo ≤ hi`},
		{"open band", r, "output w0", &GoalBand{Label: "all", Lo: math.Inf(-1), Hi: math.Inf(1)}, "at least one side finite"},
		{"NaN band", r, "output w0", &GoalBand{Label: "w0", Lo: math.NaN(), Hi: 1}, "not NaN"},
	} {
		_, err := Sweep2D(test.r, test.q, test.band)
		var pe *ParamError
		if !errors.Is(err, ErrGrid) || !errors.As(err, &pe) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: error %v, want ErrGrid containing %q", test.name, err, test.want)
		}
	}
	if _, err := Sweep2D(r, "output w0", nil, Size(-1, 1)); !errors.Is(err, ErrOption) {
		t.Errorf("bad size: error %v, want ErrOption", err)
	}
}

// BenchmarkSweep2D builds the 50 × 50 output waist map with its goal
// band and renders it to SVG (the figure of a 2-D what-if cell; the
// sweep itself is sweep.BenchmarkGrid).
func BenchmarkSweep2D(b *testing.B) {
	r, w0, _ := demoGrid(b, 50, 50)
	band := BandOf(w0)
	b.ReportAllocs()
	for b.Loop() {
		f, err := Sweep2D(r, "output w0", band)
		if err != nil {
			b.Fatal(err)
		}
		if sinkSVG, err = f.SVG(); err != nil {
			b.Fatal(err)
		}
	}
}

// A 2-D what-if of an invented 4× expander for a 633 nm alignment laser
// (f1 = 50 mm, f2 = 200 mm, 0.25 mm waist at the laser): the output waist
// against the laser-to-L1 distance and the lens gap, with the band of a
// design goal outlined. At the afocal gap f1 + f2 = 250 mm the waist is
// 4 × 0.25 mm = 1 mm whatever the distance (the ABCD law with C = 0:
// Im q′ = (A/D) Im q), above the band, which the map shows as two strips
// on either side of that gap.
func ExampleSweep2D() {
	const mm = units.Millimeter
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.25 * mm, Wavelength: 633 * units.Nanometer})
	expander := func(s1, gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(s1).ThinLens(50 * mm).Label("L1").Space(gap).ThinLens(200 * mm).Label("L2").Space(300 * mm).Build()
	}
	goal := design.Near("output w0", design.WaistRadius(laser), 0.95*mm, 0.03*mm)
	r, err := sweep.Grid(
		sweep.Param{Name: "laser to L1", Values: sweep.Steps(10*mm, 150*mm, 15)},
		sweep.Param{Name: "lens gap", Values: sweep.Steps(240*mm, 256*mm, 17)},
		expander, sweep.OfGoal(goal))
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := Sweep2D(r, "output w0", BandOf(goal))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f.Caption)
	// Output:
	// What if the laser to L1 and the lens gap change: output w0: output w0 (mm) against laser to L1 (mm) and lens gap (mm) (15 × 17 cases), from 0.5346 (dark ink) to 1.049 mm (pale cream). The goal band output w0 950 ± 30 µm is outlined; outside it the map is faded under a white veil. 47 of 255 grid points (18.4 %) lie in the band.
}
