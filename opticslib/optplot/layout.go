package optplot

import (
	"errors"
	"image/color"
	"math"
	"sort"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Axis labels of the layout plot.
const (
	LayoutXLabel = "axial position z (mm)"
	LayoutYLabel = "height y (mm)"
)

// Layout palette (sRGB), this package's own: pale mineral glass with a
// slate outline, charcoal screens, an ochre accent for the stop.
var (
	layGlassFill   = color.NRGBA{R: 0xd9, G: 0xe6, B: 0xe3, A: 0xff}
	layGlassEdge   = color.NRGBA{R: 0x3f, G: 0x5a, B: 0x63, A: 0xff}
	layScreenColor = color.NRGBA{R: 0x3a, G: 0x3a, B: 0x3a, A: 0xff}
	layStopColor   = color.NRGBA{R: 0xb0, G: 0x7a, B: 0x3a, A: 0xff}
	layMirrorColor = color.NRGBA{R: 0x55, G: 0x4a, B: 0x6e, A: 0xff}
	layPupilColor  = color.NRGBA{R: 0x8a, G: 0x6a, B: 0x30, A: 0xff}
	layLabelColor  = color.NRGBA{R: 0x55, G: 0x55, B: 0x55, A: 0xff}
)

// LayoutOption configures [Layout].
type LayoutOption func(*layoutConfig)

type layoutConfig struct {
	title      string
	z0, z1     float64 // mm; z0 == z1 means automatic
	halfHeight float64 // mm; 0 means automatic
	stops      *paraxial.Stops
	labels     bool
	width      vg.Length
	height     vg.Length
	caption    string
	captionSet bool
	err        error
}

// fail records the first bad option.
func (c *layoutConfig) fail(fn, param string, v any, reason string) {
	if c.err == nil {
		c.err = &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrLayout}
	}
}

// LayoutSize sets the figure's width and height (vg units, each
// positive, finite and at most 200 cm). The default is [DefaultWidth] ×
// [DefaultHeight].
func LayoutSize(w, h vg.Length) LayoutOption {
	return func(c *layoutConfig) {
		for _, d := range []struct {
			name string
			v    vg.Length
		}{{"width", w}, {"height", h}} {
			if checkSize("LayoutSize", d.name, d.v) != nil {
				c.fail("LayoutSize", d.name, cm(d.v), "must be positive, finite and at most 200 cm")
				return
			}
		}
		c.width, c.height = w, h
	}
}

// LayoutCaption sets the figure's caption (default: the title).
func LayoutCaption(s string) LayoutOption {
	return func(c *layoutConfig) { c.caption, c.captionSet = s, true }
}

// LayoutTitle sets the title of the layout plot (default "System layout").
func LayoutTitle(s string) LayoutOption { return func(c *layoutConfig) { c.title = s } }

// LayoutRange sets the axial range drawn, from z0 to z1 (metres, finite,
// z0 < z1). The default spans the system and every ray of the fans.
func LayoutRange(z0, z1 units.Length) LayoutOption {
	return func(c *layoutConfig) {
		if !finite(float64(z0)) || !finite(float64(z1)) || !(z0 < z1) {
			c.fail("LayoutRange", "range z0 … z1", z0.String()+" … "+z1.String(), "must be finite with z0 < z1")
			return
		}
		c.z0, c.z1 = z0.Millimeters(), z1.Millimeters()
	}
}

// LayoutHalfHeight sets the semi-diameter (metres, > 0) drawn for
// elements without a clear aperture. The default is 1.2 times the largest
// ray height of the fans at the element, or 10 mm without fans.
func LayoutHalfHeight(h units.Length) LayoutOption {
	return func(c *layoutConfig) {
		if !(h > 0) || !finite(float64(h)) {
			c.fail("LayoutHalfHeight", "half height", h.String(), "must be positive and finite")
			return
		}
		c.halfHeight = h.Millimeters()
	}
}

// LayoutStops marks the aperture stop and the pupils found by
// [paraxial.System.Stops].
func LayoutStops(a paraxial.Stops) LayoutOption {
	return func(c *layoutConfig) { c.stops = &a }
}

// LayoutLabels controls the element labels under the drawing (default on).
func LayoutLabels(on bool) LayoutOption { return func(c *layoutConfig) { c.labels = on } }

// ErrLayout is wrapped by the errors of [Layout] and [NewOutline] for an
// empty system, a bad range or a bad half height.
var ErrLayout = errors.New("optplot: layout needs a non-empty system, a finite range z0 < z1 and a positive finite half height")

