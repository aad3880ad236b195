package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Axis labels of the caustic plot.
const (
	XLabel = "axial position z (mm)"
	YLabel = "beam radius ±w (mm)"
)

// Option configures the figure functions that take options ([Caustic],
// [AlongZ], [PowerBudget], [Stability], [CavityTransmission],
// [PolarizationEllipse], [CouplingMisalignment], …); each names the
// options it uses, and ignores the others. Options are applied in order;
// the first invalid value makes the figure function return a
// [*ParamError] wrapping [ErrOption].
type Option func(*config)

type config struct {
	title, caption       string
	titleSet, captionSet bool
	band, labels, waists bool
	rays                 []paraxial.Ray
	minT                 float64
	width, height        vg.Length
	hasRange             bool
	z0, z1               float64 // mm, the x range
	zoom                 bool
	label                string
	also                 []overlay
	// edgeWaists notes waists at the ends of the range shown too
	// ([CavityCaustic]: the waist on a flat end mirror).
	edgeWaists bool
	// Cavity, polarization and coupling figures (cavityplot.go,
	// polarplot.go, coupleplot.go).
	hasDetuning       bool
	d0, d1            float64 // Hz, the detuning range
	fsrUnits, linearT bool
	order             int
	orderSet          bool
	multiples         bool
	multiplesSet      bool
	tolerances        []float64
	// names of the curves of the real-ray figures (realrays.go).
	names []string
	err   error
}

// overlay is a caustic drawn over the main one ([Also]).
type overlay struct {
	label string
	c     beam.Caustic
}

// fail records the first bad option.
func (c *config) fail(fn, param string, v any, reason string) {
	if c.err == nil {
		c.err = &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrOption}
	}
}

// Title sets the plot title. The default is "Gaussian beam caustic" for
// [Caustic] and the quantity's name for [AlongZ].
func Title(s string) Option { return func(c *config) { c.title, c.titleSet = s, true } }

// Caption sets the figure's caption ([Figure.Caption], its text
// fallback). The default is the title followed by a one-line summary (the
// waists, for a caustic), and for irradiance always the laser-safety note.
func Caption(s string) Option { return func(c *config) { c.caption, c.captionSet = s, true } }

// Size sets the figure's width and height (vg units: write
// 18*vg.Centimeter; each positive, finite and at most 200 cm). The
// default is [DefaultWidth] × [DefaultHeight], 16 cm × 9 cm.
func Size(w, h vg.Length) Option {
	return func(c *config) {
		for _, d := range []struct {
			name string
			v    vg.Length
		}{{"width", w}, {"height", h}} {
			if err := checkSize("Size", d.name, d.v); err != nil {
				c.fail("Size", d.name, cm(d.v), "must be positive, finite and at most 200 cm")
				return
			}
		}
		c.width, c.height = w, h
	}
}

// ZRange sets the axial range shown, from z0 to z1 (metres from the input
// plane, finite, z0 < z1). The default is the sampled range of the
// caustic. The y range is fitted to the beam inside the range shown.
func ZRange(z0, z1 units.Length) Option {
	return func(c *config) {
		if !finite(float64(z0)) || !finite(float64(z1)) || !(z0 < z1) {
			c.fail("ZRange", "range z0 … z1", z0.String()+" … "+z1.String(), "must be finite with z0 < z1")
			return
		}
		c.hasRange, c.zoom = true, false
		c.z0, c.z1 = z0.Millimeters(), z1.Millimeters()
	}
}

// Zoom shows the axial range z ± halfWidth (metres; halfWidth positive,
// both finite), typically around a focus, with the y range fitted to the
// beam there. Between samples the envelope is drawn from the closed form
// of a homogeneous medium (w² is quadratic in z, with slope 2w²/R at the
// sample), so a zoom far narrower than the sample spacing still shows
// the true waist.
func Zoom(z, halfWidth units.Length) Option {
	return func(c *config) {
		if !finite(float64(z)) {
			c.fail("Zoom", "centre z", z, "must be finite")
			return
		}
		if !(halfWidth > 0) || !finite(float64(halfWidth)) {
			c.fail("Zoom", "half width", halfWidth, "must be positive and finite")
			return
		}
		c.hasRange, c.zoom = true, true
		c.z0, c.z1 = (z - halfWidth).Millimeters(), (z + halfWidth).Millimeters()
	}
}

