package couple_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A bench test station launches the collimated 1.1 mm beam of a 1310 nm
// diode module into the patch cord "PC-7", whose card gives a mode-field
// diameter of 9.2 µm at 1310 nm. Which lens focuses the beam onto the
// mode, how far does the fibre face sit from the lens, and how much
// lateral and angular slop does the fibre mount allow for 1 dB?
func Example() {
	const lambda = 1310 * units.Nanometer
	diode, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 0.55 * units.Millimeter})
	if err != nil {
		fmt.Println(err)
		return
	}
	cord, err := couple.FibreFromMFD(9.2*units.Micrometer, lambda)
	if err != nil {
		fmt.Println(err)
		return
	}
	mode, err := cord.Mode(1)
	if err != nil {
		fmt.Println(err)
		return
	}
	// The launch lens may sit 20–60 mm after the diode's window, with a
	// focal length of 5–20 mm; the fibre face within 100 mm of the window.
	// (The beam is collimated, so the lens position hardly matters; the
	// focal length must be close to π w·w_fibre/λ = 6.07 mm.)
	m, err := couple.Solve(couple.Problem{
		Input: diode, Target: mode,
		Lenses:    []couple.Lens{{Label: "launch lens", FocalMin: 5 * units.Millimeter, FocalMax: 20 * units.Millimeter, ZMin: 20 * units.Millimeter, ZMax: 60 * units.Millimeter}},
		MinLength: 20 * units.Millimeter, MaxLength: 100 * units.Millimeter,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	l := m.Lenses[0]
	fmt.Printf("lens f = %.3f mm, fibre face %.3f mm after the lens, η = %.4f\n",
		l.Focal.Millimeters(), (m.Length - l.Z).Millimeters(), m.Coupling.Efficiency)

	// The mount's tolerances at the fibre face, for the beam as focused.
	fc, err := cord.Couple(m.Output, couple.Misalignment{})
	if err != nil {
		fmt.Println(err)
		return
	}
	dx, _, _ := fc.OffsetTolerance(couple.OneDecibel)
	tx, _, _ := fc.TiltTolerance(couple.OneDecibel)
	fmt.Printf("1 dB: offset %.2f µm, tilt %.1f mrad\n", dx.Micrometers(), tx.Milliradians())

	// A mount that leaves the face 1.5 µm off the axis.
	fc, err = cord.Couple(m.Output, couple.Misalignment{DX: 1.5 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("1.5 µm off: η = %.4f (%.2f dB)\n", fc.Efficiency, fc.LossDB())
	// Output:
	// lens f = 6.069 mm, fibre face 6.070 mm after the lens, η = 1.0000
	// 1 dB: offset 2.21 µm, tilt 43.5 mrad
	// 1.5 µm off: η = 0.8991 (0.46 dB)
}
