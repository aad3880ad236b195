package couple_test

import (
	"errors"
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
	// focal length must be close to f0 = π w·w_fibre/λ = 6.07 mm, and the
	// face sits about f after the lens: Kogelnik's one-lens formulas,
	// Kogelnik & Li 1966 [from memory], with zR of the input ≫ f.)
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

	// The mount's tolerances at the fibre face, for the beam as focused:
	// for matched waists w = 4.6 µm the 1 dB offset is w√(0.1 ln 10) =
	// 0.480 w = 2.21 µm and the tilt 0.480 λ/(πw) = 43.5 mrad (R40,
	// Marcuse 1977 [from memory]; 1 dB as the level is common practice,
	// no single source).
	fc, err := cord.Couple(m.Output, couple.Misalignment{})
	if err != nil {
		fmt.Println(err)
		return
	}
	dx, _, _ := fc.OffsetTolerance(couple.OneDecibel)
	tx, _, _ := fc.TiltTolerance(couple.OneDecibel)
	fmt.Printf("1 dB: offset %.2f µm, tilt %.1f mrad\n", dx.Micrometers(), tx.Milliradians())

	// A mount that leaves the face 1.5 µm off the axis: exp(−d²/w²) =
	// 0.8991 (R40).
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

// Two beams at one plane: equal 50 µm waists a Rayleigh range apart
// couple exactly 0.8 (R13 of the project's reference checks: η = 4/[(w1/w2
// + w2/w1)² + (λΔz/(πw1w2))²], Kogelnik 1964 [from memory]). Waists of 50
// and 60 µm in one plane, 10 µm apart, couple
// (2w1w2/(w1² + w2²))²·exp(−2d²/(w1² + w2²)) = 0.9363 (R40, Marcuse 1977
// [from memory]).
func ExampleOverlap() {
	const lambda = 1064 * units.Nanometer
	w := 50 * units.Micrometer
	a, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: w})
	if err != nil {
		fmt.Println(err)
		return
	}
	b, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: w, WaistZ: a.RayleighRange()})
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := couple.Overlap(a, b, couple.Misalignment{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("waists zR apart: η = %.4f (%.3f dB)\n", c.Efficiency, c.LossDB())

	b, err = beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 60 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err = couple.Overlap(a, b, couple.Misalignment{DX: 10 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("50 µm into 60 µm, 10 µm off: η = %.4f (aligned %.4f)\n", c.Efficiency, c.Aligned)
	// Output:
	// waists zR apart: η = 0.8000 (0.969 dB)
	// 50 µm into 60 µm, 10 µm off: η = 0.9363 (aligned 0.9675)
}

// A beam focused to a waist of 4.8 µm on the face of a fibre with a
// 10.4 µm MFD at 1550 nm (w = 5.2 µm) couples the size mismatch
// 4w1²w2²/(w1² + w2²)² = 0.9936 (R13 with Δz = 0). The 1 dB tolerances of
// the face's position and angle follow from the exact Gaussian form of the
// misalignment factor, exp(−2d²/(w1² + w2²)) and
// exp(−2(πθ/λ)²w1²w2²/(w1² + w2²)) (R40, Marcuse 1977 [from memory]):
// d = √(0.1 ln 10·(w1² + w2²)/2) = 2.4012 µm and θ = d·λ/(π w1 w2) =
// 47.46 mrad (evaluated in Python).
func ExampleFibre_Couple() {
	const lambda = 1550 * units.Nanometer
	fibre, err := couple.FibreFromMFD(10.4*units.Micrometer, lambda)
	if err != nil {
		fmt.Println(err)
		return
	}
	spot, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 4.8 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fc, err := fibre.Couple(spot, couple.Misalignment{})
	if err != nil {
		fmt.Println(err)
		return
	}
	dx, _, err := fc.OffsetTolerance(couple.OneDecibel)
	if err != nil {
		fmt.Println(err)
		return
	}
	tx, _, err := fc.TiltTolerance(couple.OneDecibel)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("η = %.4f (%.3f dB)\n", fc.Efficiency, fc.LossDB())
	fmt.Printf("1 dB more loss at an offset of %.3f µm or a tilt of %.1f mrad\n", dx.Micrometers(), tx.Milliradians())
	// Output:
	// η = 0.9936 (0.028 dB)
	// 1 dB more loss at an offset of 2.401 µm or a tilt of 47.5 mrad
}

// Mode matching with two lenses from the drawer: a 1064 nm laser with its
// 0.5 mm waist at the output coupler (z = 0) must be matched to the
// 150 µm waist of a cavity mode at the cavity's input mirror, 500 mm
// away, with lenses of f = 200 mm and f = 100 mm. Each solution images
// the laser waist onto the target waist exactly (Kogelnik's one-lens
// formulas for the second lens, Kogelnik & Li 1966 [from memory]), so the
// efficiency is 1 and the output beam's waist is the target's. Here one
// placement exists (checked by propagating q through it by the ABCD law
// in Python: Im q = 66.43 mm = π(150 µm)²/λ at the target plane).
func ExampleMatchTwoLenses() {
	const lambda = 1064 * units.Nanometer
	laser, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 0.5 * units.Millimeter})
	if err != nil {
		fmt.Println(err)
		return
	}
	mode, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 150 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	ms, err := couple.MatchTwoLenses(laser, mode, 200*units.Millimeter, 100*units.Millimeter, 500*units.Millimeter)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, m := range ms {
		fmt.Printf("L1 at %.2f mm, L2 at %.2f mm: η = %.6f, waist %.2f µm\n",
			m.Lenses[0].Z.Millimeters(), m.Lenses[1].Z.Millimeters(), m.Coupling.Efficiency, m.Output.WaistRadius().Micrometers())
	}
	// Output:
	// L1 at 256.99 mm, L2 at 488.99 mm: η = 1.000000, waist 150.00 µm
}

// Solve with a required efficiency: the launch of the package example,
// but the lens kit starts at f = 8 mm, longer than the f0 = π w w_f/λ =
// 6.07 mm the collimated beam needs (Kogelnik & Li 1966 [from memory]).
// The best inside the bounds is the size mismatch of the too-large spot,
// 0.9285 (S. A. Self, Appl. Opt. 22, 658 (1983) for the spot, R13 for
// the mismatch; see TestSolveMinEfficiency), so MinEfficiency 0.95 fails
// and the error says which bounds hold the solution back.
func ExampleSolve() {
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
	m, err := couple.Solve(couple.Problem{
		Input: diode, Target: mode, MinEfficiency: 0.95,
		Lenses:    []couple.Lens{{Label: "launch lens", FocalMin: 8 * units.Millimeter, FocalMax: 20 * units.Millimeter, ZMin: 20 * units.Millimeter, ZMax: 60 * units.Millimeter}},
		MinLength: 20 * units.Millimeter, MaxLength: 100 * units.Millimeter,
	})
	fmt.Println(errors.Is(err, couple.ErrNoSolution))
	fmt.Println(err)
	l := m.Lenses[0]
	fmt.Printf("best: f = %.3f mm at %.3f mm, η = %.4f\n", l.Focal.Millimeters(), l.Z.Millimeters(), m.Coupling.Efficiency)
	// Output:
	// true
	// couple: minimum efficiency MinEfficiency = 0.95: the best efficiency inside the bounds is 0.928549; active bounds: lens "launch lens" focal length at its lower bound FocalMin 8 mm; lens "launch lens" position at its upper bound ZMax 60 mm: no mode-matching solution
	// best: f = 8.000 mm at 60.000 mm, η = 0.9285
}