// Names names the curves of the real-ray figures in the key and caption,
// in order: the fan pairs of [RayAberration] (the k-th name for the k-th
// tangential and sagittal fans), the curves of
// [SphericalAberrationCurve] and [FocalShiftCurve], the ray groups of
// [RealRayLayout] that have no Label. Curves beyond the names keep their
// default names.
func Names(names ...string) Option {
	return func(c *config) { c.names = append([]string(nil), names...) }
}

// Label names the main caustic in the key; it is shown when set and
// whenever [Also] adds another caustic (default "beam").
func Label(s string) Option { return func(c *config) { c.label = s } }

// Also draws another caustic on the same axes, for example the same beam
// through a what-if variant of the system, with its own colour and dash
// pattern and the key entry label. Its element marks and waist notes are
// not drawn (those of the main caustic are). It may be given several
// times; a caustic that fails the checks of [Caustic] makes the figure
// function return an error naming it.
func Also(label string, c beam.Caustic) Option {
	return func(cf *config) { cf.also = append(cf.also, overlay{label: label, c: c}) }
}

// Band controls the pale fill between −w and +w of the x plane (default
// on).
func Band(on bool) Option { return func(c *config) { c.band = on } }

// ElementLabels controls the text above the element bars (default on).
func ElementLabels(on bool) Option { return func(c *config) { c.labels = on } }

// WaistNotes controls the annotation of every real waist with its radius
// and position (default on).
func WaistNotes(on bool) Option { return func(c *config) { c.waists = on } }

// Rays overlays paraxial rays of the tangential (x) plane on the same
// axes: each ray, given at the input plane (height in metres, angle in
// radians), is traced with [paraxial.System.MatrixTo] to every sample
// position of the caustic. A fan of a few rays from an object point shows
// where geometric optics puts the image, next to the beam's own waist.
// [AlongZ] ignores it.
func Rays(rays ...paraxial.Ray) Option {
	return func(c *config) { c.rays = append([]paraxial.Ray(nil), rays...) }
}

// MinTransmission sets the transmitted fraction below which an element's
// clear aperture is drawn as clipping the beam (default
// [beam.DefaultMinTransmission], 99 %); t must lie in (0, 1].
func MinTransmission(t float64) Option {
	return func(c *config) {
		if !(t > 0 && t <= 1) {
			c.fail("MinTransmission", "transmitted fraction t", t, "must lie in (0, 1]")
			return
		}
		c.minT = t
	}
}

// farStop is the aperture radius, in units of the largest beam radius
// shown, beyond which a passing stop is not drawn (it is listed in a note
// instead).
const farStop = 2.0

// ErrCaustic is wrapped by the errors of [Caustic] and [AlongZ] for an
// empty or inconsistent caustic.
var ErrCaustic = errors.New("optplot: caustic needs at least 2 samples with matching Z, W and WY lengths and finite values")

// ErrOption is wrapped by the errors of an invalid option value.
var ErrOption = errors.New("optplot: invalid option")

// newConfig applies opts over the defaults.
func newConfig(opts []Option) config {
	cfg := config{title: "Gaussian beam caustic", band: true, labels: true, waists: true, minT: beam.DefaultMinTransmission}
	for _, o := range opts {
		if o != nil {
			o(&cfg)
		}
	}
	return cfg
}

// figure wraps p with the configured size and caption.
func (cfg config) figure(p *plot.Plot, caption string) Figure {
	f := newFigure(p)
	if cfg.width > 0 {
		f.Width, f.Height = cfg.width, cfg.height
	}
	f.Caption = caption
	if cfg.captionSet {
		f.Caption = cfg.caption
	}
	return f
}

// checkCaustic returns a [*ParamError] wrapping [ErrCaustic] unless c has
// at least two samples, Z, W and (when present) WY of one length, and
// finite values. name is the caustic's name in the message.
func checkCaustic(fn, name string, c beam.Caustic) error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: name + "." + param, Value: v, Reason: reason, Err: ErrCaustic}
	}
	n := len(c.Z)
	if n < 2 {
		return bad("Z samples", n, "need at least 2 (use beam.Sample)")
	}
	if len(c.W) != n {
		return bad("W samples", len(c.W), "must equal the "+strconv.Itoa(n)+" samples of Z")
	}
	if c.WY != nil && len(c.WY) != n {
		return bad("WY samples", len(c.WY), "must equal the "+strconv.Itoa(n)+" samples of Z")
	}
	for i := range n {
		for _, v := range []struct {
			param string
			v     units.Length
		}{{"Z", c.Z[i]}, {"W", c.W[i]}, {"WY", wyAt(c, i)}} {
			if !finite(float64(v.v)) {
				return bad(v.param+"["+strconv.Itoa(i)+"]", v.v.String(), "must be finite")
			}
		}
		if i > 0 && c.Z[i] < c.Z[i-1] {
			return bad("Z["+strconv.Itoa(i)+"]", c.Z[i], "must not be less than Z["+strconv.Itoa(i-1)+"] = "+c.Z[i-1].String())
		}
	}
	return nil
}

