package optplot_test

// Examples that render figures; they print what was drawn, not optics.

import (
	"bytes"
	"fmt"
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// expanderBeam returns a 3× Kepler beam expander (f1 = 50 mm, f2 =
// 150 mm) and a 1064 nm beam with a 0.5 mm waist at its input.
func expanderBeam() (paraxial.System, beam.Gaussian, error) {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(50 * mm).ThinLens(50 * mm).Label("L1").
		Space(200 * mm).ThinLens(150 * mm).Label("L2").
		Space(150 * mm).Build()
	if err != nil {
		return paraxial.System{}, beam.Gaussian{}, err
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	return sys, in, err
}

// The expander as designed, with a what-if variant (L2 moved 10 mm
// towards L1) drawn on the same axes.
func ExampleCaustic() {
	sys, in, err := expanderBeam()
	if err != nil {
		fmt.Println(err)
		return
	}
	moved, err := sys.Move("L2", -10*units.Millimeter)
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := beam.Sample(sys, in, 300)
	if err != nil {
		fmt.Println(err)
		return
	}
	cm, err := beam.Sample(moved, in, 300)
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.Caustic(c, sys, optplot.Title("3× beam expander"),
		optplot.Label("as designed"), optplot.Also("L2 −10 mm", cm))
	if err != nil {
		fmt.Println(err)
		return
	}
	svg, err := f.SVG()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.Contains(svg, []byte(optplot.XLabel)), bytes.Contains(svg, []byte("L2 −10 mm")))
	fmt.Println(f)
	// Output:
	// true true
	// 3× beam expander. Waists: w₀ 33.9 µm at z = 100.0 mm.
}

// The on-axis peak irradiance of 20 mW through the expander: the figure
// carries the laser-safety caution, its caption the full note.
func ExampleAlongZ() {
	sys, in, err := expanderBeam()
	if err != nil {
		fmt.Println(err)
		return
	}
	c, err := beam.Sample(sys, in, 300)
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.AlongZ(c, optplot.IrradianceFor(20e-3))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f.Plot.Title.Text)
	fmt.Println(f.Plot.Y.Label.Text)
	fmt.Println(strings.HasSuffix(f.Caption, beam.SafetyNote))
	// Output:
	// On-axis peak irradiance along z, P = 20 mW
	// peak irradiance I₀ (kW/cm²)
	// true
}

// A what-if sweep drawn as a line figure: the transmission
// 1 − exp(−2a²/w²) of an iris of radius a for a 1 mm beam.
func ExampleLines() {
	var a, t []float64
	for i := range 21 {
		r := units.Length(0.1*float64(i)) * units.Millimeter
		a = append(a, r.Millimeters())
		t = append(t, 100*beam.CircularTransmission(r, units.Millimeter, units.Millimeter))
	}
	f, err := optplot.Lines("Iris transmission, w = 1 mm", "iris radius a (mm)", "transmitted power (%)",
		optplot.Series{Label: "1 − exp(−2a²/w²)", X: a, Y: t})
	if err != nil {
		fmt.Println(err)
		return
	}
	svg, err := f.SVG()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.Contains(svg, []byte("iris radius a (mm)")), f)
	_, err = optplot.Lines("bad", "x", "y", optplot.Series{X: []float64{0, 1}, Y: []float64{1}})
	fmt.Println(err)
	// Output:
	// true Iris transmission, w = 1 mm
	// optplot: Lines: series 1 Y points = 1: must equal the 2 points of X
}
