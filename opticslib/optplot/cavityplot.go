package optplot

import (
	"errors"
	"image/color"
	"math"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrCavity is wrapped by the errors of [Stability], [CavityTransmission]
// and [CavityCaustic] for a cavity they cannot draw: the zero Cavity, no
// mirror reflectivities (transmission), or no confined eigenmode (an
// unstable cavity or one on the stability boundary, for the transmission
// and the caustic). The error wraps the cavity package's error as well,
// so errors.Is(err, cavity.ErrUnstable) also holds.
var ErrCavity = errors.New("optplot: cavity figure needs a built cavity (cavity.Linear or cavity.Ring) with a confined eigenmode")

// cavityError returns the [*ParamError] of figure fn for the error err of
// package cavity.
func cavityError(fn string, err error) error {
	return &ParamError{Func: fn, Param: "cavity", Reason: strings.TrimPrefix(err.Error(), "cavity: "), Err: errors.Join(ErrCavity, err)}
}

// DetuningRange sets the detuning range of [CavityTransmission], from lo
// to hi in Hz relative to a TEM00 resonance (finite, lo < hi, at most 20
// FSR apart: CavityTransmission checks that). The default is
// −0.1 … 1.1 FSR: a scan over one free spectral range with TEM00 at both
// ends; a range of a few linewidths shows which modes overlap it.
func DetuningRange(lo, hi float64) Option {
	return func(c *config) {
		if !finite(lo) || !finite(hi) || !(lo < hi) {
			c.fail("DetuningRange", "range lo … hi", strconv.FormatFloat(lo, 'g', 6, 64)+" Hz … "+strconv.FormatFloat(hi, 'g', 6, 64)+" Hz", "must be finite with lo < hi")
			return
		}
		c.hasDetuning, c.d0, c.d1 = true, lo, hi
	}
}

// FSRUnits draws the detuning axis of [CavityTransmission] in units of
// the free spectral range instead of in Hz with an SI prefix (default
// off).
func FSRUnits(on bool) Option { return func(c *config) { c.fsrUnits = on } }

// Decibels chooses the transmission axis of [CavityTransmission]: on (the
// default), the transmission relative to the peak in dB, which shows the
// wings of the resonance and every mode position down to the
// off-resonance floor; off, T/T_max on a linear axis from 0 to 1, which
// shows the resonance as a laser engineer sees it on a photodiode.
func Decibels(on bool) Option { return func(c *config) { c.linearT = !on } }

// ModeOrder sets the largest transverse order m + n of the modes that
// [CavityTransmission] marks, 0 … [cavity.MaxSpectrumOrder] (default 4).
// See [CavityTransmission] for which of them are labelled.
func ModeOrder(n int) Option {
	return func(c *config) {
		if n < 0 || n > cavity.MaxSpectrumOrder {
			c.fail("ModeOrder", "order m + n", n, "must be in [0, "+strconv.Itoa(cavity.MaxSpectrumOrder)+"]")
			return
		}
		c.order, c.orderSet = n, true
	}
}

// Defaults of the cavity figures.
const (
	defaultModeOrder = 4
	labelModeOrder   = 3
	// maxDetuningFSR is the widest [DetuningRange], in FSR.
	maxDetuningFSR = 20
	// maxAllLabelled is the largest number of distinct mode positions
	// that [CavityTransmission] labels all of (a round cavity has one per
	// order).
	maxAllLabelled = 8
	// nearFraction is the distance from TEM00, as a fraction of the FSR,
	// within which [CavityTransmission] labels a mode of any order: the
	// window of [cavity.DegeneracyWindow], doubled.
	nearFraction = 2 * cavity.DegeneracyWindow
)

// nearColor marks the transverse modes close to TEM00 in
// [CavityTransmission]: the package's ochre.
var nearColor = lensColor

// near returns the distance of a mode at within (Hz in [0, fsr)) from
// the nearest TEM00 resonance.
func near(within, fsr float64) float64 { return math.Min(math.Abs(within), math.Abs(fsr-within)) }

// Stability returns the stability diagram of cavity c: the g1–g2 plane
// with the stable region 0 < g1·g2 < 1 shaded, its boundaries (the
// hyperbola g1·g2 = 1 and the axes, g1·g2 = 0), the symmetric cavities
// g1 = g2 dotted, the planar (1, 1), confocal (0, 0) and concentric
// (−1, −1) cavities labelled, and the design marked.
//
// For a linear cavity the design is the point (g1, g2) of
// [cavity.PlaneStability] (the equivalent g-parameters of the one-way
// path when there are elements between the mirrors), one point for each
// of the tangential (x) and sagittal (y) planes when they differ, for
// example with tilted curved fold mirrors.
//
// A ring has no g-parameters; what it has is the round-trip half-trace
// m = (A + D)/2 and the round-trip Gouy phase ψ. The figure marks the
// symmetric two-mirror cavity with the same m and ψ, g = cos(ψ/2) (ψ
// reduced to [0, 2π); a two-mirror cavity has m = 2g1g2 − 1 and
// ψ = 2 arccos(±√(g1g2))), on the diagonal, and draws dashed the branch
// of the hyperbola g1·g2 = (1 + m)/2 through it, every two-mirror cavity
// with the same m. Without a confined mode (an unstable ring) ψ and so
// the branch are unknown: both branches are drawn and no point. The
// caption says which presentation is drawn.
//
// The axes span at least −2 … 2 in g2 and as much in g1 as keeps the
// hyperbola undistorted in the figure's shape, and grow to take in the
// design; a design beyond |g| = 10 is drawn at the edge, hollow. The
// options [Title], [Caption] and [Size] apply. It returns a
// [*ParamError] wrapping [ErrCavity] for the zero Cavity, and one
// wrapping [ErrOption] for a bad option.
func Stability(c cavity.Cavity, opts ...Option) (Figure, error) {
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	st, err := c.Stability()
	if err != nil {
		return Figure{}, cavityError("Stability", err)
	}
	ring := !st.X.HasG
	type design struct {
		g1, g2 float64
		ok     bool    // the point is known
		p      float64 // g1·g2 (equivalent, for a ring)
		ps     cavity.PlaneStability
		name   string
		color  color.Color
	}
	planes := []design{{ps: st.X, name: "x", color: envelopeColor}, {ps: st.Y, name: "y", color: yColor}}
	var gouy [2]float64
	haveGouy := false
	if ring {
		if sp, err := c.ModeSpacing(); err == nil {
			gouy = [2]float64{float64(sp.X.Phase), float64(sp.Y.Phase)}
			haveGouy = true
		}
	}
	for i := range planes {
		d := &planes[i]
		if !ring {
			d.g1, d.g2, d.ok = d.ps.G1, d.ps.G2, true
			d.p = float64(d.g1 * d.g2)
			continue
		}
		d.p = (1 + d.ps.HalfTrace) / 2
		if haveGouy {
			g := symmetricG(gouy[i])
			d.g1, d.g2, d.ok = g, g, true
		}
	}
	same := math.Abs(planes[0].g1-planes[1].g1) <= 1e-12*math.Max(1, math.Abs(planes[0].g1)) &&
		math.Abs(planes[0].g2-planes[1].g2) <= 1e-12*math.Max(1, math.Abs(planes[0].g2)) &&
		math.Abs(planes[0].p-planes[1].p) <= 1e-12*math.Max(1, math.Abs(planes[0].p))
	if same {
		planes = planes[:1]
		planes[0].name = ""
	}

	// Ranges: g2 from −hy to hy, g1 from −hx to hx with hx/hy the aspect
	// of the data area (estimated from the figure size), so that the
	// hyperbola is not distorted.
	w, h := DefaultWidth, DefaultHeight
	if cfg.width > 0 {
		w, h = cfg.width, cfg.height
	}
	aspect := math.Max(0.5, float64((w-vg.Points(62))/(h-vg.Points(58))))
	const maxG = 10.0
	hy := 2.0
	for _, d := range planes {
		if d.ok {
			hy = math.Max(hy, math.Min(maxG, 1.12*math.Abs(d.g2)))
			hy = math.Max(hy, math.Min(maxG, 1.12*math.Abs(d.g1))/aspect)
		}
	}
	hx := hy * aspect

	title := "Stability diagram"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, "g1", "g2")
	if ring {
		p.X.Label.Text, p.Y.Label.Text = "g1 (equivalent two-mirror cavity)", "g2 (equivalent)"
	}
	p.X.Tick.Marker = niceTicks{target: 8}
	sc := &scene{}
	key := &keyBox{scene: sc}

	// The stable region: between the axes and the hyperbola, in the
	// first and third quadrants.
	hyper := func(sign float64) plotter.XYs {
		var xys plotter.XYs
		a, b := math.Log(1/hy), math.Log(hx)
		for i := range 241 {
			g1 := math.Exp(a + (b-a)*float64(i)/240)
			xys = append(xys, plotter.XY{X: sign * g1, Y: sign / g1})
		}
		return xys
	}
	for _, sign := range []float64{1, -1} {
		shade := plotter.XYs{{X: 0, Y: 0}, {X: 0, Y: sign * hy}}
		shade = append(shade, hyper(sign)...)
		shade = append(shade, plotter.XY{X: sign * hx, Y: 0})
		poly, err := plotter.NewPolygon(shade)
		if err != nil {
			return Figure{}, err
		}
		poly.Color = bandColor
		poly.LineStyle = draw.LineStyle{}
		p.Add(poly)
	}
	axisLine := draw.LineStyle{Color: axisColor, Width: vg.Points(0.8)}
	for _, l := range []plotter.XYs{{{X: -hx, Y: 0}, {X: hx, Y: 0}}, {{X: 0, Y: -hy}, {X: 0, Y: hy}}} {
		if err := addLine(p, l, axisLine); err != nil {
			return Figure{}, err
		}
	}
	diag := zeroStyle
	dd := math.Min(hx, hy)
	if err := addLine(p, plotter.XYs{{X: -dd, Y: -dd}, {X: dd, Y: dd}}, diag); err != nil {
		return Figure{}, err
	}
	bound := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.2)}
	for _, sign := range []float64{1, -1} {
		xys := hyper(sign)
		if err := addLine(p, xys, bound); err != nil {
			return Figure{}, err
		}
		key.avoid = append(key.avoid, thin(xys, 60))
	}
	// The key should not hide the stable region: points on a grid over
	// it count as data to keep clear.
	var region plotter.XYs
	for i := range 41 {
		for j := range 41 {
			g1, g2 := hx*(float64(i)/20-1), hy*(float64(j)/20-1)
			if pr := g1 * g2; pr > 0 && pr < 1 {
				region = append(region, plotter.XY{X: g1, Y: g2})
			}
		}
	}
	key.avoid = append(key.avoid, region)
	key.entries = append(key.entries,
		keyEntry{text: "stable, 0 < g1·g2 < 1", fill: bandColor},
		keyEntry{text: "g1·g2 = 1 (and 0 on the axes)", line: bound},
		keyEntry{text: "symmetric, g1 = g2", line: diag})

	marks := &pointMarks{scene: sc}
	special := labelColor
	marks.marks = append(marks.marks,
		pointMark{x: 1, y: 1, text: "planar", color: special, dx: 5, dy: 3, xalign: draw.XLeft, yalign: draw.YBottom},
		pointMark{x: 0, y: 0, text: "confocal", color: special, dx: 5, dy: -3, xalign: draw.XLeft, yalign: draw.YTop},
		pointMark{x: -1, y: -1, text: "concentric", color: special, dx: -5, dy: -3, xalign: draw.XRight, yalign: draw.YTop},
	)

	// The design.
	var parts []string
	for _, d := range planes {
		planeName := ""
		switch d.name {
		case "x":
			planeName = "x (tangential)"
		case "y":
			planeName = "y (sagittal)"
		}
		class := d.ps.Class.String()
		lead, capLead := "design: ", ""
		if d.name != "" {
			lead, capLead = d.name+": ", planeName+": "
		}
		var text, cap string
		if ring {
			text = lead + "m = " + fixed3(d.ps.HalfTrace)
			if d.ok {
				text += ", g = cos(ψ/2) = " + fixed3(d.g1)
			} else {
				text += ", g1·g2 = (1 + m)/2 = " + fixed3(d.p)
			}
			cap = capLead + "m = (A + D)/2 = " + fixed3(d.ps.HalfTrace) + ", equivalent g1·g2 = " + fixed3(d.p)
			if d.ok {
				cap += ", g = " + fixed3(d.g1)
			}
		} else {
			text = lead + "g1 = " + fixed3(d.g1) + ", g2 = " + fixed3(d.g2)
			cap = capLead + "g1 = " + fixed3(d.g1) + ", g2 = " + fixed3(d.g2) + " (g1·g2 = " + fixed3(d.p) + ")"
		}
		text += ", " + class
		cap += ", " + class
		parts = append(parts, cap)
		sty := draw.LineStyle{Color: d.color, Width: vg.Points(1.1), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
		if ring && d.p != 0 {
			// The two-mirror cavities with the same half-trace: one
			// branch when ψ fixes it, both otherwise.
			signs := []float64{1, -1}
			if d.ok {
				signs = []float64{math.Copysign(1, d.g1)}
			}
			for _, s := range signs {
				xys := equalProduct(d.p, s, hx, hy)
				if len(xys) > 1 {
					if err := addLine(p, xys, sty); err != nil {
						return Figure{}, err
					}
					key.avoid = append(key.avoid, thin(xys, 60))
				}
			}
		}
		entry := keyEntry{text: text, dot: d.color}
		if ring && d.p != 0 {
			entry.line = sty
		}
		if !d.ok {
			entry.dot = nil
		}
		key.entries = append(key.entries, entry)
		if d.ok {
			x, y := d.g1, d.g2
			off := math.Abs(x) > hx || math.Abs(y) > hy
			x, y = math.Max(-hx, math.Min(hx, x)), math.Max(-hy, math.Min(hy, y))
			label := d.name
			if label == "" {
				label = "design"
			}
			if off {
				label += " (off scale)"
			}
			mk := pointMark{x: x, y: y, text: label, color: d.color, radius: 3.6, hollow: off, auto: true}
			marks.marks = append(marks.marks, mk)
			key.avoid = append(key.avoid, plotter.XYs{{X: x, Y: y}})
		}
	}
	p.Add(marks)
	p.Add(key)
	p.X.Min, p.X.Max = -hx, hx
	p.Y.Min, p.Y.Max = -hy, hy

	caption := title + ": the g1–g2 plane of the " + c.Kind().String() + " cavity, the stable region 0 < g1·g2 < 1 shaded. "
	switch {
	case ring:
		caption += "A ring has no g-parameters: drawn is its round-trip half-trace m = (A + D)/2 as the symmetric two-mirror cavity with the same m and round-trip Gouy phase ψ, g = cos(ψ/2), and dashed the two-mirror cavities with g1·g2 = (1 + m)/2. "
	case hasEquivalentG(c):
		caption += "The design is drawn at the equivalent g-parameters of the one-way path with its intracavity elements. "
	}
	caption += "Design: " + strings.Join(parts, "; ") + "."
	return cfg.figure(p, caption), nil
}

