package sweep_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/units"
)

func lens(d, f units.Length) (paraxial.System, error) {
	return paraxial.NewBuilder().Space(d).Label("object to lens").ThinLens(f).Label("L").Space(300 * mm).Build()
}

// TestGridThinLens: the image of an object at distance d before a thin
// lens f lies d·f/(d − f) behind it (the thin-lens equation, as in
// TestOverThinLens), at every pair of the grid; rel 1e-12.
func TestGridThinLens(t *testing.T) {
	ds := sweep.Param{Name: "object distance", Values: []units.Length{150 * mm, 200 * mm, 300 * mm}}
	fs := sweep.Param{Name: "focal length", Values: []units.Length{50 * mm, 100 * mm}}
	r, err := sweep.Grid(ds, fs, lens, sweep.ImageZ(0), sweep.Magnification(0))
	if err != nil {
		t.Fatal(err)
	}
	for i, d := range ds.Values {
		for j, f := range fs.Values {
			dd, ff := float64(d), float64(f)
			wantZ, wantM := dd+dd*ff/(dd-ff), -ff/(dd-ff)
			if z, m := r.At(0, i, j), r.At(1, i, j); math.Abs(z-wantZ) > 1e-12*wantZ || math.Abs(m-wantM) > 1e-12 {
				t.Errorf("d = %v, f = %v: image z %g, m %g; want %g, %g", d, f, z, m, wantZ, wantM)
			}
		}
	}
	tb := r.Table()
	if len(tb.Rows) != 6 || strings.Join(tb.Header, "|") != "object distance (mm)|focal length (mm)|image z (mm)|magnification" ||
		strings.Join(tb.Rows[3], "|") != "200|100|400|-1" || tb.Caption != "What if the object distance and the focal length change" {
		t.Errorf("table:\n%v", tb.Text())
	}
	if q, err := r.Find("magnification"); q != 1 || err != nil {
		t.Errorf(`Find("magnification") = %d, %v`, q, err)
	}
	if _, err := r.Find("nope"); err == nil || !strings.Contains(err.Error(), `"image z", "magnification"`) {
		t.Errorf(`Find("nope") error = %v`, err)
	}
	if col, u := r.Column(0); u != "mm" || len(col) != 6 || math.Abs(col[3]-400) > 1e-9 {
		t.Errorf("Column(0) = %v %q", col, u)
	}
}

// TestGridErrors: empty, unsorted and non-finite values, and a failing
// case naming both parameter values and the quantity.
func TestGridErrors(t *testing.T) {
	good := sweep.Param{Name: "f", Values: []units.Length{50 * mm, 100 * mm}}
	if _, err := sweep.Grid(sweep.Param{Name: "d"}, good, lens, sweep.ImageZ(0)); !errors.Is(err, sweep.ErrNoCases) {
		t.Errorf("no values: %v", err)
	}
	if _, err := sweep.Grid(good, good, lens); !errors.Is(err, sweep.ErrNoCases) {
		t.Errorf("no quantity: %v", err)
	}
	for _, vs := range [][]units.Length{{100 * mm, 100 * mm}, {200 * mm, 100 * mm}, {100 * mm, units.Length(math.NaN())}} {
		_, err := sweep.Grid(sweep.Param{Name: "object distance", Values: vs}, good, lens, sweep.ImageZ(0))
		if !errors.Is(err, sweep.ErrValues) || !strings.Contains(err.Error(), "sweep: object distance value 2 = ") {
			t.Errorf("values %v: error %v", vs, err)
		}
	}
	// The object in the front focal plane images to infinity.
	_, err := sweep.Grid(sweep.Param{Name: "object distance", Values: []units.Length{100 * mm}}, good, lens, sweep.ImageZ(0))
	if !errors.Is(err, paraxial.ErrImageAtInfinity) || !strings.Contains(err.Error(), "sweep: object distance = 100 mm, f = 100 mm: image z") {
		t.Errorf("object in the focal plane: %v", err)
	}
	if _, err := sweep.Grid(good, good, lens, sweep.Quantity{Name: "broken"}); err == nil || !strings.Contains(err.Error(), `broken: has no function`) {
		t.Errorf("quantity without a function: %v", err)
	}
}

