package optplot

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Quantity is a per-z quantity of a caustic that [AlongZ] plots against
// z. Use the package's values ([BeamRadius], [WavefrontCurvature],
// [Ellipticity], [GouyPhase]) or [IrradianceFor]; the zero Quantity is
// BeamRadius.
type Quantity struct {
	kind  quantityKind
	power float64 // W, for irradiance
}

type quantityKind int

const (
	qRadius quantityKind = iota
	qCurvature
	qEllipticity
	qIrradiance
	qGouy
)

// The quantities of [AlongZ].
var (
	// BeamRadius is the 1/e² beam radius w(z), in µm when the largest
	// radius shown is below 0.5 mm and in mm otherwise; x and y are
	// drawn separately when they differ.
	BeamRadius = Quantity{kind: qRadius}
	// WavefrontCurvature is the wavefront curvature 1/R(z) in 1/m (x and
	// y when they differ). The curvature is plotted, not the radius R:
	// R runs through ±∞ at every waist, where 1/R passes smoothly
	// through 0; R > 0 diverges. Read R = 1/value (for example 0.5 1/m
	// is R = 2 m).
	WavefrontCurvature = Quantity{kind: qCurvature}
	// Ellipticity is the ratio wy/wx of the beam radii (dimensionless; 1
	// for a round beam).
	Ellipticity = Quantity{kind: qEllipticity}
	// GouyPhase is the on-axis Gouy phase ψ(z) accumulated from the
	// first sample, in radians (x and y when they differ; see
	// [beam.Caustic] for the total of an astigmatic beam).
	GouyPhase = Quantity{kind: qGouy}
)

// IrradianceFor is the on-axis peak irradiance I₀ = 2P/(π wx wy) of a
// beam of power P = power watts ([beam.PeakIrradiance]), plotted in
// W/cm² with the SI prefix that suits the largest value shown (mW/cm² …
// GW/cm²). The figure carries the laser-safety caution: a short form in
// its key and [beam.SafetyNote] in full in its caption. power must be
// positive and finite; [AlongZ] returns the error otherwise.
func IrradianceFor(power float64) Quantity { return Quantity{kind: qIrradiance, power: power} }

// String returns the quantity's name, for example "beam radius".
func (q Quantity) String() string {
	switch q.kind {
	case qRadius:
		return "beam radius"
	case qCurvature:
		return "wavefront curvature"
	case qEllipticity:
		return "ellipticity"
	case qIrradiance:
		return "on-axis peak irradiance"
	case qGouy:
		return "Gouy phase"
	}
	return "Quantity(" + strconv.Itoa(int(q.kind)) + ")"
}

// safetyShort is the laser-safety caution drawn on irradiance figures;
// the caption carries [beam.SafetyNote] in full.
const safetyShort = "Laser safety: beam-optics estimates, not exposure limits or a safety clearance. " +
	"Follow your local laser-safety rules and your laser safety officer."

// irradianceUnits are the units of irradiance figures, in W/cm² per unit.
var irradianceUnits = []struct {
	name  string
	scale float64
}{{"µW/cm²", 1e-6}, {"mW/cm²", 1e-3}, {"W/cm²", 1}, {"kW/cm²", 1e3}, {"MW/cm²", 1e6}, {"GW/cm²", 1e9}}

// curve is one line of a figure: points in plot units, style, key text.
type curve struct {
	xys   plotter.XYs
	style draw.LineStyle
	label string
}