// hasEquivalentG reports a linear cavity whose g-parameters are those of a
// path with elements (not g = 1 − d/R of an empty cavity).
func hasEquivalentG(c cavity.Cavity) bool {
	if c.Kind() != cavity.KindLinear {
		return false
	}
	for _, e := range c.Loop().Elements() {
		if e.Kind != paraxial.KindSpace && e.Kind != paraxial.KindMirror {
			return true
		}
		if e.Kind == paraxial.KindMirror && e.Tilt != 0 {
			return true
		}
	}
	return false
}

// symmetricG returns the g-parameter of the symmetric two-mirror cavity
// whose round-trip Gouy phase is psi (radians, any branch):
//
//	g = cos(ψ/2),   ψ reduced to [0, 2π)
//
// since such a cavity has ψ = 2 arccos(g) (and half-trace 2g² − 1 =
// cos ψ).
func symmetricG(psi float64) float64 {
	psi = math.Mod(psi, 2*math.Pi)
	if psi < 0 {
		psi += 2 * math.Pi
	}
	return math.Cos(psi / 2)
}

// equalProduct returns the branch of the hyperbola g1·g2 = p in the
// half-plane sign·g1 > 0, inside |g1| ≤ hx, |g2| ≤ hy.
func equalProduct(p, sign, hx, hy float64) plotter.XYs {
	var xys plotter.XYs
	a, b := math.Log(math.Abs(p)/hy), math.Log(hx)
	if !(a < b) {
		return nil
	}
	for i := range 161 {
		g1 := math.Exp(a + (b-a)*float64(i)/160)
		xys = append(xys, plotter.XY{X: sign * g1, Y: p / (sign * g1)})
	}
	return xys
}

