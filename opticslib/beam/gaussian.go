package beam

import (
	"errors"
	"math"
	"math/cmplx"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
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
// with the value printed in its unit.
type ParamError struct {
	// Param names the parameter, for example "waist radius w0".
	Param string
	// Value is the offending value in SI units: a units.Length, a
	// units.Angle, a float64 or an int; nil when there is none.
	Value any
	// Reason states the requirement that Value fails, or is empty.
	Reason string
	// Err is a wrapped sentinel ([ErrNotPhysical], [ErrIndexMismatch],
	// [ErrMismatchedPlanes], [ErrNotParaxial], a paraxial sentinel) or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("beam", "", e.Param, e.Value, e.Reason, e.Err)
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
// Construct values with [FromWaist], [FromProfile] or [FromQ] and
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
		return &ParamError{Param: "wavelength λ0", Value: lambda0, Reason: "must be positive and finite"}
	}
	if !finite(n) || n <= 0 {
		return &ParamError{Param: "index n", Value: n, Reason: "must be positive and finite"}
	}
	return nil
}

// ErrNotParaxial is returned (wrapped in a [*ParamError]) by the
// constructors for a beam whose far-field half-angle exceeds
// [MaxDivergence].
var ErrNotParaxial = errors.New("outside the paraxial range of the Gaussian-beam model")

// MaxDivergence is the largest far-field half-angle θ = M²λ0/(n π w0) the
// constructors accept: 0.5 rad (29°), a waist radius below about 0.64
// λ0/n. The Gaussian beam solves the paraxial wave equation; the
// corrections to it grow as (θ/2)² (the expansion parameter 1/(k w0) = θ/2
// of M. Lax, W. H. Louisell & W. B. McKnight, "From Maxwell to paraxial
// wave optics", Phys. Rev. A 11, 1365–1370 (1975)), about 6 % at 0.5 rad.
// The threshold itself is a choice, common practice with no single
// source; beams this fast need a vector or exact-ray treatment. Its main
// job is to catch a waist radius and a wavelength given in each other's
// place (w0 = 488 nm, λ0 = 0.42 mm gives θ ≈ 274 rad).
const MaxDivergence units.Angle = 0.5

// checkParaxial returns an error if g's half-divergence exceeds
// MaxDivergence; what names the radius the user gave.
func checkParaxial(g Gaussian, w units.Length, what string) error {
	th := g.HalfDivergence()
	if th <= MaxDivergence {
		return nil
	}
	reason := "far-field half-angle M²λ0/(n π w0) = " + th.String() + " exceeds " + MaxDivergence.String()
	if g.Wavelength > w {
		reason += "; the wavelength " + g.Wavelength.String() + " is larger than the " + what + " " + w.String() + ": are the two swapped?"
	}
	return &ParamError{Param: what, Value: w, Reason: reason, Err: ErrNotParaxial}
}

// WaistSpec describes a beam by its waist, as a laser data sheet or a
// beam-profile fit gives it. Each field says what it is, so that a medium
// index cannot be read as M² or a diameter as a radius.
type WaistSpec struct {
	// Wavelength is the vacuum wavelength λ0 in metres (required).
	Wavelength units.Length
	// WaistRadius is the 1/e² intensity radius w0 of the waist in metres;
	// give it or WaistDiameter (2w0, as many data sheets quote it), not
	// both.
	WaistRadius, WaistDiameter units.Length
	// WaistZ is the position of the waist in metres relative to the plane
	// where the beam is given (the input plane z = 0 of a system):
	// positive when the waist lies after the plane (a converging beam),
	// negative when it lies before (a diverging beam), zero when the
	// plane is the waist.
	WaistZ units.Length
	// M2 is the beam propagation ratio M² ≥ 1 (ISO 11146-1); 0 means 1.
	M2 float64
	// Index is the refractive index of the medium at the plane; 0 means 1
	// (air or vacuum to paraxial accuracy).
	Index float64
}

