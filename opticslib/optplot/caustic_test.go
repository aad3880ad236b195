package optplot

// Rendering tests: byte-identical SVG for the same input (golden files,
// STYLE rule 13), labels and marks present, bad input rejected. They check
// drawing, not optics; the numbers drawn are tested in package beam against
// Kogelnik & Li (1966) and Self (1983).

import (
	"bytes"
	"errors"
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
		ThinLens(50*mm).Label("L1").Aperture(paraxial.ClearRadius(2*mm)).
		Space(200*mm).
		ThinLens(150*mm).Label("L2").
		Space(100*mm).
		Interface(100*mm, 1.5).Space(5 * mm).PlanarInterface(1).
		Space(120 * mm).
		Build()
	if err != nil {
		t.Fatalf("Build error: %v", err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
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
	f, err := Caustic(c, sys, Title("3× beam expander"))
	if err != nil {
		t.Fatalf("Caustic error: %v", err)
	}
	return mustSVG(t, f)
}

// mustSVG renders f with [Figure.SVG] and fails the test on error.
func mustSVG(t testing.TB, f Figure) []byte {
	t.Helper()
	svg, err := f.SVG()
	if err != nil {
		t.Fatalf("SVG error: %v", err)
	}
	return svg
}

// astigmatic returns a round beam through a cylindrical lens with a
// too-small clear aperture and a spherical lens, rendered with a ray fan.
func astigmatic(t testing.TB) []byte {
	t.Helper()
	c, sys := astigmaticCase(t)
	f, err := Caustic(c, sys, Title("cylinder then lens"),
		Rays(paraxial.Ray{Y: 0.8 * mm}, paraxial.Ray{Y: -0.8 * mm}, paraxial.Ray{Theta: 0.004}))
	if err != nil {
		t.Fatalf("Caustic error: %v", err)
	}
	return mustSVG(t, f)
}

// astigmaticCaustic returns the caustic of [astigmatic].
func astigmaticCaustic(t testing.TB) beam.Caustic {
	c, _ := astigmaticCase(t)
	return c
}

func astigmaticCase(t testing.TB) (beam.Caustic, paraxial.System) {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(30*mm).CylindricalLens(60*mm, paraxial.Tangential).Label("CX").Aperture(paraxial.ClearRadius(1.2 * mm)).
		Space(60 * mm).ThinLens(40 * mm).Label("L1").Aperture(paraxial.ClearRadius(3 * mm)).
		Space(150 * mm).Build()
	if err != nil {
		t.Fatalf("Build error: %v", err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * mm, Wavelength: 780 * units.Nanometer})
	if err != nil {
		t.Fatalf("FromWaist error: %v", err)
	}
	c, err := beam.Sample(sys, in, 600)
	if err != nil {
		t.Fatalf("Sample error: %v", err)
	}
	return c, sys
}

func TestGoldenSVG(t *testing.T) {
	// Golden-image practice of gonum/plot (cmpimg; bytes.Equal for SVG):
	// two renderings of the same input must be byte-identical, and equal to
	// the stored golden file.
	for _, test := range []struct {
		name   string
		render func(testing.TB) []byte
	}{
		{"caustic_expander.svg", render},
		{"caustic_astigmatic.svg", astigmatic},
		{"layout_relay.svg", relayLayout},
		{"caustic_also.svg", alsoGolden},
		{"alongz_irradiance.svg", irradianceGolden},
	} {
		checkGolden(t, test.name, test.render)
	}
}

// checkGolden renders twice, wants identical bytes, and compares them
// with the golden file testdata/name (rewritten with -update).
func checkGolden(t *testing.T, name string, render func(testing.TB) []byte) {
	t.Helper()
	a := render(t)
	b := render(t)
	if !bytes.Equal(a, b) {
		t.Errorf("%s: two renderings differ (%d and %d bytes)", name, len(a), len(b))
		return
	}
	golden := filepath.Join("testdata", name)
	if *update {
		if err := os.WriteFile(golden, a, 0o644); err != nil {
			t.Fatalf("writing golden file: %v", err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Errorf("reading golden file (run go test -update): %v", err)
		return
	}
	if !bytes.Equal(a, want) {
		t.Errorf("SVG differs from %s (%d vs %d bytes); inspect and run go test -update if intended", golden, len(a), len(want))
	}
}

func TestCausticAstigmaticContent(t *testing.T) {
	// The y envelope, legend, waist notes of both planes, the clipping
	// warning (CX passes 94.4 %: 1 − exp(−2·1.2²/1²), R09 closed form)
	// and the ray key must be present.
	svg := string(astigmatic(t))
	for _, want := range []string{"x (tangential)", "y (sagittal)", "paraxial rays (x)", "x w₀ 14.9 µm @ 90.0 mm", "y w₀ 9.93 µm @ 130.0 mm", "CX · passes 94.4 %"} {
		if !strings.Contains(svg, want) {
			t.Errorf("SVG does not contain %q", want)
		}
	}
}

func TestCausticOptions(t *testing.T) {
	c, sys := expander(t)
	for _, bad := range []float64{0, -1, 1.5} {
		if _, err := Caustic(c, sys, MinTransmission(bad)); !errors.Is(err, ErrOption) {
			t.Errorf("MinTransmission(%g): error = %v, want ErrOption", bad, err)
		}
	}
	// A threshold of 100 % flags every aperture (T < 1 for a finite stop).
	f, err := Caustic(c, sys, MinTransmission(1), WaistNotes(false), ElementLabels(true))
	if err != nil {
		t.Fatalf("Caustic error: %v", err)
	}
	svg := mustSVG(t, f)
	if s := string(svg); !strings.Contains(s, "L1 · passes") || strings.Contains(s, "w₀") {
		t.Errorf("with MinTransmission(1) and no waist notes the SVG should flag L1 and show no w₀ note")
	}
}

func TestCausticContent(t *testing.T) {
	svg := string(render(t))
	for _, want := range []string{"<svg", XLabel, YLabel, "3× beam expander", "L1", "L2", "R 100 mm", "flat", "w₀ 33.9 µm @ 100.0 mm"} {
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
		{"one point", beam.Caustic{Z: []units.Length{0}, W: []units.Length{1}}},
		{"length mismatch", beam.Caustic{Z: []units.Length{0, 1}, W: []units.Length{1}}},
		{"NaN", beam.Caustic{Z: []units.Length{0, 1}, W: []units.Length{1, units.Length(math.NaN())}}},
		{"WY length", beam.Caustic{Z: []units.Length{0, 1}, W: []units.Length{1, 1}, WY: []units.Length{1}}},
		{"WY Inf", beam.Caustic{Z: []units.Length{0, 1}, W: []units.Length{1, 1}, WY: []units.Length{1, units.Length(math.Inf(1))}}},
	} {
		if _, err := Caustic(test.c, sys); !errors.Is(err, ErrCaustic) {
			t.Errorf("%s: Caustic error = %v, want ErrCaustic", test.name, err)
		}
	}
}

func TestBelow(t *testing.T) {
	// A clipping label must never read as the threshold or more: one
	// decimal unless that rounds up to the threshold (rounding rule of
	// strconv 'f' formatting; the cases are chosen by hand).
	for _, test := range []struct {
		t, threshold float64
		want         string
	}{
		{0.944, 0.99, "94.4 %"},
		{0.98996, 0.99, "98.996 %"},
		{0.98951, 0.99, "98.95 %"},
		{0.999949, 0.99995, "99.99 %"},
		{0.5, 1, "50.0 %"},
	} {
		if got := below(test.t, test.threshold); got != test.want {
			t.Errorf("below(%g, %g) = %q, want %q", test.t, test.threshold, got, test.want)
		}
	}
}

func TestEmptyPlotterRanges(t *testing.T) {
	// Plotters without data report a finite unit range, never ±Inf
	// (gonum/plot rejects non-finite axis ranges).
	for _, test := range []struct {
		name string
		r    interface {
			DataRange() (float64, float64, float64, float64)
		}
	}{
		{"Marks", &Marks{}},
		{"waistNotes", &waistNotes{}},
		{"FanLines", &FanLines{}},
	} {
		a, b, c, d := test.r.DataRange()
		if !finite(a) || !finite(b) || !finite(c) || !finite(d) || !(a < b && c < d) {
			t.Errorf("%s DataRange() = %g, %g, %g, %g; want a finite non-empty range", test.name, a, b, c, d)
		}
	}
}

// The marks show tubes (apertures on spaces) and the projected opening of
// a tilted part (a·cos θ in x, analytic geometry), and flag what clips:
// a 1 mm tube around a 1 mm beam passes 86 % (R09 closed form).
func TestMarksTubesAndTilt(t *testing.T) {
	sys, err := paraxial.NewBuilder().Space(10 * mm).Space(40 * mm).Label("tube").Aperture(paraxial.ClearRadius(1 * mm)).
		Space(10 * mm).FlatMirror(60 * units.Degree).Label("M").Aperture(paraxial.ClearRadius(4 * mm)).Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewMarks(sys, 1)
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Tubes) != 1 || m.Tubes[0].Z0 != 10 || m.Tubes[0].Z1 != 50 || m.Tubes[0].High != 1 {
		t.Errorf("tubes = %+v, want one from 10 to 50 mm at ±1 mm", m.Tubes)
	}
	if len(m.Marks) != 1 || !m.Marks[0].Stop || math.Abs(m.Marks[0].High-2) > 1e-12 || math.Abs(m.Marks[0].Low+2) > 1e-12 {
		t.Errorf("mirror mark = %+v, want a stop at ±4 mm·cos 60° = ±2 mm", m.Marks)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	c, err := beam.Sample(sys, in, 50)
	if err != nil {
		t.Fatal(err)
	}
	f, err := Caustic(c, sys, Size(12*vg.Centimeter, 6*vg.Centimeter))
	if err != nil {
		t.Fatal(err)
	}
	svg := mustSVG(t, f)
	// The clipping tube is drawn in the warning colour (#D23C1E).
	if !strings.Contains(string(svg), "stroke:#D23C1E") {
		t.Errorf("caustic of a clipping tube has no stroke in the warning colour")
	}
}

// alsoGolden renders the expander with its what-if variant (L2 moved
// 10 mm towards L1).
func alsoGolden(t testing.TB) []byte {
	t.Helper()
	c, cm, sys := whatIf(t)
	f, err := Caustic(c, sys, Title("3× expander, what if L2 moves"), Label("as designed"), Also("L2 −10 mm", cm))
	if err != nil {
		t.Fatalf("Caustic error: %v", err)
	}
	return mustSVG(t, f)
}

// irradianceGolden renders the on-axis peak irradiance of 20 mW through
// the expander.
func irradianceGolden(t testing.TB) []byte {
	t.Helper()
	c, _ := expander(t)
	f, err := AlongZ(c, IrradianceFor(20e-3))
	if err != nil {
		t.Fatalf("AlongZ error: %v", err)
	}
	return mustSVG(t, f)
}