// fixed3 formats v with three decimals, never "-0.000".
func fixed3(v float64) string { return table.Fixed(v, 3) }

// pointMark is a labelled point of a figure, in plot units; the label is
// drawn dx, dy points from it with the given alignment, or, with auto,
// beside it on the side (right, left, above, below) where it covers the
// least of the labels and points drawn before.
type pointMark struct {
	x, y   float64
	text   string
	color  color.Color
	radius float64 // pt; 0 means 2.2
	hollow bool
	dx, dy float64 // pt
	xalign draw.XAlignment
	yalign draw.YAlignment
	auto   bool
	noDot  bool // a label only
}

// pointMarks draws labelled points ([pointMark]), all points first, and
// records them and their labels in the scene, for later labels and the
// key to avoid.
type pointMarks struct {
	marks []pointMark
	scene *scene
}

var _ plot.Plotter = (*pointMarks)(nil)

// Plot implements plot.Plotter.
func (m *pointMarks) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	base := withFont(text.Style{Color: labelColor, Handler: plot.DefaultTextHandler}, plt, 8)
	at := func(mk pointMark) (vg.Point, vg.Length) {
		r := mk.radius
		if r == 0 {
			r = 2.2
		}
		return vg.Point{X: trX(mk.x), Y: trY(mk.y)}, vg.Points(r)
	}
	for _, mk := range m.marks {
		if mk.noDot {
			continue
		}
		pt, r := at(mk)
		var shape draw.GlyphDrawer = draw.CircleGlyph{}
		if mk.hollow {
			shape = draw.RingGlyph{}
		}
		c.DrawGlyph(draw.GlyphStyle{Color: mk.color, Radius: r, Shape: shape}, pt)
		m.scene.take(vg.Rectangle{Min: vg.Point{X: pt.X - r, Y: pt.Y - r}, Max: vg.Point{X: pt.X + r, Y: pt.Y + r}})
	}
	for _, mk := range m.marks {
		if mk.text == "" {
			continue
		}
		pt, r := at(mk)
		type place struct {
			dx, dy vg.Length
			xa     draw.XAlignment
			ya     draw.YAlignment
		}
		places := []place{{vg.Points(mk.dx), vg.Points(mk.dy), mk.xalign, mk.yalign}}
		if mk.auto {
			gap := r + vg.Points(2.5)
			places = []place{{gap, 0, draw.XLeft, draw.YCenter}, {-gap, 0, draw.XRight, draw.YCenter},
				{0, gap, draw.XCenter, draw.YBottom}, {0, -gap, draw.XCenter, draw.YTop}}
		}
		sty := base
		sty.Color = mk.color
		best, bestScore := 0, -1.0
		rects := make([]vg.Rectangle, len(places))
		for i, pl := range places {
			sty.XAlign, sty.YAlign = pl.xa, pl.ya
			p := vg.Point{X: pt.X + pl.dx, Y: pt.Y + pl.dy}
			rect := sty.Rectangle(mk.text)
			rects[i] = vg.Rectangle{Min: vg.Point{X: p.X + rect.Min.X, Y: p.Y + rect.Min.Y}, Max: vg.Point{X: p.X + rect.Max.X, Y: p.Y + rect.Max.Y}}
			score := 0.0
			if m.scene != nil {
				for _, t := range m.scene.taken {
					score += overlapArea(rects[i], t)
				}
			}
			// What lies outside the data area counts as covered.
			size := rects[i].Size()
			score += float64(size.X*size.Y) - overlapArea(rects[i], c.Rectangle)
			if bestScore < 0 || score < bestScore {
				best, bestScore = i, score
			}
		}
		pl := places[best]
		sty.XAlign, sty.YAlign = pl.xa, pl.ya
		bestAt := vg.Point{X: pt.X + pl.dx, Y: pt.Y + pl.dy}
		c.FillText(sty, bestAt, mk.text)
		m.scene.take(rects[best])
	}
}

