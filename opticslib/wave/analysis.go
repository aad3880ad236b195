package wave

import (
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Irradiance returns |u_i|² for each sample, in the square of the field's
// unit (W/m² for a field in √(W/m²)); sample i is at [Line.X](i).
func (l Line) Irradiance() []float64 { return irradiance(l.U) }

// Irradiance returns |u|² for each sample, row by row as [Grid.U], in the
// square of the field's unit (W/m² for a field in √(W/m²)).
func (g Grid) Irradiance() []float64 { return irradiance(g.U) }

func irradiance(u []complex128) []float64 {
	p := make([]float64, len(u))
	for i, v := range u {
		p[i] = real(v)*real(v) + imag(v)*imag(v)
	}
	return p
}

// Power returns Σ |u_i|² · Dx, the power per unit length along y of the
// 1-D field (W/m for a field in √(W/m²)): the Riemann sum of ∫|u|² dx,
// exact (by Parseval) for the band-limited field the samples describe.
// Free-space propagation conserves it.
func (l Line) Power() float64 {
	s := 0.0
	for _, v := range l.U {
		s += real(v)*real(v) + imag(v)*imag(v)
	}
	return s * float64(l.Dx)
}

// Power returns Σ |u|² · Dx², the power of the 2-D field (W for a field in
// √(W/m²)). A field from [GridFromBeam] at a waist of radius w0 has
// power πw0²/2 (unit amplitude on axis). Free-space propagation conserves
// it.
func (g Grid) Power() float64 {
	s := 0.0
	for _, v := range g.U {
		s += real(v)*real(v) + imag(v)*imag(v)
	}
	return s * float64(g.Dx) * float64(g.Dx)
}

// Peak returns the position x (metres) and the irradiance |u|² of the
// brightest sample, the first one in index order on a tie. It does not
// interpolate between samples. The peak irradiance relative to an
// untruncated Gaussian focus of the same input power P is
// irradiance / beam.PeakIrradiance(P, w0, w0) with w0 the focal waist of
// the q-law; see the package examples. An empty Line gives (0, 0).
func (l Line) Peak() (x units.Length, irradiance float64) {
	if len(l.U) == 0 {
		return 0, 0
	}
	k := peakIndex(l.U)
	return l.X(k), abs2(l.U[k])
}

// Peak returns the position (x, y) in metres and the irradiance |u|² of
// the brightest sample, as [Line.Peak]. An empty Grid gives (0, 0, 0).
func (g Grid) Peak() (x, y units.Length, irradiance float64) {
	if len(g.U) == 0 || g.N < 1 {
		return 0, 0, 0
	}
	k := peakIndex(g.U)
	return units.Length(g.coord(k % g.N)), units.Length(g.coord(k / g.N)), abs2(g.U[k])
}

func abs2(v complex128) float64 { return real(v)*real(v) + imag(v)*imag(v) }

func peakIndex(u []complex128) int {
	k, p := 0, -1.0
	for i, v := range u {
		if a := abs2(v); a > p {
			k, p = i, a
		}
	}
	return k
}

// AlongX returns the samples of g on the x axis (y = 0, row N/2) as a
// [Line] with the same spacing, wavelength and index: the profile of g
// along x. Its irradiance is a cut through a 2-D field (W/m² for a field
// in √(W/m²)), not a 1-D field's; use it for positions and shapes. Like
// the other Grid methods without an error result, it panics on a
// malformed Grid (len(U) ≠ N²; see [Grid.Validate]).
func (g Grid) AlongX() Line {
	n := g.N
	return Line{U: append([]complex128(nil), g.U[n/2*n:(n/2+1)*n]...), Dx: g.Dx, Wavelength: g.Wavelength, Index: g.Index}
}

// AlongY returns the samples of g on the y axis (x = 0, column N/2) as a
// [Line], as [Grid.AlongX].
func (g Grid) AlongY() Line {
	n := g.N
	u := make([]complex128, n)
	for j := range n {
		u[j] = g.U[j*n+n/2]
	}
	return Line{U: u, Dx: g.Dx, Wavelength: g.Wavelength, Index: g.Index}
}

// RadialProfile returns the azimuthal mean of the irradiance about the
// axis in rings one sample wide: ring k holds the samples with
// (k − ½)·Dx ≤ r < (k + ½)·Dx, r = √(x² + y²), for k = 0 … N/2 − 1, and
// irradiance[k] is their mean |u|², radius[k] their mean r (metres). Every
// ring holds at least one sample; ring 0 is the axis sample alone. Taking
// the mean radius rather than k·Dx removes the first-order bias of the
// ring (it holds more samples outside k·Dx than inside), so the pairs lie
// on the radial profile I(r) to about ½·I″·var(r) ≤ I″·Dx²/24 (var(r) ≤
// Dx²/12 in a ring one sample wide). Use [Grid.AlongX] for the exact
// samples on a cut.
func (g Grid) RadialProfile() (radius []units.Length, irradiance []float64) {
	n := g.N
	m := n / 2
	sum := make([]float64, m)
	rs := make([]float64, m)
	cnt := make([]int, m)
	dx := float64(g.Dx)
	for j := range n {
		y := g.coord(j) / dx
		for i := range n {
			x := g.coord(i) / dx
			r := math.Hypot(x, y)
			k := int(math.Floor(r + 0.5))
			if k < m {
				sum[k] += abs2(g.U[j*n+i])
				rs[k] += r
				cnt[k]++
			}
		}
	}
	radius = make([]units.Length, m)
	for k := range sum {
		sum[k] /= float64(cnt[k])
		radius[k] = units.Length(rs[k] / float64(cnt[k]) * dx)
	}
	return radius, sum
}

// EncircledPower returns the power inside the circle of radius r (metres)
// about the axis, in the unit of [Grid.Power]:
//
//	P(r) = Σ |u_ij|² · |pixel_ij ∩ disc(r)|
//
// with each sample's irradiance taken as constant over its pixel (a square
// of side Dx) and the overlap area computed exactly, as [Grid.Clip] does,
// so P(r) is T·Power() of a centred aperture of radius r and has the
// accuracy of that T (a midpoint rule, error ≤ (Dx²/12)·2πr·|∂I/∂r|).
// The encircled-power fraction is P(r)/P with P = [Grid.Power] (or the
// power before an aperture, for the fraction of the incident beam).
// P(+Inf) = Power(). It returns an [*Error] for an invalid field or a
// negative or NaN r.
func (g Grid) EncircledPower(r units.Length) (float64, error) {
	if err := g.Validate(); err != nil {
		return 0, err
	}
	if math.IsNaN(float64(r)) || r < 0 {
		return 0, &Error{Param: "radius r", Value: r, Reason: "must be non-negative and not NaN"}
	}
	if math.IsInf(float64(r), 1) {
		return g.Power(), nil
	}
	n := g.N
	dx := float64(g.Dx)
	a := float64(r)
	s := 0.0
	for j := range n {
		y := g.coord(j)
		if math.Abs(y)-dx/2 >= a {
			continue
		}
		for i := range n {
			if t := discCover(g.coord(i), y, dx, a); t > 0 {
				s += t * abs2(g.U[j*n+i])
			}
		}
	}
	return s * dx * dx, nil
}

// FirstMinimum returns the position x (metres) of the first local minimum
// of the irradiance |u|² on the +x side of the axis. It finds the first
// sample i > N/2 with |u_{i−1}|² > |u_i|² ≤ |u_{i+1}|² and refines the
// minimum between x_{i−1} and x_{i+1} by golden-section search on the
// band-limited (trigonometric) interpolant of the samples,
//
//	u(x) = (1/N) Σ_k U_k exp(2πi·Freq(k)·(x − x_0)/Dx),   U = F[u]
//
// which is the continuous field that the samples describe and that
// [Line.Propagate] propagates exactly, so the position is not limited to
// the sample grid (a parabola through three intensity samples is biased by
// about 0.15 Dx at an Airy zero ten samples out). For a focus on a
// [Grid], g.AlongX().FirstMinimum() is the radius of the first dark ring
// (the 2-D field restricted to y = 0 is band-limited in x too). It returns
// an [*Error] for an invalid field or when the irradiance has no such
// minimum inside the window.
func (l Line) FirstMinimum() (units.Length, error) {
	if err := l.Validate(); err != nil {
		return 0, err
	}
	n := len(l.U)
	for i := n/2 + 1; i < n-1; i++ {
		a, b, c := abs2(l.U[i-1]), abs2(l.U[i]), abs2(l.U[i+1])
		if !(a > b && b <= c) {
			continue
		}
		t := fourier.NewCmplxFFT(n)
		spec := t.Coefficients(nil, l.U)
		x0 := float64(l.X(0))
		dx := float64(l.Dx)
		at := func(x float64) float64 {
			var s complex128
			ph := 2 * math.Pi * (x - x0) / dx
			for k, v := range spec {
				if n%2 == 0 && k == n/2 {
					// The Nyquist term of an even N, split evenly between
					// ±1/2 cycles per sample: a cosine.
					s += v * complex(math.Cos(0.5*ph), 0)
					continue
				}
				s += v * cmplx.Exp(complex(0, t.Freq(k)*ph))
			}
			return abs2(s)
		}
		lo, hi := float64(l.X(i-1)), float64(l.X(i+1))
		return units.Length(goldenMin(at, lo, hi, 1e-9*dx)), nil
	}
	return 0, &Error{Param: "irradiance along +x", Reason: "has no local minimum inside the window"}
}

// goldenMin returns the minimum of the unimodal f on [lo, hi] by
// golden-section search to an interval of width tol (J. Kiefer, "Sequential
// minimax search for a maximum", Proc. Am. Math. Soc. 4, 502 (1953) [from
// memory]).
func goldenMin(f func(float64) float64, lo, hi, tol float64) float64 {
	r := (math.Sqrt(5) - 1) / 2
	c, d := hi-r*(hi-lo), lo+r*(hi-lo)
	fc, fd := f(c), f(d)
	for hi-lo > tol {
		if fc <= fd {
			hi, d, fd = d, c, fc
			c = hi - r*(hi-lo)
			fc = f(c)
		} else {
			lo, c, fc = c, d, fd
			d = lo + r*(hi-lo)
			fd = f(d)
		}
	}
	return (lo + hi) / 2
}
