package optplot

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// ErrAberration is wrapped by the errors of the real-ray figures
// ([RayAberration], [SphericalAberrationCurve], [FocalShiftCurve],
// [RealRayLayout]) for missing curves, slices of different lengths and
// values that are not finite.
var ErrAberration = errors.New("optplot: real-ray figure needs curves with matching lengths and finite values")

// Styles of the real-ray figures: the dash of the second curve of a pair
// (sagittal fans, rim rays) and the line widths.
var (
	pairDashes = []vg.Length{vg.Points(4), vg.Points(2)}
	curveWidth = vg.Points(1.3)
	rayWidth   = vg.Points(0.6)
)

// panelOffset is the pupil-axis shift of each half of [RayAberration].
const panelOffset = 1.15

// groupColor returns the colour style of curve group i: the fan colours
// of the package, cycled.
func groupColor(i int, dashed bool) draw.LineStyle {
	s := draw.LineStyle{Color: layFanColors[i%len(layFanColors)], Width: curveWidth}
	if dashed {
		s.Dashes = pairDashes
	}
	return s
}

// checkCurve returns a [*ParamError] wrapping [ErrAberration] unless x and
// y have one length of at least 2 and finite values.
func checkCurve(fn, name, xName, yName string, x, y []float64) error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: name + " " + param, Value: v, Reason: reason, Err: ErrAberration}
	}
	if len(x) < 2 {
		return bad(xName+" points", len(x), "need at least 2")
	}
	if len(y) != len(x) {
		return bad(yName+" points", len(y), "must equal the "+strconv.Itoa(len(x))+" points of "+xName)
	}
	for i := range x {
		if !finite(x[i]) {
			return bad(xName+"["+strconv.Itoa(i)+"]", x[i], "must be finite")
		}
		if !finite(y[i]) {
			return bad(yName+"["+strconv.Itoa(i)+"]", y[i], "must be finite")
		}
	}
	return nil
}

// name returns the k-th name of [Names], or def.
func (cfg config) name(k int, def string) string {
	if k < len(cfg.names) && cfg.names[k] != "" {
		return cfg.names[k]
	}
	return def
}

// planeText is "785 nm at z = 31.2 mm", the key text of a curve group.
func planeText(wavelength, plane units.Length) string {
	return table.Sig(wavelength.Nanometers(), 5) + " nm at z = " + table.Sig(plane.Millimeters(), 6) + " mm"
}

// panelTicks labels each half of the [RayAberration] pupil axis from −1
// to 1.
type panelTicks struct{}

func (panelTicks) Ticks(lo, hi float64) []plot.Tick {
	var ts []plot.Tick
	for _, off := range []float64{-panelOffset, panelOffset} {
		for k := -4; k <= 4; k++ {
			p := float64(k) / 4
			t := plot.Tick{Value: off + p}
			if k%2 == 0 {
				t.Label = strconv.FormatFloat(p, 'g', -1, 64)
			}
			ts = append(ts, t)
		}
	}
	return ts
}

// panelNames writes each half's name under the top edge of the data
// area, and records where for the key.
type panelNames struct {
	left, right string
	scene       *scene
}

func (n panelNames) Plot(c draw.Canvas, plt *plot.Plot) {
	trX, _ := plt.Transforms(&c)
	sty := withFont(plt.X.Tick.Label, plt, 8)
	sty.Color = labelColor
	sty.XAlign, sty.YAlign = text.XCenter, text.YTop
	y := c.Max.Y - vg.Points(3)
	h := sty.Height("Xy")
	for _, t := range []struct {
		x vg.Length
		s string
	}{{trX(-panelOffset), n.left}, {trX(panelOffset), n.right}} {
		c.FillText(sty, vg.Point{X: t.x, Y: y}, t.s)
		w := sty.Width(t.s)
		n.scene.take(vg.Rectangle{Min: vg.Point{X: t.x - w/2, Y: y - h}, Max: vg.Point{X: t.x + w/2, Y: y}})
	}
}