// FromWaist returns the beam at the plane where s gives it:
//
//	q = −WaistZ + i zR,   zR = π w0² n/(M² λ0)
//
// (H. Kogelnik & T. Li, "Laser beams and resonators", Appl. Opt. 5,
// 1550–1567 (1966); the M² factor per Siegman 1990, see [Gaussian]). For
// example, a 0.42 mm waist at the exit window of a 488 nm laser with
// M² = 1.1:
//
//	g, err := beam.FromWaist(beam.WaistSpec{Wavelength: 488 * units.Nanometer, WaistRadius: 0.42 * units.Millimeter, M2: 1.1})
//
// It returns a [*ParamError] for a missing, non-positive or non-finite
// value, for both or neither of WaistRadius and WaistDiameter, and one
// wrapping [ErrNotParaxial] above [MaxDivergence].
func FromWaist(s WaistSpec) (Gaussian, error) {
	w0, what, err := radiusOrDiameter(s.WaistRadius, s.WaistDiameter, "waist radius w0", "waist diameter 2w0")
	if err != nil {
		return Gaussian{}, err
	}
	if !finite(float64(s.WaistZ)) {
		return Gaussian{}, &ParamError{Param: "waist position WaistZ", Value: s.WaistZ, Reason: "must be finite"}
	}
	n, m2, err := mediumAndM2(s.Wavelength, s.Index, s.M2)
	if err != nil {
		return Gaussian{}, err
	}
	w := float64(w0)
	zR := math.Pi * float64(w*w) * n / (m2 * float64(s.Wavelength))
	return validated(Gaussian{Q: complex(-float64(s.WaistZ), zR), Wavelength: s.Wavelength, Index: n, M2: s.M2},
		given(s.WaistRadius, s.WaistDiameter), what)
}

// FromWaists returns an elliptical beam (x and y waists at the same
// WaistZ) or a simple-astigmatic one (different WaistZ) from one spec per
// plane: x is the tangential plane, y the sagittal plane. Both must give
// the same wavelength and index.
func FromWaists(x, y WaistSpec) (Astigmatic, error) {
	gx, err := FromWaist(x)
	if err != nil {
		return Astigmatic{}, planeError(paraxial.Tangential, err)
	}
	gy, err := FromWaist(y)
	if err != nil {
		return Astigmatic{}, planeError(paraxial.Sagittal, err)
	}
	a := Astigmatic{X: gx, Y: gy}
	return a, a.Validate()
}

// ProfileSpec describes a beam by what is measured at one plane: the beam
// radius (a profiler) and the wavefront radius of curvature (a wavefront
// sensor or shear plate).
type ProfileSpec struct {
	// Wavelength is the vacuum wavelength λ0 in metres (required).
	Wavelength units.Length
	// Radius is the 1/e² intensity radius w at the plane in metres; give
	// it or Diameter, not both.
	Radius, Diameter units.Length
	// WavefrontRadius is the radius of curvature R of the wavefront in
	// metres: R > 0 for a diverging beam (waist behind the plane), R < 0
	// for a converging one, ±Inf ([paraxial.Flat]) for a flat wavefront.
	WavefrontRadius units.Length
	// M2 is the beam propagation ratio M² ≥ 1; 0 means 1.
	M2 float64
	// Index is the refractive index of the medium; 0 means 1.
	Index float64
}

