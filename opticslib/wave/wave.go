package wave

import (
	"errors"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"math"
	"math/cmplx"
	"strconv"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Kernel selects the free-space transfer function of [Line.Propagate] and
// [Grid.Propagate].
type Kernel int

// Kernels; see the package documentation for the formulas.
const (
	// Paraxial is the Fresnel (paraxial) transfer function
	// exp(+i z κ²/(2k)).
	Paraxial Kernel = iota
	// Exact is the full angular-spectrum transfer function
	// exp(−i z(√(k² − κ²) − k)), with evanescent decay for κ > k.
	Exact
)

// String returns "paraxial" or "exact".
func (k Kernel) String() string {
	switch k {
	case Paraxial:
		return "paraxial"
	case Exact:
		return "exact"
	}
	return "Kernel(" + strconv.Itoa(int(k)) + ")"
}

// EdgeLimit is the largest field amplitude, relative to the peak, allowed
// in the outer sixteenth of the window on each side before [ErrWrap] is
// reported. With a Gaussian that is 3.5 w from the axis (a window of 8 w)
// the amplitude is e^−12.25 ≈ 5e-6; the 1e-4 limit is a choice based on the
// R15 reference runs (window 6.3 w gives 2.6e-5 wrap-around error), common
// practice, no single source.
const EdgeLimit = 1e-4

// ErrWrap is returned, together with the propagated field, when the field
// reaches the edge of the window (see [EdgeLimit]): energy wraps around
// the periodic window and the result is inaccurate. Use a larger window.
var ErrWrap = errors.New("wave: field reaches the window edge (wrap-around); enlarge the window")

// ErrUndersampled is returned, together with the propagated field, when
// the angular spectrum of the input reaches the Nyquist frequency 1/(2Dx):
// the largest |F[u]| in the outer sixteenth of the frequency band on each
// side exceeds [EdgeLimit] times its peak. The input is then aliased (a
// beam with strong wavefront curvature needs Dx well below w/3, since its
// local spatial frequency k·x/R grows across the beam) and the result is
// inaccurate. Use a finer spacing. It takes precedence over [ErrWrap].
var ErrUndersampled = errors.New("wave: field spectrum reaches the Nyquist frequency (aliasing); use a finer spacing Dx")

// Error reports an invalid parameter, for example
//
//	wave: spacing Dx = -1 µm: must be positive and finite
//
// or, with Err set, a sampling problem of a result that is returned with
// it (as strconv returns its best value with a *NumError), for example
//
//	wave: focal length f = -2 mm: lens phase aliases: Dx = 5 µm exceeds λ0|f|/(2n·x_max) = 3.33333 µm (field extent x_max = 300 µm): field spectrum reaches the Nyquist frequency (aliasing); use a finer spacing Dx
//
// Test for the kind with errors.Is(err, [ErrUndersampled]),
// [ErrUnresolved] or [ErrOutsideWindow].
type Error struct {
	// Param names the parameter, for example "spacing Dx".
	Param string
	// Value is the offending value in SI units: a units.Length, a float64
	// or an int.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is nil for an invalid parameter (no result is returned), or
	// the sentinel of a sampling problem when the result is returned too.
	Err error
}

// Error implements the error interface.
func (e *Error) Error() string {
	return errtext.Message("wave", "", e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *Error) Unwrap() error { return e.Err }

// MaxLineSamples is the largest sample count of a [Line] (2²⁴ samples,
// 256 MiB of complex128) and MaxGridSide the largest side of a [Grid]
// (4096² samples, 256 MiB; the FFT needs a few more rows): beyond them a
// notebook machine runs out of memory before it finishes.
const (
	MaxLineSamples = 1 << 24
	MaxGridSide    = 4096
)

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func check(n int, dx, lambda units.Length, index float64, u []complex128) error {
	if n < 2 {
		return &Error{Param: "sample count N", Value: n, Reason: "must be at least 2"}
	}
	if !finite(float64(dx)) || !(dx > 0) {
		return &Error{Param: "spacing Dx", Value: dx, Reason: "must be positive and finite"}
	}
	if !finite(float64(lambda)) || !(lambda > 0) {
		return &Error{Param: "wavelength λ0", Value: lambda, Reason: "must be positive and finite"}
	}
	if !finite(index) || !(index > 0) {
		return &Error{Param: "index n", Value: index, Reason: "must be positive and finite"}
	}
	for i, v := range u {
		if !finite(real(v)) || !finite(imag(v)) {
			return &Error{Param: "field sample " + strconv.Itoa(i), Value: v, Reason: "must be finite"}
		}
	}
	return nil
}

// Line is a 1-D sampled field u(x_i), x_i = (i − N/2)·Dx, N = len(U).
type Line struct {
	// U holds the complex field samples.
	U []complex128
	// Dx is the sample spacing in metres.
	Dx units.Length
	// Wavelength is the vacuum wavelength λ0 in metres.
	Wavelength units.Length
	// Index is the refractive index of the medium.
	Index float64
}

// X returns the position x_i = (i − N/2)·Dx of sample i, in metres.
func (l Line) X(i int) units.Length { return units.Length(float64(i-len(l.U)/2) * float64(l.Dx)) }

// Validate returns nil if l has at least 2 finite samples, a positive
// finite spacing, wavelength and index; otherwise an [*Error].
func (l Line) Validate() error { return check(len(l.U), l.Dx, l.Wavelength, l.Index, l.U) }

func checkBeam(g beam.Gaussian, plane string) error {
	if err := g.Validate(); err != nil {
		return err
	}
	if m := g.BeamQuality(); m != 1 {
		return &Error{Param: plane + "M²", Value: m, Reason: "a sampled field needs a TEM₀₀ beam (M² = 1)"}
	}
	return nil
}

// profile returns the 1-D Gaussian factor √(i zR/q)·exp(−i k x²/(2q)) of g
// at x: unit amplitude on axis at the waist, phase relative to the waist
// (Kogelnik & Li 1966). In 2-D the product of two such factors gives the
// prefactor i zR/q and the on-axis Gouy phase arctan(z/zR).
func profile(g beam.Gaussian, x float64) complex128 {
	q := g.Q
	k := 2 * math.Pi * g.Index / float64(g.Wavelength)
	return cmplx.Sqrt(complex(0, imag(q))/q) * cmplx.Exp(complex(0, -k*x*x/2)/q)
}

// LineFromBeam samples the field of the TEM₀₀ beam g at n points spaced
// dx (metres), normalised to unit amplitude on axis at the waist, with the
// phase relative to the waist:
//
//	u(x) = √(i zR/q) · exp(−i k x²/(2q)),   k = 2πn/λ0
//
// (1-D slice of the Gaussian beam of Kogelnik & Li 1966). It returns an
// error if g is invalid or has M² ≠ 1, or n or dx is invalid.
func LineFromBeam(g beam.Gaussian, n int, dx units.Length) (Line, error) {
	if n > MaxLineSamples {
		return Line{}, &Error{Param: "sample count n", Value: n, Reason: "must be at most " + strconv.Itoa(MaxLineSamples)}
	}
	if err := checkBeam(g, ""); err != nil {
		return Line{}, err
	}
	l := Line{Dx: dx, Wavelength: g.Wavelength, Index: g.Index}
	if err := check(n, dx, g.Wavelength, g.Index, nil); err != nil {
		return Line{}, err
	}
	l.U = make([]complex128, n)
	for i := range l.U {
		l.U[i] = profile(g, float64(l.X(i)))
	}
	return l, l.Validate()
}

// kappa2 returns κ² for FFT index i of an n-point transform with spacing dx.
func kappa2(t *fourier.CmplxFFT, i int, dx float64) float64 {
	k := 2 * math.Pi * t.Freq(i) / dx
	return k * k
}

// transfer returns H(κ²) for a distance z and wavenumber k.
func transfer(kern Kernel, k, z, k2 float64) complex128 {
	if kern == Exact {
		if k2 <= k*k {
			kz := math.Sqrt(k*k - k2)
			// kz − k computed without cancellation: −κ²/(kz + k).
			return cmplx.Exp(complex(0, z*k2/(kz+k)))
		}
		return complex(math.Exp(-math.Abs(z)*math.Sqrt(k2-k*k)), 0) * cmplx.Exp(complex(0, z*k))
	}
	return cmplx.Exp(complex(0, z*k2/(2*k)))
}

func checkZ(z units.Length, kern Kernel) error {
	if !finite(float64(z)) {
		return &Error{Param: "distance z", Value: z, Reason: "must be finite"}
	}
	if kern != Paraxial && kern != Exact {
		return &Error{Param: "kernel", Value: kern, Reason: "must be Paraxial or Exact"}
	}
	return nil
}

// Propagate returns the field after a distance z (metres; negative goes
// backwards) of homogeneous medium, by the angular-spectrum method with
// kernel kern: u → F⁻¹[H(κ)·F[u]] (Goodman, Introduction to Fourier
// Optics, ch. 3 [from memory]), with κ = 2π·(FFT frequency)/Dx. The
// result has the same sampling. With the exact kernel, evanescent
// components (κ > k) are damped by exp(−|z|√(κ² − k²)) for either sign of
// z, so a backward step does not amplify them.
//
// It returns an [*Error] for invalid input, and the result together with
// [ErrUndersampled] when the input spectrum reaches the Nyquist frequency
// or [ErrWrap] when the result reaches the window edge. The discrete
// propagation is exact for the periodic, band-limited field the samples
// describe, so these two checks cover its sampling errors: aliasing of
// the kernel's chirp shows up as wrap-around in the result.
func (l Line) Propagate(z units.Length, kern Kernel) (Line, error) {
	if err := l.Validate(); err != nil {
		return Line{}, err
	}
	if err := checkZ(z, kern); err != nil {
		return Line{}, err
	}
	n := len(l.U)
	t := fourier.NewCmplxFFT(n)
	spec := t.Coefficients(nil, l.U)
	aliased := nyquistAmplitude(spec, n) > EdgeLimit
	k := 2 * math.Pi * l.Index / float64(l.Wavelength)
	for i := range spec {
		spec[i] *= transfer(kern, k, float64(z), kappa2(t, i, float64(l.Dx)))
	}
	out := Line{U: t.Sequence(nil, spec), Dx: l.Dx, Wavelength: l.Wavelength, Index: l.Index}
	inv := complex(1/float64(n), 0)
	for i := range out.U {
		out.U[i] *= inv
	}
	return out, sampling(aliased, out.EdgeAmplitude())
}

// sampling returns the error that goes with a propagated field:
// [ErrUndersampled] if the input spectrum was aliased, [ErrWrap] if the
// output reaches the window edge by more than [EdgeLimit], else nil.
func sampling(aliased bool, edge float64) error {
	switch {
	case aliased:
		return ErrUndersampled
	case edge > EdgeLimit:
		return ErrWrap
	}
	return nil
}

// band returns the width of the edge band: N/16 samples, at least 1.
func band(n int) int { return max(1, n/16) }

// edgeRatio returns the largest |u| over the samples whose index (for a
// line of n samples) or whose row or column index (for an n×n grid)
// satisfies edge, relative to the largest |u| anywhere; 0 for a zero
// field.
func edgeRatio(u []complex128, n int, edge func(int) bool) float64 {
	peak, e := 0.0, 0.0
	for k, v := range u {
		a := cmplx.Abs(v)
		peak = math.Max(peak, a)
		if edge(k%n) || (len(u) > n && edge(k/n)) {
			e = math.Max(e, a)
		}
	}
	if peak == 0 {
		return 0
	}
	return e / peak
}

// windowAmplitude is [edgeRatio] over the outer band of the window.
func windowAmplitude(u []complex128, n int) float64 {
	b := band(n)
	return edgeRatio(u, n, func(i int) bool { return i < b || i >= n-b })
}

// nyquistAmplitude is [edgeRatio] of an unshifted FFT spectrum over the
// band of frequencies next to the Nyquist frequency (index N/2).
func nyquistAmplitude(spec []complex128, n int) float64 {
	b := band(n)
	return edgeRatio(spec, n, func(i int) bool { return i >= n/2-b && i < n/2+b })
}

// EdgeAmplitude returns the largest |u| in the outer sixteenth of the
// window on each side, relative to the largest |u| anywhere (0 for a zero
// field).
func (l Line) EdgeAmplitude() float64 { return windowAmplitude(l.U, len(l.U)) }

// SecondMomentRadius returns twice the intensity-weighted standard
// deviation of x,
//
//	W = 2√(⟨x²⟩ − ⟨x⟩²),   ⟨f⟩ = Σ f |u|² / Σ |u|²
//
// in metres: the second-moment (D4σ) radius of ISO 11146-1, which equals
// the 1/e² radius w for a Gaussian. It is 0 for a zero field.
func (l Line) SecondMomentRadius() units.Length {
	var s0, s1, s2 float64
	for i, v := range l.U {
		p := real(v)*real(v) + imag(v)*imag(v)
		x := float64(l.X(i))
		s0 += p
		s1 += p * x
		s2 += p * x * x
	}
	if s0 == 0 {
		return 0
	}
	m := s1 / s0
	return units.Length(2 * math.Sqrt(math.Max(0, s2/s0-m*m)))
}

// MaxDiff returns max_i |u_i − ref_i| / max_i |ref_i|, the peak-normalised
// largest difference between l and ref. It returns an [*Error] if the two
// fields are sampled differently, and +Inf if ref is zero.
func (l Line) MaxDiff(ref Line) (float64, error) {
	if len(l.U) != len(ref.U) || l.Dx != ref.Dx {
		return 0, &Error{Param: "reference sample count", Value: len(ref.U), Reason: "must match the field (N = " + strconv.Itoa(len(l.U)) + ", same Dx)"}
	}
	return maxDiff(l.U, ref.U), nil
}

func maxDiff(u, ref []complex128) float64 {
	d, p := 0.0, 0.0
	for i := range u {
		d = math.Max(d, cmplx.Abs(u[i]-ref[i]))
		p = math.Max(p, cmplx.Abs(ref[i]))
	}
	if p == 0 {
		return math.Inf(1)
	}
	return d / p
}
