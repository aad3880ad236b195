package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/budget"
	"github.com/beamnote/beamnote/opticslib/table"
)

// ErrBudget is wrapped by the errors of [PowerBudget] and
// [IrradianceBudget] for a budget that [budget.Builder.Build] did not
// make: a power that is not positive and finite, or a row with a
// non-finite or negative value.
var ErrBudget = errors.New("optplot: budget needs a positive input power and finite rows (use budget.Builder.Build)")

// checkBudget returns a [*ParamError] wrapping [ErrBudget] unless b looks
// like a budget made by budget.Builder.Build.
func checkBudget(fn string, b budget.Budget) error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrBudget}
	}
	if p := b.Input.Power; !(p > 0) || !finite(p) {
		return bad("input power P0", strconv.FormatFloat(p, 'g', -1, 64)+" W", "must be positive and finite")
	}
	if !finite(float64(b.Length)) || b.Length < 0 {
		return bad("length", b.Length, "must be finite and ≥ 0")
	}
	if !finite(b.Irradiance) || b.Irradiance < 0 {
		return bad("input irradiance", b.Irradiance, "must be finite and ≥ 0 (W/m²)")
	}
	for i, r := range b.Rows {
		at := "row " + strconv.Itoa(i) + " (" + r.Name + ")"
		switch {
		case !finite(float64(r.Z)):
			return bad(at+" z", r.Z, "must be finite")
		case !finite(r.Power) || r.Power < 0:
			return bad(at+" power", strconv.FormatFloat(r.Power, 'g', -1, 64)+" W", "must be finite and ≥ 0")
		case !finite(r.Irradiance) || r.Irradiance < 0:
			return bad(at+" irradiance", r.Irradiance, "must be finite and ≥ 0 (W/m²)")
		}
	}
	return nil
}

// budgetRange returns the axial range of a budget figure in mm: the
// option's range, or 0 … the system's length (at least the last row).
func budgetRange(cfg config, b budget.Budget) (lo, hi float64) {
	lo, hi = 0, b.Length.Millimeters()
	for _, r := range b.Rows {
		hi = math.Max(hi, r.Z.Millimeters())
	}
	if cfg.hasRange {
		lo, hi = cfg.z0, cfg.z1
	}
	if lo == hi {
		hi = lo + 1
	}
	return lo, hi
}

// budgetLabels returns the mark positions (mm) and labels of the rows: a
// label per part (the row's label, or the element kind), given at its
// first row only, so that the two faces of a plate carry one label.
func budgetLabels(b budget.Budget) (zs []float64, labels []string) {
	prev := ""
	for _, r := range b.Rows {
		l := r.Label
		if l == "" {
			l = r.Kind.String()
		}
		zs = append(zs, r.Z.Millimeters())
		if r.Label != "" && r.Label == prev {
			l = ""
		}
		labels = append(labels, l)
		prev = r.Label
	}
	return zs, labels
}

