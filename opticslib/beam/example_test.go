package beam_test

// Examples of Gaussian-beam propagation. Where each printed value can be
// checked against an outside reference, and which values are only
// regression values of this library:
//
//   - ExampleFromWaist, ExampleFromRadius: zR, θ, w, R and ψ are those of
//     reference-checks R08, from the free-space formulas of H. Kogelnik &
//     T. Li, "Laser beams and resonators", Appl. Opt. 5, 1550 (1966)
//     (TestFreeSpaceR08, TestFromRadiusR08).
//   - ExampleWaists: reference-checks R10, S. A. Self, "Focusing of
//     spherical Gaussian beams", Appl. Opt. 22, 658 (1983)
//     (TestThinLensSelfR10).
//   - ExampleSample, ExampleAt: the focus (z = 299.542 mm, w0 = 67.70 µm)
//     follows from Self's formula, and w and R at each plane from Kogelnik
//     & Li's w(z) and R(z) about that waist. Which planes Sample lists is
//     this library's own choice, a regression value.
//   - ExampleGaussian_WithM2: zR = πW0²/(M²λ) and θ = M²λ/(πW0) of the
//     embedded Gaussian (A. E. Siegman, Proc. SPIE 1224, 2 (1990) [from
//     memory]; ISO 11146-1 for M²), and w(1 m) from the same form.
//   - ExampleAtXY: wx from Self's formula (the focusing plane), wy from
//     Kogelnik & Li's w(z) (the plane without power).
//   - ExampleApertures, ExampleCircularTransmission: the round-beam values
//     are 1 − exp(−2a²/w²), the integral of the TEM₀₀ irradiance of
//     Kogelnik & Li (reference-checks R09, TestPowerR09). The elliptical
//     value 0.835082 has no published source: it is a regression value
//     that agrees with a direct 2-D integration by scipy's dblquad (the
//     method is cross-checked on seeded cases in crosscheck_test.go). The
//     99 % default threshold is this library's choice.
//   - ExampleCaustic_Irradiance: the focus of reference-checks R12 (Self's
//     formula with s = 0: w0 = 16.93 µm at 99.9928 mm) and the peak
//     irradiance 2P/(πw²) of Kogelnik & Li (R09).
//   - ExampleExtremes: the smallest radius is λf/(πw0) at f behind the
//     first lens (Self's formula with s = f, exact in that case), the
//     largest 3 × 0.5 mm, the magnification f2/f1 of the 50/150 mm
//     expander; the positions the search reports are regression values.
//   - Error messages, the summary wording and the safety note are this
//     library's own text.

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleFromWaist() {
	// A HeNe beam with a 0.5 mm waist, 2 m after the waist.
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * units.Millimeter, Wavelength: 632.8 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("zR = %.6f m, θ = %.6f mrad\n", g.RayleighRange().Meters(), float64(g.HalfDivergence()/units.Milliradian))
	g = g.Transform(paraxial.Space(2*units.Meter), 1)
	fmt.Printf("w = %.7f mm, R = %.6f m, ψ = %.6f rad\n",
		g.Radius().Millimeters(), g.WavefrontRadius().Meters(), g.GouyPhase().Radians())
	// Output:
	// zR = 1.241148 m, θ = 0.402853 mrad
	// w = 0.9482416 mm, R = 2.770224 m, ψ = 1.015386 rad
}