func wyAt(c beam.Caustic, i int) units.Length {
	if c.WY == nil {
		return c.W[i]
	}
	return c.WY[i]
}

// newPlot returns a plot in the package's look: title, axis labels and
// ticks in dark grey, axes in neutral grey, tick labels precise enough to
// differ ([niceTicks]).
func newPlot(title, xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = xLabel
	p.Y.Label.Text = yLabel
	for _, s := range []*text.Style{&p.Title.TextStyle, &p.X.Label.TextStyle, &p.Y.Label.TextStyle, &p.X.Tick.Label, &p.Y.Tick.Label} {
		s.Color = labelColor
	}
	p.X.Color, p.Y.Color = axisColor, axisColor
	p.X.Tick.Color, p.Y.Tick.Color = axisColor, axisColor
	p.X.Tick.Marker = niceTicks{target: 6}
	p.Y.Tick.Marker = niceTicks{target: 5}
	return p
}

// Overlay styles, cycled: ochre long dashes, plum dot-dash, moss short
// dashes, slate violet dots.
var overlayStyles = []draw.LineStyle{
	{Color: color.NRGBA{R: 0xb0, G: 0x7a, B: 0x3a, A: 0xff}, Width: vg.Points(1.3), Dashes: []vg.Length{vg.Points(6), vg.Points(2.5)}},
	{Color: color.NRGBA{R: 0x78, G: 0x60, B: 0x8c, A: 0xff}, Width: vg.Points(1.3), Dashes: []vg.Length{vg.Points(5), vg.Points(2), vg.Points(1), vg.Points(2)}},
	{Color: color.NRGBA{R: 0x5f, G: 0x7f, B: 0x3f, A: 0xff}, Width: vg.Points(1.3), Dashes: []vg.Length{vg.Points(3), vg.Points(2)}},
	{Color: color.NRGBA{R: 0x6b, G: 0x6f, B: 0xa8, A: 0xff}, Width: vg.Points(1.3), Dashes: []vg.Length{vg.Points(1), vg.Points(1.8)}},
}

// addLine adds the polyline xys to p in style sty.
func addLine(p *plot.Plot, xys plotter.XYs, sty draw.LineStyle) error {
	l, err := plotter.NewLine(xys)
	if err != nil {
		return err
	}
	l.LineStyle = sty
	p.Add(l)
	return nil
}

// mirrored returns the points of xys with y negated.
func mirrored(xys plotter.XYs) plotter.XYs {
	out := make(plotter.XYs, len(xys))
	for i, p := range xys {
		out[i] = plotter.XY{X: p.X, Y: -p.Y}
	}
	return out
}

