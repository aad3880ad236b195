package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/tolerance"
)

// ErrHistogram is wrapped by the errors of [ToleranceHistogram] for a
// histogram that tolerance.Result.Histogram did not make: no bins, edges
// that do not bound the counts, negative counts or no build counted.
var ErrHistogram = errors.New("optplot: tolerance histogram needs bins with increasing finite edges and counts (use tolerance.Result.Histogram)")

// Colours of the tolerance histogram: builds within the wanted range in
// the package's teal, builds outside it in brick, the wanted range a
// pale ochre band behind them.
var (
	histInColor   = color.NRGBA{R: 0x2e, G: 0x5e, B: 0x6e, A: 0x66}
	histOutColor  = color.NRGBA{R: 0xa8, G: 0x4a, B: 0x2c, A: 0x66}
	histBandColor = color.NRGBA{R: 0xb0, G: 0x7a, B: 0x3a, A: 0x24}
)

// checkHistogram returns a [*ParamError] wrapping [ErrHistogram] unless h
// has at least one bin, one more edge than counts, finite increasing
// edges, counts ≥ 0 and at least one build counted.
func checkHistogram(fn string, h tolerance.Histogram) error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrHistogram}
	}
	if len(h.Counts) == 0 {
		return bad("bins", 0, "need at least one")
	}
	if len(h.Edges) != len(h.Counts)+1 {
		return bad("edges", len(h.Edges), "must be one more than the "+strconv.Itoa(len(h.Counts))+" counts")
	}
	total := 0
	for k, e := range h.Edges {
		if !finite(e) || (k > 0 && !(e > h.Edges[k-1])) {
			return bad("edge "+strconv.Itoa(k), e, "must be finite and above the edge before it")
		}
	}
	for k, c := range h.Counts {
		if c < 0 {
			return bad("count "+strconv.Itoa(k), c, "must not be negative")
		}
		total += c
	}
	if total == 0 {
		return bad("counts", 0, "no build counted")
	}
	if math.IsNaN(h.Lo) || math.IsNaN(h.Hi) || h.Lo > h.Hi {
		return bad("wanted range", strconv.FormatFloat(h.Lo, 'g', -1, 64)+" … "+strconv.FormatFloat(h.Hi, 'g', -1, 64), "must have Lo ≤ Hi (±Inf for an open side)")
	}
	return nil
}

