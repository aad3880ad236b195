package optplot_test

// Examples that render figures; they print sizes and labels, not optics.

import (
	"bytes"
	"fmt"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleCaustic() {
	const mm = units.Millimeter
	// A 3× Kepler beam expander (f1 = 50 mm, f2 = 150 mm).
	sys, err := paraxial.NewBuilder().
		Space(50 * mm).ThinLens(50 * mm).Label("L1").
		Space(200 * mm).ThinLens(150 * mm).Label("L2").
		Space(150 * mm).Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	c, err := beam.Sample(sys, in, 300)
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := optplot.Caustic(c, sys, optplot.Title("3× beam expander"))
	if err != nil {
		fmt.Println(err)
		return
	}
	svg, err := optplot.SVG(p, 16*vg.Centimeter, 9*vg.Centimeter)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.Contains(svg, []byte(optplot.XLabel)), bytes.Contains(svg, []byte("L2")))
	// Output:
	// true true
}
