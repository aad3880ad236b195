package optplot

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/trace"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// ErrSpot is wrapped by the errors of [SpotDiagram] for missing or empty
// spots.
var ErrSpot = errors.New("optplot: spot diagram needs spots with crossings")

// SpotDiagram returns the spot diagrams of one or more [trace.Spot]
// results overlaid on one square panel, each centred on its own weighted
// centroid: each ray's crossing as a small dot in the spot's colour, its
// RMS radius as a solid circle and its aberration-free Airy radius as a
// dotted circle, in µm with equal scales on both axes. The key names
// each spot by its wavelength, plane and RMS and Airy radii, and counts
// the rays lost. The options [Title], [Caption] and [Size] apply.
//
// It returns a [*ParamError] wrapping [ErrSpot] when there is no spot, a
// spot has no crossing, or X and Y differ in length.
func SpotDiagram(spots []trace.Spot, opts ...Option) (Figure, error) {
	const fn = "SpotDiagram"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if len(spots) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "spots", Value: 0, Reason: "need at least one", Err: ErrSpot}
	}
	extent := 0.0
	for i, s := range spots {
		if len(s.X) == 0 || len(s.X) != len(s.Y) {
			return Figure{}, &ParamError{Func: fn, Param: "spot " + strconv.Itoa(i+1), Value: len(s.X), Reason: "needs crossings with X and Y of one length", Err: ErrSpot}
		}
		extent = math.Max(extent, math.Max(float64(s.Geometric), float64(s.Airy)))
	}
	if !(extent > 0) || !finite(extent) {
		extent = 1e-6
	}
	half := 1.12 * extent / 1e-6
	title := "Spot diagram"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, "x − centroid (µm)", "y − centroid (µm)")
	sc := &scene{}
	key := &keyBox{scene: sc}
	circle := func(r float64, sty draw.LineStyle) error {
		var xys plotter.XYs
		for k := 0; k <= 128; k++ {
			a := 2 * math.Pi * float64(k) / 128
			xys = append(xys, plotter.XY{X: r * math.Cos(a), Y: r * math.Sin(a)})
		}
		return addLine(p, xys, sty)
	}
	caption := title + ":"
	for i, s := range spots {
		sty := seriesStyles[i%len(seriesStyles)]
		xys := make(plotter.XYs, len(s.X))
		for j := range s.X {
			xys[j] = plotter.XY{X: s.X[j] / 1e-6, Y: s.Y[j] / 1e-6}
		}
		dots, err := plotter.NewScatter(xys)
		if err != nil {
			return Figure{}, &ParamError{Func: fn, Param: "spot " + strconv.Itoa(i+1), Reason: "crossings not finite", Err: errors.Join(ErrSpot, err)}
		}
		dots.GlyphStyle = draw.GlyphStyle{Color: sty.Color, Radius: vg.Points(0.9), Shape: draw.CircleGlyph{}}
		p.Add(dots)
		rms := draw.LineStyle{Color: sty.Color, Width: vg.Points(1.2)}
		airy := draw.LineStyle{Color: sty.Color, Width: vg.Points(0.9), Dashes: []vg.Length{vg.Points(1.2), vg.Points(1.8)}}
		if err := circle(float64(s.RMS)/1e-6, rms); err != nil {
			return Figure{}, err
		}
		if s.Airy > 0 {
			if err := circle(float64(s.Airy)/1e-6, airy); err != nil {
				return Figure{}, err
			}
		}
		lost := 0
		for _, c := range s.Lost {
			lost += c
		}
		text := table.Sig(s.Wavelength.Nanometers(), 5) + " nm at z = " + table.Sig(s.Plane.Millimeters(), 6) + " mm: RMS " + table.Sig(float64(s.RMS)/1e-6, 3) + " µm"
		key.entries = append(key.entries, keyEntry{text: text, line: rms},
			keyEntry{text: "Airy radius " + table.Sig(float64(s.Airy)/1e-6, 3) + " µm", line: airy})
		caption += " " + text + ", geometric " + table.Sig(float64(s.Geometric)/1e-6, 3) + " µm, Airy " + table.Sig(float64(s.Airy)/1e-6, 3) + " µm, " +
			strconv.Itoa(len(s.X)) + " rays"
		if lost > 0 {
			caption += " (" + strconv.Itoa(lost) + " lost)"
		}
		caption += ";"
	}
	p.Add(key)
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = -half, half, -half, half
	caption = caption[:len(caption)-1] + "."
	f := cfg.figure(p, caption)
	if f.Width == DefaultWidth || f.Width == 0 {
		f.Width, f.Height = DefaultHeight*1.15, DefaultHeight*1.15
	}
	return f, nil
}
