package paraxial

import (
	"errors"
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrEmpty is returned by the analyses ([System.Cardinal], [System.Image],
// [System.Stops] and friends) for a system without elements.
var ErrEmpty = errors.New("paraxial: empty system (no elements)")

// ErrAfocal is returned when a result needs optical power and the system
// is afocal (see [Cardinal]), for example [System.ObjectFor].
var ErrAfocal = errors.New("paraxial: system is afocal (C ≈ 0)")

// AfocalTolerance is the relative threshold below which a system counts as
// afocal: |C| ≤ AfocalTolerance·Σ|Cᵢ|, the sum over its surfaces of the
// magnitudes of their own C entries. The sum sets the scale of powers in
// the system, so the test does not depend on the length unit; 1e-9 is far
// above rounding (≈1e-16 per operation, times the angular magnification)
// and far below a deliberate defocus (an EFL of a billion times the
// typical focal length is not an imaging system).
const AfocalTolerance = 1e-9

// Cardinal holds the first-order properties of a system in one plane:
// power, focal lengths and the cardinal points, all positions absolute (z
// in metres from the input plane). Distances are measured between the
// first and the last optical surface (an element other than a space or a
// [KindDiaphragm]), so leading and trailing spaces, irises and field masks
// do not change them: the BFL of a lens followed by a sensor mask is
// measured from the lens.
//
// With the lens matrix L = [[A, B], [C, D]] from the first to the last
// surface (positions z₁, z₂), det L = n/n', Φ = −n'·C:
//
//	EFL = 1/Φ                        FrontFocalPoint      F  = z₁ + D/C
//	ObjectFocalLength f  = −n/Φ      RearFocalPoint       F' = z₂ − A/C
//	ImageFocalLength  f' = n'/Φ      FrontPrincipalPlane  H  = z₁ + (D − det)/C
//	FFL = z₁ − F  = −D/C             RearPrincipalPlane   H' = z₂ + (1 − A)/C
//	BFL = F' − z₂ = −A/C             FrontNodalPoint      N  = z₁ + (D − 1)/C
//	                                 RearNodalPoint       N' = z₂ + (det − A)/C
//
// Three kinds of quantity, three kinds of name: a ...Point or ...Plane is
// a position z; a ...FocalLength is measured from a principal plane (f
// from H to F, f' from H' to F'); FFL and BFL, the trade's front and back
// focal lengths, are measured from the vertices.
//
// These follow from tracing the defining rays through L (a ray parallel to
// the axis, one through the front focus, one of unit angular
// magnification); see W. J. Smith, Modern Optical Engineering, 4th ed.,
// ch. 2 [from memory], and reference-checks R27 for a single surface,
// whose nodal points lie at its centre of curvature. In one medium N = H
// and N' = H'.
//
// When the system is afocal (|C| ≤ [AfocalTolerance]·Σ|Cᵢ|), Afocal is
// true, the focal quantities are zero rather than infinite, and
// AngularMagnification = D and TransverseMagnification = A describe it
// (A·D = det; a Kepler telescope has D = −f₁/f₂, reference-checks R31).
type Cardinal struct {
	// Plane is the plane analysed.
	Plane Plane
	// Afocal reports C ≈ 0.
	Afocal bool
	// IndexIn and IndexOut are the object- and image-space indices n, n'.
	IndexIn, IndexOut float64
	// FirstVertex and LastVertex are the positions z₁, z₂ of the first
	// and the last surface.
	FirstVertex, LastVertex units.Length
	// Power is Φ = −n'·C in 1/m (dioptres).
	Power float64
	// EFL is the effective focal length 1/Φ (the focal length the system
	// would have in air).
	EFL units.Length
	// ObjectFocalLength f = −n/Φ is the signed distance from H to F, and
	// ImageFocalLength f' = n'/Φ that from H' to F'; they differ from EFL
	// only in a medium other than air.
	ObjectFocalLength, ImageFocalLength units.Length
	// FFL (front focal length) is the distance from F to the first vertex,
	// positive when F lies before it; BFL (back focal length) the distance
	// from the last vertex to F'. Both are measured from the glass, as a
	// catalogue states them.
	FFL, BFL units.Length
	// FrontFocalPoint and RearFocalPoint are the positions of F and F'.
	FrontFocalPoint, RearFocalPoint units.Length
	// FrontPrincipalPlane and RearPrincipalPlane are the positions of H
	// and H'.
	FrontPrincipalPlane, RearPrincipalPlane units.Length
	// FrontNodalPoint and RearNodalPoint are the positions of N and N'.
	FrontNodalPoint, RearNodalPoint units.Length
	// AngularMagnification (D) and TransverseMagnification (A) are set
	// for an afocal system and zero otherwise.
	AngularMagnification, TransverseMagnification float64
}

// vertices returns the indices of the first and the last optical surface
// (an element other than a space or a diaphragm, whose matrices are the
// identity), or ok = false if there is none.
func (s System) vertices() (first, last int, ok bool) {
	first, last = -1, -1
	for i := range s.elems {
		if k := s.elems[i].Kind; k != KindSpace && k != KindDiaphragm {
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	return first, last, first >= 0
}

// product returns the product of the matrices of elements i..j−1 in plane
// p, and the product of their entrywise magnitudes (the scale for nearZero).
func (s System) product(i, j int, p Plane) (m, bound Matrix) {
	m, bound = Identity(), Identity()
	for k := i; k < j; k++ {
		em := s.elems[k].matrix(p)
		m = m.Then(em)
		bound = bound.Then(em.abs())
	}
	return m, bound
}

// afocal reports whether m, the product of elements i..j−1, is afocal.
func (s System) afocal(m Matrix, i, j int, p Plane) bool {
	sum := 0.0
	for k := i; k < j; k++ {
		sum += math.Abs(s.elems[k].matrix(p).C)
	}
	return math.Abs(m.C) <= AfocalTolerance*sum
}

// Cardinal returns the power, focal lengths and cardinal points of s in
// plane p (see [Cardinal] for the formulas). A system of spaces and
// diaphragms only is afocal with unit magnifications, its vertices at
// z = 0.
//
// It returns [ErrNotBuilt] for the zero System, [ErrPlane] for an unknown
// plane, [ErrEmpty] for an empty system and [ErrOverflow] if a position
// overflows.
func (s System) Cardinal(p Plane) (Cardinal, error) {
	if err := s.check(p); err != nil {
		return Cardinal{}, err
	}
	if len(s.elems) == 0 {
		return Cardinal{}, ErrEmpty
	}
	c := Cardinal{Plane: p, IndexIn: s.nIn, IndexOut: s.nOut}
	first, last, ok := s.vertices()
	if !ok {
		c.Afocal, c.AngularMagnification, c.TransverseMagnification = true, 1, 1
		return c, nil
	}
	z1, z2 := s.elems[first].Z, s.elems[last].Z
	c.FirstVertex, c.LastVertex = z1, z2
	l, _ := s.product(first, last+1, p)
	if s.afocal(l, first, last+1, p) {
		c.Afocal, c.AngularMagnification, c.TransverseMagnification = true, l.D, l.A
		return c, nil
	}
	det := l.Det()
	inv := 1 / l.C
	c.Power = -s.nOut * l.C
	c.EFL = units.Length(1 / c.Power)
	c.ObjectFocalLength = units.Length(det * inv)
	c.ImageFocalLength = units.Length(-inv)
	c.FFL = units.Length(-l.D * inv)
	c.BFL = units.Length(-l.A * inv)
	c.FrontFocalPoint = z1 - c.FFL
	c.RearFocalPoint = z2 + c.BFL
	c.FrontPrincipalPlane = z1 + units.Length((l.D-det)*inv)
	c.RearPrincipalPlane = z2 + units.Length((1-l.A)*inv)
	c.FrontNodalPoint = z1 + units.Length((l.D-1)*inv)
	c.RearNodalPoint = z2 + units.Length((det-l.A)*inv)
	for _, v := range []units.Length{c.EFL, c.FrontFocalPoint, c.RearFocalPoint, c.FrontPrincipalPlane, c.RearPrincipalPlane, c.FrontNodalPoint, c.RearNodalPoint} {
		if !finite(float64(v)) {
			return Cardinal{}, ErrOverflow
		}
	}
	return c, nil
}
