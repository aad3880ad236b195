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
	// A lens weaker than f0 = π w1 w2/λ cannot match (Kogelnik & Li 1966
	// [from memory]: the closed form needs √(f² − f0²)).
	if _, err := couple.MatchOneLens(in, target, 10*units.Millimeter); !errors.Is(err, couple.ErrNoSolution) {
		t.Errorf("MatchOneLens(f = 10 mm) error = %v, want ErrNoSolution", err)
	}
}

// forward returns the beam after lenses (f, z) at the plane length, made
// by the ABCD law for q (free space q → q + d, thin lens 1/q → 1/q − 1/f;
// Kogelnik & Li 1966), written out here independently of package beam, as
// the target of a problem whose exact solution is known.
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

// Solve against the one-lens closed form (Kogelnik & Li 1966 [from
// memory], itself checked against R10, Self 1983, above): a free position
// and a free length within bounds around the Kogelnik solution; and a
// free focal length. Efficiency > 0.999 and positions to 1 mm: 1 − η is
// quadratic in the position error (R13), so η > 0.999 pins them to about
// that here.
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
	tb := s.Table() // presentation only, no outside reference
	if err := tb.Validate(); err != nil || !strings.Contains(tb.Text(), "Nelder–Mead") {
		t.Errorf("Match.Table() = %v (err %v)", tb.Text(), err)
	}
}

// Invalid problems are *ParamErrors naming the parameter and value with
// its unit. No outside reference: the package's message format; the
// requirement that the target be a mode (M² = 1) is the model's (see the
// package documentation).
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

// The closed forms name the value at fault when there is no solution.
// Kogelnik's condition |f| ≥ f0 = π w1 w2/λ (Kogelnik & Li 1966 [from
// memory]; R10's beams: f0 = π·0.2 mm·89.952 µm/632.8 nm = 89.315 mm,
// evaluated in Python); a diverging lens, which cannot image a real waist
// onto a real waist (the same closed form puts the lens before the input
// or the image before the lens); two lenses whose target plane cannot
// reach L (the placements of TestMatchTwoLenses's lenses all put it at
// 352 mm or beyond, found by the scan); and an L2 weaker than the f0 of
// every intermediate beam. The texts are the package's own format.
func TestMatchErrors(t *testing.T) {
	const lambda = 632.8 * units.Nanometer
	in := waist(t, 0.2*units.Millimeter, 0, lambda, 1)
	target := waist(t, 89.9520*units.Micrometer, 0, lambda, 1)
	f0 := units.Length(math.Pi * 0.2e-3 * 89.952e-6 / 632.8e-9)
	in2 := waist(t, 0.5*units.Millimeter, -0.1, 1064*units.Nanometer, 1)
	target2 := forward(t, in2, []couple.PlacedLens{{Focal: 50 * units.Millimeter, Z: 120 * units.Millimeter},
		{Focal: 150 * units.Millimeter, Z: 320 * units.Millimeter}}, 600*units.Millimeter)
	for _, test := range []struct {
		name  string
		run   func() ([]couple.Match, error)
		texts []string
	}{
		{"one lens, |f| < f0", func() ([]couple.Match, error) { return couple.MatchOneLens(in, target, 10*units.Millimeter) },
			[]string{"couple: lens: focal length f = 10 mm: |f| is below f0 = √(zR1·zR2) = π w1 w2/λ = " + f0.String()}},
		{"one diverging lens", func() ([]couple.Match, error) { return couple.MatchOneLens(in, target, -100*units.Millimeter) },
			[]string{"focal length f = -100 mm: both solutions put the lens before the input plane", "lens at z = "}},
		{"two lenses, L too short", func() ([]couple.Match, error) {
			return couple.MatchTwoLenses(in2, target2, 50*units.Millimeter, 150*units.Millimeter, 250*units.Millimeter)
		}, []string{"couple: length L = 250 mm: the placements of f1 = 50 mm and f2 = 150 mm", "never at L", "nearest: z1 = "}},
		{"two lenses, L2 too weak", func() ([]couple.Match, error) {
			return couple.MatchTwoLenses(in2, in2, 50*units.Millimeter, 1*units.Millimeter, 600*units.Millimeter)
		}, []string{`couple: lens "L2": focal length f2 = 1 mm: |f2| is below f0`, "for every z1 from 0 to 600 mm (smallest f0 = "}},
	} {
		ms, err := test.run()
		if !errors.Is(err, couple.ErrNoSolution) || len(ms) != 0 {
			t.Errorf("%s: %d solutions, error %v, want none and ErrNoSolution", test.name, len(ms), err)
			continue
		}
		for _, text := range test.texts {
			if !strings.Contains(err.Error(), text) {
				t.Errorf("%s: error %q, want it to contain %q", test.name, err, text)
			}
		}
	}
}

