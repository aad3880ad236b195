package trace_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A plano-convex lens from the paraxial builder, traced with real rays:
// the marginal ray crosses the axis before the paraxial focus (spherical
// aberration: 0.273 mm at h = 5 mm, reference-checks R36), and a ray too
// high for the clear aperture is blocked.
func ExampleFromParaxial() {
	const mm = units.Millimeter
	p, err := paraxial.NewBuilder().
		Space(10*mm).
		ThickLens(51.68*mm, paraxial.Flat, 4*mm, 1.5168).Label("L1").Aperture(paraxial.ClearDiameter(22.86 * mm)).
		Space(100 * mm).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := trace.FromParaxial(p, trace.Media{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []float64{0.001, 5, 10, 12} {
		r, st, stop, err := s.TraceRay(633*units.Nanometer, trace.RayFromAngles(0, h*1e-3, 0, 0, 0))
		if err != nil {
			fmt.Println(err)
			return
		}
		if st != trace.OK {
			fmt.Printf("h = %4.1f mm: %v at %q\n", h, st, s.Surface(stop).Label)
			continue
		}
		z := r.Position.Z - r.Position.Y*r.Direction.Z/r.Direction.Y
		fmt.Printf("h = %4.1f mm: crosses the axis at z = %.4f mm\n", h, z/1e-3)
	}
	// Output:
	// h =  0.0 mm: crosses the axis at z = 111.3629 mm
	// h =  5.0 mm: crosses the axis at z = 111.0899 mm
	// h = 10.0 mm: crosses the axis at z = 110.2617 mm
	// h = 12.0 mm: blocked by the clear aperture at "L1"
}

// A ray beyond the critical angle inside a glass block ends with a
// status, not NaN.
func ExampleSystem_TraceRay() {
	const mm = units.Millimeter
	s, err := trace.New(trace.Index(1.5),
		trace.Surface{Label: "exit face", Kind: trace.Refract, Medium: trace.Index(1), Thickness: 10 * mm})
	if err != nil {
		fmt.Println(err)
		return
	}
	// sin 45° · 1.5 = 1.06 > 1: total internal reflection.
	_, st, stop, _ := s.TraceRay(633*units.Nanometer, trace.RayFromAngles(0, 0, -1e-3, 0, 1))
	fmt.Println(st, "at surface", stop)
	// Output:
	// total internal reflection at surface 0
}
