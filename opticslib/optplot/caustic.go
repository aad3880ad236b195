package optplot

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Axis labels of the caustic plot.
const (
	XLabel = "axial position z (mm)"
	YLabel = "beam radius ±w (mm)"
)

// Option configures [Caustic].
type Option func(*config)

type config struct {
	title   string
	band    bool
	labels  bool
	waists  bool
	rays    []paraxial.Ray
	minT    float64
	badMinT bool
}

// Title sets the plot title. The default is "Gaussian beam caustic".
func Title(s string) Option { return func(c *config) { c.title = s } }

// Band controls the pale fill between −w and +w of the x plane (default
// on).
func Band(on bool) Option { return func(c *config) { c.band = on } }

// ElementLabels controls the text above the element bars (default on).
func ElementLabels(on bool) Option { return func(c *config) { c.labels = on } }

// WaistNotes controls the annotation of every real waist with its radius
// and position (default on).
func WaistNotes(on bool) Option { return func(c *config) { c.waists = on } }

// Rays overlays paraxial rays of the tangential (x) plane on the same
// axes: each ray, given at the input plane (height in metres, angle in
// radians), is traced with [paraxial.System.MatrixTo] to every sample
// position of the caustic. A fan of a few rays from an object point shows
// where geometric optics puts the image, next to the beam's own waist.
func Rays(rays ...paraxial.Ray) Option {
	return func(c *config) { c.rays = append([]paraxial.Ray(nil), rays...) }
}

// MinTransmission sets the transmitted fraction below which an element's
// clear aperture is drawn as clipping the beam (default
// [beam.DefaultMinTransmission], 99 %); t must lie in (0, 1].
func MinTransmission(t float64) Option {
	return func(c *config) {
		if !(t > 0 && t <= 1) {
			c.badMinT = true
			return
		}
		c.minT = t
	}
}

// farStop is the aperture radius, in units of the largest beam radius,
// beyond which a passing stop is not drawn.
const farStop = 2.0

// ErrCaustic is returned by [Caustic] for an empty or inconsistent caustic.
var ErrCaustic = errors.New("optplot: caustic needs at least 2 samples with matching Z, W and WY lengths and finite values")

// ErrOption is returned by [Caustic] for an invalid option value.
var ErrOption = errors.New("optplot: MinTransmission must lie in (0, 1]")

