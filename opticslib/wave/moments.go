package wave

import (
	"math"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Moments holds the intensity second moments of a sampled field along one
// transverse axis, in space and in spatial frequency, from which the beam
// propagation ratio M² follows ([Moments.BeamQuality]).
//
// # Spatial frequency
//
// The spatial frequency f of a plane-wave component is κx/(2π) in cycles
// per metre, with the sign of its direction: a component with f > 0
// travels towards +x, at the angle λ0·f/n to the axis (paraxially). With
// the exp(−ikz) envelopes of this package such a component is
// exp(−2πi f x), so f is the negative of the FFT frequency (see
// [Line.Moments]). With these signs Mixed is positive for a diverging beam
// (behind its waist) and negative for a converging one.
type Moments struct {
	// Mean is the intensity centroid ⟨x⟩ in metres, on the axis
	// convention of the field (x_i = (i − N/2)·Dx).
	Mean units.Length
	// Sigma is σx = √⟨(x − ⟨x⟩)²⟩ in metres: the second-moment
	// radius of ISO 11146-1 is 2σx ([Line.SecondMomentRadius]).
	Sigma units.Length
	// FreqMean is ⟨f⟩ in cycles per metre: the beam's mean direction is
	// λ0·⟨f⟩/n radians (paraxially).
	FreqMean float64
	// FreqSigma is σf = √⟨(f − ⟨f⟩)²⟩ in cycles per metre, from the
	// power spectrum |F[u]|².
	FreqSigma float64
	// Mixed is the centred mixed moment ⟨(x − ⟨x⟩)(f − ⟨f⟩)⟩ of the
	// field's Wigner distribution (dimensionless: metres times cycles per
	// metre). It is zero at a waist.
	Mixed float64
}

// BeamQuality returns the beam propagation ratio
//
//	M² = 4π·√(σx²·σf² − ⟨(x − ⟨x⟩)(f − ⟨f⟩)⟩²)
//
// At a waist the mixed moment vanishes and this is M² = 4π·σx·σf, the
// definition of A. E. Siegman, "Defining, measuring, and optimizing laser
// beam quality", Proc. SPIE 1868, 2–12 (1993) [from memory], which is the
// ISO 11146-1 ratio M² = π·d0·Θ/(4λ) written with d0 = 4σx and the
// full divergence Θ = 4λσf (ISO 11146-1:2005, clause 3 [from memory]).
// The determinant form is invariant under free-space propagation (the
// second moments of the Wigner distribution transform with the ABCD
// matrix, whose determinant is 1: M. J. Bastiaans, J. Opt. Soc. Am. A 3,
// 1227 (1986); J. Serna, R. Martínez-Herrero & P. M. Mejías, J. Opt. Soc.
// Am. A 8, 1094 (1991) [both from memory]), so it gives the same M² at
// any plane, not only at the waist. A Gaussian has M² = 1, the
// Hermite–Gaussian mode HG_m has 2m + 1 (Siegman, Lasers, 1986, ch. 17
// [from memory]).
//
// For a field that the samples resolve M² ≥ 1 (the uncertainty relation);
// a value below 1 means that the field is only a few samples wide.
func (m Moments) BeamQuality() float64 {
	s := float64(m.Sigma) * m.FreqSigma
	return 4 * math.Pi * math.Sqrt(math.Max(0, s*s-m.Mixed*m.Mixed))
}

// momentsOf returns the mean and standard deviation of the coordinates
// c(i) weighted by w[i] (w sums to total > 0), in two passes so that a
// beam far from the origin loses no digits.
func momentsOf(w []float64, total float64, c func(int) float64) (mean, sigma float64) {
	for i, v := range w {
		mean += v * c(i)
	}
	mean /= total
	var s2 float64
	for i, v := range w {
		d := c(i) - mean
		s2 += v * d * d
	}
	return mean, math.Sqrt(math.Max(0, s2/total))
}

// derivativeFactor returns 2πi·ν for FFT index k of an n-point transform
// with spacing dx, ν = t.Freq(k)/dx; zero at the Nyquist index of an even
// n, whose sign is ambiguous (the spectral derivative of the band-limited
// interpolant).
func derivativeFactor(t *fourier.CmplxFFT, k, n int, dx float64) complex128 {
	if n%2 == 0 && k == n/2 {
		return 0
	}
	return complex(0, 2*math.Pi*t.Freq(k)/dx)
}

// Moments returns the second moments of l in x and in spatial frequency:
//
//	⟨x⟩ = Σ x_i |u_i|² / Σ |u_i|²,   σx² = Σ (x_i − ⟨x⟩)² |u_i|² / Σ |u_i|²
//	⟨f⟩, σf² the same with f_k and |U_k|², U = F[u] (gonum dsp/fourier),
//	  f_k = −Freq(k)/Dx
//	mixed = −Σ (x_i − ⟨x⟩)·Im(u_i*·u'_i) / (2π Σ |u_i|²)
//
// where u' is the spectral derivative F⁻¹[2πi·(Freq(k)/Dx)·U_k] (the local
// spatial frequency of u = A·e^{iφ} is −φ'/(2π) in the sign convention of
// [Moments]). The last line is the mixed second moment of the Wigner
// distribution of u (Bastiaans 1986 [from memory]). M² follows with
// [Moments.BeamQuality]; 2·Sigma equals [Line.SecondMomentRadius].
//
// The sums approximate the moments of the continuous field when the field
// is negligible at the window edge and its spectrum at the Nyquist
// frequency: the moments, weighted by x² and f², are more sensitive to
// clipped tails than the field itself. Moments returns an [*Error] for an
// invalid or zero field, and otherwise the moments together with
// [ErrUndersampled] or [ErrWrap] under the conditions of [Line.Propagate]
// (checked on the field itself), so an inaccurate result is never silent.
func (l Line) Moments() (Moments, error) {
	if err := l.Validate(); err != nil {
		return Moments{}, err
	}
	n := len(l.U)
	dx := float64(l.Dx)
	p := make([]float64, n)
	total := 0.0
	for i, v := range l.U {
		p[i] = real(v)*real(v) + imag(v)*imag(v)
		total += p[i]
	}
	if !(total > 0) {
		return Moments{}, &Error{Param: "field", Value: "zero everywhere", Reason: "needs intensity to have moments"}
	}
	x := func(i int) float64 { return float64(i-n/2) * dx }
	mx, sx := momentsOf(p, total, x)

	t := fourier.NewCmplxFFT(n)
	spec := t.Coefficients(nil, l.U)
	ps := make([]float64, n)
	totalF := 0.0
	for k, v := range spec {
		ps[k] = real(v)*real(v) + imag(v)*imag(v)
		totalF += ps[k]
	}
	mf, sf := momentsOf(ps, totalF, func(k int) float64 { return -t.Freq(k) / dx })

	d := make([]complex128, n)
	for k, v := range spec {
		d[k] = v * derivativeFactor(t, k, n, dx)
	}
	du := t.Sequence(nil, d)
	var mixed float64
	for i, v := range l.U {
		g := du[i] / complex(float64(n), 0)
		mixed += (x(i) - mx) * (real(v)*imag(g) - imag(v)*real(g))
	}
	mixed = -mixed / (2 * math.Pi * total)

	m := Moments{Mean: units.Length(mx), Sigma: units.Length(sx), FreqMean: mf, FreqSigma: sf, Mixed: mixed}
	return m, sampling(nyquistAmplitude(spec, n) > EdgeLimit, l.EdgeAmplitude())
}

// Moments returns the second moments of g along x and along y, as
// [Line.Moments] computes them for one axis: each from the intensity
// |u|² and the power spectrum |F[u]|² summed over the other axis (the
// projections of the field's Wigner distribution), with the mixed moments
// from the spectral derivatives ∂u/∂x and ∂u/∂y. Per-axis M² values
// (mx.BeamQuality(), my.BeamQuality()) describe stigmatic and simple
// astigmatic beams aligned with the grid; a beam whose principal axes are
// rotated, or a general astigmatic beam, needs the full set of ten
// second moments of ISO 11146-2, which this method does not compute.
//
// It returns an [*Error] for an invalid or zero field, and otherwise the
// moments together with [ErrUndersampled] or [ErrWrap] as [Line.Moments]
// does.
func (g Grid) Moments() (mx, my Moments, err error) {
	if err := g.Validate(); err != nil {
		return Moments{}, Moments{}, err
	}
	n := g.N
	dx := float64(g.Dx)
	px, py := make([]float64, n), make([]float64, n)
	total := 0.0
	for j := range n {
		for i := range n {
			v := g.U[j*n+i]
			a := real(v)*real(v) + imag(v)*imag(v)
			px[i] += a
			py[j] += a
			total += a
		}
	}
	if !(total > 0) {
		return Moments{}, Moments{}, &Error{Param: "field", Value: "zero everywhere", Reason: "needs intensity to have moments"}
	}
	meanX, sigmaX := momentsOf(px, total, g.coord)
	meanY, sigmaY := momentsOf(py, total, g.coord)

	t := fourier.NewCmplxFFT(n)
	spec := append([]complex128(nil), g.U...)
	fft2(t, spec, n, false)
	fx, fy := make([]float64, n), make([]float64, n)
	totalF := 0.0
	for j := range n {
		for i := range n {
			v := spec[j*n+i]
			a := real(v)*real(v) + imag(v)*imag(v)
			fx[i] += a
			fy[j] += a
			totalF += a
		}
	}
	freq := func(k int) float64 { return -t.Freq(k) / dx }
	meanFx, sigmaFx := momentsOf(fx, totalF, freq)
	meanFy, sigmaFy := momentsOf(fy, totalF, freq)

	// Spectral derivatives along x (column index i) and y (row index j).
	dux := make([]complex128, n*n)
	duy := make([]complex128, n*n)
	for j := range n {
		cy := derivativeFactor(t, j, n, dx)
		for i := range n {
			v := spec[j*n+i]
			dux[j*n+i] = v * derivativeFactor(t, i, n, dx)
			duy[j*n+i] = v * cy
		}
	}
	fft2(t, dux, n, true)
	fft2(t, duy, n, true)
	inv := 1 / float64(n*n)
	var mixX, mixY float64
	for j := range n {
		y := g.coord(j) - meanY
		for i := range n {
			v := g.U[j*n+i]
			a, b := dux[j*n+i], duy[j*n+i]
			x := g.coord(i) - meanX
			mixX += x * (real(v)*imag(a) - imag(v)*real(a))
			mixY += y * (real(v)*imag(b) - imag(v)*real(b))
		}
	}
	mixX *= -inv / (2 * math.Pi * total)
	mixY *= -inv / (2 * math.Pi * total)

	mx = Moments{Mean: units.Length(meanX), Sigma: units.Length(sigmaX), FreqMean: meanFx, FreqSigma: sigmaFx, Mixed: mixX}
	my = Moments{Mean: units.Length(meanY), Sigma: units.Length(sigmaY), FreqMean: meanFy, FreqSigma: sigmaFy, Mixed: mixY}
	return mx, my, sampling(nyquistAmplitude(spec, n) > EdgeLimit, g.EdgeAmplitude())
}
