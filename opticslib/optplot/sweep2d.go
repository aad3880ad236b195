package optplot

import (
	"cmp"
	"errors"
	"image/color"
	"math"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// GoalBand is the wanted range of the quantity of a [Sweep2D] figure,
// outlined on the map.
type GoalBand struct {
	// Label says what the band is, for the key and the caption: "output
	// w0 2 ± 0.05 mm".
	Label string
	// Lo and Hi bound the range in the unit of the quantity's data
	// (metres for a length quantity, the quantity's Unit for a number);
	// −Inf or +Inf on an open side, Lo ≤ Hi.
	Lo, Hi float64
}

// BandOf returns the wanted range of a design goal as a band, labelled
// with the goal's name and wanted range ("output w0 2 ± 0.05 mm"). Its
// bounds are in the unit of the quantity [sweep.OfGoal] makes from the
// goal: the goal's SI unit ([design.Goal.Range]), except mrad for an
// angle.
func BandOf(g design.Goal) *GoalBand {
	lo, hi := g.Range()
	if g.Unit() == "rad" {
		lo, hi = lo*1e3, hi*1e3
	}
	return &GoalBand{Label: g.Name + " " + g.Wanted(), Lo: lo, Hi: hi}
}

// ErrGrid is wrapped by the errors of [Sweep2D]: a sweep that is not a
// grid of at least 2 × 2 finite values, a quantity it does not have, or
// a goal band that is not a range.
var ErrGrid = errors.New("optplot: 2-D sweep figure needs a grid of at least 2 × 2 values and a goal band lo ≤ hi")

// The colour scale of [Sweep2D], this package's own: from a dark
// blue-grey ink (low values) through the deep teal of the beam envelope
// and a sage green to warm sand and a pale cream (high values), each
// control lighter than the one before, interpolated by gonum's
// moreland.NewLuminance, so that lightness rises steadily with the value
// and the map reads in grey print too.
var scaleControls = []color.Color{
	color.NRGBA{R: 0x1f, G: 0x2a, B: 0x3c, A: 0xff}, // ink
	color.NRGBA{R: 0x2e, G: 0x5e, B: 0x6e, A: 0xff}, // deep teal
	color.NRGBA{R: 0x6f, G: 0x9a, B: 0x84, A: 0xff}, // sage
	color.NRGBA{R: 0xcf, G: 0xb2, B: 0x6e, A: 0xff}, // sand
	color.NRGBA{R: 0xf8, G: 0xf1, B: 0xdc, A: 0xff}, // cream
}

// scaleColors is the number of colours of the map and the scale bar.
const scaleColors = 256

var (
	// veilColor covers the map outside the goal band (white, 55 %).
	veilColor = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0x8c}
	// bandEdge outlines the goal band: dark ink over a white halo, so
	// that the line shows on the dark and the pale end of the scale.
	bandEdge = draw.LineStyle{Color: color.NRGBA{R: 0x14, G: 0x14, B: 0x14, A: 0xff}, Width: vg.Points(1.3)}
	bandHalo = draw.LineStyle{Color: whiteColor, Width: vg.Points(3.2)}
)

