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
	if err := sys.Validate(); err != nil {
		return Astigmatic{}, err
	}
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
		return Astigmatic{}, &ParamError{Param: "input beam index n", Value: a.X.Index, Reason: "the system's input medium has n = " + formatFloat(n) + " (set Index in the beam's spec, or Medium in the builder)", Err: ErrIndexMismatch}
	}
	return a, nil
}

// matricesTo returns the tangential and sagittal matrices from the input
// plane to z. A non-finite z is a [*ParamError] that wraps
// [paraxial.ErrNonFinite].
func matricesTo(sys paraxial.System, z units.Length) (mx, my paraxial.Matrix, err error) {
	if !finite(float64(z)) {
		return mx, my, &ParamError{Param: "position z", Value: z, Err: paraxial.ErrNonFinite}
	}
	if mx, err = sys.MatrixTo(z, paraxial.Tangential); err != nil {
		return mx, my, err
	}
	my, err = sys.MatrixTo(z, paraxial.Sagittal)
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
// [paraxial.System.MatrixTo] in the tangential plane, the y part in the
// sagittal plane. in may be a [Gaussian] (a round beam) or an
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
	// considered, and Name how messages name it ([paraxial.Element.Name]).
	Element int
	Name    string
	// AfterElement is the distance in metres from the element's exit
	// plane to the x waist: positive when the waist lies after the
	// element (a real focus behind a lens), negative for a virtual waist
	// before it. It is the lens-to-waist distance, with no position
	// arithmetic.
	AfterElement units.Length
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
func Waists(sys paraxial.System, in Input) (WaistList, error) {
	a, err := checkInput(sys, in)
	if err != nil {
		return nil, err
	}
	out := make(WaistList, 0, sys.Len())
	for pc := range sys.Walk(0, sys.Length()) {
		a = a.Transform(pc.X, pc.Y, pc.IndexOut)
		if a.X.Validate() != nil || a.Y.Validate() != nil {
			return nil, ErrOverflow
		}
		out = append(out, waistAfter(sys, pc, a))
	}
	return out, nil
}

// OutputWaist returns the waist of the beam leaving sys, the last entry
// of [Waists] (the zero Waist for a system with no element), without
// building the others: the goal that asks only for the output waist
// evaluates it at every step of a search. Its errors are those of
// [Waists].
func OutputWaist(sys paraxial.System, in Input) (Waist, error) {
	a, err := checkInput(sys, in)
	if err != nil {
		return Waist{}, err
	}
	var last paraxial.Piece
	n := 0
	for pc := range sys.Walk(0, sys.Length()) {
		a = a.Transform(pc.X, pc.Y, pc.IndexOut)
		if a.X.Validate() != nil || a.Y.Validate() != nil {
			return Waist{}, ErrOverflow
		}
		last, n = pc, n+1
	}
	if n == 0 {
		return Waist{}, nil
	}
	return waistAfter(sys, last, a), nil
}

// waistAfter is the waist of the beam a just after the piece pc of sys.
func waistAfter(sys paraxial.System, pc paraxial.Piece, a Astigmatic) Waist {
	end := pc.To
	return Waist{
		Element:        pc.Element,
		Name:           sys.Element(pc.Element).Name(),
		AfterElement:   a.X.WaistOffset(),
		Z:              end + a.X.WaistOffset(),
		Radius:         a.X.WaistRadius(),
		RayleighRange:  a.X.RayleighRange(),
		Index:          pc.IndexOut,
		ZY:             end + a.Y.WaistOffset(),
		RadiusY:        a.Y.WaistRadius(),
		RayleighRangeY: a.Y.RayleighRange(),
	}
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

// segment is a homogeneous stretch [s, e] of the path with the beam at s;
// elem is the index of the space, −1 for the input medium and Len() for
// the output medium.
type segment struct {
	s, e float64
	b    Astigmatic
	elem int
}

// segments calls f for every homogeneous stretch of sys that overlaps
// [a, b], in order, including the input medium before z = 0 (when a < 0)
// and the output medium after the system (when b > Length); stretches
// inside the system are whole spaces, not clipped to [a, b]. It walks the
// system with [paraxial.System.Walk]. The beam in must be valid. f returns
// false to stop.
func segments(sys paraxial.System, in Astigmatic, a, b float64, f func(segment) bool) {
	cur := in
	if a < 0 {
		s := segment{s: a, e: math.Min(0, b), b: cur.Transform(paraxial.Space(units.Length(a)), paraxial.Space(units.Length(a)), cur.X.Index), elem: -1}
		if !f(s) {
			return
		}
	}
	for pc := range sys.Walk(0, sys.Length()) {
		if pc.Kind == paraxial.KindSpace {
			z0, z1 := float64(pc.From), float64(pc.To)
			if z1 >= a && z0 <= b {
				if !f(segment{s: z0, e: z1, b: cur, elem: pc.Element}) {
					return
				}
			}
		}
		cur = cur.Transform(pc.X, pc.Y, pc.IndexOut)
	}
	if l := float64(sys.Length()); b > l {
		f(segment{s: l, e: b, b: cur, elem: sys.Len()})
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
// Zero-thickness surfaces leave w continuous, except a tilted interface,
// which rescales the tangential radius; both sides of it are compared. Ties keep the first
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
	// Z holds the sample positions from the input plane.
	Z []units.Length
	// W and WY hold the 1/e² beam radii w(z) in x and y.
	W, WY []units.Length
	// Curvature and CurvatureY hold the wavefront curvature 1/R(z) in
	// 1/m: 0 at a waist and finite everywhere, unlike R (see
	// [Gaussian.WavefrontCurvature]).
	Curvature, CurvatureY []float64
	// Index holds the refractive index at each sample.
	Index []float64
	// ElementZ holds the entrance position of every element of the
	// system, in element order.
	ElementZ []units.Length
	// Foci and FociY hold the real waists in x and in y inside the
	// sampled range, in order of position.
	Foci, FociY []Focus

	// The system and input beam the caustic was sampled from, for the
	// exact maxima of [Caustic.Irradiance].
	sys paraxial.System
	in  Astigmatic
	// The homogeneous stretches of the samples, for [Caustic.GouyPhase];
	// g0 the phases of the first sample, same whether y equals x.
	stretches []sampled
	g0        [2]float64
	same      bool
}

// sampled is the stretch of a caustic's samples k0 … k1−1, which lie at
// distance Z[k] − from into the stretches x and y.
type sampled struct {
	k0, k1 int
	from   float64
	x, y   stretch
}

// GouyPhase returns the on-axis Gouy phase of each plane at every sample
// (radians), accumulated from Z[0] element by element, not reduced modulo
// 2π: ψ(z) = ψ(z₀) + arctan(Re q(z)/zR) − arctan(Re q(z₀)/zR) within a
// space and the shift of [Gaussian.GouyShift] at a surface (Kogelnik & Li
// 1966). For a beam that is astigmatic the total on-axis Gouy phase of
// the fundamental mode is (x + y)/2 (Siegman, Lasers, ch. 20 [from
// memory]); for a round beam it is x, and y equals x.
//
// It is computed when asked, from the closed forms [Sample] kept: the
// arctangent per sample and plane costs more than w and 1/R together,
// and only a Gouy-phase plot or a mode-spacing study needs it. It returns
// nil slices for a Caustic that [Sample] or [SampleRange] did not make.
func (c Caustic) GouyPhase() (x, y []units.Angle) {
	if c.stretches == nil {
		return nil, nil
	}
	m := len(c.Z)
	g := make([]units.Angle, 2*m)
	x, y = g[0:m:m], g[m:]
	for _, st := range c.stretches {
		for k := st.k0; k < st.k1; k++ {
			d := float64(c.Z[k]) - st.from
			x[k] = units.Angle(st.x.gouy(d) - c.g0[0])
			if !c.same {
				y[k] = units.Angle(st.y.gouy(d) - c.g0[1])
			}
		}
	}
	if c.same {
		copy(y, x)
	}
	return x, y
}

// MaxSamples is the largest sample count [Sample] and [SampleRange]
// accept: 2²⁰ samples are 59 MB of results, far more than a figure or a
// table can show.
const MaxSamples = 1 << 20

// Sample returns the caustic of the beam in (given at the input plane)
// through the whole of sys, from z = 0 to z = sys.Length(), at n equally
// spaced positions (2 ≤ n ≤ [MaxSamples]) plus the position of every
// element inside that range and of every real waist ([Focus]), so that
// kinks at lenses and the minima of w are sampled exactly. Samples at the
// position of a surface describe the plane just after it, as in [At]. in
// may be a [Gaussian] (a round beam) or an [Astigmatic] beam; the x part
// follows the elements' X matrices and the y part their Y matrices.
//
// Within each space the values come from the closed forms of a
// homogeneous medium, q(z) = q(z₀) + (z − z₀) and ψ(z) = ψ(z₀) +
// arctan(Re q(z)/zR) − arctan(Re q(z₀)/zR) (Kogelnik & Li 1966); a surface
// adds the Gouy shift of [Gaussian.GouyShift].
//
// It returns an error if n is out of range, sys has zero length, in is
// invalid or its index differs from sys.IndexIn(). Use [SampleRange] to
// extend the range beyond the system.
func Sample(sys paraxial.System, in Input, n int) (Caustic, error) {
	if err := sys.Validate(); err != nil {
		return Caustic{}, err
	}
	if sys.Length() <= 0 {
		return Caustic{}, &ParamError{Param: "system length", Value: sys.Length(), Reason: "must be positive to sample; use SampleRange"}
	}
	return SampleRange(sys, in, 0, sys.Length(), n)
}

// SampleRange is like [Sample] over the range z0 to z1 (metres from the
// input plane, z0 < z1, both finite), which may extend before the input
// plane or beyond the output plane.
func SampleRange(sys paraxial.System, in Input, z0, z1 units.Length, n int) (Caustic, error) {
	if n < 2 || n > MaxSamples {
		return Caustic{}, &ParamError{Param: "sample count n", Value: n, Reason: "must be in [2, " + strconv.Itoa(MaxSamples) + "]"}
	}
	if !finite(float64(z0)) {
		return Caustic{}, &ParamError{Param: "start z0", Value: z0, Reason: "must be finite"}
	}
	if !finite(float64(z1)) || !(z1 > z0) {
		return Caustic{}, &ParamError{Param: "end z1", Value: z1, Reason: "must be finite and greater than z0 = " + z0.String()}
	}
	a0, err := checkInput(sys, in)
	if err != nil {
		return Caustic{}, err
	}
	a, b := float64(z0), float64(z1)

	// The grid: n equally spaced points merged with the surface positions
	// and the real waists, in increasing order, without duplicates.
	c := Caustic{ElementZ: make([]units.Length, 0, sys.Len()), sys: sys, in: a0, stretches: make([]sampled, 0, sys.Len()+2)}
	var extra []float64
	for pc := range sys.Walk(0, sys.Length()) {
		c.ElementZ = append(c.ElementZ, pc.From)
		if z := float64(pc.From); pc.Kind != paraxial.KindSpace && z > a && z < b {
			extra = append(extra, z)
		}
	}
	c.Foci, c.FociY = foci(sys, a0, a, b)
	for _, fs := range [][]Focus{c.Foci, c.FociY} {
		for _, f := range fs {
			if z := float64(f.Z); z > a && z < b {
				extra = append(extra, z)
			}
		}
	}
	slices.Sort(extra)
	zs := make([]units.Length, 0, n+len(extra))
	push := func(z float64) {
		if k := len(zs); k > 0 && float64(zs[k-1]) >= z {
			return
		}
		zs = append(zs, units.Length(z))
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
	c.Z = zs
	lens := make([]units.Length, 2*m)
	c.W, c.WY = lens[0:m:m], lens[m:]
	curv := make([]float64, 3*m)
	c.Curvature, c.CurvatureY, c.Index = curv[0:m:m], curv[m:2*m:2*m], curv[2*m:]

	// A round beam through rotationally symmetric elements needs one plane
	// only: the y results are copies (bit-identical to tracing y).
	same := a0.X == a0.Y
	for pc := range sys.Walk(0, sys.Length()) {
		same = same && pc.X == pc.Y
	}
	c.same = same
	// Walk from min(z0, 0) so that the beam is known at every piece;
	// samples start at z0. The beam cur holds at position pos.
	start := min(z0, 0)
	cur := a0
	if z0 < 0 {
		cur = a0.Transform(paraxial.Space(z0), paraxial.Space(z0), a0.X.Index)
	}
	var gx, gy float64 // Gouy phase accumulated at pos
	// Every output is checked in one sum: v − v is 0 for a finite v and
	// NaN otherwise; and the smallest radius must be positive.
	var bad float64
	minW := units.Length(math.Inf(1))
	k := 0
	emit := func(to units.Length, inclusive bool, from units.Length) {
		if k >= m || !(zs[k] < to || (inclusive && zs[k] == to)) {
			return
		}
		st := sampled{k0: k, from: float64(from), x: newStretch(cur.X, gx), y: newStretch(cur.Y, gy)}
		bad += st.x.base - st.x.base + st.y.base - st.y.base
		for k < m && (zs[k] < to || (inclusive && zs[k] == to)) {
			d := float64(zs[k] - from)
			w, curv := st.x.at(d)
			c.W[k], c.Curvature[k] = w, curv
			c.Index[k] = cur.X.Index
			v := float64(w) + curv
			bad += v - v
			minW = min(minW, w)
			if !same {
				w, curv := st.y.at(d)
				c.WY[k], c.CurvatureY[k] = w, curv
				v := float64(w) + curv
				bad += v - v
				minW = min(minW, w)
			}
			k++
		}
		st.k1 = k
		if st.k0 == 0 {
			c.g0 = [2]float64{st.x.gouy(float64(zs[0] - from)), st.y.gouy(float64(zs[0] - from))}
		}
		c.stretches = append(c.stretches, st)
	}
	advance := func(d float64) {
		if d == 0 {
			return
		}
		gx += gouyStep(cur.X, d)
		cur.X.Q += complex(d, 0)
		if !same {
			gy += gouyStep(cur.Y, d)
			cur.Y.Q += complex(d, 0)
		}
	}
	for pc := range sys.Walk(start, z1) {
		if pc.Kind == paraxial.KindSpace { // a space, or the input or output medium
			emit(pc.To, false, pc.From)
			advance(float64(pc.To - pc.From))
			continue
		}
		gx += float64(cur.X.GouyShift(pc.X))
		cur.X = cur.X.Transform(pc.X, pc.IndexOut)
		if !same {
			gy += float64(cur.Y.GouyShift(pc.Y))
			cur.Y = cur.Y.Transform(pc.Y, pc.IndexOut)
		}
	}
	emit(z1, true, z1)
	if bad != 0 || !(minW > 0) {
		return Caustic{}, ErrOverflow
	}
	if same {
		copy(c.WY, c.W)
		copy(c.CurvatureY, c.Curvature)
	}
	return c, nil
}

// stretch holds the constants of the closed forms of a beam along a
// homogeneous stretch, from the beam q = z0 + i zR at its start (Gouy phase
// g0 there):
//
//	w(d) = √(λ/(π zR)) · |z0 + d + i zR|,   1/R = (z0 + d)/((z0 + d)² + zR²)
//	ψ(d) = g0 − arctan(z0/zR) + arctan((z0 + d)/zR)
//
// with λ = M²λ0/n (Kogelnik & Li 1966).
type stretch struct {
	z0, zR, k, base float64
}

func newStretch(g Gaussian, g0 float64) stretch {
	z0, zR := real(g.Q), imag(g.Q)
	return stretch{z0: z0, zR: zR, k: math.Sqrt(g.lambda() / (math.Pi * zR)), base: g0 - math.Atan(z0/zR)}
}

// at returns the radius and wavefront curvature at distance d into the
// stretch.
func (s stretch) at(d float64) (units.Length, float64) {
	z := s.z0 + d
	r2 := float64(z*z) + float64(s.zR*s.zR)
	return units.Length(s.k * math.Sqrt(r2)), z / r2
}

// gouy returns the Gouy phase at distance d into the stretch.
func (s stretch) gouy(d float64) float64 { return s.base + math.Atan((s.z0+d)/s.zR) }

// gouyStep is the Gouy phase of a free-space step d from beam g:
// arctan(z2/zR) − arctan(z1/zR) (Kogelnik & Li 1966).
func gouyStep(g Gaussian, d float64) float64 {
	if d == 0 {
		return 0
	}
	z, zR := real(g.Q), imag(g.Q)
	return math.Atan((z+d)/zR) - math.Atan(z/zR)
}
