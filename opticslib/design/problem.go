package design

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Problem is a design to solve: a starting system, the variables that may
// change and the goals it must meet.
type Problem struct {
	System    paraxial.System
	Variables []Variable
	Goals     []Goal
}

// Validate checks every variable against the system ([Variable.Validate]),
// that no two variables set the same value, and every goal's weight (≥ 0,
// finite) and measure.
func (p Problem) Validate() error {
	if p.System.Len() == 0 {
		return &ParamError{Param: "system", Reason: "is empty or not built", Err: paraxial.ErrNotBuilt}
	}
	seen := map[string]bool{}
	for _, v := range p.Variables {
		if err := v.Validate(p.System); err != nil {
			return err
		}
		if seen[v.Name()] {
			return v.fail("", nil, "is given twice", nil)
		}
		seen[v.Name()] = true
	}
	if len(p.Goals) == 0 {
		return &ParamError{Param: "goals", Reason: "none given"}
	}
	for _, g := range p.Goals {
		if g.check == nil {
			return &ParamError{Subject: "goal " + errtext.Quote(g.Name), Reason: "was not made with Near, Between, AtLeast or AtMost"}
		}
		if !(g.Weight >= 0) || math.IsInf(g.Weight, 0) {
			return &ParamError{Subject: "goal " + errtext.Quote(g.Name), Param: "weight", Value: g.Weight, Reason: "must be ≥ 0 and finite"}
		}
	}
	return nil
}

// Start returns the variables' values in the starting system, each moved
// into its bounds.
func (p Problem) Start() ([]units.Length, error) {
	x := make([]units.Length, len(p.Variables))
	for i, v := range p.Variables {
		c, err := v.Current(p.System)
		if err != nil {
			return nil, err
		}
		x[i] = min(max(c, v.Min), v.Max)
	}
	return x, nil
}

// Apply returns the starting system with the variables set to x (metres,
// one value per variable, in order). It returns a *ParamError naming the
// variable for a value outside its bounds (wrapping [ErrBounds]) or an
// edit that fails.
func (p Problem) Apply(x []units.Length) (paraxial.System, error) {
	if len(x) != len(p.Variables) {
		return paraxial.System{}, &ParamError{Param: "number of values", Value: len(x), Reason: "must equal the number of variables (" + strconv.Itoa(len(p.Variables)) + ")"}
	}
	sys := p.System
	for i, v := range p.Variables {
		if !(x[i] >= v.Min && x[i] <= v.Max) {
			return paraxial.System{}, v.fail("value", x[i], "lies outside the bounds ["+v.Min.String()+", "+v.Max.String()+"]", ErrBounds)
		}
		var err error
		if sys, err = v.Apply(sys, x[i]); err != nil {
			return paraxial.System{}, err
		}
	}
	return sys, nil
}

// Evaluation is a system judged against the goals of a [Problem].
type Evaluation struct {
	// Targets holds each goal's target (value and wanted range), in the
	// order of the goals: show them to record the design.
	Targets []target.Target
	// Residuals holds each goal's signed residual (Miss/Scale, 0 when
	// met).
	Residuals []float64
	// Cost is Σ wᵢ rᵢ², zero exactly when every goal is met.
	Cost float64
}

// Evaluate measures sys against every goal. It returns a *ParamError
// naming the first goal whose value cannot be computed (wrapping
// [ErrGoal]) or whose target is invalid or not finite.
func (p Problem) Evaluate(sys paraxial.System) (Evaluation, error) {
	e := Evaluation{Targets: make([]target.Target, len(p.Goals)), Residuals: make([]float64, len(p.Goals))}
	for i, g := range p.Goals {
		t, err := g.Target(sys)
		if err != nil {
			return Evaluation{}, err
		}
		r := g.Residual(t)
		if math.IsNaN(r) || math.IsInf(r, 0) {
			return Evaluation{}, &ParamError{Subject: "goal " + errtext.Quote(g.Name), Param: "value", Value: t.ValueText(), Reason: t.Problem(), Err: ErrNotFinite}
		}
		e.Targets[i], e.Residuals[i] = t, r
		e.Cost += g.Weight * r * r
	}
	return e, nil
}

// Met reports whether every goal is met.
func (e Evaluation) Met() bool {
	for _, t := range e.Targets {
		if !t.Met() {
			return false
		}
	}
	return len(e.Targets) > 0
}

// Table returns one row per goal: value, wanted range, residual and
// whether it is met, and the cost in the caption.
func (e Evaluation) Table() table.Table {
	t := table.Table{
		Caption: "Goals (cost Σ w r² = " + table.Sig(e.Cost, 4) + ")",
		Header:  []string{"goal", "value", "wanted", "residual", "met"},
	}
	for i, tg := range e.Targets {
		met := "yes"
		if !tg.Met() {
			met = "NO: " + tg.Problem()
		}
		t.Rows = append(t.Rows, []string{tg.Name, tg.ValueText(), tg.Wanted(), table.Sig(e.Residuals[i], 3), met})
	}
	return t
}

// String returns the table as text.
func (e Evaluation) String() string { return e.Table().Text() }