// frequencyUnit returns the scale (Hz per unit) and symbol of the SI unit
// that suits an axis of frequencies up to v Hz: kHz from 1 kHz, MHz from
// 1 MHz, GHz from 10 GHz (a scan of a 1.5 GHz FSR reads in MHz).
func frequencyUnit(v float64) (float64, string) {
	switch a := math.Abs(v); {
	case a >= 1e10:
		return 1e9, "GHz"
	case a >= 1e6:
		return 1e6, "MHz"
	case a >= 1e3:
		return 1e3, "kHz"
	}
	return 1, "Hz"
}

// frequencyText formats v Hz with four significant digits in the unit
// that suits it (Hz, kHz, MHz, GHz).
func frequencyText(v float64) string {
	scale, unit := 1.0, "Hz"
	switch a := math.Abs(v); {
	case a >= 1e9:
		scale, unit = 1e9, "GHz"
	case a >= 1e6:
		scale, unit = 1e6, "MHz"
	case a >= 1e3:
		scale, unit = 1e3, "kHz"
	}
	return table.Sig(v/scale, 4) + " " + unit
}

// temName names TEM_mn as package cavity's tables do: "TEM10", or
// "TEM(12,0)" for an index of two digits.
func temName(m, n int) string {
	if m < 10 && n < 10 {
		return "TEM" + strconv.Itoa(m) + strconv.Itoa(n)
	}
	return "TEM(" + strconv.Itoa(m) + "," + strconv.Itoa(n) + ")"
}