// Layout returns a to-scale drawing of sys with the ray fans traced
// through it (see [paraxial.System.Fan]): optical axis, glass outlined
// from its radii and thicknesses, thin lenses as slim silhouettes, mirrors,
// diaphragms, and, with [LayoutStops], the stop and pupils. Both axes
// are in millimetres; because optical systems are long and thin, the
// vertical scale is usually stretched, and the drawing states the factor
// in its lower left corner. Cylindrical lenses are drawn with a dashed
// outline and labelled "cyl x" or "cyl y" for their power plane. The
// figure is [DefaultWidth] × [DefaultHeight] unless [LayoutSize] says
// otherwise; its caption is the title unless [LayoutCaption] says
// otherwise.
//
// It returns a [*ParamError] wrapping [ErrLayout] for an empty system or
// bad options, and one wrapping [ErrFanLines] for bad fans.
func Layout(sys paraxial.System, fans []paraxial.Fan, opts ...LayoutOption) (Figure, error) {
	cfg := layoutConfig{title: "System layout", labels: true}
	for _, o := range opts {
		if o != nil {
			o(&cfg)
		}
	}
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	rays, err := NewFanLines(fans)
	if err != nil {
		return Figure{}, err
	}
	out, err := newOutline(sys, rays, cfg)
	if err != nil {
		return Figure{}, err
	}
	p := newPlot(cfg.title, LayoutXLabel, LayoutYLabel)
	p.X.Tick.Marker = niceTicks{target: 6}
	p.Y.Tick.Marker = niceTicks{target: 6}
	p.Add(out)
	if len(rays.Fans) > 0 {
		p.Add(rays)
		for i, f := range rays.Fans {
			if f.Label != "" {
				p.Legend.Add(f.Label, &layFanThumb{rays.style(i)})
			}
		}
		p.Legend.Top = true
		p.Legend.TextStyle.Color = labelColor
		p.Legend.TextStyle.Font.Size = vg.Points(8)
		p.Legend.Left = true
		p.Legend.XOffs = vg.Points(6)
		p.Legend.ThumbnailWidth = vg.Points(16)
	}
	xmin, xmax, ymin, ymax := out.DataRange()
	if len(rays.Fans) > 0 {
		a, b, c, d := rays.DataRange()
		xmin, xmax = math.Min(xmin, a), math.Max(xmax, b)
		ymin, ymax = math.Min(ymin, c), math.Max(ymax, d)
	}
	if cfg.z0 != cfg.z1 {
		xmin, xmax = cfg.z0, cfg.z1
	}
	ym := math.Max(math.Abs(ymin), math.Abs(ymax))
	// Margins: 4 % along z so that elements at the ends and their labels
	// stay inside; head-room for labels below and the legend above.
	if cfg.z0 == cfg.z1 {
		pad := 0.04 * (xmax - xmin)
		xmin, xmax = xmin-pad, xmax+pad
	}
	p.X.Min, p.X.Max = xmin, xmax
	p.Y.Min, p.Y.Max = -1.75*ym, 1.45*ym
	out.xmin, out.xmax = xmin, xmax
	f := newFigure(p)
	if cfg.width > 0 {
		f.Width, f.Height = cfg.width, cfg.height
	}
	if cfg.captionSet {
		f.Caption = cfg.caption
	}
	return f, nil
}

// Outline is a plotter that draws the elements of a system to scale, in
// millimetres. Create it with [NewOutline] or through [Layout].
type Outline struct {
	// Parts holds the drawable parts in system order.
	Parts []OutlinePart
	// Axis is the style of the optical axis.
	Axis draw.LineStyle
	// Label is the style of the element labels.
	Label text.Style
	// Note, when not empty, is drawn in the lower left corner; Layout
	// leaves it empty and writes the vertical exaggeration instead.
	Note string

	xmin, xmax float64 // drawn axial range, mm
	scaleNote  bool
	pupils     []layPupil
}

// OutlinePart is one drawable item of an [Outline], in mm.
type OutlinePart struct {
	// Kind is the element kind, or KindThickLens / KindPlate for a glass
	// body.
	Kind paraxial.Kind
	// Z is the axial position (the front vertex of a glass body) and
	// Length its axial extent.
	Z, Length float64
	// HalfHeight is the drawn semi-diameter.
	HalfHeight float64
	// R1 and R2 are the front and back radii (±Inf for flat; R1 only for
	// a single surface or a mirror).
	R1, R2 float64
	// Converging marks a thin or cylindrical lens with f > 0.
	Converging bool
	// Stop marks the aperture stop.
	Stop bool
	// Label is drawn under the part.
	Label string
}

