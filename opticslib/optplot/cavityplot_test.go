package optplot

// Tests of the cavity figures: they build, render byte-identical SVG,
// carry their labels and captions, and refuse cavities they cannot draw.
// The numbers drawn come from package cavity, which tests them against
// Kogelnik & Li (1966) and the Airy function; the demo cavities are
// invented.

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// demoCavity is a 1064 nm plano-concave cavity: a flat mirror and a
// 500 mm concave one, 100 mm apart, both 99.9 % (g1 = 1, g2 = 0.8).
func demoCavity(t testing.TB) cavity.Cavity {
	t.Helper()
	c, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Label: "M1", Reflectivity: 0.999},
		M2:         cavity.Mirror{Label: "M2", Shape: cavity.Concave, Radius: 500 * mm, Reflectivity: 0.999},
		Spacing:    100 * mm,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// demoRing is a bow-tie ring: two 100 mm concave mirrors 105 mm apart met
// at 8°, two flat mirrors closing a 1.2 m arm (astigmatic).
func demoRing(t testing.TB) cavity.Cavity {
	t.Helper()
	th := 8 * units.Degree
	loop, err := paraxial.NewBuilder().
		ConcaveMirror(100*mm, th).Label("C1").Space(105*mm).
		ConcaveMirror(100*mm, th).Label("C2").Space(300 * mm).
		FlatMirror(th).Label("F1").Space(600 * mm).
		FlatMirror(th).Label("F2").Space(300 * mm).
		Build()
	if err != nil {
		t.Fatal(err)
	}
	c, err := cavity.Ring(cavity.RingSpec{
		Loop:         loop,
		Reflectivity: map[string]float64{"C1": 0.9995, "C2": 0.9995, "F1": 0.9995, "F2": 0.992},
		Wavelength:   1064 * units.Nanometer,
	})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// demoFolded is a linear cavity folded by a 200 mm concave mirror at 12°
// (x and y differ): flat end mirror, 150 mm, the fold, 175 mm, a flat
// output coupler.
func demoFolded(t testing.TB) cavity.Cavity {
	t.Helper()
	path, err := paraxial.NewBuilder().Space(150*mm).ConcaveMirror(200*mm, 12*units.Degree).Label("fold").Space(175 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	c, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Label: "HR", Reflectivity: 0.9999},
		M2:         cavity.Mirror{Label: "OC", Reflectivity: 0.98},
		Path:       path,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// figureCase is one figure of a table test: how to make it, what its SVG
// and its caption must contain.
type figureCase struct {
	name        string
	make        func() (Figure, error)
	svg, prefix []string // in the SVG; at the start of the caption
	caption     []string // in the caption
}

// checkFigures builds each figure twice, wants byte-identical SVG from
// two renderings and from the two builds (STYLE rule 13), and the texts.
// With BEAMNOTE_FIGURES set it saves each figure there as PNG, to look at.
func checkFigures(t *testing.T, cases []figureCase) {
	t.Helper()
	for _, test := range cases {
		f, err := test.make()
		if err != nil {
			t.Errorf("%s: error %v", test.name, err)
			continue
		}
		a, b := mustSVG(t, f), mustSVG(t, f)
		g, err := test.make()
		if err != nil {
			t.Errorf("%s: second build error %v", test.name, err)
			continue
		}
		if c := mustSVG(t, g); !bytes.Equal(a, b) || !bytes.Equal(a, c) {
			t.Errorf("%s: renderings differ (%d, %d, %d bytes)", test.name, len(a), len(b), len(c))
		}
		for _, w := range test.svg {
			if !bytes.Contains(a, []byte(w)) {
				t.Errorf("%s: SVG does not contain %q", test.name, w)
			}
		}
		for _, w := range test.prefix {
			if !strings.HasPrefix(f.Caption, w) {
				t.Errorf("%s: caption %q does not start with %q", test.name, f.Caption, w)
			}
		}
		for _, w := range test.caption {
			if !strings.Contains(f.Caption, w) {
				t.Errorf("%s: caption %q does not contain %q", test.name, f.Caption, w)
			}
		}
		if dir := os.Getenv("BEAMNOTE_FIGURES"); dir != "" {
			if err := f.Save(filepath.Join(dir, strings.ReplaceAll(test.name, " ", "_")+".png")); err != nil {
				t.Error(err)
			}
		}
	}
}

// TestCavityFigures: the stability diagram marks the design (g1 = 1,
// g2 = 1 − d/R = 0.8 for the plano-concave cavity, both planes for the
// folded one, the equivalent symmetric cavity for the ring); the
// transmission labels the modes (the round cavity's orders coincide; the
// ring's TEM13 lies 5.8 linewidths below TEM00 and is flagged) and gives
// FSR = c/2d = 1.499 GHz and the linewidth; the caustic notes the waist
// on the flat mirror, w0² = (λ/π)√(d(R − d)) = (260 µm)² (Kogelnik & Li
// 1966, the numbers of package cavity's example).
func TestCavityFigures(t *testing.T) {
	lin, ring, fold := demoCavity(t), demoRing(t), demoFolded(t)
	checkFigures(t, []figureCase{
		{name: "Stability linear", make: func() (Figure, error) { return Stability(lin) },
			svg:     []string{"planar", "confocal", "concentric", ">design<", "design: g1 = 1.000, g2 = 0.800, stable"},
			prefix:  []string{"Stability diagram: the g1–g2 plane of the linear cavity"},
			caption: []string{"Design: g1 = 1.000, g2 = 0.800 (g1·g2 = 0.800), stable."}},
		{name: "Stability folded", make: func() (Figure, error) { return Stability(fold, Title("Folded laser")) },
			svg:     []string{"Folded laser", ">x<", ">y<", "x: g1 = ", "y: g1 = "},
			caption: []string{"equivalent g-parameters", "x (tangential): g1 = ", "y (sagittal): g1 = "}},
		{name: "Stability ring", make: func() (Figure, error) { return Stability(ring) },
			svg:     []string{"g1 (equivalent two-mirror cavity)", "x: m = 0.341, g = cos(ψ/2) = -0.819, stable"},
			caption: []string{"A ring has no g-parameters", "equivalent g1·g2 = 0.671, g = -0.819"}},
		{name: "Transmission linear", make: func() (Figure, error) { return CavityTransmission(lin) },
			svg:     []string{"detuning from TEM00 (MHz)", "transmission relative to the peak (dB)", ">TEM00<", ">m+n=1<", ">m+n=4<"},
			caption: []string{"FSR 1.499 GHz, linewidth 477.4 kHz FWHM (finesse 3140)", "Nearest transverse mode to TEM00: m+n=1 at 221.2 MHz (0.1476 FSR"}},
		{name: "Transmission ring zoom", make: func() (Figure, error) {
			return CavityTransmission(ring, DetuningRange(-5e6, 5e6), ModeOrder(6))
		},
			svg:     []string{">TEM13<", "stroke:#B07A3A", "within 2 % of an FSR of TEM00"},
			caption: []string{"TEM13 at -2.021 MHz", "5.8 linewidths", "m + n ≤ 6"}},
		{name: "Transmission linear FSR", make: func() (Figure, error) { return CavityTransmission(lin, Decibels(false), FSRUnits(true)) },
			svg: []string{"detuning from TEM00 (FSR)", "transmission T/T_max"}},
		{name: "Caustic linear", make: func() (Figure, error) { return CavityCaustic(lin) },
			svg:     []string{">M1<", ">M2<", "w₀ 260 µm @ 0.0 mm"},
			prefix:  []string{"Cavity eigenmode, one pass from M1 to M2 (100 mm"},
			caption: []string{"Waists: w₀ 260 µm at z = 0.0 mm.", "Beam radius on M1 260 µm, on M2 291 µm."}},
		{name: "Caustic folded", make: func() (Figure, error) { return CavityCaustic(fold) },
			svg:     []string{">fold<", "x (tangential)", "x w₀ 144 µm @ 0.0 mm", "y w₀ 187 µm @ 325.0 mm"},
			caption: []string{"from HR to OC", "x w₀ 175 µm at z = 325.0 mm"}},
		{name: "Caustic ring", make: func() (Figure, error) { return CavityCaustic(ring) },
			svg:     []string{">C1<", ">F2<", "x w₀ 26.6 µm @ 52.5 mm"},
			caption: []string{"around the ring (round trip 1305 mm)", "y w₀ 27.9 µm at z = 52.5 mm"}},
	})
}

// TestCavityEdgeCases: figures of cavities at the edges of what the
// figures show: an unstable ring (no Gouy phase, so both branches of
// g1·g2 = (1 + m)/2 and no point; two 100 mm mirrors 300 mm apart, more
// than 4f), a design beyond |g| = 10 (a 10 mm convex mirror 100 mm from a
// flat one, g2 = 1 + d/R = 11) drawn at the edge, and a low-finesse
// cavity (R = 10 %, ρ below 3 − 2√2) whose Airy function has no FWHM.
func TestCavityEdgeCases(t *testing.T) {
	loop, err := paraxial.NewBuilder().
		ConcaveMirror(100*mm, 5*units.Degree).Label("A").Space(300*mm).
		ConcaveMirror(100*mm, 5*units.Degree).Label("B").Space(300 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	ring, err := cavity.Ring(cavity.RingSpec{Loop: loop, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	convex, err := cavity.Linear(cavity.LinearSpec{M2: cavity.Mirror{Shape: cavity.Convex, Radius: 10 * mm}, Spacing: 100 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	leaky, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Reflectivity: 0.1},
		M2:         cavity.Mirror{Shape: cavity.Concave, Radius: 500 * mm, Reflectivity: 0.1},
		Spacing:    100 * mm,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		t.Fatal(err)
	}
	checkFigures(t, []figureCase{
		{name: "unstable ring", make: func() (Figure, error) { return Stability(ring) },
			svg:     []string{"g1·g2 = (1 + m)/2 = ", "unstable"},
			caption: []string{"unstable"}},
		{name: "off scale", make: func() (Figure, error) { return Stability(convex) },
			svg:     []string{"design (off scale)", "g2 = 11.000"},
			caption: []string{"g2 = 11.000", "unstable"}},
		{name: "low finesse", make: func() (Figure, error) { return CavityTransmission(leaky) },
			caption: []string{"finesse too low for a half-maximum width"}},
	})
}

// TestCavityGoldenSVG: the ring's stability diagram and transmission
// against their golden files.
func TestCavityGoldenSVG(t *testing.T) {
	for _, test := range []struct {
		name string
		fig  func(cavity.Cavity, ...Option) (Figure, error)
	}{
		{"stability_ring.svg", Stability},
		{"transmission_ring.svg", CavityTransmission},
	} {
		checkGolden(t, test.name, func(tb testing.TB) []byte {
			f, err := test.fig(demoRing(tb))
			if err != nil {
				tb.Fatal(err)
			}
			return mustSVG(tb, f)
		})
	}
}

// TestCavityFigureErrors: cavities that cannot be drawn give a
// *ParamError wrapping ErrCavity and the cavity package's error; an
// unstable cavity still has its stability diagram.
func TestCavityFigureErrors(t *testing.T) {
	unstable, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Reflectivity: 0.99},
		M2:         cavity.Mirror{Shape: cavity.Concave, Radius: 80 * mm, Reflectivity: 0.99},
		Spacing:    100 * mm, // g2 = 1 − 100/80 < 0, g1 = 1: g1·g2 < 0
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		t.Fatal(err)
	}
	noR, err := cavity.Linear(cavity.LinearSpec{M2: cavity.Mirror{Shape: cavity.Concave, Radius: 500 * mm}, Spacing: 100 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	figs := map[string]func(cavity.Cavity, ...Option) (Figure, error){"Stability": Stability, "CavityTransmission": CavityTransmission, "CavityCaustic": CavityCaustic}
	for _, test := range []struct {
		name  string
		fig   string
		c     cavity.Cavity
		opts  []Option
		want  error // nil: no error
		cause error
		text  string
	}{
		{"zero", "Stability", cavity.Cavity{}, nil, ErrCavity, cavity.ErrNotBuilt, "optplot: Stability: cavity: not built"},
		{"zero", "CavityTransmission", cavity.Cavity{}, nil, ErrCavity, cavity.ErrNotBuilt, ""},
		{"zero", "CavityCaustic", cavity.Cavity{}, nil, ErrCavity, cavity.ErrNotBuilt, ""},
		{"unstable", "Stability", unstable, nil, nil, nil, ""},
		{"unstable", "CavityTransmission", unstable, nil, ErrCavity, cavity.ErrUnstable, "unstable"},
		{"unstable", "CavityCaustic", unstable, nil, ErrCavity, cavity.ErrUnstable, "optplot: CavityCaustic: cavity: tangential plane: half-trace (A + D)/2 = "},
		{"no reflectivity", "CavityTransmission", noR, nil, ErrCavity, cavity.ErrNoReflectivity, "mirror reflectivities"},
		{"no reflectivity", "CavityCaustic", noR, nil, nil, nil, ""},
		{"ModeOrder", "CavityTransmission", demoCavity(t), []Option{ModeOrder(31)}, ErrOption, nil, "ModeOrder: order m + n = 31"},
		{"DetuningRange", "CavityTransmission", demoCavity(t), []Option{DetuningRange(1e6, -1e6)}, ErrOption, nil, "DetuningRange: range lo … hi = 1e+06 Hz … -1e+06 Hz"},
		{"DetuningRange wide", "CavityTransmission", demoCavity(t), []Option{DetuningRange(0, 1e12)}, ErrOption, nil, "DetuningRange: range hi − lo = 1000 GHz: must be at most 20 FSR (29.98 GHz)"},
	} {
		f, err := figs[test.fig](test.c, test.opts...)
		if test.want == nil {
			if err != nil {
				t.Errorf("%s %s: error %v, want none", test.name, test.fig, err)
			} else if test.name == "unstable" && !strings.Contains(f.Caption, "unstable") {
				t.Errorf("%s %s: caption %q does not say unstable", test.name, test.fig, f.Caption)
			}
			continue
		}
		var pe *ParamError
		if !errors.As(err, &pe) || !errors.Is(err, test.want) || (test.cause != nil && !errors.Is(err, test.cause)) {
			t.Errorf("%s %s: error %v, want a *ParamError wrapping %v and %v", test.name, test.fig, err, test.want, test.cause)
			continue
		}
		if !strings.Contains(err.Error(), test.text) {
			t.Errorf("%s %s: error %q does not contain %q", test.name, test.fig, err, test.text)
		}
	}
}

// TestCavityHelpers: the Airy function is at half maximum half a
// linewidth from a resonance (the definition of the FWHM of [cavity.Airy];
// rel 1e-9 covers its arcsin), and the equivalent symmetric cavity of the
// ring has the ring's half-trace, 2g² − 1 = m (the identity of
// [symmetricG]; 1e-12 covers the rounding of a Gouy phase summed over the
// loop).
func TestCavityHelpers(t *testing.T) {
	for _, c := range []cavity.Cavity{demoCavity(t), demoRing(t)} {
		a, err := c.Airy()
		if err != nil {
			t.Fatal(err)
		}
		if got := airyTransmission(a.Linewidth/2, a.FSR, a.CoefficientOfFinesse); !scalar.EqualWithinRel(got, 0.5, 1e-9) {
			t.Errorf("T(linewidth/2) = %.12g, want 0.5", got)
		}
		sp, err := c.ModeSpacing()
		if err != nil {
			t.Fatal(err)
		}
		st, err := c.Stability()
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range []struct {
			psi units.Angle
			m   float64
		}{{sp.X.Phase, st.X.HalfTrace}, {sp.Y.Phase, st.Y.HalfTrace}} {
			g := symmetricG(float64(p.psi))
			if got := 2*g*g - 1; !scalar.EqualWithinAbs(got, p.m, 1e-12) {
				t.Errorf("2g² − 1 = %.15g for ψ = %v, want the half-trace %.15g", got, p.psi, p.m)
			}
		}
	}
	// The plano-concave cavity: g = cos(ψ/2) with ψ = 2 arccos(√(g1g2))
	// is √0.8.
	if g := symmetricG(2 * math.Acos(math.Sqrt(0.8))); !scalar.EqualWithinAbs(g, math.Sqrt(0.8), 1e-15) {
		t.Errorf("symmetricG = %v, want √0.8", g)
	}
	for _, test := range []struct {
		m, n int
		want string
	}{{0, 0, "TEM00"}, {1, 3, "TEM13"}, {12, 0, "TEM(12,0)"}} {
		if got := temName(test.m, test.n); got != test.want {
			t.Errorf("temName(%d, %d) = %q, want %q", test.m, test.n, got, test.want)
		}
	}
}
