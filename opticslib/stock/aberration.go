package stock

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// SphericalSeidel returns the third-order spherical-aberration Seidel sum
// S_I of a thin lens in air, in metres: marginal ray height y (metres) at
// the lens, focal length f (metres), index n, Coddington shape factor
// shape (q = (c1 + c2)/(c1 − c2), see [Lens.ShapeFactor]) and conjugate
// (position) factor conjugate (C = (u + u′)/(u − u′), see [Conjugate]):
//
//	S_I = (y⁴ K³ / 4) · [ (n+2)/(n−1) q² + 4(n+1) q C + (3n+2)(n−1) C² + n³/(n−1) ] / (n (n−1)),
//	K = 1/f
//
// (W. T. Welford, Aberrations of Optical Systems, Adam Hilger 1986,
// §7.3, in the expanded form; W. J. Smith, Modern Optical Engineering,
// ch. 6 [from memory for both]). The Seidel sums of several thin lenses
// add. From S_I follow, for the light leaving at the paraxial marginal
// angle u′ in air,
//
//	W040 = S_I/8                    wavefront aberration at the pupil's edge
//	δl′ = −S_I/(2 u′²)              longitudinal aberration (negative: the
//	                                marginal ray crosses the axis first, as
//	                                for a positive singlet)
//	σ = |W040|/(6√5)                RMS wavefront error with the defocus
//	                                that minimises it ([SphericalRMS])
//
// It is pure arithmetic (NaN or ±Inf for n = 1 or f = 0).
func SphericalSeidel(y, f units.Length, n, shape, conjugate float64) units.Length {
	k := 1 / float64(f)
	yy := float64(y) * float64(y)
	q, c := shape, conjugate
	b := ((n+2)/(n-1)*q*q + 4*(n+1)*q*c + (3*n+2)*(n-1)*c*c + n*n*n/(n-1)) / (n * (n - 1))
	return units.Length(yy * yy * k * k * k * b / 4)
}

// BestShape returns the shape factor that minimises the spherical
// aberration of a thin lens of index n at conjugate factor conjugate,
// from ∂S_I/∂q = 0 in [SphericalSeidel]:
//
//	q_best = −2 (n² − 1) C / (n + 2)
//
// For a collimated input (C = −1) it is 2(n² − 1)/(n + 2), 0.714 for
// n = 1.5 (Coddington's best form; Smith, Modern Optical Engineering,
// ch. 6 [from memory]): close to a plano-convex lens with its curved side
// towards the collimated beam (q = +1).
func BestShape(n, conjugate float64) float64 { return -2 * (n*n - 1) * conjugate / (n + 2) }

// Conjugate returns the conjugate (position) factor C = (u + u′)/(u − u′)
// of a thin lens of focal length f (metres) met by light whose wavefront
// curvature at the lens is curvature (1/m, 1/R: positive for light
// diverging from a point before the lens, 0 for a collimated beam):
//
//	u = y·curvature,  u′ = u − y/f   ⇒   C = 2 f·curvature − 1
//
// (Welford 1986, §7.3 [from memory]): −1 for a collimated input, +1 for a
// collimated output (light from the front focal point), 0 at unit
// magnification. Angles are slopes positive for rising rays, as in
// package paraxial.
func Conjugate(f units.Length, curvature float64) float64 { return 2*float64(f)*curvature - 1 }

// SphericalRMS returns the RMS wavefront error of primary spherical
// aberration of Seidel sum s over a uniformly filled circular pupil, with
// the defocus that minimises it (the best focus, or for a collimated beam
// a small change of the last spacing), in metres:
//
//	σ = |W040| / (6√5),   W040 = S_I/8
//
// (M. Born & E. Wolf, Principles of Optics, 7th ed., §9.2 [from memory]:
// W040(ρ⁴ − ρ²) has the variance W040²/180).
func SphericalRMS(s units.Length) units.Length {
	return units.Length(math.Abs(float64(s)) / 8 / (6 * math.Sqrt(5)))
}

// Seidel returns the spherical-aberration Seidel sum S_I of the lens as
// listed at marginal ray height y and conjugate factor conjugate
// ([SphericalSeidel] with the lens's focal length, index and shape factor;
// the thin-lens formula, whatever the thickness). An achromat returns 0:
// its spherical aberration is corrected by its design for a collimated
// beam on its crown side, and the search assumes it is mounted so (an
// approximation, common practice, no single source; turned round, or
// between near conjugates, it is not corrected).
func (l Lens) Seidel(y units.Length, conjugate float64) units.Length {
	if l.Kind == Achromat {
		return 0
	}
	return SphericalSeidel(y, l.Focal, l.Index, l.ShapeFactor(), conjugate)
}
