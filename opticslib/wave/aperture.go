package wave

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// MinOpeningSamples is the smallest number of samples that an opening's
// diameter or width must span before [Grid.Clip], [Grid.Obscure] and
// [Line.Clip] report [ErrUnresolved]. With fewer, the sampled mask is a
// handful of grey pixels: its area is still right (see [Grid.Clip]), but
// its shape and the first diffraction rings are not. A choice, common
// practice, no single source.
const MinOpeningSamples = 8

// ErrUnresolved is wrapped by the [*Error] that [Grid.Clip],
// [Grid.Obscure] and [Line.Clip] return, together with the result, when
// the opening spans fewer than [MinOpeningSamples] samples. Use a finer
// spacing Dx.
var ErrUnresolved = errors.New("wave: mask under-resolved; use a finer spacing Dx")

// ErrOutsideWindow is wrapped by the [*Error] that [Grid.Clip],
// [Grid.Obscure] and [Line.Clip] return, together with the result, when
// the opening reaches beyond the window half-width N·Dx/2 in a direction
// that it limits: the window, not the opening, then sets the edge there
// (and the periodic window wraps). Enlarge the window.
var ErrOutsideWindow = errors.New("wave: mask extends beyond the window; enlarge the window")

// Clip returns the field behind the opening o, a clear aperture at normal
// incidence, and the fraction T of the power of g that it passes. Build o
// from its diameter or width, as parts are sold:
//
//	paraxial.ClearDiameter(d)                    // iris, lens rim, pinhole
//	paraxial.ClearDiameter(d).Offset(dx, dy)     // decentred by (dx, dy)
//	paraxial.SlitOfWidth(w, paraxial.Tangential) // edges along y, cuts in x
//
// A pinhole is a small [paraxial.ClearDiameter]. o.MinTransmission is not
// used. g is not modified.
//
// # Mask and transmitted power
//
// The amplitude transmission of each sample is the fraction of its pixel
// (a square of side Dx centred on the sample) that lies inside the opening,
// computed exactly (circle–rectangle area from ∫√(a² − t²) dt), so the
// sampled mask has the area of the opening and its edge falls between
// samples where it should (an anti-aliased mask; a hard 0/1 mask would
// move the edge by up to Dx/2):
//
//	t_ij = |pixel_ij ∩ opening| / Dx²
//	T    = Σ t_ij |u_ij|² / Σ |u_ij|²
//
// T is the power a detector behind the opening would see. For a smooth
// field it is a midpoint rule, accurate to
//
//	|ΔT| ≤ (Dx²/12)·∮|∂I/∂n| dl / P
//
// along the edge (for a centred circle of radius a on a Gaussian of radius
// w, (4/3)(a·Dx/w²)²·e^(−2a²/w²): 1.8e-4 at a = w = 32 Dx). The returned
// field carries Σ t²|u|², a little
// less: the difference, Σ t(1 − t)|u|², is the edge-diffracted light
// beyond the Nyquist frequency, which the samples cannot hold (for a
// uniformly lit circle of diameter D about (2/3)·Dx/D of its power, the
// same order as the Airy pattern's power beyond the window's angle
// λ0/(2nDx), 4Dx/(π²D)). A hard edge always reaches the Nyquist frequency,
// so propagating a clipped field usually reports [ErrUndersampled]; near
// the axis of a focus the cost is small (≤ 2e-4 of the focal peak at
// D = 64 Dx against the Fourier–Bessel integral, measured in the package's
// SciPy cross-check).
//
// # Errors
//
// It returns an [*Error] without a result for an invalid field, a field
// with no power, or an invalid opening: a diameter or width that is zero
// (the zero Opening is unlimited, which is no mask), negative or not
// finite, an offset that is not finite, or an unknown shape or slit plane.
// It returns the result together with an [*Error] wrapping
// [ErrUnresolved] when the opening spans fewer than [MinOpeningSamples]
// samples, or wrapping [ErrOutsideWindow] when it reaches beyond the
// window half-width N·Dx/2 in a direction it limits.
func (g Grid) Clip(o paraxial.Opening) (Grid, float64, error) { return g.mask(o, false) }

// Obscure returns the field behind an opaque stop of the shape o (a
// central obscuration such as a secondary mirror with
// paraxial.ClearDiameter(d), a wire with paraxial.SlitOfWidth) and the
// fraction of the power of g that passes around it. The mask is 1 − t of
// [Grid.Clip], so the two transmitted fractions of one opening add up to 1;
// the errors are those of [Grid.Clip]. g is not modified.
func (g Grid) Obscure(o paraxial.Opening) (Grid, float64, error) { return g.mask(o, true) }

