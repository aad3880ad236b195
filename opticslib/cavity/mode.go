package cavity

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Mode is the Gaussian eigenmode (TEM₀₀) of a cavity at one plane of its
// round trip: the beam that reproduces itself after one round trip.
type Mode struct {
	// Z is the position of the plane along the round trip, in metres from
	// the reference plane z = 0 of [Cavity.Loop]. The plane lies just
	// after any surfaces at Z: at a mirror, the beam leaving it.
	Z units.Length
	// Beam is the eigenmode at the plane, X in the tangential and Y in
	// the sagittal plane, with the vacuum wavelength of the cavity and
	// the index of the medium at Z. For a cavity without tilted or
	// cylindrical parts X and Y are equal.
	Beam beam.Astigmatic
	// RoundTripX and RoundTripY are the round-trip matrices starting and
	// ending at the plane, from which the mode was solved.
	RoundTripX, RoundTripY paraxial.Matrix
	// Chosen reports the symmetric confocal cavity, whose round trip is
	// −I: every q reproduces itself, and Beam is this package's
	// documented choice (see [Cavity.Eigenmode]), not a consequence of
	// the round-trip matrix.
	Chosen bool
}

// Eigenmode returns the eigenmode of c at the plane z (metres along the
// round trip, 0 ≤ z ≤ [Cavity.Length]; for a linear cavity z ≤ d is
// the distance from M1 on the pass towards M2). In each plane it solves
// the self-consistency condition q = (A q + B)/(C q + D) for the
// round-trip matrix M(z) starting at z (det M = 1),
//
//	C q² + (D − A) q − B = 0
//	1/q = (D − A)/(2B) − i √(1 − m²)/|B|,   m = (A + D)/2
//
// taking the root with Im(1/q) < 0, a beam of finite radius
// w² = λ|B|/(π√(1 − m²)), λ = λ0/n (H. Kogelnik & T. Li, "Laser beams
// and resonators", Appl. Opt. 5, 1550–1567 (1966); A. E. Siegman,
// Lasers, University Science Books 1986, ch. 21 [from memory for the
// chapter]). Stability implies B ≠ 0 (B = 0 gives A D = 1 and |m| ≥ 1).
//
// # Special cases
//
//   - Unstable, or on the boundary with M ≠ ±I (planar, concentric,
//     hemispherical): a [*ParamError] naming the plane and wrapping
//     [ErrUnstable].
//   - M = ±I: every q is self-consistent. For the symmetric confocal
//     two-mirror cavity (R1 = R2 = d, nothing between the mirrors) the
//     mode is the one the mirrors single out by symmetry: the waist at the
//     centre, zR = d/2, w0² = λd/(2π), the wavefront matching both
//     mirrors, which is the limit of the symmetric cavity's mode as
//     g → 0 and the lowest-loss mode of finite confocal mirrors (G. D.
//     Boyd & J. P. Gordon, "Confocal multimode resonator for millimeter
//     through optical wavelength masers", Bell Syst. Tech. J. 40, 489–508
//     (1961) [from memory]). Mode.Chosen is then set. The mirrors' own
//     matching condition does not fix it: a one-parameter family of
//     Gaussian beams matches both confocal mirrors. Every other ±I round
//     trip is a [*ParamError] wrapping [ErrDegenerate].
//   - z outside [0, Length] or not finite: a [*ParamError].
//   - A mode beyond the paraxial range of package beam
//     ([beam.MaxDivergence]): the error of [beam.FromQ].
func (c Cavity) Eigenmode(z units.Length) (Mode, error) {
	if err := c.check(); err != nil {
		return Mode{}, err
	}
	if zz := float64(z); math.IsNaN(zz) || math.IsInf(zz, 0) || z < 0 || z > c.loop.Length() {
		return Mode{}, &ParamError{Param: "position z", Value: z, Reason: "must be within the round trip, 0 to " + c.loop.Length().String()}
	}
	mode := Mode{Z: z, RoundTripX: c.roundTrip(z, paraxial.Tangential), RoundTripY: c.roundTrip(z, paraxial.Sagittal)}
	n := c.loop.IndexAt(z)
	var gs [2]beam.Gaussian
	for _, p := range []paraxial.Plane{paraxial.Tangential, paraxial.Sagittal} {
		rt := mode.RoundTripX
		if p == paraxial.Sagittal {
			rt = mode.RoundTripY
		}
		q, chosen, err := c.selfConsistent(p, z, rt)
		if err != nil {
			return Mode{}, err
		}
		mode.Chosen = mode.Chosen || chosen
		g, err := beam.FromQ(q, c.lambda, n)
		if err != nil {
			return Mode{}, &ParamError{Subject: planeSubject(p), Param: "eigenmode q", Value: q, Err: err}
		}
		gs[p] = g
	}
	mode.Beam = beam.Astigmatic{X: gs[paraxial.Tangential], Y: gs[paraxial.Sagittal]}
	return mode, nil
}

