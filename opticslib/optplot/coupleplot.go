package optplot

import (
	"errors"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrCoupling is wrapped by the errors of [CouplingMisalignment] for a
// coupling that [couple.Overlap] or [couple.Fibre.Couple] did not make:
// an aligned efficiency outside (0, 1], or misalignment coefficients that
// are not positive and finite.
var ErrCoupling = errors.New("optplot: coupling figure needs a coupling made by couple.Overlap or couple.Fibre.Couple")

// Tolerances sets the levels at which [CouplingMisalignment] marks the
// alignment tolerances, each a fraction of the aligned efficiency in
// (0, 1): couple.OneDecibel for the 1 dB tolerance (the default), 0.95
// for a 5 % drop. Give several to mark several.
func Tolerances(fractions ...float64) Option {
	return func(c *config) {
		if len(fractions) == 0 {
			c.fail("Tolerances", "fractions", 0, "need at least one")
			return
		}
		for i, f := range fractions {
			if !(f > 0 && f < 1) {
				c.fail("Tolerances", "fraction "+strconv.Itoa(i+1), f, "must lie strictly between 0 and 1 (of the aligned efficiency; couple.OneDecibel for 1 dB)")
				return
			}
		}
		c.tolerances = append([]float64(nil), fractions...)
	}
}

// levelName names a tolerance level: "1 dB" for couple.OneDecibel, "95 %"
// otherwise.
func levelName(f float64) string {
	if math.Abs(f-couple.OneDecibel) <= 1e-12 {
		return "1 dB"
	}
	return table.Sig(100*f, 4) + " %"
}

// checkCoupling returns a [*ParamError] wrapping [ErrCoupling] unless c
// looks like a coupling made by package couple.
func checkCoupling(fn string, c couple.Coupling) error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Func: fn, Param: param, Value: v, Reason: reason, Err: ErrCoupling}
	}
	if !(c.Aligned > 0 && c.Aligned <= 1+1e-12) {
		return bad("aligned efficiency", c.Aligned, "must lie in (0, 1]")
	}
	for _, ax := range []struct {
		name string
		a    couple.Axis
	}{{"X", c.X}, {"Y", c.Y}} {
		for _, v := range []struct {
			name, unit string
			v          float64
		}{{"Offset", "1/m²", ax.a.Offset}, {"Tilt", "1/rad²", ax.a.Tilt}} {
			if !(v.v > 0) || !finite(v.v) {
				return bad(ax.name+"."+v.name+" coefficient", strconv.FormatFloat(v.v, 'g', -1, 64)+" "+v.unit, "must be positive and finite")
			}
		}
		if !finite(ax.a.Cross) {
			return bad(ax.name+".Cross coefficient", ax.a.Cross, "must be finite (1/(m·rad))")
		}
	}
	return nil
}

