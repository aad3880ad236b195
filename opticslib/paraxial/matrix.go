package paraxial

import "github.com/beamnote/beamnote/opticslib/units"

// Matrix is a 2×2 ray-transfer (ABCD) matrix acting on the column vector
// (y, θ) of a [Ray]:
//
//	⎡y₂⎤   ⎡A B⎤ ⎡y₁⎤
//	⎣θ₂⎦ = ⎣C D⎦ ⎣θ₁⎦
//
// B is in metres and C in 1/m; A and D are dimensionless. Angles are
// un-reduced, so det M = n_in/n_out. (Kogelnik & Li, "Laser beams and
// resonators", Appl. Opt. 5, 1550 (1966), table I, use the same form.)
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
// ThinLens(0) has C = ∓Inf. (Kogelnik & Li 1966, table I.)
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
// (E. Hecht, Optics, 4th ed., §6.2 [section from memory]; derived from the
// paraxial Snell law n1(θ1 + y/r) = n2(θ2 + y/r).)
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

func (m Matrix) finite() bool {
	return finite(m.A) && finite(m.B) && finite(m.C) && finite(m.D)
}
