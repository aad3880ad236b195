package paraxial_test

// Examples of the builder and matrices. The printed values are regression
// outputs; the formulas behind them are checked against outside references
// in reference_test.go and elements_test.go.

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleBuilder() {
	// A Kepler telescope: f1 = 100 mm, f2 = 300 mm, separated by f1 + f2.
	sys, err := paraxial.NewBuilder().
		ThinLens(100 * units.Millimeter).Label("L1").
		Space(400 * units.Millimeter).
		ThinLens(300 * units.Millimeter).Label("L2").Aperture(paraxial.ClearRadius(12.5 * units.Millimeter)).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	m := sys.Matrix(paraxial.Tangential)
	fmt.Printf("A=%.4f B=%.4f m C=%.4f /m D=%.4f\n", m.A, m.B, m.C, m.D)
	for _, e := range sys.Elements() {
		fmt.Printf("%-9s %-3s at z = %v\n", e.Kind, e.Label, e.Z)
	}
	// Output:
	// A=-3.0000 B=0.4000 m C=0.0000 /m D=-0.3333
	// thin lens L1  at z = 0 m
	// space         at z = 0 m
	// thin lens L2  at z = 400 mm
}

func ExampleBuilder_error() {
	// The error names the builder call and, once given, its label.
	_, err := paraxial.NewBuilder().
		Space(50 * units.Millimeter).
		ThinLens(0).Label("L1").
		Build()
	fmt.Println(err)
	// Output:
	// paraxial: ThinLens "L1" (call 2): focal length f = 0 m: must be nonzero and finite
}

func ExampleSystem_MatrixTo() {
	// A thick equi-biconvex lens (n = 1.5168, R = ±50 mm, 5 mm thick)
	// followed by 60 mm of air.
	sys, _ := paraxial.NewBuilder().
		Interface(50*units.Millimeter, 1.5168).
		Space(5*units.Millimeter).
		Interface(-50*units.Millimeter, 1).
		Space(60 * units.Millimeter).
		Build()
	m, _ := sys.MatrixTo(5*units.Millimeter, paraxial.Tangential) // just after the rear surface
	fmt.Printf("EFL = %.6f mm, BFL = %.6f mm\n", -1/m.C*1e3, -m.A/m.C*1e3)
	fmt.Printf("n(2 mm) = %.4f, det = %.4f\n", sys.IndexAt(2*units.Millimeter), sys.Matrix(paraxial.Tangential).Det())
	// Output:
	// EFL = 49.212999 mm, BFL = 47.536227 mm
	// n(2 mm) = 1.5168, det = 1.0000
}

func ExampleMatrix_Apply() {
	// 2f–2f imaging with a 100 mm lens: 200 mm of air, the lens, 200 mm of
	// air (B = 0, A = −1). A ray leaving the axial object point at 5 mrad
	// returns to the axis in the image plane; a ray from an object point
	// 1 mm above the axis arrives at the image height −1 mm whatever its
	// slope (1/s_o + 1/s_i = 1/f, m = −s_i/s_o = −1).
	const mm = units.Millimeter
	m := paraxial.Space(200 * mm).Then(paraxial.ThinLens(100 * mm)).Then(paraxial.Space(200 * mm))
	for _, in := range []paraxial.Ray{
		{Y: 0, Theta: 5 * units.Milliradian},
		{Y: 1 * mm, Theta: 2 * units.Milliradian},
	} {
		r := m.Apply(in)
		fmt.Printf("in: y = %.3f mm, θ = %.3f mrad; out: y = %.3f mm, θ = %.3f mrad\n",
			in.Y.Millimeters(), float64(in.Theta/units.Milliradian), r.Y.Millimeters(), float64(r.Theta/units.Milliradian))
	}
	// Output:
	// in: y = 0.000 mm, θ = 5.000 mrad; out: y = 0.000 mm, θ = -5.000 mrad
	// in: y = 1.000 mm, θ = 2.000 mrad; out: y = -1.000 mm, θ = -12.000 mrad
}
