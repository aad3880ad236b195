package paraxial

import (
	"errors"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNonFinite is returned by [System.MatrixTo] for a NaN or infinite
// position.
var ErrNonFinite = errors.New("paraxial: position must be finite")

// ErrOverflow is returned when a composed matrix or length overflows to
// ±Inf or NaN although every input was finite.
var ErrOverflow = errors.New("paraxial: matrix entry overflowed (not finite)")

// System is an immutable, ordered sequence of elements built by a
// [Builder]. The zero value is an empty system in a medium of index 0 and
// is not useful; obtain systems from [Builder.Build].
type System struct {
	elems            []Element
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

// MatrixY returns the sagittal (Y) transfer matrix from the input plane to
// the output plane. It equals [System.Matrix] for every element kind in
// this package.
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
	return s.checkedMatrixTo(z, false)
}

// MatrixToY is [System.MatrixTo] for the sagittal (Y) plane.
func (s System) MatrixToY(z units.Length) (Matrix, error) {
	return s.checkedMatrixTo(z, true)
}

func (s System) checkedMatrixTo(z units.Length, sagittal bool) (Matrix, error) {
	if !finite(float64(z)) {
		return Identity(), ErrNonFinite
	}
	m := s.matrixTo(z, sagittal)
	if !m.finite() {
		return Identity(), ErrOverflow
	}
	return m, nil
}

func (s System) matrixTo(z units.Length, sagittal bool) Matrix {
	if z < 0 {
		return Space(z)
	}
	m := Identity()
	for _, e := range s.elems {
		if e.Kind == KindSpace {
			end := e.Z + e.Length
			if z < end {
				return m.Then(Space(z - e.Z))
			}
			m = m.Then(e.X)
			continue
		}
		if e.Z > z {
			return m
		}
		if sagittal {
			m = m.Then(e.Y)
		} else {
			m = m.Then(e.X)
		}
	}
	if z > s.length {
		m = m.Then(Space(z - s.length))
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
