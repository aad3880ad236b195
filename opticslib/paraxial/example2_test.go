package paraxial_test

// Examples of the analyses. The printed values are regression outputs; the
// same quantities are checked against outside references in
// reference_test.go (for instance the R30 equi-biconvex lens of
// ExampleSystem_Cardinal, against the thick-lens formulas of W. J. Smith,
// Modern Optical Engineering, 4th ed., McGraw-Hill 2008, ch. 2 [from
// memory]).

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleSystem_Cardinal() {
	const mm = units.Millimeter
	// An equi-biconvex lens, n = 1.5168, R = ±50 mm, 5 mm thick, 20 mm
	// after the input plane (reference-checks R30).
	sys, err := paraxial.NewBuilder().
		Space(20*mm).
		ThickLens(50*mm, -50*mm, 5*mm, 1.5168).Label("L1").
		Space(60 * mm).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := sys.Cardinal(paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("EFL %.6f mm, BFL %.6f mm, FFL %.6f mm\n", c.EFL.Millimeters(), c.BFL.Millimeters(), c.FFL.Millimeters())
	fmt.Printf("H at z = %.6f mm, H' at z = %.6f mm\n", c.FrontPrincipalPlane.Millimeters(), c.RearPrincipalPlane.Millimeters())
	fmt.Printf("F' at z = %.6f mm\n", c.RearFocalPoint.Millimeters())
	// Output:
	// EFL 49.212999 mm, BFL 47.536227 mm, FFL 47.536227 mm
	// H at z = 21.676772 mm, H' at z = 23.323228 mm
	// F' at z = 72.536227 mm
}

func ExampleSystem_Image() {
	const mm = units.Millimeter
	// A singlet f = 100 mm; where is the image of an object 150 mm
	// before it, and where must the object go for 3× magnification?
	sys, _ := paraxial.NewBuilder().ThinLens(100 * mm).Space(400 * mm).Build()
	c, err := sys.Image(-150*mm, paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("image at z = %.1f mm, m = %.3f\n", c.Image.Millimeters(), c.Magnification)
	c, err = sys.ObjectFor(-3, paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("object at z = %.3f mm, image at z = %.1f mm\n", c.Object.Millimeters(), c.Image.Millimeters())
	// Output:
	// image at z = 300.0 mm, m = -2.000
	// object at z = -133.333 mm, image at z = 400.0 mm
}

func ExampleSystem_Stops() {
	const mm = units.Millimeter
	// A camera lens f = 50 mm (a 1-inch singlet) with an 8 mm iris 10 mm
	// in front of it and an 8 mm-wide sensor mask in the focal plane,
	// object at infinity.
	sys, _ := paraxial.NewBuilder().
		Space(10 * mm).Diaphragm(paraxial.ClearDiameter(8 * mm)).Label("iris").
		Space(10 * mm).ThinLens(50 * mm).Aperture(paraxial.ClearDiameter(24 * mm)).
		Space(50 * mm).Diaphragm(paraxial.ClearDiameter(8 * mm)).Label("sensor").
		Build()
	a, err := sys.Stops(paraxial.ObjectAtInfinity(), paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("stop: %s, entrance pupil z = %.1f mm, radius %.2f mm\n", a.StopName, a.Entrance.Z.Millimeters(), a.Entrance.Radius.Millimeters())
	fmt.Printf("f-number %.2f, image NA %.3f\n", a.FNumber, a.ImageNA)
	fmt.Printf("field stop: %s, half field %.3f°\n", a.FieldStopName, a.HalfField.Angle.Degrees())
	// Output:
	// stop: iris, entrance pupil z = 10.0 mm, radius 4.00 mm
	// f-number 6.25, image NA 0.080
	// field stop: sensor, half field 4.584°
}

func ExampleSystem_WithSpace() {
	const mm = units.Millimeter
	// What if the object-to-lens spacing grows from 150 mm to 160 mm?
	sys, _ := paraxial.NewBuilder().Space(150 * mm).Label("object to lens").ThinLens(100 * mm).Label("L").Space(300 * mm).Build()
	alt, err := sys.WithSpace("object to lens", 160*mm)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range []paraxial.System{sys, alt} {
		c, _ := s.Image(0, paraxial.Tangential)
		l, _ := s.Part("L")
		fmt.Printf("lens at %v: image at z = %.2f mm, m = %.3f\n", l.Z, c.Image.Millimeters(), c.Magnification)
	}
	// Output:
	// lens at 150 mm: image at z = 450.00 mm, m = -2.000
	// lens at 160 mm: image at z = 426.67 mm, m = -1.667
}

func ExampleBuilder_Append() {
	const mm = units.Millimeter
	// A 2× Kepler telescope used twice in series gives 4×.
	tele, _ := paraxial.NewBuilder().ThinLens(50 * mm).Space(150 * mm).ThinLens(100 * mm).Build()
	sys, _ := paraxial.NewBuilder().Append(tele).Space(50 * mm).Append(tele).Build()
	c, _ := sys.Cardinal(paraxial.Tangential)
	fmt.Printf("afocal %v, transverse magnification %.3f, %d elements\n", c.Afocal, c.TransverseMagnification, sys.Len())
	// Output:
	// afocal true, transverse magnification 4.000, 7 elements
}

func ExampleSystem_Move() {
	const mm = units.Millimeter
	// Slide L2 of a relay 2 mm towards L1 on the rail; the camera at the
	// end stays put. The object sits in the front focal plane of L1, so
	// the light between the lenses is collimated and the image moves with
	// L2, 2 mm in front of the camera.
	sys, _ := paraxial.NewBuilder().
		Space(100 * mm).ThinLens(100 * mm).Label("L1").
		Space(150 * mm).ThinLens(50 * mm).Label("L2").
		Space(50 * mm).Build()
	moved, err := sys.Move("L2", -2*mm)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range []paraxial.System{sys, moved} {
		l2, _ := s.Part("L2")
		c, _ := s.Image(0, paraxial.Tangential)
		fmt.Printf("L2 at %v, camera at %v: image %.3f mm after the camera\n", l2.Z, s.Length(), (c.Image - s.Length()).Millimeters())
	}
	// Output:
	// L2 at 250 mm, camera at 300 mm: image 0.000 mm after the camera
	// L2 at 248 mm, camera at 300 mm: image -2.000 mm after the camera
}

func ExampleBuilder_ConcaveMirror() {
	const mm = units.Millimeter
	// A concave mirror whose box says R = 200 mm, folding the beam at 10°
	// incidence: the tangential and sagittal foci split.
	sys, _ := paraxial.NewBuilder().ConcaveMirror(200*mm, 10*units.Degree).Space(100 * mm).Build()
	t, _ := sys.Cardinal(paraxial.Tangential)
	s, _ := sys.Cardinal(paraxial.Sagittal)
	fmt.Printf("f_t = %.3f mm, f_s = %.3f mm\n", t.EFL.Millimeters(), s.EFL.Millimeters())
	// Output:
	// f_t = 98.481 mm, f_s = 101.543 mm
}

func ExampleSystem_Table() {
	const mm = units.Millimeter
	sys, _ := paraxial.NewBuilder().
		Space(5*mm).
		ThickLens(25*mm, paraxial.Flat, 3*mm, 1.5).Label("PCX").Aperture(paraxial.ClearDiameter(12 * mm)).
		Space(45 * mm).
		Build()
	fmt.Print(sys.Table().Text())
	// Output:
	// Prescription
	// call         element                           label  z (mm)  length (mm)  R / f (mm)  n after  tilt (°)  clear aperture (mm)
	// -----------  --------------------------------  -----  ------  -----------  ----------  -------  --------  -------------------
	// 1 Space      space                                    0.000   5.000                    1.0000
	// 2 ThickLens  spherical interface (thick lens)  PCX    5.000                R 25.000    1.5000             Ø 12.000
	// 2 ThickLens  space (thick lens)                PCX    5.000   3.000                    1.5000
	// 2 ThickLens  planar interface (thick lens)     PCX    8.000                flat        1.0000             Ø 12.000
	// 3 Space      space                                    8.000   45.000                   1.0000
}

func ExampleSystem_Fan() {
	const mm = units.Millimeter
	// A ray fan from an object point 2 mm off axis, 200 mm before a
	// 100 mm lens of clear radius 10 mm: every ray meets again in the
	// image plane at 2f, at −2 mm (magnification −1).
	sys, _ := paraxial.NewBuilder().ThinLens(100 * mm).Aperture(paraxial.ClearRadius(10 * mm)).Space(200 * mm).Build()
	a, err := sys.Stops(paraxial.ObjectAt(-200*mm), paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	fan, err := sys.Fan(a, paraxial.Field{Height: 2 * mm}, 3, sys.Length())
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, steps := range fan.Rays {
		lens, end := steps[1], steps[len(steps)-1]
		fmt.Printf("ρ = %+.0f: y = %+.3f mm at the lens, %+.3f mm at z = %.0f mm\n",
			fan.Pupil[i], lens.Ray.Y.Millimeters(), end.Ray.Y.Millimeters(), end.Z.Millimeters())
	}
	// Output:
	// ρ = -1: y = -10.000 mm at the lens, -2.000 mm at z = 200 mm
	// ρ = +0: y = +0.000 mm at the lens, -2.000 mm at z = 200 mm
	// ρ = +1: y = +10.000 mm at the lens, -2.000 mm at z = 200 mm
}
