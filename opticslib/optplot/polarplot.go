package optplot

import (
	"errors"
	"image/color"
	"math"
	"math/cmplx"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/table"
)

// State is a polarization state drawn by [PolarizationEllipse]: a Jones
// vector and the name it carries in the key or above its panel.
type State struct {
	// Label names the state ("after HWP"); an empty label prints as
	// "state k" (k from 1).
	Label string
	// Jones is the state (package polar's frame and conventions); only
	// its shape is drawn, normalised to its own power.
	Jones polar.Jones
}

// ErrPolarization is wrapped by the errors of [PolarizationEllipse] and
// [PolarizationBudget] for states they cannot draw: none, too many, a
// component that is not finite, or a state without light.
var ErrPolarization = errors.New("optplot: polarization figure needs states with light and finite components")

// MaxStates is the largest number of states [PolarizationEllipse] and
// [PolarizationBudget] draw: beyond it the small panels are too small to
// read.
const MaxStates = 36

// SmallMultiples chooses the layout of [PolarizationEllipse] and
// [PolarizationBudget]: on, one small panel per state in a grid, each
// with its name above and its azimuth, ellipticity and handedness below;
// off, all ellipses overlaid in one field plane with a key. The default
// is off for PolarizationEllipse and on for PolarizationBudget.
func SmallMultiples(on bool) Option {
	return func(c *config) { c.multiples, c.multiplesSet = on, true }
}

// polarNote states the frame of the ellipse figures; polarNoteShort is
// the same in two short lines, for the key.
const polarNote = "Seen facing the source, x to the right, y up; the arrows give the sense of rotation (right-handed: clockwise)."

var polarNoteShort = []string{"Seen facing the source, x right, y up;", "arrows: sense of rotation (right-handed: clockwise)."}

// PolarizationEllipse returns a figure of the polarization ellipse of
// each state in the x–y field plane, seen facing the source with x to
// the right and y up (package polar's frame): the path of the field
// vector Re[(X, Y) e^{iωt}] over one period, normalised to the state's
// own power so that the major axis of a linear state spans the dotted
// unit circle and a circular state is the circle of radius 1/√2, with
// arrowheads giving its sense of rotation (right-handed light turns
// clockwise, as package polar names it). Linear states are lines without
// arrows.
//
// Overlaid (the default), the states share one field plane in the
// package's line colours, and the key gives each state's azimuth ψ,
// ellipticity angle χ and handedness ([polar.Jones.Ellipse]); with
// [SmallMultiples] each state has its own panel, its major axis dotted.
// The options [Title], [Caption] and [Size] apply. The default caption
// lists the states.
//
// It returns a [*ParamError] wrapping [ErrPolarization] for no states,
// more than [MaxStates], a component that is not finite or a state
// without light, and one wrapping [ErrOption] for a bad option.
func PolarizationEllipse(states []State, opts ...Option) (Figure, error) {
	const fn = "PolarizationEllipse"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if len(states) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "states", Value: 0, Reason: "need at least one", Err: ErrPolarization}
	}
	if len(states) > MaxStates {
		return Figure{}, &ParamError{Func: fn, Param: "states", Value: len(states), Reason: "must be at most " + strconv.Itoa(MaxStates) + ": draw them in several figures", Err: ErrPolarization}
	}
	drawn := make([]ellipseState, len(states))
	for i, s := range states {
		name := s.Label
		if name == "" {
			name = "state " + strconv.Itoa(i+1)
		}
		if err := checkJones(fn, "state "+strconv.Itoa(i+1)+" "+strconv.Quote(name), s.Jones); err != nil {
			return Figure{}, err
		}
		if !(s.Jones.Power() > 0) {
			return Figure{}, &ParamError{Func: fn, Param: "state " + strconv.Itoa(i+1) + " " + strconv.Quote(name) + " power", Value: s.Jones.Power(), Reason: "must be positive: a state without light has no ellipse", Err: ErrPolarization}
		}
		drawn[i] = ellipseState{label: name, jones: s.Jones}
	}
	title := "Polarization ellipses"
	if len(states) == 1 {
		title = "Polarization ellipse"
	}
	if cfg.titleSet {
		title = cfg.title
	}
	var parts []string
	for _, s := range drawn {
		parts = append(parts, s.label+": "+stateSummary(s.jones.Ellipse()))
	}
	caption := title + " in the field plane, seen facing the source (x right, y up), each normalised to its own power; arrows give the sense of rotation (right-handed: clockwise). " + strings.Join(parts, "; ") + "."
	return ellipseFigure(cfg, title, caption, drawn, cfg.multiplesSet && cfg.multiples)
}

