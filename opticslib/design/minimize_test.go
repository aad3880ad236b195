package design_test

import (
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/optimize"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// fromBackFocalPlane is a measure of this test (any function of the
// Measure form can be one): the distance of the output waist from the
// back focal plane of the thin lens "L2", whose focal length may be a
// variable. Zero is the collimation condition (see selfCollimating).
func fromBackFocalPlane(in beam.Input) design.Measure[units.Length] {
	return func(sys paraxial.System) (units.Length, error) {
		s, err := design.WaistAfter(in, "L2")(sys)
		if err != nil {
			return 0, err
		}
		l2, err := sys.Part("L2")
		if err != nil {
			return 0, err
		}
		return s - sys.Element(l2.First).Focal, nil
	}
}

// afocal is a 3× telescope problem with the input waist (0.1 mm, 633 nm)
// in L1's front focal plane, f1 = 50 mm: the gap and L2's focal length
// are free, and the goals are an output waist of 0.3 mm (±0.3 nm) in
// L2's back focal plane (±10 nm).
func afocal(t testing.TB) (design.Problem, beam.Gaussian) {
	in := hene(t, 0.1*mm)
	return design.Problem{
		System:    telescope(t, 50*mm, 50*mm, 230*mm, 120*mm),
		Variables: []design.Variable{design.Spacing("gap", 150*mm, 300*mm), design.FocalLength("L2", 80*mm, 250*mm)},
		Goals: []design.Goal{
			design.Near("output waist", design.WaistRadius(in), 0.3*mm, 0.3*units.Nanometer),
			design.Near("collimation", fromBackFocalPlane(in), 0, 10*units.Nanometer),
		},
	}, in
}

// TestMinimizeAfocal: with the input waist in L1's front focal plane the
// intermediate waist lies in L1's back focal plane with w′ = λf1/(πw0),
// and L2 collimates it (output waist in its back focal plane) only from
// a gap of f1 + f2, with the output waist w′f2/zR′ = w0·f2/f1 (S. A. Self
// 1983, s = f at both lenses). A 3× output waist therefore needs
// f2 = 150 mm and gap = f1 + f2 = 200 mm, the only solution. Near it
// both goals vary linearly with both variables (slopes 2 µm/mm and order
// one), so the centred solution is good to about the tolerances over
// the slopes (0.2 µm and 10 nm): 1 µm on each length.
func TestMinimizeAfocal(t *testing.T) {
	p, _ := afocal(t)
	s, err := design.Minimize(p, nil)
	if err != nil {
		t.Fatal(err)
	}
	if gap, f2 := float64(s.Values[0].Value), float64(s.Values[1].Value); !scalar.EqualWithinAbs(gap, 0.2, 1e-6) || !scalar.EqualWithinAbs(f2, 0.15, 1e-6) {
		t.Errorf("gap = %.9g m, f2 = %.9g m; want f1 + f2 = 0.2 m, f2 = 0.15 m\n%v", gap, f2, s)
	}
	if !s.Met() || s.Status != optimize.FunctionThreshold || !s.Converged() || s.Values[0].Bound != design.Inside {
		t.Errorf("solution: met %v, status %v, bound %v\n%v", s.Met(), s.Status, s.Values[0].Bound, s)
	}
	tb := s.Table()
	if len(tb.Rows) != 4 || tb.Rows[0][1] != `spacing "gap"` || tb.Rows[3][4] != "met" || !strings.HasPrefix(tb.Caption, "Solution: every goal met") {
		t.Errorf("table:\n%v", tb.Text())
	}
}

// expander is the two-lens expander problem of the benchmark: the input
// waist position before L1 and the gap are free, the goals a 3× output
// waist (±0.3 nm) in L2's back focal plane (±1 µm).
func expander(t testing.TB) design.Problem {
	in := hene(t, 0.1*mm)
	return design.Problem{
		System:    telescope(t, 80*mm, 50*mm, 230*mm, 150*mm),
		Variables: []design.Variable{design.Spacing("to L1", 20*mm, 120*mm), design.Spacing("gap", 150*mm, 300*mm)},
		Goals: []design.Goal{
			design.Near("output waist", design.WaistRadius(in), 0.3*mm, 0.3*units.Nanometer),
			design.Near("collimation", design.WaistAfter(in, "L2"), 150*mm, 1*um),
		},
	}
}

// TestMinimizeExpander: collimated (output waist in L2's back focal
// plane) with a waist ratio of f2/f1 is reached only with the input
// waist in L1's front focal plane, s1 = f1, and the gap f1 + f2 (Self
// 1983: the collimated ratio is (f2/f1)√(1 + (s1 − f1)²/zR²), smallest
// and equal to f2/f1 at s1 = f1). The ratio is quadratic in s1 − f1
// there, so s1 is fixed only to zR·√(2ε) by a relative ratio error ε:
// with ε = 1e-9 (the ±0.3 nm tolerance of 0.3 mm) that is 2.2 µm, and
// the gap follows it one for one; 5 µm is the tolerance.
func TestMinimizeExpander(t *testing.T) {
	s, err := design.Minimize(expander(t), nil)
	if err != nil {
		t.Fatal(err)
	}
	if s1, gap := float64(s.Values[0].Value), float64(s.Values[1].Value); !scalar.EqualWithinAbs(s1, 0.05, 5e-6) || !scalar.EqualWithinAbs(gap, 0.2, 5e-6) {
		t.Errorf("s1 = %.9g m, gap = %.9g m; want f1 = 0.05 m, f1 + f2 = 0.2 m\n%v", s1, gap, s)
	}
}

// TestMinimizeSelfMaximum: the distance s″ of the waist behind one thin
// lens, as a function of the distance s of the input waist before it, is
// largest at s = f + zR, where s″max = f + f²/(2zR) (S. A. Self 1983,
// from his lens equation: d/ds of (s − f)/((s − f)² + zR²) vanishes at
// s − f = zR).
//
// Minimize maximises with an AtLeast goal on an unreachable value L
// (here 1 m): its cost ((s″ − L)/L)² decreases as s″ grows towards L, so
// the cost's minimum is the maximum of s″. The goal stays missed, and
// Minimize says so with ErrInfeasible, naming the goal and saying that no
// bound is active. (A Near goal on a large value works the same way.)
//
// The maximum is flat: s″ = s″max − f²/(4zR³)·δ² at s = f + zR + δ, so
// the cost's convergence tolerance (relative 1e-12 of 0.73) fixes δ only
// to about 0.5 µm; 5 µm is the tolerance on s. s″max itself is second
// order in δ: relative 1e-10.
func TestMinimizeSelfMaximum(t *testing.T) {
	in := hene(t, 0.15*mm)
	zR := float64(in.RayleighRange())
	const f = 0.1
	sys, err := paraxial.NewBuilder().Space(150 * mm).Label("to L").ThinLens(f * units.Meter).Label("L").Space(300 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	p := design.Problem{System: sys, Variables: []design.Variable{design.Spacing("to L", 50*mm, 400*mm)},
		Goals: []design.Goal{design.AtLeast("waist distance", design.WaistAfter(in, "L"), 1*units.Meter)}}
	s, err := design.Minimize(p, nil)
	if !errors.Is(err, design.ErrInfeasible) || !strings.Contains(err.Error(), `goal "waist distance"`) || !strings.Contains(err.Error(), "closest to the goal") {
		t.Errorf("unreachable AtLeast goal: error %v, want ErrInfeasible naming the goal", err)
	}
	if got := float64(s.Values[0].Value); !scalar.EqualWithinAbs(got, f+zR, 5e-6) {
		t.Errorf("s at the maximum = %.12g m, want f + zR = %.12g m", got, f+zR)
	}
	if got, want := s.Evaluation.Targets[0].Value, f+f*f/(2*zR); !scalar.EqualWithinRel(got, want, 1e-10) {
		t.Errorf("s″max = %.12g m, want f + f²/(2zR) = %.12g m", got, want)
	}
}

// TestMinimizeModeMatch: two thin lenses (−50 mm, 100 mm) placed to match
// a 0.4 mm waist at 1064 nm into a 60 µm waist 400 mm away: Minimize,
// moving both lenses with the end plane fixed, must find the placement of
// couple.MatchTwoLenses (Kogelnik's one-lens formula for L2 and a root
// search over L1's position, an independent method). The waist goals
// (±0.01 µm radius, ±1 µm position) are met at the centre to far better
// than their tolerances, and the lens positions follow from them with
// slopes of order one: 2 µm is the tolerance on each position.
func TestMinimizeModeMatch(t *testing.T) {
	const um = units.Micrometer
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	mode, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 60 * um, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	ms, err := couple.MatchTwoLenses(in, mode, -50*mm, 100*mm, 400*mm)
	if err != nil {
		t.Fatal(err)
	}
	sys, err := paraxial.NewBuilder().Space(30 * mm).ThinLens(-50 * mm).Label("L1").Space(140 * mm).ThinLens(100 * mm).Label("L2").Space(230 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	p := design.Problem{System: sys,
		Variables: []design.Variable{design.Shift("L1", -30*mm, 100*mm), design.Shift("L2", -100*mm, 200*mm)},
		Goals: []design.Goal{
			design.Near("waist radius", design.WaistRadius(in), 60*um, 0.01*um),
			design.Near("waist position", design.WaistZ(in), 400*mm, 1*um),
		}}
	s, err := design.Minimize(p, nil)
	if err != nil {
		t.Fatal(err)
	}
	l1, _ := s.System.Part("L1")
	l2, _ := s.System.Part("L2")
	found := false
	for _, m := range ms {
		if scalar.EqualWithinAbs(float64(l1.Z), float64(m.Lenses[0].Z), 2e-6) && scalar.EqualWithinAbs(float64(l2.Z), float64(m.Lenses[1].Z), 2e-6) {
			found = true
		}
	}
	if !found {
		t.Errorf("lenses at %v and %v; couple.MatchTwoLenses places them at %v", l1.Z, l2.Z, ms)
	}
	// The matched beam couples into the mode: η = 1 − O(ε²) for waist
	// errors ε ≈ 1e-4 relative.
	eta, err := design.Coupling(in, mode)(s.System)
	if err != nil || eta < 1-1e-7 {
		t.Errorf("coupling of the solution = %.10f (%v), want 1 within 1e-7", eta, err)
	}
}

// TestMinimizeDeterministic: the same problem and settings give the same
// solution bit for bit (the starts are fixed and seeded).
func TestMinimizeDeterministic(t *testing.T) {
	p, _ := afocal(t)
	cfg := &design.Settings{RandomStarts: 6, Seed: 7}
	a, errA := design.Minimize(p, cfg)
	b, errB := design.Minimize(p, cfg)
	if errA != nil || errB != nil {
		t.Fatal(errA, errB)
	}
	if !reflect.DeepEqual(a.Values, b.Values) || a.FuncEvaluations != b.FuncEvaluations || a.Start != b.Start {
		t.Errorf("two runs differ: %v / %v", a.Values, b.Values)
	}
}

// TestMinimizeErrors: bounds that exclude every solution, conflicting
// goals, a cut-off optimiser and a goal that cannot be computed give
// errors naming the goal, and the bound at fault.
func TestMinimizeErrors(t *testing.T) {
	in := hene(t, 0.1*mm)
	// The collimating gap is 200 mm (f1 + f2); the bounds start at
	// 250 mm, where the waist lies 373 mm behind L2, falling to 329 mm at
	// 300 mm (Self 1983: s″ peaks at s2 = f2 + zR′ = 200.4 mm).
	p := collimation(t, in, 50*mm, 50*mm, 150*mm, 250*mm, 300*mm)
	s, err := design.Minimize(p, nil)
	if !errors.Is(err, design.ErrInfeasible) {
		t.Fatalf("bounds short of the solution: error %v, want ErrInfeasible", err)
	}
	for _, w := range []string{`design: goal "collimation": missed`, "(wanted 150 ± 0.001 mm)", "above the range", `spacing "gap" is at its bound Max = 300 mm`, "the bounds exclude every solution found", "widen them"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error %q lacks %q", err, w)
		}
	}
	if s.Values[0].Bound != design.AtMax || s.Met() || !s.Converged() {
		t.Errorf("solution: bound %v, met %v, converged %v", s.Values[0].Bound, s.Met(), s.Converged())
	}

	// Length at most 300 mm and at least 400 mm: a conflict, with the
	// compromise inside the bounds.
	p = collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm)
	p.Goals = []design.Goal{design.AtMost("length budget", design.TotalLength(), 450*mm), design.AtLeast("rail length", design.TotalLength(), 600*mm)}
	_, err = design.Minimize(p, nil)
	for _, w := range []string{`goals "length budget", "rail length"`, "above the limit", "below the limit", "no variable is at a bound: the goals conflict"} {
		if !errors.Is(err, design.ErrInfeasible) || !strings.Contains(err.Error(), w) {
			t.Errorf("conflicting goals: error %v lacks %q", err, w)
		}
	}

	// Three evaluations per run cannot solve the afocal problem.
	pa, _ := afocal(t)
	s, err = design.Minimize(pa, &design.Settings{FuncEvaluations: 3, RandomStarts: -1})
	if !errors.Is(err, design.ErrNotConverged) || !strings.Contains(err.Error(), "raise Settings.FuncEvaluations") || s.Converged() || s.Status != optimize.FunctionEvaluationLimit {
		t.Errorf("cut-off optimiser: error %v, status %v", err, s.Status)
	}

	// A goal that cannot be computed anywhere.
	p = collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm)
	p.Goals = []design.Goal{design.Near("radius at M9", design.RadiusAt(in, "M9"), 1*mm, 0.1*mm)}
	if _, err := design.Minimize(p, nil); !errors.Is(err, design.ErrGoal) || !strings.Contains(err.Error(), `goal "radius at M9"`) || !strings.Contains(err.Error(), `"M9"`) {
		t.Errorf("uncomputable goal: error %v", err)
	}
	if _, err := design.Minimize(p, &design.Settings{FuncEvaluations: -1}); err == nil || !strings.Contains(err.Error(), "FuncEvaluations = -1") {
		t.Errorf("negative evaluation limit: error %v", err)
	}
	// No variable: evaluated only, missed goals still reported.
	p.Variables = nil
	p.Goals = []design.Goal{design.AtMost("length budget", design.TotalLength(), 300*mm)}
	s, err = design.Minimize(p, nil)
	if !errors.Is(err, design.ErrInfeasible) || s.Runs != 0 || !strings.Contains(err.Error(), "no free variable") {
		t.Errorf("no variable: error %v, runs %d", err, s.Runs)
	}
}

