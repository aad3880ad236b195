package tolerance

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Kind says what a [Perturbation] changes.
type Kind int

// The kinds of perturbation.
const (
	// KindPlacement moves the part labelled Label along the axis by the
	// error (metres) with everything else in place, as on a rail: the
	// space before it grows and the space after it shrinks
	// ([paraxial.System.Move], the form of design.Shift).
	KindPlacement Kind = iota
	// KindSpacing adds the error (metres) to the length of the space
	// labelled Label; the later parts move with it
	// ([paraxial.System.WithSpace]).
	KindSpacing
	// KindFocal scales the focal length of the thin lens or curved
	// mirror labelled Label by 1 + error (a relative error, a plain
	// number: 0.01 is 1 %).
	KindFocal
	// KindTilt tilts the thin lens labelled Label by the error (radians)
	// about an axis across the beam, or adds it to the angle of incidence
	// of the curved mirror labelled Label, in the tangential plane; see
	// [TiltedLens] and [paraxial.Mirror] for the astigmatism it brings.
	KindTilt
)

// String returns "placement", "spacing", "focal length" or "tilt".
func (k Kind) String() string {
	switch k {
	case KindPlacement:
		return "placement"
	case KindSpacing:
		return "spacing"
	case KindFocal:
		return "focal length"
	case KindTilt:
		return "tilt"
	}
	return "Kind(" + errtext.Value(int(k)) + ")"
}

// unit returns the SI unit of the kind's error: "m", "rad" or "".
func (k Kind) unit() string {
	switch k {
	case KindPlacement, KindSpacing:
		return "m"
	case KindTilt:
		return "rad"
	}
	return ""
}

// Limits on the widths of the relative and angular errors: beyond them
// the error is no longer a tolerance (a focal length off by 20 % is
// another lens) and the thin-lens tilt formula leaves the paraxial range
// it was derived for.
const (
	// MaxFocalError is the largest width of a relative focal-length
	// error: 0.2 (20 %), five widths short of a focal length of zero.
	MaxFocalError = 0.2
	// MaxTilt is the largest width of a tilt error: 0.2 rad (11.5°).
	MaxTilt = 0.2
)

// DefaultIndex is the glass index assumed for a tilted thin lens when
// none is given ([Perturbation.WithIndex]): 1.5, a crown glass in the
// visible and near infrared (N-BK7 has 1.5168 at 587.6 nm and 1.5066 at
// 1064 nm, Schott datasheet [from memory]). The lens's astigmatism from a
// tilt depends on it only weakly (through sin²θ/(2n)).
const DefaultIndex = 1.5

// Perturbation is one value of a design that a real build gets wrong: a
// part's placement, a spacing, a focal length or a tilt, with the
// distribution of its error. Make one with [Placement], [Spacing],
// [FocalError] or [Tilt].
type Perturbation struct {
	// Kind says what is changed; Label names the part or space.
	Kind  Kind
	Label string
	// Dist is the error's distribution, in the kind's unit: metres for a
	// placement or spacing, a plain number (relative) for a focal
	// length, radians for a tilt.
	Dist Distribution
	// Index is the refractive index of a tilted thin lens's glass (> 1;
	// 0 means [DefaultIndex]); other kinds ignore it.
	Index float64
}

// Placement returns the axial placement error of the part labelled
// label, a length distribution: Placement("L2", Normal(50*units.Micrometer)).
func Placement(label string, d Distribution) Perturbation {
	return Perturbation{Kind: KindPlacement, Label: label, Dist: d}
}

// Spacing returns the length error of the space labelled label, a
// length distribution.
func Spacing(label string, d Distribution) Perturbation {
	return Perturbation{Kind: KindSpacing, Label: label, Dist: d}
}

// FocalError returns the relative focal-length error of the thin lens
// or curved mirror labelled label, a plain-number distribution:
// FocalError("L1", Uniform(0.01)) for a catalogue's "f ± 1 %".
func FocalError(label string, d Distribution) Perturbation {
	return Perturbation{Kind: KindFocal, Label: label, Dist: d}
}

// Tilt returns the tilt error of the thin lens or curved mirror labelled
// label, an angle distribution: Tilt("L1", Normal(2*units.Milliradian)).
// A flat mirror's tilt only steers the beam, a pointing error that a
// paraxial ABCD model does not carry, so it is refused.
func Tilt(label string, d Distribution) Perturbation {
	return Perturbation{Kind: KindTilt, Label: label, Dist: d}
}

// WithIndex returns p with the glass index n of a tilted thin lens.
func (p Perturbation) WithIndex(n float64) Perturbation { p.Index = n; return p }

// Name returns the perturbation's name for reports: "placement \"L2\"".
func (p Perturbation) Name() string { return p.Kind.String() + " " + errtext.Quote(p.Label) }

func (p Perturbation) fail(param string, v any, reason string, err error) error {
	return &ParamError{Subject: p.Name(), Param: param, Value: v, Reason: reason, Err: err}
}

func (p Perturbation) index() float64 {
	if p.Index == 0 {
		return DefaultIndex
	}
	return p.Index
}

// site is where a perturbation acts in a system: element indices.
type site struct {
	// first is the element changed (the space, the lens, the mirror);
	// for a placement before and after are the spaces either side.
	first, before, after int
}

