package beam

import (
	"errors"
	"math"
	"sort"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrIndexMismatch is returned (wrapped in a [*ParamError]) when the input
// beam's Index differs from the system's input index.
var ErrIndexMismatch = errors.New("beam index differs from the system input index")

// ErrOverflow is returned when a propagated beam parameter is not finite or
// not physical although the input was valid (extreme, overflowing inputs).
var ErrOverflow = errors.New("beam: propagated q parameter overflowed or lost Im q > 0")

// checkInput validates in and its match with sys.
func checkInput(sys paraxial.System, in Gaussian) error {
	if err := in.Validate(); err != nil {
		return err
	}
	// Indices are user-typed numbers; allow for a last-digit difference.
	if n := sys.IndexIn(); math.Abs(in.Index-n) > 1e-12*n {
		return &ParamError{Param: "input beam index n", Value: in.Index, Reason: "system input index is " + strconv.FormatFloat(n, 'g', -1, 64), Err: ErrIndexMismatch}
	}
	return nil
}

// At returns the beam at position z (metres from the input plane) of sys,
// given the beam in at the input plane. It uses [paraxial.System.MatrixTo]
// and [paraxial.System.IndexAt], so surfaces exactly at z are included.
// z may lie before the input plane or beyond the output plane (the beam
// continues in the input or output medium).
//
// It returns an error if in is not a valid beam, its index differs from
// sys.IndexIn(), z is not finite, or the result overflows.
func At(sys paraxial.System, in Gaussian, z units.Length) (Gaussian, error) {
	if err := checkInput(sys, in); err != nil {
		return Gaussian{}, err
	}
	m, err := sys.MatrixTo(z)
	if err != nil {
		return Gaussian{}, err
	}
	g := in.Transform(m, sys.IndexAt(z))
	if g.Validate() != nil {
		return Gaussian{}, ErrOverflow
	}
	return g, nil
}

// Waist describes the waist of the beam that leaves one element.
type Waist struct {
	// Element is the index of the element after which the beam is
	// considered.
	Element int
	// Z is the absolute axial position of the waist in metres from the
	// input plane. It may lie behind the element or beyond the next one
	// (a virtual waist); compare with the element positions.
	Z units.Length
	// Radius is the waist radius w0 in metres.
	Radius units.Length
	// RayleighRange is zR in metres, in the medium after the element.
	RayleighRange units.Length
	// Index is the refractive index after the element.
	Index float64
}

// Waists returns, for each element i of sys, the waist of the beam just
// after element i (after the whole gap for a space), given the beam in at
// the input plane: its radius and absolute position
//
//	Z = (element exit position) + WaistOffset
//
// A space does not change the waist, so consecutive spaces repeat it. It
// returns an error if in is invalid, its index differs from sys.IndexIn(),
// or a result overflows.
func Waists(sys paraxial.System, in Gaussian) ([]Waist, error) {
	if err := checkInput(sys, in); err != nil {
		return nil, err
	}
	g := in
	out := make([]Waist, sys.Len())
	for i, e := range sys.Elements() {
		g = g.Transform(e.X, e.IndexOut)
		if g.Validate() != nil {
			return nil, ErrOverflow
		}
		end := e.Z + e.Length
		out[i] = Waist{
			Element:       i,
			Z:             end + g.WaistOffset(),
			Radius:        g.WaistRadius(),
			RayleighRange: g.RayleighRange(),
			Index:         e.IndexOut,
		}
	}
	return out, nil
}

// Caustic is the beam envelope sampled along the axis. All slices have the
// same length, with Z increasing.
type Caustic struct {
	// Z holds the sample positions in metres from the input plane.
	Z []float64
	// W holds the 1/e² beam radius w(z) in metres.
	W []float64
	// InverseCurvature holds 1/R(z) in 1/m (0 at a waist; finite
	// everywhere, unlike R).
	InverseCurvature []float64
	// Gouy holds the on-axis Gouy phase in radians accumulated from Z[0],
	// element by element, not reduced modulo 2π.
	Gouy []float64
	// Index holds the refractive index at each sample.
	Index []float64
	// ElementZ holds the entrance position of every element of the
	// system, in metres, in element order.
	ElementZ []float64
}

// Sample returns the caustic of the beam in (given at the input plane)
// through the whole of sys, from z = 0 to z = sys.Length(), at n ≥ 2
// equally spaced positions plus the position of every element inside that
// range, so that kinks at lenses are sampled exactly. Samples at an element
// position describe the plane just after it, as in [At].
//
// It returns an error if n < 2, sys has zero length, in is invalid or its
// index differs from sys.IndexIn(). Use [SampleRange] to extend the range
// beyond the system.
func Sample(sys paraxial.System, in Gaussian, n int) (Caustic, error) {
	if sys.Length() <= 0 {
		return Caustic{}, &ParamError{Param: "system length", Value: float64(sys.Length()), Length: true, Reason: "must be positive to sample; use SampleRange"}
	}
	return SampleRange(sys, in, 0, sys.Length(), n)
}

// SampleRange is like [Sample] over the range z0 to z1 (metres from the
// input plane, z0 < z1, both finite), which may extend before the input
// plane or beyond the output plane.
func SampleRange(sys paraxial.System, in Gaussian, z0, z1 units.Length, n int) (Caustic, error) {
	if n < 2 {
		return Caustic{}, &ParamError{Param: "sample count n", Value: float64(n), Reason: "must be at least 2"}
	}
	if !finite(float64(z0)) {
		return Caustic{}, &ParamError{Param: "start z0", Value: float64(z0), Length: true, Reason: "must be finite"}
	}
	if !finite(float64(z1)) || !(z1 > z0) {
		return Caustic{}, &ParamError{Param: "end z1", Value: float64(z1), Length: true, Reason: "must be finite and greater than z0 = " + z0.String()}
	}
	if err := checkInput(sys, in); err != nil {
		return Caustic{}, err
	}
	elems := sys.Elements()
	a, b := float64(z0), float64(z1)
	zs := make([]float64, 0, n+len(elems))
	for i := range n {
		zs = append(zs, a+(b-a)*(float64(i)/float64(n-1)))
	}
	zs[n-1] = b
	c := Caustic{ElementZ: make([]float64, len(elems))}
	for i, e := range elems {
		z := float64(e.Z)
		c.ElementZ[i] = z
		if z > a && z < b {
			zs = append(zs, z)
		}
	}
	sort.Float64s(zs)
	// Remove exact duplicates (an element on a grid point).
	k := 0
	for _, z := range zs {
		if k > 0 && zs[k-1] == z {
			continue
		}
		zs[k] = z
		k++
	}
	zs = zs[:k]

	c.Z = zs
	c.W = make([]float64, len(zs))
	c.InverseCurvature = make([]float64, len(zs))
	c.Gouy = make([]float64, len(zs))
	c.Index = make([]float64, len(zs))
	t := tracer{elems: elems, g: in, pos: 0}
	if a < 0 {
		t.g = in.Transform(paraxial.Space(z0), in.Index)
		t.pos = a
	} else {
		t.advance(a)
	}
	start := t.gouy
	for i, z := range zs {
		t.advance(z)
		if t.g.Validate() != nil || !finite(t.gouy) {
			return Caustic{}, ErrOverflow
		}
		c.W[i] = float64(t.g.Radius())
		c.InverseCurvature[i] = t.g.InverseCurvature()
		c.Gouy[i] = t.gouy - start
		c.Index[i] = t.g.Index
	}
	return c, nil
}

// tracer walks a beam monotonically along a system, accumulating the Gouy
// phase element by element. Elements j < i have been fully applied; if
// element i is a space it has been applied up to pos.
type tracer struct {
	elems []paraxial.Element
	i     int
	pos   float64
	g     Gaussian
	gouy  float64
}

// space propagates by d metres in the current medium. The Gouy phase of a
// free-space step is arctan(z2/zR) − arctan(z1/zR) (Kogelnik & Li 1966).
func (t *tracer) space(d float64) {
	if d == 0 {
		return
	}
	z, zR := real(t.g.Q), imag(t.g.Q)
	t.gouy += math.Atan((z+d)/zR) - math.Atan(z/zR)
	t.g.Q += complex(d, 0)
	t.pos += d
}

// advance moves the tracer to position z ≥ t.pos, applying every surface
// located at or before z.
func (t *tracer) advance(z float64) {
	for t.i < len(t.elems) {
		e := t.elems[t.i]
		if e.Kind == paraxial.KindSpace {
			end := float64(e.Z + e.Length)
			if z < end {
				t.space(z - t.pos)
				return
			}
			t.space(end - t.pos)
			t.pos = end // remove rounding drift at element boundaries
			t.i++
			continue
		}
		if float64(e.Z) > z {
			return
		}
		t.space(float64(e.Z) - t.pos) // zero unless the tracer started before z = 0
		t.gouy += float64(t.g.GouyShift(e.X))
		t.g = t.g.Transform(e.X, e.IndexOut)
		t.i++
	}
	t.space(z - t.pos)
}