// AlongZ returns a figure of the quantity q of caustic c against z (mm):
// [BeamRadius], [WavefrontCurvature], [Ellipticity], [GouyPhase] or
// [IrradianceFor] a power. The x and y planes are drawn as separate lines
// when they differ (x solid in teal, y dashed in brick). The axis labels
// carry the units.
//
// The options [Title], [Caption], [Size], [ZRange], [Zoom], [Label] and
// [Also] (the same quantity of another caustic, in its own style with a
// key entry) apply; the caustic-drawing options (Band, ElementLabels,
// WaistNotes, Rays, MinTransmission) have no effect. Between samples the
// values come from the closed form of [Zoom].
//
// An irradiance figure shows a short laser-safety caution in its key
// and, when c was made by [beam.Sample], the exact highest value in the
// sampled range ([beam.Caustic.Irradiance]); its default caption ends
// with [beam.SafetyNote].
//
// It returns a [*ParamError] wrapping [ErrCaustic] for a bad caustic
// (as [Caustic] does, and when q needs the curvatures or Gouy phases and
// c lacks them) and one wrapping [ErrOption] for a bad option or a bad
// power.
func AlongZ(c beam.Caustic, q Quantity, opts ...Option) (Figure, error) {
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if q.kind == qIrradiance && (!(q.power > 0) || !finite(q.power)) {
		return Figure{}, &ParamError{Func: "IrradianceFor", Param: "power P", Value: strconv.FormatFloat(q.power, 'g', -1, 64) + " W", Reason: "must be positive and finite", Err: ErrOption}
	}
	all := []overlay{{label: cfg.label, c: c}}
	all = append(all, cfg.also...)
	for i, o := range all {
		fn, name := "AlongZ", "c"
		if i > 0 {
			fn, name = "Also", "caustic "+strconv.Itoa(i)+" "+strconv.Quote(o.label)
		}
		if err := checkCaustic(fn, name, o.c); err != nil {
			return Figure{}, err
		}
		if err := checkQuantity(fn, name, o.c, q); err != nil {
			return Figure{}, err
		}
	}
	lo, hi := cfg.zRange(c)
	envs := make([]envelope, len(all))
	for i, o := range all {
		envs[i] = sampleEnvelope(o.c, lo, hi, q.kind == qGouy)
		if len(envs[i].z) == 0 {
			return Figure{}, &ParamError{Func: "AlongZ", Param: "range shown", Value: strconv.FormatFloat(lo, 'g', 6, 64) + " … " + strconv.FormatFloat(hi, 'g', 6, 64) + " mm",
				Reason: "lies outside the caustic's samples, " + o.c.Z[0].String() + " … " + o.c.Z[len(o.c.Z)-1].String(), Err: ErrOption}
		}
	}

	// The unit of the y axis, from the largest value shown.
	scale, unit := 1.0, ""
	switch q.kind {
	case qRadius:
		big := 0.0
		for _, e := range envs {
			big = math.Max(big, e.maxIn(lo, hi))
		}
		unit = "mm"
		if big < 0.5 {
			scale, unit = 1e3, "µm"
		}
	case qIrradiance:
		big := 0.0
		for _, e := range envs {
			for i, z := range e.z {
				if z >= lo && z <= hi {
					big = math.Max(big, irradiance(q.power, e.wx[i], e.wy[i]))
				}
			}
		}
		scale, unit = 1, "W/cm²"
		for _, u := range irradianceUnits {
			if big >= u.scale {
				scale, unit = 1/u.scale, u.name
			}
		}
	case qCurvature, qEllipticity, qGouy:
	}

	var curves []curve
	for i, e := range envs {
		xSty := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
		ySty := draw.LineStyle{Color: yColor, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
		if i > 0 {
			xSty = overlayStyles[(i-1)%len(overlayStyles)]
			ySty = xSty
			ySty.Width = vg.Points(0.9)
			ySty.Dashes = []vg.Length{vg.Points(1.5), vg.Points(1.5)}
		}
		name := all[i].label
		if name == "" && len(all) > 1 {
			name = "beam"
		}
		vx, vy := quantityValues(e, q, scale)
		if vy == nil || !e.astigmatic() {
			curves = append(curves, curve{xys: e.xys(vx), style: xSty, label: name})
			continue
		}
		curves = append(curves, curve{xys: e.xys(vx), style: xSty, label: layJoin(name, "x (tangential)")},
			curve{xys: e.xys(vy), style: ySty, label: layJoin(name, "y (sagittal)")})
	}

	title, yLabel := q.String(), ""
	switch q.kind {
	case qRadius:
		title, yLabel = "Beam radius along z", "beam radius w ("+unit+")"
	case qCurvature:
		title, yLabel = "Wavefront curvature along z", "wavefront curvature 1/R (1/m)"
	case qEllipticity:
		title, yLabel = "Ellipticity along z", "ellipticity wy/wx"
	case qIrradiance:
		title, yLabel = "On-axis peak irradiance along z, P = "+table.Power(q.power), "peak irradiance I₀ ("+unit+")"
	case qGouy:
		title, yLabel = "Accumulated Gouy phase along z", "Gouy phase ψ (rad)"
	}
	if cfg.titleSet {
		title = cfg.title
	}
	p := newPlot(title, XLabel, yLabel)
	key := &keyBox{scene: &scene{}}
	if q.kind == qCurvature {
		// The zero line: every waist crosses it.
		if err := addLine(p, plotter.XYs{{X: lo, Y: 0}, {X: hi, Y: 0}}, zeroStyle); err != nil {
			return Figure{}, err
		}
	}
	if err := addCurves(p, key, curves); err != nil {
		return Figure{}, err
	}
	caption := title
	rangeHi := hi
	switch q.kind {
	case qIrradiance:
		if ir, err := c.Irradiance(q.power); err == nil {
			var hi string
			if z := ir.MaxZ.Millimeters(); z >= lo && z <= rangeHi {
				hi = "Highest " + strconv.FormatFloat(ir.Max*1e-4*scale, 'g', 3, 64) + " " + unit + " at z = " + table.In(ir.MaxZ, units.Millimeter, 1) + " mm"
			} else if zv, v, ok := curveMax(curves, lo, rangeHi); ok {
				// The path's maximum lies outside the range shown: give the
				// highest value in view (sampled), and where the maximum is.
				hi = "Highest in view " + strconv.FormatFloat(v, 'g', 3, 64) + " " + unit + " at z = " + strconv.FormatFloat(zv, 'f', 1, 64) +
					" mm (on the whole path " + strconv.FormatFloat(ir.Max*1e-4*scale, 'g', 3, 64) + " " + unit + " at z = " + table.In(ir.MaxZ, units.Millimeter, 1) + " mm)"
			}
			if hi != "" {
				key.notes = append(key.notes, hi+".")
				caption += ". " + hi
			}
		}
		key.notes = append(key.notes, safetyShort)
		key.noteColor = warnColor
		caption += ".\n\n" + beam.SafetyNote
		if cfg.captionSet {
			// A caption of the user's own still carries the caution.
			cfg.caption += "\n\n" + beam.SafetyNote
		}
	case qCurvature:
		key.notes = append(key.notes, "1/R is 0 at a waist; R = 1/value, R > 0 diverges.")
	case qRadius, qEllipticity, qGouy:
	}
	if !key.empty() {
		p.Add(key)
	}
	ylo, yhi := fitRange(curves, lo, hi, q.kind == qRadius || q.kind == qIrradiance, !key.empty())
	p.X.Min, p.X.Max = lo, hi
	p.Y.Min, p.Y.Max = ylo, yhi
	return cfg.figure(p, caption), nil
}

// checkQuantity returns an error if c lacks what q needs.
func checkQuantity(fn, name string, c beam.Caustic, q Quantity) error {
	n := len(c.Z)
	need := func(param string, got int) error {
		if got == n {
			return nil
		}
		return &ParamError{Func: fn, Param: name + "." + param + " samples", Value: got, Reason: "must equal the " + strconv.Itoa(n) + " samples of Z for the " + q.String() + " (use beam.Sample)", Err: ErrCaustic}
	}
	var lens []struct {
		param string
		got   int
	}
	switch q.kind {
	case qCurvature:
		lens = append(lens, struct {
			param string
			got   int
		}{"Curvature", len(c.Curvature)})
		if c.WY != nil {
			lens = append(lens, struct {
				param string
				got   int
			}{"CurvatureY", len(c.CurvatureY)})
		}
	case qGouy:
		// Finite wherever Sample made the caustic; unknown otherwise.
		if gx, _ := c.GouyPhase(); gx == nil {
			return &ParamError{Func: fn, Param: name + ".GouyPhase()", Value: "nil", Reason: "is known only for a caustic made by beam.Sample or beam.SampleRange", Err: ErrCaustic}
		}
	case qRadius, qEllipticity, qIrradiance:
	}
	for _, l := range lens {
		if err := need(l.param, l.got); err != nil {
			return err
		}
	}
	for i := range n {
		if q.kind == qCurvature && (!finite(c.Curvature[i]) || (c.WY != nil && !finite(c.CurvatureY[i]))) {
			return &ParamError{Func: fn, Param: name + ".Curvature[" + strconv.Itoa(i) + "]", Value: "non-finite", Reason: "must be finite (1/m)", Err: ErrCaustic}
		}
		if (q.kind == qEllipticity || q.kind == qIrradiance) && !(c.W[i] > 0 && wyAt(c, i) > 0) {
			return &ParamError{Func: fn, Param: name + ".W[" + strconv.Itoa(i) + "]", Value: c.W[i].String(), Reason: "beam radii must be positive for the " + q.String(), Err: ErrCaustic}
		}
	}
	return nil
}

// curveMax returns the largest y of the curves within [lo, hi] (plot
// units) and where it is.
func curveMax(curves []curve, lo, hi float64) (z, v float64, ok bool) {
	v = math.Inf(-1)
	for _, cv := range curves {
		for _, p := range cv.xys {
			if p.X >= lo && p.X <= hi && p.Y > v {
				z, v, ok = p.X, p.Y, true
			}
		}
	}
	return z, v, ok
}

// irradiance returns 2P/(π wx wy) in W/cm² for radii in mm.
func irradiance(power, wx, wy float64) float64 {
	return beam.PeakIrradiance(power, units.Length(wx*1e-3), units.Length(wy*1e-3)) * 1e-4
}

// quantityValues returns q along e in plot units (the radius and
// irradiance multiplied by scale); vy is nil when the quantity has one
// value per position (ellipticity, irradiance).
func quantityValues(e envelope, q Quantity, scale float64) (vx, vy []float64) {
	n := len(e.z)
	vx = make([]float64, n)
	switch q.kind {
	case qRadius, qCurvature, qGouy:
		vy = make([]float64, n)
	case qEllipticity, qIrradiance:
	}
	for i := range n {
		switch q.kind {
		case qRadius:
			vx[i], vy[i] = e.wx[i]*scale, e.wy[i]*scale
		case qCurvature:
			vx[i], vy[i] = e.cx[i], e.cy[i]
		case qGouy:
			vx[i], vy[i] = e.gx[i], e.gy[i]
		case qEllipticity:
			vx[i] = e.wy[i] / e.wx[i]
		case qIrradiance:
			vx[i] = irradiance(q.power, e.wx[i], e.wy[i]) * scale
		}
	}
	return vx, vy
}

// addCurves adds the curves to p, with key entries for the labelled ones
// (when there is more than one curve or any label), and asks the key to
// keep clear of them.
func addCurves(p *plot.Plot, key *keyBox, curves []curve) error {
	for _, cv := range curves {
		if err := addLine(p, cv.xys, cv.style); err != nil {
			return err
		}
		key.avoid = append(key.avoid, thin(cv.xys, 200))
		if cv.label != "" {
			key.entries = append(key.entries, keyEntry{text: cv.label, line: cv.style})
		}
	}
	return nil
}

// fitRange returns a y range covering the curves' points with x in [lo,
// hi]: from 0 when fromZero, with 6 % margins (22 % at the top for the
// key), and ±10 % (or ±1) around a constant.
func fitRange(curves []curve, lo, hi float64, fromZero, withKey bool) (ymin, ymax float64) {
	ymin, ymax = math.Inf(1), math.Inf(-1)
	for _, cv := range curves {
		for _, p := range cv.xys {
			if p.X >= lo && p.X <= hi && finite(p.Y) {
				ymin, ymax = math.Min(ymin, p.Y), math.Max(ymax, p.Y)
			}
		}
	}
	if ymin > ymax {
		return 0, 1
	}
	if fromZero && ymin >= 0 {
		ymin = 0
	}
	span := ymax - ymin
	if span <= 1e-12*math.Max(math.Abs(ymin), math.Abs(ymax)) {
		d := 0.1 * math.Abs(ymax)
		if d == 0 {
			d = 1
		}
		return ymin - d, ymax + d
	}
	top := 0.06
	if withKey {
		top = 0.22
	}
	if ymin != 0 || !fromZero {
		ymin -= 0.06 * span
	}
	return ymin, ymax + top*span
}
