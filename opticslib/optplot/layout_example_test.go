package optplot_test

// Example of the layout drawing; it prints what was drawn, not optics.

import (
	"bytes"
	"fmt"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleLayout() {
	const mm = units.Millimeter
	// A single plano-convex lens imaging a 3 mm object at 2× onto a
	// detector, with an iris as aperture stop.
	sys, err := paraxial.NewBuilder().
		Space(70*mm).
		Diaphragm(paraxial.ClearRadius(5*mm)).Label("iris").
		Space(5*mm).
		ThickLens(51.5*mm, paraxial.Flat, 4*mm, 1.5168).Label("PCX").Aperture(paraxial.ClearRadius(12.7 * mm)).
		Space(220 * mm).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := sys.Stops(paraxial.ObjectAt(0), paraxial.Tangential)
	if err != nil {
		fmt.Println(err)
		return
	}
	var fans []paraxial.Fan
	for _, h := range []units.Length{0, 3 * mm} {
		f, err := sys.Fan(a, paraxial.Field{Height: h}, 7, sys.Length())
		if err != nil {
			fmt.Println(err)
			return
		}
		fans = append(fans, f)
	}
	f, err := optplot.Layout(sys, fans, optplot.LayoutStops(a), optplot.LayoutTitle("2× relay"),
		optplot.LayoutSize(16*vg.Centimeter, 8*vg.Centimeter))
	if err != nil {
		fmt.Println(err)
		return
	}
	svg, err := f.SVG()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(bytes.Contains(svg, []byte(optplot.LayoutXLabel)), bytes.Contains(svg, []byte("iris")), a.Stop)
	// Output:
	// true true 1
}
