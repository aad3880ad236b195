// Package wave propagates sampled scalar optical fields over a free-space
// segment with the angular-spectrum (FFT) method. It is an independent,
// numerical check of the q-parameter results of package beam, and a tool
// in its own right for fields that are not Gaussian.
//
// # Units and sampling
//
// Lengths are in metres (see package units), the wavelength too; it is the
// vacuum wavelength λ0, and the medium has index n, so k = 2πn/λ0. A
// [Line] is a 1-D field u(x_i) and a [Grid] a 2-D field u(x_i, y_j) on a
// square grid, both with spacing Dx and samples at
//
//	x_i = (i − N/2)·Dx,   i = 0 … N−1
//
// so the optical axis is sample N/2. The window is periodic: energy that
// reaches its edge wraps around. Keep the window ≥ 8–10 beam radii wide and
// Dx ≤ w/3 (reference-checks R15), finer for a strongly curved wavefront
// (its local spatial frequency k·x/R must stay below π/Dx). [ErrWrap]
// reports a result that touches the window edge and [ErrUndersampled] an
// input whose angular spectrum reaches the Nyquist frequency; both come
// with the (inaccurate) result.
//
// # Sign convention
//
// Fields are complex envelopes of exp(−ikz) plane waves, as in package beam
// (H. Kogelnik & T. Li, Appl. Opt. 5, 1550 (1966)). A plane-wave component
// of transverse wavenumber κ advances, relative to exp(−ikz), by
//
//	H(κ) = exp(−i z(√(k² − κ²) − k))   ([Exact])
//	H(κ) = exp(+i z κ²/(2k))           ([Paraxial])
//
// (J. W. Goodman, Introduction to Fourier Optics, ch. 3–4 [from memory]).
// Components with κ > k are evanescent and decay as exp(−z√(κ² − k²)) in
// the exact kernel. The paraxial kernel is the exact propagator of the
// paraxial wave equation, whose Gaussian solutions are those of package
// beam, so the two agree to rounding when the window is large enough.
//
// # FFT
//
// Transforms use gonum.org/v1/gonum/dsp/fourier (any N ≥ 2; powers of two
// are fastest). A 2-D transform is done as row transforms followed by
// column transforms.
//
// # Errors and panics
//
// Constructors and [Line.Propagate]/[Grid.Propagate] validate their input
// and return errors naming the parameter and value; they never panic on
// user data. Nothing modifies its arguments: results are new fields.
package wave