// TestGoalRange: the range, unit and wanted text of each kind of goal
// (the definitions of target.Near, Between, AtLeast and AtMost).
func TestGoalRange(t *testing.T) {
	for _, c := range []struct {
		g      design.Goal
		lo, hi float64
		unit   string
		wanted string
	}{
		{design.Near("a", design.TotalLength(), 200*mm, 1*mm), 0.199, 0.201, "m", "200 ± 1 mm"},
		{design.Between("b", design.TotalLength(), 100*mm, 300*mm), 0.1, 0.3, "m", "100 … 300 mm"},
		{design.AtLeast("c", design.MinTransmission(hene(t, 1*mm)), 0.99), 0.99, math.Inf(1), "", "≥ 0.99"},
		{design.AtMost("d", design.Divergence(hene(t, 1*mm)), 2*units.Milliradian), math.Inf(-1), 0.002, "rad", "≤ 2 mrad"},
	} {
		lo, hi := c.g.Range()
		if !scalar.EqualWithinAbsOrRel(lo, c.lo, 1e-15, 1e-12) && lo != c.lo || !scalar.EqualWithinAbsOrRel(hi, c.hi, 1e-15, 1e-12) && hi != c.hi ||
			c.g.Unit() != c.unit || c.g.Wanted() != c.wanted {
			t.Errorf("%s: Range %g, %g, Unit %q, Wanted %q; want %g, %g, %q, %q", c.g.Name, lo, hi, c.g.Unit(), c.g.Wanted(), c.lo, c.hi, c.unit, c.wanted)
		}
	}
	if lo, hi := (design.Goal{}).Range(); !math.IsNaN(lo) || !math.IsNaN(hi) {
		t.Errorf("zero Goal: Range = %g, %g, want NaN, NaN", lo, hi)
	}
}
