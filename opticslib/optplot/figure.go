package optplot

import (
	"bytes"
	"errors"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/beamnote/beamnote/internal/atomicfile"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Default size of a [Figure]: 16 cm × 9 cm, a notebook cell's width.
const (
	DefaultWidth  = 16 * vg.Centimeter
	DefaultHeight = 9 * vg.Centimeter
)

// PNGDPI is the resolution, in dots per inch, of the PNG files that
// [Figure.Save] writes: a 16 cm figure is 1260 pixels wide.
const PNGDPI = 200

// Figure is a finished figure: the plot, the size it is drawn at and a
// caption. Every figure function of the package ([Caustic], [AlongZ],
// [Lines], [Layout], [Stability], [PolarizationEllipse], …) returns one; the notebook layer renders it with
// [Figure.SVG] and shows [Figure.String] where no image can be shown.
//
// A Figure made by hand, Figure{Plot: p}, is valid too: a zero Width or
// Height means [DefaultWidth] or [DefaultHeight], and an empty Caption
// means the plot's title. The Plot is shared, not copied: changing it
// changes the figure.
type Figure struct {
	// Plot is the gonum/plot plot drawn.
	Plot *plot.Plot
	// Width and Height are the size of the drawing (vg units: 1 pt =
	// 1/72 in; write 16*vg.Centimeter).
	Width, Height vg.Length
	// Caption is a one-paragraph description of the figure, the text
	// shown instead of it outside notebooks. Figures that show
	// irradiance carry the laser-safety note in it.
	Caption string
}

// ParamError is the error of a figure function or option given a bad
// value. Its message follows the library's one format,
//
//	optplot: Func: parameter = value unit: reason
//
// for example "optplot: Zoom: half width = -1 mm: must be positive and
// finite". It wraps one of the sentinels [ErrOption], [ErrCaustic],
// [ErrSeries], [ErrLayout], [ErrFanLines], [ErrFigure], [ErrBudget],
// [ErrCavity], [ErrPolarization] or [ErrCoupling], so callers test with
// errors.Is.
type ParamError struct {
	// Func names the function or option, for example "Zoom".
	Func string
	// Param names the parameter, for example "half width".
	Param string
	// Value is the offending value: a units.Length (printed with its
	// unit), a float64, an int or a string; nil when there is none.
	Value any
	// Reason states the requirement the value fails.
	Reason string
	// Err is the wrapped sentinel; for the cavity figures it is joined
	// (errors.Join) with the cavity package's error, so errors.Is finds
	// both.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("optplot", e.Func, e.Param, e.Value, e.Reason, nil)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }

// ErrFigure is wrapped by the errors of [Figure.SVG] and [Figure.Save]:
// no plot, a bad size, an unknown file extension.
var ErrFigure = errors.New("optplot: cannot render figure")

// newFigure returns the figure of p with the default size and p's title
// as caption.
func newFigure(p *plot.Plot) Figure {
	return Figure{Plot: p, Width: DefaultWidth, Height: DefaultHeight, Caption: p.Title.Text}
}

// size returns the figure's size with the defaults applied, or an error
// naming the bad dimension in cm.
func (f Figure) size(fn string) (w, h vg.Length, err error) {
	if f.Plot == nil {
		return 0, 0, &ParamError{Func: fn, Param: "Plot", Reason: "is nil", Err: ErrFigure}
	}
	w, h = f.Width, f.Height
	if w == 0 {
		w = DefaultWidth
	}
	if h == 0 {
		h = DefaultHeight
	}
	for _, d := range []struct {
		name string
		v    vg.Length
	}{{"width", w}, {"height", h}} {
		if err := checkSize(fn, d.name, d.v); err != nil {
			return 0, 0, err
		}
	}
	return w, h, nil
}

// checkSize returns an error unless v is a positive finite length of at
// most 2 m (a bound far above any screen or page, which keeps a raster
// image in memory).
func checkSize(fn, name string, v vg.Length) error {
	if !(v > 0) || math.IsInf(float64(v), 0) || v > 200*vg.Centimeter {
		return &ParamError{Func: fn, Param: name, Value: cm(v), Reason: "must be positive, finite and at most 200 cm", Err: ErrFigure}
	}
	return nil
}

// cm formats a vg length in centimetres, for error messages.
func cm(v vg.Length) string {
	return strconv.FormatFloat(float64(v/vg.Centimeter), 'g', 6, 64) + " cm"
}

// SVG renders the figure as an SVG document. Rendering the same figure
// twice gives identical bytes (gonum/plot's SVG back end writes numbers
// with fixed precision, and the package's plotters iterate over slices
// only). It returns a [*ParamError] wrapping [ErrFigure] if Plot is nil or
// a size is not positive and finite.
//
// It draws on a vgsvg canvas directly rather than through
// plot.Plot.WriterTo, which would link every gonum/plot back end (EPS,
// TeX, JPEG, TIFF) into each notebook cell.
func (f Figure) SVG() ([]byte, error) {
	w, h, err := f.size("Figure.SVG")
	if err != nil {
		return nil, err
	}
	c := &measuredText{Canvas: vgsvg.NewWith(vgsvg.UseWH(w, h))}
	drawPlot(f.Plot, c)
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, err
	}
	return pngLabel(c.fix(buf.Bytes())), nil
}

// pngLabel fixes two things in the embedded raster images (a heat map's)
// that vgsvg writes: the media type, PNG bytes under "data:image/jpg"
// (browsers sniff past it, stricter SVG renderers refuse it; the PNG
// signature, base64 "iVBOR", identifies them), and the missing
// preserveAspectRatio="none", without which SVG's default "xMidYMid meet"
// letterboxes an image whose pixel grid has another aspect ratio than its
// box, so that the map no longer lies on its axes (SVG 1.1, §7.8).
func pngLabel(svg []byte) []byte {
	svg = bytes.ReplaceAll(svg, []byte("data:image/jpg;base64,iVBOR"), []byte("data:image/png;base64,iVBOR"))
	return bytes.ReplaceAll(svg, []byte("<image x="), []byte(`<image preserveAspectRatio="none" x=`))
}

// measuredText is the SVG canvas with the width of every string it draws,
// in drawing order, as the plot's font metrics give it.
type measuredText struct {
	*vgsvg.Canvas
	widths []vg.Length
}

func (c *measuredText) FillString(f font.Face, pt vg.Point, s string) {
	c.widths = append(c.widths, f.Width(s))
	c.Canvas.FillString(f, pt, s)
}

// svgSerif is the font-family list the figures name: the font whose
// metrics laid the text out (gonum/plot's default), then Times New Roman,
// which has the same metrics, then any serif.
const svgSerif = "font-family:'Liberation Serif','Times New Roman',Times,serif;"

// fix makes the figure's text keep its laid-out width in a browser that
// lacks the plot's font: every <text> element gets the width its font
// metrics give as textLength (lengthAdjust spacingAndGlyphs: a wider
// substitute is narrowed to fit instead of running past the key or the
// figure's edge), and the font family gets fallbacks. A figure whose text
// elements do not match the measured strings one for one is left as it is.
func (c *measuredText) fix(svg []byte) []byte {
	open := []byte("<text ")
	if bytes.Count(svg, open) != len(c.widths) {
		return svg
	}
	var out bytes.Buffer
	out.Grow(len(svg) + 48*len(c.widths))
	rest := svg
	for _, w := range c.widths {
		i := bytes.Index(rest, open)
		out.Write(rest[:i+len(open)])
		out.WriteString(`textLength="` + strconv.FormatFloat(w.Points(), 'g', 5, 64) + `" lengthAdjust="spacingAndGlyphs" `)
		rest = rest[i+len(open):]
	}
	out.Write(rest)
	return bytes.ReplaceAll(out.Bytes(), []byte("font-family:Liberation Serif;"), []byte(svgSerif))
}

// Save writes the figure to the file path in the format its extension
// names, case-insensitively: ".svg" (the bytes of [Figure.SVG]), ".png"
// (a raster image at [PNGDPI] dots per inch on a white background) or
// ".pdf" (fonts embedded). The file is written atomically: to a temporary
// file in the same directory, which is then renamed over path, so a
// reader never sees half a figure and a failed write leaves an existing
// file as it was. It returns a [*ParamError] wrapping [ErrFigure] for
// another extension, no plot or a bad size, and the error of the file
// system otherwise.
//
// SVG is drawn here; PNG and PDF are drawn by the writers in
// figure_files.go, which a program contains unless it is built with the
// build tag "minimal". That is gonum/plot's own tag for leaving out its
// raster, PDF, EPS and TeX back ends, whose packages register themselves
// when imported and so are linked into every program that imports them.
// The notebook kernel builds cells that do not call Save with that tag
// (about 1.8 MB and 55 ms of link less per plotting cell), and cells that
// do call it without, so Save works in one call everywhere. A program
// built with the tag by hand gets an error naming it for ".png" and
// ".pdf". Library code must not call Save on a figure it was not given to
// save: the kernel looks for the call in the cell's own source.
func (f Figure) Save(path string) error {
	w, h, err := f.size("Figure.Save")
	if err != nil {
		return err
	}
	var data []byte
	switch ext := strings.ToLower(filepath.Ext(path)); {
	case ext == ".svg":
		if data, err = f.SVG(); err != nil {
			return err
		}
	case fileWriters[ext] != nil:
		var buf bytes.Buffer
		drawer := fileWriters[ext]
		if err := drawer(f.Plot, w, h, &buf); err != nil {
			return err
		}
		data = buf.Bytes()
	case ext == ".png" || ext == ".pdf":
		return &ParamError{Func: "Figure.Save", Param: "file extension", Value: ext,
			Reason: "PNG and PDF writers are left out of programs built with the build tag minimal; build without it", Err: ErrFigure}
	default:
		if ext == "" {
			ext = "(none)"
		}
		return &ParamError{Func: "Figure.Save", Param: "file extension", Value: ext, Reason: "must be .svg, .png or .pdf", Err: ErrFigure}
	}
	return atomicfile.Write(path, data, 0o644)
}

// fileWriters maps a lower-case file extension other than ".svg" to the
// function that draws a plot of the given size in that format;
// figure_files.go fills it (see [Figure.Save]).
var fileWriters = map[string]func(p *plot.Plot, w, h vg.Length, buf *bytes.Buffer) error{}

// Margins kept free around a figure, so that the last tick label and the
// title never touch the edge (a renderer may substitute a slightly wider
// font).
const (
	marginRight = 8 // pt
	marginTop   = 3 // pt
)

// drawPlot draws p on c inside the figure margins.
func drawPlot(p *plot.Plot, c vg.CanvasSizer) {
	p.Draw(draw.Crop(draw.New(c), 0, -vg.Points(marginRight), 0, -vg.Points(marginTop)))
}

// String returns the caption, or the plot's title when the caption is
// empty: the text fallback of the figure (fmt.Stringer).
func (f Figure) String() string {
	if f.Caption != "" || f.Plot == nil {
		return f.Caption
	}
	return f.Plot.Title.Text
}
