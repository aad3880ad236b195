package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/plan"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrPlan is wrapped by the errors of [Plan] for a plan it cannot draw:
// one not made by plan.Lay (no segments, a bad board) or one with a
// position that is not finite.
var ErrPlan = errors.New("optplot: table plan needs a plan made by plan.Lay")

// Plan palette (sRGB), this package's own: a pale stone board with grey
// holes, parts in the layout drawing's glass and mirror colours, the beam
// in the caustic's teal, warnings in its vermilion.
var (
	planBoardFill  = color.NRGBA{R: 0xf2, G: 0xf1, B: 0xed, A: 0xff}
	planBoardEdge  = color.NRGBA{R: 0x8c, G: 0x8c, B: 0x88, A: 0xff}
	planHoleColor  = color.NRGBA{R: 0xbe, G: 0xbd, B: 0xb8, A: 0xff}
	planMirrorFill = color.NRGBA{R: 0xe6, G: 0xe2, B: 0xee, A: 0xff}
	planIrisFill   = color.NRGBA{R: 0xe4, G: 0xe4, B: 0xe2, A: 0xff}
	planBandColor  = color.NRGBA{R: 0x2e, G: 0x5e, B: 0x6e, A: 0x48}
	planWarnFill   = color.NRGBA{R: 0xd2, G: 0x3c, B: 0x1e, A: 0x30}
)

// maxPlanWarnings is the number of warnings listed under the board; the
// rest are counted there and given in full in the caption.
const maxPlanWarnings = 6

// Plan returns a drawing of the table plan p to scale, seen from above:
// the board's outline and its hole grid (light dots, every hole when
// they are at least 2 pt apart, with column and row numbers counted from
// 1 at the origin corner, as [plan.Plan.Table] counts them), each part's
// footprint outlined (lenses as a slim lens across the beam, mirrors as
// a heavy face with a hatched back, plates as a thin slab at their
// angle, irises as two jaws around the opening, user matrices as a
// dashed box) with its name beside it, the beam's axis from an open
// arrow at the input to a filled one at the output, its 1/e² band (to
// scale: a 1 mm beam on a 1 m board is a hairline), a scale bar in the
// board's unit and a one-line key. The x and y scales are equal whatever
// the figure's size: the board is fitted into the drawing area and
// centred.
//
// Warnings are highlighted: the parts concerned are outlined and
// labelled in the warning colour, each warning gets a numbered marker at
// its place and a numbered line under the board (the first six; the rest
// are counted there), and the caption lists them all.
//
// The options [Title] (default "Table plan"), [Caption] and [Size] apply;
// the default size is 16 cm wide and as tall as the board's shape needs
// (5 to 22 cm).
//
// It returns a [*ParamError] wrapping [ErrPlan] for a plan not made by
// plan.Lay or with positions that are not finite, and one wrapping
// [ErrOption] for a bad option.
func Plan(p plan.Plan, opts ...Option) (Figure, error) {
	const fn = "Plan"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := p.Board.Validate(); err != nil {
		return Figure{}, &ParamError{Func: fn, Reason: strings.TrimPrefix(err.Error(), "plan: "), Err: ErrPlan}
	}
	if len(p.Segments) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "segments", Value: 0, Reason: "a plan has at least one (make it with plan.Lay)", Err: ErrPlan}
	}
	for _, pt := range p.Parts {
		for _, v := range []units.Length{pt.At.X, pt.At.Y, pt.Footprint.Center.X, pt.Footprint.Center.Y, pt.Footprint.Width, pt.Footprint.Depth, pt.Diameter} {
			if !finite(float64(v)) {
				return Figure{}, &ParamError{Func: fn, Param: "part " + strconv.Quote(pt.Name) + " position", Value: v, Reason: "must be finite", Err: ErrPlan}
			}
		}
	}
	for k, s := range p.Segments {
		for _, v := range []units.Length{s.From.X, s.From.Y, s.To.X, s.To.Y} {
			if !finite(float64(v)) {
				return Figure{}, &ParamError{Func: fn, Param: "segment " + strconv.Itoa(k+1) + " end", Value: v, Reason: "must be finite", Err: ErrPlan}
			}
		}
		if len(s.Z) != len(s.W) {
			return Figure{}, &ParamError{Func: fn, Param: "segment " + strconv.Itoa(k+1) + " beam samples", Value: len(s.W), Reason: "must equal the " + strconv.Itoa(len(s.Z)) + " positions", Err: ErrPlan}
		}
	}
	title := "Table plan"
	if cfg.titleSet {
		title = cfg.title
	}
	pl := newPlot(title, "", "")
	pl.HideAxes()
	pl.X.Min, pl.X.Max, pl.Y.Min, pl.Y.Max = 0, 1, 0, 1
	d := &planDrawing{p: p, warned: make([]bool, len(p.Parts))}
	for _, w := range p.Warnings {
		for _, i := range w.Parts {
			if i >= 0 && i < len(d.warned) {
				d.warned[i] = true
			}
		}
	}
	pl.Add(d)
	f := cfg.figure(pl, planCaption(title, p))
	if cfg.width == 0 {
		f.Width, f.Height = DefaultWidth, planHeight(p, DefaultWidth, pl)
	}
	return f, nil
}

