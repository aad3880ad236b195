package design_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

const (
	mm = units.Millimeter
	um = units.Micrometer
	nm = units.Nanometer
)

// TestRootDottie: the fixed point of cos, x = cos x, is the Dottie number
// 0.7390851332151607 (an analytic constant; e.g. S. R. Kaplan, "The Dottie
// number", Math. Mag. 80, 73–74 (2007) [from memory]).
func TestRootDottie(t *testing.T) {
	n := 0
	x, err := design.Root(func(x float64) (float64, error) { n++; return math.Cos(x) - x, nil }, 0, 1, 1e-14)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(x, 0.7390851332151607, 1e-14) {
		t.Errorf("Root = %.17g, want 0.7390851332151607", x)
	}
	if n > 20 {
		t.Errorf("Root took %d evaluations; Brent's method needs about 10 for this smooth root", n)
	}
}

// TestRootPolynomials: roots of polynomials with known roots, including a
// triple root (slow for secant methods; bisection keeps Brent's method
// bracketed) and an end point root (analytic).
func TestRootPolynomials(t *testing.T) {
	for _, c := range []struct {
		name   string
		f      func(float64) float64
		lo, hi float64
		want   float64
	}{
		{"x² − 2", func(x float64) float64 { return x*x - 2 }, 0, 2, math.Sqrt2},
		{"(x − 1/3)³", func(x float64) float64 { d := x - 1.0/3; return d * d * d }, -1, 1, 1.0 / 3},
		{"root at hi", func(x float64) float64 { return x - 5 }, 0, 5, 5},
		{"steep", func(x float64) float64 { return math.Exp(20*x) - 1e4 }, -1, 1, math.Log(1e4) / 20},
	} {
		x, err := design.Root(func(x float64) (float64, error) { return c.f(x), nil }, c.lo, c.hi, 1e-12)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		tol := 1e-11
		if c.name == "(x − 1/3)³" {
			tol = 1e-5 // a triple root is flat: f(x) underflows to 0 within (1e-16)^(1/3) of it
		}
		if !scalar.EqualWithinAbs(x, c.want, tol) {
			t.Errorf("%s: Root = %.17g, want %.17g", c.name, x, c.want)
		}
	}
}

func TestRootErrors(t *testing.T) {
	f := func(x float64) (float64, error) { return x*x + 1, nil }
	if _, err := design.Root(f, -1, 1, 1e-9); !errors.Is(err, design.ErrNoBracket) || !strings.Contains(err.Error(), "same sign") {
		t.Errorf("no sign change: %v", err)
	}
	if _, err := design.Root(f, 1, -1, 1e-9); !errors.Is(err, design.ErrBounds) {
		t.Errorf("reversed interval: %v", err)
	}
	nan := func(x float64) (float64, error) { return math.NaN(), nil }
	if _, err := design.Root(nan, 0, 1, 1e-9); !errors.Is(err, design.ErrNotFinite) {
		t.Errorf("NaN function: %v", err)
	}
	boom := errors.New("boom")
	if _, err := design.Root(func(float64) (float64, error) { return 0, boom }, 0, 1, 1e-9); !errors.Is(err, boom) {
		t.Errorf("failing function: %v", err)
	}
}

// keplerian is a 3× telescope f1 = 50 mm, f2 = 150 mm with the input waist
// in the front focal plane of L1.
func keplerian(t *testing.T, gap units.Length) paraxial.System {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(50 * mm).ThinLens(50 * mm).Label("L1").
		Space(gap).Label("gap").ThinLens(150 * mm).Label("L2").Aperture(paraxial.ClearDiameter(10 * mm)).
		Space(100 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	return sys
}

// TestCollimatingSpacing: with the input waist in L1's front focal plane
// the collimating spacing of two thin lenses is exactly f1 + f2 and the
// waist grows by f2/f1 (S. A. Self, "Focusing of spherical Gaussian
// beams", Appl. Opt. 22, 658–661 (1983): the waist maps to the back
// focal plane with w0' = λf/(πw0) at each lens). The root of the output
// waist's distance from L2's back focal plane finds it.
func TestCollimatingSpacing(t *testing.T) {
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 633 * nm})
	if err != nil {
		t.Fatal(err)
	}
	p := design.Problem{
		System:    keplerian(t, 180*mm),
		Variables: []design.Variable{design.Spacing("gap", 150*mm, 250*mm)},
		Goals:     []design.Goal{design.AtMost("divergence", design.Divergence(in), 0.5*units.Milliradian)},
	}
	if err := p.Validate(); err != nil {
		t.Fatal(err)
	}
	// The output waist position relative to L2 minus f2 changes sign at
	// the collimating spacing (the waist runs through L2's back focal
	// plane there).
	f := func(gap float64) (float64, error) {
		sys, err := p.Apply([]units.Length{units.Length(gap)})
		if err != nil {
			return 0, err
		}
		z, err := design.WaistZ(in)(sys)
		l2, _ := sys.Part("L2")
		return float64(z - l2.End - 150*mm), err
	}
	gap, err := design.Root(f, 150e-3, 250e-3, 1e-12)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(gap, 0.2, 1e-9) {
		t.Errorf("collimating spacing = %.12g m, want f1 + f2 = 0.2 m", gap)
	}
	sys, err := p.Apply([]units.Length{units.Length(gap)})
	if err != nil {
		t.Fatal(err)
	}
	e, err := p.Evaluate(sys)
	if err != nil {
		t.Fatal(err)
	}
	w, _ := design.WaistRadius(in)(sys)
	if !scalar.EqualWithinRel(float64(w), 1.2e-3, 1e-9) || !e.Met() || e.Cost != 0 {
		t.Errorf("at f1 + f2: w0 = %v (want 1.2 mm), met %v, cost %g\n%v", w, e.Met(), e.Cost, e)
	}
}

