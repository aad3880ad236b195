package plan

import (
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Turn is the side to which a fold mirror sends the beam, seen from
// above. The paraxial model knows a mirror's angle of incidence only, so
// the side is given by the user, per mirror label, in [Spec.Folds]. The
// zero value means "not given".
type Turn int

// The two fold directions.
const (
	// Left turns the beam counterclockwise seen from above.
	Left Turn = iota + 1
	// Right turns the beam clockwise seen from above.
	Right
)

// String returns "left", "right" or "not given".
func (t Turn) String() string {
	switch t {
	case Left:
		return "left"
	case Right:
		return "right"
	case 0:
		return "not given"
	}
	return "Turn(" + strconv.Itoa(int(t)) + ")"
}

// Mount is the footprint of a part's mount on the board seen from above:
// Width across the part's optical axis (along the face of a lens or a
// mirror), Depth along it, in metres. A zero field means the default of
// [DefaultMount].
type Mount struct {
	Width, Depth units.Length
}

// Default mount sizes (metres), common practice for post-mounted 1 in and
// 2 in optics with no single source: a lens or plate holder is about
// 12 mm deep and 6 mm wider than the optic on each side; a kinematic
// mirror mount about 32 mm deep (the adjusters behind the face) and 8 mm
// wider on each side; an iris about 10 mm deep and 40 mm across at least.
const (
	lensRim     = 6 * units.Millimeter
	lensDepth   = 12 * units.Millimeter
	mirrorRim   = 8 * units.Millimeter
	mirrorDepth = 32 * units.Millimeter
	irisRim     = 10 * units.Millimeter
	irisMin     = 40 * units.Millimeter
	irisDepth   = 10 * units.Millimeter
)

// DefaultDiameter is the optic diameter assumed for a part without a
// clear aperture: 1 in (25.4 mm), the most common optic size.
const DefaultDiameter = units.Inch

// DefaultMount returns the default footprint of a part of kind k with an
// optic of diameter d (for a diaphragm, its opening's diameter) and an
// axial glass length t (0 for a thin element), all in metres; the sizes
// are common practice, with no single source:
//
//	part                          width          depth
//	lens, plate, interface, box   d + 12 mm      max(12 mm, t + 6 mm)
//	mirror                        d + 16 mm      32 mm, behind the face
//	diaphragm (iris)              max(d + 20 mm, 40 mm)   10 mm
//
// The optic diameter of a part with a round clear aperture of diameter a
// is taken as a/0.9, the inverse of the 90 % clear-aperture rule of
// [paraxial.OneInchOptic]; without one it is [DefaultDiameter].
func DefaultMount(k paraxial.Kind, d, t units.Length) Mount {
	switch k {
	case paraxial.KindMirror:
		return Mount{Width: d + 2*mirrorRim, Depth: mirrorDepth}
	case paraxial.KindDiaphragm:
		return Mount{Width: max(d+2*irisRim, irisMin), Depth: irisDepth}
	case paraxial.KindSpace, paraxial.KindThinLens, paraxial.KindSphericalInterface, paraxial.KindPlanarInterface,
		paraxial.KindCylindricalLens, paraxial.KindMatrix, paraxial.KindThickLens, paraxial.KindPlate:
	}
	return Mount{Width: d + 2*lensRim, Depth: max(lensDepth, t+lensRim)}
}

// DefaultSamples is the number of beam samples along the path when
// [Spec.Samples] is zero.
const DefaultSamples = 400

// Spec says where and how to lay a system out.
type Spec struct {
	// Board is the breadboard ([MetricBoard], [ImperialBoard]).
	Board Board
	// Start is the board position of the system's input plane (z = 0),
	// which must lie on the board, and Direction the beam's direction
	// there, counterclockwise from +x (radians; write 90*units.Degree).
	Start     Point
	Direction units.Angle
	// Folds gives the fold direction of each mirror, by label. Every
	// mirror met off normal incidence needs one (a mirror at normal
	// incidence sends the beam straight back either way).
	Folds map[string]Turn
	// Mounts overrides the default footprint ([DefaultMount]) of the
	// parts with the given labels; a zero field keeps the default.
	Mounts map[string]Mount
	// Beam, when not nil, is the beam at the input plane: its 1/e²
	// radius in the board plane is sampled along the path (the band of
	// the figure) and the clearances are measured from the band's edge.
	Beam beam.Input
	// Samples is the number of beam samples along the path, 2 to
	// [beam.MaxSamples]; 0 means [DefaultSamples].
	Samples int
}

// Part is one physical part of a laid-out system: a lens, a thick lens
// or plate (its three elements), a mirror, a diaphragm, a user matrix,
// or a run of consecutive elements sharing one label.
type Part struct {
	// Name is the part's label, or [paraxial.Element.Name] of its first
	// element when it has none; Label is the label ("" without one).
	Name, Label string
	// Kind is the element kind, or KindThickLens / KindPlate for a glass
	// body of several surfaces.
	Kind paraxial.Kind
	// First and Last are the indices of its first and last element in
	// [paraxial.System.Elements].
	First, Last int
	// Z and End are the path positions of its entrance and exit (metres
	// from the input plane, along the unfolded path); Center is their
	// mean, the position placed on the board.
	Z, End, Center units.Length
	// Segment is the index in [Plan.Segments] of the straight stretch of
	// beam the part sits on (for a mirror, the one arriving at it).
	Segment int
	// At is the board position of the beam axis at Center.
	At Point
	// In and Out are the beam directions arriving at and leaving the
	// part, counterclockwise from +x in [0, 2π) (radians); they differ
	// only at a mirror.
	In, Out units.Angle
	// Normal is the direction of the part's axis: a mirror's face normal
	// (pointing out of the reflective face, towards the beams), a tilted
	// plate's surface normal, the beam direction otherwise; in [0, 2π).
	Normal units.Angle
	// AOI is the angle of incidence of a mirror or a plate (radians,
	// ≥ 0), and Turn the fold direction of a mirror (0 for other parts
	// and a mirror at normal incidence without one).
	AOI  units.Angle
	Turn Turn
	// Diameter is the optic diameter used for the footprint (for a
	// diaphragm, its opening), in metres.
	Diameter units.Length
	// Focal is the focal length of a thin or cylindrical lens or a
	// curved mirror, in metres (positive converging); zero for other
	// parts.
	Focal units.Length
	// Footprint is the mount's outline on the board: centred on the beam
	// for a lens, behind the face for a mirror.
	Footprint Rect
	// Hole is the board hole nearest to At, with At's offset from it.
	Hole Hole
	// W is the beam's 1/e² radius in the board (tangential) plane at
	// Center, in metres; zero without [Spec.Beam].
	W units.Length
	// Clearance is the least distance, in metres, from the beam (the
	// edge of its 1/e² band with [Spec.Beam], its axis without) to the
	// footprint, over the segments the part is not on; ClearSegment is
	// that segment's index, or −1 when every segment meets the part (a
	// straight path), and Clearance is then zero. A negative clearance
	// is a band that cuts into the footprint.
	Clearance    units.Length
	ClearSegment int
}

// Segment is a straight stretch of the beam between two mirrors (or the
// input and output planes).
type Segment struct {
	// From and To are its ends on the board, and Z0 ≤ Z1 their path
	// positions in metres from the input plane.
	From, To Point
	Z0, Z1   units.Length
	// Direction is the beam direction, counterclockwise from +x in
	// [0, 2π).
	Direction units.Angle
	// Z and W are the beam samples along the segment with [Spec.Beam]:
	// path positions and 1/e² radii in the board plane, in metres (the
	// samples of [beam.Sample] in [Z0, Z1], with the ends); nil
	// without.
	Z, W []units.Length
}

// Plan is a system laid out on a board: its parts, the beam's straight
// segments, and the warnings of the checks. Make it with [Lay].
type Plan struct {
	// Board is the board.
	Board Board
	// Parts holds the parts in path order, Segments the beam's straight
	// stretches in order.
	Parts    []Part
	Segments []Segment
	// Warnings holds the findings of the checks (collisions, parts off
	// the board, the beam through a part it should pass, the beam off
	// the board).
	Warnings Warnings
	// Length is the path length in metres ([paraxial.System.Length]).
	Length units.Length
	// HasBeam reports that the plan was made with a beam: Part.W and the
	// segments' samples are set.
	HasBeam bool
}

// At returns the board position and beam direction of path position z
// (metres from the input plane); before the input plane and after the
// output plane the first and last segments are extended. At a mirror it
// returns the arriving direction.
func (p Plan) At(z units.Length) (Point, units.Angle) {
	if len(p.Segments) == 0 {
		return Point{}, 0
	}
	k := len(p.Segments) - 1
	for i, s := range p.Segments {
		if z <= s.Z1 {
			k = i
			break
		}
	}
	s := p.Segments[k]
	return s.From.vec().add(unit(float64(s.Direction)).scale(float64(z - s.Z0))).point(), s.Direction
}

// span is a part before it is placed.
type span struct {
	first, last int
	kind        paraxial.Kind
	label, name string
	open        paraxial.Opening
	tilt        units.Angle
}

// spans groups the elements of sys into parts: each component (thick
// lens, plate), each mirror, each run of consecutive elements with one
// label, each unlabelled run of interfaces that leaves the input medium
// and returns to it (a lens built surface by surface), and every other
// surface on its own. Spaces are not parts.
func spans(sys paraxial.System) []span {
	elems := sys.Elements()
	compAt := make([]int, len(elems))
	for i := range compAt {
		compAt[i] = -1
	}
	comps := sys.Components()
	for k, c := range comps {
		compAt[c.First] = k
	}
	nIn := sys.IndexIn()
	var out []span
	for i := 0; i < len(elems); i++ {
		e := elems[i]
		if !e.IsSurface() {
			continue
		}
		if k := compAt[i]; k >= 0 {
			c := comps[k]
			out = append(out, span{first: c.First, last: c.Last, kind: c.Kind, label: c.Label, open: c.Aperture, tilt: c.Tilt})
			i = c.Last
			continue
		}
		last := i
		interfaceKind := e.Kind == paraxial.KindSphericalInterface || e.Kind == paraxial.KindPlanarInterface
		switch {
		case e.Kind == paraxial.KindMirror:
		case e.Label != "":
			for j := i + 1; j < len(elems) && elems[j].Label == e.Label && elems[j].Kind != paraxial.KindMirror && compAt[j] < 0; j++ {
				if elems[j].IsSurface() {
					last = j
				}
			}
		case interfaceKind && e.IndexOut != nIn:
			for j := i + 1; j < len(elems); j++ {
				f := elems[j]
				if f.Kind == paraxial.KindMirror || compAt[j] >= 0 || f.Label != "" {
					break
				}
				if f.IsSurface() {
					last = j
					if f.IndexOut == nIn {
						break
					}
				}
			}
		}
		sp := span{first: i, last: last, kind: e.Kind, label: e.Label, open: e.Aperture, tilt: e.Tilt}
		if last > i {
			sp.kind = paraxial.KindPlate
			for j := i; j <= last; j++ {
				if elems[j].Kind != paraxial.KindPlanarInterface && elems[j].IsSurface() {
					sp.kind = paraxial.KindThickLens
				}
			}
		}
		out = append(out, sp)
		i = last
	}
	for k := range out {
		out[k].name = out[k].label
		if out[k].name == "" {
			out[k].name = elems[out[k].first].Name()
		}
	}
	return out
}

// opticDiameter returns the optic diameter for a part with opening o:
// the clear diameter over 0.9 for a round opening ([DefaultMount]), the
// opening itself for a diaphragm, [DefaultDiameter] without one.
func opticDiameter(o paraxial.Opening, k paraxial.Kind) units.Length {
	if !o.Limited() || o.Shape != paraxial.Circle {
		return DefaultDiameter
	}
	if k == paraxial.KindDiaphragm {
		return o.Diameter()
	}
	return o.Diameter() / 0.9
}

// angle0 returns a reduced to [0, 2π).
func angle0(a float64) units.Angle {
	a = math.Mod(a, 2*math.Pi)
	if a < 0 {
		a += 2 * math.Pi
	}
	if a >= 2*math.Pi {
		a = 0
	}
	return units.Angle(a)
}

// Lay places sys on the board of spec, checks the placement and returns
// the plan (see the package documentation for the geometry and the
// checks). The checks' findings are warnings in the plan, not errors.
//
// It returns a [*ParamError] for a system that is not built or has no
// parts ([ErrSystem]), a bad board ([ErrBoard]), a start off the board
// or a direction that is not finite ([ErrStart]), a label in Folds or
// Mounts that names no part ([ErrLabel]), a mirror off normal incidence
// without a fold direction or with an invalid one ([ErrFold]), a bad
// mount size ([ErrMount]), a bad sample count, and the beam package's
// error for a bad beam.
func Lay(sys paraxial.System, spec Spec) (Plan, error) {
	if err := sys.Validate(); err != nil {
		return Plan{}, &ParamError{Subject: "system", Err: err}
	}
	b := spec.Board
	if err := b.Validate(); err != nil {
		return Plan{}, err
	}
	if !finite(float64(spec.Start.X)) || !finite(float64(spec.Start.Y)) || !b.Contains(spec.Start) {
		v, axis, side := spec.Start.X, "x", b.SizeX
		if spec.Start.X >= 0 && spec.Start.X <= b.SizeX {
			v, axis, side = spec.Start.Y, "y", b.SizeY
		}
		return Plan{}, &ParamError{Subject: "start", Param: "position " + axis, Value: v,
			Reason: "lies off the " + b.sizeText() + " board (" + axis + " from 0 to " + side.String() + ")", Err: ErrStart}
	}
	if !finite(float64(spec.Direction)) {
		return Plan{}, &ParamError{Subject: "start", Param: "direction", Value: spec.Direction, Reason: "must be finite", Err: ErrStart}
	}
	n := spec.Samples
	if n == 0 {
		n = DefaultSamples
	}
	if n < 2 || n > beam.MaxSamples {
		return Plan{}, &ParamError{Subject: "beam", Param: "sample count", Value: spec.Samples, Reason: "must be 0 (the default " + strconv.Itoa(DefaultSamples) + ") or in [2, " + strconv.Itoa(beam.MaxSamples) + "]"}
	}
	sp := spans(sys)
	if len(sp) == 0 {
		return Plan{}, &ParamError{Subject: "system", Param: "parts", Value: 0, Reason: "has no lens, mirror, plate or diaphragm to place", Err: ErrSystem}
	}
	if err := checkLabels(sp, spec); err != nil {
		return Plan{}, err
	}
	elems := sys.Elements()

	// The path: one segment per straight stretch, a new one at each
	// mirror, in element order.
	pl := Plan{Board: b, Length: sys.Length()}
	dir := float64(spec.Direction)
	seg := Segment{From: spec.Start, Direction: angle0(dir)}
	segOf := make([]int, len(elems)) // the segment arriving at each element
	type fold struct {
		in, out, normal float64
		turn            Turn
	}
	folds := make([]fold, len(elems))
	for i, e := range elems {
		segOf[i] = len(pl.Segments)
		if e.Kind != paraxial.KindMirror {
			continue
		}
		seg.Z1 = e.Z
		seg.To = seg.From.vec().add(unit(dir).scale(float64(e.Z - seg.Z0))).point()
		pl.Segments = append(pl.Segments, seg)
		// Reflection turns the direction by δ = π − 2θ: the arriving
		// and leaving beams make the angle 2θ with each other, on the
		// side of the face normal (law of reflection); δ = 90° at 45°,
		// 180° (straight back) at normal incidence.
		theta := math.Abs(float64(e.Tilt))
		delta := math.Pi - 2*theta
		t := spec.Folds[e.Label]
		out := dir + delta
		if t == Right {
			out = dir - delta
		}
		nrm := unit(out).sub(unit(dir))
		folds[i] = fold{in: dir, out: out, normal: math.Atan2(nrm.y, nrm.x), turn: t}
		dir = out
		seg = Segment{From: seg.To, Z0: e.Z, Direction: angle0(dir)}
	}
	seg.Z1 = sys.Length()
	seg.To = seg.From.vec().add(unit(dir).scale(float64(seg.Z1 - seg.Z0))).point()
	pl.Segments = append(pl.Segments, seg)

	for _, s := range sp {
		first, last := elems[s.first], elems[s.last]
		p := Part{Name: s.name, Label: s.label, Kind: s.kind, First: s.first, Last: s.last,
			Z: first.Z, End: last.Z + last.Length, Segment: segOf[s.first], ClearSegment: -1}
		p.Center = (p.Z + p.End) / 2
		sg := pl.Segments[p.Segment]
		p.At = sg.From.vec().add(unit(float64(sg.Direction)).scale(float64(p.Center - sg.Z0))).point()
		p.In, p.Out, p.Normal = sg.Direction, sg.Direction, sg.Direction
		p.Diameter = opticDiameter(s.open, s.kind)
		if s.first == s.last {
			p.Focal = first.Focal
		}
		m := DefaultMount(s.kind, p.Diameter, p.End-p.Z)
		if o, ok := spec.Mounts[s.label]; ok && s.label != "" {
			if o.Width > 0 {
				m.Width = o.Width
			}
			if o.Depth > 0 {
				m.Depth = o.Depth
			}
		}
		p.Footprint = Rect{Center: p.At, Axis: p.Normal, Depth: m.Depth, Width: m.Width}
		switch s.kind {
		case paraxial.KindMirror:
			f := folds[s.first]
			p.Out, p.Normal = angle0(f.out), angle0(f.normal)
			p.AOI, p.Turn = units.Angle(math.Abs(float64(s.tilt))), f.turn
			// The face is at the beam; the mount lies behind it.
			c := p.At.vec().sub(unit(f.normal).scale(float64(m.Depth) / 2))
			p.Footprint = Rect{Center: c.point(), Axis: p.Normal, Depth: m.Depth, Width: m.Width}
		case paraxial.KindPlate:
			if s.tilt != 0 {
				p.AOI = units.Angle(math.Abs(float64(s.tilt)))
				p.Normal = angle0(float64(sg.Direction) + float64(s.tilt))
				p.Footprint.Axis = p.Normal
			}
		case paraxial.KindSpace, paraxial.KindThinLens, paraxial.KindSphericalInterface, paraxial.KindPlanarInterface,
			paraxial.KindCylindricalLens, paraxial.KindMatrix, paraxial.KindThickLens, paraxial.KindDiaphragm:
		}
		p.Hole = b.Nearest(p.At)
		pl.Parts = append(pl.Parts, p)
	}

	if spec.Beam != nil {
		if err := pl.sampleBeam(sys, spec.Beam, n); err != nil {
			return Plan{}, err
		}
	}
	pl.check()
	return pl, nil
}

// sampleBeam fills the segments' beam samples and the parts' radii.
func (pl *Plan) sampleBeam(sys paraxial.System, in beam.Input, n int) error {
	if sys.Length() <= 0 {
		return &ParamError{Subject: "beam", Param: "path length", Value: sys.Length(), Reason: "must be positive to sample the beam along it"}
	}
	c, err := beam.Sample(sys, in, n)
	if err != nil {
		return &ParamError{Subject: "beam", Err: err}
	}
	for k := range pl.Segments {
		s := &pl.Segments[k]
		for i, z := range c.Z {
			if z >= s.Z0 && z <= s.Z1 {
				s.Z = append(s.Z, z)
				s.W = append(s.W, c.W[i])
			}
		}
	}
	for k := range pl.Parts {
		p := &pl.Parts[k]
		g, err := beam.AtXY(sys, in, p.Center)
		if err != nil {
			return &ParamError{Subject: "beam at " + errtext.Quote(p.Name), Err: err}
		}
		p.W = g.X.Radius()
	}
	pl.HasBeam = true
	return nil
}

// checkLabels validates spec.Folds and spec.Mounts against the parts.
func checkLabels(sp []span, spec Spec) error {
	var mirrors, labels []string
	for _, s := range sp {
		if s.label != "" && !slices.Contains(labels, s.label) {
			labels = append(labels, s.label)
		}
		if s.kind == paraxial.KindMirror && s.label != "" {
			mirrors = append(mirrors, s.label)
		}
	}
	list := func(ls []string, what string) string {
		if len(ls) == 0 {
			return "the system has no labelled " + what
		}
		q := make([]string, len(ls))
		for i, l := range ls {
			q[i] = errtext.Quote(l)
		}
		return "the " + what + " labels are " + strings.Join(q, ", ")
	}
	// Sorted keys: the first error reported does not depend on map order.
	keys := func(m map[string]Turn) []string {
		out := make([]string, 0, len(m))
		for k := range m {
			out = append(out, k)
		}
		slices.Sort(out)
		return out
	}
	for _, l := range keys(spec.Folds) {
		t := spec.Folds[l]
		switch c := count(mirrors, l); {
		case c == 0 && slices.Contains(labels, l):
			return &ParamError{Subject: "Folds", Param: "label", Value: errtext.Quote(l), Reason: "names a part that is not a mirror; " + list(mirrors, "mirror"), Err: ErrLabel}
		case c == 0:
			return &ParamError{Subject: "Folds", Param: "label", Value: errtext.Quote(l), Reason: "no mirror has this label; " + list(mirrors, "mirror"), Err: ErrLabel}
		case c > 1:
			return &ParamError{Subject: "Folds", Param: "label", Value: errtext.Quote(l), Reason: strconv.Itoa(c) + " mirrors carry it; label each mirror uniquely", Err: ErrLabel}
		}
		if t != Left && t != Right {
			return &ParamError{Subject: "mirror " + errtext.Quote(l), Param: "fold", Value: int(t), Reason: "must be plan.Left or plan.Right", Err: ErrFold}
		}
	}
	mkeys := make([]string, 0, len(spec.Mounts))
	for k := range spec.Mounts {
		mkeys = append(mkeys, k)
	}
	slices.Sort(mkeys)
	for _, l := range mkeys {
		if !slices.Contains(labels, l) {
			return &ParamError{Subject: "Mounts", Param: "label", Value: errtext.Quote(l), Reason: "no part has this label; " + list(labels, "part"), Err: ErrLabel}
		}
		m := spec.Mounts[l]
		for _, f := range []struct {
			name string
			v    units.Length
		}{{"width", m.Width}, {"depth", m.Depth}} {
			if !(f.v >= 0) || math.IsInf(float64(f.v), 0) {
				return &ParamError{Subject: "mount of " + errtext.Quote(l), Param: f.name, Value: f.v, Reason: "must be non-negative and finite (0 keeps the default)", Err: ErrMount}
			}
		}
	}
	for _, s := range sp {
		if s.kind != paraxial.KindMirror || s.tilt == 0 {
			continue
		}
		if s.label == "" {
			return &ParamError{Subject: s.name, Param: "angle of incidence θ", Value: units.Angle(math.Abs(float64(s.tilt))),
				Reason: "this mirror has no label: label it and give its fold direction (plan.Left or plan.Right) in Spec.Folds", Err: ErrFold}
		}
		if _, ok := spec.Folds[s.label]; !ok {
			return &ParamError{Subject: "mirror " + errtext.Quote(s.label), Param: "angle of incidence θ", Value: units.Angle(math.Abs(float64(s.tilt))),
				Reason: "no fold direction given: add " + errtext.Quote(s.label) + ": plan.Left or plan.Right to Spec.Folds", Err: ErrFold}
		}
	}
	return nil
}

func count(ls []string, l string) int {
	n := 0
	for _, x := range ls {
		if x == l {
			n++
		}
	}
	return n
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