// RayAberration returns the transverse ray-aberration curves of the fans
// (see [trace.System.RayFans]) on one plot in two halves that share the
// vertical scale in µm: the tangential fans on the left (the error e_y
// against the pupil coordinate p_y) and the sagittal ones on the right
// (e_x against p_x), each half with its own pupil axis from −1 to 1 and
// zero lines through its centre. Each wavelength and image plane has its
// own colour, the tangential curve solid and the sagittal one dashed;
// the key names each by wavelength and plane and gives its largest
// error. The options [Title], [Caption], [Size] and [Names] (one name per
// tangential–sagittal pair) apply.
//
// It returns a [*ParamError] wrapping [ErrAberration] when there is no
// fan, a fan has fewer than two rays, Pupil and Error differ in length, a
// value is not finite or a pupil coordinate lies outside [−1, 1].
func RayAberration(fans []trace.Fan, opts ...Option) (Figure, error) {
	const fn = "RayAberration"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if len(fans) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "fans", Value: 0, Reason: "need at least one", Err: ErrAberration}
	}
	// The k-th tangential and the k-th sagittal fan are a pair (one
	// wavelength, field and plane, as RayFans returns them) and share a
	// colour.
	var nTan, nSag int
	title := "Transverse ray aberration"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, "normalised pupil coordinate", "ray error (µm)")
	p.X.Tick.Marker = panelTicks{}
	sc := &scene{}
	key := &keyBox{scene: sc}
	largest := 0.0
	var curves []curve
	caption := title
	for i, f := range fans {
		name := "fan " + strconv.Itoa(i+1)
		if err := checkCurve(fn, name, "Pupil", "Error", f.Pupil, f.Error); err != nil {
			return Figure{}, err
		}
		off := panelOffset
		if f.Tangential {
			off = -panelOffset
		}
		xys := make(plotter.XYs, len(f.Pupil))
		worst := 0.0
		for j, pp := range f.Pupil {
			if math.Abs(pp) > 1+1e-9 {
				return Figure{}, &ParamError{Func: fn, Param: name + " Pupil[" + strconv.Itoa(j) + "]", Value: pp, Reason: "must lie in [−1, 1]", Err: ErrAberration}
			}
			e := f.Error[j] / 1e-6
			xys[j] = plotter.XY{X: off + pp, Y: e}
			worst = math.Max(worst, math.Abs(e))
		}
		largest = math.Max(largest, worst)
		kind, pair := "sagittal", nSag
		if f.Tangential {
			kind, pair = "tangential", nTan
			nTan++
		} else {
			nSag++
		}
		who, at := cfg.name(pair, "pair "+strconv.Itoa(pair+1)), planeText(f.Wavelength, f.Plane)
		where := who + ": " + at
		label := ""
		if f.Tangential || pair >= nTan {
			label = where // one key entry per pair
		}
		curves = append(curves, curve{xys: xys, style: groupColor(pair, !f.Tangential), label: label})
		caption += "; " + who + ", " + kind + " (" + at + "): largest " + table.Sig(worst, 3) + " µm"
	}
	half := 1.25 * largest
	if !(half > 0) {
		half = 1
	}
	for _, off := range []float64{-panelOffset, panelOffset} {
		for _, seg := range []plotter.XYs{{{X: off - 1, Y: 0}, {X: off + 1, Y: 0}}, {{X: off, Y: -half}, {X: off, Y: half}}} {
			if err := addLine(p, seg, zeroStyle); err != nil {
				return Figure{}, err
			}
		}
	}
	if err := addCurves(p, key, curves); err != nil {
		return Figure{}, err
	}
	p.Add(panelNames{left: "tangential: e_y against p_y", right: "sagittal: e_x against p_x", scene: sc}, key)
	p.X.Min, p.X.Max = -panelOffset-1.05, panelOffset+1.05
	p.Y.Min, p.Y.Max = -half, 1.5*half
	key.notes = append(key.notes, "solid: tangential; dashed: sagittal")
	caption += " (largest ray error " + table.Sig(largest, 3) + " µm)."
	return cfg.figure(p, caption), nil
}