type layPupil struct {
	z, r  float64
	label string
}

var (
	_ plot.Plotter     = (*Outline)(nil)
	_ plot.DataRanger  = (*Outline)(nil)
	_ plot.Thumbnailer = (*Outline)(nil)
)

// NewOutline returns an [Outline] of sys. halfHeight (metres, > 0,
// finite) is the semi-diameter drawn for elements without a clear
// aperture.
func NewOutline(sys paraxial.System, halfHeight units.Length) (*Outline, error) {
	h := halfHeight.Millimeters()
	if !(h > 0) || math.IsInf(h, 0) {
		return nil, &ParamError{Func: "NewOutline", Param: "half height", Value: halfHeight.String(), Reason: "must be positive and finite", Err: ErrLayout}
	}
	return newOutline(sys, &FanLines{}, layoutConfig{halfHeight: h, labels: true})
}

func layFinite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

func newOutline(sys paraxial.System, rays *FanLines, cfg layoutConfig) (*Outline, error) {
	if sys.Len() == 0 {
		return nil, &ParamError{Func: "Layout", Param: "system elements", Value: sys.Len(), Reason: "need a built, non-empty system", Err: ErrLayout}
	}
	elems := sys.Elements()
	stop := -1
	if cfg.stops != nil {
		stop = cfg.stops.Stop
	}
	// Semi-diameter of each element: aperture, else from the rays, else
	// the default.
	semi := make([]float64, len(elems))
	rayMax := rays.maxHeights(len(elems))
	overall := 0.0
	for _, v := range rayMax {
		overall = math.Max(overall, v)
	}
	for i, e := range elems {
		switch {
		case e.Aperture.Limited():
			// The drawn semi-diameter is the part's clear radius: the
			// layout shows the part, not its projection.
			semi[i] = e.Aperture.Radius.Millimeters()
		case cfg.halfHeight > 0:
			semi[i] = cfg.halfHeight
		case rayMax[i] > 0:
			semi[i] = 1.2 * rayMax[i]
		case overall > 0:
			semi[i] = 1.2 * overall
		default:
			semi[i] = 10
		}
	}
	o := &Outline{
		Axis:  draw.LineStyle{Color: axisColor, Width: vg.Points(0.5), Dashes: []vg.Length{vg.Points(7), vg.Points(2), vg.Points(1), vg.Points(2)}},
		Label: text.Style{Color: layLabelColor, XAlign: draw.XCenter, YAlign: draw.YTop, Handler: plot.DefaultTextHandler},
		xmin:  math.Min(0, cfg.z0), xmax: sys.Length().Millimeters(),
		scaleNote: true,
	}
	if !cfg.labels {
		o.Label.Color = color.Transparent
	}
	inComp := make([]bool, len(elems))
	for _, c := range sys.Components() {
		for i := c.First; i <= c.Last; i++ {
			inComp[i] = true
		}
		h := math.Min(semi[c.First], semi[c.Last])
		r1, r2 := float64(c.R1)*1e3, float64(c.R2)*1e3
		h = layFitHalfHeight(h, r1, r2, c.Length.Millimeters())
		part := OutlinePart{Kind: c.Kind, Z: c.Z.Millimeters(), Length: c.Length.Millimeters(), HalfHeight: h, R1: r1, R2: r2, Label: c.Label,
			Stop: stop == c.First || stop == c.Last}
		if c.Kind == paraxial.KindPlate && c.Tilt != 0 {
			part.Label = layJoin(part.Label, strconv.FormatFloat(c.Tilt.Degrees(), 'f', 0, 64)+"°")
		}
		o.Parts = append(o.Parts, part)
	}
	// Media other than the input medium (outside components): shaded
	// between the surfaces that bound them.
	nIn := sys.IndexIn()
	for i, e := range elems {
		if inComp[i] || e.Kind != paraxial.KindSpace || e.IndexIn == nIn || e.Length == 0 {
			continue
		}
		r1, r2 := math.Inf(1), math.Inf(1)
		h := semi[i]
		if i > 0 && elems[i-1].Kind == paraxial.KindSphericalInterface {
			r1, h = elems[i-1].Radius.Millimeters(), math.Min(h, semi[i-1])
		}
		if i+1 < len(elems) && elems[i+1].Kind == paraxial.KindSphericalInterface {
			r2, h = elems[i+1].Radius.Millimeters(), math.Min(h, semi[i+1])
		}
		h = layFitHalfHeight(h, r1, r2, e.Length.Millimeters())
		o.Parts = append(o.Parts, OutlinePart{Kind: paraxial.KindThickLens, Z: e.Z.Millimeters(), Length: e.Length.Millimeters(), HalfHeight: h, R1: r1, R2: r2,
			Label: "n " + strconv.FormatFloat(e.IndexIn, 'g', 4, 64)})
	}
	for i, e := range elems {
		if inComp[i] || e.Kind == paraxial.KindSpace {
			continue
		}
		part := OutlinePart{Kind: e.Kind, Z: e.Z.Millimeters(), HalfHeight: semi[i], R1: math.Inf(1), R2: math.Inf(1), Label: e.Label, Stop: i == stop, Converging: e.Focal > 0}
		switch e.Kind {
		case paraxial.KindSphericalInterface:
			part.R1 = e.Radius.Millimeters()
			part.HalfHeight = math.Min(part.HalfHeight, math.Abs(part.R1))
		case paraxial.KindMirror:
			if e.Radius != 0 {
				part.R1 = e.Radius.Millimeters()
				part.HalfHeight = math.Min(part.HalfHeight, math.Abs(part.R1))
			}
			if e.Tilt != 0 {
				part.Label = layJoin(part.Label, strconv.FormatFloat(e.Tilt.Degrees(), 'f', 0, 64)+"°")
			}
		case paraxial.KindCylindricalLens:
			part.Label = layJoin(part.Label, "cyl "+planeLetter(e.Plane))
		case paraxial.KindSpace, paraxial.KindThinLens, paraxial.KindPlanarInterface, paraxial.KindMatrix,
			paraxial.KindThickLens, paraxial.KindPlate, paraxial.KindDiaphragm:
		}
		o.Parts = append(o.Parts, part)
	}
	if a := cfg.stops; a != nil {
		for _, pu := range []struct {
			p     paraxial.Pupil
			label string
		}{{a.Entrance, "EP"}, {a.Exit, "XP"}} {
			if !pu.p.AtInfinity {
				o.pupils = append(o.pupils, layPupil{z: pu.p.Z.Millimeters(), r: pu.p.Radius.Millimeters(), label: pu.label})
			}
		}
	}
	for _, pt := range o.Parts {
		if !layFinite(pt.Z, pt.Length, pt.HalfHeight) {
			return nil, &ParamError{Func: "Layout", Param: "part " + strconv.Quote(pt.Label) + " position", Value: strconv.FormatFloat(pt.Z, 'g', -1, 64) + " mm", Reason: "must be finite", Err: ErrLayout}
		}
	}
	// Draw and label in axial order (stable, so equal positions keep the
	// system order).
	sort.SliceStable(o.Parts, func(i, j int) bool { return o.Parts[i].Z < o.Parts[j].Z })
	return o, nil
}

