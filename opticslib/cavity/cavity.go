package cavity

import (
	"errors"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// SpeedOfLight is the speed of light in vacuum, c = 299 792 458 m/s,
// exact by the SI definition of the metre (BIPM, The International System
// of Units, 9th ed., 2019, §2.3.1).
const SpeedOfLight = 299792458.0

// Kind is the geometry of a [Cavity].
type Kind int

// The cavity kinds.
const (
	// KindLinear is a standing-wave cavity between two end mirrors met at
	// normal incidence; light retraces its path, so a round trip is two
	// passes. See [Linear].
	KindLinear Kind = iota
	// KindRing is a travelling-wave cavity: a closed loop that light goes
	// round once per round trip. See [Ring].
	KindRing
)

// String returns "linear" or "ring".
func (k Kind) String() string {
	switch k {
	case KindLinear:
		return "linear"
	case KindRing:
		return "ring"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// Shape is the figure of a [Mirror] as it is sold: flat, concave or
// convex. The zero value is Flat.
type Shape int

// The mirror shapes.
const (
	// Flat is a plane mirror (radius of curvature ∞).
	Flat Shape = iota
	// Concave is a converging mirror, focal length R/2 at normal
	// incidence.
	Concave
	// Convex is a diverging mirror, focal length −R/2.
	Convex
)

// String returns "flat", "concave" or "convex".
func (s Shape) String() string {
	switch s {
	case Flat:
		return "flat"
	case Concave:
		return "concave"
	case Convex:
		return "convex"
	}
	return "Shape(" + strconv.Itoa(int(s)) + ")"
}

// Mirror is an end mirror of a [Linear] cavity, described as the part is
// labelled:
//
//	cavity.Mirror{Label: "M1", Shape: cavity.Concave, Radius: 500 * units.Millimeter, Reflectivity: 0.9999}
type Mirror struct {
	// Label names the mirror in messages, tables and
	// [Cavity.EigenmodeAtPart]; "" means "M1" or "M2". It must not
	// contain "/" or be "return" (the label of a linear cavity's return
	// pass).
	Label string
	// Shape is Flat (the zero value), Concave or Convex.
	Shape Shape
	// Radius is the radius of curvature in metres, the positive number
	// printed on the part, for a Concave or Convex mirror; it must be 0
	// (or +Inf, [paraxial.Flat]) for a Flat one.
	Radius units.Length
	// Reflectivity is the power reflectivity R in (0, 1] at the
	// wavelength of the cavity. Zero means "not given"; give it for both
	// end mirrors or for neither. Without it the loss analysis
	// ([Cavity.Airy]) returns [ErrNoReflectivity]; the mode analysis does
	// not need it.
	Reflectivity float64
}

// LinearSpec describes a two-mirror standing-wave cavity: M1, the path
// from M1 to M2, and M2. Give the path as Spacing (an empty cavity in
// vacuum or air) or as Path (a system with intracavity elements), not
// both.
type LinearSpec struct {
	// M1 and M2 are the end mirrors, met at normal incidence.
	M1, M2 Mirror
	// Spacing is the distance between the mirrors in metres (> 0), for a
	// cavity with nothing between them, in a medium of index 1.
	Spacing units.Length
	// Path is one pass from M1 to M2, built with [paraxial.Builder]:
	// spaces, lenses, plates, crystals (a spherical interface into the
	// gain medium), fold mirrors. It starts at M1 in the medium of its
	// [paraxial.System.IndexIn] and ends at M2 in the medium of its
	// IndexOut; its length must be positive. The return pass is its
	// [paraxial.System.Reverse]. Fold mirrors are met twice per round
	// trip and count as lossless; put their loss into Loss.
	Path paraxial.System
	// Loss is the fraction of the circulating power lost per round trip
	// besides the transmission of M1 and M2 (scatter, absorption,
	// intracavity surfaces, fold mirrors), in [0, 1).
	Loss float64
	// Wavelength is the vacuum wavelength λ0 in metres (required): it
	// sets the size of the eigenmode.
	Wavelength units.Length
}

// RingSpec describes a travelling-wave cavity by one round trip.
type RingSpec struct {
	// Loop is one round trip built with [paraxial.Builder], from a
	// reference plane of your choice (z = 0) back to the same plane:
	// spaces and mirrors, curved mirrors at their angles of incidence
	// ([paraxial.Builder.ConcaveMirror], ConvexMirror,
	// MirrorOfFocalLength, FlatMirror), and any other elements in the
	// loop. It must start and end in the same medium and have a positive
	// length. The tangential plane of its tilted parts is the plane of
	// the ring (a planar ring).
	Loop paraxial.System
	// Reflectivity maps the label of each mirror of Loop to its power
	// reflectivity R in (0, 1]. A nil or empty map means "not given"
	// (see [Mirror]); otherwise every mirror must be labelled and listed,
	// and every key must be the label of a mirror. Mirrors that share a
	// label share the value.
	Reflectivity map[string]float64
	// Loss is the fraction of the circulating power lost per round trip
	// besides the mirror transmissions, in [0, 1).
	Loss float64
	// Wavelength is the vacuum wavelength λ0 in metres (required).
	Wavelength units.Length
}

// returnLabel labels the return pass of a linear cavity in its loop.
const returnLabel = "return"

// Cavity is an optical resonator: a round trip of paraxial elements (its
// [Cavity.Loop]), the reflectivities of its mirrors and the wavelength.
// It is an immutable value; make it with [Linear] or [Ring]. The zero
// Cavity is not a cavity: its analyses return [ErrNotBuilt] and its
// accessors zero values.
type Cavity struct {
	kind    Kind
	loop    paraxial.System
	lambda  units.Length
	loss    float64
	optical units.Length
	// mirrors lists every reflection of the round trip, in loop order.
	mirrors []reflection
	// haveR reports that reflectivities were given; lnP is then the
	// natural logarithm of the round-trip power factor.
	haveR bool
	lnP   float64
	// Linear cavities: the one-way path, the signed curvatures k = 1/R
	// (concave positive) of M1 and M2, whether the path is one
	// homogeneous medium with nothing in it, and the path length.
	pass       paraxial.System
	k1, k2     float64
	spacesOnly bool
	spacing    units.Length
	ends       [2]reflection
	// st holds the stability of each plane, computed once.
	st    [2]PlaneStability
	built bool
}

// reflection is one mirror reflection of the round trip.
type reflection struct {
	name   string // how messages and tables name it
	label  string
	z      units.Length
	shape  Shape
	radius units.Length // printed radius, 0 for a flat mirror
	aoi    units.Angle
	refl   float64 // power reflectivity, 0 when not given or counted in Loss
}

// display names r in tables: its label in quotes, or the builder call
// that made it.
func (r reflection) display() string {
	if r.label != "" {
		return strconv.Quote(r.label)
	}
	return r.name
}

// check validates m and returns it with its default label.
func (m Mirror) check(def string) (Mirror, error) {
	if m.Label == "" {
		m.Label = def
	}
	subject := "mirror " + errtext.Quote(m.Label)
	if strings.Contains(m.Label, "/") || m.Label == returnLabel {
		return m, &ParamError{Subject: subject, Param: "label", Value: errtext.Quote(m.Label), Reason: `must not contain "/" or be "` + returnLabel + `" (the label of the return pass)`}
	}
	r := float64(m.Radius)
	switch m.Shape {
	case Flat:
		if r != 0 && !math.IsInf(r, 1) {
			return m, &ParamError{Subject: subject, Param: "radius of curvature R", Value: m.Radius, Reason: "a flat mirror has no radius: set Shape to Concave or Convex, or leave Radius 0"}
		}
		m.Radius = 0
	case Concave, Convex:
		if math.IsNaN(r) || math.IsInf(r, 0) || r <= 0 {
			return m, &ParamError{Subject: subject, Param: "radius of curvature R", Value: m.Radius, Reason: "must be positive and finite (the number printed on the part; the Shape says concave or convex, Flat for a plane mirror)"}
		}
	default:
		return m, &ParamError{Subject: subject, Param: "shape", Value: int(m.Shape), Reason: "must be Flat, Concave or Convex"}
	}
	if err := checkReflectivity(subject, m.Reflectivity, true); err != nil {
		return m, err
	}
	return m, nil
}

// checkReflectivity validates a power reflectivity (0 = not given when
// zeroOK).
func checkReflectivity(subject string, r float64, zeroOK bool) error {
	if zeroOK && r == 0 {
		return nil
	}
	if !(r > 0 && r <= 1) {
		return &ParamError{Subject: subject, Param: "reflectivity R", Value: r, Reason: "must be in (0, 1] (a power reflectivity, 0.9999 for 99.99 %)"}
	}
	return nil
}

// curvature returns the signed curvature 1/R of m, positive for a
// concave mirror, in 1/m.
func (m Mirror) curvature() float64 {
	switch m.Shape {
	case Concave:
		return 1 / float64(m.Radius)
	case Convex:
		return -1 / float64(m.Radius)
	case Flat:
	}
	return 0
}

// add appends m at normal incidence to b and labels it.
func (m Mirror) add(b *paraxial.Builder) {
	switch m.Shape {
	case Concave:
		b.ConcaveMirror(m.Radius, 0)
	case Convex:
		b.ConvexMirror(m.Radius, 0)
	case Flat:
		b.FlatMirror(0)
	}
	b.Label(m.Label)
}

func checkCommon(subject string, lambda units.Length, loss float64) error {
	l := float64(lambda)
	if math.IsNaN(l) || math.IsInf(l, 0) || l <= 0 {
		return &ParamError{Subject: subject, Param: "wavelength λ0", Value: lambda, Reason: "must be positive and finite (the vacuum wavelength)"}
	}
	if !(loss >= 0 && loss < 1) {
		return &ParamError{Subject: subject, Param: "round-trip loss", Value: loss, Reason: "must be in [0, 1) (a fraction of the circulating power)"}
	}
	return nil
}

// Linear returns the two-mirror standing-wave cavity of s. Its round
// trip ([Cavity.Loop]) is built with [paraxial.Builder]: M1 at z = 0,
// the path to M2 at z = d (d the path length), M2, and the reversed path
// back to z = 2d, labelled "return" (its parts "return/<label>"). A
// position z in [0, d] therefore lies on the pass from M1 to M2, d from
// M1 at most; the plane at z = 0 is just after the reflection at M1.
//
// It returns a [*ParamError] naming the mirror or field for a radius that
// is not positive and finite (or given for a flat mirror), a reflectivity
// outside (0, 1] or given for one mirror only, both or neither of Spacing
// and Path, a path of zero length, a loss outside [0, 1), a missing
// wavelength, and labels that name more than one part.
func Linear(s LinearSpec) (Cavity, error) {
	m1, err := s.M1.check("M1")
	if err != nil {
		return Cavity{}, err
	}
	m2, err := s.M2.check("M2")
	if err != nil {
		return Cavity{}, err
	}
	if m1.Label == m2.Label {
		return Cavity{}, &ParamError{Subject: "mirror " + errtext.Quote(m2.Label), Param: "label", Value: errtext.Quote(m2.Label), Reason: "M1 has the same label: label the end mirrors differently"}
	}
	if (m1.Reflectivity == 0) != (m2.Reflectivity == 0) {
		missing := m1
		if m2.Reflectivity == 0 {
			missing = m2
		}
		return Cavity{}, &ParamError{Subject: "mirror " + errtext.Quote(missing.Label), Param: "reflectivity R", Value: 0.0, Reason: "give the reflectivity of both end mirrors or of neither"}
	}
	if err := checkCommon("linear cavity", s.Wavelength, s.Loss); err != nil {
		return Cavity{}, err
	}
	pass, err := linearPath(s)
	if err != nil {
		return Cavity{}, err
	}
	for _, e := range pass.Elements() {
		if e.Label == returnLabel || strings.HasPrefix(e.Label, returnLabel+"/") {
			return Cavity{}, &ParamError{Subject: "Path", Param: "label", Value: errtext.Quote(e.Label), Reason: `"` + returnLabel + `" labels the return pass of a linear cavity: rename the part`}
		}
	}
	rev, err := pass.Reverse()
	if err != nil {
		return Cavity{}, &ParamError{Subject: "Path", Reason: "cannot be reversed for the return pass", Err: err}
	}
	b := paraxial.NewBuilder().Medium(pass.IndexIn())
	m1.add(b)
	b.Append(pass)
	m2.add(b)
	b.Append(rev).Label(returnLabel)
	loop, err := b.Build()
	if err != nil {
		return Cavity{}, &ParamError{Subject: "linear cavity", Reason: "building the round trip", Err: err}
	}
	c := Cavity{kind: KindLinear, loop: loop, lambda: s.Wavelength, loss: s.Loss, pass: pass,
		k1: m1.curvature(), k2: m2.curvature(), spacing: pass.Length(), built: true}
	c.spacesOnly = true
	for _, e := range pass.Elements() {
		if e.Kind != paraxial.KindSpace || e.IndexIn != pass.IndexIn() {
			c.spacesOnly = false
		}
	}
	for _, m := range []Mirror{m1, m2} {
		pt, err := loop.Part(m.Label)
		if err != nil || pt.First != pt.Last || loop.Element(pt.First).Kind != paraxial.KindMirror {
			return Cavity{}, &ParamError{Subject: "mirror " + errtext.Quote(m.Label), Param: "label", Value: errtext.Quote(m.Label), Reason: "a part of Path carries the same label: label the end mirrors uniquely"}
		}
	}
	// The loop is M1 (element 0), the path, M2, the return pass.
	i2 := 1 + pass.Len()
	for i, e := range loop.Elements() {
		if e.Kind != paraxial.KindMirror {
			continue
		}
		r := reflectionOf(e)
		switch i {
		case 0:
			r.refl = m1.Reflectivity
			c.ends[0] = r
		case i2:
			r.refl = m2.Reflectivity
			c.ends[1] = r
		}
		c.mirrors = append(c.mirrors, r)
	}
	if m1.Reflectivity != 0 {
		c.haveR = true
		c.lnP = math.Log(m1.Reflectivity) + math.Log(m2.Reflectivity) + math.Log1p(-s.Loss)
	}
	c.finish()
	return c, nil
}

// linearPath returns the path of s from M1 to M2.
func linearPath(s LinearSpec) (paraxial.System, error) {
	havePath := s.Path.Validate() == nil
	switch {
	case havePath && s.Spacing != 0:
		return paraxial.System{}, &ParamError{Subject: "linear cavity", Param: "Spacing", Value: s.Spacing, Reason: "give Spacing or Path (" + s.Path.Length().String() + " long), not both"}
	case havePath:
		if s.Path.Length() <= 0 {
			return paraxial.System{}, &ParamError{Subject: "Path", Param: "length", Value: s.Path.Length(), Reason: "must be positive (M1 and M2 cannot touch)"}
		}
		return s.Path, nil
	}
	d := float64(s.Spacing)
	if s.Spacing == 0 {
		return paraxial.System{}, &ParamError{Subject: "linear cavity", Param: "Spacing", Value: s.Spacing, Reason: "give Spacing (the mirror separation) or Path (a built paraxial.System from M1 to M2)"}
	}
	if math.IsNaN(d) || math.IsInf(d, 0) || d < 0 {
		return paraxial.System{}, &ParamError{Subject: "linear cavity", Param: "Spacing", Value: s.Spacing, Reason: "must be positive and finite"}
	}
	sys, err := paraxial.NewBuilder().Space(s.Spacing).Build()
	if err != nil {
		return paraxial.System{}, &ParamError{Subject: "linear cavity", Param: "Spacing", Value: s.Spacing, Err: err}
	}
	return sys, nil
}

// reflectionOf describes the mirror element e.
func reflectionOf(e paraxial.Element) reflection {
	r := reflection{name: e.Name(), label: e.Label, z: e.Z, aoi: e.Tilt}
	switch {
	case e.Concave():
		r.shape, r.radius = Concave, -e.Radius
	case e.Convex():
		r.shape, r.radius = Convex, e.Radius
	default:
		r.shape = Flat
	}
	return r
}

// Ring returns the travelling-wave cavity whose round trip is s.Loop.
// Positions z along the loop run from its input plane (z = 0) to its
// output plane (z = Length), the same plane reached again.
//
// It returns a [*ParamError] for an unbuilt or empty loop, a loop that
// ends in another medium than it starts in, a reflectivity outside
// (0, 1], a mirror without a label or without a reflectivity (when any
// is given), a key that is not the label of a mirror, a loss outside
// [0, 1) and a missing wavelength.
func Ring(s RingSpec) (Cavity, error) {
	if err := s.Loop.Validate(); err != nil {
		return Cavity{}, &ParamError{Subject: "ring", Param: "Loop", Reason: "build it with paraxial.NewBuilder()…Build() and check the error", Err: err}
	}
	if s.Loop.Length() <= 0 {
		return Cavity{}, &ParamError{Subject: "ring", Param: "round-trip length", Value: s.Loop.Length(), Reason: "must be positive"}
	}
	if nIn, nOut := s.Loop.IndexIn(), s.Loop.IndexOut(); math.Abs(nIn-nOut) > 1e-12*nIn {
		return Cavity{}, &ParamError{Subject: "ring", Param: "output index", Value: nOut, Reason: "must equal the input index " + strconv.FormatFloat(nIn, 'g', -1, 64) + ": the loop ends where it starts"}
	}
	if err := checkCommon("ring", s.Wavelength, s.Loss); err != nil {
		return Cavity{}, err
	}
	c := Cavity{kind: KindRing, loop: s.Loop, lambda: s.Wavelength, loss: s.Loss, built: true}
	labels := map[string]bool{}
	for _, e := range s.Loop.Elements() {
		if e.Kind == paraxial.KindMirror {
			c.mirrors = append(c.mirrors, reflectionOf(e))
			labels[e.Label] = true
		}
	}
	if len(s.Reflectivity) > 0 {
		for _, k := range slices.Sorted(maps.Keys(s.Reflectivity)) {
			if !labels[k] || k == "" {
				var have []string
				for _, l := range slices.Sorted(maps.Keys(labels)) {
					if l != "" {
						have = append(have, errtext.Quote(l))
					}
				}
				reason := "is not the label of a mirror of the loop; the mirrors are labelled " + strings.Join(have, ", ")
				if len(have) == 0 {
					reason = "is not the label of a mirror: the loop has no labelled mirrors"
				}
				return Cavity{}, &ParamError{Subject: "ring", Param: "Reflectivity key", Value: errtext.Quote(k), Reason: reason}
			}
			if err := checkReflectivity("mirror "+errtext.Quote(k), s.Reflectivity[k], false); err != nil {
				return Cavity{}, err
			}
		}
		c.haveR = true
		c.lnP = math.Log1p(-s.Loss)
		for i, m := range c.mirrors {
			r, ok := s.Reflectivity[m.label]
			if !ok || m.label == "" {
				return Cavity{}, &ParamError{Subject: m.name, Param: "reflectivity R", Reason: "not given: label every mirror and list it in Reflectivity (or give no reflectivities)", Err: ErrNoReflectivity}
			}
			c.mirrors[i].refl = r
			c.lnP += math.Log(r)
		}
	}
	c.finish()
	return c, nil
}

// finish computes the optical length and the stability of each plane.
func (c *Cavity) finish() {
	for pc := range c.loop.Walk(0, c.loop.Length()) {
		if pc.Kind == paraxial.KindSpace && pc.Element >= 0 && pc.Element < c.loop.Len() {
			c.optical += (pc.To - pc.From) * units.Length(pc.IndexIn)
		}
	}
	for _, p := range []paraxial.Plane{paraxial.Tangential, paraxial.Sagittal} {
		c.st[p] = c.stability(p)
	}
}

// Kind returns [KindLinear] or [KindRing].
func (c Cavity) Kind() Kind { return c.kind }

// Loop returns the round trip as a [paraxial.System], from the reference
// plane z = 0 back to it at z = Length(): for a linear cavity M1, the
// path, M2 and the return pass. Its tangential and sagittal matrices are
// the round-trip matrices at the input plane, before the surfaces at
// z = 0. To follow the eigenmode around the loop with package beam
// (beam.Sample, beam.AtXY), start from the mode at z = Length()
// ([Cavity.Eigenmode]), the beam arriving at the input plane.
func (c Cavity) Loop() paraxial.System { return c.loop }

// Length returns the geometric round-trip length in metres, the sum of
// the lengths of the spaces of the loop (2d for a linear cavity with
// mirror spacing d).
func (c Cavity) Length() units.Length { return c.loop.Length() }

// OpticalLength returns the optical round-trip length in metres,
//
//	L_opt = Σ nᵢ dᵢ
//
// over the spaces of the loop (dᵢ the path length of the axis ray in the
// space, nᵢ its refractive index). For a tilted plate dᵢ is the path in
// the glass.
func (c Cavity) OpticalLength() units.Length { return c.optical }

// FSR returns the free spectral range in Hz, the spacing of the
// longitudinal resonances of one transverse mode:
//
//	FSR = c / L_opt
//
// with c = [SpeedOfLight] exact and L_opt = [Cavity.OpticalLength] (for
// a two-mirror cavity of spacing d in index n, c/(2nd); Born & Wolf,
// Principles of Optics, §7.6 [from memory]). The indices are those of
// the paraxial elements; in a dispersive medium the longitudinal modes
// are spaced by the group index n_g = n − λ dn/dλ, so build the path with
// n_g where the FSR matters more than the refraction. Zero for the zero
// Cavity.
func (c Cavity) FSR() float64 {
	if !c.built {
		return 0
	}
	return SpeedOfLight / float64(c.optical)
}

// Wavelength returns the vacuum wavelength λ0 in metres.
func (c Cavity) Wavelength() units.Length { return c.lambda }

// check returns ErrNotBuilt for the zero Cavity.
func (c Cavity) check() error {
	if !c.built {
		return ErrNotBuilt
	}
	return nil
}

// planeSubject is the subject of messages about plane p.
func planeSubject(p paraxial.Plane) string { return p.String() + " plane" }

// wrapParaxial turns an error of package paraxial into a *ParamError.
func wrapParaxial(subject string, err error) error {
	var pe *ParamError
	if errors.As(err, &pe) {
		return err
	}
	return &ParamError{Subject: subject, Err: err}
}