// PowerBudget returns a figure of the power along the path of budget b
// against z (mm): a step line that stays level between elements and drops
// at each element by its transmission, with every element where something
// acts marked by a dotted vertical line and labelled (a part once, by its
// label or its kind) along the top of the plot, and the output power in
// the key. Power is plotted in the unit of [budget.Budget.PowerUnit] (W,
// mW or µW) from zero. The options [Title], [Caption], [Size] and
// [ZRange] apply; the others have no effect. The default caption is the
// title and the output power and fraction.
//
// The figure shows no irradiance; [IrradianceBudget] does, with the
// laser-safety caution.
//
// It returns a [*ParamError] wrapping [ErrBudget] for a budget that
// budget.Builder.Build did not make, and one wrapping [ErrOption] for a
// bad option.
func PowerBudget(b budget.Budget, opts ...Option) (Figure, error) {
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkBudget("PowerBudget", b); err != nil {
		return Figure{}, err
	}
	scale, unit := b.PowerUnit()
	lo, hi := budgetRange(cfg, b)
	// The step line: level at the power before each element, dropping at
	// it to the power after it, level again to the output plane.
	p := b.Input.Power / scale
	xys := plotter.XYs{{X: math.Min(lo, 0), Y: p}}
	for _, r := range b.Rows {
		z := r.Z.Millimeters()
		xys = append(xys, plotter.XY{X: z, Y: p})
		p = r.Power / scale
		xys = append(xys, plotter.XY{X: z, Y: p})
	}
	xys = append(xys, plotter.XY{X: math.Max(hi, b.Length.Millimeters()), Y: p})

	title := "Power along the path, P0 = " + table.Power(b.Input.Power)
	if cfg.titleSet {
		title = cfg.title
	}
	pl := newPlot(title, XLabel, "power P ("+unit+")")
	sc := &scene{}
	zs, labels := budgetLabels(b)
	marks := &budgetMarks{z: zs, labels: labels, scene: sc}
	pl.Add(marks)
	key := &keyBox{scene: sc}
	out := table.Sig(b.Output()/scale, 4) + " " + unit + " (" + table.Fixed(100*b.Fraction(), 2) + " % of the input)"
	if err := addCurves(pl, key, []curve{{xys: xys, style: draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.6)}, label: "power after each element"}}); err != nil {
		return Figure{}, err
	}
	key.notes = append(key.notes, "Output "+out+".")
	pl.Add(key)
	pl.X.Min, pl.X.Max = lo, hi
	pl.Y.Min, pl.Y.Max = 0, b.Input.Power/scale*1.32 // room for the labels and the key
	return cfg.figure(pl, title+"; output "+out+"."), nil
}

// IrradianceBudget returns a figure of the on-axis peak irradiance
// I₀ = 2P/(π wx wy) after each element of budget b ([budget.Row]'s
// Irradiance, from the power after the element and the beam radii there)
// against z (mm): a stem and a dot per element, the input at z = 0, the
// elements labelled along the top as in [PowerBudget]. The values are at
// the elements only: between them the beam radius changes, and
// [AlongZ] with [IrradianceFor] draws the continuous curve of a caustic.
// Irradiance is plotted in W/cm² with the SI prefix that suits the
// largest value (mW/cm² … GW/cm²).
//
// The figure carries the laser-safety caution: a short form in its key,
// and [beam.SafetyNote] in full at the end of its caption, also of a
// caption given with [Caption]. The options [Title], [Caption], [Size] and
// [ZRange] apply. Its errors are those of [PowerBudget].
func IrradianceBudget(b budget.Budget, opts ...Option) (Figure, error) {
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkBudget("IrradianceBudget", b); err != nil {
		return Figure{}, err
	}
	lo, hi := budgetRange(cfg, b)
	type point struct {
		z, v float64 // mm, W/cm²
		name string
	}
	pts := []point{{0, b.Irradiance * 1e-4, "input"}}
	for _, r := range b.Rows {
		pts = append(pts, point{r.Z.Millimeters(), r.Irradiance * 1e-4, r.Name})
	}
	big, at := 0.0, pts[0]
	for _, p := range pts {
		if p.z >= lo && p.z <= hi && p.v > big {
			big, at = p.v, p
		}
	}
	scale, unit := 1.0, "W/cm²"
	for _, u := range irradianceUnits {
		if big >= u.scale {
			scale, unit = 1/u.scale, u.name
		}
	}
	title := "Peak irradiance at the elements, P0 = " + table.Power(b.Input.Power)
	if cfg.titleSet {
		title = cfg.title
	}
	pl := newPlot(title, XLabel, "peak irradiance I₀ ("+unit+")")
	sc := &scene{}
	zs, labels := budgetLabels(b)
	pl.Add(&budgetMarks{z: zs, labels: labels, scene: sc})
	stem := draw.LineStyle{Color: yColor, Width: vg.Points(1.1)}
	var dots plotter.XYs
	key := &keyBox{scene: sc}
	for _, p := range pts {
		if p.z < lo || p.z > hi {
			continue
		}
		if err := addLine(pl, plotter.XYs{{X: p.z, Y: 0}, {X: p.z, Y: p.v * scale}}, stem); err != nil {
			return Figure{}, err
		}
		dots = append(dots, plotter.XY{X: p.z, Y: p.v * scale})
	}
	if len(dots) > 0 {
		s, err := plotter.NewScatter(dots)
		if err != nil {
			return Figure{}, err
		}
		s.GlyphStyle = draw.GlyphStyle{Color: yColor, Radius: vg.Points(2.4), Shape: draw.CircleGlyph{}}
		pl.Add(s)
		key.avoid = append(key.avoid, dots)
		key.entries = append(key.entries, keyEntry{text: "I₀ = 2P/(π wx wy) after each element", line: stem})
	}
	caption := title
	if len(dots) > 0 {
		hiText := "Highest " + strconv.FormatFloat(big*scale, 'g', 3, 64) + " " + unit + " at z = " + strconv.FormatFloat(at.z, 'f', 1, 64) + " mm (" + at.name + ")"
		key.notes = append(key.notes, hiText+".")
		caption += ". " + hiText
	}
	key.notes = append(key.notes, "Values at the elements only; between them the beam radius changes.", safetyShort)
	key.noteColor = warnColor
	pl.Add(key)
	caption += ".\n\n" + beam.SafetyNote
	if cfg.captionSet {
		// A caption of the user's own still carries the caution.
		cfg.caption += "\n\n" + beam.SafetyNote
	}
	top := big * scale
	if top == 0 {
		top = 1
	}
	pl.X.Min, pl.X.Max = lo, hi
	pl.Y.Min, pl.Y.Max = 0, top*1.45 // room for the labels and the key
	return cfg.figure(pl, caption), nil
}

