package beam

import (
	"errors"
	"math"
	"slices"
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

// ErrAstigmaticSystem is returned by [At] when the tangential and sagittal
// matrices of the system differ up to the requested plane, so that a
// single [Gaussian] cannot describe the beam there; use [AtXY].
var ErrAstigmaticSystem = errors.New("beam: the system acts differently in x and y here; use AtXY")

func formatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// checkInput validates in and its match with sys, and returns both planes.
func checkInput(sys paraxial.System, in Input) (Astigmatic, error) {
	if in == nil {
		return Astigmatic{}, &ParamError{Param: "input beam", Reason: "is nil"}
	}
	a := in.planes()
	var err error
	if _, round := in.(Gaussian); round {
		err = a.X.Validate()
	} else {
		err = a.Validate()
	}
	if err != nil {
		return Astigmatic{}, err
	}
	// Indices are user-typed numbers; allow for a last-digit difference.
	if n := sys.IndexIn(); math.Abs(a.X.Index-n) > 1e-12*n {
		return Astigmatic{}, &ParamError{Param: "input beam index n", Value: a.X.Index, Reason: "system input index is " + formatFloat(n), Err: ErrIndexMismatch}
	}
	return a, nil
}

// matricesTo returns the tangential and sagittal matrices from the input
// plane to z. A non-finite z is a [*ParamError] that wraps
// [paraxial.ErrNonFinite].
func matricesTo(sys paraxial.System, z units.Length) (mx, my paraxial.Matrix, err error) {
	if !finite(float64(z)) {
		return mx, my, &ParamError{Param: "position z", Value: float64(z), Length: true, Err: paraxial.ErrNonFinite}
	}
	if mx, err = sys.MatrixTo(z); err != nil {
		return mx, my, err
	}
	my, err = sys.MatrixToY(z)
	return mx, my, err
}

// At returns the round beam at position z (metres from the input plane) of
// sys, given the round beam in at the input plane. It uses
// [paraxial.System.MatrixTo] and [paraxial.System.IndexAt], so surfaces
// exactly at z are included. z may lie before the input plane or beyond
// the output plane (the beam continues in the input or output medium).
//
// It returns [ErrAstigmaticSystem] if the tangential and sagittal matrices
// to z differ (a cylindrical lens or a tilted mirror before z); use [AtXY]
// then. It also returns an error if in is not a valid beam, its index
// differs from sys.IndexIn(), z is not finite, or the result overflows.
func At(sys paraxial.System, in Gaussian, z units.Length) (Gaussian, error) {
	if _, err := checkInput(sys, in); err != nil {
		return Gaussian{}, err
	}
	mx, my, err := matricesTo(sys, z)
	if err != nil {
		return Gaussian{}, err
	}
	if mx != my {
		return Gaussian{}, ErrAstigmaticSystem
	}
	g := in.Transform(mx, sys.IndexAt(z))
	if g.Validate() != nil {
		return Gaussian{}, ErrOverflow
	}
	return g, nil
}

// AtXY is [At] for a beam that may differ in x and y, through a system
// that may act differently in x and y: the x part goes through
// [paraxial.System.MatrixTo], the y part through
// [paraxial.System.MatrixToY]. in may be a [Gaussian] (a round beam) or an
// [Astigmatic] beam.
func AtXY(sys paraxial.System, in Input, z units.Length) (Astigmatic, error) {
	a, err := checkInput(sys, in)
	if err != nil {
		return Astigmatic{}, err
	}
	mx, my, err := matricesTo(sys, z)
	if err != nil {
		return Astigmatic{}, err
	}
	out := a.Transform(mx, my, sys.IndexAt(z))
	if out.X.Validate() != nil || out.Y.Validate() != nil {
		return Astigmatic{}, ErrOverflow
	}
	return out, nil
}

// Waist describes the waist of the beam that leaves one element, in both
// planes. For a round beam through a rotationally symmetric system the Y
// fields equal the X fields.
type Waist struct {
	// Element is the index of the element after which the beam is
	// considered.
	Element int
	// Z is the absolute axial position of the x waist in metres from the
	// input plane. It may lie behind the element or beyond the next one
	// (a virtual waist); compare with the element positions.
	Z units.Length
	// Radius is the x waist radius W0 in metres.
	Radius units.Length
	// RayleighRange is the x Rayleigh range zR in metres, in the medium
	// after the element.
	RayleighRange units.Length
	// Index is the refractive index after the element.
	Index float64
	// ZY, RadiusY and RayleighRangeY are the same for the y part.
	ZY, RadiusY, RayleighRangeY units.Length
}

// Waists returns, for each element i of sys, the waist of the beam just
// after element i (after the whole gap for a space), given the beam in at
// the input plane: its radius and absolute position in each plane,
//
//	Z = (element exit position) + WaistOffset
//
// (Kogelnik & Li 1966; S. A. Self, "Focusing of spherical Gaussian beams",
// Appl. Opt. 22, 658–661 (1983), for the thin-lens case). A space does not
// change the waist, so consecutive spaces repeat it. It returns an error if
// in is invalid, its index differs from sys.IndexIn(), or a result
// overflows.
func Waists(sys paraxial.System, in Input) ([]Waist, error) {
	a, err := checkInput(sys, in)
	if err != nil {
		return nil, err
	}
	out := make([]Waist, sys.Len())
	for i, e := range sys.Elements() {
		a = a.Transform(e.X, e.Y, e.IndexOut)
		if a.X.Validate() != nil || a.Y.Validate() != nil {
			return nil, ErrOverflow
		}
		end := e.Z + e.Length
		out[i] = Waist{
			Element:        i,
			Z:              end + a.X.WaistOffset(),
			Radius:         a.X.WaistRadius(),
			RayleighRange:  a.X.RayleighRange(),
			Index:          e.IndexOut,
			ZY:             end + a.Y.WaistOffset(),
			RadiusY:        a.Y.WaistRadius(),
			RayleighRangeY: a.Y.RayleighRange(),
		}
	}
	return out, nil
}

// Focus is a real waist: a minimum of the beam radius that lies inside a
// homogeneous stretch of the path (a space, or the input or output medium
// within the sampled range, ends included), as opposed to the virtual
// waists that [Waists] may report.
type Focus struct {
	// Z is the waist position in metres from the input plane.
	Z units.Length
	// Radius is the waist radius W0 in metres.
	Radius units.Length
	// RayleighRange is zR in metres, in the local medium.
	RayleighRange units.Length
	// Index is the refractive index of the medium at the waist.
	Index float64
}

// segment is a homogeneous stretch [s, e] of the path with the beam at s.
type segment struct {
	s, e float64
	b    Astigmatic
}

// segments calls f for every homogeneous stretch of sys that overlaps
// [a, b], in order, including the input medium before z = 0 (when a < 0)
// and the output medium after the system (when b > Length). The beam in
// must be valid. f returns false to stop.
func segments(sys paraxial.System, in Astigmatic, a, b float64, f func(segment) bool) {
	cur := in
	if a < 0 {
		s := segment{s: a, e: math.Min(0, b), b: cur.Transform(paraxial.Space(units.Length(a)), paraxial.Space(units.Length(a)), cur.X.Index)}
		if !f(s) {
			return
		}
	}
	for i := range sys.Len() {
		e := sys.Element(i)
		z0, z1 := float64(e.Z), float64(e.Z+e.Length)
		if e.Kind == paraxial.KindSpace {
			if z1 >= a && z0 <= b {
				if !f(segment{s: z0, e: z1, b: cur}) {
					return
				}
			}
		}
		cur = cur.Transform(e.X, e.Y, e.IndexOut)
	}
	if l := float64(sys.Length()); b > l {
		f(segment{s: l, e: b, b: cur})
	}
}

// foci returns the real waists inside [a, b] in x and in y, ordered by
// position, without repeats at shared segment ends.
func foci(sys paraxial.System, in Astigmatic, a, b float64) (fx, fy []Focus) {
	add := func(out []Focus, g Gaussian, s, e float64) []Focus {
		z := s - real(g.Q) // waist position: s + WaistOffset
		if z < math.Max(s, a) || z > math.Min(e, b) {
			return out
		}
		if k := len(out); k > 0 && float64(out[k-1].Z) == z {
			return out
		}
		return append(out, Focus{Z: units.Length(z), Radius: g.WaistRadius(), RayleighRange: g.RayleighRange(), Index: g.Index})
	}
	segments(sys, in, a, b, func(s segment) bool {
		fx = add(fx, s.b.X, s.s, s.e)
		fy = add(fy, s.b.Y, s.s, s.e)
		return true
	})
	return fx, fy
}

// Extreme is a beam radius at a position.
type Extreme struct {
	// Z is the position in metres from the input plane.
	Z units.Length
	// Radius is the 1/e² beam radius in metres.
	Radius units.Length
}

// Extent holds the smallest and largest beam radius along a path, per
// plane.
type Extent struct {
	Min, Max   Extreme // x plane
	MinY, MaxY Extreme // y plane
}

// Extremes returns the smallest and the largest beam radius along the
// whole of sys, from the input plane to the output plane, in each plane.
// They are exact, not sampled: within a homogeneous gap w(z) =
// W0√(1 + ((z − z0)/zR)²) is convex (Kogelnik & Li 1966), so its maximum
// lies at an end of the gap and its minimum at an end or at the waist.
// Zero-thickness surfaces leave w continuous. Ties keep the first
// position. It returns an error if in is invalid or its index differs
// from sys.IndexIn().
func Extremes(sys paraxial.System, in Input) (Extent, error) {
	a, err := checkInput(sys, in)
	if err != nil {
		return Extent{}, err
	}
	x0 := Extreme{Z: 0, Radius: a.X.Radius()}
	y0 := Extreme{Z: 0, Radius: a.Y.Radius()}
	ex := Extent{Min: x0, Max: x0, MinY: y0, MaxY: y0}
	consider := func(min, max *Extreme, z float64, w units.Length) {
		if w < min.Radius {
			*min = Extreme{Z: units.Length(z), Radius: w}
		}
		if w > max.Radius {
			*max = Extreme{Z: units.Length(z), Radius: w}
		}
	}
	plane := func(min, max *Extreme, g Gaussian, s, e float64) {
		consider(min, max, s, g.Radius())
		end := g.Transform(paraxial.Space(units.Length(e-s)), g.Index)
		consider(min, max, e, end.Radius())
		if z := s - real(g.Q); z > s && z < e {
			consider(min, max, z, g.WaistRadius())
		}
	}
	segments(sys, a, 0, float64(sys.Length()), func(s segment) bool {
		plane(&ex.Min, &ex.Max, s.b.X, s.s, s.e)
		plane(&ex.MinY, &ex.MaxY, s.b.Y, s.s, s.e)
		return true
	})
	if !finite(float64(ex.Max.Radius)) || !finite(float64(ex.MaxY.Radius)) {
		return Extent{}, ErrOverflow
	}
	return ex, nil
}

// Caustic is the beam envelope sampled along the axis, in both planes.
// All per-sample slices have the same length, with Z increasing. For a
// round beam through a rotationally symmetric system the Y slices equal
// the X slices.
type Caustic struct {
	// Z holds the sample positions in metres from the input plane.
	Z []float64
	// W and WY hold the 1/e² beam radii w(z) in x and y, in metres.
	W, WY []float64
	// InverseCurvature and InverseCurvatureY hold 1/R(z) in 1/m (0 at a
	// waist; finite everywhere, unlike R).
	InverseCurvature, InverseCurvatureY []float64
	// Gouy and GouyY hold the on-axis Gouy phase of each plane in radians,
	// accumulated from Z[0] element by element, not reduced modulo 2π.
	// For a beam that is astigmatic the total on-axis Gouy phase of the
	// fundamental mode is (Gouy + GouyY)/2 (Siegman, Lasers, ch. 20 [from
	// memory]); for a round beam it is Gouy.
	Gouy, GouyY []float64
	// Index holds the refractive index at each sample.
	Index []float64
	// ElementZ holds the entrance position of every element of the
	// system, in metres, in element order.
	ElementZ []float64
	// Foci and FociY hold the real waists in x and in y inside the
	// sampled range, in order of position.
	Foci, FociY []Focus
}

// Sample returns the caustic of the beam in (given at the input plane)
// through the whole of sys, from z = 0 to z = sys.Length(), at n ≥ 2
// equally spaced positions plus the position of every element inside that
// range and of every real waist ([Focus]), so that kinks at lenses and
// the minima of w are sampled exactly. Samples at the
// position of a zero-thickness element describe the plane just after it,
// as in [At]. in may be a [Gaussian] (a round beam) or an [Astigmatic]
// beam; the x part follows the elements' X matrices and the y part their
// Y matrices.
//
// An element other than a space with nonzero Length (a thick element) is
// applied at its exit plane Z + Length: no samples are placed strictly
// inside it, the sample at its entrance is the arriving beam, and a plot
// joins entrance and exit by a straight chord.
//
// It returns an error if n < 2, sys has zero length, in is invalid or its
// index differs from sys.IndexIn(). Use [SampleRange] to extend the range
// beyond the system.
func Sample(sys paraxial.System, in Input, n int) (Caustic, error) {
	if sys.Length() <= 0 {
		return Caustic{}, &ParamError{Param: "system length", Value: float64(sys.Length()), Length: true, Reason: "must be positive to sample; use SampleRange"}
	}
	return SampleRange(sys, in, 0, sys.Length(), n)
}

// SampleRange is like [Sample] over the range z0 to z1 (metres from the
// input plane, z0 < z1, both finite), which may extend before the input
// plane or beyond the output plane.
func SampleRange(sys paraxial.System, in Input, z0, z1 units.Length, n int) (Caustic, error) {
	if n < 2 {
		return Caustic{}, &ParamError{Param: "sample count n", Value: float64(n), Reason: "must be at least 2"}
	}
	if !finite(float64(z0)) {
		return Caustic{}, &ParamError{Param: "start z0", Value: float64(z0), Length: true, Reason: "must be finite"}
	}
	if !finite(float64(z1)) || !(z1 > z0) {
		return Caustic{}, &ParamError{Param: "end z1", Value: float64(z1), Length: true, Reason: "must be finite and greater than z0 = " + z0.String()}
	}
	a0, err := checkInput(sys, in)
	if err != nil {
		return Caustic{}, err
	}
	elems := sys.Elements()
	a, b := float64(z0), float64(z1)

	// The grid: n equally spaced points merged with the element positions
	// (already in increasing order), without duplicates and without points
	// strictly inside thick elements.
	extra := make([]float64, 0, 2*len(elems))
	type span struct{ s, e float64 }
	var thick []span
	c := Caustic{ElementZ: make([]float64, len(elems))}
	for i, e := range elems {
		z := float64(e.Z)
		c.ElementZ[i] = z
		if e.Kind == paraxial.KindSpace {
			continue
		}
		if z > a && z < b {
			extra = append(extra, z)
		}
		if e.Length > 0 {
			end := float64(e.Z + e.Length)
			thick = append(thick, span{z, end})
			if end > a && end < b {
				extra = append(extra, end)
			}
		}
	}
	// Every real waist is sampled too, so that minima of w are exact.
	c.Foci, c.FociY = foci(sys, a0, a, b)
	for _, fs := range [][]Focus{c.Foci, c.FociY} {
		for _, f := range fs {
			if z := float64(f.Z); z > a && z < b {
				extra = append(extra, z)
			}
		}
	}
	if len(c.Foci)+len(c.FociY) > 0 {
		slices.Sort(extra)
	}
	zs := make([]float64, 0, n+len(extra))
	inside := func(z float64) bool {
		for _, t := range thick {
			if z > t.s && z < t.e {
				return true
			}
		}
		return false
	}
	push := func(z float64) {
		if k := len(zs); k > 0 && zs[k-1] >= z {
			return // duplicate (extra is sorted, so only equal values arrive)
		}
		if len(thick) > 0 && inside(z) {
			return
		}
		zs = append(zs, z)
	}
	j := 0
	for i := range n {
		z := a + (b-a)*(float64(i)/float64(n-1))
		if i == n-1 {
			z = b
		}
		for j < len(extra) && extra[j] <= z {
			push(extra[j])
			j++
		}
		push(z)
	}

	m := len(zs)
	buf := make([]float64, 7*m)
	c.Z = zs
	c.W, c.WY = buf[0:m:m], buf[m:2*m:2*m]
	c.InverseCurvature, c.InverseCurvatureY = buf[2*m:3*m:3*m], buf[3*m:4*m:4*m]
	c.Gouy, c.GouyY = buf[4*m:5*m:5*m], buf[5*m:6*m:6*m]
	c.Index = buf[6*m:]

	// A round beam through rotationally symmetric elements needs one plane
	// only: the y results are copies (bit-identical to tracing y).
	same := a0.X == a0.Y
	for _, e := range elems {
		same = same && e.X == e.Y
	}
	t := tracer{elems: elems, b: a0, pos: 0, same: same}
	if a < 0 {
		t.b = a0.Transform(paraxial.Space(z0), paraxial.Space(z0), a0.X.Index)
		t.pos = a
	} else {
		t.advance(a)
	}
	startX, startY := t.gouyX, t.gouyY
	for i, z := range zs {
		t.advance(z)
		qx, qy := t.b.X.Q, t.b.Y.Q
		if same {
			qy = qx
		}
		if !finite(real(qx)) || !(imag(qx) > 0) || !finite(imag(qx)) ||
			!finite(real(qy)) || !(imag(qy) > 0) || !finite(imag(qy)) {
			return Caustic{}, ErrOverflow
		}
		c.W[i] = float64(t.b.X.Radius())
		c.InverseCurvature[i] = t.b.X.InverseCurvature()
		c.Gouy[i] = t.gouyX - startX
		c.Index[i] = t.b.X.Index
		if !same {
			c.WY[i] = float64(t.b.Y.Radius())
			c.InverseCurvatureY[i] = t.b.Y.InverseCurvature()
			c.GouyY[i] = t.gouyY - startY
		}
	}
	if same {
		copy(c.WY, c.W)
		copy(c.InverseCurvatureY, c.InverseCurvature)
		copy(c.GouyY, c.Gouy)
	}
	for i := range m {
		if !finite(c.W[i]) || !finite(c.WY[i]) || !finite(c.Gouy[i]) || !finite(c.GouyY[i]) {
			return Caustic{}, ErrOverflow
		}
	}
	return c, nil
}

// tracer walks a beam monotonically along a system, accumulating the Gouy
// phase element by element in each plane. Elements j < i have been fully
// applied; if element i is a space it has been applied up to pos.
type tracer struct {
	elems        []paraxial.Element
	i            int
	pos          float64
	b            Astigmatic
	gouyX, gouyY float64
	same         bool // trace x only; y is identical
}

// space propagates by d metres in the current medium. The Gouy phase of a
// free-space step is arctan(z2/zR) − arctan(z1/zR) (Kogelnik & Li 1966).
func (t *tracer) space(d float64) {
	if d == 0 {
		return
	}
	z, zR := real(t.b.X.Q), imag(t.b.X.Q)
	t.gouyX += math.Atan((z+d)/zR) - math.Atan(z/zR)
	t.b.X.Q += complex(d, 0)
	t.pos += d
	if t.same {
		return
	}
	z, zR = real(t.b.Y.Q), imag(t.b.Y.Q)
	t.gouyY += math.Atan((z+d)/zR) - math.Atan(z/zR)
	t.b.Y.Q += complex(d, 0)
}

// advance moves the tracer to position z ≥ t.pos, applying every element
// whose exit plane lies at or before z.
func (t *tracer) advance(z float64) {
	for t.i < len(t.elems) {
		e := &t.elems[t.i]
		end := float64(e.Z + e.Length)
		if e.Kind == paraxial.KindSpace {
			if z < end {
				t.space(z - t.pos)
				return
			}
			t.space(end - t.pos)
			t.pos = end // remove rounding drift at element boundaries
			t.i++
			continue
		}
		if end > z {
			// z lies before this element: only the input medium can
			// remain (the tracer started before z = 0), so propagate
			// in it up to z, never past the element's entrance.
			t.space(min(z, float64(e.Z)) - t.pos)
			return
		}
		t.space(float64(e.Z) - t.pos) // zero unless the tracer started before z = 0
		t.gouyX += float64(t.b.X.GouyShift(e.X))
		if t.same {
			t.b.X = t.b.X.Transform(e.X, e.IndexOut)
		} else {
			t.gouyY += float64(t.b.Y.GouyShift(e.Y))
			t.b = t.b.Transform(e.X, e.Y, e.IndexOut)
		}
		t.pos = end
		t.i++
	}
	t.space(z - t.pos)
}
