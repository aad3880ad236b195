package paraxial

import (
	"errors"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
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
func assemble(elems []Element, comps []Component, nIn, nOut float64, method string) (System, error) {
	s := System{
		built:   true,
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
		for p := range e.lim {
			lo, hi, ok := e.Aperture.Limits(Plane(p), e.Tilt)
			m := float64(e.Aperture.Radius) * tieTolerance
			e.lim[p] = limit{lo: lo - m, hi: hi + m, ok: ok}
		}
		z += e.Length
		s.matrixX = s.matrixX.Then(e.X)
		s.matrixY = s.matrixY.Then(e.Y)
		if !s.matrixX.finite() || !s.matrixY.finite() || !finite(float64(z)) {
			err := elementError(i, *e)
			err.Reason, err.Err = method+": the running product overflows here", ErrOverflow
			return System{}, err
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

// Part is the run of consecutive elements that carry one label: a lens,
// the three elements of a thick lens, a labelled space, or a labelled
// sub-assembly.
type Part struct {
	// Label is the label.
	Label string
	// First and Last are the indices in [System.Elements] of its first and
	// last element.
	First, Last int
	// Z is the position of its entrance (front vertex) and End that of its
	// exit, in metres from the input plane; End = Z for a single surface.
	Z, End units.Length
}

// Part returns the run of consecutive elements labelled label: the
// elements whose label is label, or, for an appended assembly, starts
// with label + "/" (see [Builder.Append]). It returns an [*ElementError]
// wrapping [ErrNoLabel], which lists the labels there are, if no element
// has it, one wrapping [ErrAmbiguousLabel] if it names two separate runs
// (the same sub-assembly appended twice under one name, say), and
// [ErrNotBuilt] for the zero System. Positions relative to a part need no
// index arithmetic:
//
//	l2, err := sys.Part("L2")
//	g, err := beam.At(sys, in, l2.End+50*units.Millimeter) // 50 mm after L2
func (s System) Part(label string) (Part, error) {
	if !s.built {
		return Part{}, ErrNotBuilt
	}
	match := func(l string) bool { return l == label || strings.HasPrefix(l, label+"/") }
	var found []Part
	for k := 0; k < len(s.elems); k++ {
		if !match(s.elems[k].Label) {
			continue
		}
		j := k
		for j+1 < len(s.elems) && match(s.elems[j+1].Label) {
			j++
		}
		last := s.elems[j]
		found = append(found, Part{Label: label, First: k, Last: j, Z: s.elems[k].Z, End: last.Z + last.Length})
		k = j
	}
	switch {
	case len(found) == 1:
		return found[0], nil
	case len(found) > 1:
		e := s.elems[found[1].First]
		return Part{}, &ElementError{Method: "Part", Index: found[1].First, Param: "label", Value: errtext.Quote(label),
			Reason: strconv.Itoa(len(found)) + " separate parts carry it (the second is " + e.Name() + "); label each part, or each appended assembly, uniquely", Err: ErrAmbiguousLabel}
	}
	var have []string
	for _, e := range s.elems {
		if e.Label != "" && !slices.Contains(have, e.Label) {
			have = append(have, e.Label)
		}
	}
	reason := "the system has no labels"
	if len(have) > 0 {
		q := make([]string, len(have))
		for i, h := range have {
			q[i] = errtext.Quote(h)
		}
		reason = "labels are " + strings.Join(q, ", ")
	}
	return Part{}, &ElementError{Method: "Part", Index: -1, Param: "label", Value: errtext.Quote(label), Reason: reason, Err: ErrNoLabel}
}

// WithSpace returns a copy of s in which the space labelled label has
// length d (metres, ≥ 0, finite); s itself is unchanged. Positions of the
// later elements move by the difference. Label the spaces that are
// what-if parameters when building:
//
//	Space(96 * units.Millimeter).Label("working distance")
//
// It returns an [*ElementError] if no element has the label (wrapping
// [ErrNoLabel]), if the labelled part is not a single space, or if d is
// invalid, and one wrapping [ErrOverflow] if the new system overflows.
func (s System) WithSpace(label string, d units.Length) (System, error) {
	pt, err := s.Part(label)
	if err != nil {
		return System{}, err
	}
	e := s.elems[pt.First]
	if pt.First != pt.Last || e.Kind != KindSpace {
		err := elementError(pt.First, e)
		err.Reason = "WithSpace: the part is a " + e.Kind.String() + ", not a single space"
		return System{}, err
	}
	if !finite(float64(d)) || d < 0 {
		err := elementError(pt.First, e)
		err.Param, err.Value, err.Reason = "length d", d, "must be non-negative and finite"
		return System{}, err
	}
	elems := append([]Element(nil), s.elems...)
	m := Space(d)
	elems[pt.First].Length, elems[pt.First].X, elems[pt.First].Y = d, m, m
	return assemble(elems, s.comps, s.nIn, s.nOut, "WithSpace")
}

// Move returns a copy of s in which the part labelled label is moved by dz
// metres along the axis (dz > 0 moves it towards +z) while everything else
// stays where it was, the end plane included: the space just before the
// part grows by dz and the space just after it shrinks by dz. s itself is
// unchanged.
//
// It returns an [*ElementError] if no element has the label, if the part
// has no space on one side, if a space would become negative (the part
// would pass its neighbour), or if dz is not finite.
func (s System) Move(label string, dz units.Length) (System, error) {
	pt, err := s.Part(label)
	if err != nil {
		return System{}, err
	}
	e := s.elems[pt.First]
	fail := func(param string, v any, reason string) (System, error) {
		err := elementError(pt.First, e)
		err.Param, err.Value, err.Reason = param, v, "Move: "+reason
		return System{}, err
	}
	if !finite(float64(dz)) {
		return fail("shift dz", dz, "must be finite")
	}
	before, after := pt.First-1, pt.Last+1
	if before < 0 || s.elems[before].Kind != KindSpace {
		return fail("shift dz", dz, "no space before the part to take up the move")
	}
	if after >= len(s.elems) || s.elems[after].Kind != KindSpace {
		return fail("shift dz", dz, "no space after the part to take up the move")
	}
	gb, ga := s.elems[before].Length+dz, s.elems[after].Length-dz
	if gb < 0 || ga < 0 {
		return fail("shift dz", dz, "leaves a negative gap (space before "+gb.String()+", after "+ga.String()+")")
	}
	elems := append([]Element(nil), s.elems...)
	for _, g := range []struct {
		i int
		d units.Length
	}{{before, gb}, {after, ga}} {
		m := Space(g.d)
		elems[g.i].Length, elems[g.i].X, elems[g.i].Y = g.d, m, m
	}
	return assemble(elems, s.comps, s.nIn, s.nOut, "Move")
}

// Replace returns a copy of s in which the part labelled label is replaced
// by the elements of sub (a system built with a [Builder]; it may be empty
// to delete the part, or have any length): swap a lens for another from
// the drawer. s and sub are unchanged. Positions after the part move by
// the change in length.
//
// It returns an [*ElementError] if no element has the label, one wrapping
// [ErrSplitComponent] if the part cuts through a component, one wrapping
// [ErrIndexChange] if sub does not start in the medium before the part and
// end in the medium after it (relative tolerance 1e-12), and one wrapping
// [ErrOverflow] if the new system overflows.
func (s System) Replace(label string, sub System) (System, error) {
	pt, err := s.Part(label)
	if err != nil {
		return System{}, err
	}
	if !sub.built {
		return System{}, &ElementError{Method: "Replace", Label: label, Index: pt.First, Param: "replacement", Err: ErrNotBuilt}
	}
	return s.replace(pt.First, pt.Last+1, sub)
}

func (s System) replace(i, j int, sub System) (System, error) {
	for _, c := range s.comps {
		inside := c.First >= i && c.Last < j
		outside := c.Last < i || c.First >= j
		if !inside && !outside {
			err := elementError(c.First, s.elems[c.First])
			err.Reason, err.Err = "Replace", ErrSplitComponent
			return System{}, err
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
		err := elementError(i, s.elems[min(i, len(s.elems)-1)])
		err.Param, err.Value, err.Reason, err.Err = "replacement input index", subIn, "Replace: the medium there has n = "+strconv.FormatFloat(before, 'g', -1, 64), ErrIndexChange
		return System{}, err
	}
	if j < len(s.elems) && !same(subOut, after) {
		err := elementError(j, s.elems[j])
		err.Param, err.Value, err.Reason, err.Err = "replacement output index", subOut, "Replace: the medium there has n = "+strconv.FormatFloat(after, 'g', -1, 64), ErrIndexChange
		return System{}, err
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
	return assemble(elems, comps, nIn, nOut, "Replace")
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
	if !s.built {
		return System{}, ErrNotBuilt
	}
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
	return assemble(elems, comps, s.nOut, s.nIn, "Reverse")
}