// Sweep2D returns a figure of one quantity of a two-parameter what-if
// sweep ([sweep.Grid]): a heat map of the quantity named quantity
// against the two parameters, the first along x and the second along y
// (both in the unit their values suit, mm on a bench), on the package's
// colour scale (dark ink for low values to pale cream for high ones),
// with a scale bar beside it in the quantity's unit.
//
// A band, when not nil, is the quantity's wanted range (a design goal's,
// [BandOf], or any [lo, hi]): its edges are outlined on the map (gonum's
// plotter.Contour at Lo and Hi, ink over a white halo) and marked on the
// scale bar, and the map outside the band is faded under a white veil,
// so that the region meeting the goal keeps its full colour. A key says
// so, and the caption gives the share of grid points inside the band.
//
// The options [Title], [Caption] and [Size] apply. It returns a
// [*ParamError] wrapping [ErrGrid] for a sweep with fewer than 2 values
// of a parameter, values that are not finite and increasing, data that
// do not fill the grid, a quantity the sweep does not have, or a band
// with NaN bounds, Lo > Hi or both sides open; one wrapping [ErrOption]
// for a bad option.
func Sweep2D(r sweep.GridResult, quantity string, band *GoalBand, opts ...Option) (Figure, error) {
	const fn = "Sweep2D"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrGrid}
	}
	q := slices.IndexFunc(r.Quantities, func(qt sweep.Quantity) bool { return qt.Name == quantity })
	if q < 0 {
		names := make([]string, len(r.Quantities))
		for i, qt := range r.Quantities {
			names[i] = strconv.Quote(qt.Name)
		}
		return Figure{}, bad("quantity", quantity, "is not in the sweep, which has "+strings.Join(names, ", "))
	}
	na, nb := len(r.A.Values), len(r.B.Values)
	for _, p := range []sweep.Param{r.A, r.B} {
		if len(p.Values) < 2 {
			return Figure{}, bad("parameter "+strconv.Quote(p.Name)+" values", len(p.Values), "need at least 2 for a map")
		}
		for i, v := range p.Values {
			if !finite(float64(v)) || (i > 0 && !(v > p.Values[i-1])) {
				return Figure{}, bad("parameter "+strconv.Quote(p.Name)+" value "+strconv.Itoa(i+1), v, "must be finite and greater than the one before")
			}
		}
	}
	if len(r.Data) != len(r.Quantities) || len(r.Data[q]) != na*nb {
		return Figure{}, bad("data", len(r.Data[min(q, len(r.Data)-1)]), "must hold "+strconv.Itoa(na*nb)+" values per quantity (make the sweep with sweep.Grid)")
	}
	for k, v := range r.Data[q] {
		if !finite(v) {
			return Figure{}, bad("value at "+r.A.Name+" = "+r.A.Values[k/nb].String()+", "+r.B.Name+" = "+r.B.Values[k%nb].String(), v, "must be finite")
		}
	}
	if band != nil && (math.IsNaN(band.Lo) || math.IsNaN(band.Hi) || band.Lo > band.Hi || (math.IsInf(band.Lo, -1) && math.IsInf(band.Hi, 1))) {
		return Figure{}, bad("band "+strconv.Quote(band.Label), strconv.FormatFloat(band.Lo, 'g', -1, 64)+" … "+strconv.FormatFloat(band.Hi, 'g', -1, 64),
			"must be a range lo ≤ hi, not NaN, with at least one side finite")
	}

	xs, _ := r.A.Column()
	ys, _ := r.B.Column()
	zs, zu := r.Column(q)
	zlabel := r.Label(q)
	// scale converts the data (and the band) to the unit of the map.
	scale := 1.0
	if r.Quantities[q].Kind == sweep.KindLength {
		all := make([]units.Length, len(r.Data[q]))
		for k, v := range r.Data[q] {
			all[k] = units.Length(v)
		}
		u, _ := table.LengthUnit(all...)
		scale = float64(u)
	}
	zmin, zmax := slices.Min(zs), slices.Max(zs)
	if zmin == zmax {
		d := math.Max(math.Abs(zmin)*1e-3, 1e-12)
		zmin, zmax = zmin-d, zmax+d
	}
	cm, err := moreland.NewLuminance(scaleControls)
	if err != nil {
		return Figure{}, err
	}
	cm.SetMin(zmin)
	cm.SetMax(zmax)
	grid := &gridXYZ{x: xs, y: ys, z: zs}
	heat := plotter.NewHeatMap(grid, cm.Palette(scaleColors))
	heat.Min, heat.Max = zmin, zmax
	heat.Rasterized = true // one small image, not a rectangle per case

	title := "What if the " + r.A.Name + " and the " + r.B.Name + " change: " + r.Quantities[q].Name
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot("", r.A.Label(), r.B.Label())
	p.X.Padding, p.Y.Padding = 0, 0 // the map meets its axes
	p.Add(heat)
	bar := newPlot("", "", zlabel)
	bar.HideX()
	bar.Y.Padding = 0
	bar.Add(&plotter.ColorBar{ColorMap: cm, Vertical: true, Colors: scaleColors})
	bar.X.Min, bar.X.Max = 0, 1
	bar.Y.Min, bar.Y.Max = zmin, zmax

	caption := title + ": " + zlabel + " against " + r.A.Label() + " and " + r.B.Label() + " (" + strconv.Itoa(na) + " × " + strconv.Itoa(nb) +
		" cases), from " + table.Sig(slices.Min(zs), 4) + " (dark ink) to " + table.Sig(slices.Max(zs), 4) + " " + zu + " (pale cream)."
	if band != nil {
		lo, hi := band.Lo/scale, band.Hi/scale
		mask := &gridXYZ{x: xs, y: ys, z: make([]float64, len(zs))}
		var inside plotter.XYs
		for k, z := range zs {
			if z >= lo && z <= hi {
				mask.z[k] = math.NaN() // not veiled
				inside = append(inside, plotter.XY{X: xs[k/nb], Y: ys[k%nb]})
			} else {
				mask.z[k] = 1
			}
		}
		veil := plotter.NewHeatMap(mask, plainPalette{veilColor})
		veil.Min, veil.Max = 0, 1
		veil.Rasterized = true
		p.Add(veil)
		var levels []float64
		for _, l := range []float64{lo, hi} {
			if finite(l) && l > slices.Min(zs) && l < slices.Max(zs) {
				levels = append(levels, l)
			}
		}
		if len(levels) > 0 {
			for _, sty := range []draw.LineStyle{bandHalo, bandEdge} {
				c := plotter.NewContour(grid, slices.Clone(levels), nil)
				c.LineStyles = []draw.LineStyle{sty}
				c.Min, c.Max = zmin, zmax
				p.Add(&sortedContour{c})
			}
		}
		for _, l := range []float64{lo, hi} {
			if finite(l) && l >= zmin && l <= zmax {
				for _, sty := range []draw.LineStyle{bandHalo, bandEdge} {
					if err := addLine(bar, plotter.XYs{{X: 0, Y: l}, {X: 1, Y: l}}, sty); err != nil {
						return Figure{}, err
					}
				}
			}
		}
		key := &keyBox{scene: &scene{}, avoid: []plotter.XYs{inside}}
		key.entries = append(key.entries,
			keyEntry{text: "goal band: " + band.Label, line: bandEdge},
			keyEntry{text: "outside the band (faded)", fill: faded(cm, zmin, zmax)})
		p.Add(key)
		share := 100 * float64(len(inside)) / float64(len(zs))
		caption += " The goal band " + band.Label + " is outlined; outside it the map is faded under a white veil. " +
			strconv.Itoa(len(inside)) + " of " + strconv.Itoa(len(zs)) + " grid points (" + table.Fixed(share, 1) + " %) lie in the band."
		if len(inside) == 0 {
			caption += " No case meets the goal: the band lies outside the values swept."
		}
	}
	xmin, xmax, ymin, ymax := heat.DataRange()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = xmin, xmax, ymin, ymax

	host := newPlot(title, "", "")
	host.HideAxes()
	host.X.Min, host.X.Max, host.Y.Min, host.Y.Max = 0, 1, 0, 1
	host.Add(&withScale{main: p, bar: bar})
	return cfg.figure(host, caption), nil
}