// PolarizationBudget returns the polarization ellipses along the chain of
// budget b ([polar.Trace]): the input and the state after each element,
// drawn as [PolarizationEllipse] draws them, labelled with the element's
// name and the power left as a fraction of the input. Steps where no
// light is left (below 1e-15 of the input, as [polar.Budget.Table]
// judges) show "no light". The default layout is one small panel per
// state ([SmallMultiples]); SmallMultiples(false) overlays them, leaving
// out the dark steps. The options [Title], [Caption] and [Size] apply.
//
// It returns a [*ParamError] wrapping [ErrPolarization] for a budget
// whose input has no light or a component that is not finite (one that
// polar.Trace did not make), or with more than [MaxStates] states, and
// one wrapping [ErrOption] for a bad option.
func PolarizationBudget(b polar.Budget, opts ...Option) (Figure, error) {
	const fn = "PolarizationBudget"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkJones(fn, "input", b.Input); err != nil {
		return Figure{}, err
	}
	p0 := b.Input.Power()
	if !(p0 > 0) {
		return Figure{}, &ParamError{Func: fn, Param: "input power", Value: p0, Reason: "must be positive (make the budget with polar.Trace)", Err: ErrPolarization}
	}
	if n := len(b.Steps) + 1; n > MaxStates {
		return Figure{}, &ParamError{Func: fn, Param: "states", Value: n, Reason: "must be at most " + strconv.Itoa(MaxStates) + " (the input and each step): split the chain", Err: ErrPolarization}
	}
	multiples := !cfg.multiplesSet || cfg.multiples
	states := []ellipseState{{label: "input", jones: b.Input}}
	parts := []string{"input: " + stateSummary(b.Input.Ellipse())}
	for k, s := range b.Steps {
		name := s.Name
		if name == "" {
			name = "element " + strconv.Itoa(k+1)
		}
		if err := checkJones(fn, "step "+strconv.Itoa(k+1)+" "+strconv.Quote(name), s.Out); err != nil {
			return Figure{}, err
		}
		dark := s.Out.Power() <= 1e-15*p0
		frac := table.Fixed(100*s.Out.Power()/p0, 1) + " %"
		st := ellipseState{label: "after " + name, power: frac, jones: s.Out, dark: dark}
		if dark {
			parts = append(parts, st.label+": no light")
			if !multiples {
				continue
			}
		} else {
			parts = append(parts, st.label+" ("+frac+"): "+stateSummary(s.Out.Ellipse()))
		}
		states = append(states, st)
	}
	title := "Polarization along the chain"
	if cfg.titleSet {
		title = cfg.title
	}
	caption := title + ": the state after each element in the field plane, seen facing the source (x right, y up), normalised to its own power, with the power left as a fraction of the input; arrows give the sense of rotation (right-handed: clockwise). " + strings.Join(parts, "; ") + "."
	return ellipseFigure(cfg, title, caption, states, multiples)
}

// checkJones returns a [*ParamError] unless both components of v are
// finite.
func checkJones(fn, name string, v polar.Jones) error {
	for _, z := range []complex128{v.X, v.Y} {
		if cmplx.IsNaN(z) || cmplx.IsInf(z) {
			return &ParamError{Func: fn, Param: name, Value: v.String(), Reason: "components must be finite", Err: ErrPolarization}
		}
	}
	if p := v.Power(); !finite(p) {
		return &ParamError{Func: fn, Param: name + " power", Value: p, Reason: "overflows", Err: ErrPolarization}
	}
	return nil
}

