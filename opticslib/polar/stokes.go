package polar

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Stokes is a Stokes vector: the four Stokes parameters of a beam that
// may be partially polarized, in the caller's power unit (see [Jones]):
//
//	S0   the total power
//	S1   the power along x minus the power along y
//	S2   the power along +45° minus the power along −45°
//	S3   the right-handed minus the left-handed circular power
//
// with the handedness of [Handedness] (E. Collett, Field Guide to
// Polarization, SPIE 2005 [from memory]). A physical beam has
// S0 ≥ √(S1² + S2² + S3²), with equality for fully polarized light
// ([Jones.Stokes]). The Stokes vectors of mutually incoherent beams add
// ([Stokes.Add]; G. G. Stokes 1852, Born & Wolf, Principles of Optics,
// §10.8.3 [from memory]).
type Stokes struct {
	S0, S1, S2, S3 float64
}

// Add returns the Stokes vector of the incoherent superposition of s and
// o: the sum of the parameters.
func (s Stokes) Add(o Stokes) Stokes {
	return Stokes{S0: s.S0 + o.S0, S1: s.S1 + o.S1, S2: s.S2 + o.S2, S3: s.S3 + o.S3}
}

// polarized returns √(S1² + S2² + S3²), the power of the polarized part.
func (s Stokes) polarized() float64 {
	return math.Hypot(math.Hypot(s.S1, s.S2), s.S3)
}

// DegreeOfPolarization returns the degree of polarization
//
//	DOP = √(S1² + S2² + S3²)/S0
//
// (dimensionless: 1 for fully polarized light, 0 for unpolarized light;
// Born & Wolf, §10.8.2 [from memory]). Special case: DOP = 0 when S0 = 0
// (no light, nothing polarized). It is not clamped: a value above 1 means
// s is not physical (see [Stokes.Validate]).
func (s Stokes) DegreeOfPolarization() float64 {
	if s.S0 == 0 {
		return 0
	}
	return s.polarized() / s.S0
}

// Ellipse returns the polarization ellipse of the polarized part of s:
//
//	ψ = ½ atan2(S2, S1),   χ = ½ asin(S3/√(S1² + S2² + S3²))
//
// (Born & Wolf, §1.4.2 [from memory]). Special cases: circular light has
// no azimuth and returns ψ = 0; a Stokes vector without polarized part
// returns the zero Ellipse.
func (s Stokes) Ellipse() Ellipse {
	ip := s.polarized()
	if ip == 0 {
		return Ellipse{}
	}
	return Ellipse{
		Azimuth:     units.Angle(math.Atan2(s.S2, s.S1) / 2),
		Ellipticity: units.Angle(math.Asin(math.Max(-1, math.Min(1, s.S3/ip))) / 2),
	}
}

// Validate returns a [*ParamError] unless s is a physical Stokes vector:
// finite parameters, S0 ≥ 0 and √(S1² + S2² + S3²) ≤ S0, the last with a
// relative slack of 1e-12 for rounding (a vector made by [Jones.Stokes]
// and a few [Mueller] products passes).
func (s Stokes) Validate() error {
	for _, v := range [4]float64{s.S0, s.S1, s.S2, s.S3} {
		if !finite(v) {
			return &ParamError{Element: "Stokes", Param: "parameters", Value: s.String(), Reason: "must be finite"}
		}
	}
	if s.S0 < 0 {
		return &ParamError{Element: "Stokes", Param: "power S0", Value: s.S0, Reason: "must be non-negative"}
	}
	if p := s.polarized(); p > s.S0*(1+1e-12) {
		return &ParamError{Element: "Stokes", Param: "polarized power √(S1²+S2²+S3²)", Value: p, Reason: "must not exceed S0 = " + formatG(s.S0)}
	}
	return nil
}