func layJoin(a, b string) string {
	if a == "" {
		return b
	}
	return a + " " + b
}

// sag returns the axial sag (mm) of a sphere of radius r (mm, ±Inf flat)
// at height y, in the stable form y²/(r(1 + √(1 − y²/r²))).
func laySag(r, y float64) float64 {
	if math.IsInf(r, 0) {
		return 0
	}
	q := 1 - y*y/(r*r)
	if q < 0 {
		q = 0
	}
	return y * y / (r * (1 + math.Sqrt(q)))
}

// layFitHalfHeight reduces h so that it does not exceed either radius and the
// edge thickness t + sag2(h) − sag1(h) stays non-negative.
func layFitHalfHeight(h, r1, r2, t float64) float64 {
	h = math.Min(h, math.Min(math.Abs(r1), math.Abs(r2)))
	edge := func(y float64) float64 { return t + laySag(r2, y) - laySag(r1, y) }
	if edge(h) >= 0 {
		return h
	}
	lo, hi := 0.0, h
	for range 60 {
		mid := (lo + hi) / 2
		if edge(mid) >= 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo
}

// layCurve returns n+1 canvas points of the surface z0 + laySag(r, y) for y
// from y0 to y1.
func layCurve(trX, trY func(float64) vg.Length, z0, r, y0, y1 float64, n int) []vg.Point {
	pts := make([]vg.Point, 0, n+1)
	for i := range n + 1 {
		y := y0 + (y1-y0)*float64(i)/float64(n)
		pts = append(pts, vg.Point{X: trX(z0 + laySag(r, y)), Y: trY(y)})
	}
	return pts
}

// Plot implements plot.Plotter.
func (o *Outline) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	lbl := withFont(o.Label, plt, 7)
	// Optical axis across the drawn range.
	c.StrokeLines(o.Axis, c.ClipLinesX([]vg.Point{{X: trX(plt.X.Min), Y: trY(0)}, {X: trX(plt.X.Max), Y: trY(0)}})...)

	edge := draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.9)}
	// Labels share one baseline under the tallest part.
	tallest := 0.0
	for _, pt := range o.Parts {
		tallest = math.Max(tallest, pt.HalfHeight)
	}
	base := trY(-tallest) - vg.Points(14)
	var lastRight vg.Length = -1e9
	var lastRow int
	for _, pt := range o.Parts {
		x := trX(pt.Z)
		top, bot := trY(pt.HalfHeight), trY(-pt.HalfHeight)
		switch pt.Kind {
		case paraxial.KindThickLens, paraxial.KindPlate:
			front := layCurve(trX, trY, pt.Z, pt.R1, -pt.HalfHeight, pt.HalfHeight, 24)
			back := layCurve(trX, trY, pt.Z+pt.Length, pt.R2, pt.HalfHeight, -pt.HalfHeight, 24)
			poly := append(front, back...)
			c.FillPolygon(layGlassFill, c.ClipPolygonX(poly))
			c.StrokeLines(edge, c.ClipLinesX(append(poly, poly[0]))...)
		case paraxial.KindThinLens, paraxial.KindCylindricalLens:
			sil := laySilhouette(x, top, bot, pt.Converging)
			c.FillPolygon(layGlassFill, sil)
			sty := edge
			if pt.Kind == paraxial.KindCylindricalLens {
				sty.Dashes = []vg.Length{vg.Points(2), vg.Points(1.5)}
			}
			c.StrokeLines(sty, append(sil, sil[0]))
		case paraxial.KindSphericalInterface, paraxial.KindPlanarInterface:
			c.StrokeLines(edge, layCurve(trX, trY, pt.Z, pt.R1, -pt.HalfHeight, pt.HalfHeight, 24))
		case paraxial.KindMirror:
			sty := draw.LineStyle{Color: layMirrorColor, Width: vg.Points(1.8)}
			surf := layCurve(trX, trY, pt.Z, pt.R1, -pt.HalfHeight, pt.HalfHeight, 24)
			c.StrokeLines(sty, surf)
			// Short ticks on the back (+z) side every few points.
			hatch := draw.LineStyle{Color: layMirrorColor, Width: vg.Points(0.6)}
			for i := 0; i < len(surf); i += 3 {
				p := surf[i]
				c.StrokeLine2(hatch, p.X, p.Y, p.X+vg.Points(3), p.Y-vg.Points(2.5))
			}
		case paraxial.KindDiaphragm:
			jaw := max(vg.Points(8), (top-bot)*0.3)
			sty := draw.LineStyle{Color: layScreenColor, Width: vg.Points(2.4)}
			if pt.Stop {
				sty.Color = layStopColor
			}
			c.StrokeLine2(sty, x, top, x, top+jaw)
			c.StrokeLine2(sty, x, bot, x, bot-jaw)
			// Small feet make the opening read as a screen edge.
			c.StrokeLine2(draw.LineStyle{Color: sty.Color, Width: vg.Points(0.8)}, x-vg.Points(2.5), top, x+vg.Points(2.5), top)
			c.StrokeLine2(draw.LineStyle{Color: sty.Color, Width: vg.Points(0.8)}, x-vg.Points(2.5), bot, x+vg.Points(2.5), bot)
		case paraxial.KindMatrix:
			w := vg.Points(4)
			box := []vg.Point{{X: x - w, Y: bot}, {X: x + w, Y: bot}, {X: x + w, Y: top}, {X: x - w, Y: top}, {X: x - w, Y: bot}}
			c.StrokeLines(draw.LineStyle{Color: layScreenColor, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(1), vg.Points(1.5)}}, box)
		case paraxial.KindSpace:
		}
		if pt.Stop && pt.Kind != paraxial.KindDiaphragm {
			// An aperture stop on a lens: ochre ticks at its rim.
			sty := draw.LineStyle{Color: layStopColor, Width: vg.Points(2.4)}
			xm := trX(pt.Z + pt.Length/2)
			c.StrokeLine2(sty, xm, top, xm, top+vg.Points(6))
			c.StrokeLine2(sty, xm, bot, xm, bot-vg.Points(6))
		}
		label := pt.Label
		if pt.Stop && !strings.Contains(label, "stop") {
			label = layJoin(label, "(stop)")
		}
		if label == "" {
			continue
		}
		w := lbl.Width(label)
		xl := trX(pt.Z + pt.Length/2)
		xl = min(max(xl, c.Min.X+w/2), c.Max.X-w/2)
		row := 0
		if xl-w/2 < lastRight+vg.Points(3) {
			row = 1 - lastRow
		}
		yl := base - vg.Length(row)*lbl.FontExtents().Height
		c.FillText(lbl, vg.Point{X: xl, Y: yl}, label)
		lastRight, lastRow = xl+w/2, row
	}
	// Pupils: dashed uprights with a small label on top.
	psty := draw.LineStyle{Color: layPupilColor, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}
	plbl := lbl
	plbl.Color = layPupilColor
	plbl.YAlign = draw.YBottom
	for _, pm := range o.pupils {
		x := trX(pm.z)
		if !c.ContainsX(x) {
			continue
		}
		top, bot := trY(pm.r), trY(-pm.r)
		c.StrokeLine2(psty, x, bot, x, top)
		c.FillText(plbl, vg.Point{X: x, Y: top + vg.Points(2)}, pm.label)
	}
	// Vertical exaggeration: mm per point along z over mm per point along y.
	note := o.Note
	if note == "" && o.scaleNote {
		sx := float64(trX(1) - trX(0)) // points per mm along z
		sy := float64(trY(1) - trY(0))
		if sx > 0 && sy > 0 {
			f := sy / sx
			note = "to scale"
			if f > 1.05 || f < 0.95 {
				note = "y scale ×" + strconv.FormatFloat(f, 'f', 1, 64)
			}
		}
	}
	if note != "" {
		nl := lbl
		nl.XAlign, nl.YAlign = draw.XLeft, draw.YBottom
		c.FillText(nl, vg.Point{X: c.Min.X + vg.Points(6), Y: c.Min.Y + vg.Points(3)}, note)
	}
}