// EigenmodeAtPart returns the eigenmode just after the part labelled
// label (a mirror: the beam leaving it; the beam radius is the same on
// both sides of a thin element). For a linear cavity the labels of Path
// name the pass from M1 to M2 and "return/<label>" the return pass. It
// returns the errors of [Cavity.Eigenmode] and a [*ParamError] wrapping
// [paraxial.ErrNoLabel] or [paraxial.ErrAmbiguousLabel].
func (c Cavity) EigenmodeAtPart(label string) (Mode, error) {
	if err := c.check(); err != nil {
		return Mode{}, err
	}
	pt, err := c.loop.Part(label)
	if err != nil {
		return Mode{}, wrapParaxial("", err)
	}
	return c.Eigenmode(pt.End)
}

// selfConsistent returns the eigen-q in plane p at the plane z whose
// round-trip matrix is rt, and whether it is the confocal choice.
func (c Cavity) selfConsistent(p paraxial.Plane, z units.Length, rt paraxial.Matrix) (complex128, bool, error) {
	st := c.st[p]
	switch st.Class {
	case Stable:
		return eigenQ(rt), false, nil
	case Unstable:
		return 0, false, &ParamError{Subject: planeSubject(p), Param: "half-trace (A + D)/2", Value: st.HalfTrace, Reason: "|A + D|/2 > 1: unstable", Err: ErrUnstable}
	case Marginal:
	}
	switch st.Boundary {
	case MinusIdentity, PlusIdentity:
		if c.confocal() {
			q0 := complex(-float64(c.spacing)/2, float64(c.spacing)/2)
			m, err := c.loop.MatrixBetween(0, z, p)
			if err != nil {
				return 0, false, wrapParaxial(planeSubject(p), err)
			}
			n := c.pass.IndexIn()
			g := beam.Gaussian{Q: q0, Wavelength: c.lambda, Index: n}.Transform(m, n)
			return g.Q, true, nil
		}
		id := "+I"
		if st.Boundary == MinusIdentity {
			id = "−I"
		}
		return 0, false, &ParamError{Subject: planeSubject(p), Param: "round-trip matrix", Value: matrixText(rt), Reason: "is " + id + ": the mode is set by the apertures and misalignment, not by the ABCD matrix", Err: ErrDegenerate}
	case EdgeMinus, EdgePlus, Inside:
	}
	reason := "|A + D|/2 = 1, round trip not ±I: on the stability boundary"
	if st.Note != "" {
		reason += " (" + st.Note + ")"
	}
	return 0, false, &ParamError{Subject: planeSubject(p), Param: "half-trace (A + D)/2", Value: st.HalfTrace, Reason: reason + ": the mode's radius is unbounded", Err: ErrUnstable}
}

// confocal reports the symmetric confocal two-mirror cavity: a linear
// cavity with an empty path whose round trip is −I in both planes.
func (c Cavity) confocal() bool {
	return c.kind == KindLinear && c.spacesOnly &&
		c.st[paraxial.Tangential].Boundary == MinusIdentity && c.st[paraxial.Sagittal].Boundary == MinusIdentity
}

// eigenQ returns the self-consistent q of a stable round-trip matrix m
// (|m.A + m.D| < 2, det 1), the root with Im(1/q) < 0; see
// [Cavity.Eigenmode]. 1 − h² is formed as (1 − h)(1 + h), which keeps
// its relative accuracy near the boundary.
func eigenQ(m paraxial.Matrix) complex128 {
	h := (m.A + m.D) / 2
	s := math.Sqrt((1 - h) * (1 + h))
	return 1 / complex((m.D-m.A)/(2*m.B), -s/math.Abs(m.B))
}
