// Package target states what a design must achieve, next to the
// computation that checks it, so that a design log says loudly when a
// design no longer meets its targets.
//
// A target has a name, the computed value, the wanted value or range and
// the unit, which comes from the Go type of the values (a [units.Length],
// a [units.Angle], or a float64 for a plain number such as a
// magnification or a transmission fraction): value and wanted range must
// have the same type, so a target cannot mix units.
//
//	t := target.Near("expander output radius", w, 2*units.Millimeter, 0.1*units.Millimeter)
//	fmt.Println(t)        // target expander output radius: 2.031 mm (wanted 2 ± 0.1 mm): met
//	if err := t.Err(); err != nil { … }
//
// In a notebook, nb.Show(t) draws the mark and records the target in the
// executed notebook, where the re-run collects it. A target never stops a
// computation: it reports.
package target

import (
	"errors"
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Quantity is the type of a target's values: a length (metres), an angle
// (radians) or a plain number.
type Quantity interface {
	units.Length | units.Angle | float64
}

// Kind is the form of a target's wanted range.
type Kind int

// The kinds of target.
const (
	KindNear    Kind = iota // |value − want| ≤ tol
	KindBetween             // lo ≤ value ≤ hi
	KindAtLeast             // value ≥ lo
	KindAtMost              // value ≤ hi
)

// String returns "near", "between", "at least" or "at most".
func (k Kind) String() string {
	switch k {
	case KindNear:
		return "near"
	case KindBetween:
		return "between"
	case KindAtLeast:
		return "at least"
	case KindAtMost:
		return "at most"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// Target is one design target and the value computed for it. Values are
// in SI units (metres, radians) or plain numbers, as Unit says. Make one
// with [Near], [Between], [AtLeast] or [AtMost].
type Target struct {
	// Name says what the value is, for example "relay working distance".
	Name string
	// Kind is the form of the wanted range.
	Kind Kind
	// Unit is the SI unit of the values: "m", "rad" or "" (a plain
	// number).
	Unit string
	// Value is the computed value.
	Value float64
	// Lo and Hi bound the wanted range (−Inf or +Inf on an open side). A
	// [KindNear] target has Lo = Want − Tol and Hi = Want + Tol.
	Lo, Hi float64
	// Want and Tol are the wanted value and the tolerance of a
	// [KindNear] target; for [KindBetween] the middle and half-width of
	// the range; NaN and 0 for a one-sided target. Tol is also how far
	// the value may move between two runs before the re-run lists it as
	// moved (a one-sided target: any change of its recorded digits).
	Want, Tol float64
	// invalid says why the target itself is wrong (a negative
	// tolerance, an empty range, a non-finite limit); "" if it is not.
	invalid string
}

// ErrMissed is the error of a target whose value lies outside its wanted
// range; ErrInvalid of a target whose wanted range is itself wrong (a
// negative tolerance, an empty range, a non-finite limit) or whose value
// is not a finite number.
var (
	ErrMissed  = errors.New("target: missed")
	ErrInvalid = errors.New("target: invalid")
)

// Error is the error of a target that is not met: it names the target
// and says by how much it missed, in the target's unit.
type Error struct {
	Target Target
}

// Error returns the text line of the target (see [Target.String]).
func (e *Error) Error() string { return e.Target.String() }

// Unwrap returns [ErrMissed] or [ErrInvalid].
func (e *Error) Unwrap() error {
	if e.Target.invalid != "" {
		return ErrInvalid
	}
	return ErrMissed
}

func unitOf[Q Quantity]() string {
	var q Q
	switch any(q).(type) {
	case units.Length:
		return "m"
	case units.Angle:
		return "rad"
	}
	return ""
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Near states that value must lie within tol of want: |value − want| ≤ tol
// (tol ≥ 0, both finite).
func Near[Q Quantity](name string, value, want, tol Q) Target {
	w, d := float64(want), float64(tol)
	t := Target{Name: name, Kind: KindNear, Unit: unitOf[Q](), Value: float64(value), Want: w, Tol: d, Lo: w - d, Hi: w + d}
	switch {
	case !finite(w):
		t.invalid = "wanted value " + t.format(w) + " is not finite"
	case !finite(d) || d < 0:
		t.invalid = "tolerance " + t.format(d) + " must be finite and ≥ 0"
	}
	return t
}

// Between states that value must lie in [lo, hi] (lo ≤ hi, both finite).
func Between[Q Quantity](name string, value, lo, hi Q) Target {
	l, h := float64(lo), float64(hi)
	t := Target{Name: name, Kind: KindBetween, Unit: unitOf[Q](), Value: float64(value), Lo: l, Hi: h, Want: l + (h-l)/2, Tol: (h - l) / 2}
	if !finite(l) || !finite(h) || !(l <= h) {
		t.invalid = "range " + t.format(l) + " … " + t.format(h) + " must be finite with lo ≤ hi"
	}
	return t
}

// AtLeast states that value must be at least min (finite).
func AtLeast[Q Quantity](name string, value, min Q) Target {
	t := Target{Name: name, Kind: KindAtLeast, Unit: unitOf[Q](), Value: float64(value), Lo: float64(min), Hi: math.Inf(1), Want: math.NaN()}
	if !finite(t.Lo) {
		t.invalid = "lower limit " + t.format(t.Lo) + " is not finite"
	}
	return t
}

// AtMost states that value must be at most max (finite).
func AtMost[Q Quantity](name string, value, max Q) Target {
	t := Target{Name: name, Kind: KindAtMost, Unit: unitOf[Q](), Value: float64(value), Lo: math.Inf(-1), Hi: float64(max), Want: math.NaN()}
	if !finite(t.Hi) {
		t.invalid = "upper limit " + t.format(t.Hi) + " is not finite"
	}
	return t
}

// Met reports whether the target is valid, its value finite, and the value
// inside the wanted range. The range includes its edges, widened by the
// rounding of the limits (1e-12 of the largest magnitude involved), so
// that 2.1 mm meets 2 ± 0.1 mm although 2 mm + 0.1 mm rounds below 2.1 mm.
func (t Target) Met() bool {
	return t.invalid == "" && finite(t.Value) && t.Miss() == 0
}

// slack is the rounding allowance of the range edges (see [Target.Met]).
func (t Target) slack() float64 { return 1e-12 * t.maxAbs() }

// Miss returns by how much the value lies outside the wanted range, in the
// target's unit: positive above Hi, negative below Lo, 0 inside (and NaN
// for an invalid target or a non-finite value).
func (t Target) Miss() float64 {
	switch {
	case t.invalid != "" || !finite(t.Value):
		return math.NaN()
	case t.Value > t.Hi+t.slack():
		return t.Value - t.Hi
	case t.Value < t.Lo-t.slack():
		return t.Value - t.Lo
	}
	return 0
}

// Err returns nil for a met target and otherwise an [*Error] naming the
// target and saying by how much it missed (or why it is invalid).
func (t Target) Err() error {
	if t.Met() {
		return nil
	}
	return &Error{Target: t}
}

// Problem returns why the target is not met, "" when it is: "is 0.21 mm
// above the range", "is 0.006 (0.61 %) below the limit" (a plain number:
// also relative to the edge missed), "value NaN is not a finite number",
// or why its wanted range is invalid.
func (t Target) Problem() string {
	switch {
	case t.invalid != "":
		return "invalid target: " + t.invalid
	case !finite(t.Value):
		return "value " + t.format(t.Value) + " is not a finite number"
	case t.Met():
		return ""
	}
	miss := t.Miss()
	where := "range"
	if t.Kind == KindAtLeast || t.Kind == KindAtMost {
		where = "limit"
	}
	side := "above"
	if miss < 0 {
		side = "below"
	}
	s := "is " + t.format(math.Abs(miss))
	// A plain number also relative to the edge it missed.
	edge := t.Hi
	if miss < 0 {
		edge = t.Lo
	}
	if t.Unit == "" && edge != 0 {
		s += " (" + table.Sig(100*math.Abs(miss/edge), 2) + " %)"
	}
	return s + " " + side + " the " + where
}

// Wanted describes the wanted range in the target's unit: "2 ± 0.1 mm",
// "20 … 30 mm", "≥ 0.99", "≤ 50 µm".
func (t Target) Wanted() string {
	switch t.Kind {
	case KindNear:
		return t.number(t.Want) + " ± " + t.format(t.Tol)
	case KindBetween:
		return t.number(t.Lo) + " … " + t.format(t.Hi)
	case KindAtLeast:
		return "≥ " + t.format(t.Lo)
	}
	return "≤ " + t.format(t.Hi)
}

// ToleranceText returns the tolerance in the target's display unit ("0.1
// mm"): the half-width of a range; "" for a one-sided target, which has
// none.
func (t Target) ToleranceText() string {
	if t.Kind == KindAtLeast || t.Kind == KindAtMost {
		return ""
	}
	return t.format(t.Tol)
}

// ValueText returns the computed value in the target's display unit with
// the digits the record keeps, for example "2.0312 mm".
func (t Target) ValueText() string { return t.format(t.Value) }

// String returns the target's text line: "target <name>: <value> (wanted
// <range>): met", or "…: MISSED: <problem>".
func (t Target) String() string {
	s := "target " + t.Name + ": " + t.ValueText() + " (wanted " + t.Wanted() + "): "
	if t.Met() {
		return s + "met"
	}
	return s + "MISSED: " + t.Problem()
}

// Digits is the number of significant digits of a target's value in its
// text, its mark and its record line.
const Digits = 6

// displayUnit returns the unit a target's values are shown in and its
// symbol: for lengths, the one table.LengthUnit chooses for the wanted
// range (or the value, for a one-sided target), so that value and range
// read in one unit; for angles mrad below 1 rad; nothing for a plain
// number.
func (t Target) displayUnit() (float64, string) {
	switch t.Unit {
	case "m":
		var ref []units.Length
		for _, v := range []float64{t.Lo, t.Hi, t.Value} {
			if finite(v) {
				ref = append(ref, units.Length(v))
			}
		}
		u, sym := table.LengthUnit(ref...)
		if u == units.Micrometer && t.maxAbs() < 1e-6 {
			return float64(units.Nanometer), "nm"
		}
		return float64(u), sym
	case "rad":
		if t.maxAbs() < 1 {
			return float64(units.Milliradian), "mrad"
		}
		return 1, "rad"
	}
	return 1, ""
}

func (t Target) maxAbs() float64 {
	m := 0.0
	for _, v := range []float64{t.Lo, t.Hi, t.Value} {
		if finite(v) {
			m = math.Max(m, math.Abs(v))
		}
	}
	return m
}

// number formats v in the display unit without the unit symbol.
func (t Target) number(v float64) string {
	u, _ := t.displayUnit()
	if !finite(v) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	return table.Sig(v/u, Digits)
}

// format formats v in the display unit with its symbol.
func (t Target) format(v float64) string {
	_, sym := t.displayUnit()
	s := t.number(v)
	if sym != "" {
		s += " " + sym
	}
	return strings.TrimSpace(s)
}
