package tolerance

import (
	"cmp"
	"math"
	"slices"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// StepFraction sets the finite-difference step of [Study.Sensitivity]:
// h = StepFraction·σ of each perturbation's distribution. See the
// package documentation ("Sensitivity") for why a tenth of the tolerance.
const StepFraction = 0.1

// Sensitivity is the linear (first-order) tolerance analysis of a study:
// the slope of every goal against every error, and each goal's spread
// that the tolerances give when their effects add linearly.
type Sensitivity struct {
	// Goals names the goals and Units gives their SI units ("m",
	// "rad", ""); Nominal holds their values in the nominal design.
	Goals   []string
	Units   []string
	Nominal []float64
	// Parameters names the perturbations ([Perturbation.Name]), Kinds
	// gives their kinds, Tolerances their distributions and Steps the
	// step h used for each, in the perturbation's unit.
	Parameters []string
	Kinds      []Kind
	Tolerances []Distribution
	Steps      []float64
	// Slope[i][j] is ∂goal_i/∂error_j by central differences,
	//
	//	(g(+h) − g(−h)) / (2h)
	//
	// in SI units (metres of waist per metre of spacing, metres per unit
	// of relative focal error, metres per radian of tilt).
	Slope [][]float64
	// Curvature[i][j] is ∂²goal_i/∂error_j², (g(+h) − 2g(0) + g(−h))/h².
	Curvature [][]float64
	// Spread[i] is the linear estimate of goal i's standard deviation,
	// the root sum of squares of the contributions |Slope·σ|:
	//
	//	σ_i = √(Σ_j (Slope[i][j] σ_j)²)
	//
	// valid for independent errors whose effects are linear over their
	// range (the law of propagation of uncertainty, JCGM 100:2008, GUM,
	// eq. (10) [from memory]).
	Spread []float64
	// Shift[i] is the second-order estimate of the mean's offset from
	// the nominal value, ½ Σ_j Curvature[i][j] σ_j²: what a tilt of a lens
	// at normal incidence gives, whose slope is zero (its effects are
	// even in the angle).
	Shift []float64
}

// Sensitivity returns the slope of every goal against every error at the
// nominal design, by central differences with the step h = σ/10 of each
// tolerance ([StepFraction]), the compensator re-solved at each step as
// in a build, and each goal's linear spread (root sum of squares). It
// returns a *ParamError for an invalid study or a step at which the
// design cannot be built or measured.
func (s Study) Sensitivity() (Sensitivity, error) {
	p, err := s.plan()
	if err != nil {
		return Sensitivity{}, err
	}
	ng, np := len(s.Goals), len(s.Perturbations)
	out := Sensitivity{
		Goals: make([]string, ng), Units: make([]string, ng), Nominal: make([]float64, ng),
		Parameters: make([]string, np), Kinds: make([]Kind, np), Tolerances: make([]Distribution, np), Steps: make([]float64, np),
		Slope: make([][]float64, ng), Curvature: make([][]float64, ng), Spread: make([]float64, ng), Shift: make([]float64, ng),
	}
	for i, t := range p.nominal {
		out.Goals[i], out.Units[i], out.Nominal[i] = t.Name, t.Unit, t.Value
		out.Slope[i], out.Curvature[i] = make([]float64, np), make([]float64, np)
	}
	ev := genericEval{p}
	x := make([]float64, np)
	plus, minus := make([]float64, ng), make([]float64, ng)
	for j, q := range s.Perturbations {
		sigma := q.Dist.Sigma()
		h := StepFraction * sigma
		out.Parameters[j], out.Kinds[j], out.Tolerances[j], out.Steps[j] = q.Name(), q.Kind, q.Dist, h
		for k, sign := range []float64{1, -1} {
			x[j] = sign * h
			vals := plus
			if k == 1 {
				vals = minus
			}
			if _, _, err := ev.trial(x, vals); err != nil {
				return Sensitivity{}, q.fail("step", q.Dist.value(x[j]), "the design cannot be evaluated a tenth of the tolerance away from nominal", err)
			}
		}
		x[j] = 0
		for i := range ng {
			g0 := out.Nominal[i]
			out.Slope[i][j] = (plus[i] - minus[i]) / (2 * h)
			out.Curvature[i][j] = (plus[i] - 2*g0 + minus[i]) / (h * h)
			c := out.Slope[i][j] * sigma
			out.Spread[i] += c * c
			out.Shift[i] += 0.5 * out.Curvature[i][j] * sigma * sigma
		}
	}
	for i := range out.Spread {
		out.Spread[i] = math.Sqrt(out.Spread[i])
	}
	return out, nil
}

// displayUnit returns the unit (SI per unit) and symbol in which the
// sensitivity tables show a goal of SI unit u whose spread is about mag:
// nm, µm, mm or m for lengths, µrad, mrad or rad for angles.
func displayUnit(u string, mag float64) (float64, string) {
	mag = math.Abs(mag)
	switch u {
	case "m":
		switch {
		case mag == 0 || !finite(mag):
			return 1e-3, "mm"
		case mag < 1e-6:
			return 1e-9, "nm"
		case mag < 1e-3:
			return 1e-6, "µm"
		case mag < 1:
			return 1e-3, "mm"
		}
		return 1, "m"
	case "rad":
		switch {
		case mag == 0 || !finite(mag) || mag < 1e-3:
			return 1e-6, "µrad"
		case mag < 1:
			return 1e-3, "mrad"
		}
		return 1, "rad"
	}
	return 1, ""
}

// paramUnit returns the unit in which an error of kind k is counted in
// the tables: a millimetre of placement or spacing, a per cent of focal
// length, a milliradian of tilt.
func paramUnit(k Kind) (float64, string) {
	switch k {
	case KindPlacement, KindSpacing:
		return 1e-3, "mm"
	case KindFocal:
		return 0.01, "%"
	}
	return 1e-3, "mrad"
}

// quantity formats v of SI unit u with n significant digits in the unit
// that suits it.
func quantity(v float64, u string, n int) string {
	switch u {
	case "m":
		return table.LengthSig(units.Length(v), n)
	case "rad":
		return table.AngleSig(units.Angle(v), n)
	}
	return table.Sig(v, n)
}

// goalScale returns the display unit of goal i: from its spread and
// largest contribution.
func (s Sensitivity) goalScale(i int) (float64, string) {
	m := s.Spread[i]
	for j := range s.Parameters {
		m = math.Max(m, math.Abs(s.Slope[i][j]*s.Tolerances[j].Sigma()))
	}
	if m == 0 {
		m = math.Abs(s.Nominal[i])
	}
	return displayUnit(s.Units[i], m)
}

// roundingFloor is the size, relative to a goal's nominal value, below
// which a contribution |slope·σ| is rounding noise of the differences
// (a few rounding units of the goal over a step of σ/10 give ~1e-14 of
// it; a long path may lose a hundred units more): the tables show 0.
const roundingFloor = 1e-11

// shown returns the slope the tables show: 0 when its contribution is
// below the rounding floor.
func (s Sensitivity) shown(i, j int) float64 {
	if math.Abs(s.Slope[i][j]*s.Tolerances[j].Sigma()) <= roundingFloor*math.Abs(s.Nominal[i]) {
		return 0
	}
	return s.Slope[i][j]
}

// Table returns the sensitivities, one row per goal and one column per
// error: the change of the goal per millimetre of placement or spacing,
// per per cent of focal length, per milliradian of tilt ("12.5 µm/mm"),
// then the goal's linear spread σ (root sum of squares) and the
// second-order shift of its mean. A slope whose contribution |slope·σ|
// is below 1e-11 of the goal's value, rounding noise of the differences,
// shows as 0.
func (s Sensitivity) Table() table.Table {
	t := table.Table{
		Caption: "Sensitivity of each goal to each error (central differences, step σ/10); linear spread σ = √Σ(slope·σ_error)²",
		Header:  []string{"goal", "nominal"},
	}
	for j, name := range s.Parameters {
		t.Header = append(t.Header, name+" ("+s.Tolerances[j].String()+")")
	}
	t.Header = append(t.Header, "linear σ", "mean shift (2nd order)")
	for i, g := range s.Goals {
		gs, gsym := s.goalScale(i)
		row := []string{g, quantity(s.Nominal[i], s.Units[i], 6)}
		for j := range s.Parameters {
			ps, psym := paramUnit(s.Kinds[j])
			v := s.shown(i, j) * ps / gs
			unit := gsym + "/" + psym
			if gsym == "" {
				unit = "per " + psym
			}
			row = append(row, table.Sig(v, 3)+" "+unit)
		}
		sp := table.Sig(s.Spread[i]/gs, 3)
		sh := table.Sig(s.Shift[i]/gs, 3)
		if gsym != "" {
			sp, sh = sp+" "+gsym, sh+" "+gsym
		}
		row = append(row, sp, sh)
		t.Rows = append(t.Rows, row)
	}
	return t
}

// Budget returns the error budget: for every goal and error the
// contribution |slope·σ| to the goal's spread and its share of the
// variance, one row per pair, the largest first within each goal, so
// that the tolerance to tighten stands on top.
func (s Sensitivity) Budget() table.Table {
	t := table.Table{
		Caption: "Error budget: each error's contribution to each goal's linear spread",
		Header:  []string{"goal", "error", "tolerance", "contribution σ", "share of variance (%)"},
	}
	for i, g := range s.Goals {
		gs, gsym := s.goalScale(i)
		idx := make([]int, len(s.Parameters))
		c := make([]float64, len(s.Parameters))
		for j := range idx {
			idx[j], c[j] = j, math.Abs(s.shown(i, j)*s.Tolerances[j].Sigma())
		}
		// Largest first; ties keep the study's order.
		slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(c[b], c[a]) })
		v := s.Spread[i] * s.Spread[i]
		for _, j := range idx {
			share := "0"
			if v > 0 {
				share = table.Sig(100*c[j]*c[j]/v, 3)
			}
			cs := table.Sig(c[j]/gs, 3)
			if gsym != "" {
				cs += " " + gsym
			}
			t.Rows = append(t.Rows, []string{g, s.Parameters[j], s.Tolerances[j].String(), cs, share})
		}
	}
	return t
}

// String returns the sensitivity table as text.
func (s Sensitivity) String() string { return s.Table().Text() }