// planHeight returns the default figure height for width w: the board
// at the width left by the row numbers and margins, plus the title and
// the lines under the board (the warnings wrapped as [planDrawing.Plot]
// wraps them), within 5 … 22 cm.
func planHeight(p plan.Plan, w vg.Length, pl *plot.Plot) vg.Length {
	sty := withFont(text.Style{Handler: plot.DefaultTextHandler}, pl, 7)
	lines := 2
	for i, wn := range p.Warnings {
		if i == maxPlanWarnings {
			lines++
			break
		}
		lines += len(wrap(sty, strconv.Itoa(i+1)+"  "+wn.Text, w-vg.Points(40)))
	}
	board := (w - vg.Points(40)) * vg.Length(float64(p.Board.SizeY/p.Board.SizeX))
	h := board + vg.Points(30) + vg.Length(lines)*sty.FontExtents().Height + vg.Points(12)
	return min(max(h, 5*vg.Centimeter), 22*vg.Centimeter)
}

// planCaption is the title, the board, the parts and the warnings.
func planCaption(title string, p plan.Plan) string {
	s := title + " on a " + p.Board.String() + ", seen from above, to scale: " + strconv.Itoa(len(p.Parts)) + " parts, beam path " +
		table.In(p.Length, units.Millimeter, 1) + " mm."
	switch len(p.Warnings) {
	case 0:
		return s + " No warnings."
	case 1:
		return s + " 1 warning: " + p.Warnings[0].Text + "."
	}
	parts := make([]string, len(p.Warnings))
	for i, w := range p.Warnings {
		parts[i] = strconv.Itoa(i+1) + ". " + w.Text
	}
	return s + " " + strconv.Itoa(len(p.Warnings)) + " warnings: " + strings.Join(parts, "; ") + "."
}

// planDrawing draws a plan with its own equal-scale transform from board
// metres to the canvas.
type planDrawing struct {
	p      plan.Plan
	warned []bool // per part: named by a warning
}

var _ plot.Plotter = (*planDrawing)(nil)

// planView is the board's place on the canvas: the canvas point of the
// board origin and the scale in points per metre, the same along x and
// y.
type planView struct {
	ox, oy vg.Length
	k      float64
}

func (v planView) pt(p plan.Point) vg.Point {
	return vg.Point{X: v.ox + vg.Length(float64(v.k*float64(p.X))), Y: v.oy + vg.Length(float64(v.k*float64(p.Y)))}
}

// local returns the canvas point at along·u + across·v from c (canvas
// points, offsets in points), u at angle a counterclockwise from +x and
// v 90° further: the canvas has the board's orientation, so a part's
// frame is the same on both.
func local(c vg.Point, a float64, along, across vg.Length) vg.Point {
	s, co := math.Sincos(a)
	// Each product converted on its own, so that no CPU fuses it into an
	// FMA and the SVG stays byte-identical everywhere.
	ac, as := vg.Length(along*vg.Length(co)), vg.Length(along*vg.Length(s))
	xc, xs := vg.Length(across*vg.Length(co)), vg.Length(across*vg.Length(s))
	return vg.Point{X: c.X + ac - xs, Y: c.Y + as + xc}
}

// unitVec returns the unit vector at angle a.
func unitVec(a float64) [2]float64 {
	s, c := math.Sincos(a)
	return [2]float64{c, s}
}