// TestResidualsAndCost: the residual is the miss over the goal's scale
// (definition of this package), the cost Σ w r².
func TestResidualsAndCost(t *testing.T) {
	sys := keplerian(t, 200*mm)
	p := design.Problem{System: sys, Goals: []design.Goal{
		design.AtMost("length", design.TotalLength(), 300*mm),                           // 350 mm: miss 50 mm, scale 300 mm
		design.Near("length near", design.TotalLength(), 380*mm, 10*mm).WithWeight(0.5), // miss −20 mm, scale 10 mm
		design.Between("length in", design.TotalLength(), 350*mm, 450*mm),               // met
	}}
	e, err := p.Evaluate(sys)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{50.0 / 300, -2, 0}
	for i, r := range e.Residuals {
		if !scalar.EqualWithinAbs(r, want[i], 1e-12) {
			t.Errorf("residual %d = %g, want %g", i, r, want[i])
		}
	}
	if c := want[0]*want[0] + 0.5*4; !scalar.EqualWithinAbs(e.Cost, c, 1e-12) {
		t.Errorf("cost = %g, want %g", e.Cost, c)
	}
	if e.Met() {
		t.Errorf("Met = true with two goals missed")
	}
}

func TestVariableErrors(t *testing.T) {
	sys := keplerian(t, 200*mm)
	for _, c := range []struct {
		v    design.Variable
		want []string
	}{
		{design.Spacing("gap", 250*mm, 150*mm), []string{`variable spacing "gap"`, "Min = 250 mm", "Max"}},
		{design.Spacing("L1", 0, 1), []string{`"L1"`, "not a single space"}},
		{design.FocalLength("gap", 10*mm, 20*mm), []string{"not a thin lens"}},
		{design.FocalLength("L1", -10*mm, 20*mm), []string{"one sign"}},
		{design.Spacing("nope", 0, 1), []string{`"nope"`}},
		{design.Spacing("gap", -1*mm, 1), []string{"negative"}},
		{design.Spacing("gap", units.Length(math.NaN()), 1), []string{"finite"}},
	} {
		err := c.v.Validate(sys)
		if err == nil {
			t.Errorf("%v: no error", c.v)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%v: error %q lacks %q", c.v, err, w)
			}
		}
	}
	p := design.Problem{System: sys, Variables: []design.Variable{design.Spacing("gap", 150*mm, 250*mm)},
		Goals: []design.Goal{design.AtMost("length", design.TotalLength(), 300*mm)}}
	if _, err := p.Apply([]units.Length{260 * mm}); !errors.Is(err, design.ErrBounds) || !strings.Contains(err.Error(), "260 mm") {
		t.Errorf("out of bounds: %v", err)
	}
}

// TestFocalLengthVariable keeps the lens's label and clear aperture.
func TestFocalLengthVariable(t *testing.T) {
	sys := keplerian(t, 200*mm)
	v := design.FocalLength("L2", 100*mm, 200*mm)
	out, err := v.Apply(sys, 120*mm)
	if err != nil {
		t.Fatal(err)
	}
	p, err := out.Part("L2")
	if err != nil {
		t.Fatal(err)
	}
	e := out.Element(p.First)
	if e.Focal != 120*mm || e.Aperture.Diameter() != 10*mm {
		t.Errorf("replaced L2: f = %v, clear Ø %v; want 120 mm, 10 mm", e.Focal, e.Aperture.Diameter())
	}
	if got, _ := v.Current(sys); got != 150*mm {
		t.Errorf("Current = %v, want 150 mm (sys unchanged)", got)
	}
}
