package paraxial

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNoStop is returned by [System.Stops] when no element has a clear
// aperture that limits the axial pencil.
var ErrNoStop = errors.New("paraxial: no clear aperture limits the axial pencil; set one with Builder.Aperture")

// ErrAxisOutside is returned (wrapped in an [*ElementError] naming the
// part) by [System.Stops] when an opening is offset so far that the optical
// axis lies outside it: no paraxial pencil passes.
var ErrAxisOutside = errors.New("the optical axis lies outside this clear aperture (its offset exceeds its size)")

// ErrStopImaged is returned by [System.Stops] when the chief ray is
// undefined: the object (finite) is imaged onto the stop, or (object at
// infinity) the stop is at a focal plane of the optics before it.
var ErrStopImaged = errors.New("paraxial: chief ray undefined: the object is conjugate to the aperture stop")

// Object is the object of an aperture analysis: a plane at a finite
// axial position, or a point at infinity.
type Object struct {
	// Z is the axial position of the object plane in metres from the
	// input plane; it must be at or before the first surface. It is not
	// used when Infinite is true.
	Z units.Length
	// Infinite selects an object at infinity (rays enter as parallel
	// pencils; fields are angles).
	Infinite bool
}

// ObjectAt returns a finite object plane at axial position z (metres).
func ObjectAt(z units.Length) Object { return Object{Z: z} }

// ObjectAtInfinity returns an object at infinity.
func ObjectAtInfinity() Object { return Object{Infinite: true} }

// Field is a field point: an object height for a finite object, or a field
// angle for an object at infinity; the other member is ignored.
type Field struct {
	// Height is the object height in metres (finite objects).
	Height units.Length
	// Angle is the field angle in radians (objects at infinity).
	Angle units.Angle
}

// Pupil is the image of the aperture stop in object space (entrance pupil)
// or image space (exit pupil).
type Pupil struct {
	// Z is the axial position in metres from the input plane; zero when
	// AtInfinity.
	Z units.Length
	// Radius is the pupil radius in metres; zero when AtInfinity.
	Radius units.Length
	// Magnification is the pupil magnification relative to the stop
	// (radius/stop radius, signed).
	Magnification float64
	// AtInfinity reports a telecentric space: the pupil is imaged to
	// infinity.
	AtInfinity bool
}

