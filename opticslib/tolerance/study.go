package tolerance

import (
	"math"
	"slices"
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Study is a design to tolerance: the system as designed, the values a
// build gets wrong with their error distributions, and the goals it must
// still meet (the goals of a [design.Problem], judged the same way). A
// Compensator, when set, is re-adjusted in every build, as on a bench.
//
// For speed, Fast may give each goal's value as a function of the beam at
// the end plane ([Fast], [Output]); Monte Carlo then perturbs the element
// matrices directly instead of rebuilding the system (see the package
// documentation, "Two routes").
type Study struct {
	// System is the nominal design.
	System paraxial.System
	// Perturbations lists the errors of a build, each named once.
	Perturbations []Perturbation
	// Goals are the requirements, with distinct names.
	Goals []design.Goal
	// Compensator, when not nil, is the adjustment made in every build.
	Compensator *Compensator
	// Beam is the beam at the input plane that the Fast measures
	// propagate (the beam the goals' measures were made with).
	Beam beam.Input
	// Fast maps goal names to the goal's value computed from the
	// [Output] of a build; give one for every goal or none.
	Fast map[string]Fast
}

// Compensator is the one adjustment a builder makes after assembly to
// restore one goal, as when a spacing is set by watching the beam: in
// every build the Variable (a spacing, a part's shift or a thin lens's
// focal length, within its bounds) is solved so that the goal named Goal
// (a Near or Between goal) takes its wanted value (the middle of a
// Between range), by Brent's method ([design.Root]). When no value within
// the bounds reaches it, the variable is set to the bound that comes
// closest and the build is counted as compensated at a limit.
type Compensator struct {
	Variable design.Variable
	Goal     string
}

// plan is a validated study: what every route needs.
type plan struct {
	s     Study
	sites []site
	// nominal holds each goal's target in the (compensated) nominal
	// design: the wanted range and the unit judge every trial.
	nominal []target.Target
	// comp is the compensator's variable (nil without one), compGoal
	// its goal's index, want the value it restores, xtol the root
	// tolerance in metres; compNominal its value in the nominal design.
	comp        *design.Variable
	compGoal    int
	want, xtol  float64
	compNominal float64
	compSite    site
	// fast holds each goal's fast measure, nil for the generic route;
	// in is the beam they propagate.
	fast []Fast
	in   beam.Astigmatic
}

// Validate checks the study: a built, non-empty system; each
// perturbation ([Perturbation.Validate]) named once; at least one goal,
// names distinct, each computable in the nominal design; the compensator
// ([design.Variable.Validate], bounds of nonzero width, a Near or Between
// goal, not the focal length of a lens that is also tilted); the fast
// measures (a valid Beam for the system, one per goal, each agreeing
// with its goal's own measure). It returns a *ParamError naming what is
// at fault.
func (s Study) Validate() error {
	_, err := s.plan()
	return err
}

func (s Study) plan() (*plan, error) {
	if err := s.System.Validate(); err != nil || s.System.Len() == 0 {
		return nil, &ParamError{Param: "system", Reason: "is empty or not built", Err: paraxial.ErrNotBuilt}
	}
	p := &plan{s: s, compGoal: -1}
	names := map[string]bool{}
	for _, q := range s.Perturbations {
		st, err := q.resolve(s.System)
		if err != nil {
			return nil, err
		}
		if names[q.Name()] {
			return nil, q.fail("", nil, "is given twice (one distribution per value; add the widths in quadrature)", ErrPerturbation)
		}
		names[q.Name()] = true
		p.sites = append(p.sites, st)
	}
	if len(s.Perturbations) == 0 {
		return nil, &ParamError{Param: "perturbations", Reason: "none given", Err: ErrPerturbation}
	}
	if len(s.Goals) == 0 {
		return nil, &ParamError{Param: "goals", Reason: "none given"}
	}
	goals := map[string]int{}
	for i, g := range s.Goals {
		if _, dup := goals[g.Name]; dup {
			return nil, &ParamError{Subject: "goal " + errtext.Quote(g.Name), Reason: "is given twice (goal names must differ)"}
		}
		goals[g.Name] = i
	}
	if c := s.Compensator; c != nil {
		if err := p.compensator(c, goals); err != nil {
			return nil, err
		}
	}
	// The nominal design: every error zero, the compensator solved.
	zero := make([]float64, len(s.Perturbations))
	vals := make([]float64, len(s.Goals))
	p.nominal = make([]target.Target, len(s.Goals))
	sys, _, _, err := p.generic(zero)
	if err == nil {
		err = p.measure(sys, vals, p.nominal)
	}
	if err != nil {
		return nil, &ParamError{Param: "nominal design", Reason: "cannot be evaluated", Err: err}
	}
	for i, t := range p.nominal {
		if math.IsNaN(t.Miss()) {
			return nil, &ParamError{Subject: "goal " + errtext.Quote(s.Goals[i].Name), Param: "wanted range", Value: t.Wanted(), Reason: t.Problem()}
		}
	}
	if p.comp != nil {
		c0, _ := p.comp.Current(s.System)
		p.compNominal = float64(c0)
	}
	if len(s.Fast) > 0 {
		if err := p.fastMeasures(goals); err != nil {
			return nil, err
		}
	}
	return p, nil
}

// compensator validates c and fills the plan's compensator fields.
func (p *plan) compensator(c *Compensator, goals map[string]int) error {
	v := c.Variable
	bad := func(param string, value any, reason string, err error) error {
		return &ParamError{Subject: "compensator " + v.Name(), Param: param, Value: value, Reason: reason, Err: because(ErrCompensator, err)}
	}
	if err := v.Validate(p.s.System); err != nil {
		return bad("", nil, "", err)
	}
	if !(v.Min < v.Max) {
		return bad("bounds", "["+v.Min.String()+", "+v.Max.String()+"]", "need Min < Max: a compensator must be free to move", nil)
	}
	gi, ok := goals[c.Goal]
	if !ok {
		return bad("goal", errtext.Quote(c.Goal), "names no goal of the study", nil)
	}
	for _, q := range p.s.Perturbations {
		if v.Kind == design.KindFocal && q.Kind == KindTilt && q.Label == v.Label {
			return bad("label", v.Label, "is also tilted ("+q.Name()+"): a focal-length compensator sets a thin lens", nil)
		}
	}
	pt, _ := p.s.System.Part(v.Label)
	p.compSite = site{first: pt.First, before: pt.First - 1, after: pt.Last + 1}
	p.comp, p.compGoal = &v, gi
	// The root tolerance: 1e-12 of the bounds' size, far below any
	// bench adjustment and a few hundred rounding units of the value, so
	// that the finite differences of a compensated sensitivity are not
	// limited by it.
	p.xtol = 1e-12 * math.Max(math.Max(math.Abs(float64(v.Min)), math.Abs(float64(v.Max))), float64(v.Max-v.Min))
	// The wanted value, from the goal's target in the starting system.
	t, err := p.s.Goals[gi].Target(p.s.System)
	if err != nil {
		return bad("goal", errtext.Quote(c.Goal), "cannot be evaluated in the nominal design", err)
	}
	if t.Kind != target.KindNear && t.Kind != target.KindBetween {
		return bad("goal", errtext.Quote(c.Goal), "is an "+t.Kind.String()+" goal; a compensator restores a Near or Between goal to its wanted value", nil)
	}
	p.want = t.Want
	return nil
}

// measure evaluates every goal on sys: the values into vals and, when
// ts is not nil, the targets into ts. A goal that cannot be computed or
// is not finite is an error naming it.
func (p *plan) measure(sys paraxial.System, vals []float64, ts []target.Target) error {
	for i, g := range p.s.Goals {
		t, err := g.Target(sys)
		if err != nil {
			return err
		}
		if !finite(t.Value) {
			return &ParamError{Subject: "goal " + errtext.Quote(g.Name), Param: "value", Value: t.Value, Reason: "is not finite", Err: ErrTrial}
		}
		vals[i] = t.Value
		if ts != nil {
			ts[i] = t
		}
	}
	return nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// generic builds the system of one trial with errors x by the edits of
// package paraxial, and solves the compensator on it.
func (p *plan) generic(x []float64) (sys paraxial.System, comp float64, atLimit bool, err error) {
	sys, err = perturbSystem(p.s.System, p.s.Perturbations, x)
	if err != nil || p.comp == nil {
		return sys, math.NaN(), false, err
	}
	g := p.s.Goals[p.compGoal]
	v := *p.comp
	f := func(c float64) (float64, error) {
		s, err := v.Apply(sys, units.Length(c))
		if err != nil {
			return 0, err
		}
		t, err := g.Target(s)
		return t.Value - p.want, err
	}
	c, atLimit, err := p.solve(f)
	if err != nil {
		return paraxial.System{}, math.NaN(), false, err
	}
	sys, err = v.Apply(sys, units.Length(c))
	return sys, c, atLimit, err
}

// solve returns the compensator value at which f, the compensated goal's
// distance from its wanted value, is zero: Brent's root when f changes
// sign over the bounds, otherwise the bound where |f| is smaller, with
// atLimit set.
func (p *plan) solve(f func(float64) (float64, error)) (x float64, atLimit bool, err error) {
	lo, hi := float64(p.comp.Min), float64(p.comp.Max)
	subject := func() string { return "compensator " + p.comp.Name() } // only on failure: no allocation per build
	flo, err := f(lo)
	if err == nil && !finite(flo) {
		err = ErrTrial
	}
	if err != nil {
		return 0, false, &ParamError{Subject: subject(), Param: "value", Value: units.Length(lo), Reason: "the goal cannot be evaluated at the lower bound", Err: because(ErrTrial, err)}
	}
	fhi, err := f(hi)
	if err == nil && !finite(fhi) {
		err = ErrTrial
	}
	if err != nil {
		return 0, false, &ParamError{Subject: subject(), Param: "value", Value: units.Length(hi), Reason: "the goal cannot be evaluated at the upper bound", Err: because(ErrTrial, err)}
	}
	switch {
	case flo == 0:
		return lo, false, nil
	case fhi == 0:
		return hi, false, nil
	case (flo > 0) == (fhi > 0):
		if math.Abs(flo) <= math.Abs(fhi) {
			return lo, true, nil
		}
		return hi, true, nil
	}
	x, err = design.Root(f, lo, hi, p.xtol)
	if err != nil {
		return 0, false, &ParamError{Subject: subject(), Reason: "root search failed", Err: because(ErrTrial, err)}
	}
	return x, false, nil
}

// fastMeasures checks the study's fast measures and fills p.fast and
// p.in: a beam valid for the system, one measure per goal, and agreement
// with the goals' own measures in the nominal design and in a build with
// every error at +1σ (−1σ when that build cannot be made).
func (p *plan) fastMeasures(goals map[string]int) error {
	s := p.s
	if s.Beam == nil {
		return &ParamError{Param: "Beam", Reason: "is nil; the fast measures need the input beam", Err: ErrFast}
	}
	if _, err := beam.AtXY(s.System, s.Beam, 0); err != nil {
		return &ParamError{Param: "Beam", Reason: "does not fit the system", Err: because(ErrFast, err)}
	}
	switch b := s.Beam.(type) {
	case beam.Gaussian:
		p.in = beam.Astigmatic{X: b, Y: b}
	case beam.Astigmatic:
		p.in = b
	}
	p.fast = make([]Fast, len(s.Goals))
	var unknown []string
	for name, f := range s.Fast {
		i, ok := goals[name]
		if !ok {
			unknown = append(unknown, errtext.Quote(name))
			continue
		}
		if f == nil {
			return &ParamError{Subject: "goal " + errtext.Quote(name), Param: "fast measure", Reason: "is nil", Err: ErrFast}
		}
		p.fast[i] = f
	}
	if len(unknown) > 0 {
		slices.Sort(unknown)
		return &ParamError{Param: "Fast", Value: strings.Join(unknown, ", "), Reason: "names no goal of the study", Err: ErrFast}
	}
	for i, f := range p.fast {
		if f == nil {
			return &ParamError{Subject: "goal " + errtext.Quote(s.Goals[i].Name), Param: "fast measure", Reason: "is missing: give a fast measure for every goal, or none", Err: ErrFast}
		}
	}
	fe := newFastEval(p)
	n := len(s.Perturbations)
	probes := [][]float64{make([]float64, n)}
	for _, sign := range []float64{1, -1} {
		x := make([]float64, n)
		for j, q := range s.Perturbations {
			x[j] = sign * q.Dist.Sigma()
		}
		probes = append(probes, x)
	}
	gv := make([]float64, len(s.Goals))
	fv := make([]float64, len(s.Goals))
	for k, x := range probes {
		sys, gc, _, err := p.generic(x)
		if err == nil {
			err = p.measure(sys, gv, nil)
		}
		if err != nil {
			if k == 0 {
				return err
			}
			continue // +1σ cannot be built: try −1σ
		}
		fc, _, err := fe.trial(x, fv)
		if err != nil {
			return &ParamError{Param: "fast route", Reason: "fails where the system can be built", Err: because(ErrFast, err)}
		}
		where := "in the nominal design"
		if k > 0 {
			where = "with every error at " + []string{"", "+", "−"}[k] + "1σ"
		}
		for i := range gv {
			if !agree(fv[i], gv[i], s.Goals[i].Scale()) {
				u := p.nominal[i].Unit
				return &ParamError{Subject: "goal " + errtext.Quote(s.Goals[i].Name), Param: "fast measure value", Value: quantity(fv[i], u, 10),
					Reason: "differs from the goal's own measure (" + quantity(gv[i], u, 10) + ") " + where + ": give the fast form of the same measure, and the same beam", Err: ErrFast}
			}
		}
		if p.comp != nil && !agree(fc, gc, float64(p.comp.Max-p.comp.Min)) {
			return &ParamError{Subject: "compensator " + p.comp.Name(), Param: "fast route value", Value: units.Length(fc),
				Reason: "differs from the system's (" + units.Length(gc).String() + ") " + where, Err: ErrFast}
		}
		if k > 0 {
			break
		}
	}
	return nil
}

// agree reports whether a fast and a generic value are the same
// computation: within 1e-9 of their size or of the goal's scale. The two
// routes compose the same matrices in another order (whole products
// against element by element), which differs by rounding, ~1e-15
// relative; a different measure or beam differs by far more.
func agree(a, b, scale float64) bool {
	return math.Abs(a-b) <= 1e-9*(math.Abs(b)+math.Abs(scale))
}
