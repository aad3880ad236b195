package paraxial

import (
	"errors"
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrImageAtInfinity is returned by [System.Image] when the object lies in
// the front focal plane, so that the image is at infinity.
var ErrImageAtInfinity = errors.New("paraxial: image at infinity (object in the front focal plane)")

// ErrMagnification is returned by [System.ObjectFor] for a target
// magnification that is zero or not finite.
var ErrMagnification = errors.New("paraxial: magnification must be nonzero and finite")

// Conjugates is an object–image table: the images of several object
// planes ([System.Conjugates]).
type Conjugates []Conjugate

// Conjugate is a pair of conjugate planes, object and image, in one plane
// of a system.
type Conjugate struct {
	// Plane is the plane of the system analysed.
	Plane Plane
	// Object and Image are the axial positions of the object and of its
	// image, in metres from the input plane. The object is in object space
	// (the input medium, extended through the system if virtual), the
	// image in image space (the output medium).
	Object, Image units.Length
	// Magnification is the transverse magnification y'/y, negative for an
	// inverted image.
	Magnification float64
	// AngularMagnification is θ'/θ for a ray from the axial object
	// point; Magnification·AngularMagnification = n/n'.
	AngularMagnification float64
	// RealObject reports an object at or before the first optical
	// surface, RealImage an image at or after the last one (diaphragms do
	// not count; see [Cardinal]).
	RealObject, RealImage bool
}

// objectMatrix returns the matrix from the object plane z (in object
// space) to the output plane: Space(−z) followed by the system.
func (s System) objectMatrix(z units.Length, p Plane) Matrix {
	return Space(-z).Then(s.Matrix(p))
}

// Image returns the image of the object plane at axial position object
// (metres from the input plane, finite; negative for an object before the
// input plane) in plane p. With P = [[A, B], [C, D]] the matrix from the
// object plane to the output plane z = L, the image lies where the matrix
// to it has B = 0:
//
//	Image = L − B/D,  Magnification = det P / D,  AngularMagnification = D
//
// (the imaging condition B = 0: Kogelnik & Li 1966; Gerrard & Burch 1975,
// ch. II [from memory]; reference-checks R31). Images and objects may be
// virtual; see [Conjugate].
//
// It returns [ErrNotBuilt], [ErrPlane], [ErrEmpty] for an empty system, [ErrNonFinite] for a
// non-finite object, [ErrImageAtInfinity] when |D| ≤ 1e-12·(|D_sys| +
// |C·object|) (cancellation to rounding level), and [ErrOverflow] if the
// result is not finite.
func (s System) Image(object units.Length, p Plane) (Conjugate, error) {
	if err := s.check(p); err != nil {
		return Conjugate{}, err
	}
	if len(s.elems) == 0 {
		return Conjugate{}, ErrEmpty
	}
	if !finite(float64(object)) {
		return Conjugate{}, ErrNonFinite
	}
	m := s.Matrix(p)
	pm := s.objectMatrix(object, p)
	if math.Abs(pm.D) <= 1e-12*(math.Abs(m.D)+math.Abs(m.C*float64(object))) {
		return Conjugate{Object: object}, ErrImageAtInfinity
	}
	d := -pm.B / pm.D
	c := Conjugate{
		Plane:                p,
		Object:               object,
		Image:                s.length + units.Length(d),
		Magnification:        pm.Det() / pm.D,
		AngularMagnification: pm.D,
	}
	if !finite(float64(c.Image)) || !finite(c.Magnification) {
		return Conjugate{}, ErrOverflow
	}
	c.RealObject, c.RealImage = true, true
	if first, last, ok := s.vertices(); ok {
		c.RealObject = object <= s.elems[first].Z
		c.RealImage = c.Image >= s.elems[last].Z
	}
	return c, nil
}

// ObjectFor returns the conjugate pair whose transverse magnification is
// m (nonzero, finite; negative for an inverted image) in plane p: the
// object position that sets the object-to-lens spacing for a wanted
// magnification. From Magnification = det/D with D = D_sys − C_sys·z:
//
//	Object = (D_sys − det/m) / C_sys
//
// It returns [ErrEmpty], [ErrMagnification] for a bad m, [ErrAfocal] for an
// afocal system (whose magnification is the same for every object), and
// the errors of [System.Image].
func (s System) ObjectFor(m float64, p Plane) (Conjugate, error) {
	if err := s.check(p); err != nil {
		return Conjugate{}, err
	}
	if len(s.elems) == 0 {
		return Conjugate{}, ErrEmpty
	}
	if !finite(m) || m == 0 {
		return Conjugate{}, ErrMagnification
	}
	sm := s.Matrix(p)
	if s.afocal(sm, 0, len(s.elems), p) {
		return Conjugate{}, ErrAfocal
	}
	z := (sm.D - sm.Det()/m) / sm.C
	if !finite(z) {
		return Conjugate{}, ErrOverflow
	}
	return s.Image(units.Length(z), p)
}

// Conjugates returns the image of every object position in objects, in
// order (an object–image table; see [Conjugates.Table]). It stops at the
// first error, returning the conjugates computed so far.
func (s System) Conjugates(objects []units.Length, p Plane) (Conjugates, error) {
	out := make([]Conjugate, 0, len(objects))
	for _, z := range objects {
		c, err := s.Image(z, p)
		if err != nil {
			return out, err
		}
		out = append(out, c)
	}
	return out, nil
}
