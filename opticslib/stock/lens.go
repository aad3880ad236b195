package stock

import (
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Kind is the shape of a lens as a catalogue names it.
type Kind int

// The kinds of lens. The zero Kind is not a kind (a [Spec] must say).
const (
	// PlanoConvex: one flat side, one convex side, f > 0.
	PlanoConvex Kind = iota + 1
	// Biconvex: both sides convex (R1 > 0, R2 < 0); given by its focal
	// length it is taken as equi-convex.
	Biconvex
	// PlanoConcave: one flat side, one concave side, f < 0.
	PlanoConcave
	// Biconcave: both sides concave (R1 < 0, R2 > 0); given by its focal
	// length it is taken as equi-concave.
	Biconcave
	// Meniscus: both centres of curvature on the same side (R1·R2 > 0),
	// positive or negative; its radii must be given.
	Meniscus
	// Achromat: a cemented achromatic doublet, given by its focal length
	// only; its third-order spherical aberration is taken as corrected
	// (zero) by its design, used the right way round (see
	// [Lens.Seidel]).
	Achromat
)

var kindNames = [...]string{PlanoConvex: "plano-convex", Biconvex: "biconvex", PlanoConcave: "plano-concave",
	Biconcave: "biconcave", Meniscus: "meniscus", Achromat: "achromat"}

// String returns the kind as a stock file writes it: "plano-convex",
// "biconvex", "plano-concave", "biconcave", "meniscus" or "achromat".
func (k Kind) String() string {
	if k.valid() {
		return kindNames[k]
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

func (k Kind) valid() bool { return k >= PlanoConvex && k <= Achromat }

// ParseKind returns the kind named s: one of the names [Kind.String]
// gives, matched without regard to case, with a space or nothing in place
// of the hyphen ("Plano Convex", "planoconvex"); "achromatic doublet",
// "positive meniscus" and "negative meniscus" are accepted too.
func ParseKind(s string) (Kind, bool) {
	key := strings.Map(func(r rune) rune {
		switch r {
		case ' ', '-', '_':
			return -1
		}
		return r
	}, strings.ToLower(strings.TrimSpace(s)))
	switch key {
	case "achromaticdoublet", "doublet":
		return Achromat, true
	case "positivemeniscus", "negativemeniscus":
		return Meniscus, true
	}
	for k := PlanoConvex; k <= Achromat; k++ {
		if key == strings.ReplaceAll(kindNames[k], "-", "") {
			return k, true
		}
	}
	return 0, false
}

func kindList() string {
	s := ""
	for k := PlanoConvex; k <= Achromat; k++ {
		if k > PlanoConvex {
			s += ", "
		}
		s += kindNames[k]
	}
	return s
}

// ClearFraction is the part of a lens's diameter taken as its clear
// aperture: 90 %, the figure catalogues commonly state for mounted
// singlets and doublets (common practice, no single source; the retaining
// ring or the bevel takes the rest).
const ClearFraction = 0.9

// Limits of the lens values a [Spec] or a stock file may give.
const (
	// MaxIndex is the largest refractive index accepted (germanium, the
	// densest common lens material, has about 4.0 in the infrared).
	MaxIndex = 4.1
	// MaxCount is the largest number of identical lenses one entry may
	// hold.
	MaxCount = 10000
	// MaxDiameter is the largest lens diameter accepted, 1 m: a larger
	// value is almost surely a unit mistake.
	MaxDiameter = 1 * units.Meter
	// FocalAgreement is how far (relative) a focal length given beside
	// the radii may differ from the lensmaker's value: 2 %, since
	// catalogues round their nominal focal lengths and state them at a
	// design wavelength (common practice, no single source).
	FocalAgreement = 0.02
)

// Spec describes a lens as a person or a stock file gives it. A singlet is
// given either by its radii and centre thickness, or by its focal length
// and kind (then its radii are those of the kind's usual shape); an
// achromat by its focal length only. Zero fields are "not given".
type Spec struct {
	// Label names the lens in tables and messages, "PCX-050-A"
	// (required).
	Label string
	// Kind is the lens's shape (required).
	Kind Kind
	// Focal is the focal length in metres (positive for a converging
	// lens); give it, or R1, R2 and Thickness, or both (then they must
	// agree within [FocalAgreement]).
	Focal units.Length
	// R1 and R2 are the radii of the front and back surfaces in metres,
	// with the sign convention of package paraxial: positive when the
	// centre of curvature lies after the surface (towards +z, where the
	// light goes), so a biconvex lens has R1 > 0 > R2; [paraxial.Flat]
	// (±Inf) for a flat side. The front side is the one the light meets
	// first as the lens is listed.
	R1, R2 units.Length
	// Thickness is the centre thickness in metres (required with the
	// radii; optional with the focal length, when it makes the radii of
	// the kind's shape exact).
	Thickness units.Length
	// Diameter is the lens's outer diameter in metres (required).
	Diameter units.Length
	// Material names the glass ("N-BK7", "fused silica", "N-SF11"; see
	// [GlassIndex]); Index is the refractive index, which overrides the
	// material's nd (give it for another glass, or for the index at the
	// laser's wavelength). A singlet needs one of them.
	Material string
	Index    float64
	// Count is how many of the lens the lab owns (at least 1).
	Count int
	// Note is free text.
	Note string
}

// Lens is a lens of a stock: the values of its [Spec], checked, with the
// focal length computed from the radii when they were given and the
// radii of the kind's shape when the focal length was. Make one with
// [LensFromSpec] or [Read].
type Lens struct {
	Label string
	Kind  Kind
	// Focal is the effective focal length in air, metres: from the
	// thick-lens lensmaker's equation when FromRadii (see
	// [LensmakerFocal]), else as given.
	Focal units.Length
	// R1 and R2 are the front and back radii (metres, paraxial sign
	// convention, [paraxial.Flat] for a flat side): as given when
	// FromRadii, else those of the kind's shape that give Focal with
	// Index and Thickness (the curved side first for a plano lens, equal
	// and opposite for a biconvex or biconcave one); both 0 for an
	// achromat.
	R1, R2 units.Length
	// FromRadii is true when the radii were given.
	FromRadii bool
	// Thickness is the centre thickness in metres, 0 when not given (the
	// lens is then thin).
	Thickness units.Length
	// Diameter is the outer diameter in metres.
	Diameter units.Length
	// Material is the glass's name as given ("" if none) and Index the
	// refractive index used (0 for an achromat given without one).
	Material string
	Index    float64
	// Count is how many the lab owns, Note the free text.
	Count int
	Note  string
	// Where says where the lens was read: "drawer.csv line 12", or "" for
	// a lens made from a Spec.
	Where string
}

// fieldNames name the values of a lens in messages: the Spec's field
// names, or a stock file's column names.
type fieldNames struct {
	label, kind, focal, r1, r2, ct, diameter, material, index, count string
}

var specNames = fieldNames{"Label", "Kind", "Focal", "R1", "R2", "Thickness", "Diameter", "Material", "Index", "Count"}

// LensFromSpec returns the lens s describes. The focal length of a lens
// given by its radii is the thick-lens lensmaker's equation
// ([LensmakerFocal]); a singlet given by its focal length gets the radii
// of its kind's shape. It returns a [*ParamError] naming the lens and the
// field, with the value and its unit, wrapping [ErrInput] for a missing or
// inconsistent value (radii and focal length that disagree, a kind that
// does not match the radii, an unknown material without an index) and
// [ErrNotPhysical] for a lens that cannot be made (no power, a radius
// smaller than half the diameter, a negative edge thickness).
func LensFromSpec(s Spec) (Lens, error) {
	where := "lens " + errtext.Quote(strings.TrimSpace(s.Label))
	if strings.TrimSpace(s.Label) == "" {
		where = "lens"
	}
	return makeLens(s, where, specNames)
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// curvature returns 1/r (0 for a flat side, ±Inf).
func curvature(r units.Length) float64 {
	if math.IsInf(float64(r), 0) {
		return 0
	}
	return 1 / float64(r)
}

// radius returns 1/c as a length, [paraxial.Flat] for c = 0.
func radius(c float64) units.Length {
	if c == 0 {
		return paraxial.Flat
	}
	return units.Length(1 / c)
}

// sag returns the signed sag of a sphere of curvature c at height a: the
// axial distance from the vertex plane to the surface, positive towards
// +z.
func sag(c, a float64) float64 { return c * a * a / (1 + math.Sqrt(1-c*c*a*a)) }

func makeLens(s Spec, where string, nm fieldNames) (Lens, error) {
	fail := func(param string, v any, reason string, err error) (Lens, error) {
		return Lens{}, &ParamError{Where: where, Param: param, Value: v, Reason: reason, Err: err}
	}
	l := Lens{Label: strings.TrimSpace(s.Label), Kind: s.Kind, Diameter: s.Diameter, Material: strings.TrimSpace(s.Material),
		Count: s.Count, Note: s.Note, Thickness: s.Thickness}
	if l.Label == "" {
		return fail(nm.label, nil, "is empty: every lens needs a label", ErrInput)
	}
	if !s.Kind.valid() {
		return fail(nm.kind, int(s.Kind), "is not a kind of lens ("+kindList()+")", ErrInput)
	}
	if d := float64(s.Diameter); !finite(d) || d <= 0 || s.Diameter > MaxDiameter {
		return fail(nm.diameter, s.Diameter, "must be positive and at most "+MaxDiameter.String(), ErrInput)
	}
	if s.Count < 1 || s.Count > MaxCount {
		return fail(nm.count, s.Count, "must be a whole number from 1 to "+strconv.Itoa(MaxCount), ErrInput)
	}
	if t := float64(s.Thickness); !finite(t) || t < 0 {
		return fail(nm.ct, s.Thickness, "must be positive and finite (or not given)", ErrInput)
	}
	if f := float64(s.Focal); math.IsNaN(f) || math.IsInf(f, 0) {
		return fail(nm.focal, s.Focal, "must be finite (or not given)", ErrInput)
	}
	// The index: the Index field overrides the material's nd.
	if s.Index != 0 {
		if !(s.Index > 1 && s.Index <= MaxIndex) {
			return fail(nm.index, s.Index, "must be above 1 and at most "+strconv.FormatFloat(MaxIndex, 'g', -1, 64), ErrNotPhysical)
		}
		l.Index = s.Index
	} else if l.Material != "" {
		nd, name, ok := GlassIndex(l.Material)
		if !ok {
			return fail(nm.material, errtext.Quote(l.Material), "is not a known glass ("+glassList()+"); give its index in "+nm.index, ErrInput)
		}
		l.Index, l.Material = nd, name
	} else if s.Kind != Achromat {
		return fail(nm.index, nil, "missing: a singlet needs its material ("+glassList()+") or its index", ErrInput)
	}
	given := s.R1 != 0 || s.R2 != 0
	n := l.Index
	switch {
	case s.Kind == Achromat:
		if given {
			return fail(nm.r1, s.R1, "an achromat is given by its focal length only; leave "+nm.r1+" and "+nm.r2+" empty", ErrInput)
		}
		if s.Focal == 0 {
			return fail(nm.focal, nil, "missing: an achromat needs its focal length", ErrInput)
		}
		l.Focal = s.Focal
		return l, nil
	case given:
		for _, r := range []struct {
			name string
			v    units.Length
		}{{nm.r1, s.R1}, {nm.r2, s.R2}} {
			if r.v == 0 || math.IsNaN(float64(r.v)) {
				return fail(r.name, r.v, "must be given with the other radius (use inf for a flat side)", ErrInput)
			}
		}
		if s.Thickness == 0 {
			return fail(nm.ct, nil, "missing: a lens given by its radii needs its centre thickness", ErrInput)
		}
		f := LensmakerFocal(s.R1, s.R2, s.Thickness, n)
		if !finite(float64(f)) {
			return fail(nm.r1, s.R1, "with "+nm.r2+" = "+s.R2.String()+" and "+nm.ct+" = "+s.Thickness.String()+" the lens has no power", ErrNotPhysical)
		}
		if s.Focal != 0 && math.Abs(float64(s.Focal-f)) > FocalAgreement*math.Abs(float64(f)) {
			return fail(nm.focal, s.Focal, "disagrees with the lensmaker's "+f.String()+" from the radii, thickness and index by more than "+
				strconv.FormatFloat(100*FocalAgreement, 'g', -1, 64)+" %", ErrInput)
		}
		l.Focal, l.R1, l.R2, l.FromRadii = f, s.R1, s.R2, true
		if math.IsInf(float64(l.R1), 0) {
			l.R1 = paraxial.Flat
		}
		if math.IsInf(float64(l.R2), 0) {
			l.R2 = paraxial.Flat
		}
		if reason := shapeMismatch(s.Kind, curvature(l.R1), curvature(l.R2), f); reason != "" {
			return fail(nm.kind, s.Kind, reason+" (R1 = "+l.R1.String()+", R2 = "+l.R2.String()+", f = "+f.String()+")", ErrInput)
		}
	default:
		f := s.Focal
		if f == 0 {
			return fail(nm.focal, nil, "missing: give the focal length, or the radii "+nm.r1+", "+nm.r2+" and thickness "+nm.ct, ErrInput)
		}
		var c1, c2 float64
		switch s.Kind {
		case PlanoConvex, PlanoConcave:
			// A plano lens's power is (n − 1)/R whatever its thickness.
			c1 = 1 / ((n - 1) * float64(f))
		case Biconvex, Biconcave:
			// Equi-convex: 1/f = (n−1)(2c − (n−1) t c²/n), the root that
			// tends to 1/(2(n−1)f) as t → 0, written without
			// cancellation.
			x := float64(s.Thickness) / (n * float64(f))
			if 1-x < 0 {
				return fail(nm.ct, s.Thickness, "is too thick for an equi-convex lens of f = "+f.String()+" (at most n·f = "+units.Length(n*float64(f)).String()+")", ErrNotPhysical)
			}
			c1 = 1 / ((n - 1) * float64(f) * (1 + math.Sqrt(1-x)))
			c2 = -c1
		case Meniscus:
			return fail(nm.r1, nil, "missing: a meniscus's shape is not fixed by its kind; give "+nm.r1+", "+nm.r2+" and "+nm.ct, ErrInput)
		}
		if reason := shapeMismatch(s.Kind, c1, c2, f); reason != "" {
			return fail(nm.focal, f, reason, ErrInput)
		}
		l.Focal, l.R1, l.R2 = f, radius(c1), radius(c2)
	}
	// Physical checks of a singlet: each sphere at least as wide as the
	// lens, and an edge thickness that is not negative.
	a := float64(l.Diameter) / 2
	c1, c2 := curvature(l.R1), curvature(l.R2)
	for _, r := range []struct {
		name string
		c    float64
		v    units.Length
	}{{nm.r1, c1, l.R1}, {nm.r2, c2, l.R2}} {
		if math.Abs(r.c)*a > 1 {
			if !l.FromRadii {
				return fail(nm.focal, l.Focal, "the "+l.Kind.String()+" shape needs a radius of "+r.v.String()+" (index "+
					strconv.FormatFloat(n, 'g', -1, 64)+"), smaller than half the diameter "+units.Length(a).String()+": no such lens", ErrNotPhysical)
			}
			return fail(r.name, r.v, "is smaller than half the diameter "+units.Length(a).String()+": no such lens", ErrNotPhysical)
		}
	}
	if t := float64(l.Thickness); t > 0 {
		if edge := t + sag(c2, a) - sag(c1, a); edge < 0 {
			return fail(nm.ct, l.Thickness, "gives a negative edge thickness "+units.Length(edge).String()+" at the diameter "+l.Diameter.String(), ErrNotPhysical)
		}
	}
	return l, nil
}

// shapeMismatch returns why front and back curvatures c1, c2 and focal
// length f do not fit kind k, or "".
func shapeMismatch(k Kind, c1, c2 float64, f units.Length) string {
	flat := (c1 == 0) != (c2 == 0)
	switch k {
	case PlanoConvex:
		if !flat || f <= 0 {
			return "a plano-convex lens has one flat side and a positive focal length"
		}
	case PlanoConcave:
		if !flat || f >= 0 {
			return "a plano-concave lens has one flat side and a negative focal length"
		}
	case Biconvex:
		if !(c1 > 0 && c2 < 0) {
			return "a biconvex lens has R1 > 0 and R2 < 0"
		}
	case Biconcave:
		if !(c1 < 0 && c2 > 0) {
			return "a biconcave lens has R1 < 0 and R2 > 0"
		}
	case Meniscus:
		if !(c1*c2 > 0) {
			return "a meniscus has R1 and R2 of the same sign, both curved"
		}
	}
	return ""
}

// Validate checks what the search relies on: a label, a kind, a nonzero
// finite focal length, a positive diameter, a count of at least 1 and,
// for a singlet, an index above 1 and radii that are not zero. A lens
// from [LensFromSpec] or [Read] is valid.
func (l Lens) Validate() error {
	where := "lens " + errtext.Quote(l.Label)
	fail := func(param string, v any, reason string) error {
		return &ParamError{Where: where, Param: param, Value: v, Reason: reason, Err: ErrInput}
	}
	switch {
	case l.Label == "":
		return &ParamError{Where: "lens", Param: "Label", Reason: "is empty: make lenses with LensFromSpec or Read", Err: ErrInput}
	case !l.Kind.valid():
		return fail("Kind", int(l.Kind), "is not a kind of lens ("+kindList()+")")
	case !finite(float64(l.Focal)) || l.Focal == 0:
		return fail("Focal", l.Focal, "must be nonzero and finite")
	case !(l.Diameter > 0) || l.Diameter > MaxDiameter:
		return fail("Diameter", l.Diameter, "must be positive and at most "+MaxDiameter.String())
	case l.Count < 1 || l.Count > MaxCount:
		return fail("Count", l.Count, "must be from 1 to "+strconv.Itoa(MaxCount))
	case l.Kind != Achromat && !(l.Index > 1 && l.Index <= MaxIndex):
		return fail("Index", l.Index, "a singlet needs an index above 1 and at most "+strconv.FormatFloat(MaxIndex, 'g', -1, 64))
	case l.Kind != Achromat && (l.R1 == 0 || l.R2 == 0 || math.IsNaN(float64(l.R1)) || math.IsNaN(float64(l.R2))):
		return fail("R1", l.R1, "a singlet needs both radii (paraxial.Flat for a flat side)")
	}
	return nil
}

// LensmakerFocal returns the effective focal length in air of a thick lens
// of radii r1, r2 (metres, paraxial sign convention, ±Inf for a flat
// side), centre thickness t (metres) and index n, by the thick-lens
// lensmaker's equation
//
//	1/f = (n − 1) [1/R1 − 1/R2 + (n − 1) t / (n R1 R2)]
//
// (W. J. Smith, Modern Optical Engineering, 4th ed., McGraw-Hill 2008,
// ch. 2 [from memory]; checked against the matrix of
// [paraxial.ThickLens]). It is pure arithmetic: a lens without power
// gives ±Inf, as the IEEE-754 division does.
func LensmakerFocal(r1, r2, t units.Length, n float64) units.Length {
	c1, c2 := curvature(r1), curvature(r2)
	p := (n - 1) * (c1 - c2 + (n-1)*float64(t)*c1*c2/n)
	return units.Length(1 / p)
}

// ShapeFactor returns the Coddington shape factor of the lens as listed,
//
//	q = (R2 + R1)/(R2 − R1) = (c1 + c2)/(c1 − c2),   c = 1/R
//
// (W. J. Smith, Modern Optical Engineering, ch. 6 [from memory]): +1 for
// a plano lens with its curved side first (R2 flat), −1 with its flat
// side first, 0 for an equi-convex or equi-concave lens, |q| > 1 for a
// meniscus. Turning the lens round ([Lens.Reversed]) changes the sign. It
// is NaN for an achromat, which has no single shape.
func (l Lens) ShapeFactor() float64 {
	if l.Kind == Achromat {
		return math.NaN()
	}
	c1, c2 := curvature(l.R1), curvature(l.R2)
	return (c1 + c2) / (c1 - c2)
}

// Reversed returns the lens turned round: front and back swap and change
// sign, R1′ = −R2 and R2′ = −R1, so the shape factor changes sign and the
// focal length does not. An achromat is returned unchanged.
func (l Lens) Reversed() Lens {
	if l.Kind == Achromat {
		return l
	}
	l.R1, l.R2 = -l.R2, -l.R1
	if math.IsInf(float64(l.R1), 0) {
		l.R1 = paraxial.Flat
	}
	if math.IsInf(float64(l.R2), 0) {
		l.R2 = paraxial.Flat
	}
	return l
}

// Facing says which side of a plano lens the light meets first, "curved
// side first" or "flat side first", and "" for other kinds.
func (l Lens) Facing() string {
	if l.Kind != PlanoConvex && l.Kind != PlanoConcave {
		return ""
	}
	if math.IsInf(float64(l.R2), 0) {
		return "curved side first"
	}
	return "flat side first"
}

// ClearRadius returns the radius of the lens's clear aperture,
// [ClearFraction] × Diameter/2, in metres.
func (l Lens) ClearRadius() units.Length { return ClearFraction * l.Diameter / 2 }

// PrincipalPlanes returns the positions of the front principal plane H
// relative to the front vertex and of the rear principal plane H′
// relative to the back vertex, in metres, positive towards +z:
//
//	δH = −f (n − 1) t / (n R2),   δH′ = −f (n − 1) t / (n R1)
//
// (W. J. Smith, Modern Optical Engineering, ch. 2 [from memory]; checked
// against [paraxial.System.Cardinal]). A thin model of the lens
// ([Lens.Thin]) belongs at the principal planes: the glass-to-glass gap
// between two lenses is the thin-lens spacing − δH(next) + δH′(this). Both
// are 0 for a lens without a thickness and for an achromat.
func (l Lens) PrincipalPlanes() (front, back units.Length) {
	if l.Kind == Achromat || l.Thickness == 0 {
		return 0, 0
	}
	k := -float64(l.Focal) * (l.Index - 1) * float64(l.Thickness) / l.Index
	return units.Length(k * curvature(l.R2)), units.Length(k * curvature(l.R1))
}

// addThin appends the thin model of l labelled label to b.
func (l Lens) addThin(b *paraxial.Builder, label string) *paraxial.Builder {
	return b.ThinLens(l.Focal).Label(label).Aperture(paraxial.ClearRadius(l.ClearRadius()))
}

// Thin returns the thin-lens model of the lens for a paraxial system, to
// append with [paraxial.Builder.Append]: a thin lens of focal length
// Focal labelled label, with the clear aperture of radius
// [Lens.ClearRadius]. It stands at the lens's principal planes (see
// [Lens.PrincipalPlanes]); the lab-stock search uses it.
func (l Lens) Thin(label string) (paraxial.System, error) {
	if err := l.Validate(); err != nil {
		return paraxial.System{}, err
	}
	return l.addThin(paraxial.NewBuilder(), label).Build()
}

// Thick returns the thick-lens model of a singlet with a thickness: the
// two spherical surfaces and the glass between ([paraxial.Builder.ThickLens])
// labelled label, with the clear aperture of radius [Lens.ClearRadius].
// It returns a *ParamError for an achromat or a lens without a thickness.
func (l Lens) Thick(label string) (paraxial.System, error) {
	if err := l.Validate(); err != nil {
		return paraxial.System{}, err
	}
	if l.Kind == Achromat || l.Thickness == 0 {
		return paraxial.System{}, &ParamError{Where: "lens " + errtext.Quote(l.Label), Param: "Thickness", Value: l.Thickness,
			Reason: "a thick model needs a singlet with its centre thickness", Err: ErrInput}
	}
	return paraxial.NewBuilder().ThickLens(l.R1, l.R2, l.Thickness, l.Index).Label(label).
		Aperture(paraxial.ClearRadius(l.ClearRadius())).Build()
}
