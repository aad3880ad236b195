package sweep_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/units"
)

const (
	mm = units.Millimeter
	nm = units.Nanometer
)

func imager(d units.Length) (paraxial.System, error) {
	return paraxial.NewBuilder().Space(d).Label("object to lens").ThinLens(100 * mm).Label("L").Space(300 * mm).Build()
}

// A thin lens f = 100 mm with the object at distance d images it at
// d·f/(d − f) behind the lens, magnification −f/(d − f) (the thin-lens
// imaging equation; F. L. Pedrotti et al., Introduction to Optics, 3rd
// ed., 2007, ch. 2 [from memory]). rel 1e-12.
func TestOverThinLens(t *testing.T) {
	ds := []units.Length{150 * mm, 200 * mm, 300 * mm}
	r, err := sweep.Over("object distance", ds, imager, sweep.ImageZ(0), sweep.Magnification(0))
	if err != nil {
		t.Fatal(err)
	}
	for i, d := range ds {
		f := 0.1
		wantZ := float64(d) + float64(d)*f/(float64(d)-f)
		wantM := -f / (float64(d) - f)
		if math.Abs(r.Data[0][i]-wantZ) > 1e-12*wantZ || math.Abs(r.Data[1][i]-wantM) > 1e-12 {
			t.Errorf("d = %v: image z %g, m %g; want %g, %g", d, r.Data[0][i], r.Data[1][i], wantZ, wantM)
		}
	}
	tb := r.Table()
	if tb.Header[0] != "object distance (mm)" || tb.Header[1] != "image z (mm)" || tb.Header[2] != "magnification" || tb.Rows[1][1] != "400" || tb.Rows[1][2] != "-1" {
		t.Errorf("table = %+v", tb)
	}
	// A failing case names the value and the quantity.
	_, err = sweep.Over("object distance", []units.Length{100 * mm}, imager, sweep.ImageZ(0))
	if !errors.Is(err, paraxial.ErrImageAtInfinity) || !strings.Contains(err.Error(), "sweep: object distance = 100 mm: image z") {
		t.Errorf("object in the focal plane: error = %v", err)
	}
	if _, err := sweep.Over("d", nil, imager, sweep.ImageZ(0)); !errors.Is(err, sweep.ErrNoCases) {
		t.Errorf("no values: error = %v", err)
	}
}

// At the afocal gap f₁ + f₂ = 120 mm the output waist is the 5× image of
// the laser's, 2.1 mm (Kogelnik & Li 1966, afocal imaging of a waist); the
// other rows are this library's values.
func ExampleOver() {
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.42 * mm, Wavelength: 488 * nm})
	expander := func(gap units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(40 * mm).ThinLens(-30 * mm).Space(gap).ThinLens(150 * mm).Space(500 * mm).Build()
	}
	r, err := sweep.Over("lens gap", []units.Length{118 * mm, 120 * mm, 122 * mm}, expander,
		sweep.OutputWaistRadius(laser), sweep.RadiusAtEnd(laser))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(r.Table().Text())
	// Output:
	// What if the lens gap changes
	// lens gap (mm)  output w0 (mm)  w at the output plane (mm)
	// -------------  --------------  --------------------------
	// 118            0.7566          2.171
	// 120            2.1             2.106
	// 122            0.7891          2.04
}

// A what-if over parts, not lengths: the same lens traded for two from the
// drawer, the image z from the thin-lens equation as above.
func TestCases(t *testing.T) {
	build := func(f units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(300 * mm).ThinLens(f).Space(300 * mm).Build()
	}
	type lens struct {
		name string
		f    units.Length
	}
	r, err := sweep.Cases("lens", []lens{{"drawer lens A", 100 * mm}, {"drawer lens B", 150 * mm}}, func(l lens) string { return l.name },
		func(l lens) (paraxial.System, error) { return build(l.f) }, sweep.ImageZ(0))
	if err != nil {
		t.Fatal(err)
	}
	tb := r.Table()
	// 300·100/200 = 150 mm behind the lens; 300·150/150 = 300 mm.
	if tb.Header[0] != "lens" || tb.Rows[0][0] != "drawer lens A" || tb.Rows[0][1] != "450" || tb.Rows[1][1] != "600" || r.Values != nil {
		t.Errorf("table = %+v", tb)
	}
}