// Caustic returns a figure of the beam envelope ±w(z) of c, in mm against
// z in mm, with the zero-thickness elements of sys marked at their
// positions and every real waist (c.Foci, c.FociY) annotated with its
// radius and position (see the package documentation for the look). When
// the y envelope differs from the x envelope it is drawn dashed, with a
// key. c is usually the result of [beam.Sample] for the same sys.
//
// Clear apertures are drawn as stops at the edges of the opening in x on
// the element bars, and tubes (apertures on spaces) as lines along the
// gap; one is drawn in the warning colour when it passes less than its
// threshold: the opening's own, or the [MinTransmission] option (the
// results of [beam.Caustic.Clipping], for a c made by [beam.Sample]). A
// stop that passes and lies beyond twice the largest beam radius shown is
// not drawn, so that wide optics do not squash the envelope; a note in
// the key lists each such stop with its clear diameter.
//
// [ZRange] and [Zoom] choose the axial range, [Also] adds what-if
// caustics, [Size] and [Caption] set the figure's size and caption. The
// default caption is the title and the waists.
//
// It returns a [*ParamError] wrapping [ErrCaustic] if c (or a caustic of
// [Also]) has fewer than two points, the slices differ in length, or a
// value is not finite, and one wrapping [ErrOption] for a bad option.
func Caustic(c beam.Caustic, sys paraxial.System, opts ...Option) (Figure, error) {
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkCaustic("Caustic", "c", c); err != nil {
		return Figure{}, err
	}
	for i, o := range cfg.also {
		if err := checkCaustic("Also", "caustic "+strconv.Itoa(i+1)+" "+strconv.Quote(o.label), o.c); err != nil {
			return Figure{}, err
		}
	}
	n := len(c.Z)
	lo, hi := cfg.zRange(c)
	env := sampleEnvelope(c, lo, hi, false)
	if len(env.z) == 0 {
		return Figure{}, &ParamError{Func: "Caustic", Param: "range shown", Value: strconv.FormatFloat(lo, 'g', 6, 64) + " … " + strconv.FormatFloat(hi, 'g', 6, 64) + " mm",
			Reason: "lies outside the caustic's samples, " + c.Z[0].String() + " … " + c.Z[n-1].String(), Err: ErrOption}
	}
	upper, upperY := env.xys(env.wx), env.xys(env.wy)
	astig := env.astigmatic()
	wmax := env.maxIn(lo, hi)
	overlays := make([]envelope, len(cfg.also))
	for i, o := range cfg.also {
		overlays[i] = sampleEnvelope(o.c, lo, hi, false)
		wmax = math.Max(wmax, overlays[i].maxIn(lo, hi))
	}
	if !(wmax > 0) {
		wmax = 1
	}

	p := newPlot(cfg.title, XLabel, YLabel)
	sc := &scene{}
	key := &keyBox{scene: sc}

	if cfg.band {
		ring := make(plotter.XYs, 0, 2*len(upper))
		ring = append(ring, upper...)
		for i := len(upper) - 1; i >= 0; i-- {
			ring = append(ring, plotter.XY{X: upper[i].X, Y: -upper[i].Y})
		}
		band, err := plotter.NewPolygon(ring)
		if err != nil {
			return Figure{}, err
		}
		band.Color = bandColor
		band.LineStyle = draw.LineStyle{} // no outline
		p.Add(band)
	}
	if err := addLine(p, plotter.XYs{{X: lo, Y: 0}, {X: hi, Y: 0}}, zeroStyle); err != nil {
		return Figure{}, err
	}

	if len(cfg.rays) > 0 {
		// The transfer matrix to each sample plane is the same for every
		// ray: compute it once, not once per ray.
		ms := make([]paraxial.Matrix, n)
		for i, z := range c.Z {
			m, err := sys.MatrixTo(z, paraxial.Tangential)
			if err != nil {
				return Figure{}, err
			}
			ms[i] = m
		}
		sty := draw.LineStyle{Color: rayColor, Width: vg.Points(0.7)}
		for k, r := range cfg.rays {
			xys := make(plotter.XYs, n)
			for i, m := range ms {
				y := float64(m.Apply(r).Y) * 1e3
				if !finite(y) {
					return Figure{}, &ParamError{Func: "Rays", Param: "ray " + strconv.Itoa(k+1) + " height at z = " + c.Z[i].String(), Value: units.Length(y / 1e3), Reason: "must be finite", Err: ErrOption}
				}
				xys[i] = plotter.XY{X: c.Z[i].Millimeters(), Y: y}
			}
			if err := addLine(p, xys, sty); err != nil {
				return Figure{}, err
			}
		}
		key.entries = append(key.entries, keyEntry{text: "paraxial rays (x)", line: sty})
	}

	label := cfg.label
	if label == "" && len(cfg.also) > 0 {
		label = "beam"
	}
	xSty := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
	ySty := draw.LineStyle{Color: yColor, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
	for _, xys := range []plotter.XYs{upper, mirrored(upper)} {
		if err := addLine(p, xys, xSty); err != nil {
			return Figure{}, err
		}
	}
	key.avoid = append(key.avoid, thin(upper, 200), thin(mirrored(upper), 200))
	if astig {
		for _, xys := range []plotter.XYs{upperY, mirrored(upperY)} {
			if err := addLine(p, xys, ySty); err != nil {
				return Figure{}, err
			}
		}
		key.avoid = append(key.avoid, thin(upperY, 200), thin(mirrored(upperY), 200))
		key.entries = append(key.entries, keyEntry{text: layJoin(label, "x (tangential)"), line: xSty, fill: bandFill(cfg.band)},
			keyEntry{text: layJoin(label, "y (sagittal)"), line: ySty})
	} else if label != "" {
		key.entries = append(key.entries, keyEntry{text: label, line: xSty, fill: bandFill(cfg.band)})
	}
	for i, o := range overlays {
		sty := overlayStyles[i%len(overlayStyles)]
		up := o.xys(o.wx)
		for _, xys := range []plotter.XYs{up, mirrored(up)} {
			if err := addLine(p, xys, sty); err != nil {
				return Figure{}, err
			}
		}
		key.avoid = append(key.avoid, thin(up, 200), thin(mirrored(up), 200))
		name := cfg.also[i].label
		if o.astigmatic() {
			yst := sty
			yst.Width = vg.Points(0.9)
			yst.Dashes = []vg.Length{vg.Points(1.5), vg.Points(1.5)}
			upY := o.xys(o.wy)
			for _, xys := range []plotter.XYs{upY, mirrored(upY)} {
				if err := addLine(p, xys, yst); err != nil {
					return Figure{}, err
				}
			}
			key.entries = append(key.entries, keyEntry{text: layJoin(name, "x"), line: sty}, keyEntry{text: layJoin(name, "y"), line: yst})
		} else {
			key.entries = append(key.entries, keyEntry{text: name, line: sty})
		}
	}

	marks, err := NewMarks(sys, 1.15*wmax)
	if err != nil {
		return Figure{}, err
	}
	marks.scene = sc
	// Clipping results by element (a slice in element order, not a map:
	// the drawing must not depend on map order), when c knows its system
	// and beam.
	clips := make([]beam.Clip, sys.Len())
	hasClip := make([]bool, sys.Len())
	if cl, err := c.Clipping(cfg.minT); err == nil {
		for _, k := range cl {
			if k.Element >= 0 && k.Element < len(clips) {
				clips[k.Element], hasClip[k.Element] = k, true
			}
		}
	}
	clipped := func(i int) (beam.Clip, bool) {
		if i >= 0 && i < len(clips) && hasClip[i] && clips[i].Low {
			return clips[i], true
		}
		return beam.Clip{}, false
	}
	var omitted []string
	visible := func(z float64) bool { return z >= lo && z <= hi }
	var kept []Mark
	for _, mk := range marks.Marks {
		name := mk.Label
		if !cfg.labels {
			mk.Label = ""
		}
		if mk.Stop {
			if k, ok := clipped(mk.Element); ok {
				mk.Clipped = true
				if mk.Label != "" {
					mk.Label += " · passes " + below(k.Transmission, k.MinTransmission)
				}
			}
			// A stop far outside the beam would only squash the
			// envelope: draw a default-height bar instead, and say so.
			if !mk.Clipped && mk.half() > farStop*wmax {
				if visible(mk.Z) {
					omitted = append(omitted, stopNote(name, sys.Element(mk.Element).Aperture))
				}
				mk.Stop, mk.Low, mk.High = false, -1.15*wmax, 1.15*wmax
			}
		}
		kept = append(kept, mk)
	}
	marks.Marks = kept
	tubes := marks.Tubes[:0]
	for _, tb := range marks.Tubes {
		if _, ok := clipped(tb.Element); ok {
			tb.Clipped = true
		}
		if !tb.Clipped && math.Max(math.Abs(tb.Low), math.Abs(tb.High)) > farStop*wmax {
			if tb.Z1 >= lo && tb.Z0 <= hi {
				omitted = append(omitted, stopNote(layJoin(tb.Label, "tube"), sys.Element(tb.Element).Aperture))
			}
			continue
		}
		tubes = append(tubes, tb)
	}
	marks.Tubes = tubes
	if len(marks.Marks)+len(marks.Tubes) > 0 {
		p.Add(marks)
	}
	if len(omitted) > 0 {
		key.notes = append(key.notes, "Not drawn, beyond twice the largest beam radius: "+strings.Join(omitted, ", ")+".")
	}

	if cfg.waists {
		notes := newWaistNotes(c, astig, lo, hi, cfg.edgeWaists)
		notes.scene = sc
		if len(notes.notes) > 0 {
			p.Add(notes)
		}
	}
	if !key.empty() {
		p.Add(key)
	}
	// Symmetric y range with head-room for the element labels above and
	// the waist notes below; more with a key.
	room := 1.4
	if !key.empty() {
		room = 1.7
	}
	ymax := room * math.Max(wmax, marks.maxHalfHeightIn(lo, hi))
	p.Y.Min, p.Y.Max = -ymax, ymax
	p.X.Min, p.X.Max = lo, hi
	return cfg.figure(p, causticCaption(cfg.title, c, astig)), nil
}

// bandFill returns the key's fill sample for the envelope band.
func bandFill(on bool) color.Color {
	if on {
		return bandColor
	}
	return nil
}

// stopNote describes an opening that is not drawn: "L1 Ø 25.4 mm", or
// "S slit 2 mm" for a slit.
func stopNote(name string, o paraxial.Opening) string {
	size := "Ø " + o.Diameter().String()
	if o.Shape == paraxial.Slit {
		size = "slit " + o.Diameter().String()
	}
	return layJoin(name, size)
}

// causticCaption returns the title followed by the waists in the
// sampled range.
func causticCaption(title string, c beam.Caustic, astig bool) string {
	var parts []string
	add := func(fs []beam.Focus, plane string) {
		for _, f := range fs {
			if f.Z <= c.Z[0] { // the source, at the start of the path
				continue
			}
			parts = append(parts, plane+"w₀ "+short(f.Radius)+" at z = "+table.In(f.Z, units.Millimeter, 1)+" mm")
		}
	}
	if astig {
		add(c.Foci, "x ")
		add(c.FociY, "y ")
	} else {
		add(c.Foci, "")
	}
	if len(parts) == 0 {
		return title
	}
	return title + ". Waists: " + strings.Join(parts, "; ") + "."
}

// zRange returns the axial range of a figure of c in mm: the option's
// range, or the caustic's own; never empty.
func (cfg config) zRange(c beam.Caustic) (lo, hi float64) {
	lo, hi = c.Z[0].Millimeters(), c.Z[len(c.Z)-1].Millimeters()
	if cfg.hasRange {
		lo, hi = cfg.z0, cfg.z1
	}
	if lo == hi {
		hi = lo + 1
	}
	return lo, hi
}

// below formats the transmitted fraction t < threshold as a percentage
// with one decimal, or more (up to four) when one decimal would round it
// up to the threshold or beyond: 0.98996 against 99 % reads "98.996 %",
// not "99.0 %".
func below(t, threshold float64) string {
	prec := 1
	s := strconv.FormatFloat(100*t, 'f', prec, 64)
	for prec < 4 {
		if v, err := strconv.ParseFloat(s, 64); err == nil && v < 100*threshold {
			break
		}
		prec++
		s = strconv.FormatFloat(100*t, 'f', prec, 64)
	}
	return s + " %"
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// note is one waist annotation, in plot units (mm).
type note struct {
	z, w0 float64
	text  string
	y     bool // a y-plane waist of an astigmatic beam
}

// waistNotes draws a short bar at ±w0 of each real waist, a dotted leader
// down to the bottom of the plot and a one-line label there, for example
// "w₀ 16.9 µm @ 99.99 mm".
type waistNotes struct {
	notes []note
	style text.Style
	scene *scene
}

var (
	_ plot.Plotter     = (*waistNotes)(nil)
	_ plot.DataRanger  = (*waistNotes)(nil)
	_ plot.Thumbnailer = (*waistNotes)(nil)
)

// DataRange implements plot.DataRanger: the waist positions and ±w0, in
// mm; the unit range (0, 1, −1, 1) without notes.
func (wn *waistNotes) DataRange() (xmin, xmax, ymin, ymax float64) {
	return barRange(len(wn.notes), func(i int) (float64, float64) { return wn.notes[i].z, wn.notes[i].w0 })
}

// Thumbnail implements plot.Thumbnailer with the two short waist bars.
func (wn *waistNotes) Thumbnail(c *draw.Canvas) {
	bar := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.2)}
	x := (c.Min.X + c.Max.X) / 2
	d := (c.Max.X - c.Min.X) / 4
	c.StrokeLine2(bar, x-d, c.Max.Y, x+d, c.Max.Y)
	c.StrokeLine2(bar, x-d, c.Min.Y, x+d, c.Min.Y)
}

