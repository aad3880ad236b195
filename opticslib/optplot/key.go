package optplot

import (
	"image/color"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

var (
	whiteColor = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xff}
	keyBack    = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xe0} // behind the key, mostly opaque
)

// scene collects, while one plot draws, the canvas rectangles that its
// labels occupy, so that the key, drawn last, can avoid them. Each figure
// has its own; nothing is shared between plots.
type scene struct{ taken []vg.Rectangle }

// take records r as occupied; a nil scene records nothing.
func (s *scene) take(r vg.Rectangle) {
	if s != nil {
		s.taken = append(s.taken, r)
	}
}

// keyEntry is one line of the key: a line sample (and a pale fill behind
// it when fill is not nil, a dot on it when dot is not nil, a ring when
// ring is set too) followed by the text.
type keyEntry struct {
	text string
	line draw.LineStyle
	fill color.Color
	dot  color.Color
	ring bool
}

// keyBox draws the figure's key: line entries, then note lines (text
// only, wrapped to half the plot width). It is placed in the corner of
// the data area (or, with middle, its centre or the middle of its
// bottom) where it covers the fewest labels and data points.
type keyBox struct {
	entries []keyEntry
	notes   []string
	// noteColor is the colour of the note lines (labelColor when nil).
	noteColor color.Color
	avoid     []plotter.XYs // data to keep clear, plot units
	scene     *scene
	// middle adds the centre of the data area and the middle of its
	// bottom edge to the places tried after the corners (a figure whose
	// data hug the edges, or peak in the middle).
	middle bool
}

var _ plot.Plotter = (*keyBox)(nil)

func (k *keyBox) empty() bool { return len(k.entries) == 0 && len(k.notes) == 0 }

// wrap splits s into lines no wider than w in style sty, at spaces.
func wrap(sty text.Style, s string, w vg.Length) []string {
	var lines []string
	cur := ""
	for _, word := range strings.Fields(s) {
		try := word
		if cur != "" {
			try = cur + " " + word
		}
		if cur != "" && sty.Width(try) > w {
			lines = append(lines, cur)
			cur = word
			continue
		}
		cur = try
	}
	if cur != "" {
		lines = append(lines, cur)
	}
	return lines
}

// Plot implements plot.Plotter.
func (k *keyBox) Plot(c draw.Canvas, plt *plot.Plot) {
	if k.empty() {
		return
	}
	trX, trY := plt.Transforms(&c)
	sty := withFont(text.Style{Color: labelColor, XAlign: draw.XLeft, YAlign: draw.YBottom, Handler: plot.DefaultTextHandler}, plt, 7.5)
	lineH := sty.FontExtents().Height
	thumb := vg.Points(18)
	gap := vg.Points(4)
	pad := vg.Points(3)
	maxNote := (c.Max.X - c.Min.X) * 0.55
	var notes []string
	for _, n := range k.notes {
		notes = append(notes, wrap(sty, n, maxNote)...)
	}
	var w vg.Length
	for _, e := range k.entries {
		w = max(w, thumb+gap+sty.Width(e.text)*1.1)
	}
	for _, n := range notes {
		w = max(w, sty.Width(n)*1.1)
	}
	w += 2 * pad
	h := vg.Length(len(k.entries)+len(notes))*lineH + 2*pad
	inset := vg.Points(4)
	corners := []vg.Point{
		{X: c.Max.X - inset - w, Y: c.Max.Y - inset - h}, // top right
		{X: c.Min.X + inset, Y: c.Max.Y - inset - h},     // top left
		{X: c.Max.X - inset - w, Y: c.Min.Y + inset},     // bottom right
		{X: c.Min.X + inset, Y: c.Min.Y + inset},         // bottom left
	}
	if k.middle {
		mid := (c.Min.X + c.Max.X - w) / 2
		corners = append(corners, vg.Point{X: mid, Y: (c.Min.Y + c.Max.Y - h) / 2}, vg.Point{X: mid, Y: c.Min.Y + inset})
	}
	// Score each corner: area of labels covered, plus 40 pt² per data
	// point covered; the first corner with the lowest score wins.
	best, bestScore := 0, -1.0
	for i, o := range corners {
		r := vg.Rectangle{Min: o, Max: vg.Point{X: o.X + w, Y: o.Y + h}}
		score := 0.0
		if k.scene != nil {
			for _, t := range k.scene.taken {
				score += overlapArea(r, t)
			}
		}
		for _, xys := range k.avoid {
			for _, p := range xys {
				x, y := trX(p.X), trY(p.Y)
				if x >= r.Min.X && x <= r.Max.X && y >= r.Min.Y && y <= r.Max.Y {
					score += 40
				}
			}
		}
		if bestScore < 0 || score < bestScore {
			best, bestScore = i, score
		}
	}
	o := corners[best]
	r := vg.Rectangle{Min: o, Max: vg.Point{X: o.X + w, Y: o.Y + h}}
	c.FillPolygon(keyBack, []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}})
	y := r.Max.Y - pad - lineH
	for _, e := range k.entries {
		mid := y + lineH/2 - vg.Points(1)
		x0 := r.Min.X + pad
		if e.fill != nil {
			c.FillPolygon(e.fill, []vg.Point{{X: x0, Y: mid - vg.Points(3)}, {X: x0 + thumb, Y: mid - vg.Points(3)}, {X: x0 + thumb, Y: mid + vg.Points(3)}, {X: x0, Y: mid + vg.Points(3)}})
		}
		if e.line.Width > 0 {
			c.StrokeLine2(e.line, x0, mid, x0+thumb, mid)
		}
		if e.dot != nil {
			var shape draw.GlyphDrawer = draw.CircleGlyph{}
			if e.ring {
				shape = draw.RingGlyph{}
			}
			c.DrawGlyph(draw.GlyphStyle{Color: e.dot, Radius: vg.Points(3), Shape: shape}, vg.Point{X: x0 + thumb/2, Y: mid})
		}
		c.FillText(sty, vg.Point{X: x0 + thumb + gap, Y: y}, e.text)
		y -= lineH
	}
	ns := sty
	if k.noteColor != nil {
		ns.Color = k.noteColor
	}
	for _, n := range notes {
		c.FillText(ns, vg.Point{X: r.Min.X + pad, Y: y}, n)
		y -= lineH
	}
	// The key is drawn last: forget this drawing's labels, so that the
	// next rendering of the same plot starts afresh (same bytes).
	if k.scene != nil {
		k.scene.taken = k.scene.taken[:0]
	}
}

// overlapArea returns the area (pt²) common to a and b.
func overlapArea(a, b vg.Rectangle) float64 {
	w := min(a.Max.X, b.Max.X) - max(a.Min.X, b.Min.X)
	h := min(a.Max.Y, b.Max.Y) - max(a.Min.Y, b.Min.Y)
	if w <= 0 || h <= 0 {
		return 0
	}
	return float64(w * h)
}

// thin returns at most n points of xys, evenly picked (all when shorter).
func thin(xys plotter.XYs, n int) plotter.XYs {
	if len(xys) <= n {
		return xys
	}
	out := make(plotter.XYs, 0, n)
	for i := range n {
		out = append(out, xys[i*(len(xys)-1)/(n-1)])
	}
	return out
}
