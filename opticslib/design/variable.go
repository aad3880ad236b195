package design

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// VariableKind says which value of a system a [Variable] sets.
type VariableKind int

// The kinds of variable.
const (
	// KindSpacing sets the length of the space labelled Label
	// ([paraxial.System.WithSpace]): later parts move with it.
	KindSpacing VariableKind = iota
	// KindShift moves the part labelled Label by the value along the axis
	// with everything else in place, the end plane included
	// ([paraxial.System.Move]); the value is the displacement from the
	// starting position.
	KindShift
	// KindFocal sets the focal length of the thin lens labelled Label,
	// keeping its clear aperture ([paraxial.System.Replace]).
	KindFocal
)

// String returns "spacing", "shift" or "focal length".
func (k VariableKind) String() string {
	switch k {
	case KindSpacing:
		return "spacing"
	case KindShift:
		return "shift"
	case KindFocal:
		return "focal length"
	}
	return "VariableKind(" + errtext.Value(int(k)) + ")"
}

// Variable is one free value of a design with its bounds, in metres.
type Variable struct {
	// Kind says what the value sets; Label names the space or part.
	Kind  VariableKind
	Label string
	// Min ≤ Max bound the value (both finite; a focal length's bounds
	// have one sign).
	Min, Max units.Length
}

// Spacing returns the variable length of the space labelled label, in
// [min, max] metres.
func Spacing(label string, min, max units.Length) Variable {
	return Variable{Kind: KindSpacing, Label: label, Min: min, Max: max}
}

// Shift returns the variable displacement of the part labelled label
// along the axis, in [min, max] metres from where the starting system has
// it (the end plane stays).
func Shift(label string, min, max units.Length) Variable {
	return Variable{Kind: KindShift, Label: label, Min: min, Max: max}
}

// FocalLength returns the variable focal length of the thin lens labelled
// label, in [min, max] metres (both of one sign).
func FocalLength(label string, min, max units.Length) Variable {
	return Variable{Kind: KindFocal, Label: label, Min: min, Max: max}
}

// Name returns the variable's name for reports: "spacing \"gap\"".
func (v Variable) Name() string { return v.Kind.String() + " " + errtext.Quote(v.Label) }

func (v Variable) fail(param string, value any, reason string, err error) error {
	return &ParamError{Subject: "variable " + v.Name(), Param: param, Value: value, Reason: reason, Err: err}
}

// Validate checks the bounds against the system: the label must name a
// space (KindSpacing), a part with spaces on both sides (KindShift) or a
// thin lens (KindFocal); Min ≤ Max, both finite; a spacing's Min ≥ 0 and a
// focal length's bounds nonzero and of one sign.
func (v Variable) Validate(sys paraxial.System) error {
	lo, hi := float64(v.Min), float64(v.Max)
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) || lo > hi {
		return v.fail("bounds Min", v.Min, "need Min ≤ Max (= "+v.Max.String()+"), both finite", ErrBounds)
	}
	switch v.Kind {
	case KindSpacing:
		if lo < 0 {
			return v.fail("bound Min", v.Min, "a spacing cannot be negative", ErrBounds)
		}
	case KindFocal:
		if lo*hi <= 0 {
			return v.fail("bounds Min", v.Min, "focal-length bounds must be nonzero and of one sign (Max = "+v.Max.String()+")", ErrBounds)
		}
	case KindShift:
	default:
		return v.fail("kind", int(v.Kind), "unknown variable kind", nil)
	}
	_, err := v.Current(sys)
	return err
}

// Current returns the variable's value in sys: the space's length, 0 for
// a shift, the thin lens's focal length. It returns a *ParamError if the
// label does not name a part of the right kind.
func (v Variable) Current(sys paraxial.System) (units.Length, error) {
	p, err := sys.Part(v.Label)
	if err != nil {
		return 0, v.fail("", nil, "", err)
	}
	e := sys.Element(p.First)
	switch v.Kind {
	case KindSpacing:
		if p.First != p.Last || e.Kind != paraxial.KindSpace {
			return 0, v.fail("label", v.Label, "is not a single space (label the space when building: Space(d).Label(…))", nil)
		}
		return e.Length, nil
	case KindFocal:
		if p.First != p.Last || e.Kind != paraxial.KindThinLens {
			return 0, v.fail("label", v.Label, "is not a thin lens", nil)
		}
		return e.Focal, nil
	}
	return 0, nil
}

// Apply returns a copy of sys with the variable set to x (metres); sys is
// unchanged. It does not check the bounds (see [Problem.Apply]); it
// returns a *ParamError if x is not finite, the label is wrong, or the
// edit fails (a shift that makes a space negative).
func (v Variable) Apply(sys paraxial.System, x units.Length) (paraxial.System, error) {
	if math.IsNaN(float64(x)) || math.IsInf(float64(x), 0) {
		return paraxial.System{}, v.fail("value", x, "must be finite", ErrNotFinite)
	}
	var out paraxial.System
	var err error
	switch v.Kind {
	case KindSpacing:
		out, err = sys.WithSpace(v.Label, x)
	case KindShift:
		out, err = sys.Move(v.Label, x)
	case KindFocal:
		if x == 0 {
			return paraxial.System{}, v.fail("value", x, "a focal length must be nonzero", nil)
		}
		var p paraxial.Part
		if p, err = sys.Part(v.Label); err == nil {
			e := sys.Element(p.First)
			if p.First != p.Last || e.Kind != paraxial.KindThinLens {
				return paraxial.System{}, v.fail("label", v.Label, "is not a thin lens", nil)
			}
			b := paraxial.NewBuilder().ThinLens(x).Label(v.Label)
			if e.Aperture.Limited() {
				b.Aperture(e.Aperture)
			}
			var sub paraxial.System
			if sub, err = b.Build(); err == nil {
				out, err = sys.Replace(v.Label, sub)
			}
		}
	default:
		return paraxial.System{}, v.fail("kind", int(v.Kind), "unknown variable kind", nil)
	}
	if err != nil {
		return paraxial.System{}, v.fail("value", x, "", err)
	}
	return out, nil
}
