package cavity

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Class is the stability class of a round trip in one plane.
type Class int

// The stability classes, from the half-trace m = (A + D)/2 of the
// round-trip matrix.
const (
	// Stable: |m| < 1. Rays stay confined and the cavity has one
	// Gaussian eigenmode (for a two-mirror cavity 0 < g1·g2 < 1).
	Stable Class = iota
	// Marginal: |m| = 1 to rounding, the stability boundary
	// (g1·g2 = 0 or 1). If the round trip is ±I every ray retraces itself
	// but no Gaussian mode is singled out ([ErrDegenerate]); otherwise
	// rays walk off linearly with the number of round trips and the mode
	// has an infinite (or zero) radius somewhere ([ErrUnstable]). The
	// [Boundary] says which.
	Marginal
	// Unstable: |m| > 1 (g1·g2 < 0 or > 1). Rays walk off exponentially;
	// no Gaussian mode ([ErrUnstable]).
	Unstable
)

// String returns "stable", "marginal" or "unstable".
func (c Class) String() string {
	switch c {
	case Stable:
		return "stable"
	case Marginal:
		return "marginal"
	case Unstable:
		return "unstable"
	}
	return "Class(" + strconv.Itoa(int(c)) + ")"
}

// Boundary says where on the stability boundary a [Marginal] round trip
// lies. It is Inside for Stable and Unstable ones.
type Boundary int

// The boundary cases. For a two-mirror cavity M = −I is the symmetric
// confocal cavity (g1 = g2 = 0), EdgeMinus the other cases of g1·g2 = 0
// (R = L for one mirror: hemispherical when the other is flat), and
// EdgePlus g1·g2 = 1 (planar g1 = g2 = 1, concentric g1 = g2 = −1, and
// L = R1 + R2 in general: the centres of curvature coincide); M = +I does
// not occur without intracavity elements.
const (
	// Inside: not on the boundary.
	Inside Boundary = iota
	// MinusIdentity: the round trip is −I; every ray retraces itself
	// after two round trips and the round-trip Gouy phase is π.
	MinusIdentity
	// PlusIdentity: the round trip is +I; every ray retraces itself
	// after one round trip and the round-trip Gouy phase is 0 mod 2π.
	PlusIdentity
	// EdgeMinus: m = −1 but the round trip is not −I.
	EdgeMinus
	// EdgePlus: m = +1 but the round trip is not +I.
	EdgePlus
)

// String names the boundary case.
func (b Boundary) String() string {
	switch b {
	case Inside:
		return "inside"
	case MinusIdentity:
		return "round trip −I"
	case PlusIdentity:
		return "round trip +I"
	case EdgeMinus:
		return "(A + D)/2 = −1"
	case EdgePlus:
		return "(A + D)/2 = +1"
	}
	return "Boundary(" + strconv.Itoa(int(b)) + ")"
}

// PlaneStability is the stability of a cavity in one plane.
type PlaneStability struct {
	// Plane is Tangential or Sagittal.
	Plane paraxial.Plane
	// RoundTrip is the round-trip matrix at the reference plane z = 0,
	// just after the surfaces there (for a linear cavity, just after the
	// reflection at M1: A = 2g2 − 1, B = 2 d g2, D = 4 g1 g2 − 2 g2 − 1
	// for an empty cavity of spacing d). Its determinant is 1.
	RoundTrip paraxial.Matrix
	// HalfTrace is m = (A + D)/2 of the round trip, the same at every
	// plane (the round trips at two planes are similar matrices).
	HalfTrace float64
	// HasG reports that G1 and G2 are set: for a linear cavity.
	HasG bool
	// G1 and G2 are the g-parameters of a linear cavity, g = 1 − d/R for
	// an empty one (R > 0 concave, ∞ flat), with
	//
	//	m = 2 g1 g2 − 1,   stable for 0 < g1 g2 < 1
	//
	// (H. Kogelnik & T. Li, "Laser beams and resonators", Appl. Opt. 5,
	// 1550–1567 (1966) [from memory for the equation numbers]). With
	// intracavity elements they are the equivalent g-parameters of the
	// one-way path P = [[a, b], [c, d]] in reduced form (det 1, indices
	// n1 at M1 and n2 at M2):
	//
	//	g1 = a − b/R1,   g2 = (n2/n1)(d − b/R2)
	//
	// (H. Kogelnik, "Imaging of optical modes — resonators with internal
	// lenses", Bell Syst. Tech. J. 44, 455–494 (1965) [from memory]; the
	// relation m = 2 g1 g2 − 1 is checked against the round-trip matrix
	// in the tests).
	G1, G2 float64
	// Class is Stable, Marginal or Unstable.
	Class Class
	// Boundary says which boundary case a Marginal round trip is.
	Boundary Boundary
	// Note names the geometry of a Marginal round trip ("symmetric
	// confocal", "planar", "concentric", "hemispherical: R2 = d", …), or
	// is empty.
	Note string
}

