package plan_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/plan"
	"github.com/beamnote/beamnote/opticslib/units"
)

// An invented bench: a 633 nm laser head near the front-left corner of a
// 900 × 600 mm metric breadboard sends its beam along +x; a 3× Kepler
// expander (f 50 mm and 150 mm, 200 mm apart along the path, its focus
// between the mirrors) is folded by two 45° mirrors into a Z (left, then right), which offsets the beam
// by 100 mm parallel to itself, and the expanded beam reaches a camera
// behind an iris.
func ExampleLay() {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(150 * mm).
		ThinLens(50 * mm).Label("L1").Aperture(paraxial.HalfInchOptic()).
		Space(25 * mm).
		FlatMirror(45 * units.Degree).Label("M1").Aperture(paraxial.OneInchOptic()).
		Space(100 * mm).
		FlatMirror(45 * units.Degree).Label("M2").Aperture(paraxial.OneInchOptic()).
		Space(75 * mm).
		ThinLens(150 * mm).Label("L2").Aperture(paraxial.OneInchOptic()).
		Space(200 * mm).
		Diaphragm(paraxial.ClearDiameter(8 * mm)).Label("iris").
		Space(100 * mm).
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
		Folds: map[string]plan.Turn{"M1": plan.Left, "M2": plan.Right},
		Beam:  in,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(p.Table())
	fmt.Println(len(p.Warnings), "warnings")
	end, dir := p.At(p.Length)
	fmt.Printf("beam ends at (%.1f, %.1f) mm going %.0f°\n", end.X.Millimeters(), end.Y.Millimeters(), dir.Degrees())
	// Output:
	// Table plan on a 900 × 600 mm metric breadboard (M6 on 25 mm): positions from the origin corner, holes counted from 1 there, angles counterclockwise from +x
	// part  kind              x (mm)  y (mm)  hole (col, row)  dx (mm)  dy (mm)  beam (°)    normal (°)  z (mm)  clearance (mm)  w (mm)
	// ----  ----------------  ------  ------  ---------------  -------  -------  ----------  ----------  ------  --------------  ------
	// L1    thin lens         187.5   112.5   8, 5             0.0      0.0      0.0                     150.0   18.8            0.407
	// M1    mirror 45° left   212.5   112.5   9, 5             0.0      0.0      0.0 → 90.0  135.0       175.0   84.6            0.206
	// M2    mirror 45° right  212.5   212.5   9, 9             0.0      0.0      90.0 → 0.0  315.0       275.0   85.0            0.602
	// L2    thin lens         287.5   212.5   12, 9            0.0      0.0      0.0                     350.0   68.4            1.207
	// iris  diaphragm         487.5   212.5   20, 9            0.0      0.0      0.0                     550.0   269.4           1.211
	// 0 warnings
	// beam ends at (587.5, 212.5) mm going 0°
}

// A mirror without a fold direction is an error naming it.
func ExampleLay_missingFold() {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(100 * mm).FlatMirror(30 * units.Degree).Label("M1").Space(100 * mm).Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	_, err = plan.Lay(sys, plan.Spec{Board: plan.MetricBoard(600*mm, 600*mm), Start: plan.Point{X: 100 * mm, Y: 100 * mm}})
	fmt.Println(err)
	// Output:
	// plan: mirror "M1": angle of incidence θ = 30° (523.599 mrad): no fold direction given: add "M1": plan.Left or plan.Right to Spec.Folds: fold direction missing or invalid
}

// The checks on an invented bench laid out in a hurry: the lens sits
// 5 mm before the fold mirror, so the mounts collide and the beam leaving
// the mirror cuts through the lens holder, and the returning leg of the
// U-turn is longer than the board.
func ExampleWarnings_Table() {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(150 * mm).ThinLens(100 * mm).Label("L1").
		Space(5 * mm).FlatMirror(45 * units.Degree).Label("M1").
		Space(40 * mm).FlatMirror(45 * units.Degree).Label("M2").
		Space(300 * mm).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := plan.Lay(sys, plan.Spec{
		Board: plan.MetricBoard(600*mm, 450*mm),
		Start: plan.Point{X: 37.5 * mm, Y: 212.5 * mm},
		Folds: map[string]plan.Turn{"M1": plan.Left, "M2": plan.Left},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(p.Warnings.Table())
	// Output:
	// Table-plan checks: 3 warnings
	// check              x (mm)  y (mm)  warning
	// -----------------  ------  ------  ------------------------------------------------------------------------------------
	// collision          188.4   201.1   "L1" and "M1" collide: the footprints overlap by 13.9 mm at (188.4, 201.1) mm
	// beam through part  192.5   212.5   beam segment 2 (z 155–195 mm) passes through "L1" for 18.7 mm from (192.5, 212.5) mm
	// beam off board     0.0     252.5   the beam leaves the board across the left edge at (0.0, 252.5) mm, z = 387.5 mm
}