func ExampleWaists() {
	// A 0.2 mm waist 200 mm before a 100 mm lens (S. A. Self 1983).
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.2 * units.Millimeter, Wavelength: 632.8 * units.Nanometer})
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
	// A collimated 1 mm beam focused by a 200 mm lens; the sampler adds
	// the element positions and the real waist to the 4 requested points.
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * units.Millimeter, Wavelength: 1064 * units.Nanometer})
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
		fmt.Printf("z = %5.1f mm  w = %.4f mm  n = %.1f\n", float64(c.Z[i])*1e3, float64(c.W[i])*1e3, c.Index[i])
	}
	for _, f := range c.Foci {
		fmt.Printf("focus at z = %.3f mm, w0 = %.2f µm\n", f.Z.Millimeters(), f.Radius.Micrometers())
	}
	// Output:
	// z =   0.0 mm  w = 1.0000 mm  n = 1.0
	// z = 100.0 mm  w = 1.0006 mm  n = 1.0
	// z = 200.0 mm  w = 0.5026 mm  n = 1.0
	// z = 299.5 mm  w = 0.0677 mm  n = 1.0
	// z = 300.0 mm  w = 0.0677 mm  n = 1.0
	// focus at z = 0.000 mm, w0 = 1000.00 µm
	// focus at z = 299.542 mm, w0 = 67.70 µm
}

func ExampleGaussian_WithM2() {
	// A diode module: 0.4 mm waist at the exit window, M² = 1.5.
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * units.Millimeter, Wavelength: 808 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	g, err = g.WithM2(1.5)
	if err != nil {
		fmt.Println(err)
		return
	}
	far := g.Transform(paraxial.Space(1*units.Meter), 1)
	fmt.Printf("zR = %.1f mm, θ = %.3f mrad, w(1 m) = %.3f mm\n",
		g.RayleighRange().Millimeters(), float64(g.HalfDivergence()/units.Milliradian), far.Radius().Millimeters())
	_, err = g.WithM2(0.8)
	fmt.Println(err)
	// Output:
	// zR = 414.7 mm, θ = 0.964 mrad, w(1 m) = 1.044 mm
	// beam: M² = 0.8: must be at least 1 and finite
}

func ExampleAtXY() {
	// A round beam through a cylindrical lens that focuses x only.
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * units.Millimeter, Wavelength: 633 * units.Nanometer})
	sys, err := paraxial.NewBuilder().
		CylindricalLens(200*units.Millimeter, paraxial.Tangential).
		Space(200 * units.Millimeter).Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := beam.AtXY(sys, in, 200*units.Millimeter)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("wx = %.1f µm, wy = %.4f mm\n", a.X.Radius().Micrometers(), a.Y.Radius().Millimeters())
	_, err = beam.At(sys, in, 200*units.Millimeter)
	fmt.Println(err)
	// Output:
	// wx = 40.3 µm, wy = 1.0008 mm
	// beam: the system acts differently in x and y here; use AtXY
}

func ExampleClipping() {
	// A 3 mm beam meets an 8 mm-diameter mirror at 45° and a 1-inch lens;
	// the mirror's round clear aperture sees a footprint stretched to
	// 3 mm/cos 45° = 4.24 mm in the plane of incidence.
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 3 * units.Millimeter, Wavelength: 1064 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().
		Space(100 * units.Millimeter).
		FlatMirror(45 * units.Degree).Label("fold mirror").Aperture(paraxial.ClearDiameter(8 * units.Millimeter)).
		Space(100 * units.Millimeter).
		ThinLens(200 * units.Millimeter).Label("L1").Aperture(paraxial.OneInchOptic()).
		Space(200 * units.Millimeter).Build()
	clips, err := beam.Clipping(sys, in, 0) // default threshold 99 %
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range clips {
		fmt.Printf("%s: %.4f %v\n", c.Name, c.Transmission, c.Low)
		if c.Low {
			fmt.Println(c.Warning())
		}
	}
	// Output:
	// FlatMirror "fold mirror" (call 2): 0.9040 true
	// FlatMirror "fold mirror" (call 2) at z = 100 mm: Ø 8 mm at 45° passes 90.40 % of the beam (wx = 3 mm, footprint 4.24 mm, wy = 3 mm), below 99.00 %
	// ThinLens "L1" (call 4): 1.0000 false
}