// Caustic returns a plot of the beam envelope ±w(z) of c, in mm against z
// in mm, with the zero-thickness elements of sys marked at their positions
// and every real waist (c.Foci, c.FociY) annotated with its radius and
// position (see the package documentation for the look). When the y
// envelope differs from the x envelope it is drawn dashed, with a legend.
// c is usually the result of [beam.Sample] for the same sys.
//
// Clear apertures are drawn as stops at the edges of the opening in x on
// the element bars, and tubes (apertures on spaces) as lines along the
// gap; one is drawn in the warning colour when it passes less than its
// threshold: the opening's own, or the [MinTransmission] option (the
// results of [beam.Caustic.Clipping], for a c made by [beam.Sample]). A
// stop that passes and lies beyond twice the largest beam radius is left
// out, so that wide optics do not squash the envelope.
//
// It returns [ErrCaustic] if c has fewer than two points, the slices
// differ in length, or a value is not finite, and [ErrOption] for a bad
// option.
func Caustic(c beam.Caustic, sys paraxial.System, opts ...Option) (*plot.Plot, error) {
	cfg := config{title: "Gaussian beam caustic", band: true, labels: true, waists: true, minT: beam.DefaultMinTransmission}
	for _, o := range opts {
		o(&cfg)
	}
	if cfg.badMinT {
		return nil, ErrOption
	}
	n := len(c.Z)
	if n < 2 || len(c.W) != n || (c.WY != nil && len(c.WY) != n) {
		return nil, ErrCaustic
	}
	wy := c.WY
	if wy == nil {
		wy = c.W
	}
	upper, lower := make(plotter.XYs, n), make(plotter.XYs, n)
	upperY, lowerY := make(plotter.XYs, n), make(plotter.XYs, n)
	wmax := 0.0
	astig := false
	for i := range n {
		z, w, v := c.Z[i].Millimeters(), c.W[i].Millimeters(), wy[i].Millimeters()
		if !finite(z) || !finite(w) || !finite(v) {
			return nil, ErrCaustic
		}
		upper[i], lower[i] = plotter.XY{X: z, Y: w}, plotter.XY{X: z, Y: -w}
		upperY[i], lowerY[i] = plotter.XY{X: z, Y: v}, plotter.XY{X: z, Y: -v}
		wmax = math.Max(wmax, math.Max(w, v))
		astig = astig || math.Abs(v-w) > 1e-9*math.Max(w, v)
	}
	if wmax == 0 {
		wmax = 1
	}

	p := plot.New()
	p.Title.Text = cfg.title
	p.X.Label.Text = XLabel
	p.Y.Label.Text = YLabel
	p.Title.TextStyle.Color = labelColor
	p.X.Label.TextStyle.Color = labelColor
	p.Y.Label.TextStyle.Color = labelColor
	p.X.Tick.Label.Color = labelColor
	p.Y.Tick.Label.Color = labelColor
	p.X.Color, p.Y.Color = axisColor, axisColor
	p.X.Tick.Color, p.Y.Tick.Color = axisColor, axisColor

	if cfg.band {
		ring := make(plotter.XYs, 0, 2*n)
		ring = append(ring, upper...)
		for i := n - 1; i >= 0; i-- {
			ring = append(ring, lower[i])
		}
		band, err := plotter.NewPolygon(ring)
		if err != nil {
			return nil, err
		}
		band.Color = bandColor
		band.LineStyle = draw.LineStyle{} // no outline
		p.Add(band)
	}

	axis, err := plotter.NewLine(plotter.XYs{{X: upper[0].X, Y: 0}, {X: upper[n-1].X, Y: 0}})
	if err != nil {
		return nil, err
	}
	axis.LineStyle = draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2.5)}}
	p.Add(axis)

	legend := false
	if len(cfg.rays) > 0 {
		// The transfer matrix to each sample plane is the same for every
		// ray: compute it once, not once per ray.
		ms := make([]paraxial.Matrix, n)
		for i, z := range c.Z {
			m, err := sys.MatrixTo(z, paraxial.Tangential)
			if err != nil {
				return nil, err
			}
			ms[i] = m
		}
		var first *plotter.Line
		for _, r := range cfg.rays {
			xys := make(plotter.XYs, n)
			for i, m := range ms {
				y := float64(m.Apply(r).Y) * 1e3
				if !finite(y) {
					return nil, ErrCaustic
				}
				xys[i] = plotter.XY{X: c.Z[i].Millimeters(), Y: y}
			}
			l, err := plotter.NewLine(xys)
			if err != nil {
				return nil, err
			}
			l.LineStyle = draw.LineStyle{Color: rayColor, Width: vg.Points(0.7)}
			p.Add(l)
			if first == nil {
				first = l
			}
		}
		p.Legend.Add("paraxial rays (x)", first)
		legend = true
	}

	var lineX *plotter.Line
	for _, xys := range []plotter.XYs{upper, lower} {
		l, err := plotter.NewLine(xys)
		if err != nil {
			return nil, err
		}
		l.LineStyle = draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
		p.Add(l)
		lineX = l
	}
	if astig {
		var lineY *plotter.Line
		for _, xys := range []plotter.XYs{upperY, lowerY} {
			l, err := plotter.NewLine(xys)
			if err != nil {
				return nil, err
			}
			l.LineStyle = draw.LineStyle{Color: yColor, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
			p.Add(l)
			lineY = l
		}
		p.Legend.Add("x (tangential)", lineX)
		p.Legend.Add("y (sagittal)", lineY)
		legend = true
	}
	if legend {
		// Put the key on the side where the beam is narrower.
		q := n / 4
		left, right := 0.0, 0.0
		for i := range q {
			left = math.Max(left, math.Max(upper[i].Y, upperY[i].Y))
			right = math.Max(right, math.Max(upper[n-1-i].Y, upperY[n-1-i].Y))
		}
		p.Legend.Left = left < right
		p.Legend.Top = true
		p.Legend.TextStyle.Font.Size = vg.Points(7.5)
		p.Legend.TextStyle.Color = labelColor
		p.Legend.ThumbnailWidth = vg.Points(18)
		p.Legend.Padding = vg.Points(1)
	}

	marks, err := NewMarks(sys, 1.15*wmax)
	if err != nil {
		return nil, err
	}
	// Clipping results by element, when c knows its system and beam.
	clips := map[int]beam.Clip{}
	if cl, err := c.Clipping(cfg.minT); err == nil {
		for _, k := range cl {
			clips[k.Element] = k
		}
	}
	for i := range marks.Marks {
		mk := &marks.Marks[i]
		if !cfg.labels {
			mk.Label = ""
		}
		if !mk.Stop {
			continue
		}
		if k, ok := clips[mk.Element]; ok && k.Low {
			mk.Clipped = true
			if mk.Label != "" {
				mk.Label += " · passes " + below(k.Transmission, k.MinTransmission)
			}
		}
		// A stop far outside the beam would only squash the envelope:
		// draw a default-height bar instead.
		if !mk.Clipped && mk.half() > farStop*wmax {
			mk.Stop, mk.Low, mk.High = false, -1.15*wmax, 1.15*wmax
		}
	}
	tubes := marks.Tubes[:0]
	for _, tb := range marks.Tubes {
		if k, ok := clips[tb.Element]; ok && k.Low {
			tb.Clipped = true
		}
		if !tb.Clipped && math.Max(math.Abs(tb.Low), math.Abs(tb.High)) > farStop*wmax {
			continue
		}
		tubes = append(tubes, tb)
	}
	marks.Tubes = tubes
	if len(marks.Marks)+len(marks.Tubes) > 0 {
		p.Add(marks)
	}

	var notes *waistNotes
	if cfg.waists {
		notes = newWaistNotes(c, astig, upper[0].X, upper[n-1].X)
		if len(notes.notes) > 0 {
			p.Add(notes)
		}
	}
	// Symmetric y range with head-room for the element labels above and
	// the waist notes below.
	room := 1.4
	if legend {
		room = 1.7
	}
	ymax := room * math.Max(wmax, marks.maxHalfHeight())
	p.Y.Min, p.Y.Max = -ymax, ymax
	p.X.Min, p.X.Max = upper[0].X, upper[n-1].X
	if p.X.Min == p.X.Max {
		p.X.Max = p.X.Min + 1
	}
	return p, nil
}