// Stops is the result of a first-order aperture analysis of a system for
// one object, in one plane: aperture stop, pupils, marginal and chief
// rays, numerical apertures and field of view ([System.Stops]).
//
// Rays are given at the start plane: the object plane for a finite
// object, the input plane z = 0 for an object at infinity. The marginal
// ray leaves the axial object point (or enters parallel to the axis) and
// grazes the edge of the aperture stop. The chief ray leaves the edge of
// the field and crosses the axis at the centre of the stop. A general ray
// from field f through relative pupil coordinate ρ ∈ [−1, 1] is, by
// linearity, chief(f) + ρ·marginal (see [Stops.Ray]).
//
// The aperture stop is the element whose clear aperture, divided by the
// marginal ray height there, is smallest (W. J. Smith, Modern Optical
// Engineering, 4th ed., ch. 6 [from memory]); the field stop is the
// element other than the stop with the smallest ratio of clear aperture to
// chief-ray height. Of apertures equal within a relative 1e-9 (equal by
// design), the first met is chosen. Pupils are the images of the stop
// through the elements before it (entrance) and after it (exit).
//
// With P = [[A, B], [C, D]] the matrix from the start plane to the stop
// and Q the matrix from the stop to the output plane,
//
//	entrance pupil  z = Start + B/A,  radius = stop radius/|A|
//	exit pupil      z = Length − Q.B/Q.D,  magnification det Q/Q.D
//	chief ray       y = −B/A at θ = 1 (object at infinity),
//	                θ = −A/B at y = 1 (finite object)
//
// A pupil is at infinity (telecentric), and the chief ray undefined, when
// the deciding entry (A, Q.D or B) is zero to within 1e-12 of the size of
// the terms that cancel in it, far above rounding; it is never reported
// at a huge finite distance.
type Stops struct {
	// Object and Plane are the inputs of the analysis.
	Object Object
	Plane  Plane
	// Start is the axial position at which the rays below are given.
	Start units.Length
	// Stop is the element index of the aperture stop, StopName its label
	// (or [Element.Name] when it has none) and StopZ its position (a
	// space's entrance or exit when the stop is a tube).
	Stop     int
	StopName string
	StopZ    units.Length
	// StopRadius is the half-opening of the stop in this plane, in metres:
	// the distance from the axis to the nearer edge, projected onto the
	// beam's transverse plane for a tilted part.
	StopRadius units.Length
	// Entrance and Exit are the pupils.
	Entrance, Exit Pupil
	// Marginal is the marginal ray at Start.
	Marginal Ray
	// ObjectNA is n·|θ| of the marginal ray in object space (0 for an
	// object at infinity); ImageNA is n'·|θ'| in image space. Paraxial
	// NA = n·u.
	ObjectNA, ImageNA float64
	// WorkingFNumber is 1/(2·ImageNA), the paraxial working f-number
	// (Smith, ch. 6 [from memory]); zero when ImageNA = 0 (image at
	// infinity).
	WorkingFNumber float64
	// FNumber is EFL/(2·entrance-pupil radius) for an object at infinity
	// (equal to WorkingFNumber there) and zero otherwise.
	FNumber float64
	// FieldStop is the element index of the field stop, or −1 if no other
	// clear aperture limits the field; the fields below are then zero.
	// FieldStopName is its label, or [Element.Name] without one.
	FieldStop     int
	FieldStopName string
	// HalfField is the field at which the chief ray reaches the edge of
	// the field stop (50 % vignetting, the usual field of view); the full
	// field of view is twice it.
	HalfField Field
	// UnvignettedField is the largest field whose whole pencil passes
	// every aperture (|y_chief| + |y_marginal| ≤ aperture everywhere).
	UnvignettedField Field

	chief Ray // chief ray for unit field (1 m height or 1 rad)
}

// Ray returns the ray at Start from field point f through relative pupil
// coordinate rho (−1 and 1 are the pupil edges, 0 the chief ray):
// chief(f) + rho·Marginal.
func (a Stops) Ray(f Field, rho float64) Ray {
	k := float64(f.Height)
	if a.Object.Infinite {
		k = float64(f.Angle)
	}
	return Ray{
		Y:     units.Length(k*float64(a.chief.Y) + rho*float64(a.Marginal.Y)),
		Theta: units.Angle(k*float64(a.chief.Theta) + rho*float64(a.Marginal.Theta)),
	}
}

// Chief returns the chief ray at Start for field point f, Ray(f, 0).
func (a Stops) Chief(f Field) Ray { return a.Ray(f, 0) }

// start validates obj and returns the start plane of its rays.
func (s System) start(obj Object, p Plane) (units.Length, error) {
	if err := s.check(p); err != nil {
		return 0, err
	}
	if len(s.elems) == 0 {
		return 0, ErrEmpty
	}
	if obj.Infinite {
		return 0, nil
	}
	if !finite(float64(obj.Z)) {
		return 0, ErrNonFinite
	}
	for i, e := range s.elems {
		if !e.IsSurface() {
			continue
		}
		if obj.Z > e.Z {
			err := elementError(i, e)
			err.Param, err.Value, err.Reason = "object position z", obj.Z, "Stops: must be at or before this first surface at z = "+e.Z.String()
			return 0, err
		}
		break
	}
	return obj.Z, nil
}

