package optplot

import (
	"bytes"
	"errors"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
)

// Axis labels of the caustic plot.
const (
	XLabel = "axial position z (mm)"
	YLabel = "beam radius ±w (mm)"
)

// Option configures [Caustic].
type Option func(*config)

type config struct {
	title  string
	band   bool
	labels bool
}

// Title sets the plot title. The default is "Gaussian beam caustic".
func Title(s string) Option { return func(c *config) { c.title = s } }

// Band controls the pale fill between −w and +w (default on).
func Band(on bool) Option { return func(c *config) { c.band = on } }

// ElementLabels controls the text above the element bars (default on).
func ElementLabels(on bool) Option { return func(c *config) { c.labels = on } }

// ErrCaustic is returned by [Caustic] for an empty or inconsistent caustic.
var ErrCaustic = errors.New("optplot: caustic needs at least 2 samples with matching Z and W lengths and finite values")

// Caustic returns a plot of the beam envelope ±w(z) of c, in mm against z
// in mm, with the zero-thickness elements of sys marked at their positions
// (see the package documentation for the look). c is usually the result of
// [beam.Sample] for the same sys.
//
// It returns [ErrCaustic] if c has fewer than two points, len(c.Z) !=
// len(c.W), or a value is not finite.
func Caustic(c beam.Caustic, sys paraxial.System, opts ...Option) (*plot.Plot, error) {
	cfg := config{title: "Gaussian beam caustic", band: true, labels: true}
	for _, o := range opts {
		o(&cfg)
	}
	n := len(c.Z)
	if n < 2 || len(c.W) != n {
		return nil, ErrCaustic
	}
	upper := make(plotter.XYs, n)
	lower := make(plotter.XYs, n)
	wmax := 0.0
	for i := range n {
		z, w := c.Z[i]*1e3, c.W[i]*1e3
		if math.IsNaN(z) || math.IsInf(z, 0) || math.IsNaN(w) || math.IsInf(w, 0) {
			return nil, ErrCaustic
		}
		upper[i] = plotter.XY{X: z, Y: w}
		lower[i] = plotter.XY{X: z, Y: -w}
		wmax = math.Max(wmax, w)
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

	for _, xys := range []plotter.XYs{upper, lower} {
		l, err := plotter.NewLine(xys)
		if err != nil {
			return nil, err
		}
		l.LineStyle = draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
		p.Add(l)
	}

	marks, err := NewMarks(sys, 1.15*wmax)
	if err != nil {
		return nil, err
	}
	if !cfg.labels {
		for i := range marks.Marks {
			marks.Marks[i].Label = ""
		}
	}
	if len(marks.Marks) > 0 {
		p.Add(marks)
	}
	// Symmetric y range with head-room for the labels.
	ymax := 1.35 * math.Max(wmax, p.Y.Max)
	p.Y.Min, p.Y.Max = -ymax, ymax
	p.X.Min, p.X.Max = upper[0].X, upper[n-1].X
	if p.X.Min == p.X.Max {
		p.X.Max = p.X.Min + 1
	}
	return p, nil
}

// SVG renders p as an SVG document of the given size (for example
// 16*vg.Centimeter by 9*vg.Centimeter) with p.WriterTo(width, height,
// "svg"). Rendering the same plot twice gives identical bytes.
func SVG(p *plot.Plot, width, height vg.Length) ([]byte, error) {
	w, err := p.WriterTo(width, height, "svg")
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if _, err := w.WriteTo(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