// below formats the transmitted fraction t < threshold as a percentage
// with one decimal, or more (up to four) when one decimal would round it
// up to the threshold or beyond: 0.98996 against 99 % reads "98.996 %",
// not "99.0 %".
func below(t, threshold float64) string {
	prec := 1
	s := strconv.FormatFloat(100*t, 'f', prec, 64)
	for prec < 4 {
		if v, err := strconv.ParseFloat(s, 64); err == nil && v < 100*threshold {
			break
		}
		prec++
		s = strconv.FormatFloat(100*t, 'f', prec, 64)
	}
	return s + " %"
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// note is one waist annotation, in plot units (mm).
type note struct {
	z, w0 float64
	text  string
	y     bool // a y-plane waist of an astigmatic beam
}

// waistNotes draws a short bar at ±w0 of each real waist, a dotted leader
// down to the bottom of the plot and a one-line label there, for example
// "w₀ 16.9 µm @ 99.99 mm".
type waistNotes struct {
	notes []note
	style text.Style
}

var (
	_ plot.Plotter     = (*waistNotes)(nil)
	_ plot.DataRanger  = (*waistNotes)(nil)
	_ plot.Thumbnailer = (*waistNotes)(nil)
)

// DataRange implements plot.DataRanger: the waist positions and ±w0, in
// mm; the unit range (0, 1, −1, 1) without notes.
func (wn *waistNotes) DataRange() (xmin, xmax, ymin, ymax float64) {
	return barRange(len(wn.notes), func(i int) (float64, float64) { return wn.notes[i].z, wn.notes[i].w0 })
}

// Thumbnail implements plot.Thumbnailer with the two short waist bars.
func (wn *waistNotes) Thumbnail(c *draw.Canvas) {
	bar := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.2)}
	x := (c.Min.X + c.Max.X) / 2
	d := (c.Max.X - c.Min.X) / 4
	c.StrokeLine2(bar, x-d, c.Max.Y, x+d, c.Max.Y)
	c.StrokeLine2(bar, x-d, c.Min.Y, x+d, c.Min.Y)
}