// modeGroup is a set of transverse modes at one frequency within the FSR.
type modeGroup struct {
	within   float64 // Hz in [0, FSR)
	lines    []cavity.Line
	minOrder int
	overlap  bool // a mode of it lies within a linewidth of TEM00
}

// label names the group: "TEM00", "m+n=2" for every mode of one order
// (a round cavity), the modes' names otherwise, joined by " + ".
func (g modeGroup) label() string {
	byOrder := map[int][]cavity.Line{}
	var orders []int
	for _, l := range g.lines {
		k := l.M + l.N
		if _, ok := byOrder[k]; !ok {
			orders = append(orders, k)
		}
		byOrder[k] = append(byOrder[k], l)
	}
	slices.Sort(orders)
	var parts []string
	for _, k := range orders {
		ls := byOrder[k]
		if k > 0 && len(ls) == k+1 {
			parts = append(parts, "m+n="+strconv.Itoa(k))
			continue
		}
		for _, l := range ls {
			parts = append(parts, temName(l.M, l.N))
		}
	}
	return strings.Join(parts, " + ")
}

// modeGroups groups the lines of s that coincide (to 1e-9 FSR) and marks
// those that overlap TEM00.
func modeGroups(s cavity.Spectrum) []modeGroup {
	var groups []modeGroup
	tol := 1e-9 * s.FSR
	for _, l := range s.Lines {
		if k := len(groups); k > 0 && math.Abs(l.Within-groups[k-1].within) <= tol {
			groups[k-1].lines = append(groups[k-1].lines, l)
			groups[k-1].minOrder = min(groups[k-1].minOrder, l.M+l.N)
		} else {
			groups = append(groups, modeGroup{within: l.Within, lines: []cavity.Line{l}, minOrder: l.M + l.N})
		}
		g := &groups[len(groups)-1]
		if l.M+l.N == 0 {
			continue
		}
		for _, j := range l.Overlaps {
			if o := s.Lines[j]; o.M == 0 && o.N == 0 {
				g.overlap = true
			}
		}
	}
	// A group at 0 holding other modes than TEM00 overlaps it too.
	for i := range groups {
		if groups[i].minOrder == 0 && len(groups[i].lines) > 1 {
			groups[i].overlap = true
		}
	}
	return groups
}

