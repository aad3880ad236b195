package paraxial

import (
	"errors"
	"iter"
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
// edits wrap it in an [*ElementError] naming the part at which the running
// product overflowed; test for it with errors.Is.
var ErrOverflow = errors.New("paraxial: matrix entry overflowed (not finite)")

// System is an immutable, ordered sequence of elements built by a
// [Builder]. The zero value is not a system: every analysis and edit
// returns [ErrNotBuilt] for it, and [System.Matrix] returns the zero
// matrix. Obtain systems from [Builder.Build].
type System struct {
	elems            []Element
	comps            []Component
	nIn, nOut        float64
	length           units.Length
	matrixX, matrixY Matrix
	built            bool
}

// Validate returns [ErrNotBuilt] for the zero System and nil for a system
// made by [Builder.Build] or an edit.
func (s System) Validate() error {
	if !s.built {
		return ErrNotBuilt
	}
	return nil
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

// Matrix returns the transfer matrix of the whole system in plane p, from
// the input plane (z = 0) to the output plane (z = Length()): the product
// M = M_{N−1}⋯M₁·M₀ of the element matrices (the element met first stands
// rightmost). It is the identity for an empty system and the zero matrix
// for the zero System. Its determinant is IndexIn()/IndexOut(). It panics
// if p is neither Tangential nor Sagittal.
func (s System) Matrix(p Plane) Matrix {
	mustPlane(p)
	if p == Sagittal {
		return s.matrixY
	}
	return s.matrixX
}

// MatrixTo returns the transfer matrix in plane p from the input plane to
// the plane at position z (metres from the input plane). A plane partway
// through a space gets the corresponding fraction of the gap. Surfaces
// located exactly at z are included: the matrix describes the plane just
// after them. For z < 0 the result propagates backwards in the input
// medium, [Space](z); for z > Length() it continues in the output medium.
//
// It returns (with the identity) [ErrNotBuilt] for the zero System,
// [ErrPlane] for an unknown plane, [ErrNonFinite] if z is NaN or ±Inf, and
// [ErrOverflow] if an entry of the result overflows.
func (s System) MatrixTo(z units.Length, p Plane) (Matrix, error) {
	if err := s.check(p); err != nil {
		return Identity(), err
	}
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

// check returns the error for an unbuilt system or an unknown plane.
func (s System) check(p Plane) error {
	if !s.built {
		return ErrNotBuilt
	}
	if !p.valid() {
		return ErrPlane
	}
	return nil
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
// It returns the errors of [System.MatrixTo], and [ErrOrder] if z1 > z2;
// the matrix is then the identity.
func (s System) MatrixBetween(z1, z2 units.Length, p Plane) (Matrix, error) {
	if err := s.check(p); err != nil {
		return Identity(), err
	}
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
// included only if incl or z1 < 0 (surfaces at z = 0 lie after a start
// plane before the input plane).
func (s System) between(z1, z2 units.Length, incl bool, p Plane) Matrix {
	m := Identity()
	for w := s.walker(z1, z2); w.next(); {
		pc := &w.pc
		if pc.e != nil && pc.e.Kind != KindSpace {
			if pc.from == z1 && !incl && z1 >= 0 {
				continue
			}
			m = m.Then(pc.e.matrix(p))
			continue
		}
		if d := pc.to - pc.from; d > 0 {
			m = m.Then(Space(d))
		}
	}
	return m
}

// piece is one step of [System.walk]: a surface e at from = to, or the
// stretch [from, to] of a space e, or of the input medium (i = −1) or the
// output medium (i = Len()), where e is nil.
type piece struct {
	i        int
	e        *Element
	from, to units.Length
}

// walker is the one walk over a system, as a cursor that needs no
// allocation: for w := s.walker(from, to); w.next(); { use w.pc }. It
// visits, in order, every piece of the path between positions from ≤ to
// (metres):
//
//   - the input medium [from, min(to, 0)] if from < 0;
//   - every space that overlaps [from, to], clipped to it; a space of
//     positive length that only touches from (ends there) or to (starts
//     there) is left out, a zero-length space inside [from, to] is kept;
//   - every surface at a position Z with from ≤ Z ≤ to;
//   - the output medium [max(from, Length), to] if to > Length.
//
// w.pc.e points into the system's own element list and must not be
// modified.
type walker struct {
	elems    []Element
	length   units.Length
	from, to units.Length
	i        int // next element to consider; −1 before the input medium
	done     bool
	pc       piece
}

func (s *System) walker(from, to units.Length) walker {
	return walker{elems: s.elems, length: s.length, from: from, to: to, i: -1}
}

// next moves to the next piece and reports whether there is one.
func (w *walker) next() bool {
	if w.done {
		return false
	}
	if w.i < 0 {
		w.i = 0
		if w.from < 0 {
			w.pc = piece{i: -1, from: w.from, to: min(w.to, 0)}
			return true
		}
	}
	for w.i < len(w.elems) {
		i := w.i
		e := &w.elems[i] // not a copy: Element is large and this loop is hot
		w.i++
		a, b, keep, stop := clip(e, w.from, w.to)
		if stop {
			w.i = len(w.elems)
			break
		}
		if keep {
			w.pc = piece{i: i, e: e, from: a, to: b}
			return true
		}
	}
	w.done = true
	if w.to > w.length {
		w.pc = piece{i: len(w.elems), from: max(w.from, w.length), to: w.to}
		return true
	}
	return false
}

// clip is the boundary rule of the walk for element e and the range
// [from, to]: keep reports that e contributes the piece [a, b] (a space
// clipped to the range, or a surface at a = b = Z), stop that e and every
// later element lie beyond the range. Hot loops that cannot afford the
// walker (System.Trace) call it directly, so that the rule stays one.
func clip(e *Element, from, to units.Length) (a, b units.Length, keep, stop bool) {
	if e.Kind != KindSpace || e.Length == 0 {
		// A surface, or a zero-length space: kept when inside [from, to].
		return e.Z, e.Z, e.Z >= from && e.Z <= to, e.Z > to
	}
	// A space of positive length: kept when it overlaps the range by more
	// than a point, clipped to it.
	end := e.Z + e.Length
	return max(from, e.Z), min(to, end), end > from && e.Z < to, e.Z >= to
}

// walk calls f for every piece of [System.walker] from ≤ to, in order; f
// returns false to stop.
func (s System) walk(from, to units.Length, f func(*piece) bool) {
	for w := s.walker(from, to); w.next(); {
		if !f(&w.pc) {
			return
		}
	}
}

// Piece is one step of a walk along a system ([System.Walk]): a surface at
// From = To, or the stretch [From, To] of a space or of the input or output
// medium, with its transfer matrices and the refractive indices on either
// side.
type Piece struct {
	// Element is the element index in [System.Elements]; −1 for the input
	// medium before z = 0 and Len() for the output medium after the last
	// element.
	Element int
	// Kind is the element kind (KindSpace for the input and output media).
	Kind Kind
	// From and To are the axial positions in metres.
	From, To units.Length
	// X and Y are the tangential and sagittal matrices of this piece: the
	// surface's, or [Space](To − From).
	X, Y Matrix
	// IndexIn and IndexOut are the refractive indices before and after
	// the piece (equal except at an interface).
	IndexIn, IndexOut float64
}

// Walk returns the pieces of s between positions from and to (metres from
// the input plane, from ≤ to), in order: the input medium before z = 0 if
// from < 0, the part of every space inside [from, to], every surface at a
// position in [from, to] (ends included), and the output medium beyond
// Length() if to > Length(). A space of positive length that only touches
// from or to is left out. Every analysis of the package and of package
// beam walks a system this way.
//
// An unbuilt system, non-finite bounds or from > to yield nothing.
func (s System) Walk(from, to units.Length) iter.Seq[Piece] {
	return func(yield func(Piece) bool) {
		if !s.built || !finite(float64(from)) || !finite(float64(to)) || from > to {
			return
		}
		s.walk(from, to, func(pc *piece) bool {
			out := Piece{Element: pc.i, Kind: KindSpace, From: pc.from, To: pc.to}
			switch {
			case pc.e == nil && pc.i < 0:
				out.IndexIn, out.IndexOut = s.nIn, s.nIn
			case pc.e == nil:
				out.IndexIn, out.IndexOut = s.nOut, s.nOut
			default:
				out.Kind, out.IndexIn, out.IndexOut = pc.e.Kind, pc.e.IndexIn, pc.e.IndexOut
			}
			if pc.e != nil && pc.e.Kind != KindSpace {
				out.X, out.Y = pc.e.X, pc.e.Y
			} else {
				m := Space(pc.to - pc.from)
				out.X, out.Y = m, m
			}
			return yield(out)
		})
	}
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
	if z < 0 {
		return n
	}
	s.walk(0, z, func(pc *piece) bool {
		if pc.e != nil {
			n = pc.e.IndexOut
		}
		return true
	})
	return n
}
