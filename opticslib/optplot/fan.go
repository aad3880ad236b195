package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/paraxial"
)

// Fan colours, cycled per fan: the package's teal, ochre and plum, then a
// moss green and a brick red.
var layFanColors = []color.NRGBA{
	{R: 0x2e, G: 0x5e, B: 0x6e, A: 0xff},
	{R: 0xb0, G: 0x7a, B: 0x3a, A: 0xff},
	{R: 0x78, G: 0x60, B: 0x8c, A: 0xff},
	{R: 0x5f, G: 0x7f, B: 0x3f, A: 0xff},
	{R: 0xa4, G: 0x52, B: 0x3f, A: 0xff},
}

// ErrFanLines is wrapped by the error of [NewFanLines] for a ray with a
// non-finite position or height.
var ErrFanLines = errors.New("optplot: ray fan contains a non-finite position or height")

// FanPaths is one fan prepared for drawing, in mm.
type FanPaths struct {
	// Label names the fan in the legend, for example "y = 5 mm".
	Label string
	// Paths holds each ray's polyline (z, y) in mm, cut at the element
	// that blocks it.
	Paths []plotter.XYs
	// Blocked reports, per path, whether the ray was stopped by a clear
	// aperture; its last point is then the blocking plane.
	Blocked []bool
	// elems holds, per path and point, the element index of the step.
	elems [][]int
}

// FanLines is a plotter that draws ray fans as thin polylines, one colour per
// fan; a ray stopped by a clear aperture ends in a small cross. Create it
// with [NewFanLines].
type FanLines struct {
	// Fans holds the fans in order.
	Fans []FanPaths
	// Width is the line width (default 0.7 pt).
	Width vg.Length
}

var (
	_ plot.Plotter     = (*FanLines)(nil)
	_ plot.DataRanger  = (*FanLines)(nil)
	_ plot.Thumbnailer = (*FanLines)(nil)
)

// layFanLabel describes the field point of f.
func layFanLabel(f paraxial.Fan) string {
	switch {
	case f.Field.Angle != 0:
		return "field " + strconv.FormatFloat(f.Field.Angle.Degrees(), 'f', 2, 64) + "°"
	case f.Field.Height != 0:
		return "y = " + strconv.FormatFloat(f.Field.Height.Millimeters(), 'g', 4, 64) + " mm"
	}
	return "on axis"
}

// NewFanLines converts traced fans to a [FanLines] plotter. Each ray is drawn up
// to and including the first step flagged Blocked. It returns a
// [*ParamError] wrapping [ErrFanLines] if a position or height is not
// finite.
func NewFanLines(fans []paraxial.Fan) (*FanLines, error) {
	r := &FanLines{Width: vg.Points(0.7)}
	for fi, f := range fans {
		fp := FanPaths{Label: layFanLabel(f)}
		for ri, steps := range f.Rays {
			xy := make(plotter.XYs, 0, len(steps))
			el := make([]int, 0, len(steps))
			blocked := false
			for _, s := range steps {
				z, y := s.Z.Millimeters(), s.Ray.Y.Millimeters()
				if !layFinite(z, y) {
					return nil, &ParamError{Func: "NewFanLines", Param: "fan " + strconv.Itoa(fi+1) + " ray " + strconv.Itoa(ri+1) + " step (z, y)",
						Value: s.Z.String() + ", " + s.Ray.Y.String(), Reason: "must be finite", Err: ErrFanLines}
				}
				xy = append(xy, plotter.XY{X: z, Y: y})
				el = append(el, s.Element)
				if s.Blocked {
					blocked = true
					break
				}
			}
			fp.Paths = append(fp.Paths, xy)
			fp.Blocked = append(fp.Blocked, blocked)
			fp.elems = append(fp.elems, el)
		}
		r.Fans = append(r.Fans, fp)
	}
	return r, nil
}

// style returns the line style of fan i.
func (r *FanLines) style(i int) draw.LineStyle {
	w := r.Width
	if w == 0 {
		w = vg.Points(0.7)
	}
	return draw.LineStyle{Color: layFanColors[i%len(layFanColors)], Width: w}
}

// maxHeights returns, per element index < n, the largest |y| of the drawn
// rays at that element, in mm.
func (r *FanLines) maxHeights(n int) []float64 {
	out := make([]float64, n)
	for _, f := range r.Fans {
		for k, p := range f.Paths {
			for j, pt := range p {
				if e := f.elems[k][j]; e >= 0 && e < n {
					out[e] = math.Max(out[e], math.Abs(pt.Y))
					// A step after a space is also the entrance of the
					// next element.
					if e+1 < n {
						out[e+1] = math.Max(out[e+1], math.Abs(pt.Y))
					}
				}
			}
		}
	}
	return out
}

// Plot implements plot.Plotter.
func (r *FanLines) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	for i, f := range r.Fans {
		sty := r.style(i)
		for k, p := range f.Paths {
			pts := make([]vg.Point, len(p))
			for j, q := range p {
				pts[j] = vg.Point{X: trX(q.X), Y: trY(q.Y)}
			}
			c.StrokeLines(sty, c.ClipLinesXY(pts)...)
			if f.Blocked[k] && len(pts) > 0 {
				e := pts[len(pts)-1]
				if c.Contains(e) {
					d := vg.Points(2.2)
					x := draw.LineStyle{Color: sty.Color, Width: vg.Points(0.9)}
					c.StrokeLine2(x, e.X-d, e.Y-d, e.X+d, e.Y+d)
					c.StrokeLine2(x, e.X-d, e.Y+d, e.X+d, e.Y-d)
				}
			}
		}
	}
}

// DataRange implements plot.DataRanger over every drawn point, in mm.
func (r *FanLines) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, ymin = math.Inf(1), math.Inf(1)
	xmax, ymax = math.Inf(-1), math.Inf(-1)
	for _, f := range r.Fans {
		for _, p := range f.Paths {
			for _, q := range p {
				xmin, xmax = math.Min(xmin, q.X), math.Max(xmax, q.X)
				ymin, ymax = math.Min(ymin, q.Y), math.Max(ymax, q.Y)
			}
		}
	}
	if xmin > xmax {
		return 0, 1, -1, 1
	}
	return xmin, xmax, ymin, ymax
}

// Thumbnail implements plot.Thumbnailer with a short line in the first
// fan's colour.
func (r *FanLines) Thumbnail(c *draw.Canvas) {
	(&layFanThumb{r.style(0)}).Thumbnail(c)
}

// layFanThumb is the legend entry of one fan: two converging strokes.
type layFanThumb struct{ sty draw.LineStyle }

// Thumbnail implements plot.Thumbnailer.
func (f *layFanThumb) Thumbnail(c *draw.Canvas) {
	y := (c.Min.Y + c.Max.Y) / 2
	h := (c.Max.Y - c.Min.Y) / 3
	c.StrokeLine2(f.sty, c.Min.X, y+h, c.Max.X, y-h/3)
	c.StrokeLine2(f.sty, c.Min.X, y-h, c.Max.X, y+h/3)
}