// CavityTransmission returns the transmission of cavity c against the
// detuning of the laser from a TEM00 resonance: the Airy function
//
//	T/T_max = 1/(1 + F sin²(πν/FSR))
//
// of [cavity.Airy] (F the coefficient of finesse, ν the detuning), with
// the frequencies of the transverse modes TEM_mn, m + n ≤ [ModeOrder]
// (default 4), from [cavity.Cavity.Spectrum] marked by dotted lines and
// labelled ("TEM10", or "m+n=2" where the modes of one order coincide, as
// in a round cavity); when there are more than 8 positions, only the
// modes of order up to 3 and those within 2 % of an FSR of TEM00 (drawn
// in ochre) are labelled. Modes that lie within a linewidth of TEM00 (so
// that they resonate with it) are drawn in the warning colour. The heights of the transverse-mode resonances depend on
// the alignment and mode matching of the input beam, which the cavity
// does not know; they are not drawn.
//
// The transmission is in dB relative to the peak by default, which shows
// where every mode falls on the wings of the resonance, down to the
// off-resonance floor 1/(1 + F); [Decibels](false) draws T/T_max on a
// linear axis. The detuning axis spans −0.1 … 1.1 FSR in Hz with an SI
// prefix, or [DetuningRange] in Hz (at most 20 FSR wide), or in units of
// the FSR with [FSRUnits]. The key and the caption give the FSR, the linewidth (FWHM)
// and the finesse, the nearest transverse mode to TEM00 and any
// near-degeneracy of [cavity.Gouy]. The options [Title], [Caption] and
// [Size] apply.
//
// It returns a [*ParamError] wrapping [ErrCavity] (and the cavity error)
// for the zero Cavity, a cavity without mirror reflectivities, and one
// without a confined eigenmode (unstable or on the stability boundary,
// where the transverse modes are not defined); and one wrapping
// [ErrOption] for a bad option or a detuning range wider than 20 FSR.
func CavityTransmission(c cavity.Cavity, opts ...Option) (Figure, error) {
	const fn = "CavityTransmission"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	a, err := c.Airy()
	if err != nil && !errors.Is(err, cavity.ErrLowFinesse) {
		return Figure{}, cavityError(fn, err)
	}
	order := defaultModeOrder
	if cfg.orderSet {
		order = cfg.order
	}
	sp, err := c.Spectrum(order)
	if err != nil {
		return Figure{}, cavityError(fn, err)
	}
	ms, err := c.ModeSpacing()
	if err != nil {
		return Figure{}, cavityError(fn, err)
	}
	fsr, lw := sp.FSR, a.Linewidth
	lo, hi := -0.1*fsr, 1.1*fsr
	if cfg.hasDetuning {
		lo, hi = cfg.d0, cfg.d1
		if hi-lo > maxDetuningFSR*fsr {
			return Figure{}, &ParamError{Func: "DetuningRange", Param: "range hi − lo", Value: frequencyText(hi - lo),
				Reason: "must be at most " + strconv.Itoa(maxDetuningFSR) + " FSR (" + frequencyText(maxDetuningFSR*fsr) + "): the resonances would not be resolved", Err: ErrOption}
		}
	}
	scale, unit := frequencyUnit(math.Max(math.Abs(lo), math.Abs(hi)))
	if cfg.fsrUnits {
		scale, unit = fsr, "FSR"
	}

	// Samples: even over the range, and dense within ±100 linewidths of
	// each TEM00 resonance in view, where the peak is narrow.
	var nus []float64
	const even = 1200
	for i := range even + 1 {
		nus = append(nus, lo+(hi-lo)*float64(i)/even)
	}
	if lw > 0 {
		for k := math.Ceil((lo - 100*lw) / fsr); k*fsr <= hi+100*lw; k++ {
			for j := -150; j <= 150; j++ {
				nu := k*fsr + 0.5*lw*math.Sinh(float64(j)/25)
				if nu >= lo && nu <= hi {
					nus = append(nus, nu)
				}
			}
		}
	}
	slices.Sort(nus)
	nus = slices.Compact(nus)
	F := a.CoefficientOfFinesse
	floor := 1 / (1 + F)
	xys := make(plotter.XYs, len(nus))
	for i, nu := range nus {
		t := airyTransmission(nu, fsr, F)
		y := t
		if !cfg.linearT {
			y = 10 * math.Log10(t)
		}
		xys[i] = plotter.XY{X: nu / scale, Y: y}
	}

	title := "Cavity transmission against detuning"
	if cfg.titleSet {
		title = cfg.title
	}
	yLabel := "transmission relative to the peak (dB)"
	if cfg.linearT {
		yLabel = "transmission T/T_max"
	}
	p := newPlot(title, "detuning from TEM00 ("+unit+")", yLabel)
	sc := &scene{}
	key := &keyBox{scene: sc, middle: true}

	// The modes: TEM00 and each group of coincident transverse modes at
	// every position in view, labelled groups first (they take the top
	// row of labels).
	groups := modeGroups(sp)
	sorted := slices.Clone(groups)
	slices.SortStableFunc(sorted, func(a, b modeGroup) int { return a.minOrder - b.minOrder })
	marks := &budgetMarks{scene: sc}
	overlapping, close := false, false
	var overlapNames []string
	for _, g := range sorted {
		label := ""
		if len(groups) <= maxAllLabelled || g.minOrder <= labelModeOrder || near(g.within, fsr) <= nearFraction*fsr {
			label = g.label()
		}
		var col color.Color
		switch {
		case g.overlap:
			col = warnColor
			overlapping = true
			overlapNames = append(overlapNames, g.label())
		case g.minOrder > 0 && near(g.within, fsr) <= nearFraction*fsr:
			col = nearColor
			close = true
		}
		for k := math.Ceil((lo - g.within) / fsr); g.within+k*fsr <= hi; k++ {
			marks.z = append(marks.z, (g.within+k*fsr)/scale)
			marks.labels = append(marks.labels, label)
			marks.colors = append(marks.colors, col)
		}
	}
	p.Add(marks)
	airy := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.3)}
	if err := addCurves(p, key, []curve{{xys: xys, style: airy, label: "TEM00 resonance (Airy function)"}}); err != nil {
		return Figure{}, err
	}
	guide := draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
	key.entries = append(key.entries, keyEntry{text: "transverse modes, m + n ≤ " + strconv.Itoa(order), line: guide})
	if close {
		key.entries = append(key.entries, keyEntry{text: "within " + table.Sig(100*nearFraction, 2) + " % of an FSR of TEM00", line: draw.LineStyle{Color: nearColor, Width: vg.Points(0.9), Dashes: guide.Dashes}})
	}
	if overlapping {
		key.entries = append(key.entries, keyEntry{text: "within a linewidth of TEM00", line: draw.LineStyle{Color: warnColor, Width: vg.Points(0.9), Dashes: guide.Dashes}})
	}
	summary := "FSR " + frequencyText(fsr)
	if lw > 0 {
		summary += ", linewidth " + frequencyText(lw) + " FWHM (finesse " + table.Sig(a.Finesse, 4) + ")"
	} else {
		summary += "; finesse too low for a half-maximum width"
	}
	if lw > 0 {
		key.notes = append(key.notes, "FSR "+frequencyText(fsr)+", finesse "+table.Sig(a.Finesse, 4)+",", "linewidth "+frequencyText(lw)+" FWHM.")
	} else {
		key.notes = append(key.notes, "FSR "+frequencyText(fsr)+"; finesse too low", "for a half-maximum width.")
	}
	p.Add(key)

	p.X.Min, p.X.Max = lo/scale, hi/scale
	// Head-room above the peak for the rows of mode labels.
	rows := 0.3
	if cfg.linearT {
		p.Y.Min, p.Y.Max = -0.03, 1+rows
	} else {
		// From the lowest transmission in view: the off-resonance floor
		// for a whole FSR, higher for a zoom on a resonance.
		bottom := 0.0
		for _, p := range xys {
			bottom = math.Min(bottom, p.Y)
		}
		if !(bottom < -1) {
			bottom = -1
		}
		span := -bottom
		p.Y.Min, p.Y.Max = bottom-0.06*span, rows*span
	}

	caption := title + ", normalised to the peak"
	if !cfg.linearT {
		caption += " (dB)"
	}
	caption += ", with the transverse modes TEM_mn, m + n ≤ " + strconv.Itoa(order) + ", from the round-trip Gouy phase. " + summary +
		"; off-resonance floor 1/(1 + F) = " + table.Fixed(10*math.Log10(floor), 1) + " dB."
	if near, ok := nearestMode(groups, fsr); ok {
		caption += " Nearest transverse mode to TEM00: " + near.label() + " at " + frequencyText(near.within) + " (" + table.Fixed(near.within/fsr, 4) + " FSR"
		if lw > 0 {
			caption += ", " + table.Sig(math.Abs(near.within)/lw, 3) + " linewidths"
		}
		caption += ")."
	}
	if overlapping {
		caption += " Within a linewidth of TEM00: " + strings.Join(overlapNames, ", ") + "."
	}
	caption += degeneracyText(ms)
	caption += " The heights of the transverse-mode resonances depend on the alignment and mode matching and are not drawn."
	return cfg.figure(p, caption), nil
}