// stateWords names an ellipse as package polar's budget table does,
// judged on χ printed with two decimals: "linear", "right circular",
// "left elliptical", ….
func stateWords(e polar.Ellipse) string {
	chi := math.Round(e.Ellipticity.Degrees() * 100)
	switch {
	case chi == 0:
		return "linear"
	case chi == 4500:
		return "right circular"
	case chi == -4500:
		return "left circular"
	case chi > 0:
		return "right elliptical"
	}
	return "left elliptical"
}

// stateSummary describes an ellipse in one line: "ψ 30.0°, χ 10.0°,
// right elliptical", without ψ for circular light.
func stateSummary(e polar.Ellipse) string {
	words := stateWords(e)
	chi := "χ " + table.Fixed(e.Ellipticity.Degrees(), 1) + "°"
	if strings.HasSuffix(words, "circular") {
		return chi + ", " + words
	}
	return "ψ " + table.Fixed(e.Azimuth.Degrees(), 1) + "°, " + chi + ", " + words
}

// ellipseState is one state of an ellipse figure.
type ellipseState struct {
	label string
	power string // the fraction of the input, for a budget; "" otherwise
	jones polar.Jones
	dark  bool
	color color.Color
	style draw.LineStyle
}

// ellipseFigure makes the figure of the states, overlaid or in panels.
func ellipseFigure(cfg config, title, caption string, states []ellipseState, multiples bool) (Figure, error) {
	p := newPlot(title, "", "")
	p.HideAxes()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 1, 0, 1
	sc := &scene{}
	k := 0
	for i := range states {
		sty := seriesStyles[k%len(seriesStyles)]
		sty.Width = vg.Points(1.5)
		if multiples {
			sty = draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
		}
		states[i].style, states[i].color = sty, sty.Color
		if !states[i].dark {
			k++
		}
	}
	p.Add(&ellipses{states: states, multiples: multiples, scene: sc})
	if !multiples {
		key := &keyBox{scene: sc}
		for _, s := range states {
			key.entries = append(key.entries, keyEntry{text: s.label + ": " + stateSummary(s.jones.Ellipse()), line: s.style})
		}
		key.notes = append(key.notes, polarNoteShort...)
		p.Add(key)
	}
	return cfg.figure(p, caption), nil
}

// ellipses draws the field plane with the ellipses of its states: one
// panel at the left of the data area with all states (the key goes
// beside it), or a grid of panels, one per state, with a note of the
// frame along the bottom.
type ellipses struct {
	states    []ellipseState
	multiples bool
	scene     *scene
}

var _ plot.Plotter = (*ellipses)(nil)