// Stability is the stability of a cavity in both planes: X tangential
// (the plane of incidence of tilted mirrors), Y sagittal. They are equal
// for a cavity without tilted or cylindrical parts.
type Stability struct {
	X, Y PlaneStability
}

// Stable reports whether both planes are Stable.
func (s Stability) Stable() bool { return s.X.Class == Stable && s.Y.Class == Stable }

// Stability returns the stability of c in both planes, from the
// round-trip matrix (|A + D|/2 ≤ 1) and, for a linear cavity, the
// g-parameters. It returns [ErrNotBuilt] for the zero Cavity.
//
// The boundary |m| = 1 is decided with a tolerance of 1e-12 relative to
// the size of the terms that make up A + D (the half-trace of the product
// of the entrywise magnitudes of the element matrices): rounding in a
// product of N matrices leaves about N·1.1e-16 of that size (N. J.
// Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., 2002,
// §3.5 [from memory]), so 1e-12 is far above it and far below any
// deliberate distance from the boundary (g1·g2 = 1e-12 would need mirror
// radii matched to the spacing to 1e-12). The same tolerance, relative to
// the size of each entry's terms, decides whether the round trip is ±I.
func (c Cavity) Stability() (Stability, error) {
	if err := c.check(); err != nil {
		return Stability{}, err
	}
	return Stability{X: c.st[paraxial.Tangential], Y: c.st[paraxial.Sagittal]}, nil
}

// boundaryTolerance is the relative tolerance of the stability boundary;
// see [Cavity.Stability].
const boundaryTolerance = 1e-12

// stability computes the stability in plane p.
func (c Cavity) stability(p paraxial.Plane) PlaneStability {
	full, bound := c.loop.Matrix(p), paraxial.Identity()
	for pc := range c.loop.Walk(0, c.loop.Length()) {
		m := pc.X
		if p == paraxial.Sagittal {
			m = pc.Y
		}
		bound = bound.Then(absMatrix(m))
	}
	s := PlaneStability{Plane: p, RoundTrip: c.roundTrip(0, p), HalfTrace: (full.A + full.D) / 2}
	s.Class, s.Boundary = classify(full, bound)
	if c.kind == KindLinear {
		s.HasG = true
		pm := c.pass.Matrix(p)
		n1, n2 := c.pass.IndexIn(), c.pass.IndexOut()
		s.G1 = pm.A - pm.B*c.k1
		s.G2 = n2 / n1 * (pm.D - pm.B*c.k2)
	}
	s.Note = c.note(s)
	return s
}

// absMatrix returns the entrywise magnitudes of m.
func absMatrix(m paraxial.Matrix) paraxial.Matrix {
	return paraxial.Matrix{A: math.Abs(m.A), B: math.Abs(m.B), C: math.Abs(m.C), D: math.Abs(m.D)}
}