// degeneracyText describes the near-degeneracies of the round-trip Gouy
// phases ([cavity.Gouy.Degeneracy]) for the caption, or returns "".
func degeneracyText(ms cavity.Spacing) string {
	where := func(d cavity.Degeneracy) string {
		if d.Exact {
			return " coincide with TEM00."
		}
		return " lie " + table.Sig(math.Abs(d.Detuning)*100, 3) + " % of an FSR from TEM00."
	}
	dx, dy := ms.X.Degeneracy, ms.Y.Degeneracy
	if dx.Q > 0 && dx.P == dy.P && dx.Q == dy.Q && math.Abs(dx.Detuning-dy.Detuning) <= 1e-9 {
		return " " + strings.ToUpper(dx.Name[:1]) + dx.Name[1:] + ": the modes of order m + n = " + strconv.Itoa(dx.Q) + where(dx)
	}
	out := ""
	for _, g := range []struct {
		d     cavity.Degeneracy
		plane string
		index string
	}{{dx, "tangential", "m"}, {dy, "sagittal", "n"}} {
		if g.d.Q > 0 {
			out += " In the " + g.plane + " plane " + g.d.Name + ": the modes with " + g.index + " = " + strconv.Itoa(g.d.Q) + where(g.d)
		}
	}
	return out
}

// airyTransmission returns T/T_max = 1/(1 + F sin²(πν/FSR)) at the
// detuning nu (Hz) from a resonance, for the coefficient of finesse F.
func airyTransmission(nu, fsr, F float64) float64 {
	s := math.Sin(math.Pi * nu / fsr)
	return 1 / (1 + F*s*s)
}

// nearestMode returns the group of transverse modes nearest TEM00 (its
// within measured round the FSR, negative below the resonance).
func nearestMode(groups []modeGroup, fsr float64) (modeGroup, bool) {
	best, ok := modeGroup{}, false
	for _, g := range groups {
		if g.minOrder == 0 {
			continue
		}
		w := g.within
		if w > fsr/2 {
			w -= fsr
		}
		if !ok || math.Abs(w) < math.Abs(best.within) {
			best, ok = g, true
			best.within = w
		}
	}
	return best, ok
}