// faded returns the colour of the middle of the scale under the veil,
// for the key.
func faded(cm palette.ColorMap, lo, hi float64) color.Color {
	c, err := cm.At((lo + hi) / 2)
	if err != nil {
		return veilColor
	}
	r, g, b, _ := c.RGBA()
	a := float64(veilColor.A) / 255
	mix := func(v uint32) uint8 { return uint8(math.Round(float64(v>>8)*(1-a) + 255*a)) }
	return color.NRGBA{R: mix(r), G: mix(g), B: mix(b), A: 0xff}
}

// gridXYZ is the data of a [Sweep2D] map: x along the first parameter
// (columns), y along the second (rows), z[c·len(y) + r] as
// sweep.GridResult stores it.
type gridXYZ struct{ x, y, z []float64 }

var _ plotter.GridXYZ = (*gridXYZ)(nil)

func (g *gridXYZ) Dims() (c, r int)   { return len(g.x), len(g.y) }
func (g *gridXYZ) Z(c, r int) float64 { return g.z[c*len(g.y)+r] }
func (g *gridXYZ) X(c int) float64    { return g.x[c] }
func (g *gridXYZ) Y(r int) float64    { return g.y[r] }
func (g *gridXYZ) Min() float64       { return slices.Min(g.z) }
func (g *gridXYZ) Max() float64       { return slices.Max(g.z) }

// plainPalette is a palette of the given colours.
type plainPalette []color.Color

// Colors implements palette.Palette.
func (p plainPalette) Colors() []color.Color { return []color.Color(p) }

