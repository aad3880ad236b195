package beam

import (
	"errors"
	"math"
	"math/cmplx"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNotPhysical is returned (wrapped in a [*ParamError]) for a beam whose
// q parameter has Im q ≤ 0 or is not finite.
var ErrNotPhysical = errors.New("not a physical beam (need finite q with Im q > 0)")

// ParamError reports an invalid beam parameter. Its message has the form
//
//	beam: waist radius w0 = -1 mm: must be positive and finite
//
// Value is in SI units (metres for lengths, printed with units.Length when
// Length is true).
type ParamError struct {
	Param  string
	Value  float64
	Length bool
	Reason string
	Err    error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	s := "beam: " + e.Param + " = "
	if e.Length {
		s += units.Length(e.Value).String()
	} else {
		s += strconv.FormatFloat(e.Value, 'g', -1, 64)
	}
	if e.Reason != "" {
		s += ": " + e.Reason
	}
	if e.Err != nil {
		s += ": " + e.Err.Error()
	}
	return s
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }

// Gaussian is a fundamental Gaussian beam at one plane.
//
// Q is the complex beam parameter in metres, q = z + i zR (see the package
// documentation for the convention). Wavelength is the vacuum wavelength λ0
// in metres and Index the refractive index of the medium at the plane.
// Construct values with [FromWaist] or [FromQ], which validate them.
type Gaussian struct {
	Q          complex128
	Wavelength units.Length
	Index      float64
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func checkLight(lambda0 units.Length, n float64) error {
	if !finite(float64(lambda0)) || lambda0 <= 0 {
		return &ParamError{Param: "wavelength λ0", Value: float64(lambda0), Length: true, Reason: "must be positive and finite"}
	}
	if !finite(n) || n <= 0 {
		return &ParamError{Param: "index n", Value: n, Reason: "must be positive and finite"}
	}
	return nil
}

// FromWaist returns the beam, in a medium of index n, at a plane located
// waistOffset before its waist: a beam with waist radius w0 (1/e² intensity
// radius, metres) at distance waistOffset (metres; > 0 when the waist lies
// ahead of the plane, < 0 when behind, as returned by
// [Gaussian.WaistOffset]). λ0 is the vacuum wavelength in metres.
//
//	q = −waistOffset + i π w0² n/λ0
//
// (Kogelnik & Li 1966.) It returns a [*ParamError] unless w0, λ0 and n are
// positive and finite and waistOffset is finite.
func FromWaist(w0, waistOffset, lambda0 units.Length, n float64) (Gaussian, error) {
	if !finite(float64(w0)) || w0 <= 0 {
		return Gaussian{}, &ParamError{Param: "waist radius w0", Value: float64(w0), Length: true, Reason: "must be positive and finite"}
	}
	if !finite(float64(waistOffset)) {
		return Gaussian{}, &ParamError{Param: "waist offset", Value: float64(waistOffset), Length: true, Reason: "must be finite"}
	}
	if err := checkLight(lambda0, n); err != nil {
		return Gaussian{}, err
	}
	w := float64(w0)
	zR := math.Pi * float64(w*w) * n / float64(lambda0)
	g := Gaussian{Q: complex(-float64(waistOffset), zR), Wavelength: lambda0, Index: n}
	return g, g.Validate()
}

// FromQ returns the beam with parameter q (metres) in a medium of index n
// at vacuum wavelength λ0 (metres). It returns a [*ParamError] unless q is
// finite with Im q > 0 and λ0 and n are positive and finite.
func FromQ(q complex128, lambda0 units.Length, n float64) (Gaussian, error) {
	g := Gaussian{Q: q, Wavelength: lambda0, Index: n}
	return g, g.Validate()
}

// Validate returns nil if g is a physical beam: finite Q with Im Q > 0 and
// positive finite wavelength and index. Otherwise it returns a
// [*ParamError].
func (g Gaussian) Validate() error {
	if err := checkLight(g.Wavelength, g.Index); err != nil {
		return err
	}
	if !finite(real(g.Q)) || !finite(imag(g.Q)) || !(imag(g.Q) > 0) {
		return &ParamError{Param: "Im q", Value: imag(g.Q), Length: true, Err: ErrNotPhysical}
	}
	// The derived quantities must be finite as well (no overflow in |q|).
	if w := g.Radius(); !finite(float64(w)) || w <= 0 {
		return &ParamError{Param: "beam radius w", Value: float64(w), Length: true, Err: ErrNotPhysical}
	}
	return nil
}

// lambda returns the wavelength in the medium, λ0/n.
func (g Gaussian) lambda() float64 { return float64(g.Wavelength) / g.Index }

// Radius returns the 1/e² intensity radius w at the plane, in metres:
//
//	w = |q| √(λ/(π zR)),   equivalently   w = w0 √(1 + (z/zR)²)
//
// with λ = λ0/n (Kogelnik & Li 1966).
func (g Gaussian) Radius() units.Length {
	return units.Length(cmplx.Abs(g.Q) * math.Sqrt(g.lambda()/(math.Pi*imag(g.Q))))
}

// Curvature returns the radius of curvature R of the wavefront at the plane,
// in metres:
//
//	R = |q|²/Re q = z (1 + (zR/z)²)
//
// R > 0 past the waist (diverging beam), R < 0 before it (converging).
// Special case: R = +Inf exactly at the waist (Re q = 0, flat wavefront).
func (g Gaussian) Curvature() units.Length {
	z := real(g.Q)
	if z == 0 {
		return units.Length(math.Inf(1))
	}
	zR := imag(g.Q)
	return units.Length(z + float64(zR*zR)/z)
}

// InverseCurvature returns 1/R in 1/m, which is 0 at a waist and finite
// everywhere: 1/R = Re(1/q) = z/(z² + zR²).
func (g Gaussian) InverseCurvature() float64 {
	z, zR := real(g.Q), imag(g.Q)
	return z / (float64(z*z) + float64(zR*zR))
}

// RayleighRange returns zR = Im q = π w0² n/λ0 in metres: the distance from
// the waist at which the radius has grown to √2·w0.
func (g Gaussian) RayleighRange() units.Length { return units.Length(imag(g.Q)) }

// WaistRadius returns the waist radius w0 in metres:
//
//	w0 = √(λ zR/π),  λ = λ0/n
func (g Gaussian) WaistRadius() units.Length {
	return units.Length(math.Sqrt(g.lambda() * imag(g.Q) / math.Pi))
}

// WaistOffset returns the signed distance from the plane to the waist,
// −Re q, in metres: positive when the waist lies ahead (the beam is
// converging), negative when it lies behind.
func (g Gaussian) WaistOffset() units.Length { return units.Length(-real(g.Q)) }

// Divergence returns the far-field half-angle of the beam in its medium,
//
//	θ = λ/(π w0) = λ0/(n π w0)
//
// in radians (Kogelnik & Li 1966; Siegman, Lasers, ch. 17 [from memory]).
func (g Gaussian) Divergence() units.Angle {
	return units.Angle(g.lambda() / (math.Pi * float64(g.WaistRadius())))
}

// GouyPhase returns the on-axis Gouy phase relative to the waist,
//
//	ψ = arctan(z/zR),  z = Re q
//
// in radians; it is negative before the waist and tends to ±π/2 far from
// it.
func (g Gaussian) GouyPhase() units.Angle {
	return units.Angle(math.Atan(real(g.Q) / imag(g.Q)))
}

// Transform returns the beam after the un-reduced ray-transfer matrix m,
// in an output medium of index nOut, by the ABCD law
//
//	q2 = (A q1 + B)/(C q1 + D)
//
// (Kogelnik & Li 1966; see the package documentation for how the index
// enters). The wavelength is unchanged. nOut must equal the output index of
// the optics that m describes, n_in/det m; Transform does not check this.
//
// Transform is pure arithmetic: if m has det ≤ 0, or C = D = 0, the result
// is not a physical beam; call [Gaussian.Validate] when m is not from a
// validated [paraxial.System].
func (g Gaussian) Transform(m paraxial.Matrix, nOut float64) Gaussian {
	x, y := real(g.Q), imag(g.Q)
	num := complex(float64(m.A*x)+m.B, m.A*y)
	den := complex(float64(m.C*x)+m.D, m.C*y)
	return Gaussian{Q: num / den, Wavelength: g.Wavelength, Index: nOut}
}

// GouyShift returns the Gouy phase accumulated on axis while the beam
// passes through the un-reduced matrix m,
//
//	Δψ = −arg(A + B/q1)
//
// in radians, in (−π, π]. In free space it equals arctan(z2/zR) −
// arctan(z1/zR); a thin lens or interface adds zero. The result is reduced
// to (−π, π]; for systems with several foci, accumulate it element by
// element (as [Sample] does).
func (g Gaussian) GouyShift(m paraxial.Matrix) units.Angle {
	return units.Angle(-cmplx.Phase(complex(m.A, 0) + complex(m.B, 0)/g.Q))
}