// prefix returns the matrix from the plane z0 (at or before every
// surface) through elements 0..upto−1, and the product of the entrywise
// magnitudes (the scale for nearZero).
func (s System) prefix(z0 units.Length, upto int, p Plane) (m, bound Matrix) {
	m, bound = Identity(), Identity()
	s.walk(z0, s.length, func(pc *piece) bool {
		if pc.i >= upto {
			return false
		}
		em := Space(pc.to - pc.from)
		if pc.e != nil && pc.e.Kind != KindSpace {
			em = pc.e.matrix(p)
		}
		m, bound = m.Then(em), bound.Then(em.abs())
		return true
	})
	return m, bound
}

// tieTolerance is the relative margin by which an aperture must be
// smaller than an earlier one to replace it as the aperture or field stop,
// so that apertures equal by design (two identical lenses of a relay) are
// resolved in favour of the first rather than by rounding. It is the
// margin of [Step.Blocked].
const tieTolerance = 1e-9

// stopCandidate is an aperture position visited by a trace.
type stopCandidate struct {
	elem  int
	z     units.Length
	a     units.Length // half-opening in the plane analysed
	after bool         // the plane is after the element (space exit, or surface)
}

// apertureHeights calls f for every aperture met by ray r from z0 in
// plane p, with the ray height y there and the bound yb, the same height
// traced with the entrywise magnitudes of the matrices (the scale for
// nearZero). A space's aperture (a tube) is visited at both ends: ray
// heights are linear along a gap, so the ends bound them. A surface is
// visited with the height of the ray arriving at it.
func (s System) apertureHeights(r Ray, z0 units.Length, p Plane, f func(c stopCandidate, y, yb float64)) {
	rb := Ray{Y: units.Length(math.Abs(float64(r.Y))), Theta: units.Angle(math.Abs(float64(r.Theta)))}
	apply := func(m Matrix) { r, rb = m.Apply(r), m.abs().Apply(rb) }
	s.walk(z0, s.length, func(pc *piece) bool {
		if pc.e == nil {
			apply(Space(pc.to - pc.from))
			return true
		}
		h, limited := pc.e.Aperture.halfOpening(p, pc.e.Tilt)
		if pc.e.Kind == KindSpace {
			if limited {
				f(stopCandidate{elem: pc.i, z: pc.from, a: units.Length(h)}, float64(r.Y), float64(rb.Y))
			}
			apply(Space(pc.to - pc.from))
			if limited {
				f(stopCandidate{elem: pc.i, z: pc.to, a: units.Length(h), after: true}, float64(r.Y), float64(rb.Y))
			}
			return true
		}
		// A surface's opening is checked against the arriving ray, in the
		// frame in which its angle of incidence (Tilt) is given: a tilted
		// interface rescales heights (A = cos θ′/cos θ), a thin element
		// does not.
		if limited {
			f(stopCandidate{elem: pc.i, z: pc.e.Z, a: units.Length(h)}, float64(r.Y), float64(rb.Y))
		}
		apply(pc.e.matrix(p))
		return true
	})
}

