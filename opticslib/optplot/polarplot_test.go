package optplot

// Tests of the polarization figures: they build, render byte-identical
// SVG, name the states, and refuse states they cannot draw. The states are
// invented; their ellipses come from package polar, which tests them.

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// demoStates are four states of a bench: linear at 0° and 30°, right
// circular, and left elliptical at 120° with χ = −20°.
func demoStates(t testing.TB) []State {
	t.Helper()
	lin0, err := polar.Linear(0, 1)
	if err != nil {
		t.Fatal(err)
	}
	lin30, err := polar.Linear(30*units.Degree, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	rc, err := polar.Circular(polar.Right, 1)
	if err != nil {
		t.Fatal(err)
	}
	le, err := polar.Elliptical(120*units.Degree, -20*units.Degree, 2)
	if err != nil {
		t.Fatal(err)
	}
	return []State{{Label: "laser", Jones: lin0}, {Label: "after HWP", Jones: lin30}, {Label: "after QWP", Jones: rc}, {Jones: le}}
}

// demoChain traces light along x through a polarizer at 45°, a
// quarter-wave plate at 20°, a half-wave plate at 10° and a crossed pair
// of polarizers (the last step has no light).
func demoChain(t testing.TB) polar.Budget {
	t.Helper()
	must := func(m polar.JonesMatrix, err error) polar.JonesMatrix {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		return m
	}
	in, err := polar.Linear(0, 0.02)
	if err != nil {
		t.Fatal(err)
	}
	b, err := polar.Trace(in,
		polar.Element{Name: "P45", Matrix: must(polar.Polarizer(45 * units.Degree))},
		polar.Element{Name: "QWP", Matrix: must(polar.QuarterWave(20 * units.Degree))},
		polar.Element{Name: "HWP at 10°", Matrix: must(polar.HalfWave(10 * units.Degree))},
		polar.Element{Name: "analyser", Matrix: must(polar.Polarizer(90 * units.Degree))},
		polar.Element{Name: "block", Matrix: must(polar.Polarizer(0))},
	)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestPolarizationFigures: both layouts of both figures build and render
// deterministically, with the states' names, angles and handedness, and
// "no light" for the dark last step of the chain. The states after the
// plates follow from Jones calculus (package polar's tests): light at
// 45° through a quarter-wave plate at 20° is left elliptical with
// χ = −25° (half the 50° between axis and light, sign by package polar's
// handedness), and a half-wave plate turns it right-handed.
func TestPolarizationFigures(t *testing.T) {
	states, chain := demoStates(t), demoChain(t)
	checkFigures(t, []figureCase{
		{name: "ellipses overlaid", make: func() (Figure, error) { return PolarizationEllipse(states) },
			svg:     []string{"laser: ψ 0.0°, χ 0.0°, linear", "after QWP: χ 45.0°, right circular", "state 4: ψ -60.0°, χ -20.0°, left elliptical", "Seen facing the source, x right, y up;"},
			caption: []string{"Polarization ellipses in the field plane", "after HWP: ψ 30.0°, χ 0.0°, linear"}},
		{name: "ellipses in panels", make: func() (Figure, error) {
			return PolarizationEllipse(states, SmallMultiples(true), Title("Bench states"))
		},
			svg: []string{"Bench states", ">laser<", ">state 4<", "ψ -60.0°, χ -20.0°", ">left elliptical<", ">right circular<"}},
		{name: "budget in panels", make: func() (Figure, error) { return PolarizationBudget(chain) },
			svg:     []string{">input<", ">after QWP<", ">after HWP at 10°<", "50.0 % of input", ">no light<", "ψ 20.0°, χ -25.0°", ">right elliptical<"},
			caption: []string{"after analyser (8.9 %): ψ 90.0°, χ 0.0°, linear", "after block: no light"}},
		{name: "budget overlaid", make: func() (Figure, error) { return PolarizationBudget(chain, SmallMultiples(false)) },
			svg: []string{"after QWP: ψ 20.0°, χ -25.0°, left elliptical", "after HWP at 10°: ψ 0.0°, χ 25.0°, right elliptical"}},
	})
}

// TestPolarizationGoldenSVG: the chain in panels against its golden file.
func TestPolarizationGoldenSVG(t *testing.T) {
	checkGolden(t, "polarization_budget.svg", func(tb testing.TB) []byte {
		f, err := PolarizationBudget(demoChain(tb))
		if err != nil {
			tb.Fatal(err)
		}
		return mustSVG(tb, f)
	})
}

// TestEllipseSense: the drawn path turns clockwise (negative signed area,
// x right and y up) for right-handed light and anticlockwise for
// left-handed light, as package polar names handedness (S3 > 0 right,
// the field turning clockwise facing the source), and encloses the area
// of the polygon inscribed at equal steps of ωt in the normalised
// ellipse (semi-axes cos χ and sin χ): π cos χ sin χ · sin(2π/N)·N/(2π)
// for N samples, an affine image of the regular N-gon in a circle
// (rel 1e-12 covers rounding).
func TestEllipseSense(t *testing.T) {
	for _, test := range []struct {
		azimuth, chi units.Angle
	}{{0, 45 * units.Degree}, {30 * units.Degree, 20 * units.Degree}, {-70 * units.Degree, -10 * units.Degree}, {10 * units.Degree, -45 * units.Degree}} {
		v, err := polar.Elliptical(test.azimuth, test.chi, 3)
		if err != nil {
			t.Fatal(err)
		}
		path := ellipsePath(v)
		area := 0.0
		for i := 0; i+1 < len(path); i++ {
			area += (path[i][0]*path[i+1][1] - path[i+1][0]*path[i][1]) / 2
		}
		chi := float64(test.chi)
		n := float64(ellipseSamples)
		// Clockwise (negative) for χ > 0, right-handed.
		want := -math.Pi * math.Cos(chi) * math.Sin(chi) * math.Sin(2*math.Pi/n) * n / (2 * math.Pi)
		if !scalar.EqualWithinRel(area, want, 1e-12) {
			t.Errorf("ψ %v, χ %v: signed area %.6f, want %.6f", test.azimuth.Degrees(), test.chi.Degrees(), area, want)
		}
		if right := v.Stokes().S3 > 0; right != (area < 0) {
			t.Errorf("ψ %v, χ %v: S3 > 0 is %v but the path turns clockwise is %v", test.azimuth.Degrees(), test.chi.Degrees(), right, area < 0)
		}
	}
}

// TestPolarizationErrors: states that cannot be drawn are *ParamError
// values wrapping ErrPolarization, naming the state.
func TestPolarizationErrors(t *testing.T) {
	ok := demoStates(t)
	nan := polar.Jones{X: complex(math.NaN(), 0)}
	many := make([]State, MaxStates+1)
	for i := range many {
		many[i] = ok[0]
	}
	for _, test := range []struct {
		name   string
		states []State
		want   string
	}{
		{"none", nil, "states = 0: need at least one"},
		{"too many", many, "states = 37: must be at most 36"},
		{"NaN", []State{ok[0], {Label: "bad", Jones: nan}}, `state 2 "bad" = ((NaN+0i), (0+0i)): components must be finite`},
		{"dark", []State{{Jones: polar.Jones{}}}, `state 1 "state 1" power = 0`},
	} {
		_, err := PolarizationEllipse(test.states)
		var pe *ParamError
		if !errors.As(err, &pe) || !errors.Is(err, ErrPolarization) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: error %v, want a *ParamError wrapping ErrPolarization containing %q", test.name, err, test.want)
		}
	}
	if _, err := PolarizationBudget(polar.Budget{}); !errors.Is(err, ErrPolarization) || !strings.Contains(err.Error(), "input power = 0") {
		t.Errorf("PolarizationBudget(zero budget) error %v, want ErrPolarization naming the input power", err)
	}
}
