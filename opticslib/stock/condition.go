package stock

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

type conditionKind int

const (
	condCollimate conditionKind = iota + 1
	condWaistAt
	condWaistSize
)

// Condition is a condition a [Search] solves a spacing for: a property of
// the beam leaving the last lens, which the last gap sets through S. A.
// Self's thin-lens equation in closed form (Self, "Focusing of spherical
// Gaussian beams", Appl. Opt. 22, 658–661 (1983)). Make one with
// [Collimate], [WaistAt] or [WaistSize]; each is also a design goal
// ([Condition.Goal]), so that every candidate's targets state it.
type Condition struct {
	kind       conditionKind
	value, tol float64
}

// Collimate is the condition that the beam leaves the last lens
// collimated: its waist lies in the last lens's back focal plane, which
// makes the output waist the largest the last gap can give and the
// divergence the smallest (Self 1983; the intermediate waist then lies in
// the last lens's front focal plane). The measured value is the waist's
// offset from the back focal plane in output Rayleigh ranges,
// [CollimationOffset]; tol (> 0) is how far it may lie. At tol = 0.1 the
// beam radius at the back focal plane is within 0.5 % of the waist.
func Collimate(tol float64) Condition { return Condition{kind: condCollimate, tol: tol} }

// WaistAt is the condition that the output waist lies z (metres, > 0)
// after the last lens, within tol (metres, > 0): a focusing goal, such
// as a focus on a sample or a fibre face at z. Self's waist distance has a
// maximum f + f²/(2zR), so a lens pair may have two solutions or none.
func WaistAt(z, tol units.Length) Condition {
	return Condition{kind: condWaistAt, value: float64(z), tol: float64(tol)}
}

// WaistSize is the condition that the output waist radius (1/e²) is w
// (metres, > 0) within tol (metres, > 0). With [Collimate] it makes a
// three-lens expander of exactly the wanted size (two spacings, two
// conditions).
func WaistSize(w, tol units.Length) Condition {
	return Condition{kind: condWaistSize, value: float64(w), tol: float64(tol)}
}

// name returns the condition's goal name with the last lens labelled
// last.
func (c Condition) name(last string) string {
	switch c.kind {
	case condCollimate:
		return "collimation"
	case condWaistAt:
		return "waist after " + last
	case condWaistSize:
		return "output waist"
	}
	return "condition"
}

// String describes the condition: "collimated (waist within ±0.1 zR of
// the back focal plane)", "waist 150 mm ± 1 mm after the last lens",
// "output waist 3 mm ± 0.05 mm".
func (c Condition) String() string {
	tol := strconv.FormatFloat(c.tol, 'g', 4, 64)
	switch c.kind {
	case condCollimate:
		return "collimated (waist within ±" + tol + " zR of the back focal plane)"
	case condWaistAt:
		return "waist " + units.Length(c.value).String() + " ± " + units.Length(c.tol).String() + " after the last lens"
	case condWaistSize:
		return "output waist " + units.Length(c.value).String() + " ± " + units.Length(c.tol).String()
	}
	return "Condition{} (make one with Collimate, WaistAt or WaistSize)"
}

func (c Condition) validate(i int) error {
	where := "search: condition " + strconv.Itoa(i+1) + " (" + errtext.Quote(c.name("L")) + ")"
	if c.kind < condCollimate || c.kind > condWaistSize {
		return &ParamError{Where: "search", Param: "Solve[" + strconv.Itoa(i) + "]", Reason: "is the zero Condition; make one with Collimate, WaistAt or WaistSize", Err: ErrInput}
	}
	if !(c.tol > 0) || math.IsInf(c.tol, 0) {
		var v any = c.tol
		if c.kind != condCollimate {
			v = units.Length(c.tol)
		}
		return &ParamError{Where: where, Param: "tolerance", Value: v, Reason: "must be positive and finite", Err: ErrInput}
	}
	if c.kind != condCollimate && (!(c.value > 0) || math.IsInf(c.value, 0)) {
		return &ParamError{Where: where, Param: "value", Value: units.Length(c.value), Reason: "must be positive and finite", Err: ErrInput}
	}
	return nil
}

