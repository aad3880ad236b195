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
// A thin lens of focal length f > 0 multiplies the field by
// exp(+i k r²/(2f)) ([Line.ThinLens], [Grid.ThinLens]): the phase that
// takes 1/q to 1/q − 1/f, so a converging lens makes the beam converge, as
// in package beam.
//
// # Clipped beams
//
// The focus of a truncated beam, the rings it makes and what a pinhole
// spatial filter removes are computed by composing small steps, each
// returning a new field:
//
//	clipped, T, err := in.Clip(paraxial.ClearDiameter(d))  // iris, pinhole; T = passed fraction
//	lensed, err := clipped.ThinLens(f)
//	focus, err := lensed.Propagate(f, wave.Paraxial)        // back focal plane
//
// Openings are the [paraxial.Opening] values that the rest of the library
// uses for clear apertures, built from their diameter or width
// (paraxial.ClearDiameter, paraxial.SlitOfWidth, .Offset(dx, dy)); a
// pinhole is a small ClearDiameter, and [Grid.Obscure] blocks the same
// shapes (a central obscuration, a wire). Masks are anti-aliased: each
// sample transmits the fraction of its pixel inside the opening.
//
// The focal field is then read with [Grid.Peak], [Grid.AlongX] and
// [Grid.AlongY] (cuts through the axis, as a [Line]), [Grid.RadialProfile],
// [Grid.EncircledPower] and [Line.FirstMinimum] (a dark ring's radius),
// and compared with the unclipped Gaussian through package beam (the
// q-law radius at f and beam.PeakIrradiance). [Grid.Power] and
// [Line.Power] give the power of the samples.
//
// A focus is sampled best at N·Dx² = λ0 f/n ("critical sampling"): the
// focal plane's natural spacing λ0 f/(n·N·Dx) then equals Dx, the lens
// phase is below the Nyquist frequency wherever the field lies inside the
// window, and the step from the lens to its back focal plane is exactly a
// discrete Fourier transform of the clipped field. A hard edge is never
// band-limited, so propagating a clipped field usually reports
// [ErrUndersampled]; the cross-checks (aperture_crosscheck_test.go)
// measure the cost at D = 64 Dx: 2e-4 of the focal peak against the
// Fourier–Bessel integral.
//
// # FFT
//
// Transforms use gonum.org/v1/gonum/dsp/fourier (any N ≥ 2; powers of two
// are fastest). A 2-D transform is done as row transforms followed by
// column transforms.
//
// # Errors and panics
//
// Constructors, [Line.Propagate]/[Grid.Propagate], the lenses and the
// masks validate their input and return an [*Error] naming the parameter
// and value; they never panic on user data. Sampling problems of a result
// come with the result: [ErrWrap] and [ErrUndersampled] from Propagate;
// an [*Error] that wraps [ErrUndersampled] from ThinLens (aliased lens
// phase), and [ErrUnresolved] or [ErrOutsideWindow] from the masks; test
// them with errors.Is. Nothing modifies its arguments: results are new
// fields. Methods without an error result (cuts, profiles) panic only on
// a malformed Grid whose len(U) is not N².
package wave