// classify returns the class and boundary case of the round-trip matrix
// m, whose terms have the entrywise magnitudes bound.
func classify(m, bound paraxial.Matrix) (Class, Boundary) {
	h := (m.A + m.D) / 2
	tol := boundaryTolerance * math.Max(1, (bound.A+bound.D)/2)
	d := math.Abs(h) - 1
	switch {
	case math.Abs(d) <= tol:
		sgn := math.Copysign(1, h)
		ident := math.Abs(m.A-sgn) <= boundaryTolerance*math.Max(1, bound.A) &&
			math.Abs(m.D-sgn) <= boundaryTolerance*math.Max(1, bound.D) &&
			math.Abs(m.B) <= boundaryTolerance*bound.B &&
			math.Abs(m.C) <= boundaryTolerance*bound.C
		switch {
		case ident && sgn < 0:
			return Marginal, MinusIdentity
		case ident:
			return Marginal, PlusIdentity
		case sgn < 0:
			return Marginal, EdgeMinus
		}
		return Marginal, EdgePlus
	case d < 0:
		return Stable, Inside
	}
	return Unstable, Inside
}

// nameTolerance is how close a g-parameter must be to 0 or ±1 to be named
// by it on the boundary (where g1·g2 is already known to be 0 or 1 to
// 1e-12): loose, since it only chooses the words of the note.
const nameTolerance = 1e-9

// note names the geometry of a marginal round trip.
func (c Cavity) note(s PlaneStability) string {
	if s.Class != Marginal {
		return ""
	}
	near := func(g, v float64) bool { return math.Abs(g-v) <= nameTolerance }
	if c.kind == KindRing {
		switch s.Boundary {
		case MinusIdentity:
			return "round trip −I: every ray retraces itself after two round trips"
		case PlusIdentity:
			return "round trip +I: every ray retraces itself after one round trip"
		case EdgeMinus, EdgePlus, Inside:
		}
		return s.Boundary.String()
	}
	m1, m2 := c.ends[0], c.ends[1]
	equiv := ""
	if !c.spacesOnly {
		equiv = "equivalent "
	}
	switch s.Boundary {
	case MinusIdentity:
		if c.spacesOnly {
			return "symmetric confocal (g1 = g2 = 0, R1 = R2 = d)"
		}
		return "round trip −I (" + equiv + "g1 = g2 = 0)"
	case PlusIdentity:
		return "round trip +I"
	case EdgeMinus:
		zero, other, g := m2, m1, "g2"
		if math.Abs(s.G1) < math.Abs(s.G2) {
			zero, other, g = m1, m2, "g1"
		}
		if !c.spacesOnly {
			return equiv + g + " = 0 (g1·g2 = 0)"
		}
		if other.shape == Flat {
			return "hemispherical: " + g + " = 0, R = d for " + quoteLabel(zero) + ", centre of curvature on the flat " + quoteLabel(other)
		}
		return g + " = 0: R = d for " + quoteLabel(zero) + ", centre of curvature on " + quoteLabel(other)
	case EdgePlus:
		switch {
		case near(s.G1, 1) && near(s.G2, 1):
			return "planar (" + equiv + "g1 = g2 = 1)"
		case near(s.G1, -1) && near(s.G2, -1):
			return "concentric (" + equiv + "g1 = g2 = −1)"
		case c.spacesOnly:
			return "g1·g2 = 1: d = R1 + R2, the centres of curvature coincide"
		}
		return equiv + "g1·g2 = 1"
	case Inside:
	}
	return ""
}

func quoteLabel(r reflection) string { return strconv.Quote(r.label) }

// roundTrip returns the round-trip matrix in plane p starting and ending
// at the plane z of the loop (just after the surfaces at z):
//
//	M(z) = M(0 → z) · M(z → L)
//
// (the part from z to the end of the loop acts first).
//
// z must lie in [0, Length]; it is clamped there.
func (c Cavity) roundTrip(z units.Length, p paraxial.Plane) paraxial.Matrix {
	l := c.loop.Length()
	z = min(max(0, z), l)
	after, _ := c.loop.MatrixBetween(z, l, p)
	before, _ := c.loop.MatrixTo(z, p)
	return after.Then(before)
}