// String formats s as "(S0, S1, S2, S3)" with six significant digits.
func (s Stokes) String() string {
	return "(" + formatG(s.S0) + ", " + formatG(s.S1) + ", " + formatG(s.S2) + ", " + formatG(s.S3) + ")"
}

// Ellipse is a polarization ellipse.
//
// Azimuth ψ is the angle of the major axis from x towards y, in
// (−90°, 90°]. Ellipticity χ is the ellipticity angle, tan χ = ±b/a with
// a and b the major and minor semi-axes, in [−45°, 45°]: 0 for linear
// light, +45° for right-handed and −45° for left-handed circular light,
// its sign the handedness ([Handedness]).
type Ellipse struct {
	Azimuth, Ellipticity units.Angle
}

// Mueller is a Mueller matrix: the real 4×4 matrix that takes the
// [Stokes] vector before an element to the one after it, S' = M S.
// M[i][j] is row i, column j.
type Mueller [4][4]float64

// Apply returns M s.
func (m Mueller) Apply(s Stokes) Stokes {
	in := [4]float64{s.S0, s.S1, s.S2, s.S3}
	var out [4]float64
	for i := range 4 {
		for j := range 4 {
			out[i] += m[i][j] * in[j]
		}
	}
	return Stokes{S0: out[0], S1: out[1], S2: out[2], S3: out[3]}
}

// Then returns the Mueller matrix of m followed by next, in beam order:
// next·m, so that m.Then(next).Apply(s) == next.Apply(m.Apply(s)).
func (m Mueller) Then(next Mueller) Mueller {
	var out Mueller
	for i := range 4 {
		for j := range 4 {
			for k := range 4 {
				out[i][j] += next[i][k] * m[k][j]
			}
		}
	}
	return out
}

// pauli holds σ0 … σ3 in the order of the Stokes parameters, so that
// S_i = vᴴ σ_i v for a Jones vector v (σ3 = [[0, −i], [i, 0]] gives
// S3 = 2 Im(X* Y)).
var pauli = [4]JonesMatrix{
	{XX: 1, YY: 1},
	{XX: 1, YY: -1},
	{XY: 1, YX: 1},
	{XY: -1i, YX: 1i},
}

// Mueller returns the Mueller matrix of the non-depolarizing element m,
//
//	M = A (J ⊗ J*) A⁻¹,   A = ⎡1  0   0  1⎤
//	                          ⎢1  0   0 −1⎥
//	                          ⎢0  1   1  0⎥
//	                          ⎣0  i  −i  0⎦
//
// (R. M. A. Azzam & N. M. Bashara, Ellipsometry and Polarized Light, 1977,
// §2.11 [from memory], with the sign of the last row set by S3 = 2 Im(X* Y)),
// computed in the equivalent form
//
//	M_ij = ½ Re tr(σ_i J σ_j Jᴴ)
//
// with the Pauli matrices σ of the Stokes parameters, so that
// M·(v.Stokes()) = (J v).Stokes() for every Jones vector v, and
// a.Then(b).Mueller() = a.Mueller().Then(b.Mueller()).
func (m JonesMatrix) Mueller() Mueller {
	mh := m.adjoint()
	var out Mueller
	for j := range 4 {
		p := mh.Then(pauli[j]).Then(m) // J σ_j Jᴴ (Then multiplies on the left)
		for i := range 4 {
			out[i][j] = 0.5 * real(trace(pauli[i], p))
		}
	}
	return out
}

// adjoint returns the conjugate transpose of m.
func (m JonesMatrix) adjoint() JonesMatrix {
	return JonesMatrix{XX: conj(m.XX), XY: conj(m.YX), YX: conj(m.XY), YY: conj(m.YY)}
}

// trace returns tr(a·b).
func trace(a, b JonesMatrix) complex128 {
	return a.XX*b.XX + a.XY*b.YX + a.YX*b.XY + a.YY*b.YY
}

func conj(z complex128) complex128 { return complex(real(z), -imag(z)) }

func formatG(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
