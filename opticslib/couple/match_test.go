package couple_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/units"
)

// R10 of the project's reference checks (S. A. Self, Appl. Opt. 22, 658
// (1983)): λ = 632.8 nm, w0 = 0.2 mm, 200 mm before a 100 mm lens, images
// to w0” = 89.9520 µm at 120.228 mm after it. Matching the input waist to
// a waist of 89.9520 µm with f = 100 mm must give the lens 200 mm after
// the input waist and the target 320.228 mm from the input plane. The
// reference digits are 6: rel 2e-5 on positions (the waist's 6 digits
// move the solution by about that much through d ∝ √(f² − f0²)).
func TestMatchOneLensR10(t *testing.T) {
	const lambda = 632.8 * units.Nanometer
	in := waist(t, 0.2*units.Millimeter, 0, lambda, 1)
	target := waist(t, 89.9520*units.Micrometer, 0, lambda, 1)
	ms, err := couple.MatchOneLens(in, target, 100*units.Millimeter)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, m := range ms {
		if !scalar.EqualWithinAbs(m.Coupling.Efficiency, 1, 1e-10) {
			t.Errorf("solution at z = %v: efficiency %.15g, want 1", m.Lenses[0].Z, m.Coupling.Efficiency)
		}
		if scalar.EqualWithinRel(float64(m.Lenses[0].Z), 0.2, 2e-5) {
			found = true
			if !scalar.EqualWithinRel(float64(m.Length), 0.320228, 2e-5) {
				t.Errorf("R10 solution: target plane at %v, want 320.228 mm", m.Length)
			}
		}
	}
	if !found {
		t.Errorf("MatchOneLens: no solution with the lens at 200 mm: %v", ms)
	}
	// A lens weaker than f0 = π w1 w2/λ cannot match.
	if _, err := couple.MatchOneLens(in, target, 10*units.Millimeter); !errors.Is(err, couple.ErrNoSolution) {
		t.Errorf("MatchOneLens(f = 10 mm) error = %v, want ErrNoSolution", err)
	}
}

