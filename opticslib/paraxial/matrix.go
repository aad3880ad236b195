package paraxial

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Matrix is a 2×2 ray-transfer (ABCD) matrix acting on the column vector
// (y, θ) of a [Ray]:
//
//	⎡y₂⎤   ⎡A B⎤ ⎡y₁⎤
//	⎣θ₂⎦ = ⎣C D⎦ ⎣θ₁⎦
//
// B is in metres and C in 1/m; A and D are dimensionless. Angles are
// un-reduced, so det M = n_in/n_out. (Kogelnik & Li, "Laser beams and
// resonators", Appl. Opt. 5, 1550 (1966), table I [from memory], use the
// same form.)
//
// The zero value is the zero matrix, not the identity; use [Identity].
type Matrix struct {
	A, B, C, D float64
}

// Identity returns the identity matrix, the transfer matrix of an empty
// system (A = D = 1, B = C = 0).
func Identity() Matrix { return Matrix{A: 1, D: 1} }

// Then returns the matrix of m followed by next: the product next·m, so that
//
//	m.Then(next).Apply(r) == next.Apply(m.Apply(r))
//
// A chain a.Then(b).Then(c) reads in the order light meets the elements.
// Products are evaluated with each term rounded separately, so results are
// identical on CPUs with and without fused multiply-add.
func (m Matrix) Then(next Matrix) Matrix {
	return Matrix{
		A: float64(next.A*m.A) + float64(next.B*m.C),
		B: float64(next.A*m.B) + float64(next.B*m.D),
		C: float64(next.C*m.A) + float64(next.D*m.C),
		D: float64(next.C*m.B) + float64(next.D*m.D),
	}
}

// Det returns the determinant A·D − B·C. With un-reduced angles it equals
// n_in/n_out, the ratio of the refractive indices before and after the
// system.
func (m Matrix) Det() float64 {
	return float64(m.A*m.D) - float64(m.B*m.C)
}

// Apply returns the ray r transferred through m:
//
//	y₂ = A y₁ + B θ₁
//	θ₂ = C y₁ + D θ₁
func (m Matrix) Apply(r Ray) Ray {
	y, th := float64(r.Y), float64(r.Theta)
	return Ray{
		Y:     units.Length(float64(m.A*y) + float64(m.B*th)),
		Theta: units.Angle(float64(m.C*y) + float64(m.D*th)),
	}
}

// Ray is a paraxial ray at one plane: height Y above the axis (metres) and
// un-reduced slope angle Theta (radians), positive when the ray rises
// towards +z.
type Ray struct {
	Y     units.Length
	Theta units.Angle
}

// Space returns the transfer matrix of a homogeneous gap of axial length d
// (metres):
//
//	⎡1 d⎤
//	⎣0 1⎦
//
// It does not depend on the refractive index of the gap: with un-reduced
// angles the slope θ is constant along a straight ray and the height grows
// by d·θ whatever the medium. In the reduced-angle form (ray vector (y, nθ))
// the same gap has B = d/n, the "reduced thickness"; that form has det = 1
// everywhere. (Gerrard & Burch 1975, ch. 2 [from memory].)
//
// Special cases: a negative d propagates backwards; NaN or ±Inf d gives a
// non-finite B.
func Space(d units.Length) Matrix {
	return Matrix{A: 1, B: float64(d), D: 1}
}

// ThinLens returns the matrix of a thin lens of focal length f (metres) in a
// single medium:
//
//	⎡  1   0⎤
//	⎣−1/f  1⎦
//
// f > 0 converges. Special cases: ThinLens(±Inf) is the identity;
// ThinLens(0) has C = ∓Inf. (Kogelnik & Li 1966, table I [from memory].)
func ThinLens(f units.Length) Matrix {
	return Matrix{A: 1, C: -1 / float64(f), D: 1}
}

// SphericalInterface returns the refraction matrix of a spherical surface of
// radius r (metres; r > 0 when the centre of curvature lies after the
// vertex) between media of index n1 (before) and n2 (after), for un-reduced
// angles:
//
//	⎡       1             0   ⎤
//	⎣(n1−n2)/(n2·r)    n1/n2  ⎦
//
// Its determinant is n1/n2 and its rear focal length is n2·r/(n2−n1).
// (F. L. Pedrotti, L. S. Pedrotti & L. M. Pedrotti, Introduction to
// Optics, 3rd ed., Pearson 2007, ch. 18 [from memory], which uses the same
// un-reduced form; derived from the paraxial Snell law
// n1(θ1 + y/r) = n2(θ2 + y/r).)
//
// Special cases: r = ±Inf gives [PlanarInterface]; r = 0 gives an infinite C.
func SphericalInterface(r units.Length, n1, n2 float64) Matrix {
	return Matrix{A: 1, C: (n1 - n2) / (n2 * float64(r)), D: n1 / n2}
}

