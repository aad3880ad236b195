package beam_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleFromWaist() {
	// A HeNe beam with a 0.5 mm waist, 2 m after the waist.
	g, err := beam.FromWaist(0.5*units.Millimeter, 0, 632.8*units.Nanometer, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("zR = %.6f m, θ = %.6f mrad\n", g.RayleighRange().Meters(), float64(g.Divergence()/units.Milliradian))
	g = g.Transform(paraxial.Space(2*units.Meter), 1)
	fmt.Printf("w = %.7f mm, R = %.6f m, ψ = %.6f rad\n",
		g.Radius().Millimeters(), g.Curvature().Meters(), g.GouyPhase().Radians())
	// Output:
	// zR = 1.241148 m, θ = 0.402853 mrad
	// w = 0.9482416 mm, R = 2.770224 m, ψ = 1.015386 rad
}

func ExampleWaists() {
	// A 0.2 mm waist 200 mm before a 100 mm lens (S. A. Self 1983).
	in, _ := beam.FromWaist(0.2*units.Millimeter, 0, 632.8*units.Nanometer, 1)
	sys, _ := paraxial.NewBuilder().
		Space(200 * units.Millimeter).
		ThinLens(100 * units.Millimeter).Label("L").
		Space(300 * units.Millimeter).
		Build()
	ws, err := beam.Waists(sys, in)
	if err != nil {
		fmt.Println(err)
		return
	}
	w := ws[1] // after the lens
	fmt.Printf("waist %.4f µm at z = %.3f mm\n", w.Radius.Micrometers(), w.Z.Millimeters())
	// Output:
	// waist 89.9520 µm at z = 320.228 mm
}

func ExampleSample() {
	in, _ := beam.FromWaist(1*units.Millimeter, 0, 1064*units.Nanometer, 1)
	sys, _ := paraxial.NewBuilder().
		Space(100 * units.Millimeter).
		ThinLens(200 * units.Millimeter).
		Space(200 * units.Millimeter).
		Build()
	c, err := beam.Sample(sys, in, 4)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := range c.Z {
		fmt.Printf("z = %5.1f mm  w = %.4f mm  n = %.1f\n", c.Z[i]*1e3, c.W[i]*1e3, c.Index[i])
	}
	// Output:
	// z =   0.0 mm  w = 1.0000 mm  n = 1.0
	// z = 100.0 mm  w = 1.0006 mm  n = 1.0
	// z = 200.0 mm  w = 0.5026 mm  n = 1.0
	// z = 300.0 mm  w = 0.0677 mm  n = 1.0
}
