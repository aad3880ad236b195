package wave

import (
	"math"
	"math/cmplx"

	"github.com/beamnote/beamnote/opticslib/units"
)

// ThinLens returns the field just behind a thin lens of focal length f
// (metres; f > 0 converges) centred on the axis:
//
//	u'(x) = u(x) · exp(+i k x²/(2f)),   k = 2πn/λ0
//
// the phase that takes a Gaussian beam's 1/q to 1/q − 1/f in the exp(−ikz)
// convention of the package (Kogelnik & Li 1966; the thin-lens transmission
// function of Goodman, Introduction to Fourier Optics, ch. 5 [from
// memory], written for exp(−ikz) envelopes). The lens is an ideal phase
// screen: no aperture (clip the field with [Line.Clip] first) and no
// aberration. ThinLens(±Inf) returns a copy of l.
//
// # Sampling
//
// The lens phase has the local spatial frequency k·x/(2πf) cycles per
// metre, which the samples represent only while it stays below the Nyquist
// frequency 1/(2Dx) over the field:
//
//	k·x_max·Dx/|f| < π   ⇔   Dx < λ0|f|/(2n·x_max)
//
// where x_max is the largest |x| at which |u| exceeds [EdgeLimit] times its
// peak (the field's extent, not the window: the phase does not matter
// where there is no light). When Dx is too coarse ThinLens returns the
// (aliased) result together with an [*Error] naming f, Dx and the limit,
// which wraps [ErrUndersampled]. A focus that the window samples well has
// N·Dx² ≈ λ0 f/n (the output spacing λ0 f/(n N Dx) of the Fraunhofer
// transform equals Dx); then the limit is met wherever the field lies
// inside the window.
//
// It returns an [*Error] without a result for an invalid field or an f
// that is zero or NaN.
func (l Line) ThinLens(f units.Length) (Line, error) {
	if err := l.Validate(); err != nil {
		return Line{}, err
	}
	if err := checkFocal(f); err != nil {
		return Line{}, err
	}
	out := Line{U: make([]complex128, len(l.U)), Dx: l.Dx, Wavelength: l.Wavelength, Index: l.Index}
	k := 2 * math.Pi * l.Index / float64(l.Wavelength)
	for i, v := range l.U {
		x := float64(l.X(i))
		out.U[i] = v * lensPhase(k, x*x, float64(f))
	}
	xmax := 0.0
	peak := peakAbs(l.U)
	for i, v := range l.U {
		if cmplx.Abs(v) > EdgeLimit*peak {
			xmax = math.Max(xmax, math.Abs(float64(l.X(i))))
		}
	}
	return out, lensSampling(f, l.Dx, l.Wavelength, l.Index, units.Length(xmax))
}

// ThinLens is [Line.ThinLens] for a 2-D field, with x² replaced by
// x² + y² (a spherical lens). The sampling condition holds per axis, so
// x_max is the largest |x| or |y| at which |u| exceeds [EdgeLimit] times
// its peak.
func (g Grid) ThinLens(f units.Length) (Grid, error) {
	if err := g.Validate(); err != nil {
		return Grid{}, err
	}
	if err := checkFocal(f); err != nil {
		return Grid{}, err
	}
	n := g.N
	out := Grid{U: make([]complex128, n*n), N: n, Dx: g.Dx, Wavelength: g.Wavelength, Index: g.Index}
	k := 2 * math.Pi * g.Index / float64(g.Wavelength)
	peak := peakAbs(g.U)
	xmax := 0.0
	for j := range n {
		y := g.coord(j)
		for i := range n {
			x := g.coord(i)
			v := g.U[j*n+i]
			out.U[j*n+i] = v * lensPhase(k, x*x+y*y, float64(f))
			if cmplx.Abs(v) > EdgeLimit*peak {
				xmax = math.Max(xmax, math.Max(math.Abs(x), math.Abs(y)))
			}
		}
	}
	return out, lensSampling(f, g.Dx, g.Wavelength, g.Index, units.Length(xmax))
}

func checkFocal(f units.Length) error {
	if math.IsNaN(float64(f)) || f == 0 {
		return &Error{Param: "focal length f", Value: f, Reason: "must be nonzero and not NaN (±Inf is no lens)"}
	}
	return nil
}

// lensPhase returns exp(+i k r²/(2f)); 1 for f = ±Inf.
func lensPhase(k, r2, f float64) complex128 {
	if math.IsInf(f, 0) {
		return 1
	}
	return cmplx.Exp(complex(0, k*r2/(2*f)))
}

// lensSampling returns the aliasing error of [Line.ThinLens], or nil.
func lensSampling(f, dx, lambda units.Length, index float64, xmax units.Length) error {
	if math.IsInf(float64(f), 0) || xmax == 0 {
		return nil
	}
	limit := units.Length(float64(lambda) * math.Abs(float64(f)) / (2 * index * float64(xmax)))
	if dx < limit {
		return nil
	}
	return &Error{Param: "focal length f", Value: f,
		Reason: "lens phase aliases: Dx = " + dx.String() + " exceeds λ0|f|/(2n·x_max) = " + limit.String() +
			" (field extent x_max = " + xmax.String() + ")",
		Err: ErrUndersampled}
}

// peakAbs returns max |u_i| (0 for an empty or zero field).
func peakAbs(u []complex128) float64 {
	p := 0.0
	for _, v := range u {
		p = math.Max(p, cmplx.Abs(v))
	}
	return p
}