// FromProfile returns the beam with the measured radius and wavefront
// radius of curvature of s at the plane:
//
//	1/q = 1/R − i M²λ0/(n π w²)
//
// (Kogelnik & Li 1966, with the embedded-Gaussian M² of [Gaussian]). It
// returns a [*ParamError] unless the radius (or diameter), wavelength and
// index are positive and finite and R is nonzero and not NaN, and one
// wrapping [ErrNotParaxial] above [MaxDivergence].
func FromProfile(s ProfileSpec) (Gaussian, error) {
	w, what, err := radiusOrDiameter(s.Radius, s.Diameter, "beam radius w", "beam diameter 2w")
	if err != nil {
		return Gaussian{}, err
	}
	r := s.WavefrontRadius
	if math.IsNaN(float64(r)) || r == 0 {
		return Gaussian{}, &ParamError{Param: "wavefront radius R", Value: r, Reason: "must be nonzero (±Inf, paraxial.Flat, for a flat wavefront)"}
	}
	n, m2, err := mediumAndM2(s.Wavelength, s.Index, s.M2)
	if err != nil {
		return Gaussian{}, err
	}
	lambda := m2 * float64(s.Wavelength) / n
	inv := complex(1/float64(r), -lambda/(math.Pi*float64(w*w)))
	return validated(Gaussian{Q: 1 / inv, Wavelength: s.Wavelength, Index: n, M2: s.M2}, given(s.Radius, s.Diameter), what)
}

// validated returns g if it is a valid beam inside the paraxial range, and
// the zero Gaussian with the error otherwise; w is the radius or diameter
// the user gave, named what.
func validated(g Gaussian, w units.Length, what string) (Gaussian, error) {
	if err := g.Validate(); err != nil {
		return Gaussian{}, err
	}
	if err := checkParaxial(g, w, what); err != nil {
		return Gaussian{}, err
	}
	return g, nil
}

// radiusOrDiameter returns the radius from exactly one of r and d.
func radiusOrDiameter(r, d units.Length, rname, dname string) (units.Length, string, error) {
	switch {
	case r != 0 && d != 0:
		return 0, "", &ParamError{Param: rname, Value: r, Reason: "give the " + rname + " or the " + dname + " (" + d.String() + "), not both"}
	case d != 0:
		if !finite(float64(d)) || d <= 0 {
			return 0, "", &ParamError{Param: dname, Value: d, Reason: "must be positive and finite"}
		}
		return d / 2, dname, nil
	case !finite(float64(r)) || r <= 0:
		return 0, "", &ParamError{Param: rname, Value: r, Reason: "must be positive and finite (or give the " + dname + ")"}
	}
	return r, rname, nil
}

func given(r, d units.Length) units.Length {
	if d != 0 {
		return d
	}
	return r
}

// mediumAndM2 validates the wavelength and returns the index and M² with
// their defaults (0 means 1).
func mediumAndM2(lambda0 units.Length, n, m2 float64) (float64, float64, error) {
	if n == 0 {
		n = 1
	}
	if err := checkLight(lambda0, n); err != nil {
		return 0, 0, err
	}
	if m2 == 0 {
		m2 = 1
	}
	if !finite(m2) || !(m2 >= 1) {
		return 0, 0, &ParamError{Param: "M²", Value: m2, Reason: "must be at least 1 and finite (0 means 1)"}
	}
	return n, m2, nil
}

// WithM2 returns the embedded-Gaussian beam with propagation ratio m2 ≥ 1
// that keeps the waist radius W0 and the waist position of g fixed (the
// way laser data sheets specify a beam: waist diameter, waist location and
// M²), and so changes the Rayleigh range and the divergence. Its Rayleigh
// range is
//
//	zR = π W0² n/(m2 λ0)
//
// and its divergence m2·λ0/(n π W0) (Siegman 1990 [from memory]). At a
// plane away from the waist the radius therefore differs from g's. It
// returns a [*ParamError] if m2 < 1 or m2 is not finite, if g is not a
// valid beam, and one wrapping [ErrNotParaxial] if the divergence exceeds
// [MaxDivergence].
func (g Gaussian) WithM2(m2 float64) (Gaussian, error) {
	if err := g.Validate(); err != nil {
		return Gaussian{}, err
	}
	if !finite(m2) || !(m2 >= 1) {
		return Gaussian{}, &ParamError{Param: "M²", Value: m2, Reason: "must be at least 1 and finite"}
	}
	w0 := g.WaistRadius()
	zR := math.Pi * float64(w0*w0) * g.Index / (m2 * float64(g.Wavelength))
	return validated(Gaussian{Q: complex(real(g.Q), zR), Wavelength: g.Wavelength, Index: g.Index, M2: m2}, w0, "waist radius w0")
}