// Stops finds the aperture stop, pupils, marginal and chief rays,
// numerical apertures, f-numbers and field of view of s for object obj in
// plane p (see [Stops]). Clear apertures are set with [Builder.Aperture]
// and [Builder.Diaphragm]; an aperture on a space (a tube) is checked at
// both ends, and a part met at an angle θ limits the tangential plane to
// its clear radius × cos θ.
//
// It returns [ErrNotBuilt] for the zero System, [ErrPlane] for an unknown
// plane, [ErrEmpty] for an empty system, an [*ElementError] for an object
// after the first surface, [ErrNonFinite] for a non-finite object
// position, [ErrNoStop] if no aperture limits the axial pencil,
// [ErrStopImaged] if the chief ray is undefined, and [ErrOverflow] if a
// result is not finite.
func (s System) Stops(obj Object, p Plane) (Stops, error) {
	z0, err := s.start(obj, p)
	if err != nil {
		return Stops{}, err
	}
	a := Stops{Object: obj, Plane: p, Start: z0, Stop: -1, FieldStop: -1}
	trial := Ray{Theta: 1}
	if obj.Infinite {
		trial = Ray{Y: 1}
	}
	best := math.Inf(1)
	var stop stopCandidate
	axisBlocked := -1
	s.apertureHeights(trial, z0, p, func(c stopCandidate, y, yb float64) {
		if c.a <= 0 && axisBlocked < 0 {
			axisBlocked = c.elem
		}
		if nearZero(y, yb) {
			return // an aperture in an image of the object plane limits no pencil
		}
		if r := float64(c.a) / math.Abs(y); r < best*(1-tieTolerance) {
			best, stop = r, c
		}
	})
	if axisBlocked >= 0 {
		err := elementError(axisBlocked, s.elems[axisBlocked])
		err.Param, err.Value, err.Reason, err.Err = "clear radius", s.elems[axisBlocked].Aperture.Radius, "Stops", ErrAxisOutside
		return Stops{}, err
	}
	if math.IsInf(best, 1) {
		return Stops{}, ErrNoStop
	}
	a.Stop, a.StopZ, a.StopRadius = stop.elem, stop.z, stop.a
	a.StopName = labelOrName(s.elems[stop.elem])
	a.Marginal = Ray{Y: trial.Y * units.Length(best), Theta: trial.Theta * units.Angle(best)}

	// Matrices from the start plane to the stop plane, and from the stop
	// plane to the output plane.
	split := stop.elem
	if stop.after {
		split++
	}
	pm, pb := s.prefix(z0, split, p)
	qm, qb := s.product(split, len(s.elems), p)
	// Entrance pupil: plane z with B = 0 from z to the stop, radius
	// a/|A| (A is unchanged by the extra space). A ≈ 0 (the stop in the
	// rear focal plane of the optics before it) puts it at infinity.
	if nearZero(pm.A, pb.A) {
		a.Entrance = Pupil{AtInfinity: true}
	} else {
		a.Entrance = Pupil{
			Z:             z0 + units.Length(pm.B/pm.A),
			Radius:        units.Length(float64(a.StopRadius) / math.Abs(pm.A)),
			Magnification: 1 / pm.A,
		}
	}
	// Exit pupil: image of the stop through qm.
	if nearZero(qm.D, qb.D) {
		a.Exit = Pupil{AtInfinity: true}
	} else {
		m := qm.Det() / qm.D
		a.Exit = Pupil{
			Z:             s.length + units.Length(-qm.B/qm.D),
			Radius:        units.Length(float64(a.StopRadius) * math.Abs(m)),
			Magnification: m,
		}
	}

	// Chief ray for unit field, through the centre of the stop:
	// A y + B θ = 0 at the stop.
	if obj.Infinite {
		if a.Entrance.AtInfinity {
			return Stops{}, ErrStopImaged
		}
		a.chief = Ray{Y: units.Length(-pm.B / pm.A), Theta: 1}
	} else {
		if nearZero(pm.B, pb.B) {
			return Stops{}, ErrStopImaged
		}
		a.chief = Ray{Y: 1, Theta: units.Angle(-pm.A / pm.B)}
	}

	// Numerical apertures and f-numbers.
	whole, _ := s.prefix(z0, len(s.elems), p)
	out := whole.Apply(a.Marginal)
	if !obj.Infinite {
		a.ObjectNA = s.nIn * math.Abs(float64(a.Marginal.Theta))
	}
	a.ImageNA = s.nOut * math.Abs(float64(out.Theta))
	if a.ImageNA > 0 {
		a.WorkingFNumber = 1 / (2 * a.ImageNA)
	}
	if obj.Infinite && !a.Entrance.AtInfinity {
		if c, err := s.Cardinal(p); err == nil && !c.Afocal {
			a.FNumber = math.Abs(float64(c.EFL)) / (2 * float64(a.Entrance.Radius))
		}
	}

	// Field stop and field of view from the chief and marginal heights.
	type height struct {
		c stopCandidate
		y float64
	}
	var marg []height
	s.apertureHeights(a.Marginal, z0, p, func(c stopCandidate, y, _ float64) { marg = append(marg, height{c, y}) })
	half, unvig := math.Inf(1), math.Inf(1)
	k := 0
	s.apertureHeights(a.chief, z0, p, func(c stopCandidate, y, yb float64) {
		ym := math.Abs(marg[k].y)
		k++
		if c == stop || nearZero(y, yb) {
			return // the chief ray crosses the axis here: no field limit
		}
		yc := math.Abs(y)
		if r := float64(c.a) / yc; r < half*(1-tieTolerance) {
			half = r
			a.FieldStop = c.elem
		}
		unvig = math.Min(unvig, math.Max(0, float64(c.a)-ym)/yc)
	})
	if a.FieldStop >= 0 {
		a.FieldStopName = labelOrName(s.elems[a.FieldStop])
		if obj.Infinite {
			a.HalfField = Field{Angle: units.Angle(half)}
			a.UnvignettedField = Field{Angle: units.Angle(unvig)}
		} else {
			a.HalfField = Field{Height: units.Length(half)}
			a.UnvignettedField = Field{Height: units.Length(unvig)}
		}
	}
	for _, v := range []float64{float64(a.Entrance.Z), float64(a.Entrance.Radius), float64(a.Exit.Z), float64(a.Exit.Radius),
		float64(a.chief.Y), float64(a.chief.Theta), float64(a.Marginal.Y), float64(a.Marginal.Theta), a.ImageNA, a.FNumber, a.WorkingFNumber} {
		if !finite(v) {
			return Stops{}, ErrOverflow
		}
	}
	return a, nil
}