// Plot implements plot.Plotter.
func (e *ellipses) Plot(c draw.Canvas, plt *plot.Plot) {
	sty := withFont(text.Style{Color: labelColor, XAlign: draw.XCenter, YAlign: draw.YTop, Handler: plot.DefaultTextHandler}, plt, 7.5)
	lineH := sty.FontExtents().Height
	w, h := c.Max.X-c.Min.X, c.Max.Y-c.Min.Y
	if !e.multiples {
		// One field plane, as large as the height allows and at most
		// 42 % of the width: the key, up to 55 % wide, goes beside it.
		side := min(h, 0.42*w)
		ctr := vg.Point{X: c.Min.X + side/2, Y: (c.Min.Y + c.Max.Y) / 2}
		fieldPlane(c, sty, ctr, side, e.states, false)
		e.scene.take(vg.Rectangle{Min: vg.Point{X: ctr.X - side/2, Y: ctr.Y - side/2}, Max: vg.Point{X: ctr.X + side/2, Y: ctr.Y + side/2}})
		return
	}
	// A note of the frame along the bottom, then the grid of panels:
	// the number of columns that gives the largest panels, the grid
	// centred in the space left.
	note := sty
	note.XAlign, note.YAlign = draw.XLeft, draw.YBottom
	notes := wrap(note, polarNote, w)
	for i, n := range notes {
		c.FillText(note, vg.Point{X: c.Min.X, Y: c.Min.Y + vg.Length(len(notes)-1-i)*lineH}, n)
	}
	avail := h - vg.Length(len(notes))*lineH - vg.Points(6)
	n := len(e.states)
	power := false
	for _, s := range e.states {
		power = power || s.power != ""
	}
	// Each cell: its label (up to two lines), the power line of a
	// budget, the panel, two lines of text, and gaps.
	gap := vg.Points(3)
	text := 4 * lineH
	if power {
		text += lineH
	}
	text += 3 * gap
	bestCols, bestSide := 1, vg.Length(-1)
	for cols := 1; cols <= n; cols++ {
		rows := (n + cols - 1) / cols
		side := min(w/vg.Length(cols)-vg.Points(10), avail/vg.Length(rows)-text)
		if side > bestSide {
			bestCols, bestSide = cols, side
		}
	}
	cols := bestCols
	rows := (n + cols - 1) / cols
	side := max(bestSide, vg.Points(12))
	cw, ch := w/vg.Length(cols), side+text
	top0 := c.Max.Y - max(0, (avail-vg.Length(rows)*ch)/2)
	for i, s := range e.states {
		col, row := i%cols, i/cols
		cx := c.Min.X + vg.Length(col)*cw + cw/2
		y := top0 - vg.Length(row)*ch
		// The label, wrapped to the cell, at most two lines, set at the
		// bottom of its two lines.
		label := wrap(sty, s.label, cw-vg.Points(6))
		if len(label) > 2 {
			label = append(label[:1], strings.Join(label[1:], " "))
		}
		if len(label) < 2 {
			y -= lineH
		}
		for _, l := range label {
			c.FillText(sty, vg.Point{X: cx, Y: y}, l)
			y -= lineH
		}
		if power {
			if s.power != "" && !s.dark {
				p := sty
				p.Color = axisColor
				c.FillText(p, vg.Point{X: cx, Y: y}, s.power+" of input")
			}
			y -= lineH
		}
		y -= gap
		fieldPlane(c, sty, vg.Point{X: cx, Y: y - side/2}, side, []ellipseState{s}, true)
		y -= side + gap
		if s.dark {
			continue
		}
		el := s.jones.Ellipse()
		words := stateWords(el)
		angles := "χ " + table.Fixed(el.Ellipticity.Degrees(), 1) + "°"
		if !strings.HasSuffix(words, "circular") {
			angles = "ψ " + table.Fixed(el.Azimuth.Degrees(), 1) + "°, " + angles
		}
		c.FillText(sty, vg.Point{X: cx, Y: y}, angles)
		c.FillText(sty, vg.Point{X: cx, Y: y - lineH}, words)
	}
}

// fieldPlane draws one field plane in the square of the given side
// centred at ctr: the x and y axes with their letters, the dotted unit
// circle and the ellipse of each state (its major axis dotted when axis
// is set); a dark state is "no light".
func fieldPlane(c draw.Canvas, sty text.Style, ctr vg.Point, side vg.Length, states []ellipseState, axis bool) {
	tag := sty
	tag.Color = axisColor
	tagH := tag.FontExtents().Height
	r := max(vg.Points(4), (side/2-tagH)/1.1)
	ext := r * 1.1
	axisSty := draw.LineStyle{Color: axisColor, Width: vg.Points(0.6)}
	c.StrokeLine2(axisSty, ctr.X-ext, ctr.Y, ctr.X+ext, ctr.Y)
	c.StrokeLine2(axisSty, ctr.X, ctr.Y-ext, ctr.X, ctr.Y+ext)
	tag.XAlign, tag.YAlign = draw.XLeft, draw.YCenter
	c.FillText(tag, vg.Point{X: ctr.X + ext + vg.Points(1.5), Y: ctr.Y}, "x")
	tag.XAlign, tag.YAlign = draw.XCenter, draw.YBottom
	c.FillText(tag, vg.Point{X: ctr.X, Y: ctr.Y + ext + vg.Points(1)}, "y")
	circle := make([]vg.Point, 0, 121)
	for i := range 121 {
		s, co := math.Sincos(2 * math.Pi * float64(i) / 120)
		circle = append(circle, vg.Point{X: ctr.X + r*vg.Length(co), Y: ctr.Y + r*vg.Length(s)})
	}
	c.StrokeLines(draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}, circle)
	for _, s := range states {
		if s.dark {
			t := sty
			t.YAlign = draw.YCenter
			t.Color = axisColor
			c.FillText(t, vg.Point{X: ctr.X, Y: ctr.Y + r/2}, "no light")
			continue
		}
		drawEllipse(c, ctr, r, s, axis)
	}
}

