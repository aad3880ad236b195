package optplot

import (
	"errors"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Palette of the package (sRGB), chosen for calm contrast on white.
var (
	envelopeColor  = color.NRGBA{R: 0x2e, G: 0x5e, B: 0x6e, A: 0xff} // deep teal
	bandColor      = color.NRGBA{R: 0x2e, G: 0x5e, B: 0x6e, A: 0x26} // the same, ~15 % opaque
	axisColor      = color.NRGBA{R: 0x9a, G: 0x9a, B: 0x9a, A: 0xff} // neutral grey
	lensColor      = color.NRGBA{R: 0xb0, G: 0x7a, B: 0x3a, A: 0xff} // warm ochre
	interfaceColor = color.NRGBA{R: 0x78, G: 0x60, B: 0x8c, A: 0xff} // muted plum
	labelColor     = color.NRGBA{R: 0x33, G: 0x33, B: 0x33, A: 0xff} // dark grey text
	yColor         = color.NRGBA{R: 0xa8, G: 0x4a, B: 0x2c, A: 0xff} // brick, for the y plane
	rayColor       = color.NRGBA{R: 0x6b, G: 0x6f, B: 0xa8, A: 0xb0} // slate violet, translucent
	stopColor      = color.NRGBA{R: 0x4a, G: 0x4a, B: 0x4a, A: 0xff} // aperture stops
	warnColor      = color.NRGBA{R: 0xd2, G: 0x3c, B: 0x1e, A: 0xff} // vermilion: clipping stop
)

// zeroStyle is the thin dotted grey of zero lines and reference diagonals.
var zeroStyle = draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2.5)}}

// Mark is one zero-thickness element drawn by [Marks], in plot units
// (millimetres).
type Mark struct {
	// Element is the element's index in the system.
	Element int
	// Z is the axial position in mm.
	Z float64
	// Low and High are the ends of the bar in mm across the beam (x): the
	// edges of the clear aperture in the tangential plane when it has one
	// (projected by cos θ on a tilted part, shifted by its offset),
	// otherwise ∓ the default height of the [Marks].
	Low, High float64
	// Kind is the element type.
	Kind paraxial.Kind
	// Converging is true for a thin or cylindrical lens with f > 0.
	Converging bool
	// Plane is the plane in which a cylindrical lens has power (its mark
	// carries the letter x for Tangential or y for Sagittal).
	Plane paraxial.Plane
	// Label is drawn above the bar.
	Label string
	// Stop is true when the element has a clear aperture that limits x;
	// it is drawn as a pair of jaws at Low and High.
	Stop bool
	// Clipped draws the stops in the warning colour: the aperture passes
	// less than its threshold (beam.Clipping).
	Clipped bool
}

// Tube is an aperture on a space, drawn by [Marks] as a pair of lines
// along the gap at the edges of the opening, in mm.
type Tube struct {
	// Element is the space's index in the system.
	Element int
	// Z0 and Z1 are the ends of the tube in mm.
	Z0, Z1 float64
	// Low and High are the edges of the opening across the beam (x).
	Low, High float64
	// Label names the tube.
	Label string
	// Clipped draws the tube in the warning colour.
	Clipped bool
}

// Marks is a plotter that draws the zero-thickness elements of a system
// as vertical bars with labels. Create it with [NewMarks].
type Marks struct {
	// Marks holds the elements, in system order.
	Marks []Mark
	// Tubes holds the spaces with a clear aperture, in system order.
	Tubes []Tube
	// LineStyle is the style of lens bars; interface bars use the same
	// width in InterfaceColor.
	draw.LineStyle
	// InterfaceColor is the bar colour of refracting interfaces.
	InterfaceColor color.Color
	// Label is the style of the labels; a zero Font size means 8 pt in
	// the plot's default font.
	Label text.Style

	scene *scene // labels drawn, for the key to avoid (Caustic sets it)
}