// ToleranceHistogram returns the histogram of one goal over the builds
// of a Monte Carlo run ([tolerance.Result.Histogram]): a bar per bin, the
// part of the builds within the goal's wanted range in teal and the part
// outside it in brick (a bar that straddles a limit is split there), the
// wanted range as a pale ochre band behind the bars with dotted edges,
// and the nominal design as a dashed grey line. The key gives the wanted
// range, the nominal value, the mean and σ, and the yield of the goal
// with its standard error; failed builds, which the bars leave out, are
// counted in it. Lengths are in nm, µm or mm and angles in µrad, mrad or
// rad, chosen from the values shown. A limit of the range that lies
// farther than the values' own span beyond them is left off the axis and
// the band runs to the edge. The options [Title], [Caption] and [Size]
// apply.
//
// It returns a [*ParamError] wrapping [ErrHistogram] for a histogram not
// made by package tolerance, and one wrapping [ErrOption] for a bad
// option.
func ToleranceHistogram(h tolerance.Histogram, opts ...Option) (Figure, error) {
	const fn = "ToleranceHistogram"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkHistogram(fn, h); err != nil {
		return Figure{}, err
	}
	lo, hi := h.Edges[0], h.Edges[len(h.Edges)-1]
	span := hi - lo
	// The x range: the values, with the limits of the wanted range that
	// lie within one span of them.
	xmin, xmax := lo, hi
	for _, lim := range []float64{h.Lo, h.Hi} {
		if finite(lim) && lim >= lo-span && lim <= hi+span {
			xmin, xmax = math.Min(xmin, lim), math.Max(xmax, lim)
		}
	}
	pad := 0.04 * (xmax - xmin)
	xmin, xmax = xmin-pad, xmax+pad
	mag := math.Max(math.Abs(xmin), math.Abs(xmax))
	scale, unit := 1.0, ""
	switch h.Unit {
	case "m":
		scale, unit = lengthAxisUnit(mag)
	case "rad":
		scale, unit = angleAxisUnit(mag)
	}
	xl := h.Goal
	if unit != "" {
		xl += " (" + unit + ")"
	}
	title := "Monte Carlo: " + h.Goal
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, xl, "builds")
	sc := &scene{}
	key := &keyBox{scene: sc}
	top := 0
	for _, c := range h.Counts {
		top = max(top, c)
	}
	// Room above the tallest bar for the key in a top corner.
	ytop := 1.55 * float64(top)
	rect := func(x0, x1, y float64, fill color.Color, edge draw.LineStyle) error {
		poly, err := plotter.NewPolygon(plotter.XYs{{X: x0 / scale, Y: 0}, {X: x1 / scale, Y: 0}, {X: x1 / scale, Y: y}, {X: x0 / scale, Y: y}})
		if err != nil {
			return err
		}
		poly.Color, poly.LineStyle = fill, edge
		p.Add(poly)
		return nil
	}
	// The wanted range, clipped to the axis.
	bl, bh := math.Max(h.Lo, xmin), math.Min(h.Hi, xmax)
	if bl < bh {
		if err := rect(bl, bh, ytop, histBandColor, draw.LineStyle{}); err != nil {
			return Figure{}, err
		}
		edge := draw.LineStyle{Color: lensColor, Width: vg.Points(0.9), Dashes: []vg.Length{vg.Points(1.5), vg.Points(1.5)}}
		for _, lim := range []float64{h.Lo, h.Hi} {
			if finite(lim) && lim > xmin && lim < xmax {
				if err := addLine(p, plotter.XYs{{X: lim / scale, Y: 0}, {X: lim / scale, Y: ytop}}, edge); err != nil {
					return Figure{}, err
				}
			}
		}
	}
	// The bars, split at the limits of the wanted range.
	outline := draw.LineStyle{Color: envelopeColor, Width: vg.Points(0.6)}
	outlineOut := draw.LineStyle{Color: yColor, Width: vg.Points(0.6)}
	var tops plotter.XYs
	in, out := false, false
	for k, c := range h.Counts {
		if c == 0 {
			continue
		}
		a, b, y := h.Edges[k], h.Edges[k+1], float64(c)
		// The key keeps clear of the bars' bodies, not only their tops.
		for _, x := range []float64{a, (a + b) / 2, b} {
			for _, f := range []float64{0.25, 0.5, 0.75, 1} {
				tops = append(tops, plotter.XY{X: x / scale, Y: f * y})
			}
		}
		cuts := []float64{a}
		for _, lim := range []float64{h.Lo, h.Hi} {
			if lim > a && lim < b {
				cuts = append(cuts, lim)
			}
		}
		cuts = append(cuts, b)
		for i := 0; i+1 < len(cuts); i++ {
			x0, x1 := cuts[i], cuts[i+1]
			mid := (x0 + x1) / 2
			fill, edge := histInColor, outline
			if mid < h.Lo || mid > h.Hi {
				fill, edge = histOutColor, outlineOut
				out = true
			} else {
				in = true
			}
			if err := rect(x0, x1, y, fill, edge); err != nil {
				return Figure{}, err
			}
		}
	}
	nominal := draw.LineStyle{Color: labelColor, Width: vg.Points(1), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
	if finite(h.Nominal) && h.Nominal >= xmin && h.Nominal <= xmax {
		if err := addLine(p, plotter.XYs{{X: h.Nominal / scale, Y: 0}, {X: h.Nominal / scale, Y: ytop}}, nominal); err != nil {
			return Figure{}, err
		}
	}
	withUnit := func(s string) string {
		if unit != "" {
			s += " " + unit
		}
		return s
	}
	value := func(v float64) string { return withUnit(table.Sig(v/scale, 6)) }
	sigma := withUnit(table.Sig(h.Std/scale, 3))
	total := 0
	for _, c := range h.Counts {
		total += c
	}
	wanted := h.Wanted
	if wanted == "" {
		wanted = value(h.Lo) + " … " + value(h.Hi)
	}
	key.entries = append(key.entries, keyEntry{text: "wanted " + wanted, fill: histBandColor})
	if in {
		key.entries = append(key.entries, keyEntry{text: "builds within it", fill: histInColor})
	}
	if out {
		key.entries = append(key.entries, keyEntry{text: "builds outside it", fill: histOutColor})
	}
	key.entries = append(key.entries, keyEntry{text: "nominal " + value(h.Nominal), line: nominal})
	key.notes = append(key.notes, "mean "+value(h.Mean)+", σ "+sigma,
		"goal met in "+h.Yield.String()+" of "+strconv.Itoa(h.Yield.Trials)+" builds")
	if h.Failed > 0 {
		key.notes = append(key.notes, strconv.Itoa(h.Failed)+" builds failed (not shown)")
	}
	key.avoid = append(key.avoid, tops)
	p.Add(key)
	p.X.Min, p.X.Max = xmin/scale, xmax/scale
	p.Y.Min, p.Y.Max = 0, ytop
	caption := title + ": " + strconv.Itoa(total) + " builds in " + strconv.Itoa(len(h.Counts)) + " bins from " + value(lo) + " to " + value(hi) +
		"; wanted " + wanted + ", met in " + h.Yield.String() + "; nominal " + value(h.Nominal) + ", mean " + value(h.Mean) + ", σ " + sigma + "."
	if h.Failed > 0 {
		caption += " " + strconv.Itoa(h.Failed) + " builds failed and are not shown."
	}
	return cfg.figure(p, caption), nil
}