// CouplingMisalignment returns the coupling efficiency of c against
// misalignment in two panels: against the lateral offset in x and in y
// (left) and against the tilt in x and in y (right), each error alone
// with the others removed, from the exact Gaussian form of [couple.Axis],
//
//	η(d) = η_aligned · exp(−Offset·d²),   η(θ) = η_aligned · exp(−Tilt·θ²)
//
// The tolerances of [couple.Coupling.OffsetTolerance] and
// [couple.Coupling.TiltTolerance] at the 1 dB level (or the levels of
// [Tolerances]) are marked on the curves and given in the keys; the
// misalignment c was computed for, when not zero, is marked as dots (each
// error alone) and its combined efficiency stated in the caption. The
// offsets are in nm, µm or mm and the tilts in µrad or mrad, chosen from
// the range shown (±3 times the larger 1 dB tolerance, wider for a lower
// level). The y envelope is dashed; x and y share one line when they
// agree. The caption notes when offset and tilt interact (the Cross
// coefficient: at a plane away from the waists a tilt partly undoes an
// offset). The options [Title], [Caption], [Size] and [Tolerances]
// apply.
//
// It returns a [*ParamError] wrapping [ErrCoupling] for a coupling not
// made by package couple (the zero Coupling among them), and one wrapping
// [ErrOption] for a bad option.
func CouplingMisalignment(c couple.Coupling, opts ...Option) (Figure, error) {
	const fn = "CouplingMisalignment"
	cfg := newConfig(opts)
	if cfg.err != nil {
		return Figure{}, cfg.err
	}
	if err := checkCoupling(fn, c); err != nil {
		return Figure{}, err
	}
	levels := cfg.tolerances
	if len(levels) == 0 {
		levels = []float64{couple.OneDecibel}
	}
	title := "Coupling efficiency against misalignment"
	if cfg.titleSet {
		title = cfg.title
	}
	type axis struct {
		kx, ky   float64 // Offset or Tilt coefficients of x and y
		given    [2]float64
		tol      func(f float64) (x, y float64)
		quantity string
		angle    bool
	}
	m := c.Misalignment
	axes := []axis{
		{kx: c.X.Offset, ky: c.Y.Offset, given: [2]float64{float64(m.DX), float64(m.DY)}, quantity: "lateral offset",
			tol: func(f float64) (float64, float64) {
				x, y, _ := c.OffsetTolerance(f)
				return float64(x), float64(y)
			}},
		{kx: c.X.Tilt, ky: c.Y.Tilt, given: [2]float64{float64(m.TiltX), float64(m.TiltY)}, quantity: "tilt", angle: true,
			tol: func(f float64) (float64, float64) {
				x, y, _ := c.TiltTolerance(f)
				return float64(x), float64(y)
			}},
	}
	peak := 100 * c.Aligned
	var plots []*plot.Plot
	var capParts []string
	givenAny := m != (couple.Misalignment{})
	for _, a := range axes {
		same := math.Abs(a.kx-a.ky) <= 1e-9*math.Max(a.kx, a.ky)
		// The range: three 1 dB tolerances, or 1.25 times the widest
		// tolerance of the levels asked for.
		x1, y1 := a.tol(couple.OneDecibel)
		span := 3 * math.Max(x1, y1)
		for _, f := range levels {
			tx, ty := a.tol(f)
			span = math.Max(span, 1.25*math.Max(tx, ty))
		}
		for _, g := range a.given {
			span = math.Max(span, 1.15*math.Abs(g))
		}
		scale, unit := lengthAxisUnit(span)
		if a.angle {
			scale, unit = angleAxisUnit(span)
		}
		sym := "d"
		if a.angle {
			sym = "θ"
		}
		p := newPlot("", a.quantity+" "+sym+" ("+unit+")", "coupling efficiency η (%)")
		sc := &scene{}
		key := &keyBox{scene: sc}
		xSty := draw.LineStyle{Color: envelopeColor, Width: vg.Points(1.4)}
		ySty := draw.LineStyle{Color: yColor, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(4), vg.Points(2)}}
		planes := []struct {
			name string
			k    float64
			sty  draw.LineStyle
			i    int
		}{{"x", a.kx, xSty, 0}, {"y", a.ky, ySty, 1}}
		if same {
			planes = planes[:1]
			planes[0].name = "x and y"
		}
		var tolParts []string
		for _, pl := range planes {
			xys := make(plotter.XYs, 0, 401)
			for i := range 401 {
				v := span * (float64(i)/200 - 1)
				xys = append(xys, plotter.XY{X: v / scale, Y: peak * math.Exp(-pl.k*v*v)})
			}
			if err := addLine(p, xys, pl.sty); err != nil {
				return Figure{}, err
			}
			key.avoid = append(key.avoid, thin(xys, 100))
			var tols, capTols []string
			var dots plotter.XYs
			drop := draw.LineStyle{Color: pl.sty.Color, Width: vg.Points(0.7), Dashes: []vg.Length{vg.Points(1), vg.Points(1.5)}}
			for _, f := range levels {
				tx, ty := a.tol(f)
				t := tx
				if pl.i == 1 {
					t = ty
				}
				v := "±" + table.Sig(t/scale, 3) + " " + unit
				tols = append(tols, v)
				capTols = append(capTols, v+" at "+levelName(f))
				dots = append(dots, plotter.XY{X: -t / scale, Y: peak * f}, plotter.XY{X: t / scale, Y: peak * f})
				for _, s := range []float64{-1, 1} {
					if err := addLine(p, plotter.XYs{{X: s * t / scale, Y: 0}, {X: s * t / scale, Y: peak * f}}, drop); err != nil {
						return Figure{}, err
					}
				}
			}
			if err := addDots(p, dots, pl.sty.Color, 2.2, false); err != nil {
				return Figure{}, err
			}
			key.entries = append(key.entries, keyEntry{text: pl.name + ": " + strings.Join(tols, ", "), line: pl.sty})
			tolParts = append(tolParts, pl.name+" "+strings.Join(capTols, ", "))
			// The given misalignment, this error alone.
			var given []float64
			if same {
				given = []float64{a.given[0], a.given[1]}
			} else {
				given = []float64{a.given[pl.i]}
			}
			var gd plotter.XYs
			for _, g := range given {
				if g != 0 {
					gd = append(gd, plotter.XY{X: g / scale, Y: peak * math.Exp(-pl.k*g*g)})
				}
			}
			if len(gd) > 0 {
				if err := addDots(p, gd, pl.sty.Color, 3.2, true); err != nil {
					return Figure{}, err
				}
			}
		}
		// The levels: a dotted line across and its name at the left.
		level := draw.LineStyle{Color: axisColor, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
		names := &pointMarks{scene: sc}
		for _, f := range levels {
			if err := addLine(p, plotter.XYs{{X: -span / scale, Y: peak * f}, {X: span / scale, Y: peak * f}}, level); err != nil {
				return Figure{}, err
			}
			names.marks = append(names.marks, pointMark{x: -span / scale, y: peak * f, text: levelName(f), color: axisColor, noDot: true, dx: 3, dy: 1.5, xalign: draw.XLeft, yalign: draw.YBottom})
		}
		p.Add(names)
		if givenAny {
			key.entries = append(key.entries, keyEntry{text: "given misalignment, alone", dot: labelColor, ring: true})
		}

		p.Add(key)
		p.X.Min, p.X.Max = -span/scale, span/scale
		p.Y.Min, p.Y.Max = 0, peak*1.32
		plots = append(plots, p)
		capParts = append(capParts, a.quantity+" "+strings.Join(tolParts, "; "))
	}

	host := newPlot(title, "", "")
	host.HideAxes()
	host.X.Min, host.X.Max, host.Y.Min, host.Y.Max = 0, 1, 0, 1
	host.Add(&panels{plots: plots})

	caption := title + ", each error alone: coupling efficiency η against the lateral offset (left) and the tilt (right) in x (tangential) and y (sagittal). Aligned η = " + table.Fixed(peak, 2) + " %"
	if c.Model != "" {
		caption += ", model: " + c.Model
	}
	caption += ". Tolerances, relative to the aligned η: " + strings.Join(capParts, "; ") + "."
	if givenAny {
		var given []string
		for _, g := range []struct {
			name string
			v    float64
			text string
		}{{"x offset", float64(m.DX), m.DX.String()}, {"y offset", float64(m.DY), m.DY.String()},
			{"x tilt", float64(m.TiltX), table.AngleSig(m.TiltX, 3)}, {"y tilt", float64(m.TiltY), table.AngleSig(m.TiltY, 3)}} {
			if g.v != 0 {
				given = append(given, g.name+" "+g.text)
			}
		}
		caption += " With the given misalignment (" + strings.Join(given, ", ") + ") together, η = " + table.Fixed(100*c.Efficiency, 2) + " %."
	}
	// Offset and tilt interact when the cross term is a noticeable part
	// of the exponent at the 1 dB tolerances: |Cross| d θ against
	// Offset d² = Tilt θ², that is |Cross|/(2√(Offset·Tilt)) (0 at a
	// common waist plane, 1 at most).
	var inter []string
	for _, ax := range []struct {
		name string
		a    couple.Axis
	}{{"x", c.X}, {"y", c.Y}} {
		if r := math.Abs(ax.a.Cross) / (2 * math.Sqrt(ax.a.Offset*ax.a.Tilt)); r > 0.05 {
			inter = append(inter, ax.name+" "+table.Fixed(r, 2))
		}
	}
	if len(inter) > 0 {
		caption += " Offset and tilt interact (cross-coupling |Cross|/(2√(Offset·Tilt)) " + strings.Join(inter, ", ") + ", at most 1): a tilt can partly undo an offset, so combined errors have other tolerances."
	}
	return cfg.figure(host, caption), nil
}

