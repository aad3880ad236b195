package optplot_test

import (
	"bytes"
	"testing"

	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// TestSpotDiagram checks that a spot renders, twice to the same bytes, and
// that an empty spot is refused.
func TestSpotDiagram(t *testing.T) {
	s := trace.Spot{Wavelength: 633 * units.Nanometer, Plane: 0.1, X: []float64{0, 1e-6, -2e-6}, Y: []float64{0, 2e-6, 1e-6},
		RMS: 1.5 * units.Micrometer, Geometric: 2.3 * units.Micrometer, Airy: 3 * units.Micrometer}
	f, err := optplot.SpotDiagram([]trace.Spot{s, s})
	if err != nil {
		t.Fatal(err)
	}
	a, err := f.SVG()
	if err != nil {
		t.Fatal(err)
	}
	b, _ := f.SVG()
	if !bytes.Equal(a, b) || len(a) < 1000 {
		t.Errorf("SVG not deterministic or empty (%d bytes)", len(a))
	}
	if _, err := optplot.SpotDiagram([]trace.Spot{{}}); err == nil {
		t.Error("empty spot: no error")
	}
}