// Goal returns the condition as a design goal on a system whose last lens
// is labelled last, for the beam in: Near([CollimationOffset](in, last),
// 0, tol), Near(design.WaistAfter(in, last), z, tol) or
// Near(design.WaistRadius(in), w, tol).
func (c Condition) Goal(in beam.Input, last string) design.Goal {
	switch c.kind {
	case condCollimate:
		return design.Near(c.name(last), CollimationOffset(in, last), 0, c.tol)
	case condWaistAt:
		return design.Near(c.name(last), design.WaistAfter(in, last), units.Length(c.value), units.Length(c.tol))
	}
	return design.Near(c.name(last), design.WaistRadius(in), units.Length(c.value), units.Length(c.tol))
}

// miss returns the condition's signed miss from its aim for the beam q
// just after the last lens (focal length f, metres), with the effective
// wavelength lam = M²λ0/n: in the unit of the condition's tolerance.
func (c Condition) miss(q complex128, f, lam float64) float64 {
	switch c.kind {
	case condCollimate:
		return (-real(q) - f) / imag(q)
	case condWaistAt:
		return -real(q) - c.value
	}
	return math.Sqrt(lam*imag(q)/math.Pi) - c.value
}

// lastGap returns the spacings d from the lens before the last one to the
// last lens (focal length f) that meet the condition, for the beam q just
// after the lens before: the intermediate waist lies s″ = −Re q after
// that lens with Rayleigh range zR = Im q, at s = d − s″ before the last
// lens, and Self's thin-lens equation
//
//	s′ − f = u f² / (u² + zR²),   m² = f² / (u² + zR²),   u = s − f,
//
// gives the output waist distance s′ and magnification m in closed form;
// each condition is solved for u. Branch k (0 or 1) of a two-root
// condition is continuous in the beam q; ok is false where it does not
// exist.
func (c Condition) lastGap(q complex128, f, lam float64, k int) (d float64, ok bool) {
	s2, zR := -real(q), imag(q)
	var u float64
	switch c.kind {
	case condCollimate:
		if k != 0 {
			return 0, false
		}
		u = 0
	case condWaistAt:
		// (z − f) u² − f² u + (z − f) zR² = 0.
		a := c.value - f
		if a == 0 {
			if k != 0 {
				return 0, false
			}
			u = 0
			break
		}
		disc := f*f*f*f - 4*a*a*zR*zR
		if disc < 0 {
			return 0, false
		}
		qd := f*f + math.Sqrt(disc)
		if k == 0 {
			u = qd / (2 * a)
		} else {
			u = 2 * a * zR * zR / qd
		}
	case condWaistSize:
		// Output Rayleigh range zRt = π w²/lam = m² zR.
		zRt := math.Pi * c.value * c.value / lam
		u2 := f*f*zR/zRt - zR*zR
		if u2 < 0 {
			return 0, false
		}
		u = math.Sqrt(u2)
		if k == 1 {
			u = -u
		}
	}
	d = u + f + s2
	return d, !math.IsNaN(d) && !math.IsInf(d, 0)
}

// branches is the number of branches of lastGap.
func (c Condition) branches() int {
	if c.kind == condCollimate {
		return 1
	}
	return 2
}

// CollimationOffset measures how far the last waist of the beam in lies
// from the back focal plane of the thin lens labelled label, in the
// waist's Rayleigh ranges:
//
//	(s′ − f) / zR′
//
// with s′ the lens-to-waist distance ([design.WaistAfter]), f the lens's
// focal length and zR′ the output Rayleigh range. It is zero for a
// collimated beam (Self 1983: the largest output waist); a value of ±0.1
// means the beam at the back focal plane is within 0.5 % of the waist
// radius (w = w0 √(1 + 0.1²)). It returns an error if label does not name
// a thin lens or the beam cannot be followed.
func CollimationOffset(in beam.Input, label string) design.Measure[float64] {
	return func(sys paraxial.System) (float64, error) {
		p, err := sys.Part(label)
		if err != nil {
			return 0, err
		}
		e := sys.Element(p.First)
		if p.First != p.Last || e.Kind != paraxial.KindThinLens {
			return 0, &ParamError{Where: "collimation offset", Param: "label", Value: errtext.Quote(label), Reason: "is not a thin lens", Err: ErrInput}
		}
		w, err := design.LastWaist(sys, in)
		if err != nil {
			return 0, err
		}
		return float64(w.Z-p.End-e.Focal) / float64(w.RayleighRange), nil
	}
}
