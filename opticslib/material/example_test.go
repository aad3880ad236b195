package material_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/units"
)

// An N-BK7 lens for a 1064 nm laser: the absolute index that the tracer
// uses, the catalogue value relative to air, and the data-sheet nd, vd.
func Example() {
	bk7, err := material.ByName("N-BK7")
	if err != nil {
		fmt.Println(err)
		return
	}
	n, _ := bk7.Index(1064 * units.Nanometer)
	rel, _ := bk7.IndexInAir(1064 * units.Nanometer)
	nd, _ := bk7.IndexInAir(material.LineD)
	vd, _ := bk7.Abbe()
	fmt.Printf("n_abs = %.6f, n_rel = %.6f\n", n, rel)
	fmt.Printf("nd = %.5f, vd = %.2f (%v)\n", nd, vd, bk7.Basis())
	fmt.Println(bk7.CheckRange(3 * units.Micrometer))
	// Output:
	// n_abs = 1.507044, n_rel = 1.506635
	// nd = 1.51680, vd = 64.17 (relative to air (air wavelengths))
	// material: "N-BK7": air wavelength 2.9992 µm (vacuum 3 µm) outside the formula's range 300 nm – 2.5 µm (air wavelengths): the index is extrapolated
}

// Air of a warm, humid laboratory, and the air wavelength of a HeNe laser
// in it.
func ExampleAirOf() {
	lab := material.Air{Temperature: 25, Pressure: 100e3, RelativeHumidity: 0.6, CO2: 450}
	air, err := material.AirOf(lab)
	if err != nil {
		fmt.Println(err)
		return
	}
	n, _ := air.Index(632.991 * units.Nanometer)
	la, _ := material.AirWavelength(632.991*units.Nanometer, lab)
	fmt.Printf("n − 1 = %.4e, λ_air = %.4f nm\n", n-1, la.Nanometers())
	// Output:
	// n − 1 = 2.6305e-04, λ_air = 632.8245 nm
}

// Water at 20 °C and atmospheric pressure (IAPWS R9-97) against Daimon &
// Masumura's fit at the same temperature.
func ExampleWater() {
	w, _ := material.Water(20, 101325)
	d, _ := material.WaterDaimonMasumura(20)
	a, _ := w.Index(589.3 * units.Nanometer)
	b, _ := d.Index(589.3 * units.Nanometer)
	fmt.Printf("IAPWS %.5f, Daimon & Masumura %.5f\n", a, b)
	_, err := material.WaterDaimonMasumura(22)
	fmt.Println(err)
	// Output:
	// IAPWS 1.33335, Daimon & Masumura 1.33335
	// material: "water (Daimon & Masumura)": temperature t = 22 °C: the fits exist only at 19, 20, 21.5 and 24 °C: no coefficients for this state
}

// A user glass from its catalogue nd and vd, and one from Sellmeier
// coefficients.
func ExampleModelGlass() {
	g, _ := material.ModelGlass(1.6, 40)
	nd, _ := g.IndexInAir(material.LineD)
	vd, _ := g.Abbe()
	fmt.Printf("nd = %.4f, vd = %.2f\n", nd, vd)
	fmt.Println(g.CheckRange(1550*units.Nanometer) != nil)
	// Output:
	// nd = 1.6000, vd = 40.00
	// true
}