// laySilhouette returns the closed outline of a thin-lens symbol at x
// from bot to top: a slim biconvex shape for a converging lens, a
// biconcave one with flat ends for a diverging lens.
func laySilhouette(x, top, bot vg.Length, converging bool) []vg.Point {
	const n = 16
	centre, rim := vg.Points(3.2), vg.Points(0.7)
	if !converging {
		centre, rim = vg.Points(0.9), vg.Points(3.4)
	}
	half := func(t float64) vg.Length { // t in [−1, 1]
		return rim + (centre-rim)*vg.Length(1-t*t)
	}
	pts := make([]vg.Point, 0, 2*n+2)
	for i := range n + 1 {
		t := -1 + 2*float64(i)/n
		y := bot + (top-bot)*vg.Length((t+1)/2)
		pts = append(pts, vg.Point{X: x - half(t), Y: y})
	}
	for i := n; i >= 0; i-- {
		t := -1 + 2*float64(i)/n
		y := bot + (top-bot)*vg.Length((t+1)/2)
		pts = append(pts, vg.Point{X: x + half(t), Y: y})
	}
	return pts
}

// DataRange implements plot.DataRanger: the axial extent of the system and
// the largest semi-diameter, in mm. Pupil marks do not widen the range (a
// pupil far outside the system would squash the drawing); they are drawn
// only where they fall inside it.
func (o *Outline) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax = o.xmin, o.xmax
	h := 0.0
	for _, p := range o.Parts {
		xmin = math.Min(xmin, p.Z+math.Min(0, laySag(p.R1, p.HalfHeight)))
		xmax = math.Max(xmax, p.Z+p.Length+math.Max(0, laySag(p.R2, p.HalfHeight)))
		h = math.Max(h, p.HalfHeight)
	}
	if h == 0 {
		h = 1
	}
	if xmax <= xmin {
		xmax = xmin + 1
	}
	return xmin, xmax, -h, h
}

// Thumbnail implements plot.Thumbnailer with a small lens silhouette.
func (o *Outline) Thumbnail(c *draw.Canvas) {
	x := (c.Min.X + c.Max.X) / 2
	sil := laySilhouette(x, c.Max.Y, c.Min.Y, true)
	c.FillPolygon(layGlassFill, sil)
	c.StrokeLines(draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.8)}, append(sil, sil[0]))
}