var (
	_ plot.Plotter     = (*Marks)(nil)
	_ plot.DataRanger  = (*Marks)(nil)
	_ plot.Thumbnailer = (*Marks)(nil)
)

// errNoFinite reports non-finite marker data.
var errNoFinite = errors.New("optplot: element position or size is not finite")

// NewMarks returns a [Marks] plotter for the zero-thickness elements of
// sys and for its tubes (spaces with a clear aperture). halfHeight (mm,
// > 0, finite) is the bar half-length for elements without a clear
// aperture. An element without a label is labelled with its parameter, for
// example "f 100 mm" or "R -50 mm".
func NewMarks(sys paraxial.System, halfHeight float64) (*Marks, error) {
	if !(halfHeight > 0) || math.IsInf(halfHeight, 0) {
		return nil, errors.New("optplot: marker half-height must be positive and finite")
	}
	m := &Marks{
		LineStyle:      draw.LineStyle{Color: lensColor, Width: vg.Points(1.6)},
		InterfaceColor: interfaceColor,
		Label: text.Style{
			Color:   labelColor,
			XAlign:  draw.XCenter,
			YAlign:  draw.YBottom,
			Handler: plot.DefaultTextHandler,
		},
	}
	// run is the label of the run of elements walked so far: the later
	// surfaces of one labelled part (a plate's or a thick lens's back
	// surface) are drawn without repeating its label.
	run, inRun := "", false
	for pc := range sys.Walk(0, sys.Length()) {
		e := sys.Element(pc.Element)
		repeat := inRun && e.Label != "" && e.Label == run
		run, inRun = e.Label, true
		lo, hi, limited := e.Aperture.Limits(paraxial.Tangential, e.Tilt)
		lo, hi = lo*1e3, hi*1e3
		if !e.IsSurface() {
			if limited {
				m.Tubes = append(m.Tubes, Tube{Element: pc.Element, Z0: pc.From.Millimeters(), Z1: pc.To.Millimeters(), Low: lo, High: hi, Label: e.Label})
			}
			continue
		}
		mk := Mark{Element: pc.Element, Z: e.Z.Millimeters(), Low: -halfHeight, High: halfHeight, Kind: e.Kind, Label: e.Label, Converging: e.Focal > 0, Plane: e.Plane}
		if limited {
			mk.Low, mk.High, mk.Stop = lo, hi, true
		}
		switch {
		case repeat:
			mk.Label = ""
		case mk.Label == "":
			mk.Label = defaultLabel(e)
		}
		if !finite(mk.Z) || !finite(mk.Low) || !finite(mk.High) {
			return nil, errNoFinite
		}
		m.Marks = append(m.Marks, mk)
	}
	return m, nil
}

func defaultLabel(e paraxial.Element) string {
	switch e.Kind {
	case paraxial.KindThinLens:
		return "f " + units.Length(e.Focal).String()
	case paraxial.KindCylindricalLens:
		return "f" + planeLetter(e.Plane) + " " + units.Length(e.Focal).String()
	case paraxial.KindSphericalInterface:
		return "R " + units.Length(e.Radius).String()
	case paraxial.KindPlanarInterface:
		return "flat"
	case paraxial.KindSpace, paraxial.KindMirror, paraxial.KindMatrix, paraxial.KindThickLens,
		paraxial.KindPlate, paraxial.KindDiaphragm:
	}
	return ""
}

// planeLetter returns "x" for the tangential and "y" for the sagittal
// plane.
func planeLetter(p paraxial.Plane) string {
	if p == paraxial.Sagittal {
		return "y"
	}
	return "x"
}

