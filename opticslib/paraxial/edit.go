package paraxial

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrSplitComponent is returned (wrapped in an [*ElementError]) by
// [System.Replace] when the replaced range cuts through a thick lens or a
// plate.
var ErrSplitComponent = errors.New("range cuts through a component (thick lens or plate); replace all of its elements")

// ErrIndexChange is returned (wrapped in an [*ElementError]) by
// [System.Replace] when the replacement does not start or end in the
// medium of the replaced range.
var ErrIndexChange = errors.New("replacement changes the refractive index at its boundary")

// assemble copies elems and comps, sets the positions Z, fills in the
// component geometry and composes the matrices. If a running product or
// position overflows it returns an [*ElementError] naming the element
// after which that happened and wrapping [ErrOverflow].
func assemble(elems []Element, comps []Component, nIn, nOut float64) (System, error) {
	s := System{
		elems:   append([]Element(nil), elems...),
		comps:   append([]Component(nil), comps...),
		nIn:     nIn,
		nOut:    nOut,
		matrixX: Identity(),
		matrixY: Identity(),
	}
	var z units.Length
	for i := range s.elems {
		e := &s.elems[i]
		e.Z = z
		z += e.Length
		s.matrixX = s.matrixX.Then(e.X)
		s.matrixY = s.matrixY.Then(e.Y)
		if !s.matrixX.finite() || !s.matrixY.finite() || !finite(float64(z)) {
			return System{}, &ElementError{Index: i, Kind: e.Kind, Err: ErrOverflow}
		}
	}
	s.length = z
	for i := range s.comps {
		c := &s.comps[i]
		front, glass, back := s.elems[c.First], s.elems[c.First+1], s.elems[c.Last]
		c.Z, c.Length, c.Index, c.Aperture = front.Z, glass.Length, glass.IndexIn, front.Aperture
		c.R1, c.R2 = surfaceRadius(front), surfaceRadius(back)
		c.Thickness = glass.Length
		if c.Kind == KindPlate {
			c.Tilt = front.Tilt
			c.Thickness = glass.Length * units.Length(math.Cos(float64(back.Tilt)))
		}
	}
	return s, nil
}

func surfaceRadius(e Element) units.Length {
	if e.Kind == KindSphericalInterface {
		return e.Radius
	}
	return Flat
}

func (s System) checkIndex(i int, op string) {
	if i < 0 || i >= len(s.elems) {
		panic("paraxial: " + op + ": element index " + strconv.Itoa(i) + " out of range [0, " + strconv.Itoa(len(s.elems)) + ")")
	}
}

// WithSpace returns a copy of s in which space element i has length d
// (metres, ≥ 0, finite); s itself is unchanged. Positions of the later
// elements move by the difference. Changing the glass space of a thick
// lens or plate changes its thickness.
//
// It returns an [*ElementError] if element i is not a space or d is
// invalid, and an [*ElementError] wrapping [ErrOverflow] if the new system
// overflows. It panics if i is out of range.
func (s System) WithSpace(i int, d units.Length) (System, error) {
	s.checkIndex(i, "WithSpace")
	e := s.elems[i]
	if e.Kind != KindSpace {
		return System{}, &ElementError{Index: i, Kind: e.Kind, Op: "WithSpace", Reason: "element " + strconv.Itoa(i) + " is a " + e.Kind.String() + ", not a space"}
	}
	if !finite(float64(d)) || d < 0 {
		return System{}, &ElementError{Index: i, Kind: KindSpace, Param: "length d", Value: float64(d), Length: true, Reason: "must be non-negative and finite"}
	}
	elems := append([]Element(nil), s.elems...)
	m := Space(d)
	elems[i].Length, elems[i].X, elems[i].Y = d, m, m
	return assemble(elems, s.comps, s.nIn, s.nOut)
}

