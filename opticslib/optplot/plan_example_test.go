package optplot_test

// Example of the table-plan figure; it prints what was drawn, not
// optics (the geometry is tested in package plan).

import (
	"bytes"
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/plan"
	"github.com/beamnote/beamnote/opticslib/units"
)

// An invented bench on a 900 × 600 mm metric breadboard: a 633 nm beam
// expanded 3× by a Kepler telescope folded into a Z by two 45° mirrors,
// then an iris; the last mirror is placed too close behind the iris, so
// the figure shows one collision.
func ExamplePlan() {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(150 * mm).
		ThinLens(50 * mm).Label("L1").Aperture(paraxial.HalfInchOptic()).
		Space(25 * mm).
		FlatMirror(45 * units.Degree).Label("M1").
		Space(100 * mm).
		FlatMirror(45 * units.Degree).Label("M2").
		Space(75 * mm).
		ThinLens(150 * mm).Label("L2").
		Space(200 * mm).
		Diaphragm(paraxial.ClearDiameter(8 * mm)).Label("iris").
		Space(10 * mm).
		FlatMirror(45 * units.Degree).Label("M3").
		Space(200 * mm).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 633 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := plan.Lay(sys, plan.Spec{
		Board: plan.MetricBoard(900*mm, 600*mm),
		Start: plan.Point{X: 37.5 * mm, Y: 112.5 * mm},
		Folds: map[string]plan.Turn{"M1": plan.Left, "M2": plan.Right, "M3": plan.Left},
		Beam:  in,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.Plan(p, optplot.Title("Folded expander"))
	if err != nil {
		fmt.Println(err)
		return
	}
	svg, err := f.SVG()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.Contains(svg, []byte(">iris<")), len(p.Warnings))
	fmt.Println(p.Warnings[0])
	// Output:
	// true 1
	// "iris" and "M3" collide: the footprints overlap by 9.6 mm at (489.1, 198.6) mm
}