// Plot implements plot.Plotter. Labels stay inside the data area: a label
// near an edge is moved inwards, and one that would overlap another label
// goes up a row (the first row where it fits).
func (m *Marks) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	lbl := withFont(m.Label, plt, 8)
	head := vg.Points(4)
	lineHeight := lbl.FontExtents().Height
	for _, tb := range m.Tubes {
		// Tubes: thin lines along the gap at the edges of the opening.
		st := draw.LineStyle{Color: stopColor, Width: vg.Points(0.9)}
		if tb.Clipped {
			st = draw.LineStyle{Color: warnColor, Width: vg.Points(1.6)}
		}
		x0, x1 := trX(tb.Z0), trX(tb.Z1)
		for _, y := range []float64{tb.Low, tb.High} {
			c.StrokeLines(st, c.ClipLinesX([]vg.Point{{X: x0, Y: trY(y)}, {X: x1, Y: trY(y)}})...)
		}
	}
	type placed struct{ left, right, y vg.Length }
	var done []placed
	for _, mk := range m.Marks {
		x := trX(mk.Z)
		if !c.ContainsX(x) {
			continue
		}
		top, bot := trY(mk.High), trY(mk.Low)
		sty := m.LineStyle
		lens := mk.Kind == paraxial.KindThinLens || mk.Kind == paraxial.KindCylindricalLens
		if !lens {
			sty.Color = m.InterfaceColor
		}
		if mk.Kind == paraxial.KindCylindricalLens {
			// A cylindrical lens: two thin parallel bars (the flat and
			// the curved face seen edge-on) and the letter of its power
			// plane beside the top end.
			thinSty := sty
			thinSty.Width = sty.Width * 0.55
			d := vg.Points(1.3)
			c.StrokeLine2(thinSty, x-d, bot, x-d, top)
			c.StrokeLine2(thinSty, x+d, bot, x+d, top)
			tag := lbl
			tag.Color = sty.Color
			tag.XAlign, tag.YAlign = draw.XLeft, draw.YCenter
			off := head
			if mk.Stop {
				off = vg.Points(7) // beyond the jaws
			}
			tp := vg.Point{X: x + off + vg.Points(2), Y: top}
			c.FillText(tag, tp, planeLetter(mk.Plane))
			m.scene.take(vg.Rectangle{Min: vg.Point{X: tp.X, Y: tp.Y - lineHeight/2}, Max: vg.Point{X: tp.X + tag.Width("x"), Y: tp.Y + lineHeight/2}})
		} else {
			c.StrokeLine2(sty, x, bot, x, top)
		}
		if lens {
			// End marks: a converging lens opens outwards (a "diamond"
			// silhouette), a diverging lens inwards.
			d := head
			if !mk.Converging {
				d = -head
			}
			for _, y := range []struct{ at, dir vg.Length }{{top, 1}, {bot, -1}} {
				tip := y.at
				base := y.at - y.dir*d
				c.StrokeLines(sty, []vg.Point{{X: x - head, Y: base}, {X: x, Y: tip}, {X: x + head, Y: base}})
			}
		}
		if mk.Stop {
			// Stops: short horizontal jaws at the edges, heavier and in
			// the warning colour when the aperture clips the beam.
			st := draw.LineStyle{Color: stopColor, Width: vg.Points(1.2)}
			jaw := vg.Points(5)
			if mk.Clipped {
				st = draw.LineStyle{Color: warnColor, Width: vg.Points(2.2)}
				jaw = vg.Points(7)
			}
			c.StrokeLine2(st, x-jaw, top, x+jaw, top)
			c.StrokeLine2(st, x-jaw, bot, x+jaw, bot)
		}
		m.scene.take(vg.Rectangle{Min: vg.Point{X: x - head, Y: bot - head}, Max: vg.Point{X: x + head, Y: top + head}})
		if mk.Label == "" {
			continue
		}
		// Keep the label inside the data area horizontally (with 10 %
		// of its width to spare for renderers that substitute a wider
		// font), then take the lowest row where it overlaps no label
		// drawn so far.
		w := lbl.Width(mk.Label)
		spare := 0.1*w + vg.Points(1)
		lx := min(max(x, c.Min.X+w/2+spare), c.Max.X-w/2-spare)
		y := top + head + vg.Points(1)
		for moved := true; moved; {
			moved = false
			for _, p := range done {
				if lx-w/2 < p.right+vg.Points(2) && lx+w/2 > p.left-vg.Points(2) && y < p.y+lineHeight && y+lineHeight > p.y {
					y, moved = p.y+lineHeight, true
				}
			}
		}
		// Never above the data area: the label then sits on the bar.
		y = min(y, c.Max.Y-lineHeight)
		l := lbl
		l.XAlign = draw.XCenter
		if mk.Clipped {
			l.Color = warnColor
		}
		c.FillText(l, vg.Point{X: lx, Y: y}, mk.Label)
		done = append(done, placed{left: lx - w/2, right: lx + w/2, y: y})
		m.scene.take(vg.Rectangle{Min: vg.Point{X: lx - w/2, Y: y}, Max: vg.Point{X: lx + w/2, Y: y + lineHeight}})
	}
}

