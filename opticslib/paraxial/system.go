package paraxial

import (
	"errors"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNonFinite is returned by [System.MatrixTo] for a NaN or infinite
// position.
var ErrNonFinite = errors.New("paraxial: position must be finite")

// ErrOrder is returned by [System.MatrixBetween] when the start plane lies
// after the end plane.
var ErrOrder = errors.New("paraxial: start position after end position")

// ErrOverflow is returned when a composed matrix or length overflows to
// ±Inf or NaN although every input was finite. [Builder.Build] and the
// edits ([System.WithSpace], [System.Replace], [System.Reverse]) wrap it
// in an [*ElementError] naming the element at which the running product
// overflowed; test for it with errors.Is.
var ErrOverflow = errors.New("paraxial: matrix entry overflowed (not finite)")

// System is an immutable, ordered sequence of elements built by a
// [Builder]. The zero value is an empty system in a medium of index 0 and
// is not useful; obtain systems from [Builder.Build].
type System struct {
	elems            []Element
	comps            []Component
	nIn, nOut        float64
	length           units.Length
	matrixX, matrixY Matrix
}

// Len returns the number of elements.
func (s System) Len() int { return len(s.elems) }

// Element returns a copy of element i. It panics if i is out of range
// [0, Len()).
func (s System) Element(i int) Element {
	if i < 0 || i >= len(s.elems) {
		panic("paraxial: element index " + strconv.Itoa(i) + " out of range [0, " + strconv.Itoa(len(s.elems)) + ")")
	}
	return s.elems[i]
}

// Elements returns a copy of the element list, in order.
func (s System) Elements() []Element { return append([]Element(nil), s.elems...) }

// Length returns the total axial length in metres: the sum of the space
// lengths, which is also the position of the output plane.
func (s System) Length() units.Length { return s.length }

// IndexIn returns the refractive index of the input medium.
func (s System) IndexIn() float64 { return s.nIn }

// IndexOut returns the refractive index of the output medium.
func (s System) IndexOut() float64 { return s.nOut }

// Components returns the thick lenses and plates of the system, in order,
// with their geometry (positions, radii, glass index) read from the
// elements.
func (s System) Components() []Component { return append([]Component(nil), s.comps...) }

// PlaneMatrix returns the transfer matrix of the whole system in plane p:
// [System.Matrix] for Tangential and [System.MatrixY] for Sagittal.
func (s System) PlaneMatrix(p Plane) Matrix {
	if p == Sagittal {
		return s.matrixY
	}
	return s.matrixX
}

// MatrixY returns the sagittal (Y) transfer matrix from the input plane to
// the output plane. It equals [System.Matrix] for a rotationally symmetric
// system.
func (s System) MatrixY() Matrix { return s.matrixY }

// Matrix returns the tangential (X) transfer matrix from the input plane
// (z = 0) to the output plane (z = Length()): the product M_{N−1}⋯M_1·M_0 of
// the element matrices. It is the identity for an empty system. Its
// determinant is IndexIn()/IndexOut().
func (s System) Matrix() Matrix { return s.matrixX }

// MatrixTo returns the tangential (X) transfer matrix from the input plane
// to the plane at position z (metres from the input plane). A plane partway
// through a space gets the corresponding fraction of the gap. Surfaces
// located exactly at z are included: the matrix describes the plane just
// after them. For z < 0 the result propagates backwards in the input
// medium, [Space](z); for z > Length() it continues in the output medium.
//
// It returns [ErrNonFinite] (and the identity) if z is NaN or ±Inf, and
// [ErrOverflow] (and the identity) if an entry of the result overflows.
func (s System) MatrixTo(z units.Length) (Matrix, error) {
	return s.matrixTo(z, Tangential)
}

// MatrixToY is [System.MatrixTo] for the sagittal (Y) plane.
func (s System) MatrixToY(z units.Length) (Matrix, error) {
	return s.matrixTo(z, Sagittal)
}

func (s System) matrixTo(z units.Length, p Plane) (Matrix, error) {
	if !finite(float64(z)) {
		return Identity(), ErrNonFinite
	}
	if z < 0 {
		return Space(z), nil
	}
	m := s.between(0, z, true, p)
	if !m.finite() {
		return Identity(), ErrOverflow
	}
	return m, nil
}

// MatrixBetween returns the transfer matrix in plane p from the plane at
// z1 to the plane at z2 (metres from the input plane, z1 ≤ z2). Both
// planes follow the convention of [System.MatrixTo]: the plane at z lies
// just after any surfaces located at z, so surfaces at z1 are excluded and
// surfaces at z2 included, and
//
//	MatrixTo(z1).Then(MatrixBetween(z1, z2)) = MatrixTo(z2)
//
// (use [System.Matrix] for the whole system including surfaces at z = 0).
// Parts of the range before z = 0 or after Length() propagate in the
// input or output medium.
//
// It returns [ErrNonFinite] if z1 or z2 is not finite, [ErrOrder] if
// z1 > z2, and [ErrOverflow] if an entry overflows; the matrix is then
// the identity.
func (s System) MatrixBetween(z1, z2 units.Length, p Plane) (Matrix, error) {
	if !finite(float64(z1)) || !finite(float64(z2)) {
		return Identity(), ErrNonFinite
	}
	if z1 > z2 {
		return Identity(), ErrOrder
	}
	m := s.between(z1, z2, false, p)
	if !m.finite() {
		return Identity(), ErrOverflow
	}
	return m, nil
}

// between composes the matrix from z1 to z2 ≥ z1. Surfaces at z1 are
// included only if incl.
func (s System) between(z1, z2 units.Length, incl bool, p Plane) Matrix {
	m := Identity()
	pos := z1
	if pos < 0 {
		end := min(z2, 0)
		m = Space(end - pos)
		pos = end
		if z2 < 0 {
			return m
		}
		incl = true // surfaces at z = 0 lie after a start plane before 0
	}
	for _, e := range s.elems {
		if e.Kind == KindSpace {
			end := e.Z + e.Length
			if end <= pos {
				continue
			}
			if e.Z >= z2 {
				return m
			}
			to := min(end, z2)
			if to > pos {
				m = m.Then(Space(to - pos))
				pos = to
			}
			if end > z2 {
				return m
			}
			continue
		}
		if e.Z < pos || (e.Z == z1 && !incl) {
			continue
		}
		if e.Z > z2 {
			return m
		}
		m = m.Then(e.matrix(p))
	}
	if z2 > pos {
		m = m.Then(Space(z2 - pos))
	}
	return m
}

// IndexAt returns the refractive index of the medium at position z (metres
// from the input plane), with the same convention as [System.MatrixTo]: at
// the position of an interface it returns the index after it. It returns
// IndexIn() for z < 0 and IndexOut() for z beyond the last element; NaN z
// gives NaN.
func (s System) IndexAt(z units.Length) float64 {
	if z != z {
		return z.Meters()
	}
	n := s.nIn
	for _, e := range s.elems {
		if e.Z > z {
			break
		}
		n = e.IndexOut
	}
	return n
}