// lengthAxisUnit returns the scale (m per unit) and symbol for an axis of
// lengths spanning up to v metres: nm below 1 µm, µm below 1 mm, mm.
func lengthAxisUnit(v float64) (float64, string) {
	switch {
	case v < 1e-6:
		return 1e-9, "nm"
	case v < 1e-3:
		return 1e-6, "µm"
	}
	return 1e-3, "mm"
}

// angleAxisUnit returns the scale (rad per unit) and symbol for an axis
// of angles spanning up to v radians: µrad below 1 mrad, mrad below 1 rad.
func angleAxisUnit(v float64) (float64, string) {
	switch {
	case v < 1e-3:
		return float64(units.Microradian), "µrad"
	case v < 1:
		return float64(units.Milliradian), "mrad"
	}
	return 1, "rad"
}

// addDots adds a dot of the given radius (pt) at each point of xys,
// hollow when ring is set.
func addDots(p *plot.Plot, xys plotter.XYs, col color.Color, radius float64, ring bool) error {
	sc, err := plotter.NewScatter(xys)
	if err != nil {
		return err
	}
	var shape draw.GlyphDrawer = draw.CircleGlyph{}
	if ring {
		shape = draw.RingGlyph{}
	}
	sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(radius), Shape: shape}
	p.Add(sc)
	return nil
}

// panels draws plots side by side in the data area of a host plot whose
// axes are hidden: small multiples, each with its own axes and key.
type panels struct {
	plots []*plot.Plot
}

var _ plot.Plotter = (*panels)(nil)

// panelGap is the space between two panels.
const panelGap = 12 // pt

// Plot implements plot.Plotter.
func (ps *panels) Plot(c draw.Canvas, _ *plot.Plot) {
	n := len(ps.plots)
	if n == 0 {
		return
	}
	gap := vg.Points(panelGap)
	w := (c.Max.X - c.Min.X - vg.Length(n-1)*gap) / vg.Length(n)
	for i, p := range ps.plots {
		x0 := c.Min.X + vg.Length(i)*(w+gap)
		p.Draw(draw.Crop(c, x0-c.Min.X, x0+w-c.Max.X, 0, 0))
	}
}