// DataRange implements plot.DataRanger: the bar positions and heights, in
// mm. Without marks it is the unit range (0, 1, −1, 1), so that an empty
// Marks never gives the plot an infinite range.
func (m *Marks) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax, ymin, ymax = barRange(len(m.Marks), func(i int) (float64, float64) { return m.Marks[i].Z, m.Marks[i].half() })
	for _, tb := range m.Tubes {
		h := math.Max(math.Abs(tb.Low), math.Abs(tb.High))
		xmin, xmax = math.Min(xmin, tb.Z0), math.Max(xmax, tb.Z1)
		ymin, ymax = math.Min(ymin, -h), math.Max(ymax, h)
	}
	return xmin, xmax, ymin, ymax
}

// half returns the larger distance of the bar's ends from the axis.
func (mk Mark) half() float64 { return math.Max(math.Abs(mk.Low), math.Abs(mk.High)) }

// barRange returns the data range of n vertical bars, bar i at position
// and half-height at(i), symmetric about the axis: the unit range (0, 1,
// −1, 1) when n is 0.
func barRange(n int, at func(i int) (z, half float64)) (xmin, xmax, ymin, ymax float64) {
	if n == 0 {
		return 0, 1, -1, 1
	}
	xmin, xmax = math.Inf(1), math.Inf(-1)
	ymin, ymax = math.Inf(1), math.Inf(-1)
	for i := range n {
		z, h := at(i)
		xmin, xmax = math.Min(xmin, z), math.Max(xmax, z)
		ymin, ymax = math.Min(ymin, -h), math.Max(ymax, h)
	}
	return xmin, xmax, ymin, ymax
}

// withFont returns s with the plot's tick-label font at size points when
// s has no font size, and the plot's text handler when s has none.
func withFont(s text.Style, plt *plot.Plot, size float64) text.Style {
	if s.Font.Size == 0 {
		s.Font = plt.X.Tick.Label.Font
		s.Font.Size = vg.Points(size)
	}
	if s.Handler == nil {
		s.Handler = plt.TextHandler
	}
	return s
}

// Thumbnail implements plot.Thumbnailer with a short vertical bar.
func (m *Marks) Thumbnail(c *draw.Canvas) {
	x := (c.Min.X + c.Max.X) / 2
	c.StrokeLine2(m.LineStyle, x, c.Min.Y, x, c.Max.Y)
}

// maxHalfHeightIn returns the largest bar half-height in mm of the marks
// and tubes inside [lo, hi] mm (0 without any).
func (m *Marks) maxHalfHeightIn(lo, hi float64) float64 {
	h := 0.0
	for _, mk := range m.Marks {
		if mk.Z >= lo && mk.Z <= hi {
			h = math.Max(h, mk.half())
		}
	}
	for _, tb := range m.Tubes {
		if tb.Z1 >= lo && tb.Z0 <= hi {
			h = math.Max(h, math.Max(math.Abs(tb.Low), math.Abs(tb.High)))
		}
	}
	return h
}