// CavityCaustic returns the caustic of the eigenmode of cavity c ([Caustic]
// of the mode through [cavity.Cavity.Loop]): for a linear cavity one pass
// from M1 (z = 0) to M2, which the return pass repeats, for a ring the
// whole round trip from its reference plane. The mirrors and any
// intracavity elements are marked, the x and y envelopes drawn separately
// when they differ (a ring with tilted curved mirrors), and every waist
// noted, the one on a flat end mirror too. The default title is "Cavity
// eigenmode"; the default caption gives the waists with their positions
// and, for a linear cavity, the beam radius on each end mirror.
//
// The beam is [cavity.Cavity.Eigenmode] at z = Length(), the mode
// arriving at the reference plane, sampled with [beam.SampleRange]; the
// options of [Caustic] apply. It returns a [*ParamError] wrapping
// [ErrCavity] (and the cavity error) for the zero Cavity and for a cavity
// without a confined eigenmode (unstable, on the stability boundary, or
// a degenerate round trip other than the symmetric confocal one), and the
// errors of [Caustic] otherwise.
func CavityCaustic(c cavity.Cavity, opts ...Option) (Figure, error) {
	const fn = "CavityCaustic"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if _, err := c.Stability(); err != nil {
		return Figure{}, cavityError(fn, err)
	}
	mode, err := c.Eigenmode(c.Length())
	if err != nil {
		return Figure{}, cavityError(fn, err)
	}
	loop := c.Loop()
	end := c.Length()
	linear := c.Kind() == cavity.KindLinear
	if linear {
		end = c.Length() / 2
	}
	cs, err := beam.SampleRange(loop, mode.Beam, 0, end, 400)
	if err != nil {
		return Figure{}, cavityError(fn, err)
	}
	snapEdgeWaists(&cs, c.Wavelength())
	title := "Cavity eigenmode"
	if cfg.titleSet {
		title = cfg.title
	}
	astig := false
	for i := range cs.W {
		if math.Abs(float64(cs.W[i]-cs.WY[i])) > 1e-9*float64(max(cs.W[i], cs.WY[i])) {
			astig = true
		}
	}
	caption := title
	if linear {
		caption += ", one pass from " + mirrorName(loop, 0, "M1") + " to " + mirrorName(loop, end, "M2") + " (" + short(end) + "; the return pass repeats it)"
	} else {
		caption += " around the ring (round trip " + short(end) + ")"
	}
	var ws []string
	add := func(fs []beam.Focus, prefix string) {
		for i, f := range fs {
			if i > 0 && math.Abs(float64(f.Z-fs[i-1].Z)) < 1e-9*float64(end) {
				continue
			}
			ws = append(ws, prefix+"w₀ "+short(f.Radius)+" at z = "+table.In(f.Z, units.Millimeter, 1)+" mm")
		}
	}
	if astig {
		add(cs.Foci, "x ")
		add(cs.FociY, "y ")
	} else {
		add(cs.Foci, "")
	}
	if len(ws) > 0 {
		caption += ". Waists: " + strings.Join(ws, "; ")
	}
	if linear {
		n := len(cs.W) - 1
		radius := func(i int) string {
			if astig {
				return "x " + short(cs.W[i]) + ", y " + short(cs.WY[i])
			}
			return short(cs.W[i])
		}
		caption += ". Beam radius on " + mirrorName(loop, 0, "M1") + " " + radius(0) + ", on " + mirrorName(loop, end, "M2") + " " + radius(n)
	}
	caption += "."
	all := append([]Option{Title(title), Caption(caption), func(cf *config) { cf.edgeWaists = true }}, opts...)
	return Caustic(cs, loop, all...)
}

// mirrorName returns the label of the first mirror of loop at z, or def.
func mirrorName(loop paraxial.System, z units.Length, def string) string {
	for _, e := range loop.Elements() {
		if e.Kind == paraxial.KindMirror && math.Abs(float64(e.Z-z)) <= 1e-12*float64(max(loop.Length(), 1)) {
			if e.Label != "" {
				return e.Label
			}
			break
		}
	}
	return def
}

// snapEdgeWaists adds to c the waists that lie at its first or last
// sample to rounding (a flat end mirror of a linear cavity, where the
// mode's waist is), for vacuum wavelength lambda0: [beam.SampleRange]
// finds a waist only inside the range, and rounding may put this one a
// few attometres outside.
func snapEdgeWaists(c *beam.Caustic, lambda0 units.Length) {
	n := len(c.Z)
	if n < 2 || len(c.Curvature) != n || len(c.Index) != n {
		return
	}
	span := float64(c.Z[n-1] - c.Z[0])
	type plane struct {
		foci *[]beam.Focus
		w    []units.Length
		curv []float64
	}
	planes := []plane{{&c.Foci, c.W, c.Curvature}}
	if len(c.WY) == n && len(c.CurvatureY) == n {
		planes = append(planes, plane{&c.FociY, c.WY, c.CurvatureY})
	}
	for _, pl := range planes {
		for _, i := range []int{0, n - 1} {
			// A waist: the wavefront is flat to rounding, 1/R below
			// 1e-9 of the inverse span.
			if !(math.Abs(pl.curv[i])*span <= 1e-9) {
				continue
			}
			have := false
			for _, f := range *pl.foci {
				if math.Abs(float64(f.Z-c.Z[i])) <= 1e-9*span {
					have = true
				}
			}
			if have {
				continue
			}
			w := float64(pl.w[i])
			f := beam.Focus{Z: c.Z[i], Radius: pl.w[i], Index: c.Index[i],
				RayleighRange: units.Length(math.Pi * w * w * c.Index[i] / float64(lambda0))}
			if i == 0 {
				*pl.foci = append([]beam.Focus{f}, *pl.foci...)
			} else {
				*pl.foci = append(*pl.foci, f)
			}
		}
	}
}