// Plot implements plot.Plotter.
func (d *planDrawing) Plot(c draw.Canvas, plt *plot.Plot) {
	p := d.p
	b := p.Board
	sty := withFont(text.Style{Color: labelColor, XAlign: draw.XLeft, YAlign: draw.YBottom, Handler: plot.DefaultTextHandler}, plt, 7)
	small := withFont(text.Style{Color: axisColor, XAlign: draw.XCenter, YAlign: draw.YTop, Handler: plot.DefaultTextHandler}, plt, 6)
	lineH := sty.FontExtents().Height
	smallH := small.FontExtents().Height
	cols, rows := b.Holes()

	// Room: row numbers at the left, column numbers, the key and the
	// warning lines under the board.
	nw := len(p.Warnings)
	listed := min(nw, maxPlanWarnings)
	ws := sty
	ws.Color = warnColor
	left := small.Width(strconv.Itoa(rows)) + vg.Points(6)
	var warnText []string
	for i := range listed {
		// Long warnings wrap to the width under the board, continuation
		// lines indented.
		for j, l := range wrap(ws, strconv.Itoa(i+1)+"  "+p.Warnings[i].Text, c.Max.X-c.Min.X-left-vg.Points(12)) {
			if j > 0 {
				l = "     " + l
			}
			warnText = append(warnText, l)
		}
	}
	if nw > listed {
		warnText = append(warnText, "… and "+strconv.Itoa(nw-listed)+" more warnings (see the caption)")
	}
	lines := len(warnText)
	bottom := smallH + vg.Points(3) + lineH + vg.Points(6) + vg.Length(lines)*lineH
	top, right := vg.Points(4), vg.Points(4)
	aw := c.Max.X - c.Min.X - left - right
	ah := c.Max.Y - c.Min.Y - bottom - top
	if aw <= 0 || ah <= 0 {
		return
	}
	k := math.Min(float64(aw)/float64(b.SizeX), float64(ah)/float64(b.SizeY))
	bw, bh := vg.Length(k*float64(b.SizeX)), vg.Length(k*float64(b.SizeY))
	v := planView{ox: c.Min.X + left + (aw-bw)/2, oy: c.Min.Y + bottom + (ah - bh), k: k}
	ptPer := func(l units.Length) vg.Length { return vg.Length(k * float64(l)) }

	// The board and its holes: each row of holes is one dotted line,
	// dashes as long as the dots are wide at the hole pitch.
	corners := []vg.Point{v.pt(plan.Point{}), v.pt(plan.Point{X: b.SizeX}), v.pt(plan.Point{X: b.SizeX, Y: b.SizeY}), v.pt(plan.Point{Y: b.SizeY})}
	c.FillPolygon(planBoardFill, corners)
	c.StrokeLines(draw.LineStyle{Color: planBoardEdge, Width: vg.Points(0.8)}, append(corners, corners[0]))
	pitch := ptPer(b.Pitch)
	if pitch >= vg.Points(2) {
		dot := min(vg.Points(1.4), 0.35*pitch)
		hs := draw.LineStyle{Color: planHoleColor, Width: dot, Dashes: []vg.Length{dot, pitch - dot}}
		x0, x1 := v.pt(b.HoleAt(1, 1)).X-dot/2, v.pt(b.HoleAt(cols, 1)).X+dot/2
		for r := 1; r <= rows; r++ {
			y := v.pt(b.HoleAt(1, r)).Y
			c.StrokeLine2(hs, x0, y, x1, y)
		}
	}
	// Hole numbers: every step-th, at least 14 pt apart, and 1 when it
	// is not crowded by the next.
	step := 1
	for _, s := range []int{1, 2, 5, 10, 20, 50, 100, 200, 500} {
		step = s
		if vg.Length(s)*pitch >= vg.Points(14) {
			break
		}
	}
	numbered := func(last int) []int {
		var out []int
		if step == 1 || step >= 5 {
			out = append(out, 1)
		}
		for i := step; i <= last; i += step {
			if i > 1 {
				out = append(out, i)
			}
		}
		return out
	}
	for _, col := range numbered(cols) {
		x := v.pt(b.HoleAt(col, 1)).X
		c.FillText(small, vg.Point{X: x, Y: v.oy - vg.Points(2)}, strconv.Itoa(col))
	}
	rs := small
	rs.XAlign, rs.YAlign = draw.XRight, draw.YCenter
	for _, row := range numbered(rows) {
		y := v.pt(b.HoleAt(1, row)).Y
		c.FillText(rs, vg.Point{X: v.ox - vg.Points(3), Y: y}, strconv.Itoa(row))
	}

	// Footprints filled first, under the beam.
	for i, pt := range p.Parts {
		poly := d.footprint(v, pt)
		fill := layGlassFill
		switch pt.Kind {
		case paraxial.KindMirror:
			fill = planMirrorFill
		case paraxial.KindDiaphragm, paraxial.KindMatrix:
			fill = planIrisFill
		case paraxial.KindSpace, paraxial.KindThinLens, paraxial.KindSphericalInterface, paraxial.KindPlanarInterface,
			paraxial.KindCylindricalLens, paraxial.KindThickLens, paraxial.KindPlate:
		}
		c.FillPolygon(fill, poly)
		if d.warned[i] {
			c.FillPolygon(planWarnFill, poly)
		}
	}
	// The beam: the band to scale, then the axis. At a fold the band's
	// edges end and start on the mirror's face line (through the fold
	// point, square to the normal n ∝ d_out − d_in), where the arriving
	// and leaving edges meet, rather than square to the beam.
	faceShift := func(a, b float64) func(across vg.Length) vg.Length {
		d, v := unitVec(a), unitVec(a+math.Pi/2)
		n := [2]float64{math.Cos(b) - d[0], math.Sin(b) - d[1]}
		dn := float64(d[0]*n[0]) + float64(d[1]*n[1])
		vn := float64(v[0]*n[0]) + float64(v[1]*n[1])
		if dn == 0 {
			return func(vg.Length) vg.Length { return 0 }
		}
		return func(across vg.Length) vg.Length { return -across * vg.Length(vn/dn) }
	}
	for k, s := range p.Segments {
		if len(s.Z) < 2 {
			continue
		}
		a := float64(s.Direction)
		from := v.pt(s.From)
		var up, down []vg.Point
		for i, z := range s.Z {
			at := local(from, a, ptPer(z-s.Z0), 0)
			w := ptPer(s.W[i])
			shift := func(vg.Length) vg.Length { return 0 }
			switch {
			case i == 0 && k > 0:
				shift = faceShift(a, float64(p.Segments[k-1].Direction))
			case i == len(s.Z)-1 && k+1 < len(p.Segments):
				shift = faceShift(a, float64(p.Segments[k+1].Direction))
			}
			up = append(up, local(at, a, shift(w), w))
			down = append(down, local(at, a, shift(-w), -w))
		}
		for i := len(down) - 1; i >= 0; i-- {
			up = append(up, down[i])
		}
		c.FillPolygon(planBandColor, up)
	}
	axis := make([]vg.Point, 0, len(p.Segments)+1)
	axis = append(axis, v.pt(p.Segments[0].From))
	for _, s := range p.Segments {
		axis = append(axis, v.pt(s.To))
	}
	beamSty := draw.LineStyle{Color: envelopeColor, Width: vg.Points(0.9)}
	c.StrokeLines(beamSty, axis)
	first, last := p.Segments[0], p.Segments[len(p.Segments)-1]
	arrow(c, v.pt(first.From), float64(first.Direction), false)
	arrow(c, v.pt(last.To), float64(last.Direction), true)

	// Outlines and symbols.
	for i, pt := range p.Parts {
		poly := d.footprint(v, pt)
		edge := draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.6)}
		if d.warned[i] {
			edge = draw.LineStyle{Color: warnColor, Width: vg.Points(1.3)}
		}
		c.StrokeLines(edge, append(poly, poly[0]))
		drawPart(c, v, pt)
	}

	// Labels, each where it covers the least of the other labels, the
	// footprints and the beam.
	var taken []vg.Rectangle
	boxes := make([]vg.Rectangle, len(p.Parts))
	for i, pt := range p.Parts {
		boxes[i] = bounds(d.footprint(v, pt))
	}
	for i, pt := range p.Parts {
		ls := sty
		if d.warned[i] {
			ls.Color = warnColor
		}
		r := placeLabel(ls, pt.Name, boxes[i], boxes, taken, axis, c)
		c.FillText(ls, r.Min, pt.Name)
		taken = append(taken, r)
	}

	// Warning markers: numbered rings at the places.
	for i, w := range p.Warnings {
		marker(c, small, v.pt(w.At), i+1)
	}

	// Under the board: the key and the scale bar on one line, then the
	// warnings.
	y := v.oy - smallH - vg.Points(5) - lineH
	x := v.ox
	ks := sty
	ks.Color = labelColor
	key := func(draw func(x, mid vg.Length), label string) {
		mid := y + lineH/2 - vg.Points(1)
		draw(x, mid)
		c.FillText(ks, vg.Point{X: x + vg.Points(16), Y: y}, label)
		x += vg.Points(28) + ks.Width(label)
	}
	key(func(x, mid vg.Length) { c.StrokeLine2(beamSty, x, mid, x+vg.Points(12), mid) }, "beam axis")
	if p.HasBeam {
		key(func(x, mid vg.Length) {
			c.FillPolygon(planBandColor, []vg.Point{{X: x, Y: mid - vg.Points(2.5)}, {X: x + vg.Points(12), Y: mid - vg.Points(2.5)}, {X: x + vg.Points(12), Y: mid + vg.Points(2.5)}, {X: x, Y: mid + vg.Points(2.5)}})
		}, "1/e² band, to scale")
	}
	key(func(x, mid vg.Length) {
		sq := []vg.Point{{X: x + vg.Points(2), Y: mid - vg.Points(3)}, {X: x + vg.Points(10), Y: mid - vg.Points(3)}, {X: x + vg.Points(10), Y: mid + vg.Points(3)}, {X: x + vg.Points(2), Y: mid + vg.Points(3)}}
		c.FillPolygon(layGlassFill, sq)
		c.StrokeLines(draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.6)}, append(sq, sq[0]))
	}, "mount footprint")
	if nw > 0 {
		key(func(x, mid vg.Length) { marker(c, small, vg.Point{X: x + vg.Points(6), Y: mid}, 1) }, "warning")
	}
	scaleBar(c, ks, v, b, y, x)
	for _, l := range warnText {
		y -= lineH
		c.FillText(ws, vg.Point{X: v.ox, Y: y}, l)
	}
}