// Validate checks p against sys: the distribution (a positive finite
// width, the unit of the kind, a relative focal error at most
// [MaxFocalError] and a tilt at most [MaxTilt]), and the label: a part
// with a space directly before and after it (placement), a single space
// (spacing), a single thin lens or curved mirror (focal length, tilt);
// a tilted lens's index must be in (1, 5]. It returns a *ParamError
// naming the perturbation, wrapping [ErrDistribution] or
// [ErrPerturbation].
func (p Perturbation) Validate(sys paraxial.System) error {
	_, err := p.resolve(sys)
	return err
}

func (p Perturbation) resolve(sys paraxial.System) (site, error) {
	if p.Kind < KindPlacement || p.Kind > KindTilt {
		return site{}, p.fail("kind", int(p.Kind), "unknown perturbation kind", ErrPerturbation)
	}
	d := p.Dist
	if r := d.validate(); r != "" {
		return site{}, p.fail("tolerance", d.value(d.Width), r, ErrDistribution)
	}
	if want := p.Kind.unit(); d.Unit != want {
		return site{}, p.fail("tolerance", d.value(d.Width), "is in "+unitName(d.Unit)+"; a "+p.Kind.String()+" error is in "+unitName(want), ErrDistribution)
	}
	switch {
	case p.Kind == KindFocal && d.Width > MaxFocalError:
		return site{}, p.fail("tolerance", d.Width, "a relative focal-length error wider than 0.2 (20 %) is another lens, not a tolerance", ErrDistribution)
	case p.Kind == KindTilt && d.Width > MaxTilt:
		return site{}, p.fail("tolerance", units.Angle(d.Width), "a tilt wider than 0.2 rad leaves the paraxial range of the tilted-element formulas", ErrDistribution)
	}
	if err := sys.Validate(); err != nil {
		return site{}, p.fail("system", nil, "", err)
	}
	pt, err := sys.Part(p.Label)
	if err != nil {
		return site{}, p.fail("", nil, "", because(ErrPerturbation, err))
	}
	e := sys.Element(pt.First)
	s := site{first: pt.First, before: pt.First - 1, after: pt.Last + 1}
	switch p.Kind {
	case KindPlacement:
		if _, err := sys.Move(p.Label, 0); err != nil {
			return site{}, p.fail("", nil, "cannot be moved (a placement needs a space directly before and after the part)", because(ErrPerturbation, err))
		}
	case KindSpacing:
		if pt.First != pt.Last || e.Kind != paraxial.KindSpace {
			return site{}, p.fail("", nil, "is not a single space (label the space when building: Space(d).Label(…))", ErrPerturbation)
		}
	case KindFocal, KindTilt:
		if pt.First != pt.Last || (e.Kind != paraxial.KindThinLens && e.Kind != paraxial.KindMirror) {
			return site{}, p.fail("", nil, "is a "+e.Kind.String()+" or several elements; a "+p.Kind.String()+" error applies to a single thin lens or curved mirror", ErrPerturbation)
		}
		if e.Kind == paraxial.KindMirror && e.Focal == 0 {
			reason := "is a flat mirror, which has no focal length"
			if p.Kind == KindTilt {
				reason = "is a flat mirror: its tilt only steers the beam, a pointing error that a paraxial ABCD model does not carry"
			}
			return site{}, p.fail("", nil, reason, ErrPerturbation)
		}
		if p.Kind == KindTilt && e.Kind == paraxial.KindThinLens {
			if n := p.index(); !(n > 1 && n <= 5) {
				return site{}, p.fail("glass index", n, "must be in (1, 5]", ErrPerturbation)
			}
		}
	}
	return s, nil
}

func unitName(u string) string {
	switch u {
	case "m":
		return "metres (a length)"
	case "rad":
		return "radians (an angle)"
	}
	return "a plain number"
}

// TiltedLens returns the tangential and sagittal focal lengths of a thin
// lens of focal length f (metres) and glass index n tilted by θ about an
// axis across the beam, met by the beam through its centre: Coddington's
// equations for the two surfaces of a thin lens in air, summed,
//
//	sin θ' = sin θ / n,   k = (n cos θ' − cos θ)/(n − 1)
//	f_s = f / k,   f_t = f cos²θ / k
//
// (the oblique-refraction equations of H. Coddington, 1829, as in W. J.
// Smith, Modern Optical Engineering, 4th ed., McGraw-Hill 2008 [from
// memory]; for small θ they reduce to Martin's spectacle-lens formulas
// F_s = F (1 + sin²θ/(2n)), F_t = F_s/cos²θ, L. C. Martin, Technical
// Optics, 1948 [from memory]). Both foci shorten, the tangential one
// faster: a tilted lens is astigmatic, with a cylinder of about F tan²θ.
//
// A mirror is refraction into n' = −n: with n = −1, k = cos θ and the
// formulas give the tilted mirror's f_s = f/cos θ and f_t = f cos θ (H.
// Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank, IEEE J. Quantum
// Electron. QE-8, 373 (1972) [from memory]), which [paraxial.Mirror]
// uses; note that the lens's foci are not f cos θ and f/cos θ.
//
// It is pure arithmetic: n = 1 gives NaN (k = 0/0), and |sin θ| > |n| NaN.
func TiltedLens(f units.Length, tilt units.Angle, n float64) (tangential, sagittal units.Length) {
	s, c := math.Sincos(float64(tilt))
	si := s / n
	ci := math.Sqrt(1 - si*si)
	k := (n*ci - c) / (n - 1)
	return units.Length(float64(f) * c * c / k), units.Length(float64(f) / k)
}