// TestSteps: the ends are exact and the steps equal (analytic).
func TestSteps(t *testing.T) {
	s := sweep.Steps(110*mm, 130*mm, 5)
	want := []units.Length{110 * mm, 115 * mm, 120 * mm, 125 * mm, 130 * mm}
	for i := range want {
		if math.Abs(float64(s[i]-want[i])) > 1e-15 {
			t.Errorf("Steps[%d] = %v, want %v", i, s[i], want[i])
		}
	}
	if s[4] != 130*mm || len(sweep.Steps(0, 1, 0)) != 0 || sweep.Steps(3*mm, 5*mm, 1)[0] != 3*mm {
		t.Errorf("Steps ends: %v, %v, %v", s[4], sweep.Steps(0, 1, 0), sweep.Steps(3*mm, 5*mm, 1))
	}
}

// TestQuantitiesAreDesignMeasures: the built-in quantities, now design's
// measures, give bit for bit the values of the direct beam and paraxial
// calls they replaced, on the expander and laser of notebook
// 00-quickstart (its sweep, unchanged), and agree with a design goal on
// the same quantity.
func TestQuantitiesAreDesignMeasures(t *testing.T) {
	expander := func(gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().
			Space(40 * mm).
			ThinLens(-30 * mm).Label("L1").Aperture(paraxial.ClearDiameter(6 * mm)).
			Space(gap).Label("gap").
			ThinLens(150 * mm).Label("L2").Aperture(paraxial.ClearDiameter(25.4 * mm)).
			Space(500 * mm).Label("to the scanner").
			Build()
	}
	laser, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.42 * mm, Wavelength: 488 * nm})
	if err != nil {
		t.Fatal(err)
	}
	gaps := []units.Length{116 * mm, 118 * mm, 120 * mm, 122 * mm, 124 * mm}
	r, err := sweep.Over("lens gap", gaps, expander,
		sweep.OutputWaistZ(laser), sweep.OutputWaistRadius(laser), sweep.RadiusAtEnd(laser), sweep.RadiusAt(laser, "L2"), sweep.ImageZ(0), sweep.Magnification(0))
	if err != nil {
		t.Fatal(err)
	}
	for i, g := range gaps {
		sys, _ := expander(g)
		ws, _ := beam.Waists(sys, laser)
		end, _ := beam.AtXY(sys, laser, sys.Length())
		l2, _ := sys.Part("L2")
		atL2, _ := beam.AtXY(sys, laser, l2.End)
		im, _ := sys.Image(0, paraxial.Tangential)
		for q, want := range []float64{float64(ws.Last().Z), float64(ws.Last().Radius), float64(end.X.Radius()), float64(atL2.X.Radius()), float64(im.Image), im.Magnification} {
			if r.Data[q][i] != want {
				t.Errorf("gap %v, %s = %.17g, want %.17g (the direct call)", g, r.Quantities[q].Name, r.Data[q][i], want)
			}
		}
	}
	goal := design.Near("output w0", design.WaistRadius(laser), 2.1*mm, 0.01*mm)
	g, err := sweep.Over("lens gap", gaps, expander, sweep.OfGoal(goal))
	if err != nil {
		t.Fatal(err)
	}
	for i := range gaps {
		if g.Data[0][i] != r.Data[1][i] {
			t.Errorf("OfGoal at case %d = %g, want OutputWaistRadius's %g", i, g.Data[0][i], r.Data[1][i])
		}
	}
	if g.Quantities[0].Kind != sweep.KindLength || g.Label(0) != "output w0 (mm)" {
		t.Errorf("OfGoal quantity: kind %v, label %q", g.Quantities[0].Kind, g.Label(0))
	}
	div := sweep.OfGoal(design.AtMost("divergence", design.Divergence(laser), 1*units.Milliradian))
	if div.Kind != sweep.KindNumber || div.Unit != "mrad" {
		t.Errorf("OfGoal on an angle: kind %v, unit %q; want a number in mrad", div.Kind, div.Unit)
	}
	one, err := paraxial.NewBuilder().Space(50 * units.Millimeter).Build()
	if err != nil {
		t.Fatal(err)
	}
	v, err := div.Of(one)
	w := laser.HalfDivergence() // free space keeps the far-field angle (Gaussian-beam identity)
	if err != nil || math.Abs(v-w.Milliradians()) > 1e-12*w.Milliradians() {
		t.Errorf("OfGoal on an angle = %g mrad (%v), want %g mrad", v, err, w.Milliradians())
	}
}