// SphericalAberrationCurve returns the longitudinal spherical aberration
// of one or more axial beams (see [trace.System.SphericalAberration]):
// each ray's height in the entrance pupil (mm, vertical) against where it
// crosses the axis relative to the paraxial focus (µm, horizontal), one
// colour per curve, with the paraxial focus as the vertical zero line.
// The key names each curve by wavelength and paraxial focus and gives the
// rim ray's shift. The options [Title], [Caption], [Size] and [Names]
// apply.
//
// It returns a [*ParamError] wrapping [ErrAberration] when there is no
// curve, a curve has fewer than two rays, Height and Shift differ in
// length or a value is not finite.
func SphericalAberrationCurve(las []trace.LongitudinalAberration, opts ...Option) (Figure, error) {
	const fn = "SphericalAberrationCurve"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if len(las) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "curves", Value: 0, Reason: "need at least one", Err: ErrAberration}
	}
	title := "Longitudinal spherical aberration"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, "axis crossing − paraxial focus (µm)", "ray height in the pupil (mm)")
	key := &keyBox{scene: &scene{}}
	var curves []curve
	top, left, right := 0.0, 0.0, 0.0
	caption := title + ":"
	for i, la := range las {
		if err := checkCurve(fn, "curve "+strconv.Itoa(i+1), "Height", "Shift", la.Height, la.Shift); err != nil {
			return Figure{}, err
		}
		xys := make(plotter.XYs, len(la.Height))
		rim, rimShift := 0.0, 0.0
		for j := range la.Height {
			xys[j] = plotter.XY{X: la.Shift[j] / 1e-6, Y: la.Height[j] / 1e-3}
			top = math.Max(top, math.Abs(xys[j].Y))
			left, right = math.Min(left, xys[j].X), math.Max(right, xys[j].X)
			if math.Abs(la.Height[j]) >= rim {
				rim, rimShift = math.Abs(la.Height[j]), la.Shift[j]/1e-6
			}
		}
		text := table.Sig(la.Wavelength.Nanometers(), 5) + " nm, paraxial focus z = " + table.Sig(la.Paraxial.Millimeters(), 6) +
			" mm: rim ray (h = " + table.Sig(rim/1e-3, 3) + " mm) " + table.Sig(rimShift, 3) + " µm"
		if who := cfg.name(i, ""); who != "" {
			text = who + ", " + text
		}
		curves = append(curves, curve{xys: xys, style: groupColor(i, false), label: text})
		caption += " " + text + ";"
	}
	if !(top > 0) {
		top = 1
	}
	// Both sides of the paraxial focus when the curves cross it, with a
	// fifth of the span kept on the side they do not reach.
	wide := right - left
	if !(wide > 0) {
		wide = 1
	}
	left, right = math.Min(left, -0.2*wide), math.Max(right, 0.2*wide)
	if err := addLine(p, plotter.XYs{{X: 0, Y: 0}, {X: 0, Y: 1.35 * top}}, zeroStyle); err != nil {
		return Figure{}, err
	}
	if err := addCurves(p, key, curves); err != nil {
		return Figure{}, err
	}
	p.Add(key)
	p.X.Min, p.X.Max = left-0.05*wide, right+0.05*wide
	p.Y.Min, p.Y.Max = 0, 1.35*top
	return cfg.figure(p, caption[:len(caption)-1]+"."), nil
}