// sortedContour draws a gonum plotter.Contour with its paths in a fixed
// order. The contour plotter collects each level's paths in a map, so two
// renderings may stroke the same paths in different orders (the same
// picture, other bytes); sortedContour records the strokes and replays
// them sorted by their points, each open path from its lower end, so the
// SVG is byte-identical for the same data. It leaves out the contour's
// glyph boxes, which would pad the axes off the heat map's edges.
type sortedContour struct{ c *plotter.Contour }

var _ plot.Plotter = (*sortedContour)(nil)

// Plot implements plot.Plotter.
func (s *sortedContour) Plot(c draw.Canvas, plt *plot.Plot) {
	rec := &strokeRecorder{Canvas: c.Canvas}
	s.c.Plot(draw.Canvas{Canvas: rec, Rectangle: c.Rectangle}, plt)
	for i := range rec.strokes {
		rec.strokes[i].path = canonical(rec.strokes[i].path)
	}
	slices.SortStableFunc(rec.strokes, func(a, b stroke) int { return comparePaths(a.path, b.path) })
	for _, st := range rec.strokes {
		c.SetColor(st.color)
		c.SetLineWidth(st.width)
		c.SetLineDash(st.dashes, st.offset)
		c.Stroke(st.path)
	}
}

// stroke is one recorded Stroke call with the line state it used.
type stroke struct {
	path          vg.Path
	color         color.Color
	width, offset vg.Length
	dashes        []vg.Length
}

// strokeRecorder passes every call to Canvas except Stroke, which it
// records with the current line state.
type strokeRecorder struct {
	vg.Canvas
	color         color.Color
	width, offset vg.Length
	dashes        []vg.Length
	strokes       []stroke
}

func (r *strokeRecorder) SetColor(c color.Color)   { r.color = c; r.Canvas.SetColor(c) }
func (r *strokeRecorder) SetLineWidth(w vg.Length) { r.width = w; r.Canvas.SetLineWidth(w) }
func (r *strokeRecorder) SetLineDash(d []vg.Length, o vg.Length) {
	r.dashes, r.offset = slices.Clone(d), o
	r.Canvas.SetLineDash(d, o)
}
func (r *strokeRecorder) Stroke(p vg.Path) {
	r.strokes = append(r.strokes, stroke{path: slices.Clone(p), color: r.color, width: r.width, offset: r.offset, dashes: r.dashes})
}

// canonical returns an open polyline from its lexicographically lower
// end; closed paths and paths with curves are returned as they are.
func canonical(p vg.Path) vg.Path {
	if len(p) < 2 || p[0].Type != vg.MoveComp {
		return p
	}
	for _, c := range p[1:] {
		if c.Type != vg.LineComp {
			return p
		}
	}
	first, last := p[0].Pos, p[len(p)-1].Pos
	if comparePoints(last, first) >= 0 {
		return p
	}
	out := make(vg.Path, 0, len(p))
	for i := len(p) - 1; i >= 0; i-- {
		if i == len(p)-1 {
			out.Move(p[i].Pos)
		} else {
			out.Line(p[i].Pos)
		}
	}
	return out
}

func comparePoints(a, b vg.Point) int { return cmp.Or(cmp.Compare(a.X, b.X), cmp.Compare(a.Y, b.Y)) }

func comparePaths(a, b vg.Path) int {
	for i := 0; i < len(a) && i < len(b); i++ {
		if c := cmp.Or(cmp.Compare(a[i].Type, b[i].Type), comparePoints(a[i].Pos, b[i].Pos)); c != 0 {
			return c
		}
	}
	return cmp.Compare(len(a), len(b))
}

// withScale draws a map and its scale bar side by side in the data area
// of a host plot whose axes are hidden: the bar, with its axis, takes
// barWidth at the right.
type withScale struct {
	main, bar *plot.Plot
}

var _ plot.Plotter = (*withScale)(nil)

// barWidth is the width of the scale bar panel, its tick labels and axis
// label included; barGap the space between the map and the bar.
const (
	barWidth = 62 // pt
	barGap   = 10 // pt
)

// Plot implements plot.Plotter.
func (w *withScale) Plot(c draw.Canvas, _ *plot.Plot) {
	bw, gap := vg.Points(barWidth), vg.Points(barGap)
	w.main.Draw(draw.Crop(c, 0, -(bw + gap), 0, 0))
	w.bar.Draw(draw.Crop(c, c.Max.X-c.Min.X-bw, 0, 0, 0))
}
