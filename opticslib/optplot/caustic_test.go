package optplot

import (
	"bytes"
	"flag"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

var update = flag.Bool("update", false, "rewrite the golden SVG files in testdata")

const mm = units.Millimeter

// expander returns a 3× Kepler beam expander with an output focusing lens
// and its sampled caustic.
func expander(t testing.TB) (beam.Caustic, paraxial.System) {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(50*mm).
		ThinLens(50*mm).Label("L1").Aperture(2*mm).
		Space(200*mm).
		ThinLens(150*mm).Label("L2").
		Space(100*mm).
		Interface(100*mm, 1.5).Space(5 * mm).PlanarInterface(1).
		Space(120 * mm).
		Build()
	if err != nil {
		t.Fatalf("Build error: %v", err)
	}
	in, err := beam.FromWaist(0.5*mm, 0, 1064*units.Nanometer, 1)
	if err != nil {
		t.Fatalf("FromWaist error: %v", err)
	}
	c, err := beam.Sample(sys, in, 400)
	if err != nil {
		t.Fatalf("Sample error: %v", err)
	}
	return c, sys
}

func render(t testing.TB) []byte {
	t.Helper()
	c, sys := expander(t)
	p, err := Caustic(c, sys, Title("3× beam expander"))
	if err != nil {
		t.Fatalf("Caustic error: %v", err)
	}
	svg, err := SVG(p, 16*vg.Centimeter, 9*vg.Centimeter)
	if err != nil {
		t.Fatalf("SVG error: %v", err)
	}
	return svg
}

func TestCausticDeterministic(t *testing.T) {
	// Golden-image practice of gonum/plot (cmpimg; bytes.Equal for SVG):
	// two renderings of the same input must be byte-identical, and equal to
	// the stored golden file.
	a := render(t)
	b := render(t)
	if !bytes.Equal(a, b) {
		t.Fatalf("two renderings differ (%d and %d bytes)", len(a), len(b))
	}
	golden := filepath.Join("testdata", "caustic_expander.svg")
	if *update {
		if err := os.WriteFile(golden, a, 0o644); err != nil {
			t.Fatalf("writing golden file: %v", err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("reading golden file (run go test -update): %v", err)
	}
	if !bytes.Equal(a, want) {
		t.Errorf("SVG differs from %s (%d vs %d bytes); inspect and run go test -update if intended", golden, len(a), len(want))
	}
}

func TestCausticContent(t *testing.T) {
	svg := string(render(t))
	for _, want := range []string{"<svg", XLabel, YLabel, "3× beam expander", "L1", "L2", "R 100 mm", "flat"} {
		if !strings.Contains(svg, want) {
			t.Errorf("SVG does not contain %q", want)
		}
	}
}

func TestCausticErrors(t *testing.T) {
	_, sys := expander(t)
	for _, test := range []struct {
		name string
		c    beam.Caustic
	}{
		{"empty", beam.Caustic{}},
		{"one point", beam.Caustic{Z: []float64{0}, W: []float64{1}}},
		{"length mismatch", beam.Caustic{Z: []float64{0, 1}, W: []float64{1}}},
		{"NaN", beam.Caustic{Z: []float64{0, 1}, W: []float64{1, math.NaN()}}},
	} {
		if _, err := Caustic(test.c, sys); err != ErrCaustic {
			t.Errorf("%s: Caustic error = %v, want ErrCaustic", test.name, err)
		}
	}
}