// Problem.MinEfficiency: an unreachable target is an error wrapping
// ErrNoSolution that gives the best efficiency and the active bounds,
// returned with the best Match.
//
// Reference value: the collimated 1.1 mm beam of the package example
// (w1 = 0.55 mm at its waist, zR1 = π w1²/λ = 725.4 mm at 1310 nm) focused
// by a lens of f = 8 mm at d = 60 mm (both at their bounds, FocalMin and
// ZMax: a longer lens than f0 = π w1 w_f/λ = 6.067 mm makes the spot too
// big, and a larger d shrinks it) has its waist w' = w1 f/√((d − f)² +
// zR1²) (S. A. Self, "Focusing of spherical Gaussian beams", Appl. Opt.
// 22, 658–661 (1983)); with the fibre face free to move to that waist the
// coupling is R13's size mismatch 4/(r + 1/r)², r = w'/w_f, w_f = 4.6 µm:
// 0.9285491 (evaluated in Python). Rel 1e-6: the optimiser stops within
// about 1e-9 of the bounds in the mapped variable.
//
// The M² bound: an input of M² = 1.3 couples at most (2/(M² + 1))² =
// 0.756144 into any TEM₀₀ target (Gaussian Schell model, see
// TestSchellModelBound), so MinEfficiency 0.9 is refused before any
// search, naming the M².
func TestSolveMinEfficiency(t *testing.T) {
	const lambda = 1310 * units.Nanometer
	diode := waist(t, 0.55*units.Millimeter, 0, lambda, 1)
	mode := waist(t, 4.6*units.Micrometer, 0, lambda, 1)
	launch := []couple.Lens{{Label: "launch lens", FocalMin: 8 * units.Millimeter, FocalMax: 20 * units.Millimeter,
		ZMin: 20 * units.Millimeter, ZMax: 60 * units.Millimeter}}
	p := couple.Problem{Input: diode, Target: mode, Lenses: launch, MinLength: 20 * units.Millimeter, MaxLength: 100 * units.Millimeter}

	zr1, f, d, wf := math.Pi*0.55e-3*0.55e-3/1310e-9, 8e-3, 60e-3, 4.6e-6
	r := 0.55e-3 * f / math.Sqrt((d-f)*(d-f)+zr1*zr1) / wf
	want := 4 / ((r + 1/r) * (r + 1/r))
	if !scalar.EqualWithinRel(want, 0.9285491, 1e-6) {
		t.Fatalf("reference η = %.7f, want 0.9285491 (Self 1983 with R13)", want)
	}
	p.MinEfficiency = 0.9 // reachable: no error
	m, err := couple.Solve(p)
	if err != nil || !scalar.EqualWithinRel(m.Coupling.Efficiency, want, 1e-6) {
		t.Errorf("Solve(MinEfficiency 0.9) = η %.7f, %v, want %.7f and no error", m.Coupling.Efficiency, err, want)
	}
	p.MinEfficiency = 0.95 // unreachable within the bounds
	m, err = couple.Solve(p)
	if !errors.Is(err, couple.ErrNoSolution) || !scalar.EqualWithinRel(m.Coupling.Efficiency, want, 1e-6) {
		t.Errorf("Solve(MinEfficiency 0.95) = η %.7f, %v, want the best Match (η %.7f) and ErrNoSolution", m.Coupling.Efficiency, err, want)
	}
	for _, text := range []string{
		"couple: minimum efficiency MinEfficiency = 0.95: the best efficiency inside the bounds is 0.928549",
		`lens "launch lens" focal length at its lower bound FocalMin 8 mm`,
		`lens "launch lens" position at its upper bound ZMax 60 mm`,
	} {
		if err == nil || !strings.Contains(err.Error(), text) {
			t.Errorf("Solve(MinEfficiency 0.95) error = %v, want it to contain %q", err, text)
		}
	}
	if err != nil && strings.Contains(err.Error(), "total length") {
		t.Errorf("Solve(MinEfficiency 0.95) error = %v: the length is free inside its bounds, not active", err)
	}

	// Two lenses with their positions bounded short of the solution of
	// TestMatchTwoLenses (L2 at 320 mm, target at 600 mm): the length
	// and L2's position end on their upper bounds.
	in := waist(t, 0.5*units.Millimeter, -0.1, 1064*units.Nanometer, 1)
	target := forward(t, in, []couple.PlacedLens{{Focal: 50 * units.Millimeter, Z: 120 * units.Millimeter},
		{Focal: 150 * units.Millimeter, Z: 320 * units.Millimeter}}, 600*units.Millimeter)
	_, err = couple.Solve(couple.Problem{Input: in, Target: target, MinEfficiency: 0.99, MinLength: 200 * units.Millimeter, MaxLength: 300 * units.Millimeter,
		Lenses: []couple.Lens{{Focal: 50 * units.Millimeter}, {Focal: 150 * units.Millimeter, ZMin: 50 * units.Millimeter, ZMax: 120 * units.Millimeter}}})
	for _, text := range []string{`lens "L2" position at its upper bound ZMax 120 mm`, "total length at MaxLength 300 mm"} {
		if !errors.Is(err, couple.ErrNoSolution) || !strings.Contains(err.Error(), text) {
			t.Errorf("Solve(two lenses, bounded) error = %v, want ErrNoSolution naming %q", err, text)
		}
	}

	for _, test := range []struct {
		p        couple.Problem
		sentinel error
		text     string
	}{
		{couple.Problem{Input: waist(t, 0.55*units.Millimeter, 0, lambda, 1.3), Target: mode, Lenses: launch, MinLength: 0.02, MaxLength: 0.1, MinEfficiency: 0.9},
			couple.ErrNoSolution, "couple: minimum efficiency MinEfficiency = 0.9: exceeds the bound (2/(M² + 1))² = 0.756144 for the input's M² = 1.3"},
		{couple.Problem{Input: diode, Target: mode, Lenses: launch, MinLength: 0.02, MaxLength: 0.1, MinEfficiency: 1.5},
			nil, "couple: minimum efficiency MinEfficiency = 1.5: must lie between 0 and 1"},
		{couple.Problem{Input: diode, Target: mode, Lenses: launch, MinLength: 0.02, MaxLength: 0.1, MinEfficiency: math.NaN()},
			nil, "minimum efficiency MinEfficiency = NaN"},
		{couple.Problem{Input: diode, Target: mode, Lenses: launch, MinLength: 0.02, MaxLength: 0.1, MinEfficiency: -0.1},
			nil, "minimum efficiency MinEfficiency = -0.1"},
	} {
		_, err := couple.Solve(test.p)
		var pe *couple.ParamError
		if !errors.As(err, &pe) || (test.sentinel != nil && !errors.Is(err, test.sentinel)) || !strings.Contains(err.Error(), test.text) {
			t.Errorf("Solve error = %v, want a *ParamError containing %q (wrapping %v)", err, test.text, test.sentinel)
		}
	}
}