// footprint returns the canvas corners of a part's footprint.
func (d *planDrawing) footprint(v planView, pt plan.Part) []vg.Point {
	cs := pt.Footprint.Corners()
	out := make([]vg.Point, len(cs))
	for i, q := range cs {
		out[i] = v.pt(q)
	}
	return out
}

// drawPart draws the symbol of a part inside its footprint.
func drawPart(c draw.Canvas, v planView, pt plan.Part) {
	at := v.pt(pt.At)
	half := vg.Length(v.k * float64(pt.Diameter) / 2)
	a := float64(pt.Normal)
	glass := draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.7)}
	switch pt.Kind {
	case paraxial.KindThinLens, paraxial.KindCylindricalLens, paraxial.KindThickLens, paraxial.KindSphericalInterface, paraxial.KindMatrix:
		if pt.Kind == paraxial.KindMatrix {
			box := []vg.Point{local(at, a, -vg.Points(3), -half), local(at, a, vg.Points(3), -half), local(at, a, vg.Points(3), half), local(at, a, -vg.Points(3), half)}
			c.StrokeLines(draw.LineStyle{Color: layScreenColor, Width: vg.Points(0.7), Dashes: []vg.Length{vg.Points(1), vg.Points(1.5)}}, append(box, box[0]))
			return
		}
		sil := lensAcross(at, a, half, pt.Kind != paraxial.KindThinLens && pt.Kind != paraxial.KindCylindricalLens || pt.Focal > 0)
		c.FillPolygon(layGlassFill, sil)
		if pt.Kind == paraxial.KindCylindricalLens {
			glass.Dashes = []vg.Length{vg.Points(1.5), vg.Points(1)}
		}
		c.StrokeLines(glass, append(sil, sil[0]))
	case paraxial.KindPlate, paraxial.KindPlanarInterface:
		t := max(vg.Points(1.2), vg.Length(v.k*float64(pt.End-pt.Z))) / 2
		slab := []vg.Point{local(at, a, -t, -half), local(at, a, t, -half), local(at, a, t, half), local(at, a, -t, half)}
		c.FillPolygon(layGlassFill, slab)
		c.StrokeLines(glass, append(slab, slab[0]))
	case paraxial.KindMirror:
		face := draw.LineStyle{Color: layMirrorColor, Width: vg.Points(1.8)}
		c.StrokeLine2(face, local(at, a, 0, -half).X, local(at, a, 0, -half).Y, local(at, a, 0, half).X, local(at, a, 0, half).Y)
		// Hatching on the back (away from the beams, −normal).
		hatch := draw.LineStyle{Color: layMirrorColor, Width: vg.Points(0.5)}
		n := max(3, int(2*half/vg.Points(2.5)))
		for i := range n + 1 {
			s := -half + 2*half*vg.Length(i)/vg.Length(n)
			p, q := local(at, a, -vg.Points(0.9), s), local(at, a, -vg.Points(3.2), s-vg.Points(1.6))
			c.StrokeLine2(hatch, p.X, p.Y, q.X, q.Y)
		}
	case paraxial.KindDiaphragm:
		// Two jaws from the opening's edge to the edge of the body.
		open := max(vg.Points(0.8), half)
		body := vg.Length(v.k*float64(pt.Footprint.Width)) / 2
		jaw := draw.LineStyle{Color: layScreenColor, Width: vg.Points(1.6)}
		for _, sgn := range []vg.Length{1, -1} {
			p, q := local(at, a, 0, sgn*open), local(at, a, 0, sgn*body)
			c.StrokeLine2(jaw, p.X, p.Y, q.X, q.Y)
		}
	case paraxial.KindSpace:
	}
}