func ExampleCaustic_Irradiance() {
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 2 * units.Millimeter, Wavelength: 1064 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().ThinLens(100 * units.Millimeter).Space(200 * units.Millimeter).Build()
	c, err := beam.Sample(sys, in, 100)
	if err != nil {
		fmt.Println(err)
		return
	}
	ir, err := c.Irradiance(0.020) // 20 mW
	if err != nil {
		fmt.Println(err)
		return
	}
	// Irradiance is always shown with the laser-safety note: Summary
	// ends with beam.SafetyNote.
	fmt.Println(ir.Summary())
	// Output:
	// Peak irradiance 2P/(π wx wy) for P = 20 mW: highest 4.44e+07 W/m² (4.44e+03 W/cm²), at z = 99.9928 mm where w = 16.9 µm.
	//
	// Laser safety: focused beams reach hazardous irradiance at powers far below those of most laboratory lasers, and lenses and windows throw stray reflections. These numbers are beam-optics estimates, not exposure limits and not a safety clearance. Follow your local laser-safety rules and the instructions of your responsible laser safety officer, and wear the eyewear they specify.
}

func ExampleExtremes() {
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * units.Millimeter, Wavelength: 1064 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().
		Space(50 * units.Millimeter).ThinLens(50 * units.Millimeter).
		Space(200 * units.Millimeter).ThinLens(150 * units.Millimeter).
		Space(100 * units.Millimeter).Build()
	ex, err := beam.Extremes(sys, in)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("smallest %.2f µm at %.2f mm, largest %.3f mm at %.0f mm\n",
		ex.Min.Radius.Micrometers(), ex.Min.Z.Millimeters(), ex.Max.Radius.Millimeters(), ex.Max.Z.Millimeters())
	// Output:
	// smallest 33.87 µm at 100.00 mm, largest 1.500 mm at 250 mm
}

func ExampleFromProfile() {
	// A beam measured 2 m past a HeNe waist (R08): w = 0.9482416 mm on a
	// profiler, R = 2.770224 m from a wavefront sensor. The waist is found
	// behind the plane.
	g, err := beam.FromProfile(beam.ProfileSpec{Radius: 0.9482416 * units.Millimeter, WavefrontRadius: 2.770224 * units.Meter, Wavelength: 632.8 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("w0 = %.4f mm, waist %.4f m from the plane\n", g.WaistRadius().Millimeters(), g.WaistOffset().Meters())
	// Output:
	// w0 = 0.5000 mm, waist -2.0000 m from the plane
}

func ExampleAt() {
	// A 1 mm waist focused by a 200 mm lens, 100 mm after the waist; the
	// beam 150 mm after the lens (Self's formula and Kogelnik & Li's w(z),
	// R(z); the ABCD law is cross-checked with NumPy on seeded cases in
	// crosscheck_test.go).
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * units.Millimeter, Wavelength: 1064 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().
		Space(100 * units.Millimeter).ThinLens(200 * units.Millimeter).
		Space(200 * units.Millimeter).Build()
	g, err := beam.At(sys, in, 250*units.Millimeter)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("w = %.4f mm, R = %.1f mm, waist %.2f mm ahead\n",
		g.Radius().Millimeters(), g.WavefrontRadius().Millimeters(), g.WaistOffset().Millimeters())
	// Output:
	// w = 0.2569 mm, R = -53.2 mm, waist 49.54 mm ahead
}

func ExampleCircularTransmission() {
	// A round 1 mm beam and an elliptical 1 mm × 2 mm beam through a
	// 1.5 mm-radius aperture (R09; the elliptical value agrees with a
	// direct 2-D integration).
	a := 1.5 * units.Millimeter
	fmt.Printf("round %.6f, elliptical %.6f\n",
		beam.CircularTransmission(a, 1*units.Millimeter, 1*units.Millimeter),
		beam.CircularTransmission(a, 1*units.Millimeter, 2*units.Millimeter))
	// Output:
	// round 0.988891, elliptical 0.835082
}