// Clip is [Grid.Clip] for a 1-D field: o must be a slit across x,
// paraxial.SlitOfWidth(w, paraxial.Tangential), optionally with
// .Offset(dx, 0); a circle or a slit across y is an [*Error]. t_i is the
// fraction of [x_i − Dx/2, x_i + Dx/2] inside the slit, and T =
// Σ t_i|u_i|² / Σ|u_i|².
func (l Line) Clip(o paraxial.Opening) (Line, float64, error) {
	if err := l.Validate(); err != nil {
		return Line{}, 0, err
	}
	if err := checkOpening(o, false); err != nil {
		return Line{}, 0, err
	}
	if o.Shape != paraxial.Slit || o.Across != paraxial.Tangential {
		what := "circle"
		if o.Shape == paraxial.Slit {
			what = "slit across " + o.Across.String()
		}
		return Line{}, 0, &Error{Param: "opening", Value: what,
			Reason: "a Line (1-D field along x) takes a slit across x, paraxial.SlitOfWidth(w, paraxial.Tangential)"}
	}
	dx := float64(l.Dx)
	a, c := float64(o.Radius), float64(o.OffsetX)
	out := Line{U: make([]complex128, len(l.U)), Dx: l.Dx, Wavelength: l.Wavelength, Index: l.Index}
	var p0, p1 float64
	for i, v := range l.U {
		t := intervalCover(float64(l.X(i)), dx, c-a, c+a)
		p := real(v)*real(v) + imag(v)*imag(v)
		p0 += p
		p1 += t * p
		out.U[i] = complex(t, 0) * v
	}
	if !(p0 > 0) {
		return Line{}, 0, errNoPower
	}
	return out, p1 / p0, maskSampling(o, false, l.Dx, len(l.U), math.Abs(c)+a, 0)
}

var errNoPower = &Error{Param: "field", Value: "zero everywhere", Reason: "has no power to transmit"}

func (g Grid) mask(o paraxial.Opening, block bool) (Grid, float64, error) {
	if err := g.Validate(); err != nil {
		return Grid{}, 0, err
	}
	if err := checkOpening(o, block); err != nil {
		return Grid{}, 0, err
	}
	n := g.N
	dx := float64(g.Dx)
	a, cx, cy := float64(o.Radius), float64(o.OffsetX), float64(o.OffsetY)
	out := Grid{U: make([]complex128, n*n), N: n, Dx: g.Dx, Wavelength: g.Wavelength, Index: g.Index}
	// Per-axis transmissions of a slit, computed once.
	tx, ty := make([]float64, n), make([]float64, n)
	for i := range n {
		tx[i], ty[i] = 1, 1
		if o.Shape == paraxial.Slit {
			if o.Across == paraxial.Tangential {
				tx[i] = intervalCover(g.coord(i), dx, cx-a, cx+a)
			} else {
				ty[i] = intervalCover(g.coord(i), dx, cy-a, cy+a)
			}
		}
	}
	var p0, p1 float64
	for j := range n {
		y := g.coord(j)
		for i := range n {
			var t float64
			if o.Shape == paraxial.Circle {
				t = discCover(g.coord(i)-cx, y-cy, dx, a)
			} else {
				t = tx[i] * ty[j]
			}
			if block {
				t = 1 - t
			}
			v := g.U[j*n+i]
			p := real(v)*real(v) + imag(v)*imag(v)
			p0 += p
			p1 += t * p
			out.U[j*n+i] = complex(t, 0) * v
		}
	}
	if !(p0 > 0) {
		return Grid{}, 0, errNoPower
	}
	reachX, reachY := math.Abs(cx)+a, math.Abs(cy)+a
	switch {
	case o.Shape == paraxial.Slit && o.Across == paraxial.Tangential:
		reachY = 0
	case o.Shape == paraxial.Slit:
		reachX = 0
	}
	return out, p1 / p0, maskSampling(o, block, g.Dx, n, reachX, reachY)
}

// maskName returns the parameter name of the size of o: "aperture
// diameter", "slit width", "obscuration diameter" or "obscuration width".
func maskName(o paraxial.Opening, block bool) string {
	switch {
	case block && o.Shape == paraxial.Slit:
		return "obscuration width"
	case block:
		return "obscuration diameter"
	case o.Shape == paraxial.Slit:
		return "slit width"
	}
	return "aperture diameter"
}

// checkOpening validates o as a mask (a positive finite size).
func checkOpening(o paraxial.Opening, block bool) error {
	switch {
	case o.Shape != paraxial.Circle && o.Shape != paraxial.Slit:
		return &Error{Param: "opening shape", Value: int(o.Shape), Reason: "must be paraxial.Circle or paraxial.Slit"}
	case o.Shape == paraxial.Slit && o.Across != paraxial.Tangential && o.Across != paraxial.Sagittal:
		return &Error{Param: "slit plane", Value: int(o.Across), Reason: "must be paraxial.Tangential (cuts in x) or paraxial.Sagittal (cuts in y)"}
	case !finite(float64(o.Radius)) || !(o.Radius > 0):
		return &Error{Param: maskName(o, block), Value: 2 * o.Radius,
			Reason: "must be positive and finite (the zero paraxial.Opening is unlimited, which is no mask)"}
	case !finite(float64(o.OffsetX)):
		return &Error{Param: "opening offset x", Value: o.OffsetX, Reason: "must be finite"}
	case !finite(float64(o.OffsetY)):
		return &Error{Param: "opening offset y", Value: o.OffsetY, Reason: "must be finite"}
	}
	return nil
}

