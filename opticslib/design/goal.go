package design

import (
	"errors"
	"math"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/target"
)

// Measure computes one value of a system: a length in metres, an angle in
// radians or a plain number. The measures of this package ([WaistRadius],
// [WaistZ], [Divergence], [ImageZ], [TotalLength], [MinTransmission],
// [Coupling], …) cover the usual goals; any function of this form can be
// one.
type Measure[Q target.Quantity] func(sys paraxial.System) (Q, error)

// Goal is one requirement on a design: a measured value and its wanted
// range, with a weight and a residual scale. Make one with [Near],
// [Between], [AtLeast] or [AtMost].
type Goal struct {
	// Name says what is measured, for example "output waist radius"; it
	// names the goal's target and its errors.
	Name string
	// Weight multiplies the goal's squared residual in the cost (≥ 0,
	// finite; set with [Goal.WithWeight], 1 by default).
	Weight float64
	// check measures the system and states the target.
	check func(sys paraxial.System) (target.Target, error)
	// scale is the residual scale in SI units (> 0).
	scale float64
	// spec is the goal's target for the value zero: its kind, unit and
	// wanted range, known without measuring a system.
	spec target.Target
}

func goal[Q target.Quantity](name string, m Measure[Q], scale float64, state func(v Q) target.Target) Goal {
	return Goal{Name: name, Weight: 1, scale: scale, spec: state(0), check: func(sys paraxial.System) (target.Target, error) {
		if m == nil {
			return target.Target{}, &ParamError{Subject: "goal " + errtext.Quote(name), Reason: "has no measure (nil)"}
		}
		v, err := m(sys)
		if err != nil {
			return target.Target{}, &ParamError{Subject: "goal " + errtext.Quote(name), Err: errors.Join(ErrGoal, err)}
		}
		return state(v), nil
	}}
}

// scaleOf returns a positive residual scale: s if it is positive and
// finite, otherwise the magnitude of ref, otherwise 1 (a plain number or a
// limit of zero).
func scaleOf(s, ref float64) float64 {
	switch {
	case s > 0 && !math.IsInf(s, 0):
		return s
	case ref != 0 && !math.IsNaN(ref) && !math.IsInf(ref, 0):
		return math.Abs(ref)
	}
	return 1
}

// Near states that the measured value must lie within tol of want
// (|value − want| ≤ tol, tol ≥ 0). The residual scale is tol (|want| when
// tol is 0).
func Near[Q target.Quantity](name string, m Measure[Q], want, tol Q) Goal {
	return goal(name, m, scaleOf(float64(tol), float64(want)), func(v Q) target.Target { return target.Near(name, v, want, tol) })
}

// Between states that the measured value must lie in [lo, hi]. The
// residual scale is the half-width (hi − lo)/2.
func Between[Q target.Quantity](name string, m Measure[Q], lo, hi Q) Goal {
	return goal(name, m, scaleOf(float64(hi-lo)/2, float64(hi)), func(v Q) target.Target { return target.Between(name, v, lo, hi) })
}

// AtLeast states that the measured value must be at least min. The
// residual scale is |min| (1 for min = 0).
func AtLeast[Q target.Quantity](name string, m Measure[Q], min Q) Goal {
	return goal(name, m, scaleOf(0, float64(min)), func(v Q) target.Target { return target.AtLeast(name, v, min) })
}

// AtMost states that the measured value must be at most max. The residual
// scale is |max| (1 for max = 0).
func AtMost[Q target.Quantity](name string, m Measure[Q], max Q) Goal {
	return goal(name, m, scaleOf(0, float64(max)), func(v Q) target.Target { return target.AtMost(name, v, max) })
}

// WithWeight returns g with weight w (≥ 0, finite; checked by
// [Problem.Validate]).
func (g Goal) WithWeight(w float64) Goal { g.Weight = w; return g }

// WithScale returns g with the residual scale s in the goal's SI unit
// (> 0, finite; other values keep the default).
func (g Goal) WithScale(s float64) Goal {
	if s > 0 && !math.IsInf(s, 0) {
		g.scale = s
	}
	return g
}

// Scale returns the goal's residual scale in its SI unit: the residual is
// Miss/Scale ([target.Target.Miss]).
func (g Goal) Scale() float64 { return g.scale }

// Target measures sys and returns the goal's target: the value with its
// wanted range. It returns a *ParamError naming the goal, wrapping
// [ErrGoal] and the measure's error, when the value cannot be computed.
func (g Goal) Target(sys paraxial.System) (target.Target, error) {
	if g.check == nil {
		return target.Target{}, &ParamError{Subject: "goal " + errtext.Quote(g.Name), Reason: "was not made with Near, Between, AtLeast or AtMost"}
	}
	return g.check(sys)
}

// Residual returns how far t misses its wanted range in units of the
// goal's scale, signed (positive above the range, negative below, zero
// inside). It is NaN for an invalid target or a non-finite value.
func (g Goal) Residual(t target.Target) float64 { return t.Miss() / g.scale }

// Range returns the goal's wanted range [lo, hi] in its SI unit ([Goal.Unit]):
// want ∓ tol for a Near goal, [lo, hi] for Between, [min, +Inf] for AtLeast
// and [−Inf, max] for AtMost. A goal not made by this package's
// constructors gives NaN, NaN.
func (g Goal) Range() (lo, hi float64) {
	if g.check == nil {
		return math.NaN(), math.NaN()
	}
	return g.spec.Lo, g.spec.Hi
}

// Unit returns the SI unit of the goal's values: "m" for a length, "rad"
// for an angle, "" for a plain number.
func (g Goal) Unit() string { return g.spec.Unit }

// Kind returns the form of the goal's wanted range (near, between, at
// least, at most).
func (g Goal) Kind() target.Kind { return g.spec.Kind }

// Wanted describes the goal's wanted range as its targets show it ("2 ±
// 0.1 mm", "≥ 0.99"; [target.Target.Wanted]).
func (g Goal) Wanted() string { return g.spec.Wanted() }

// aim returns the value a root search for the goal aims at, in SI units:
// the wanted value of a Near goal, the middle of a Between goal's range,
// the limit of a one-sided goal.
func (g Goal) aim() float64 {
	switch g.spec.Kind {
	case target.KindAtLeast:
		return g.spec.Lo
	case target.KindAtMost:
		return g.spec.Hi
	}
	return g.spec.Want
}

// centred returns the residual of t measured from the aim of the goal
// (signed, in units of the goal's scale) for a Near or Between goal, and
// the ordinary residual ([Goal.Residual]) for a one-sided goal: zero only
// at the centre of a two-sided range.
func (g Goal) centred(t target.Target) float64 {
	if t.Kind == target.KindNear || t.Kind == target.KindBetween {
		if !t.Met() && math.IsNaN(t.Miss()) {
			return math.NaN()
		}
		return (t.Value - t.Want) / g.scale
	}
	return g.Residual(t)
}
