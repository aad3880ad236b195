package budget_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/budget"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A 20 mW, 640 nm diode module feeds a microscope's illumination fibre:
// its uncoated output window, a silver fold mirror, an iris, a half-wave
// plate and a polarizer that set the power, and an AR-coated coupling lens
// into the fibre (coupling efficiency 0.65, from a mode-overlap estimate).
func Example() {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(5*mm).Plate(1*mm, 1.5, 0).Label("window").
		Space(80*mm).FlatMirror(45*units.Degree).Label("fold").
		Space(60*mm).Diaphragm(paraxial.ClearDiameter(3*mm)).Label("iris").
		Space(20*mm).Plate(0.5*mm, 1.54, 0).Label("HWP").
		Space(20*mm).Plate(2*mm, 1.5, 0).Label("polarizer").
		Space(40*mm).ThickLens(8*mm, paraxial.Flat, 2.5*mm, 1.5).Label("coupler").
		Space(7 * mm).Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	laser, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.9 * mm, Wavelength: 640 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	hwp, err := polar.HalfWave(10 * units.Degree)
	if err != nil {
		fmt.Println(err)
		return
	}
	pol, err := polar.Polarizer(0)
	if err != nil {
		fmt.Println(err)
		return
	}
	b, err := budget.NewBuilder(sys, budget.Input{Power: 20e-3, Beam: laser, Polarization: polar.Jones{X: 1}}).
		Mirror("fold", 0.975).
		AR("HWP", 0.002).Insert("HWP", "half-wave plate at 10°", hwp).
		AR("polarizer", 0.002).Insert("polarizer", "polarizer at 0°", pol).
		AR("coupler", 0.0025).Coupling("coupler", 0.65).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range b.Rows {
		fmt.Printf("%-30s z = %6.1f mm  T = %.4f  P = %7.4f mW  I0 = %.3g W/cm²\n", r.Name, r.Z.Millimeters(), r.Transmission, r.Power*1e3, r.Irradiance*1e-4)
	}
	fmt.Printf("into the fibre: %.3f mW (%.1f %%)\n", b.Output()*1e3, 100*b.Fraction())
	// Irradiance is never shown without the caution.
	fmt.Println(b.Note)
	// Output:
	// Plate "window" (call 2)        z =    5.0 mm  T = 0.9600  P = 19.2000 mW  I0 = 1.51 W/cm²
	// Plate "window" (call 2)        z =    6.0 mm  T = 0.9600  P = 18.4320 mW  I0 = 1.45 W/cm²
	// FlatMirror "fold" (call 4)     z =   86.0 mm  T = 0.9750  P = 17.9712 mW  I0 = 1.41 W/cm²
	// Diaphragm "iris" (call 6)      z =  146.0 mm  T = 0.9961  P = 17.9012 mW  I0 = 1.41 W/cm²
	// Plate "HWP" (call 8)           z =  166.0 mm  T = 0.9980  P = 17.8654 mW  I0 = 1.4 W/cm²
	// Plate "HWP" (call 8)           z =  166.5 mm  T = 0.9980  P = 17.8297 mW  I0 = 1.4 W/cm²
	// Plate "polarizer" (call 10)    z =  186.5 mm  T = 0.9980  P = 17.7940 mW  I0 = 1.4 W/cm²
	// Plate "polarizer" (call 10)    z =  188.5 mm  T = 0.8813  P = 15.6811 mW  I0 = 1.23 W/cm²
	// ThickLens "coupler" (call 12)  z =  228.5 mm  T = 0.9975  P = 15.6419 mW  I0 = 1.23 W/cm²
	// ThickLens "coupler" (call 12)  z =  231.0 mm  T = 0.6484  P = 10.1418 mW  I0 = 0.99 W/cm²
	// into the fibre: 10.142 mW (50.7 %)
	// Laser safety: focused beams reach hazardous irradiance at powers far below those of most laboratory lasers, and lenses and windows throw stray reflections. These numbers are beam-optics estimates, not exposure limits and not a safety clearance. Follow your local laser-safety rules and the instructions of your responsible laser safety officer, and wear the eyewear they specify.
}