// newWaistNotes returns the notes of the waists of c inside (zmin, zmax)
// mm, or inside [zmin, zmax] with edges (a cavity's waist on a flat end
// mirror); positions print with one decimal, more when the range is
// short.
func newWaistNotes(c beam.Caustic, astig bool, zmin, zmax float64, edges bool) *waistNotes {
	wn := &waistNotes{style: text.Style{Color: labelColor, XAlign: draw.XCenter, YAlign: draw.YBottom, Handler: plot.DefaultTextHandler}}
	dec := max(1, min(4, 2-int(math.Floor(math.Log10(zmax-zmin)))))
	start := c.Z[0].Millimeters()
	add := func(fs []beam.Focus, prefix string, y bool) {
		for _, f := range fs {
			z := f.Z.Millimeters()
			// The input waist at the very start of the path is the
			// source; it is described elsewhere and would clip. A
			// cavity's mode has no source: its waists at the ends of
			// the range are kept.
			tol := 1e-9 * (zmax - zmin)
			if edges {
				if z < zmin-tol || z > zmax+tol {
					continue
				}
			} else if z <= start+tol || z <= zmin || z >= zmax {
				continue
			}
			// A waist just behind a lens placed at a waist repeats the
			// one just before it at plot resolution: keep one.
			if k := len(wn.notes); k > 0 {
				last := wn.notes[k-1]
				if last.y == y && math.Abs(last.z-z) < 2e-3*(zmax-zmin) && math.Abs(last.w0-f.Radius.Millimeters()) < 0.01*last.w0 {
					continue
				}
			}
			wn.notes = append(wn.notes, note{z: z, w0: f.Radius.Millimeters(), text: prefix + "w₀ " + short(f.Radius) + " @ " + strconv.FormatFloat(z, 'f', dec, 64) + " mm", y: y})
		}
	}
	if astig {
		add(c.Foci, "x ", false)
		add(c.FociY, "y ", true)
		// Merge into position order (both lists are sorted).
		for i := 1; i < len(wn.notes); i++ {
			for j := i; j > 0 && wn.notes[j].z < wn.notes[j-1].z; j-- {
				wn.notes[j], wn.notes[j-1] = wn.notes[j-1], wn.notes[j]
			}
		}
	} else {
		add(c.Foci, "", false)
	}
	return wn
}