// Replace returns a copy of s in which elements i to j−1 are replaced by
// the elements of sub (which may be empty, to delete them, or have any
// length); s and sub are unchanged. Use it to swap a lens: find the lens
// with [System.Lookup] and put a sub-system built with a [Builder] in its
// place. Positions after the range move by the change in length.
//
// It returns an [*ElementError] wrapping [ErrSplitComponent] if [i, j)
// cuts through a component, and one wrapping [ErrIndexChange] if sub does
// not start in the medium before element i and end in the medium after
// element j−1 (relative tolerance 1e-12), and one wrapping [ErrOverflow]
// if the new system overflows. It panics if 0 ≤ i ≤ j ≤ Len() does not
// hold.
func (s System) Replace(i, j int, sub System) (System, error) {
	if i < 0 || j < i || j > len(s.elems) {
		panic("paraxial: Replace: range [" + strconv.Itoa(i) + ", " + strconv.Itoa(j) + ") invalid for " + strconv.Itoa(len(s.elems)) + " elements")
	}
	for _, c := range s.comps {
		inside := c.First >= i && c.Last < j
		outside := c.Last < i || c.First >= j
		if !inside && !outside {
			return System{}, &ElementError{Index: c.First, Kind: c.Kind, Op: "Replace", Err: ErrSplitComponent}
		}
	}
	before, after := s.nIn, s.nOut
	if i > 0 {
		before = s.elems[i-1].IndexOut
	}
	if j < len(s.elems) {
		after = s.elems[j].IndexIn
	} else if i == j && i > 0 {
		after = before
	}
	same := func(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(math.Abs(a), math.Abs(b)) }
	subIn, subOut := sub.nIn, sub.nOut
	if len(sub.elems) == 0 {
		subIn, subOut = before, before
	}
	if !same(subIn, before) {
		return System{}, &ElementError{Index: i, Kind: kindAt(s, i), Op: "Replace", Param: "replacement input index", Value: subIn, Reason: "medium there has n = " + strconv.FormatFloat(before, 'g', -1, 64), Err: ErrIndexChange}
	}
	if j < len(s.elems) && !same(subOut, after) {
		return System{}, &ElementError{Index: j, Kind: kindAt(s, j), Op: "Replace", Param: "replacement output index", Value: subOut, Reason: "medium there has n = " + strconv.FormatFloat(after, 'g', -1, 64), Err: ErrIndexChange}
	}
	nOut := s.nOut
	if j == len(s.elems) {
		nOut = subOut
	}
	elems := make([]Element, 0, len(s.elems)-(j-i)+len(sub.elems))
	elems = append(elems, s.elems[:i]...)
	elems = append(elems, sub.elems...)
	elems = append(elems, s.elems[j:]...)
	shift := len(sub.elems) - (j - i)
	var comps []Component
	for _, c := range s.comps {
		if c.Last < i {
			comps = append(comps, c)
		}
	}
	for _, c := range sub.comps {
		c.First += i
		c.Last += i
		comps = append(comps, c)
	}
	for _, c := range s.comps {
		if c.First >= j {
			c.First += shift
			c.Last += shift
			comps = append(comps, c)
		}
	}
	nIn := s.nIn
	if i == 0 && len(elems) > 0 {
		nIn = elems[0].IndexIn
	}
	return assemble(elems, comps, nIn, nOut)
}

func kindAt(s System, i int) Kind {
	if i < len(s.elems) {
		return s.elems[i].Kind
	}
	return KindSpace
}

// Lookup returns the range [i, j) of the first run of consecutive
// elements labelled name (all three elements of a labelled thick lens, for
// example), and ok = false if no element has that label.
func (s System) Lookup(name string) (i, j int, ok bool) {
	for k, e := range s.elems {
		if e.Label != name {
			continue
		}
		j = k + 1
		for j < len(s.elems) && s.elems[j].Label == name {
			j++
		}
		return k, j, true
	}
	return 0, 0, false
}

// Reverse returns the system traversed backwards: light enters at the old
// output plane, in the old output medium, and meets the elements in
// reverse order. Each element matrix M becomes [Matrix.Reverse](M); a
// refracting surface of radius R from n1 to n2 becomes one of radius −R
// from n2 to n1 (the same physical surface seen from the other side); a
// tilted surface's angle becomes its refraction angle. Mirrors, thin and
// cylindrical lenses and spaces are unchanged. The reversed matrix is
// Matrix().Reverse(), its front and back focal lengths are swapped, and
// EFL is unchanged (analytic identities; Gerrard & Burch 1975, §II.7
// [from memory]).
//
// It returns an [*ElementError] wrapping [ErrOverflow] if the reversed
// product overflows, which for a system that built without overflow can
// happen only at the edge of the float64 range.
func (s System) Reverse() (System, error) {
	n := len(s.elems)
	elems := make([]Element, n)
	for k, e := range s.elems {
		r := e
		r.X, r.Y = e.X.Reverse(), e.Y.Reverse()
		r.IndexIn, r.IndexOut = e.IndexOut, e.IndexIn
		switch e.Kind {
		case KindSphericalInterface:
			r.Radius = -e.Radius
		case KindPlanarInterface:
			if e.Tilt != 0 {
				r.Tilt = units.Angle(math.Asin(e.IndexIn * math.Sin(float64(e.Tilt)) / e.IndexOut))
			}
		case KindSpace, KindThinLens, KindMirror, KindCylindricalLens, KindMatrix, KindThickLens, KindPlate, KindDiaphragm:
		}
		elems[n-1-k] = r
	}
	comps := make([]Component, len(s.comps))
	for k, c := range s.comps {
		c.First, c.Last = n-1-c.Last, n-1-c.First
		comps[len(s.comps)-1-k] = c
	}
	return assemble(elems, comps, s.nOut, s.nIn)
}
