package optplot

import (
	"math"

	"gonum.org/v1/plot/plotter"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/units"
)

// minShown is the number of sample intervals below which the part of a
// caustic shown is refined between its samples.
const minShown = 300

// envelope holds a caustic's values over the range shown: z and the
// radii in mm, curvatures in 1/m (nil when the caustic has none), Gouy
// phases in radians (nil likewise).
type envelope struct {
	z, wx, wy []float64
	cx, cy    []float64
	gx, gy    []float64
}

// sampleEnvelope returns the samples of c that cover [lo, hi] mm (with
// the neighbour outside each end, so lines reach the axes' edges). When
// fewer than [minShown] intervals cover the range, each is divided
// evenly, with w² from its closed form in a homogeneous medium: a
// quadratic in z fitted to the radius and slope d(w²)/dz = 2w²/R at the
// start of the interval and the radius at its end (exact, since samples
// lie at every element), and 1/R from the same quadratic; Gouy phases are
// interpolated linearly. Without curvatures w is interpolated linearly.
// The result is empty when [lo, hi] misses the samples.
func sampleEnvelope(c beam.Caustic, lo, hi float64, gouy bool) envelope {
	n := len(c.Z)
	var e envelope
	if n < 2 || hi < c.Z[0].Millimeters() || lo > c.Z[n-1].Millimeters() {
		return e
	}
	i0, i1 := 0, n-1
	for i0+1 < n && c.Z[i0+1].Millimeters() <= lo {
		i0++
	}
	for i1-1 >= 0 && c.Z[i1-1].Millimeters() >= hi {
		i1--
	}
	if i1 <= i0 {
		i1 = min(i0+1, n-1)
		i0 = i1 - 1
	}
	k := 1
	if iv := i1 - i0; iv < minShown {
		k = min(1000, (minShown+iv-1)/iv)
	}
	hasC := len(c.Curvature) == n && (c.WY == nil || len(c.CurvatureY) == n)
	var gouyX, gouyY []units.Angle
	if gouy {
		gouyX, gouyY = c.GouyPhase()
	}
	hasG := len(gouyX) == n
	curvY := c.Curvature
	if c.WY != nil {
		curvY = c.CurvatureY
	}
	push := func(z, wx, wy, cx, cy, gx, gy float64) {
		e.z, e.wx, e.wy = append(e.z, z*1e3), append(e.wx, wx*1e3), append(e.wy, wy*1e3)
		if hasC {
			e.cx, e.cy = append(e.cx, cx), append(e.cy, cy)
		}
		if hasG {
			e.gx, e.gy = append(e.gx, gx), append(e.gy, gy)
		}
	}
	at := func(i int) (z, wx, wy, cx, cy, gx, gy float64) {
		z, wx, wy = float64(c.Z[i]), float64(c.W[i]), float64(wyAt(c, i))
		if hasC {
			cx, cy = c.Curvature[i], curvY[i]
		}
		if hasG {
			gx, gy = float64(gouyX[i]), float64(gouyY[i])
		}
		return
	}
	for i := i0; i < i1; i++ {
		z0, wx0, wy0, cx0, cy0, gx0, gy0 := at(i)
		z1, wx1, wy1, _, _, gx1, gy1 := at(i + 1)
		push(z0, wx0, wy0, cx0, cy0, gx0, gy0)
		h := z1 - z0
		if !(h > 0) {
			continue
		}
		for j := 1; j < k; j++ {
			t := h * float64(j) / float64(k)
			f := t / h
			wx, cx := between(wx0, cx0, wx1, t, h, hasC)
			wy, cy := between(wy0, cy0, wy1, t, h, hasC)
			push(z0+t, wx, wy, cx, cy, gx0+(gx1-gx0)*f, gy0+(gy1-gy0)*f)
		}
	}
	push(at(i1))
	return e
}

// between returns w and 1/R at t (m) into an interval of length h from a
// sample (w0, 1/R = c0) to one of radius w1: from the quadratic w²(t) =
// w0² + 2w0²c0·t + a·t² through w1² at t = h, or linear in w without
// curvature. A non-positive w² (rounding) gives the linear value.
func between(w0, c0, w1, t, h float64, hasC bool) (w, curv float64) {
	if !hasC {
		return w0 + (w1-w0)*t/h, 0
	}
	a0, b := w0*w0, 2*w0*w0*c0
	a := (w1*w1 - a0 - b*h) / (h * h)
	w2 := a0 + t*(b+t*a)
	if !(w2 > 0) {
		return w0 + (w1-w0)*t/h, c0
	}
	return math.Sqrt(w2), (b + 2*a*t) / (2 * w2)
}

// xys pairs e's z with v.
func (e envelope) xys(v []float64) plotter.XYs {
	out := make(plotter.XYs, len(e.z))
	for i := range e.z {
		out[i] = plotter.XY{X: e.z[i], Y: v[i]}
	}
	return out
}

// astigmatic reports whether the x and y radii differ anywhere.
func (e envelope) astigmatic() bool {
	for i := range e.z {
		if math.Abs(e.wy[i]-e.wx[i]) > 1e-9*math.Max(e.wx[i], e.wy[i]) {
			return true
		}
	}
	return false
}

// maxIn returns the largest radius (mm) at points inside [lo, hi] mm, or,
// when no point lies inside, at the points found.
func (e envelope) maxIn(lo, hi float64) float64 {
	m, any := 0.0, false
	for i, z := range e.z {
		if z >= lo && z <= hi {
			m, any = math.Max(m, math.Max(e.wx[i], e.wy[i])), true
		}
	}
	if !any {
		for i := range e.z {
			m = math.Max(m, math.Max(e.wx[i], e.wy[i]))
		}
	}
	return m
}