// PlanarInterface returns the refraction matrix of a flat surface between
// media of index n1 and n2 for un-reduced angles, the paraxial Snell law
// n1θ1 = n2θ2:
//
//	⎡1    0  ⎤
//	⎣0  n1/n2⎦
func PlanarInterface(n1, n2 float64) Matrix {
	return Matrix{A: 1, D: n1 / n2}
}

// abs returns the matrix of the magnitudes of the entries of m.
func (m Matrix) abs() Matrix {
	return Matrix{A: math.Abs(m.A), B: math.Abs(m.B), C: math.Abs(m.C), D: math.Abs(m.D)}
}

// zeroTolerance is the relative size below which an entry of a product
// counts as zero in the imaging and pupil conditions: |x| ≤ 1e-12·x̄,
// where x̄ is the same entry of the product of the entrywise magnitudes,
// the size of the terms that cancelled in x. Rounding leaves about
// N·1.1e-16·x̄ after N products (N. J. Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., 2002, §3.5 [from memory]), so 1e-12 is
// far above it for any practical system and far below a deliberate value.
const zeroTolerance = 1e-12

// nearZero reports |x| ≤ zeroTolerance·bound.
func nearZero(x, bound float64) bool { return math.Abs(x) <= zeroTolerance*bound }

func (m Matrix) finite() bool {
	return finite(m.A) && finite(m.B) && finite(m.C) && finite(m.D)
}

// Flat is the radius of a flat surface, +Inf, for the radius arguments of
// [Builder.ThickLens], [Builder.Mirror] and the matrix constructors. The
// limit R → ∞ of every curved-surface matrix is the flat-surface matrix
// (C ∝ 1/R → 0). It is the only infinite value the [Builder] accepts; a
// radius of 0 is always an error. (Go constants cannot be infinite, so
// Flat is a variable; do not assign to it.)
var Flat = units.Length(math.Inf(1))

// Reverse returns the matrix of the same optics traversed in the opposite
// direction (light entering at the old output, in the old output medium):
//
//	M_rev = (1/det M) ⎡D B⎤
//	                  ⎣C A⎦
//
// It follows from the reversal rule for reduced matrices, where
// M_rev,red = [[D, B], [C, A]] (A. Gerrard & J. M. Burch, Introduction to
// Matrix Methods in Optics, 1975, §II.7 [from memory]), converted with
// [Matrix.Reduced]. Heights keep their sign and angles keep theirs in the
// reversed frame, whose z axis points the other way. det M_rev = 1/det M.
// Special case: det M = 0 gives non-finite entries.
func (m Matrix) Reverse() Matrix {
	d := m.Det()
	return Matrix{A: m.D / d, B: m.B / d, C: m.C / d, D: m.A / d}
}

// Reduced returns the reduced-angle form of m, the matrix acting on
// (y, n·θ), for input index nIn and output index nOut:
//
//	⎡ A        B/nIn     ⎤
//	⎣ nOut·C   nOut·D/nIn⎦
//
// Its determinant is 1 when m is a physical system (det m = nIn/nOut).
// A gap of length d in index n has the reduced form B = d/n ("reduced
// thickness"). [MatrixFromReduced] is the inverse.
func (m Matrix) Reduced(nIn, nOut float64) Matrix {
	return Matrix{A: m.A, B: m.B / nIn, C: nOut * m.C, D: nOut * m.D / nIn}
}

// MatrixFromReduced converts a reduced-angle matrix r, acting on (y, n·θ),
// back to the un-reduced form used by this package; it is the inverse of
// [Matrix.Reduced].
func MatrixFromReduced(r Matrix, nIn, nOut float64) Matrix {
	return Matrix{A: r.A, B: r.B * nIn, C: r.C / nOut, D: r.D * nIn / nOut}
}

// ThickLens returns the matrix of a lens of front radius r1, back radius
// r2, centre thickness t (metres) and index n, immersed in a medium of
// index n0 on both sides: back surface · glass gap · front surface,
//
//	SphericalInterface(r1, n0, n).Then(Space(t)).Then(SphericalInterface(r2, n, n0))
//
// A radius of [Flat] gives a plane surface. Its power −n0·C is
// (n−n0)·[1/r1 − 1/r2 + (n−n0)t/(n r1 r2)], which for n0 = 1 is the
// thick-lens lensmaker formula (W. J. Smith, Modern Optical Engineering,
// 4th ed., McGraw-Hill 2008, ch. 2 [from memory]).
func ThickLens(r1, r2, t units.Length, n, n0 float64) Matrix {
	return SphericalInterface(r1, n0, n).Then(Space(t)).Then(SphericalInterface(r2, n, n0))
}