// lensAcross returns the outline of a slim lens symbol centred at c,
// spanning ±half across the axis at angle a: biconvex for a converging
// lens, biconcave with flat ends for a diverging one (the layout
// drawing's silhouette, turned).
func lensAcross(c vg.Point, a float64, half vg.Length, converging bool) []vg.Point {
	const n = 12
	centre, rim := vg.Points(2.2), vg.Points(0.5)
	if !converging {
		centre, rim = vg.Points(0.7), vg.Points(2.4)
	}
	th := func(t float64) vg.Length { return rim + (centre-rim)*vg.Length(1-t*t) }
	pts := make([]vg.Point, 0, 2*n+2)
	for i := range n + 1 {
		t := -1 + 2*float64(i)/n
		pts = append(pts, local(c, a, -th(t), half*vg.Length(t)))
	}
	for i := n; i >= 0; i-- {
		t := -1 + 2*float64(i)/n
		pts = append(pts, local(c, a, th(t), half*vg.Length(t)))
	}
	return pts
}

// arrow draws an arrowhead at p pointing along angle a: open at the
// input, filled at the output.
func arrow(c draw.Canvas, p vg.Point, a float64, filled bool) {
	tip := local(p, a, vg.Points(5), 0)
	l, r := local(p, a, -vg.Points(1), vg.Points(3)), local(p, a, -vg.Points(1), -vg.Points(3))
	if filled {
		c.FillPolygon(envelopeColor, []vg.Point{tip, l, r})
		return
	}
	c.StrokeLines(draw.LineStyle{Color: envelopeColor, Width: vg.Points(0.9)}, []vg.Point{l, tip, r})
}