// FocalShiftCurve returns the chromatic focal shift of one or more
// systems (see [trace.System.ChromaticFocalShift]): the paraxial focus
// (solid) and the rim ray's axis crossing (dashed, the same colour; left
// out where the rim ray was lost) relative to the paraxial focus at the
// reference wavelength, in µm against vacuum wavelength in nm, with the
// zero line and a dot at the reference. The options [Title], [Caption],
// [Size] and [Names] apply.
//
// It returns a [*ParamError] wrapping [ErrAberration] when there is no
// curve, a curve has fewer than two wavelengths, Wavelengths, Shift,
// Marginal and MarginalLost differ in length or a value is not finite.
func FocalShiftCurve(fss []trace.FocalShift, opts ...Option) (Figure, error) {
	const fn = "FocalShiftCurve"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if len(fss) == 0 {
		return Figure{}, &ParamError{Func: fn, Param: "curves", Value: 0, Reason: "need at least one", Err: ErrAberration}
	}
	title := "Chromatic focal shift"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, "vacuum wavelength (nm)", "focus − reference focus (µm)")
	key := &keyBox{scene: &scene{}}
	var curves []curve
	lo, hi := math.Inf(1), math.Inf(-1)
	caption := title + ":"
	for i, fs := range fss {
		name := "curve " + strconv.Itoa(i+1)
		nm := make([]float64, len(fs.Wavelengths))
		for j, w := range fs.Wavelengths {
			nm[j] = w.Nanometers()
		}
		if err := checkCurve(fn, name, "Wavelengths", "Shift", nm, fs.Shift); err != nil {
			return Figure{}, err
		}
		if len(fs.Marginal) != len(nm) || len(fs.MarginalLost) != len(nm) {
			return Figure{}, &ParamError{Func: fn, Param: name + " Marginal points", Value: len(fs.Marginal), Reason: "Marginal and MarginalLost must have the " + strconv.Itoa(len(nm)) + " points of Wavelengths", Err: ErrAberration}
		}
		ref := fs.Reference.Nanometers()
		if !finite(ref) {
			return Figure{}, &ParamError{Func: fn, Param: name + " Reference", Value: fs.Reference, Reason: "must be finite", Err: ErrAberration}
		}
		var par, rim plotter.XYs
		for j := range nm {
			par = append(par, plotter.XY{X: nm[j], Y: fs.Shift[j] / 1e-6})
			if !fs.MarginalLost[j] {
				if !finite(fs.Marginal[j]) {
					return Figure{}, &ParamError{Func: fn, Param: name + " Marginal[" + strconv.Itoa(j) + "]", Value: fs.Marginal[j], Reason: "must be finite", Err: ErrAberration}
				}
				rim = append(rim, plotter.XY{X: nm[j], Y: fs.Marginal[j] / 1e-6})
			}
			lo, hi = math.Min(lo, nm[j]), math.Max(hi, nm[j])
		}
		refText := "reference " + table.Sig(ref, 5) + " nm"
		who := cfg.name(i, "")
		if who != "" {
			who += ": "
		}
		curves = append(curves, curve{xys: par, style: groupColor(i, false), label: who + "paraxial focus (" + refText + ")"})
		if len(rim) >= 2 {
			curves = append(curves, curve{xys: rim, style: groupColor(i, true),
				label: who + "rim ray, h = " + table.Sig(fs.PupilRadius.Millimeters(), 3) + " mm"})
		}
		span := 0.0
		for _, v := range par {
			span = math.Max(span, math.Abs(v.Y))
		}
		caption += " " + who + refText + ", paraxial focus within ±" + table.Sig(span, 3) + " µm from " + table.Sig(lo, 5) + " to " + table.Sig(hi, 5) + " nm;"
		dot, err := plotter.NewScatter(plotter.XYs{{X: ref, Y: 0}})
		if err != nil {
			return Figure{}, err
		}
		dot.GlyphStyle = draw.GlyphStyle{Color: layFanColors[i%len(layFanColors)], Radius: vg.Points(2.4), Shape: draw.RingGlyph{}}
		p.Add(dot)
		lo, hi = math.Min(lo, ref), math.Max(hi, ref)
	}
	if err := addLine(p, plotter.XYs{{X: lo, Y: 0}, {X: hi, Y: 0}}, zeroStyle); err != nil {
		return Figure{}, err
	}
	if err := addCurves(p, key, curves); err != nil {
		return Figure{}, err
	}
	p.Add(key)
	ymin, ymax := fitRange(curves, lo, hi, false, true)
	p.Y.Min, p.Y.Max = math.Min(ymin, 0), math.Max(ymax, 0)
	p.X.Min, p.X.Max = lo, hi
	return cfg.figure(p, caption[:len(caption)-1]+"."), nil
}

// RayPaths is one group of traced rays for [RealRayLayout]: each path as
// [trace.System.Path] returns it (points in the fixed frame, metres).
type RayPaths struct {
	// Label names the group in the key (a field angle, a wavelength);
	// empty: no key entry.
	Label string
	// Paths are the rays, each at least two points.
	Paths [][]trace.Ray
}