// BeamQuality returns the propagation ratio M² of g: g.M2, or 1 when M2 is
// zero.
func (g Gaussian) BeamQuality() float64 {
	if g.M2 == 0 {
		return 1
	}
	return g.M2
}

// FromQ returns the TEM₀₀ beam with complex parameter q (metres) at vacuum
// wavelength wavelength (metres) in a medium of refractive index index.
// It is for q values computed elsewhere; beams from data sheets and
// measurements are entered with [FromWaist] and [FromProfile]. It returns a
// [*ParamError] unless q is finite with Im q > 0 and the wavelength and
// index are positive and finite, and one wrapping [ErrNotParaxial] beyond
// [MaxDivergence]. Every constructor returns the zero Gaussian with an
// error.
func FromQ(q complex128, wavelength units.Length, index float64) (Gaussian, error) {
	g := Gaussian{Q: q, Wavelength: wavelength, Index: index}
	if err := g.Validate(); err != nil {
		return Gaussian{}, err
	}
	return validated(g, g.WaistRadius(), "waist radius w0 (from q)")
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
		return &ParamError{Param: "Im q", Value: units.Length(imag(g.Q)), Err: ErrNotPhysical}
	}
	// The derived quantities must be finite as well (no overflow in |q|).
	if w := g.Radius(); !finite(float64(w)) || w <= 0 {
		return &ParamError{Param: "beam radius w", Value: w, Err: ErrNotPhysical}
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

// WavefrontRadius returns the radius of curvature R of the wavefront at the
// plane, in metres:
//
//	R = |q|²/Re q = z (1 + (zR/z)²)
//
// R > 0 past the waist (diverging beam), R < 0 before it (converging).
// Special case: R = +Inf exactly at the waist (Re q = 0, flat wavefront).
func (g Gaussian) WavefrontRadius() units.Length {
	z := real(g.Q)
	if z == 0 {
		return units.Length(math.Inf(1))
	}
	zR := imag(g.Q)
	return units.Length(z + float64(zR*zR)/z)
}

// WavefrontCurvature returns the curvature 1/R of the wavefront in 1/m,
// which is 0 at a waist and finite everywhere: 1/R = Re(1/q) = z/(z² + zR²).
func (g Gaussian) WavefrontCurvature() float64 {
	z, zR := real(g.Q), imag(g.Q)
	return z / (float64(z*z) + float64(zR*zR))
}

// RayleighRange returns zR = Im q = π w0² n/(M² λ0) in metres: the
// distance from the waist at which the radius has grown to √2·w0.
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

// HalfDivergence returns the far-field half-angle of the beam in its
// medium, measured from the axis to the 1/e² edge,
//
//	θ = λ/(π w0) = M² λ0/(n π w0)
//
// in radians (Kogelnik & Li 1966; Siegman, Lasers, ch. 17 [from memory];
// the M² factor per Siegman 1990 [from memory]). ISO 11146-1 quotes the
// full angle; see [Gaussian.FullDivergence].
func (g Gaussian) HalfDivergence() units.Angle {
	return units.Angle(g.lambda() / (math.Pi * float64(g.WaistRadius())))
}

// FullDivergence returns the full far-field divergence angle Θ = 2θ in
// radians, edge to edge of the 1/e² (second-moment, for a Gaussian)
// diameter, the quantity ISO 11146-1 calls the divergence angle.
func (g Gaussian) FullDivergence() units.Angle { return 2 * g.HalfDivergence() }

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