// labelOrName returns e's label, or its Name without one.
func labelOrName(e Element) string {
	if e.Label != "" {
		return e.Label
	}
	return e.Name()
}

// Step is one point of a traced ray: the ray just after element Element
// (at the end of a space), at axial position Z.
type Step struct {
	// Element is the index of the element just passed; −1 for points in
	// object space before the first element (the start point), Len() for
	// the end point in the output space beyond the last element.
	Element int
	// Z is the axial position in metres.
	Z units.Length
	// Ray is the ray at Z, after the element.
	Ray Ray
	// Blocked reports that the ray lies outside the element's clear
	// aperture (at either end of a space, or arriving at a surface), by
	// more than a relative 1e-9 of its size so that marginal rays
	// constructed to graze the stop pass.
	Blocked bool
}

// blocked reports that height y lies outside the opening of e in plane p
// (with a relative margin of [tieTolerance] of the opening's size, so that
// marginal rays constructed to graze the stop pass).
func blocked(y units.Length, e *Element, p Plane) bool {
	l := &e.lim[p&1]
	v := float64(y)
	return l.ok && (v < l.lo || v > l.hi)
}

// Trace traces ray r, given at axial position from, element by element to
// position to (from ≤ to, both finite, metres from the input plane) in
// plane p, and appends one [Step] per element met to dst[:0], plus the
// start point and, if to lies beyond the last element, the end point.
// Surfaces at from are included. Rays beyond a clear aperture are flagged
// (Blocked) but traced on, so that a caller can draw or count them.
// With a dst of sufficient capacity it does not allocate.
//
// It returns [ErrNotBuilt], [ErrPlane], [ErrNonFinite] if from, to or r is
// not finite, [ErrOrder] if from > to, and [ErrOverflow] if a ray
// overflows.
func (s System) Trace(r Ray, from, to units.Length, p Plane, dst []Step) ([]Step, error) {
	dst = dst[:0]
	if err := s.check(p); err != nil {
		return dst, err
	}
	if !finite(float64(from)) || !finite(float64(to)) || !finite(float64(r.Y)) || !finite(float64(r.Theta)) {
		return dst, ErrNonFinite
	}
	if from > to {
		return dst, ErrOrder
	}
	dst = append(dst, Step{Element: -1, Z: from, Ray: r})
	// The walk of System.walker, written out for speed with its boundary
	// rule clip.
	if from < 0 {
		r = Space(min(to, 0) - from).Apply(r)
		if to < 0 {
			dst = append(dst, Step{Element: -1, Z: to, Ray: r})
		}
	}
	for i := range s.elems {
		e := &s.elems[i] // not a copy: Element is large and this loop is hot
		a, b, keep, stop := clip(e, from, to)
		if stop {
			break
		}
		if !keep {
			continue
		}
		if e.Kind == KindSpace {
			bl := blocked(r.Y, e, p)
			r = Space(b - a).Apply(r)
			dst = append(dst, Step{Element: i, Z: b, Ray: r, Blocked: bl || blocked(r.Y, e, p)})
			continue
		}
		// The opening is checked against the arriving ray (see
		// apertureHeights).
		bl := blocked(r.Y, e, p)
		r = e.matrix(p).Apply(r)
		dst = append(dst, Step{Element: i, Z: e.Z, Ray: r, Blocked: bl})
	}
	if to > s.length {
		r = Space(to - max(from, s.length)).Apply(r)
		dst = append(dst, Step{Element: len(s.elems), Z: to, Ray: r})
	}
	if !finite(float64(r.Y)) || !finite(float64(r.Theta)) {
		return dst, ErrOverflow
	}
	return dst, nil
}