// RealRayLayout returns a side view of a real-ray system with rays
// traced through it: z (mm) horizontal, y (mm) vertical. Each refracting
// surface is drawn as its true profile z_v + sag(y) (see
// [trace.Surface.Sag]) over its clear radius (or, without one, over the
// rays that reach it), the glass between two surfaces is shaded where the
// medium between them has an index other than 1 at the vacuum wavelength
// given, mirrors are drawn thick with short hatching on their back,
// stops as bars from their opening outwards, an ideal lens as a line
// with end ticks, and the image plane as a thin line. Each group of paths
// has its own colour and, with a label, a key entry. The options [Title],
// [Caption], [Size] and [Names] apply.
//
// It returns a [*ParamError] wrapping [ErrAberration] for a system not
// built, a wavelength at which a medium has no index, a path with fewer
// than two points or a point that is not finite.
func RealRayLayout(sys trace.System, vacuum units.Length, rays []RayPaths, opts ...Option) (Figure, error) {
	const fn = "RealRayLayout"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := sys.Validate(); err != nil {
		return Figure{}, &ParamError{Func: fn, Param: "system", Reason: "not built", Err: errors.Join(ErrAberration, err)}
	}
	idx, err := sys.Indices(vacuum)
	if err != nil {
		return Figure{}, &ParamError{Func: fn, Param: "vacuum wavelength", Value: vacuum, Reason: "a medium has no index there", Err: errors.Join(ErrAberration, err)}
	}
	n := sys.Len()
	// Half-heights: the clear radius, else the highest ray on the surface.
	reach := make([]float64, n+1)
	total := 0
	zmin, zmax := float64(sys.Vertex(0)), float64(sys.Vertex(n))
	var groups []curve
	for g, rp := range rays {
		var pts []plotter.XYs
		for k, path := range rp.Paths {
			if len(path) < 2 {
				return Figure{}, &ParamError{Func: fn, Param: "group " + strconv.Itoa(g+1) + " path " + strconv.Itoa(k+1) + " points", Value: len(path), Reason: "need at least 2", Err: ErrAberration}
			}
			xys := make(plotter.XYs, len(path))
			for j, r := range path {
				z, y := r.Position.Z, r.Position.Y
				if !finite(z) || !finite(y) {
					return Figure{}, &ParamError{Func: fn, Param: "group " + strconv.Itoa(g+1) + " path " + strconv.Itoa(k+1) + " point " + strconv.Itoa(j), Value: r.Position.Z, Reason: "must be finite", Err: ErrAberration}
				}
				xys[j] = plotter.XY{X: z / 1e-3, Y: y / 1e-3}
				zmin, zmax = math.Min(zmin, z), math.Max(zmax, z)
				if s := j - 1; s >= 0 && s <= n {
					reach[s] = math.Max(reach[s], math.Abs(y))
				}
			}
			pts = append(pts, xys)
			total++
		}
		groupName := rp.Label
		if groupName == "" {
			groupName = cfg.name(g, "")
		}
		for k, xys := range pts {
			label := ""
			if k == 0 {
				label = groupName
			}
			groups = append(groups, curve{xys: xys, style: draw.LineStyle{Color: layFanColors[g%len(layFanColors)], Width: rayWidth}, label: label})
		}
	}
	tallest := 0.0
	half := make([]float64, n+1)
	for i := range n {
		s := sys.Surface(i)
		half[i] = float64(s.ClearRadius)
		if half[i] == 0 {
			half[i] = 1.05 * reach[i]
		}
		tallest = math.Max(tallest, half[i])
	}
	if !(tallest > 0) {
		tallest = math.Max(reach[n], 1e-3)
	}
	for i := range n {
		if half[i] == 0 {
			half[i] = tallest
		}
	}
	half[n] = math.Max(1.2*reach[n], 0.15*tallest)
	title := "Real rays"
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, LayoutXLabel, LayoutYLabel)
	// profile returns surface i's profile from −h to h in plot units (mm),
	// h cut back to the conic's rim.
	profile := func(i int, h float64, up bool) plotter.XYs {
		s := sys.Surface(i)
		if _, ok := s.Sag(units.Length(h)); !ok && s.Curvature() != 0 {
			h = 0.999 / math.Abs(s.Curvature()) / math.Sqrt(math.Max(1+s.Conic, 1e-12))
		}
		const k = 32
		xys := make(plotter.XYs, 0, k+1)
		for j := range k + 1 {
			y := -h + 2*h*float64(j)/k
			if !up {
				y = -y
			}
			sag, _ := s.Sag(units.Length(y))
			xys = append(xys, plotter.XY{X: float64(sys.Vertex(i)+sag) / 1e-3, Y: y / 1e-3})
		}
		return xys
	}
	if err := addLine(p, plotter.XYs{{X: zmin / 1e-3, Y: 0}, {X: zmax / 1e-3, Y: 0}}, zeroStyle); err != nil {
		return Figure{}, err
	}
	// Glass between consecutive surfaces with an index other than 1.
	for i := 0; i+1 < n; i++ {
		if math.Abs(idx[i+1]-1) < 1e-3 {
			continue
		}
		ring := append(profile(i, half[i], true), profile(i+1, half[i+1], false)...)
		poly, err := plotter.NewPolygon(ring)
		if err != nil {
			return Figure{}, err
		}
		poly.Color = layGlassFill
		poly.LineStyle = draw.LineStyle{}
		p.Add(poly)
	}
	edge := draw.LineStyle{Color: layGlassEdge, Width: vg.Points(0.9)}
	span := (zmax - zmin) / 1e-3
	for i := range n {
		s := sys.Surface(i)
		z, h := float64(sys.Vertex(i))/1e-3, half[i]/1e-3
		switch s.Kind {
		case trace.Refract:
			if err := addLine(p, profile(i, half[i], true), edge); err != nil {
				return Figure{}, err
			}
		case trace.Reflect:
			prof := profile(i, half[i], true)
			if err := addLine(p, prof, draw.LineStyle{Color: layMirrorColor, Width: vg.Points(2)}); err != nil {
				return Figure{}, err
			}
			// The back is the side the light arrives from the other way.
			back := 1.0
			if i > 0 && sys.Vertex(i) < sys.Vertex(i-1) {
				back = -1
			}
			d := 0.015 * span
			for j := 0; j < len(prof); j += 4 {
				pt := prof[j]
				if err := addLine(p, plotter.XYs{pt, {X: pt.X + back*d, Y: pt.Y + 0.6*d}}, draw.LineStyle{Color: layMirrorColor, Width: vg.Points(0.6)}); err != nil {
					return Figure{}, err
				}
			}
		case trace.Stop:
			bar := draw.LineStyle{Color: layStopColor, Width: vg.Points(2.2)}
			for _, sgn := range []float64{1, -1} {
				if err := addLine(p, plotter.XYs{{X: z, Y: sgn * h}, {X: z, Y: sgn * 1.3 * h}}, bar); err != nil {
					return Figure{}, err
				}
			}
		case trace.Ideal:
			d := 0.01 * span
			for _, seg := range []plotter.XYs{{{X: z, Y: -h}, {X: z, Y: h}}, {{X: z - d, Y: h}, {X: z + d, Y: h}}, {{X: z - d, Y: -h}, {X: z + d, Y: -h}}} {
				if err := addLine(p, seg, draw.LineStyle{Color: layGlassEdge, Width: vg.Points(1.2)}); err != nil {
					return Figure{}, err
				}
			}
		}
	}
	zi, hi := float64(sys.Vertex(n))/1e-3, half[n]/1e-3
	if err := addLine(p, plotter.XYs{{X: zi, Y: -hi}, {X: zi, Y: hi}}, draw.LineStyle{Color: layScreenColor, Width: vg.Points(0.8)}); err != nil {
		return Figure{}, err
	}
	key := &keyBox{scene: &scene{}}
	if err := addCurves(p, key, groups); err != nil {
		return Figure{}, err
	}
	p.Add(key)
	ext := 1.45 * tallest / 1e-3
	p.Y.Min, p.Y.Max = -ext, ext
	pad := 0.03 * span
	p.X.Min, p.X.Max = zmin/1e-3-pad, zmax/1e-3+pad
	caption := title + ": " + strconv.Itoa(n) + " surfaces from z = " + table.Sig(float64(sys.Vertex(0))/1e-3, 6) + " mm, image plane at z = " +
		table.Sig(zi, 6) + " mm, " + strconv.Itoa(total) + " rays"
	for _, rp := range rays {
		if rp.Label != "" {
			caption += "; " + rp.Label + ": " + strconv.Itoa(len(rp.Paths))
		}
	}
	return cfg.figure(p, caption+"."), nil
}
