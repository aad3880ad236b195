package optplot

// Tests of the figure value, its rendering and files, the tick labels,
// AlongZ, Also and Lines. They check drawing and validation, not optics;
// the numbers drawn are tested in package beam.

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/units"
)

// whatIf returns the expander's caustic and that of the variant with L2
// moved 10 mm towards L1.
func whatIf(t testing.TB) (beam.Caustic, beam.Caustic, paraxial.System) {
	t.Helper()
	c, sys := expander(t)
	moved, err := sys.Move("L2", -10*mm)
	if err != nil {
		t.Fatalf("Move: %v", err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	cm, err := beam.Sample(moved, in, 400)
	if err != nil {
		t.Fatalf("Sample: %v", err)
	}
	return c, cm, sys
}

func TestFigureDefaults(t *testing.T) {
	c, sys := expander(t)
	f, err := Caustic(c, sys, Title("T"))
	if err != nil {
		t.Fatal(err)
	}
	if f.Width != 16*vg.Centimeter || f.Height != 9*vg.Centimeter {
		t.Errorf("size = %v × %v, want 16 cm × 9 cm", f.Width, f.Height)
	}
	if !strings.HasPrefix(f.String(), "T") {
		t.Errorf("String() = %q, want the title first", f.String())
	}
	f, err = Caustic(c, sys, Size(10*vg.Centimeter, 5*vg.Centimeter), Caption("my caption"))
	if err != nil {
		t.Fatal(err)
	}
	if f.Width != 10*vg.Centimeter || f.Height != 5*vg.Centimeter || f.String() != "my caption" {
		t.Errorf("Size/Caption: got %v × %v, %q", f.Width, f.Height, f.String())
	}
	// A hand-made figure: zero size means the default, empty caption the
	// title.
	hand := Figure{Plot: f.Plot}
	if _, err := hand.SVG(); err != nil {
		t.Errorf("Figure{Plot}.SVG() error: %v", err)
	}
	if hand.String() != f.Plot.Title.Text {
		t.Errorf("Figure{Plot}.String() = %q, want the title", hand.String())
	}
	for _, bad := range []Figure{{}, {Plot: f.Plot, Width: -1}, {Plot: f.Plot, Height: vg.Length(math.Inf(1))}} {
		if _, err := bad.SVG(); !errors.Is(err, ErrFigure) {
			t.Errorf("SVG of %+v: error = %v, want ErrFigure", bad, err)
		}
	}
}

func TestDeterministic(t *testing.T) {
	// Same input, built twice, gives the same bytes (STYLE rule 13).
	c, cm, sys := whatIf(t)
	for _, build := range []func() (Figure, error){
		func() (Figure, error) { return Caustic(c, sys, Also("moved", cm), Label("design")) },
		func() (Figure, error) { return AlongZ(c, IrradianceFor(0.02), Also("moved", cm)) },
		func() (Figure, error) {
			return Lines("s", "x (mm)", "y (mm)", Series{Label: "a", X: []float64{0, 1, 2}, Y: []float64{1, 1.05, 1.1}, Low: []float64{0.9, 1, 1}, High: []float64{1.1, 1.1, 1.2}})
		},
	} {
		f1, err := build()
		if err != nil {
			t.Fatal(err)
		}
		f2, err := build()
		if err != nil {
			t.Fatal(err)
		}
		a, b := mustSVG(t, f1), mustSVG(t, f2)
		if !bytes.Equal(a, b) || !bytes.Equal(a, mustSVG(t, f1)) {
			t.Errorf("%q: renderings differ", f1.Plot.Title.Text)
		}
	}
}

func TestSave(t *testing.T) {
	c, sys := expander(t)
	f, err := Caustic(c, sys)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	// Magic bytes: SVG starts with the XML declaration, PNG with
	// \x89PNG\r\n\x1a\n (PNG spec §5.2), PDF with %PDF- (ISO 32000-1 §7.5.2).
	for _, test := range []struct{ name, magic string }{
		{"a.svg", "<?xml"}, {"b.PNG", "\x89PNG\r\n\x1a\n"}, {"c.pdf", "%PDF-"},
	} {
		path := filepath.Join(dir, test.name)
		if err := f.Save(path); err != nil {
			t.Errorf("Save(%s) error: %v", test.name, err)
			continue
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Errorf("reading %s: %v", test.name, err)
			continue
		}
		if len(b) < 1000 || !bytes.HasPrefix(b, []byte(test.magic)) {
			t.Errorf("%s: %d bytes starting %q, want more than 1000 starting %q", test.name, len(b), b[:min(len(b), 8)], test.magic)
		}
	}
	svg, _ := os.ReadFile(filepath.Join(dir, "a.svg"))
	if !bytes.Equal(svg, mustSVG(t, f)) {
		t.Errorf("saved SVG differs from Figure.SVG")
	}
	err = f.Save(filepath.Join(dir, "d.jpg"))
	if !errors.Is(err, ErrFigure) || !strings.Contains(err.Error(), ".jpg") {
		t.Errorf("Save(.jpg) error = %v, want ErrFigure naming .jpg", err)
	}
	// No temporary file is left behind.
	entries, _ := os.ReadDir(dir)
	if len(entries) != 3 {
		t.Errorf("directory holds %d files, want the 3 figures", len(entries))
	}
}

func TestOptionErrors(t *testing.T) {
	c, sys := expander(t)
	for _, test := range []struct {
		name string
		opt  Option
		want string // in the message: the parameter and value with its unit
	}{
		{"MinTransmission", MinTransmission(1.5), "transmitted fraction t = 1.5"},
		{"Size", Size(0, 9*vg.Centimeter), "width = 0 cm"},
		{"Size height", Size(9*vg.Centimeter, vg.Length(math.NaN())), "height = NaN cm"},
		{"ZRange", ZRange(300*mm, 100*mm), "range z0 … z1 = 300 mm … 100 mm"},
		{"Zoom", Zoom(100*mm, -1*mm), "half width = -1 mm"},
		{"Zoom centre", Zoom(units.Length(math.Inf(1)), 1*mm), "centre z"},
		{"ZRange outside", ZRange(2, 3), "range shown"},
		{"Also", Also("bad", beam.Caustic{Z: []units.Length{0}}), `Also: caustic 1 "bad".Z samples = 1`},
	} {
		_, err := Caustic(c, sys, test.opt)
		if !errors.Is(err, ErrOption) && !errors.Is(err, ErrCaustic) {
			t.Errorf("%s: error = %v, want ErrOption or ErrCaustic", test.name, err)
			continue
		}
		if !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: error %q does not contain %q", test.name, err, test.want)
		}
	}
	if _, err := AlongZ(c, IrradianceFor(-1)); !errors.Is(err, ErrOption) || !strings.Contains(err.Error(), "power P = -1 W") {
		t.Errorf("IrradianceFor(-1): error = %v, want ErrOption naming the power in W", err)
	}
	if _, err := Layout(sys, nil, LayoutSize(-1, 1)); !errors.Is(err, ErrLayout) {
		t.Errorf("LayoutSize(-1, 1): error = %v, want ErrLayout", err)
	}
}

func TestTickLabelsDiffer(t *testing.T) {
	// Adjacent labels must differ and show the step's digits: a range
	// with ticks 1.00, 1.05, 1.10 must not print "1.1" twice (the case of
	// the issue), nor any two equal labels on any range.
	labels := func(lo, hi float64, n int) []string {
		var out []string
		for _, tk := range (niceTicks{target: n}).Ticks(lo, hi) {
			if tk.Label != "" {
				out = append(out, tk.Label)
			}
		}
		return out
	}
	got := strings.Join(labels(0.97, 1.13, 5), " ")
	if got != "1.00 1.05 1.10" {
		t.Errorf("labels(0.97, 1.13) = %q, want \"1.00 1.05 1.10\"", got)
	}
	for _, r := range [][2]float64{{0.98, 1.12}, {-2.6, 2.6}, {98, 102}, {0, 475}, {1e-6, 3e-6}, {1e7, 1.0001e7}, {-0.055, 0.055}, {0.999, 1.001}, {-15, 386}, {3e9, 7e9}} {
		for _, n := range []int{5, 6} {
			ls := labels(r[0], r[1], n)
			if len(ls) < 2 {
				t.Errorf("labels(%g, %g, %d) = %q: fewer than 2", r[0], r[1], n, ls)
			}
			for i := 1; i < len(ls); i++ {
				if ls[i] == ls[i-1] {
					t.Errorf("labels(%g, %g, %d) = %q: %q twice", r[0], r[1], n, ls, ls[i])
				}
			}
		}
	}
}

func TestAlongZQuantities(t *testing.T) {
	c, sys := expander(t)
	_ = sys
	// An astigmatic caustic for the x/y lines: the cylinder case.
	cyl := astigmaticCaustic(t)
	for _, test := range []struct {
		q      Quantity
		c      beam.Caustic
		yLabel string
		want   []string
	}{
		{BeamRadius, c, "beam radius w (mm)", nil},
		{BeamRadius, cyl, "beam radius w (mm)", []string{"x (tangential)", "y (sagittal)"}},
		{WavefrontCurvature, c, "wavefront curvature 1/R (1/m)", []string{"1/R is 0 at a waist"}},
		{Ellipticity, cyl, "ellipticity wy/wx", nil},
		{IrradianceFor(0.02), c, "peak irradiance I₀ (kW/cm²)", []string{"Laser safety", "laser-safety rules", "Highest"}},
		{GouyPhase, cyl, "Gouy phase ψ (rad)", []string{"y (sagittal)"}},
	} {
		f, err := AlongZ(test.c, test.q)
		if err != nil {
			t.Errorf("AlongZ(%v) error: %v", test.q, err)
			continue
		}
		svg := string(mustSVG(t, f))
		for _, w := range append([]string{test.yLabel, XLabel}, test.want...) {
			if !strings.Contains(svg, w) {
				t.Errorf("AlongZ(%v): SVG does not contain %q", test.q, w)
			}
		}
		if test.q.kind == qIrradiance && !strings.Contains(f.Caption, beam.SafetyNote) {
			t.Errorf("AlongZ(irradiance) caption lacks beam.SafetyNote: %q", f.Caption)
		}
		if f.Plot.Y.Min >= f.Plot.Y.Max || !finite(f.Plot.Y.Min) || !finite(f.Plot.Y.Max) {
			t.Errorf("AlongZ(%v): y range %g … %g", test.q, f.Plot.Y.Min, f.Plot.Y.Max)
		}
	}
	// A user caption on an irradiance figure still carries the note.
	f, err := AlongZ(c, IrradianceFor(0.02), Caption("mine"))
	if err != nil || !strings.HasPrefix(f.Caption, "mine") || !strings.Contains(f.Caption, beam.SafetyNote) {
		t.Errorf("AlongZ(irradiance, Caption) = %q, %v; want the caption and the safety note", f.Caption, err)
	}
	// A hand-made caustic has no curvatures: the error names them.
	hand := beam.Caustic{Z: []units.Length{0, 1}, W: []units.Length{1e-3, 2e-3}}
	if _, err := AlongZ(hand, WavefrontCurvature); !errors.Is(err, ErrCaustic) || !strings.Contains(err.Error(), "Curvature") {
		t.Errorf("AlongZ(hand-made, curvature) error = %v, want ErrCaustic naming Curvature", err)
	}
	if _, err := AlongZ(hand, BeamRadius); err != nil {
		t.Errorf("AlongZ(hand-made, radius) error: %v", err)
	}
}

func TestAlsoTwoCaustics(t *testing.T) {
	c, cm, sys := whatIf(t)
	f, err := Caustic(c, sys, Label("as designed"), Also("L2 −10 mm", cm), Also("again", cm))
	if err != nil {
		t.Fatal(err)
	}
	svg := string(mustSVG(t, f))
	for _, w := range []string{"as designed", "L2 −10 mm", "again", "stroke:#B07A3A", "stroke:#78608C"} {
		if !strings.Contains(svg, w) {
			t.Errorf("Caustic with Also: SVG does not contain %q", w)
		}
	}
	f, err = AlongZ(c, BeamRadius, Also("L2 −10 mm", cm))
	if err != nil {
		t.Fatal(err)
	}
	if svg := string(mustSVG(t, f)); !strings.Contains(svg, "L2 −10 mm") || !strings.Contains(svg, ">beam<") {
		t.Errorf("AlongZ with Also: key entries missing")
	}
}

func TestZoom(t *testing.T) {
	// A zoom of ±2 mm on the 33.9 µm waist at 100 mm: the y range is
	// fitted to the beam there (well below the 1.5 mm of the full plot)
	// and the waist is drawn from the closed form, not 3 samples.
	c, sys := expander(t)
	f, err := Caustic(c, sys, Zoom(100*mm, 2*mm))
	if err != nil {
		t.Fatal(err)
	}
	if f.Plot.X.Min != 98 || math.Abs(f.Plot.X.Max-102) > 1e-9 {
		t.Errorf("x range = %g … %g mm, want 98 … 102", f.Plot.X.Min, f.Plot.X.Max)
	}
	if f.Plot.Y.Max > 0.1 || f.Plot.Y.Max < 0.0339 {
		t.Errorf("y max = %g mm, want between the waist 0.0339 mm and 0.1 mm", f.Plot.Y.Max)
	}
	env := sampleEnvelope(c, 98, 102, false)
	if len(env.z) < minShown {
		t.Errorf("zoom has %d points, want at least %d", len(env.z), minShown)
	}
	// w(z) = w0 √(1 + ((z − z0)/zR)²) (Kogelnik & Li 1966) at every drawn
	// point; the quadratic of w² is exact in free space, so rel 1e-6
	// covers rounding only.
	var fc beam.Focus
	for _, f := range c.Foci {
		if math.Abs(f.Z.Millimeters()-100) < 1 {
			fc = f
		}
	}
	w0, z0, zr := fc.Radius.Millimeters(), fc.Z.Millimeters(), fc.RayleighRange.Millimeters()
	for i, z := range env.z {
		want := w0 * math.Sqrt(1+math.Pow((z-z0)/zr, 2))
		if math.Abs(env.wx[i]-want) > 1e-6*want {
			t.Errorf("w(%g mm) = %.9g mm, want %.9g", z, env.wx[i], want)
			break
		}
	}
	if !strings.Contains(string(mustSVG(t, f)), "w₀ 33.9 µm @ 100.00 mm") {
		t.Errorf("zoom lacks the waist note with two decimals")
	}
}

// causticOf draws the caustic of a 0.5 mm, 633 nm beam waisted at the
// input of sys, sampled at 100 planes.
func causticOf(t *testing.T, sys paraxial.System) Figure {
	t.Helper()
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 633 * units.Nanometer})
	c, err := beam.Sample(sys, in, 100)
	if err != nil {
		t.Fatal(err)
	}
	f, err := Caustic(c, sys)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestOmittedStopNoted(t *testing.T) {
	// A 25.4 mm optic around a 1 mm beam is not drawn, but listed.
	sys, err := paraxial.NewBuilder().Space(20 * mm).ThinLens(100 * mm).Label("L1").Aperture(paraxial.ClearDiameter(25.4 * mm)).
		Space(100 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	f := causticOf(t, sys)
	if svg := string(mustSVG(t, f)); !strings.Contains(svg, "beyond twice the largest beam radius") || !strings.Contains(svg, "L1 Ø 25.4 mm") {
		t.Errorf("the omitted stop of L1 is not noted")
	}
}

func TestCylindricalMark(t *testing.T) {
	// A cylindrical lens carries the letter of its power plane and, when
	// unlabelled, "fy" and its focal length.
	sys, err := paraxial.NewBuilder().Space(20*mm).CylindricalLens(-50*mm, paraxial.Sagittal).Space(50 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	f := causticOf(t, sys)
	svg := string(mustSVG(t, f))
	if !strings.Contains(svg, "fy -50 mm") || !strings.Contains(svg, ">y</text>") {
		t.Errorf("cylindrical lens mark lacks its label or plane letter")
	}
}

func TestLinesValidation(t *testing.T) {
	ok := []float64{0, 1, 2}
	for _, test := range []struct {
		name string
		s    []Series
		want string
	}{
		{"none", nil, "series = 0"},
		{"one point", []Series{{X: []float64{1}, Y: []float64{1}}}, "X points = 1"},
		{"lengths", []Series{{Label: "a", X: ok, Y: []float64{1, 2}}}, `series 1 "a" Y points = 2`},
		{"NaN", []Series{{X: ok, Y: []float64{1, math.NaN(), 2}}}, "Y[1] = NaN"},
		{"Inf X", []Series{{X: []float64{0, math.Inf(1), 2}, Y: ok}}, "X[1] = +Inf"},
		{"band half", []Series{{X: ok, Y: ok, Low: ok}}, "needs both Low and High"},
		{"band order", []Series{{X: ok, Y: ok, Low: []float64{0, 2, 2}, High: []float64{1, 1, 3}}}, "Low ≤ High"},
		{"second", []Series{{X: ok, Y: ok}, {X: ok, Y: ok[:1]}}, "series 2"},
	} {
		_, err := Lines("t", "x", "y", test.s...)
		if !errors.Is(err, ErrSeries) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: Lines error = %v, want ErrSeries containing %q", test.name, err, test.want)
		}
	}
	f, err := Lines("sweep", "lens spacing d (mm)", "waist w₀ (µm)",
		Series{Label: "f = 100 mm", X: ok, Y: []float64{1, 1.05, 1.1}, Low: []float64{0.95, 1, 1.05}, High: []float64{1.05, 1.1, 1.15}},
		Series{Label: "f = 150 mm", X: ok, Y: []float64{1.2, 1.1, 1.0}})
	if err != nil {
		t.Fatal(err)
	}
	svg := string(mustSVG(t, f))
	for _, w := range []string{"sweep", "lens spacing d (mm)", "f = 100 mm", "f = 150 mm"} {
		if !strings.Contains(svg, w) {
			t.Errorf("Lines SVG does not contain %q", w)
		}
	}
}

// A what-if study becomes a line figure in one call; quantities with
// different units are refused (they cannot share an axis).
func TestSweepFigure(t *testing.T) {
	build := func(d units.Length) (paraxial.System, error) {
		return paraxial.NewBuilder().Space(d).ThinLens(100 * units.Millimeter).Space(300 * units.Millimeter).Build()
	}
	r, err := sweep.Over("object distance", []units.Length{150 * units.Millimeter, 200 * units.Millimeter, 300 * units.Millimeter}, build,
		sweep.ImageZ(0), sweep.Magnification(0))
	if err != nil {
		t.Fatal(err)
	}
	f, err := Sweep(r, "image z")
	if err != nil {
		t.Fatal(err)
	}
	svg, err := f.SVG()
	if err != nil || !strings.Contains(string(svg), "object distance (mm)") {
		t.Errorf("Sweep figure: err %v, axis label missing", err)
	}
	if _, err := Sweep(r, "image z", "magnification"); err == nil || !strings.Contains(err.Error(), "another unit") {
		t.Errorf("Sweep with mixed units: error = %v", err)
	}
	if _, err := Sweep(r, "nothing"); err == nil || !strings.Contains(err.Error(), `no quantity "nothing"`) {
		t.Errorf("Sweep of an unknown quantity: error = %v", err)
	}
}
