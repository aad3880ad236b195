package units_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleLength() {
	f := 150 * units.Millimeter
	lambda := 632.8 * units.Nanometer
	fmt.Println(f, lambda, 2*f+900*units.Millimeter, 35*units.Micrometer)
	fmt.Printf("%.1f mm = %.3f m\n", f.Millimeters(), f.Meters())
	// Output:
	// 150 mm 632.8 nm 1.2 m 35 µm
	// 150.0 mm = 0.150 m
}

func ExampleAngle() {
	a := 30 * units.Degree
	fmt.Printf("%.6f rad = %.1f°\n", a.Radians(), a.Degrees())
	fmt.Println(2 * units.Milliradian)
	// Output:
	// 0.523599 rad = 30.0°
	// 2 mrad
}