// Plot implements plot.Plotter.
func (wn *waistNotes) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, trY := plt.Transforms(&c)
	sty := withFont(wn.style, plt, 7.5)
	lineH := sty.FontExtents().Height
	base := c.Min.Y + vg.Points(3)
	tick := vg.Points(3.5)
	leader := draw.LineStyle{Color: axisColor, Width: vg.Points(0.5), Dashes: []vg.Length{vg.Points(1), vg.Points(1.5)}}
	var rows []vg.Length // right edge of the last label in each row
	for _, n := range wn.notes {
		x := trX(n.z)
		if !c.ContainsX(x) {
			continue
		}
		col := envelopeColor
		if n.y {
			col = yColor
		}
		bar := draw.LineStyle{Color: col, Width: vg.Points(1.2)}
		top, bot := trY(n.w0), trY(-n.w0)
		c.StrokeLine2(bar, x-tick, top, x+tick, top)
		c.StrokeLine2(bar, x-tick, bot, x+tick, bot)
		w := sty.Width(n.text)
		// Keep the label inside the data area horizontally.
		// (A margin of 15 % covers renderers that substitute a wider
		// font, and glyphs such as ₀ taken from a fallback font.)
		lx := x
		margin := vg.Points(2) + 0.15*w
		if lx-w/2 < c.Min.X+margin {
			lx = c.Min.X + margin + w/2
		}
		if lx+w/2 > c.Max.X-margin {
			lx = c.Max.X - margin - w/2
		}
		row := 0
		for row < len(rows) && lx-w/2 < rows[row]+vg.Points(4) {
			row++
		}
		if row == len(rows) {
			rows = append(rows, 0)
		}
		rows[row] = lx + w/2
		y := base + vg.Length(row)*lineH
		c.StrokeLine2(leader, x, bot-vg.Points(1), x, y+lineH)
		s := sty
		s.Color = col
		c.FillText(s, vg.Point{X: lx, Y: y}, n.text)
		wn.scene.take(vg.Rectangle{Min: vg.Point{X: lx - w/2, Y: y}, Max: vg.Point{X: lx + w/2, Y: y + lineH}})
	}
}

// short formats a length with three significant digits in µm or mm (as
// the waist notes show them).
func short(l units.Length) string {
	if math.Abs(float64(l)) >= 1 {
		return table.In(l, units.Millimeter, 0) + " mm"
	}
	return table.LengthSig(l, 3)
}