// budgetMarks draws a dotted vertical line at each element of a budget
// figure (or each mode of a [CavityTransmission] figure) and its label
// along the top of the data area; a label that would overlap one drawn
// before goes down a row.
type budgetMarks struct {
	z      []float64 // mm (plot units)
	labels []string
	// colors, when not nil, holds a colour per mark for its line and
	// label; a nil entry keeps the default.
	colors []color.Color
	scene  *scene
}

var _ plot.Plotter = (*budgetMarks)(nil)

// Plot implements plot.Plotter.
func (m *budgetMarks) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, _ := plt.Transforms(&c)
	lbl := withFont(text.Style{Color: labelColor, XAlign: draw.XCenter, YAlign: draw.YTop, Handler: plot.DefaultTextHandler}, plt, 7.5)
	lineH := lbl.FontExtents().Height
	guide := draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
	type placed struct{ left, right, y vg.Length }
	var done []placed
	for i, z := range m.z {
		x := trX(z)
		if !c.ContainsX(x) {
			continue
		}
		g, ls := guide, lbl
		if i < len(m.colors) && m.colors[i] != nil {
			g.Color, ls.Color = m.colors[i], m.colors[i]
			g.Width = vg.Points(0.9)
		}
		c.StrokeLine2(g, x, c.Min.Y, x, c.Max.Y)
		l := m.labels[i]
		if l == "" {
			continue
		}
		w := lbl.Width(l)
		spare := 0.1*w + vg.Points(1)
		lx := min(max(x, c.Min.X+w/2+spare), c.Max.X-w/2-spare)
		y := c.Max.Y - vg.Points(2)
		for moved := true; moved; {
			moved = false
			for _, p := range done {
				if lx-w/2 < p.right+vg.Points(2) && lx+w/2 > p.left-vg.Points(2) && y > p.y-lineH && y-lineH < p.y {
					y, moved = p.y-lineH, true
				}
			}
		}
		c.FillText(ls, vg.Point{X: lx, Y: y}, l)
		done = append(done, placed{left: lx - w/2, right: lx + w/2, y: y})
		m.scene.take(vg.Rectangle{Min: vg.Point{X: lx - w/2, Y: y - lineH}, Max: vg.Point{X: lx + w/2, Y: y}})
	}
}
