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
	// Param names the parameter, for example "waist radius w0".
	Param string
	// Value is the offending value, in SI units (metres for lengths).
	Value float64
	// Length is true when Value is a length (printed with units.Length).
	Length bool
	// Reason states the requirement that Value fails, or is empty.
	Reason string
	// Err is a wrapped sentinel ([ErrNotPhysical], [ErrIndexMismatch],
	// [ErrMismatchedPlanes], paraxial.ErrNonFinite) or nil.
	Err error
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

// Gaussian is a Gaussian beam at one plane, in one transverse direction or
// (for a round beam) both.
//
// Q is the complex beam parameter in metres, q = z + i zR (see the package
// documentation for the convention). Wavelength is the vacuum wavelength λ0
// in metres and Index the refractive index of the medium at the plane.
//
// M2 is the beam propagation ratio M² ≥ 1 of an embedded-Gaussian beam
// (A. E. Siegman, "New developments in laser resonators", Proc. SPIE 1224,
// 2–14 (1990) [from memory]; ISO 11146-1 for the name). Q is then the
// parameter of the embedded TEM₀₀ beam, which obeys the ABCD law unchanged,
// and the real beam is M = √M² times wider at every plane:
//
//	W = M·w_embedded,   zR = π W0² n/(M² λ0)
//
// that is, a TEM₀₀ formula with the effective wavelength M²λ0. The zero
// value of M2 means 1, a pure TEM₀₀ beam, so a literal Gaussian{Q, λ0, n}
// is a TEM₀₀ beam.
//
// Construct values with [FromWaist], [FromRadius] or [FromQ] and
// [Gaussian.WithM2], which validate them.
type Gaussian struct {
	Q          complex128
	Wavelength units.Length
	Index      float64
	M2         float64
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

// FromRadius returns the TEM₀₀ beam that has 1/e² intensity radius w
// (metres) and wavefront radius of curvature r (metres; r > 0 for a
// diverging beam, r < 0 for a converging one, ±Inf for a flat wavefront) at
// the plane, in a medium of index n at vacuum wavelength λ0 (metres):
//
//	1/q = 1/r − i λ/(π w²),   λ = λ0/n
//
// (Kogelnik & Li 1966). This is how a beam measured with a profiler and a
// wavefront sensor (or a shear plate) at one plane is entered. For a beam
// with M² > 1 measured this way, the effective wavelength M²λ0 replaces λ
// above, since q depends on λ0 and M² only through M²λ0:
//
//	g, err := beam.FromRadius(w, r, m2*lambda0, n)
//	g.Wavelength, g.M2 = lambda0, m2
//
// A beam known by its waist is entered with [FromWaist] and
// [Gaussian.WithM2] instead.
//
// It returns a [*ParamError] unless w, λ0 and n are positive and finite
// and r is nonzero and not NaN.
func FromRadius(w, r, lambda0 units.Length, n float64) (Gaussian, error) {
	if !finite(float64(w)) || w <= 0 {
		return Gaussian{}, &ParamError{Param: "beam radius w", Value: float64(w), Length: true, Reason: "must be positive and finite"}
	}
	if math.IsNaN(float64(r)) || r == 0 {
		return Gaussian{}, &ParamError{Param: "radius of curvature R", Value: float64(r), Length: true, Reason: "must be nonzero (±Inf for a flat wavefront)"}
	}
	if err := checkLight(lambda0, n); err != nil {
		return Gaussian{}, err
	}
	lambda := float64(lambda0) / n
	inv := complex(1/float64(r), -lambda/(math.Pi*float64(w*w)))
	g := Gaussian{Q: 1 / inv, Wavelength: lambda0, Index: n}
	return g, g.Validate()
}

// WithM2 returns the embedded-Gaussian beam with propagation ratio m2 ≥ 1
// that has the same waist radius W0 and the same waist position as g (the
// way laser data sheets specify a beam: waist diameter, waist location and
// M²). Its Rayleigh range is
//
//	zR = π W0² n/(m2 λ0)
//
// and its divergence m2·λ0/(n π W0) (Siegman 1990 [from memory]). At a
// plane away from the waist the radius therefore differs from g's. It
// returns a [*ParamError] if m2 < 1 or m2 is not finite, or if g is not a
// valid beam.
func (g Gaussian) WithM2(m2 float64) (Gaussian, error) {
	if err := g.Validate(); err != nil {
		return Gaussian{}, err
	}
	if !finite(m2) || !(m2 >= 1) {
		return Gaussian{}, &ParamError{Param: "M²", Value: m2, Reason: "must be at least 1 and finite"}
	}
	w0 := float64(g.WaistRadius())
	zR := math.Pi * float64(w0*w0) * g.Index / (m2 * float64(g.Wavelength))
	h := Gaussian{Q: complex(real(g.Q), zR), Wavelength: g.Wavelength, Index: g.Index, M2: m2}
	return h, h.Validate()
}

// BeamQuality returns the propagation ratio M² of g: g.M2, or 1 when M2 is
// zero.
func (g Gaussian) BeamQuality() float64 {
	if g.M2 == 0 {
		return 1
	}
	return g.M2
}

// FromQ returns the beam with parameter q (metres) in a medium of index n
// at vacuum wavelength λ0 (metres). It returns a [*ParamError] unless q is
// finite with Im q > 0 and λ0 and n are positive and finite.
func FromQ(q complex128, lambda0 units.Length, n float64) (Gaussian, error) {
	g := Gaussian{Q: q, Wavelength: lambda0, Index: n}
	return g, g.Validate()
}

// Validate returns nil if g is a physical beam: finite Q with Im Q > 0,
// positive finite wavelength and index, and M2 zero (meaning 1) or a finite
// number ≥ 1. Otherwise it returns a [*ParamError].
func (g Gaussian) Validate() error {
	if err := checkLight(g.Wavelength, g.Index); err != nil {
		return err
	}
	if g.M2 != 0 && (!finite(g.M2) || !(g.M2 >= 1)) {
		return &ParamError{Param: "M²", Value: g.M2, Reason: "must be at least 1 and finite (0 means 1)"}
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

// lambda returns the effective wavelength in the medium, M²λ0/n.
func (g Gaussian) lambda() float64 { return g.BeamQuality() * float64(g.Wavelength) / g.Index }

// Radius returns the 1/e² intensity radius w at the plane, in metres:
//
//	w = |q| √(λ/(π zR)),   equivalently   w = w0 √(1 + (z/zR)²)
//
// with λ = M²λ0/n (Kogelnik & Li 1966; the M² factor as in [Gaussian]).
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
//	w0 = √(λ zR/π),  λ = M²λ0/n
func (g Gaussian) WaistRadius() units.Length {
	return units.Length(math.Sqrt(g.lambda() * imag(g.Q) / math.Pi))
}

// WaistOffset returns the signed distance from the plane to the waist,
// −Re q, in metres: positive when the waist lies ahead (the beam is
// converging), negative when it lies behind.
func (g Gaussian) WaistOffset() units.Length { return units.Length(-real(g.Q)) }

// Divergence returns the far-field half-angle of the beam in its medium,
//
//	θ = λ/(π w0) = M² λ0/(n π w0)
//
// in radians (Kogelnik & Li 1966; Siegman, Lasers, ch. 17 [from memory];
// the M² factor per Siegman 1990 [from memory]).
func (g Gaussian) Divergence() units.Angle {
	return units.Angle(g.lambda() / (math.Pi * float64(g.WaistRadius())))
}

// GouyPhase returns the on-axis Gouy phase relative to the waist,
//
//	ψ = arctan(z/zR),  z = Re q
//
// in radians; it is negative before the waist and tends to ±π/2 far from
// it. For M² > 1 it is the Gouy phase of the embedded TEM₀₀ beam.
func (g Gaussian) GouyPhase() units.Angle {
	return units.Angle(math.Atan(real(g.Q) / imag(g.Q)))
}

// Transform returns the beam after the un-reduced ray-transfer matrix m,
// in an output medium of index nOut, by the ABCD law
//
//	q2 = (A q1 + B)/(C q1 + D)
//
// (Kogelnik & Li 1966; see the package documentation for how the index
// enters). The wavelength and M² are unchanged. nOut must equal the output index of
// the optics that m describes, n_in/det m; Transform does not check this.
//
// Transform is pure arithmetic: if m has det ≤ 0, or C = D = 0, the result
// is not a physical beam; call [Gaussian.Validate] when m is not from a
// validated [paraxial.System].
func (g Gaussian) Transform(m paraxial.Matrix, nOut float64) Gaussian {
	x, y := real(g.Q), imag(g.Q)
	num := complex(float64(m.A*x)+m.B, m.A*y)
	den := complex(float64(m.C*x)+m.D, m.C*y)
	return Gaussian{Q: num / den, Wavelength: g.Wavelength, Index: nOut, M2: g.M2}
}

// GouyShift returns the Gouy phase accumulated on axis while the beam
// passes through the un-reduced matrix m,
//
//	Δψ = −arg(A + B/q1)
//
// in radians, in [−π, π]. This is the phase of the 2-D (round-beam)
// amplitude factor 1/(A + B/q1); a 1-D (one transverse direction) factor
// carries half of it, so the fundamental mode of a simple-astigmatic beam
// advances by (Δψx + Δψy)/2. In free space it equals arctan(z2/zR) −
// arctan(z1/zR); a thin lens or interface adds zero. The result is reduced
// to [−π, π]; for systems with several foci, accumulate it element by
// element (as [Sample] does).
func (g Gaussian) GouyShift(m paraxial.Matrix) units.Angle {
	return units.Angle(-cmplx.Phase(complex(m.A, 0) + complex(m.B, 0)/g.Q))
}