// forward returns the beam after lenses (f, z) at the plane length, made
// by the ABCD law in package beam, as the target of a problem whose exact
// solution is known.
func forward(t *testing.T, in beam.Gaussian, lenses []couple.PlacedLens, length units.Length) beam.Gaussian {
	t.Helper()
	q := in.Q
	prev := 0.0
	for _, l := range lenses {
		q += complex(float64(l.Z)-prev, 0)
		q = 1 / (1/q - complex(1/float64(l.Focal), 0))
		prev = float64(l.Z)
	}
	q += complex(float64(length)-prev, 0)
	g, err := beam.FromQ(q, in.Wavelength, in.Index)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// Two lenses with given focal lengths at a given length: the target is
// made by propagating the input through a known placement, so an exact
// solution exists; MatchTwoLenses must find it (positions to 1e-9 m: the
// bisection runs to machine precision, the efficiency is quadratic in the
// error) and Solve, with free positions, must reach η > 0.999 and agree
// with one closed-form solution.
func TestMatchTwoLenses(t *testing.T) {
	const lambda = 1064 * units.Nanometer
	in := waist(t, 0.5*units.Millimeter, -0.1, lambda, 1)
	truth := []couple.PlacedLens{{Label: "L1", Focal: 50 * units.Millimeter, Z: 120 * units.Millimeter},
		{Label: "L2", Focal: 150 * units.Millimeter, Z: 320 * units.Millimeter}}
	length := 600 * units.Millimeter
	target := forward(t, in, truth, length)
	ms, err := couple.MatchTwoLenses(in, target, truth[0].Focal, truth[1].Focal, length)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, m := range ms {
		if m.Coupling.Efficiency < 1-1e-10 {
			t.Errorf("closed-form solution z1 = %v, z2 = %v: η = %.15g", m.Lenses[0].Z, m.Lenses[1].Z, m.Coupling.Efficiency)
		}
		if scalar.EqualWithinAbs(float64(m.Lenses[0].Z), float64(truth[0].Z), 1e-9) &&
			scalar.EqualWithinAbs(float64(m.Lenses[1].Z), float64(truth[1].Z), 1e-9) {
			found = true
		}
	}
	if !found {
		t.Errorf("MatchTwoLenses did not find z1 = 120 mm, z2 = 320 mm among %d solutions", len(ms))
	}
	s, err := couple.Solve(couple.Problem{Input: in, Target: target, MinLength: length, MaxLength: length,
		Lenses: []couple.Lens{{Focal: truth[0].Focal}, {Focal: truth[1].Focal}}})
	if err != nil {
		t.Fatal(err)
	}
	if s.Coupling.Efficiency < 0.999 {
		t.Errorf("Solve: η = %.6g, want > 0.999 (an exact solution exists)", s.Coupling.Efficiency)
	}
	// The solver's placement is one of the closed-form ones: positions to
	// 1 mm (1 − η ≈ (Δz/scale)², so η > 0.999 pins them to about a mm
	// here), efficiency to 1e-3.
	agree := false
	for _, m := range ms {
		if math.Abs(float64(m.Lenses[0].Z-s.Lenses[0].Z)) < 1e-3 && math.Abs(float64(m.Lenses[1].Z-s.Lenses[1].Z)) < 1e-3 {
			agree = true
		}
	}
	if !agree {
		t.Errorf("Solve placed z1 = %v, z2 = %v, not near a closed-form solution", s.Lenses[0].Z, s.Lenses[1].Z)
	}
	if got, err := s.System.Part("L2"); err != nil || !scalar.EqualWithinAbs(float64(got.Z), float64(s.Lenses[1].Z), 1e-15) {
		t.Errorf("System.Part(L2) = %v, %v, want z = %v", got, err, s.Lenses[1].Z)
	}
}

// Solve against the one-lens closed form: a free position and a free
// length within bounds around the Kogelnik solution; and a free focal
// length.
func TestSolveOneLens(t *testing.T) {
	const lambda = 780 * units.Nanometer
	in := waist(t, 0.9*units.Millimeter, 0, lambda, 1)
	target := waist(t, 60*units.Micrometer, 0, lambda, 1)
	f := 250 * units.Millimeter
	ms, err := couple.MatchOneLens(in, target, f)
	if err != nil {
		t.Fatal(err)
	}
	ref := ms[0]
	s, err := couple.Solve(couple.Problem{Input: in, Target: target, MinLength: ref.Length - 50*units.Millimeter,
		MaxLength: ref.Length + 50*units.Millimeter, Lenses: []couple.Lens{{Label: "focuser", Focal: f}}})
	if err != nil {
		t.Fatal(err)
	}
	if s.Coupling.Efficiency < 0.999 {
		t.Errorf("Solve: η = %.6g, want > 0.999", s.Coupling.Efficiency)
	}
	if math.Abs(float64(s.Lenses[0].Z-ref.Lenses[0].Z)) > 1e-3 || math.Abs(float64(s.Length-ref.Length)) > 1e-3 {
		t.Errorf("Solve: lens at %v, target at %v; closed form %v, %v", s.Lenses[0].Z, s.Length, ref.Lenses[0].Z, ref.Length)
	}
	// Free focal length and position at a fixed length of 600 mm.
	// (A 0.3 mm input, so that f0 = π w1 w2/λ = 72.5 mm lies well below
	// the solution and L depends strongly on f.)
	in = waist(t, 0.3*units.Millimeter, 0, lambda, 1)
	s, err = couple.Solve(couple.Problem{Input: in, Target: target, MinLength: 0.6, MaxLength: 0.6,
		Lenses: []couple.Lens{{FocalMin: 50 * units.Millimeter, FocalMax: 300 * units.Millimeter}}})
	if err != nil {
		t.Fatal(err)
	}
	if s.Coupling.Efficiency < 0.999 {
		t.Errorf("Solve (free f): η = %.6g, want > 0.999", s.Coupling.Efficiency)
	}
	if one, err := couple.MatchOneLens(in, target, s.Lenses[0].Focal); err != nil {
		t.Errorf("MatchOneLens(f = %v) error: %v", s.Lenses[0].Focal, err)
	} else {
		ok := false
		for _, m := range one {
			ok = ok || math.Abs(float64(m.Length-0.6)) < 1e-3
		}
		if !ok {
			t.Errorf("closed form for the solver's f = %v does not give L ≈ 600 mm", s.Lenses[0].Focal)
		}
	}
	tb := s.Table()
	if err := tb.Validate(); err != nil || !strings.Contains(tb.Text(), "Nelder–Mead") {
		t.Errorf("Match.Table() = %v (err %v)", tb.Text(), err)
	}
}

func TestSolveErrors(t *testing.T) {
	const lambda = 780 * units.Nanometer
	in := waist(t, 0.9*units.Millimeter, 0, lambda, 1)
	target := waist(t, 60*units.Micrometer, 0, lambda, 1)
	multi := waist(t, 60*units.Micrometer, 0, lambda, 1.3)
	for _, test := range []struct {
		p    couple.Problem
		text string
	}{
		{couple.Problem{Input: in, Target: multi, MinLength: 1, MaxLength: 1, Lenses: []couple.Lens{{Focal: 0.1}}}, "couple: target: M² = 1.3: must be 1"},
		{couple.Problem{Input: in, Target: target, MinLength: 1, MaxLength: 0.5, Lenses: []couple.Lens{{Focal: 0.1}}}, "length bounds MinLength = 1 m"},
		{couple.Problem{Input: in, Target: target, MinLength: 1, MaxLength: 1}, "number of lenses = 0"},
		{couple.Problem{Input: in, Target: target, MinLength: 1, MaxLength: 1, Lenses: []couple.Lens{{FocalMin: -0.1, FocalMax: 0.1}}}, `lens "L1": focal length f = 0 m`},
		{couple.Problem{Input: in, Target: target, MinLength: 1, MaxLength: 1, Lenses: []couple.Lens{{Focal: 0.1, ZMin: 0.5, ZMax: 0.2}}}, "position bound ZMin = 500 mm"},
	} {
		_, err := couple.Solve(test.p)
		var pe *couple.ParamError
		if !errors.As(err, &pe) || !strings.Contains(err.Error(), test.text) {
			t.Errorf("Solve error = %v, want a *ParamError containing %q", err, test.text)
		}
	}
}