// ellipseSamples is the number of points per period of an ellipse.
const ellipseSamples = 144

// ellipsePath returns the field of v normalised to unit power,
// Re[(X, Y) e^{iωt}]/√P, at ellipseSamples + 1 instants over one period
// from ωt = 0 (the last point repeats the first), x to the right and y
// up as seen facing the source. v must carry light.
func ellipsePath(v polar.Jones) [][2]float64 {
	a := math.Sqrt(v.Power())
	x, y := v.X/complex(a, 0), v.Y/complex(a, 0)
	out := make([][2]float64, ellipseSamples+1)
	for i := range out {
		e := cmplx.Exp(complex(0, 2*math.Pi*float64(i)/ellipseSamples))
		out[i] = [2]float64{real(x * e), real(y * e)}
	}
	return out
}

// drawEllipse draws the path of the field of s over one period, scaled
// so that a field of unit amplitude reaches radius r, with two
// arrowheads at the ends of the major axis pointing along the motion.
func drawEllipse(c draw.Canvas, ctr vg.Point, r vg.Length, s ellipseState, axis bool) {
	path := ellipsePath(s.jones)
	pts := make([]vg.Point, len(path))
	far, farAt := -1.0, 0
	for i, e := range path {
		pts[i] = vg.Point{X: ctr.X + r*vg.Length(e[0]), Y: ctr.Y + r*vg.Length(e[1])}
		if d := float64(e[0]*e[0]) + float64(e[1]*e[1]); i < ellipseSamples && d > far+1e-12 {
			far, farAt = d, i
		}
	}
	el := s.jones.Ellipse()
	words := stateWords(el)
	if words == "linear" {
		// A line, drawn once end to end (the path retraces it, which
		// would blur a dash pattern).
		end := pts[farAt]
		c.StrokeLine2(s.style, 2*ctr.X-end.X, 2*ctr.Y-end.Y, end.X, end.Y)
		return
	}
	if axis && !strings.HasSuffix(words, "circular") {
		sn, cs := math.Sincos(float64(el.Azimuth))
		dx, dy := r*vg.Length(cs), r*vg.Length(sn)
		c.StrokeLine2(draw.LineStyle{Color: s.color, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}, ctr.X-dx, ctr.Y-dy, ctr.X+dx, ctr.Y+dy)
	}
	c.StrokeLines(s.style, pts)
	size := vg.Points(6)
	for _, i := range []int{farAt, (farAt + ellipseSamples/2) % ellipseSamples} {
		prev, next := pts[(i+ellipseSamples-1)%ellipseSamples], pts[i+1]
		dx, dy := float64(next.X-prev.X), float64(next.Y-prev.Y)
		l := math.Hypot(dx, dy)
		if l == 0 {
			continue
		}
		ux, uy := vg.Length(dx/l), vg.Length(dy/l)
		tip := vg.Point{X: pts[i].X + ux*size/2, Y: pts[i].Y + uy*size/2}
		back := vg.Point{X: pts[i].X - ux*size/2, Y: pts[i].Y - uy*size/2}
		half := size * 0.42
		c.FillPolygon(s.color, []vg.Point{tip, {X: back.X - uy*half, Y: back.Y + ux*half}, {X: back.X + uy*half, Y: back.Y - ux*half}})
	}
}