// MaxFanRays is the largest ray count [System.Fan] accepts, and
// MaxFanSteps the largest number of steps (rays × (elements + 2)) of one
// fan: a fan is drawn or summarised, and 10⁶ steps are 40 MB.
const (
	MaxFanRays  = 10000
	MaxFanSteps = 1000000
)

// Fan is a set of rays from one field point filling the entrance pupil,
// traced through a system.
type Fan struct {
	// Field is the field point of the fan.
	Field Field
	// Pupil holds the relative pupil coordinate ρ of each ray, from −1 to
	// 1.
	Pupil []float64
	// Rays holds the traced path of each ray, in the order of Pupil.
	Rays [][]Step
}

// Fan traces n rays (1 ≤ n ≤ [MaxFanRays], at most [MaxFanSteps] steps
// in all) from field point f through the
// entrance pupil of a (computed by [System.Stops] for s), at equally
// spaced pupil coordinates ρ from −1 to 1 (n = 1 gives the chief ray
// alone), from a.Start to position to. Blocked steps are flagged as in
// [System.Trace].
//
// It returns an [*ElementError] if n is out of range, and the errors of
// [System.Trace].
func (s System) Fan(a Stops, f Field, n int, to units.Length) (Fan, error) {
	if n < 1 || n > MaxFanRays {
		return Fan{}, &ElementError{Method: "Fan", Index: -1, Param: "ray count n", Value: n, Reason: "must be in [1, " + strconv.Itoa(MaxFanRays) + "]"}
	}
	if err := s.Validate(); err != nil {
		return Fan{}, err
	}
	if steps := n * (len(s.elems) + 2); steps > MaxFanSteps {
		return Fan{}, &ElementError{Method: "Fan", Index: -1, Param: "ray count n", Value: n,
			Reason: "× " + strconv.Itoa(len(s.elems)+2) + " steps per ray exceeds " + strconv.Itoa(MaxFanSteps) + " steps; trace fewer rays"}
	}
	fan := Fan{Field: f, Pupil: make([]float64, n), Rays: make([][]Step, n)}
	for i := range n {
		rho := 0.0
		if n > 1 {
			rho = -1 + 2*float64(i)/float64(n-1)
		}
		steps, err := s.Trace(a.Ray(f, rho), a.Start, to, a.Plane, make([]Step, 0, len(s.elems)+2))
		if err != nil {
			return Fan{}, err
		}
		fan.Pupil[i], fan.Rays[i] = rho, steps
	}
	return fan, nil
}