func newWaistNotes(c beam.Caustic, astig bool, zmin, zmax float64) *waistNotes {
	wn := &waistNotes{style: text.Style{Color: labelColor, XAlign: draw.XCenter, YAlign: draw.YBottom, Handler: plot.DefaultTextHandler}}
	add := func(fs []beam.Focus, prefix string, y bool) {
		for _, f := range fs {
			z := f.Z.Millimeters()
			// The input waist at the very start of the path is the
			// source; it is described elsewhere and would clip.
			if z <= zmin+1e-9*(zmax-zmin) || z >= zmax {
				continue
			}
			// A waist just behind a lens placed at a waist repeats the
			// one just before it at plot resolution: keep one.
			if k := len(wn.notes); k > 0 {
				last := wn.notes[k-1]
				if last.y == y && math.Abs(last.z-z) < 2e-3*(zmax-zmin) && math.Abs(last.w0-f.Radius.Millimeters()) < 0.01*last.w0 {
					continue
				}
			}
			wn.notes = append(wn.notes, note{z: z, w0: f.Radius.Millimeters(), text: prefix + "w₀ " + short(f.Radius) + " @ " + strconv.FormatFloat(z, 'f', 1, 64) + " mm", y: y})
		}
	}
	if astig {
		add(c.Foci, "x ", false)
		add(c.FociY, "y ", true)
		// Merge into position order (both lists are sorted).
		for i := 1; i < len(wn.notes); i++ {
			for j := i; j > 0 && wn.notes[j].z < wn.notes[j-1].z; j-- {
				wn.notes[j], wn.notes[j-1] = wn.notes[j-1], wn.notes[j]
			}
		}
	} else {
		add(c.Foci, "", false)
	}
	return wn
}

// Plot implements plot.Plotter.
func (wn *waistNotes) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	sty := withFont(wn.style, plt, 7.5)
	lineH := sty.FontExtents().Height
	base := c.Min.Y + vg.Points(3)
	tick := vg.Points(3.5)
	leader := draw.LineStyle{Color: axisColor, Width: vg.Points(0.5), Dashes: []vg.Length{vg.Points(1), vg.Points(1.5)}}
	var rows []vg.Length // right edge of the last label in each row
	for _, n := range wn.notes {
		x := trX(n.z)
		if !c.ContainsX(x) {
			continue
		}
		col := envelopeColor
		if n.y {
			col = yColor
		}
		bar := draw.LineStyle{Color: col, Width: vg.Points(1.2)}
		top, bot := trY(n.w0), trY(-n.w0)
		c.StrokeLine2(bar, x-tick, top, x+tick, top)
		c.StrokeLine2(bar, x-tick, bot, x+tick, bot)
		w := sty.Width(n.text)
		// Keep the label inside the data area horizontally.
		// (A margin of 15 % covers renderers that substitute a wider
		// font, and glyphs such as ₀ taken from a fallback font.)
		lx := x
		margin := vg.Points(2) + 0.15*w
		if lx-w/2 < c.Min.X+vg.Points(2) {
			lx = c.Min.X + vg.Points(2) + w/2
		}
		if lx+w/2 > c.Max.X-margin {
			lx = c.Max.X - margin - w/2
		}
		row := 0
		for row < len(rows) && lx-w/2 < rows[row]+vg.Points(4) {
			row++
		}
		if row == len(rows) {
			rows = append(rows, 0)
		}
		rows[row] = lx + w/2
		y := base + vg.Length(row)*lineH
		c.StrokeLine2(leader, x, bot-vg.Points(1), x, y+lineH)
		s := sty
		s.Color = col
		c.FillText(s, vg.Point{X: lx, Y: y}, n.text)
	}
}

// SVG renders p as an SVG document of the given size (for example
// 16*vg.Centimeter by 9*vg.Centimeter). Rendering the same plot twice gives
// identical bytes. It returns an error if a size is not positive and finite.
//
// It draws on a vgsvg canvas directly rather than through p.WriterTo, which
// would link every gonum/plot back end (PDF, EPS, TeX, raster images) into
// each notebook cell; the SVG bytes are the same.
func SVG(p *plot.Plot, width, height vg.Length) ([]byte, error) {
	if !(width > 0 && height > 0) || math.IsInf(float64(width), 0) || math.IsInf(float64(height), 0) {
		return nil, fmt.Errorf("optplot: SVG size %v × %v: must be positive and finite", width, height)
	}
	c := vgsvg.NewWith(vgsvg.UseWH(width, height))
	p.Draw(draw.New(c))
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// short formats a length with three significant digits in µm below 1 mm
// and in mm otherwise, for example "16.9 µm" and "1.25 mm".
func short(l units.Length) string {
	if math.Abs(float64(l)) < 1e-3 {
		return strconv.FormatFloat(l.Micrometers(), 'g', 3, 64) + " µm"
	}
	return strconv.FormatFloat(l.Millimeters(), 'g', 3, 64) + " mm"
}