// marker draws warning number n in a ring at p.
func marker(c draw.Canvas, sty text.Style, p vg.Point, n int) {
	r := vg.Points(4.5)
	ring := make([]vg.Point, 0, 25)
	for i := range 25 {
		s, co := math.Sincos(2 * math.Pi * float64(i) / 24)
		ring = append(ring, vg.Point{X: p.X + r*vg.Length(co), Y: p.Y + r*vg.Length(s)})
	}
	c.FillPolygon(whiteColor, ring)
	c.StrokeLines(draw.LineStyle{Color: warnColor, Width: vg.Points(1)}, ring)
	t := sty
	t.Color = warnColor
	t.XAlign, t.YAlign = draw.XCenter, draw.YCenter
	c.FillText(t, p, strconv.Itoa(n))
}

// scaleBar draws a bar of a round length in the board's unit (1, 2 or
// 5 × a power of ten, about a fifth of the board's width) at the right
// end of the key line y, no further left than x.
func scaleBar(c draw.Canvas, sty text.Style, v planView, b plan.Board, y, x vg.Length) {
	u, sym := units.Millimeter, "mm"
	if b.Grid == plan.Imperial {
		u, sym = units.Inch, "in"
	}
	want := float64(b.SizeX/u) / 5
	l := math.Pow(10, math.Floor(math.Log10(want)))
	for _, f := range []float64{5, 2, 1} {
		if f*l <= want {
			l *= f
			break
		}
	}
	label := table.Sig(l, 3) + " " + sym
	w := vg.Length(v.k * l * float64(u))
	right := v.ox + vg.Length(v.k*float64(b.SizeX))
	x0 := right - w
	lw := sty.Width(label) + vg.Points(4)
	if x0-lw < x {
		return
	}
	mid := y + vg.Points(2)
	bar := draw.LineStyle{Color: labelColor, Width: vg.Points(1.2)}
	c.StrokeLine2(bar, x0, mid, right, mid)
	tick := draw.LineStyle{Color: labelColor, Width: vg.Points(0.8)}
	for _, xx := range []vg.Length{x0, right} {
		c.StrokeLine2(tick, xx, mid-vg.Points(2.5), xx, mid+vg.Points(2.5))
	}
	t := sty
	t.XAlign = draw.XRight
	c.FillText(t, vg.Point{X: x0 - vg.Points(4), Y: y}, label)
}

