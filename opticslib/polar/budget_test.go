package polar_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestTraceBudget(t *testing.T) {
	// The chain x light → polarizer 45° → quarter-wave 0° → polarizer 90°:
	// Malus's law (Goldstein, Polarized Light, 3rd ed. [from memory]) gives
	// 1/2 after the polarizer; the quarter-wave plate with its
	// fast axis along x, 45° below the light's azimuth, makes it circular
	// without loss, left-handed (the fast x component leads: (1, −i)/√2 up
	// to phase; QuarterWave's rule θ = ψ − 45° for left); the last
	// polarizer passes half of circular light: 1/4 in all; the crossed
	// last one nothing (rounding leaves ~1e-35 W). Powers are analytic
	// (rel 1e-15), the table layout is the project's own.
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	in := vec(polar.Linear(0, 0.02)) // 20 mW, normalised in W
	b := mustOf[polar.Budget](t)(polar.Trace(in,
		polar.Element{Name: "P45", Matrix: mat(polar.Polarizer(45 * units.Degree))},
		polar.Element{Name: "QWP", Matrix: mat(polar.QuarterWave(0))},
		polar.Element{Matrix: mat(polar.Polarizer(90 * units.Degree))},
		polar.Element{Name: "block", Matrix: mat(polar.Polarizer(0))},
	))
	b.PowerUnit = "W"
	for k, want := range []float64{0.01, 0.01, 0.005, 0} {
		if got := b.Steps[k].Power; !scalar.EqualWithinAbsOrRel(got, want, 1e-18, 1e-15) {
			t.Errorf("Trace step %d power = %.17g, want %.17g", k, got, want)
		}
	}
	if h := b.Steps[1].Ellipse.Ellipticity; !scalar.EqualWithinAbs(h.Degrees(), -45, 1e-12) {
		t.Errorf("after the QWP χ = %v°, want −45° (left-handed)", h.Degrees())
	}
	want := "Power and polarization after each element\n" +
		"after      power (W)  of input (%)  transmission (%)  azimuth ψ (°)  ellipticity χ (°)  state\n" +
		"---------  ---------  ------------  ----------------  -------------  -----------------  -------------\n" +
		"input      0.02       100.000                         0.00           0.00               linear\n" +
		"P45        0.01       50.000        50.000            45.00          0.00               linear\n" +
		"QWP        0.01       50.000        100.000                          -45.00             left circular\n" +
		"element 3  0.005      25.000        50.000            90.00          0.00               linear\n" +
		"block      " + b.Table().Cell(4, 1) + "  0.000         0.000                                               no light\n"
	if got := b.Table().Text(); got != want {
		t.Errorf("Budget.Table() =\n%s\nwant\n%s", got, want)
	}
	if got := b.Output(); got != b.Steps[3].Out {
		t.Errorf("Output() = %v, want the last step's %v", got, b.Steps[3].Out)
	}
	if err := b.Table().Validate(); err != nil {
		t.Errorf("Table().Validate() = %v", err)
	}
	empty := mustOf[polar.Budget](t)(polar.Trace(in))
	if empty.Output() != in || len(empty.Table().Rows) != 1 || empty.Table().Header[1] != "power (input units)" {
		t.Errorf("Trace(in) with no elements: %v", empty.Table())
	}
}

func TestTraceHalfWavePBS(t *testing.T) {
	// A half-wave plate at θ before an ideal PBS on light along x sends
	// cos²2θ to p and sin²2θ to s (the half-wave rule and Malus's law;
	// Goldstein, Polarized Light [from memory]);
	// the two ports add to the input (energy conservation). Rel 1e-14.
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	pbs := mustOf[polar.Ports](t)(polar.PolarizingBeamSplitter(math.Inf(1), math.Inf(1)))
	for _, deg := range []float64{0, 10, 22.5, 30, 45} {
		h := mat(polar.HalfWave(units.Angle(deg) * units.Degree))
		in := vec(polar.Linear(0, 1))
		bt := mustOf[polar.Budget](t)(polar.Trace(in, polar.Element{Name: "HWP", Matrix: h}, polar.Element{Name: "PBS p", Matrix: pbs.Transmitted}))
		br := mustOf[polar.Budget](t)(polar.Trace(in, polar.Element{Name: "HWP", Matrix: h}, polar.Element{Name: "PBS s", Matrix: pbs.Reflected}))
		c := math.Cos(4 * float64(units.Angle(deg)*units.Degree) / 2)
		pt, pr := bt.Output().Power(), br.Output().Power()
		if !scalar.EqualWithinAbs(pt, c*c, 1e-15) || !scalar.EqualWithinAbs(pt+pr, 1, 1e-15) {
			t.Errorf("HWP %g° + PBS: p %.17g, s %.17g, want %.17g, sum 1", deg, pt, pr, c*c)
		}
	}
}
