package optplot

import (
	"errors"
	"image/color"
	"strconv"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Series is one line of a [Lines] figure, in the caller's units (the axis
// labels name them).
type Series struct {
	// Label names the line in the key; lines without a label have no key
	// entry.
	Label string
	// X and Y hold the points, of one length (at least 2), finite.
	X, Y []float64
	// Low and High, when not nil, are the lower and upper edges of a pale
	// band drawn under the line at each X (a tolerance or a spread of a
	// what-if sweep); both have the length of X, finite, Low ≤ High.
	Low, High []float64
}

// ErrSeries is wrapped by the errors of [Lines] for missing or bad
// series.
var ErrSeries = errors.New("optplot: line figure needs series with matching X and Y lengths and finite values")

// Line colours of [Lines], cycled: the package's teal, then the overlay
// colours of [Also].
var seriesStyles = append([]draw.LineStyle{{Color: envelopeColor, Width: vg.Points(1.4)}}, overlayStyles...)

// maxDotted is the largest number of points of a series that [Lines]
// marks with a dot at each point.
const maxDotted = 30

// Lines returns a line figure of the series, for what-if sweeps (a waist
// radius against a lens position, a transmission against an iris
// diameter): one line per series in its own colour and dash pattern, a
// key for the labelled ones, axis labels as given (put the unit in them:
// "lens spacing d (mm)"), tick labels precise enough to differ. The
// figure is [DefaultWidth] × [DefaultHeight] with the title as caption;
// change its fields to change them.
//
// It returns a [*ParamError] wrapping [ErrSeries] if there is no series,
// a series has fewer than 2 points, X and Y (or a band) differ in length,
// a value is not finite, or a band's Low exceeds its High.
func Lines(title, xLabel, yLabel string, series ...Series) (Figure, error) {
	if len(series) == 0 {
		return Figure{}, &ParamError{Func: "Lines", Param: "series", Value: 0, Reason: "need at least one", Err: ErrSeries}
	}
	for i, s := range series {
		name := "series " + strconv.Itoa(i+1)
		if s.Label != "" {
			name += " " + strconv.Quote(s.Label)
		}
		bad := func(param string, v any, reason string) error {
			return &ParamError{Func: "Lines", Param: name + " " + param, Value: v, Reason: reason, Err: ErrSeries}
		}
		if len(s.X) < 2 {
			return Figure{}, bad("X points", len(s.X), "need at least 2")
		}
		if len(s.Y) != len(s.X) {
			return Figure{}, bad("Y points", len(s.Y), "must equal the "+strconv.Itoa(len(s.X))+" points of X")
		}
		if (s.Low == nil) != (s.High == nil) {
			return Figure{}, bad("band", nil, "needs both Low and High")
		}
		if s.Low != nil && (len(s.Low) != len(s.X) || len(s.High) != len(s.X)) {
			return Figure{}, bad("band points", strconv.Itoa(len(s.Low))+" and "+strconv.Itoa(len(s.High)), "must equal the "+strconv.Itoa(len(s.X))+" points of X")
		}
		for j := range s.X {
			for _, v := range []struct {
				param string
				v     float64
			}{{"X", s.X[j]}, {"Y", s.Y[j]}} {
				if !finite(v.v) {
					return Figure{}, bad(v.param+"["+strconv.Itoa(j)+"]", v.v, "must be finite")
				}
			}
			if s.Low != nil {
				if !finite(s.Low[j]) || !finite(s.High[j]) || s.Low[j] > s.High[j] {
					return Figure{}, bad("band at X["+strconv.Itoa(j)+"]", strconv.FormatFloat(s.Low[j], 'g', -1, 64)+" … "+strconv.FormatFloat(s.High[j], 'g', -1, 64), "must be finite with Low ≤ High")
				}
			}
		}
	}
	p := newPlot(title, xLabel, yLabel)
	key := &keyBox{scene: &scene{}}
	var curves []curve
	xmin, xmax := series[0].X[0], series[0].X[0]
	for i, s := range series {
		sty := seriesStyles[i%len(seriesStyles)]
		xys := make(plotter.XYs, len(s.X))
		for j := range s.X {
			xys[j] = plotter.XY{X: s.X[j], Y: s.Y[j]}
			xmin, xmax = min(xmin, s.X[j]), max(xmax, s.X[j])
		}
		if s.Low != nil {
			ring := make(plotter.XYs, 0, 2*len(s.X))
			for j := range s.X {
				ring = append(ring, plotter.XY{X: s.X[j], Y: s.High[j]})
			}
			for j := len(s.X) - 1; j >= 0; j-- {
				ring = append(ring, plotter.XY{X: s.X[j], Y: s.Low[j]})
			}
			band, err := plotter.NewPolygon(ring)
			if err != nil {
				return Figure{}, err
			}
			c := color.NRGBAModel.Convert(sty.Color).(color.NRGBA)
			c.A = 0x26
			band.Color = c
			band.LineStyle = draw.LineStyle{}
			p.Add(band)
			curves = append(curves, curve{xys: append(plotter.XYs(nil), ring...)})
		}
		curves = append(curves, curve{xys: xys, style: sty, label: s.Label})
	}
	// Bands first (under every line), then the lines.
	var lines []curve
	for _, cv := range curves {
		if cv.style.Width > 0 {
			lines = append(lines, cv)
		}
	}
	if err := addCurves(p, key, lines); err != nil {
		return Figure{}, err
	}
	// A few cases (a what-if sweep) get a dot at each, so that five points
	// do not read as a continuous curve.
	for _, cv := range lines {
		if len(cv.xys) > maxDotted {
			continue
		}
		sc, err := plotter.NewScatter(cv.xys)
		if err != nil {
			return Figure{}, err
		}
		sc.GlyphStyle = draw.GlyphStyle{Color: cv.style.Color, Radius: vg.Points(2), Shape: draw.CircleGlyph{}}
		p.Add(sc)
	}
	if !key.empty() {
		p.Add(key)
	}
	if xmin == xmax {
		xmin, xmax = xmin-1, xmax+1
	}
	ylo, yhi := fitRange(curves, xmin, xmax, false, !key.empty())
	p.X.Min, p.X.Max = xmin, xmax
	p.Y.Min, p.Y.Max = ylo, yhi
	return newFigure(p), nil
}
