package polar

import (
	"math"
	"math/cmplx"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Jones is a Jones vector: the complex amplitudes of the x and y
// components of a fully polarized beam, in the beam frame and with the
// time convention of the package documentation (the field at the plane is
// Re[(X x̂ + Y ŷ) e^{iωt}]).
//
// Amplitudes are power amplitudes: the power of the beam is
//
//	P = |X|² + |Y|²
//
// in whatever unit the caller normalised the vector to (watts when
// |X|² + |Y|² is the power in W). Every element of the package keeps this
// normalisation, so the power after a chain is read off the output vector.
//
// The zero value is a beam without light.
type Jones struct {
	X, Y complex128
}

// Power returns |X|² + |Y|², the power of the beam in the caller's unit
// (see [Jones]). It is the Stokes parameter S0.
func (v Jones) Power() float64 {
	return float64(real(v.X)*real(v.X)) + float64(imag(v.X)*imag(v.X)) +
		float64(real(v.Y)*real(v.Y)) + float64(imag(v.Y)*imag(v.Y))
}

// Stokes returns the Stokes parameters of v, in the power unit of v:
//
//	S0 = |X|² + |Y|²
//	S1 = |X|² − |Y|²
//	S2 = 2 Re(X* Y)
//	S3 = 2 Im(X* Y)
//
// With the package's conventions S1 > 0 is light polarized along x,
// S2 > 0 along +45°, and S3 > 0 right-handed light (see the package
// documentation; E. Collett, Field Guide to Polarization, SPIE 2005, the
// Stokes-parameter definitions [from memory]). For a Jones vector,
// S0² = S1² + S2² + S3² up to rounding.
func (v Jones) Stokes() Stokes {
	xx := float64(real(v.X)*real(v.X)) + float64(imag(v.X)*imag(v.X))
	yy := float64(real(v.Y)*real(v.Y)) + float64(imag(v.Y)*imag(v.Y))
	c := cmplx.Conj(v.X) * v.Y
	return Stokes{S0: xx + yy, S1: xx - yy, S2: 2 * real(c), S3: 2 * imag(c)}
}

// Ellipse returns the polarization ellipse of v: its azimuth ψ and
// ellipticity angle χ (see [Ellipse]). The zero vector returns the zero
// Ellipse.
func (v Jones) Ellipse() Ellipse { return v.Stokes().Ellipse() }

// String formats v as "(X, Y)" with each component in the form
// strconv.FormatComplex gives with six significant digits, for example
// "((0.707107+0i), (0+0.707107i))".
func (v Jones) String() string {
	return "(" + strconv.FormatComplex(v.X, 'g', 6, 128) + ", " + strconv.FormatComplex(v.Y, 'g', 6, 128) + ")"
}

// Handedness is the sense of rotation of the field of elliptical or
// circular light. The package names it as M. Born & E. Wolf (Principles of
// Optics, §1.4.2 [from memory]) and D. H. Goldstein, Polarized Light, 3rd ed., 2011
// [from memory] do: light is right-handed when, to an observer looking
// into the oncoming beam (towards the source), the field vector turns
// clockwise. Right-handed light has S3 > 0 and the Jones vector (1, i)/√2
// with the package's time convention e^{iωt}, as in E. Collett, Field
// Guide to Polarization, SPIE 2005 [from memory]. (The IEEE antenna
// convention names the same light left-handed.)
type Handedness int

// The two senses of rotation.
const (
	// Right: clockwise as seen facing the source; S3 > 0; (1, i)/√2.
	Right Handedness = iota + 1
	// Left: anticlockwise as seen facing the source; S3 < 0; (1, −i)/√2.
	Left
)

// String returns "right" or "left", or "Handedness(n)" for another value.
func (h Handedness) String() string {
	switch h {
	case Right:
		return "right"
	case Left:
		return "left"
	}
	return "Handedness(" + strconv.Itoa(int(h)) + ")"
}

// Linear returns the Jones vector of linearly polarized light of the given
// power (in the caller's unit, see [Jones]) at the azimuth ψ measured from
// x towards y:
//
//	(X, Y) = √P (cos ψ, sin ψ)
//
// It returns a [*ParamError] for a non-finite azimuth or a power that is
// negative or not finite.
func Linear(azimuth units.Angle, power float64) (Jones, error) {
	return Elliptical(azimuth, 0, power)
}

// Circular returns the Jones vector of circularly polarized light of the
// given handedness and power (in the caller's unit):
//
//	Right: √P (1, i)/√2,   Left: √P (1, −i)/√2
//
// (see [Handedness] for the convention). It returns a [*ParamError] for
// another Handedness value or a bad power.
func Circular(h Handedness, power float64) (Jones, error) {
	switch h {
	case Right:
		return Elliptical(0, 45*units.Degree, power)
	case Left:
		return Elliptical(0, -45*units.Degree, power)
	}
	return Jones{}, &ParamError{Element: "Circular", Param: "handedness", Value: int(h), Reason: "must be Right or Left"}
}

// Elliptical returns the Jones vector of elliptically polarized light with
// azimuth ψ (the major axis, from x towards y), ellipticity angle χ
// (tan χ = ±b/a, the ratio of the minor to the major semi-axis, positive
// for right-handed light, |χ| ≤ 45°) and power P in the caller's unit:
//
//	(X, Y) = √P R(ψ) (cos χ, i sin χ),   R(ψ) = ⎡cos ψ  −sin ψ⎤
//	                                            ⎣sin ψ   cos ψ⎦
//
// whose Stokes parameters are P(1, cos 2χ cos 2ψ, cos 2χ sin 2ψ, sin 2χ)
// (E. Collett, Field Guide to Polarization, SPIE 2005 [from memory]). An
// ellipticity beyond ±45° describes the same family of ellipses with the
// axes exchanged; it is accepted as it is. It returns a [*ParamError] for
// non-finite angles or a power that is negative or not finite.
func Elliptical(azimuth, ellipticity units.Angle, power float64) (Jones, error) {
	if err := checkAngle("Elliptical", "azimuth ψ", azimuth); err != nil {
		return Jones{}, err
	}
	if err := checkAngle("Elliptical", "ellipticity angle χ", ellipticity); err != nil {
		return Jones{}, err
	}
	if !finite(power) || power < 0 {
		return Jones{}, &ParamError{Element: "Elliptical", Param: "power P", Value: power, Reason: "must be non-negative and finite (in the caller's power unit)"}
	}
	a := math.Sqrt(power)
	sp, cp := math.Sincos(float64(azimuth))
	sc, cc := math.Sincos(float64(ellipticity))
	return Jones{
		X: complex(a*cp*cc, -a*sp*sc+0), // +0: no "-0i" in printed states
		Y: complex(a*sp*cc, a*cp*sc),
	}, nil
}

// JonesMatrix is the 2×2 complex Jones matrix of an element, acting on
// [Jones] vectors in the beam frame:
//
//	⎡X'⎤   ⎡XX  XY⎤ ⎡X⎤
//	⎣Y'⎦ = ⎣YX  YY⎦ ⎣Y⎦
//
// The elements of the package are power-normalised (see [Jones]): a
// lossless element is unitary, a lossy one has singular values ≤ 1.
type JonesMatrix struct {
	XX, XY, YX, YY complex128
}

// Identity returns the identity Jones matrix, the matrix of an empty
// chain (free propagation in an isotropic medium, with its common phase
// left out).
func Identity() JonesMatrix { return JonesMatrix{XX: 1, YY: 1} }

// Apply returns the vector v after the element m: m·v.
func (m JonesMatrix) Apply(v Jones) Jones {
	return Jones{X: m.XX*v.X + m.XY*v.Y, Y: m.YX*v.X + m.YY*v.Y}
}

// Then returns the matrix of m followed by next, in beam order: the first
// element light meets is applied first, so the product is next·m and
//
//	m.Then(next).Apply(v) == next.Apply(m.Apply(v))
//
// A chain a.Then(b).Then(c) reads in the order light meets the elements,
// as paraxial.Matrix.Then does for ray matrices.
func (m JonesMatrix) Then(next JonesMatrix) JonesMatrix {
	return JonesMatrix{
		XX: next.XX*m.XX + next.XY*m.YX,
		XY: next.XX*m.XY + next.XY*m.YY,
		YX: next.YX*m.XX + next.YY*m.YX,
		YY: next.YX*m.XY + next.YY*m.YY,
	}
}

// Rotated returns the matrix of the element m turned by the angle θ about
// the beam axis (from x towards y), for an element whose output frame is
// its input frame (a transmissive element):
//
//	J(θ) = R(−θ) J R(θ),   R(θ) = ⎡ cos θ  sin θ⎤
//	                              ⎣−sin θ  cos θ⎦
//
// where R(θ) takes components from the beam frame into the frame of the
// element (E. Collett, Field Guide to Polarization, SPIE 2005, rotated
// elements [from memory]). For a reflecting element the output frame
// turns the other way; build such a matrix with Rotated on the input side
// only.
func (m JonesMatrix) Rotated(theta units.Angle) JonesMatrix {
	s, c := math.Sincos(float64(theta))
	toElem := JonesMatrix{XX: complex(c, 0), XY: complex(s, 0), YX: complex(-s, 0), YY: complex(c, 0)}
	fromElem := JonesMatrix{XX: complex(c, 0), XY: complex(-s, 0), YX: complex(s, 0), YY: complex(c, 0)}
	return toElem.Then(m).Then(fromElem)
}

// Reverse returns the matrix of the reciprocal element m traversed
// backwards, in the return frame of the package documentation (x reversed,
// y kept, z reversed, so that the frame stays right-handed):
//
//	J_back = Q Jᵀ Q,   Q = diag(1, −1)
//
// A polarizer or waveplate at θ appears at −θ, an optically active
// rotator keeps its matrix (the rotation undoes itself on the way back).
// The rule holds for reciprocal media only (polarizers, waveplates,
// optical activity, Fresnel interfaces); a Faraday rotator is not
// reciprocal, and its return matrix is [FaradayRotator] with [Backward].
// (Reciprocity of Jones matrices: R. J. Potton, "Reciprocity in optics",
// Rep. Prog. Phys. 67, 717–754 (2004) [from memory].)
func (m JonesMatrix) Reverse() JonesMatrix {
	return JonesMatrix{XX: m.XX, XY: -m.YX, YX: -m.XY, YY: m.YY}
}