// bounds returns the bounding rectangle of canvas points.
func bounds(ps []vg.Point) vg.Rectangle {
	r := vg.Rectangle{Min: ps[0], Max: ps[0]}
	for _, q := range ps[1:] {
		r.Min.X, r.Min.Y = min(r.Min.X, q.X), min(r.Min.Y, q.Y)
		r.Max.X, r.Max.Y = max(r.Max.X, q.X), max(r.Max.Y, q.Y)
	}
	return r
}

// placeLabel returns the rectangle (its Min is the text's origin) of a
// part's label beside its footprint box own: above, below, right, left
// or at a corner, the first of those that covers the least of the other
// labels (taken), the footprints (boxes) and the beam (axis), and stays
// in the canvas.
func placeLabel(sty text.Style, s string, own vg.Rectangle, boxes, taken []vg.Rectangle, axis []vg.Point, c draw.Canvas) vg.Rectangle {
	w, h := sty.Width(s), sty.FontExtents().Height
	g := vg.Points(2)
	cx, cy := (own.Min.X+own.Max.X)/2, (own.Min.Y+own.Max.Y)/2
	cands := []vg.Point{
		{X: cx - w/2, Y: own.Max.Y + g},     // above
		{X: cx - w/2, Y: own.Min.Y - g - h}, // below
		{X: own.Max.X + g, Y: cy - h/2},     // right
		{X: own.Min.X - g - w, Y: cy - h/2}, // left
		{X: own.Max.X + g, Y: own.Max.Y + g},
		{X: own.Min.X - g - w, Y: own.Max.Y + g},
		{X: own.Max.X + g, Y: own.Min.Y - g - h},
		{X: own.Min.X - g - w, Y: own.Min.Y - g - h},
	}
	best, bestScore := 0, math.Inf(1)
	for i, o := range cands {
		r := vg.Rectangle{Min: o, Max: vg.Point{X: o.X + w, Y: o.Y + h}}
		score := 0.0
		for _, t := range taken {
			score += 4 * overlapArea(r, t)
		}
		for _, bx := range boxes {
			score += overlapArea(r, bx)
		}
		for j := 1; j < len(axis); j++ {
			if segmentHitsRect(axis[j-1], axis[j], r) {
				score += 200
			}
		}
		if r.Min.X < c.Min.X || r.Max.X > c.Max.X || r.Min.Y < c.Min.Y || r.Max.Y > c.Max.Y {
			score += 1e6
		}
		if score < bestScore {
			best, bestScore = i, score
		}
	}
	o := cands[best]
	return vg.Rectangle{Min: o, Max: vg.Point{X: o.X + w, Y: o.Y + h}}
}

// segmentHitsRect reports whether the canvas segment pq meets r (the
// Liang–Barsky clip of the segment to the rectangle).
func segmentHitsRect(p, q vg.Point, r vg.Rectangle) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := float64(q.X-p.X), float64(q.Y-p.Y)
	for _, e := range [4][2]float64{{-dx, float64(p.X - r.Min.X)}, {dx, float64(r.Max.X - p.X)}, {-dy, float64(p.Y - r.Min.Y)}, {dy, float64(r.Max.Y - p.Y)}} {
		if e[0] == 0 {
			if e[1] < 0 {
				return false
			}
			continue
		}
		t := e[1] / e[0]
		if e[0] < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return false
		}
	}
	return true
}
