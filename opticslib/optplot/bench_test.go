package optplot

// Benchmarks only (STYLE rule 14); no values are checked here.

import (
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

var sinkSVG []byte

// BenchmarkCausticSVG builds a caustic figure with its element marks (two
// lenses with clear apertures, a tube and a tilted fold mirror, 400
// samples as the notebooks draw them) and renders it to SVG bytes: the
// plotting part of a notebook cell.
func BenchmarkCausticSVG(b *testing.B) {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(50 * mm).ThinLens(100 * mm).Label("L1").Aperture(paraxial.ClearDiameter(10 * mm)).
		Space(40 * mm).Label("tube").Aperture(paraxial.ClearRadius(4 * mm)).
		Space(30 * mm).FlatMirror(45 * units.Degree).Label("M").Aperture(paraxial.OneInchOptic()).
		Space(80 * mm).ThinLens(50 * mm).Label("L2").Aperture(paraxial.HalfInchOptic()).
		Space(120 * mm).Build()
	if err != nil {
		b.Fatal(err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		b.Fatal(err)
	}
	c, err := beam.Sample(sys, in, 400)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		f, err := Caustic(c, sys)
		if err != nil {
			b.Fatal(err)
		}
		if sinkSVG, err = f.SVG(); err != nil {
			b.Fatal(err)
		}
	}
}
