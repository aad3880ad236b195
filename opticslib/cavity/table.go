package cavity

import (
	"cmp"
	"errors"
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// frequency formats a frequency in Hz with n significant digits in Hz,
// kHz, MHz or GHz, whichever keeps the number at least 1, for example
// "1.498962 GHz" or "477.4 kHz".
func frequency(hz float64, n int) string {
	switch a := math.Abs(hz); {
	case a >= 1e9:
		return table.Sig(hz/1e9, n) + " GHz"
	case a >= 1e6:
		return table.Sig(hz/1e6, n) + " MHz"
	case a >= 1e3:
		return table.Sig(hz/1e3, n) + " kHz"
	}
	return table.Sig(hz, n) + " Hz"
}

// frequencyUnit returns the scale and symbol for a column of frequencies
// up to max Hz.
func frequencyUnit(max float64) (float64, string) {
	switch {
	case max >= 1e10:
		return 1e9, "GHz"
	case max >= 1e7:
		return 1e6, "MHz"
	case max >= 1e4:
		return 1e3, "kHz"
	}
	return 1, "Hz"
}

// matrixText formats a round-trip matrix for messages and tables.
func matrixText(m paraxial.Matrix) string {
	g := func(v float64) string {
		if v == 0 {
			v = 0
		}
		return strconv.FormatFloat(v, 'g', 6, 64)
	}
	return "[[" + g(m.A) + ", " + g(m.B) + " m], [" + g(m.C) + " 1/m, " + g(m.D) + "]]"
}

func planeHeader() []string { return []string{"quantity", "x (tangential)", "y (sagittal)"} }

// both returns a row with the same value in both planes.
func both(name, v string) []string { return []string{name, v, v} }

func percent(r float64) string {
	return strconv.FormatFloat(100*r, 'g', 8, 64) + " %"
}

func angleCell(a units.Angle) string {
	return table.Sig(a.Radians(), 6) + " rad (" + table.Sig(a.Degrees(), 6) + "°)"
}

// Table returns the stability of both planes: the round-trip matrix at
// z = 0, the half-trace, the g-parameters of a linear cavity, the class
// and the boundary case.
func (s Stability) Table() table.Table {
	t := table.Table{Caption: "Stability", Header: planeHeader()}
	row := func(name string, f func(PlaneStability) string) {
		t.Rows = append(t.Rows, []string{name, f(s.X), f(s.Y)})
	}
	row("round-trip A", func(p PlaneStability) string { return table.Sig(p.RoundTrip.A, 6) })
	row("round-trip B (mm)", func(p PlaneStability) string { return table.Sig(p.RoundTrip.B/1e-3, 6) })
	row("round-trip C (1/m)", func(p PlaneStability) string { return table.Sig(p.RoundTrip.C, 6) })
	row("round-trip D", func(p PlaneStability) string { return table.Sig(p.RoundTrip.D, 6) })
	row("(A + D)/2", func(p PlaneStability) string { return table.Sig(p.HalfTrace, 8) })
	if s.X.HasG {
		row("g1", func(p PlaneStability) string { return table.Sig(p.G1, 8) })
		row("g2", func(p PlaneStability) string { return table.Sig(p.G2, 8) })
		row("g1·g2", func(p PlaneStability) string { return table.Sig(p.G1*p.G2, 8) })
	}
	row("stability", func(p PlaneStability) string { return classText(p) })
	return t
}

func classText(p PlaneStability) string {
	if p.Note != "" {
		return p.Class.String() + ": " + p.Note
	}
	return p.Class.String()
}

// String returns [Stability.Table] as text.
func (s Stability) String() string { return s.Table().Text() }

// Table returns the eigenmode at its plane with one column per plane
// (see [beam.Astigmatic.Table]), with the position and the half-trace.
func (m Mode) Table() table.Table {
	b := m.Beam.Table()
	t := table.Table{Caption: "Eigenmode at z = " + table.Quantity(m.Z) + " of the round trip", Header: planeHeader()}
	t.Rows = append(t.Rows, []string{"(A + D)/2 of the round trip", table.Sig((m.RoundTripX.A+m.RoundTripX.D)/2, 8), table.Sig((m.RoundTripY.A+m.RoundTripY.D)/2, 8)})
	t.Rows = append(t.Rows, b.Rows...)
	if m.Chosen {
		t.Rows = append(t.Rows, both("degenerate", "round trip −I: symmetric confocal choice (waist at the centre)"))
	}
	return t
}

// String returns [Mode.Table] as text.
func (m Mode) String() string { return m.Table().Text() }

// Table returns the resonance data as a two-column table.
func (a Airy) Table() table.Table {
	t := table.Table{Caption: "Resonance (Airy function)", Header: []string{"quantity", "value"}}
	add := func(k, v string) { t.Rows = append(t.Rows, []string{k, v}) }
	add("FSR", frequency(a.FSR, 7))
	add("round-trip power factor ρ²", table.Sig(a.RoundTripPower, 8))
	add("round-trip amplitude factor ρ", table.Sig(a.RoundTripAmplitude, 8))
	add("coefficient of finesse F", table.Sig(a.CoefficientOfFinesse, 6))
	if a.Finesse > 0 {
		add("finesse (exact Airy FWHM)", table.Sig(a.Finesse, 7))
	} else {
		add("finesse (exact Airy FWHM)", "none: ρ < 3 − 2√2")
	}
	add("finesse ≈ π√ρ/(1 − ρ)", table.Sig(a.FinesseApprox, 7))
	if a.Linewidth > 0 {
		add("linewidth (FWHM)", frequency(a.Linewidth, 5))
	}
	add("photon lifetime τ (ns)", table.Sig(a.PhotonLifetime/1e-9, 5))
	add("off-resonance contrast I_min/I_max", table.Sig(a.Contrast, 5))
	return t
}

// String returns [Airy.Table] as text.
func (a Airy) String() string { return a.Table().Text() }

// Table returns the round-trip Gouy phase, the transverse-mode spacing
// and any degeneracy per plane.
func (s Spacing) Table() table.Table {
	t := table.Table{Caption: "Transverse-mode spacing", Header: planeHeader()}
	row := func(name string, f func(Gouy) string) {
		t.Rows = append(t.Rows, []string{name, f(s.X), f(s.Y)})
	}
	t.Rows = append(t.Rows, both("FSR", frequency(s.FSR, 7)))
	row("round-trip Gouy phase ψ", func(g Gouy) string { return angleCell(g.Phase) })
	row("ψ/2π (fraction of FSR)", func(g Gouy) string { return table.Sig(float64(g.Phase)/(2*math.Pi), 7) })
	row("transverse-mode spacing", func(g Gouy) string { return frequency(g.Spacing, 7) })
	row("degeneracy", func(g Gouy) string { return degeneracyText(g.Degeneracy) })
	if s.Inversion {
		t.Rows = append(t.Rows, []string{"image inversion", "odd number of reflections: odd m shifted by FSR/2", ""})
	}
	return t
}

func degeneracyText(d Degeneracy) string {
	if d.Q == 0 {
		return "none up to order " + strconv.Itoa(MaxReentrantOrder)
	}
	if d.Exact {
		return d.Name + ": order " + strconv.Itoa(d.Q) + " on TEM₀₀"
	}
	return d.Name + ": order " + strconv.Itoa(d.Q) + " at " + table.Sig(d.Detuning, 3) + " FSR from TEM₀₀"
}

// String returns [Spacing.Table] as text.
func (s Spacing) String() string { return s.Table().Text() }

// modeName returns "TEM12", or "TEM10,3" when an index has two digits.
func modeName(l Line) string {
	if l.M < 10 && l.N < 10 {
		return "TEM" + strconv.Itoa(l.M) + strconv.Itoa(l.N)
	}
	return "TEM" + strconv.Itoa(l.M) + "," + strconv.Itoa(l.N)
}

// Table returns the spectrum, one row per mode in order of frequency
// within the FSR: the mode, its order, its offset from TEM₀₀ and its
// place within the FSR (in a unit that suits the FSR), the fraction of
// the FSR and the modes it overlaps.
func (s Spectrum) Table() table.Table {
	scale, unit := frequencyUnit(s.FSR)
	caption := "Transverse modes within one FSR (" + frequency(s.FSR, 7) + "), m + n ≤ " + strconv.Itoa(s.Order)
	if s.Linewidth > 0 {
		caption += "; overlap: closer than the linewidth " + frequency(s.Linewidth, 4)
	} else {
		caption += "; overlap: coincident (no reflectivities given)"
	}
	t := table.Table{Caption: caption, Header: []string{"mode", "m + n", "offset from TEM₀₀ (" + unit + ")", "within FSR (" + unit + ")", "fraction of FSR", "overlaps"}}
	for _, l := range s.Lines {
		var with []string
		for _, j := range l.Overlaps {
			with = append(with, modeName(s.Lines[j]))
		}
		t.Rows = append(t.Rows, []string{modeName(l), strconv.Itoa(l.M + l.N), table.Fixed(l.Offset/scale, 4), table.Fixed(l.Within/scale, 4),
			table.Fixed(l.Within/s.FSR, 6), strings.Join(with, ", ")})
	}
	return t
}

// String returns [Spectrum.Table] as text.
func (s Spectrum) String() string { return s.Table().Text() }

// Warnings returns what to watch for in c, one sentence each: planes
// that are unstable or on the stability boundary, a degenerate round
// trip and the confocal choice of mode, and the degenerate and
// near-degenerate Gouy fractions of [Cavity.ModeSpacing] (planar,
// confocal, concentric, re-entrant P/Q with Q ≤ [MaxReentrantOrder]).
// A plane prefix is given only when the planes differ. Empty for a
// well-behaved cavity and for the zero Cavity.
func (c Cavity) Warnings() []string {
	if !c.built {
		return nil
	}
	var out []string
	add := func(x, y string) {
		switch {
		case x == y && x != "":
			out = append(out, x)
		default:
			if x != "" {
				out = append(out, "tangential plane: "+x)
			}
			if y != "" {
				out = append(out, "sagittal plane: "+y)
			}
		}
	}
	st := func(p PlaneStability) string {
		switch p.Class {
		case Unstable:
			return "unstable ((A + D)/2 = " + table.Sig(p.HalfTrace, 6) + "): no confined mode"
		case Marginal:
			s := "on the stability boundary (" + cmp.Or(p.Note, p.Boundary.String()) + ")"
			switch p.Boundary {
			case MinusIdentity, PlusIdentity:
				if c.confocal() {
					return s + ": every q reproduces itself; the mode shown is the symmetric confocal one (waist at the centre)"
				}
				return s + ": every q reproduces itself; no mode is singled out"
			case EdgeMinus, EdgePlus, Inside:
			}
			return s + ": no finite mode"
		case Stable:
		}
		return ""
	}
	add(st(c.st[paraxial.Tangential]), st(c.st[paraxial.Sagittal]))
	if sp, err := c.ModeSpacing(); err == nil {
		dg := func(g Gouy) string {
			d := g.Degeneracy
			if d.Q == 0 {
				return ""
			}
			if d.Exact {
				return d.Name + " (ψ/2π = " + strconv.Itoa(d.P) + "/" + strconv.Itoa(d.Q) + "): the modes of order " + strconv.Itoa(d.Q) + " fall on TEM₀₀"
			}
			return d.Name + " (ψ/2π ≈ " + strconv.Itoa(d.P) + "/" + strconv.Itoa(d.Q) + "): the modes of order " + strconv.Itoa(d.Q) + " lie " + table.Sig(math.Abs(d.Detuning)*100, 3) + " % of an FSR from TEM₀₀"
		}
		add(dg(sp.X), dg(sp.Y))
	}
	return out
}

// Table returns a summary of c: kind and mirrors, round-trip and optical
// length, FSR, stability per plane, round-trip Gouy phase and
// transverse-mode spacing, the beam radius at each mirror, finesse and
// linewidth when the reflectivities are given, and the warnings. Parts
// that cannot be computed (no mode in an unstable plane) say why.
func (c Cavity) Table() table.Table {
	if !c.built {
		return table.Table{Caption: "Cavity (not built)", Header: planeHeader()}
	}
	caption := "Ring cavity, " + strconv.Itoa(len(c.mirrors)) + " mirrors"
	if c.kind == KindLinear {
		caption = "Linear cavity " + strconv.Quote(c.ends[0].label) + "–" + strconv.Quote(c.ends[1].label)
	}
	t := table.Table{Caption: caption, Header: planeHeader()}
	add := func(r ...string) { t.Rows = append(t.Rows, r) }
	seen := map[string]bool{}
	for _, m := range c.mirrors {
		if c.onReturn(m) {
			continue // the return pass meets the fold mirrors again
		}
		v := m.shape.String()
		if m.shape != Flat {
			v += ", R = " + table.Quantity(m.radius)
		}
		if m.aoi != 0 {
			v += ", AOI " + table.Sig(m.aoi.Degrees(), 4) + "°"
		}
		switch {
		case m.refl > 0:
			v += ", reflectivity " + percent(m.refl)
		case c.kind == KindLinear && m.z != 0 && m.z != c.spacing:
			v += " (fold; loss in Loss)"
		}
		if !seen[m.name] {
			add("mirror "+m.display()+" at z = "+table.Quantity(m.z), v, "")
			seen[m.name] = true
		}
	}
	add(both("round-trip length", table.Quantity(c.Length()))...)
	add(both("optical round-trip length Σ n·d", table.Quantity(c.OpticalLength()))...)
	add(both("FSR", frequency(c.FSR(), 7))...)
	x, y := c.st[paraxial.Tangential], c.st[paraxial.Sagittal]
	add("(A + D)/2", table.Sig(x.HalfTrace, 8), table.Sig(y.HalfTrace, 8))
	if x.HasG {
		add("g1, g2", table.Sig(x.G1, 6)+", "+table.Sig(x.G2, 6), table.Sig(y.G1, 6)+", "+table.Sig(y.G2, 6))
		add("g1·g2", table.Sig(x.G1*x.G2, 8), table.Sig(y.G1*y.G2, 8))
	}
	add("stability", classText(x), classText(y))
	if sp, err := c.ModeSpacing(); err == nil {
		add("round-trip Gouy phase ψ", angleCell(sp.X.Phase), angleCell(sp.Y.Phase))
		add("transverse-mode spacing", frequency(sp.X.Spacing, 7), frequency(sp.Y.Spacing, 7))
	}
	seen = map[string]bool{}
	for _, m := range c.mirrors {
		if seen[m.name] || c.onReturn(m) {
			continue
		}
		seen[m.name] = true
		if mode, err := c.Eigenmode(m.z); err == nil {
			add("beam radius w at "+m.display(), table.Quantity(mode.Beam.X.Radius()), table.Quantity(mode.Beam.Y.Radius()))
		} else if errors.Is(err, ErrUnstable) || errors.Is(err, ErrDegenerate) {
			add("beam radius w at mirrors", "no mode", "")
			break
		}
	}
	switch a, err := c.Airy(); {
	case err == nil:
		add(both("finesse (exact Airy FWHM)", table.Sig(a.Finesse, 7))...)
		add(both("linewidth (FWHM)", frequency(a.Linewidth, 5))...)
	case errors.Is(err, ErrNoReflectivity):
		add(both("finesse", "no reflectivities given")...)
	default:
		add("finesse", err.Error(), "")
	}
	for _, w := range c.Warnings() {
		add("warning", w, "")
	}
	return t
}

// onReturn reports a fold mirror of a linear cavity met on the return
// pass (labelled "return" or "return/<label>").
func (c Cavity) onReturn(m reflection) bool {
	return c.kind == KindLinear && (m.label == returnLabel || strings.HasPrefix(m.label, returnLabel+"/"))
}

// String returns [Cavity.Table] as text.
func (c Cavity) String() string { return c.Table().Text() }