// Mirror returns the tangential and sagittal matrices of a mirror of
// radius r (metres; package sign convention, so a concave mirror facing
// the incoming light has r < 0, and [Flat] is a flat mirror) met at angle
// of incidence aoi (radians), in the unfolded representation where the
// reflected light continues towards +z:
//
//	tangential: ⎡    1       0⎤    sagittal: ⎡     1      0⎤
//	            ⎣2/(r·cos θ) 1⎦              ⎣2·cos θ/r   1⎦
//
// At normal incidence this is a lens of focal length f = −r/2 (H. Kogelnik
// & T. Li, Appl. Opt. 5, 1550 (1966), table I [from memory], with their
// R = −r); off axis the focal length is f·cos θ in the plane of incidence
// and f/cos θ perpendicular to it (H. Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank,
// IEEE J. Quantum Electron. QE-8, 373 (1972) [from memory]). Heights
// keep their sign across the fold.
func Mirror(r units.Length, aoi units.Angle) (tangential, sagittal Matrix) {
	c := math.Cos(float64(aoi))
	return Matrix{A: 1, C: 2 / (float64(r) * c), D: 1}, Matrix{A: 1, C: 2 * c / float64(r), D: 1}
}

// CylindricalLens returns the tangential and sagittal matrices of a thin
// cylindrical lens of focal length f (metres) with power in plane p only:
// [ThinLens](f) in plane p and the identity in the other.
func CylindricalLens(f units.Length, p Plane) (tangential, sagittal Matrix) {
	if p == Sagittal {
		return Identity(), ThinLens(f)
	}
	return ThinLens(f), Identity()
}

// TiltedPlanarInterface returns the tangential and sagittal matrices of a
// flat surface between indices n1 and n2 met at angle of incidence aoi
// (radians), with the refraction angle θ' from n1 sin θ = n2 sin θ':
//
//	tangential: ⎡cos θ'/cos θ            0           ⎤
//	            ⎣     0        n1·cos θ/(n2·cos θ')  ⎦
//	sagittal:   [PlanarInterface](n1, n2)
//
// The tangential A is the change of beam width across the tilted surface
// and D follows from differentiating Snell's law, n1 cos θ dθ =
// n2 cos θ' dθ'; det = n1/n2 in both planes. A plate of thickness t
// tilted by θ then has B = t·n²cos²θ/(n²−sin²θ)^{3/2} (tangential) and
// t/√(n²−sin²θ) (sagittal) in air, the Brewster-plate formulas of
// Kogelnik et al. 1972 [from memory]. Beyond the critical angle the
// entries are NaN; [Builder.Plate] rejects such angles.
func TiltedPlanarInterface(n1, n2 float64, aoi units.Angle) (tangential, sagittal Matrix) {
	s := n1 * math.Sin(float64(aoi)) / n2
	c1 := math.Cos(float64(aoi))
	c2 := math.Sqrt(1 - s*s)
	return Matrix{A: c2 / c1, D: n1 * c1 / (n2 * c2)}, PlanarInterface(n1, n2)
}

// PlateShift returns the paraxial longitudinal image shift of a
// plane-parallel plate of thickness t (metres) and index n in a medium of
// index n0 at normal incidence, the difference between t and its
// air-equivalent path t·n0/n:
//
//	Δ = t (1 − n0/n)
//
// An image formed through the plate moves away by Δ (reference-checks R32;
// for n0 = 1, W. J. Smith, Modern Optical Engineering, 4th ed., McGraw-Hill
// 2008, ch. 4 [from memory]).
func PlateShift(t units.Length, n, n0 float64) units.Length {
	return t * units.Length(1-n0/n)
}

// PlateDisplacement returns the lateral offset (metres) between the
// incident and the exit ray of a plane-parallel plate of thickness t and
// index n in a medium of index n0 at angle of incidence aoi:
//
//	d = t sin θ [1 − cos θ / √((n/n0)² − sin²θ)]
//
// This is exact geometry (Snell's law), not paraxial; the exit ray is
// parallel to the incident one (reference-checks R32). It returns NaN for
// n < n0 beyond the critical angle.
func PlateDisplacement(t units.Length, n, n0 float64, aoi units.Angle) units.Length {
	s, c := math.Sincos(float64(aoi))
	r := n / n0
	return t * units.Length(s*(1-c/math.Sqrt(r*r-s*s)))
}