// maskSampling returns the [ErrUnresolved] or [ErrOutsideWindow] error of
// a mask whose limited extent reaches reachX and reachY from the axis (0
// for an axis it does not limit), or nil.
func maskSampling(o paraxial.Opening, block bool, dx units.Length, n int, reachX, reachY float64) error {
	size := 2 * o.Radius
	if s := float64(size / dx); s < MinOpeningSamples {
		return &Error{Param: maskName(o, block), Value: size,
			Reason: "spans " + strconv.FormatFloat(s, 'g', 3, 64) + " samples of Dx = " + dx.String() +
				", fewer than " + strconv.Itoa(MinOpeningSamples),
			Err: ErrUnresolved}
	}
	half := float64(n) * float64(dx) / 2
	if r := math.Max(reachX, reachY); r > half {
		return &Error{Param: maskName(o, block), Value: size,
			Reason: "reaches " + units.Length(r).String() + " from the axis, beyond the window half-width N·Dx/2 = " +
				units.Length(half).String(),
			Err: ErrOutsideWindow}
	}
	return nil
}

// intervalCover returns the fraction of [x − d/2, x + d/2] inside
// [lo, hi].
func intervalCover(x, d, lo, hi float64) float64 {
	l := math.Max(x-d/2, lo)
	h := math.Min(x+d/2, hi)
	return clamp01((h - l) / d)
}

func clamp01(v float64) float64 { return math.Min(1, math.Max(0, v)) }

// discCover returns the fraction of the square of side d centred on
// (x, y) that lies inside the disc of radius a centred on the origin, by
// inclusion–exclusion of [discCorner].
func discCover(x, y, d, a float64) float64 {
	ax, ay := math.Abs(x), math.Abs(y)
	h := d / 2
	// Nearest and farthest points of the square from the centre.
	nx, ny := math.Max(0, ax-h), math.Max(0, ay-h)
	if nx*nx+ny*ny >= a*a {
		return 0
	}
	fx, fy := ax+h, ay+h
	if fx*fx+fy*fy <= a*a {
		return 1
	}
	x0, x1, y0, y1 := x-h, x+h, y-h, y+h
	area := discCorner(x1, y1, a) - discCorner(x0, y1, a) - discCorner(x1, y0, a) + discCorner(x0, y0, a)
	return clamp01(area / (d * d))
}

// discCorner returns the area of the part of the disc of radius a centred
// on the origin with X < x and Y < y:
//
//	∫_{−a}^{min(x, a)} clamp(y + h(t), 0, 2h(t)) dt,   h(t) = √(a² − t²)
//
// split where the chord meets Y = y (|t| = s = √(a² − y²), where h = |y|)
// and integrated in closed form with ∫h dt = ½(t·h + a²·atan2(t, h)). The
// atan2 form, with h = √((a − t)(a + t)) and h(±s) = |y| exactly, stays
// accurate near t = ±a, where asin(t/a) would amplify the rounding of t/a
// by 1/√(1 − t²/a²).
func discCorner(x, y, a float64) float64 {
	if x <= -a || y <= -a {
		return 0
	}
	x = math.Min(x, a)
	H := func(t, h float64) float64 { return 0.5 * (t*h + a*a*math.Atan2(t, h)) }
	hOf := func(t float64) float64 { return math.Sqrt(math.Max(0, (a-t)*(a+t))) }
	if y >= a {
		return 2 * (H(x, hOf(x)) - H(-a, 0))
	}
	s := math.Sqrt((a - y) * (a + y))
	ay := math.Abs(y)
	area := 0.0
	// seg adds the integral over [t1, min(t2, x)]; h1 and h2 are h at t1
	// and t2.
	seg := func(t1, h1, t2, h2 float64, inner bool) {
		if x < t2 {
			t2, h2 = x, hOf(x)
		}
		if t2 <= t1 {
			return
		}
		switch {
		case inner:
			area += y*(t2-t1) + H(t2, h2) - H(t1, h1)
		case y >= 0:
			area += 2 * (H(t2, h2) - H(t1, h1))
		}
	}
	seg(-a, 0, -s, ay, false)
	seg(-s, ay, s, ay, true)
	seg(s, ay, a, 0, false)
	return area
}