// A what-if over two spacings of a 4× Keplerian expander (f1 = 50 mm,
// f2 = 200 mm) for an invented 633 nm laser whose 0.25 mm waist is at
// the input plane: the input distance to L1 and the lens gap. At the gap
// f1 + f2 = 250 mm the pair is afocal, with ABCD matrix A = −f2/f1,
// C = 0, D = −f1/f2, so q′ = (Aq + B)/D has Im q′ = (A/D) Im q: the
// Rayleigh range grows by (f2/f1)² and the output waist is 4 × 0.25 mm =
// 1 mm wherever the input waist lies (an analytic identity of the ABCD
// law). The 245 mm rows are this library's values.
func ExampleGrid() {
	const mm = units.Millimeter
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.25 * mm, Wavelength: 633 * units.Nanometer})
	build := func(s1, gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(s1).ThinLens(50 * mm).Label("L1").Space(gap).ThinLens(200 * mm).Label("L2").Space(300 * mm).Build()
	}
	r, err := sweep.Grid(sweep.Param{Name: "laser to L1", Values: []units.Length{30 * mm, 50 * mm, 70 * mm}},
		sweep.Param{Name: "lens gap", Values: []units.Length{245 * mm, 250 * mm}}, build,
		sweep.OutputWaistRadius(laser))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(r.Table().Text())
	// Output:
	// What if the laser to L1 and the lens gap change
	// laser to L1 (mm)  lens gap (mm)  output w0 (mm)
	// ----------------  -------------  --------------
	// 30                245            0.8749
	// 30                250            1
	// 50                245            0.8498
	// 50                250            1
	// 70                245            0.8258
	// 70                250            1
}

var sinkGrid sweep.GridResult

// BenchmarkGrid sweeps the output waist radius and position of a
// two-lens expander over a 50 × 50 grid of the input distance and the
// lens gap (2500 systems built and measured), as a 2-D what-if figure
// does.
func BenchmarkGrid(b *testing.B) {
	laser, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.25 * mm, Wavelength: 633 * nm})
	if err != nil {
		b.Fatal(err)
	}
	build := func(s1, gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(s1).ThinLens(50 * mm).Label("L1").Space(gap).ThinLens(200 * mm).Label("L2").Space(300 * mm).Build()
	}
	a := sweep.Param{Name: "laser to L1", Values: sweep.Steps(20*mm, 80*mm, 50)}
	g := sweep.Param{Name: "lens gap", Values: sweep.Steps(240*mm, 260*mm, 50)}
	b.ReportAllocs()
	for b.Loop() {
		r, err := sweep.Grid(a, g, build, sweep.OutputWaistRadius(laser), sweep.OutputWaistZ(laser))
		if err != nil {
			b.Fatal(err)
		}
		sinkGrid = r
	}
}

// FuzzGrid: any parameter values give a full grid or an error, never a
// panic or a short result.
func FuzzGrid(f *testing.F) {
	f.Add(150e-3, 200e-3, 300e-3, 50e-3, 100e-3)
	f.Add(100e-3, 100e-3, 300e-3, 50e-3, 100e-3)
	f.Add(math.NaN(), 0.0, 1.0, -1.0, math.Inf(1))
	f.Add(0.0, 1e-300, 1e300, 1e-9, 2e-9)
	f.Fuzz(func(t *testing.T, d1, d2, d3, f1, f2 float64) {
		ds := sweep.Param{Name: "d", Values: []units.Length{units.Length(d1), units.Length(d2), units.Length(d3)}}
		fs := sweep.Param{Name: "f", Values: []units.Length{units.Length(f1), units.Length(f2)}}
		r, err := sweep.Grid(ds, fs, lens, sweep.ImageZ(0))
		if err != nil {
			return
		}
		if len(r.Data) != 1 || len(r.Data[0]) != 6 || len(r.Table().Rows) != 6 {
			t.Errorf("grid of 3 × 2: data %v", r.Data)
		}
		for _, v := range r.Data[0] {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("non-finite value %g in %v", v, r.Data[0])
			}
		}
	})
}
