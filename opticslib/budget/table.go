package budget

import (
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// powerUnit returns the display unit of a power column in watts and its
// symbol, from the input power p0: W from 1 W, mW from 1 mW, µW below.
func powerUnit(p0 float64) (float64, string) {
	switch {
	case p0 >= 1:
		return 1, "W"
	case p0 >= 1e-3:
		return 1e-3, "mW"
	}
	return 1e-6, "µW"
}

// PowerUnit returns the unit the table and figures of b use for power:
// the scale in watts and its symbol, "W" from an input of 1 W, "mW" from
// 1 mW, "µW" below.
func (b Budget) PowerUnit() (scale float64, symbol string) { return powerUnit(b.Input.Power) }

// State describes the input polarization in words: "unpolarized", or the
// ellipse of the Jones vector ("linear, ψ = 0.00°", "elliptical, ψ =
// 10.00°, χ = 20.00°", "right circular").
func (in Input) State() string {
	if in.Unpolarized() {
		return "unpolarized"
	}
	e := in.Polarization.Ellipse()
	psi, chi := table.Fixed(e.Azimuth.Degrees(), 2), table.Fixed(e.Ellipticity.Degrees(), 2)
	switch {
	case chi == "0.00":
		return "linear, ψ = " + psi + "°"
	case chi == "45.00":
		return "right circular"
	case chi == "-45.00":
		return "left circular"
	}
	return "elliptical, ψ = " + psi + "°, χ = " + chi + "°"
}

// Caption returns the budget's one-paragraph summary: the input (power,
// polarization and how the Fresnel losses treat it), the output power and
// fraction, how the irradiance is computed, and [beam.SafetyNote].
func (b Budget) Caption() string {
	scale, unit := b.PowerUnit()
	fr := "Fresnel losses for the beam's Jones vector"
	if b.Input.Unpolarized() {
		fr = "Fresnel losses for unpolarized light: the s/p average (Ts + Tp)/2 at the first surface, then the partial polarization of tilted surfaces followed with Stokes vectors"
	}
	return "Power budget: P0 = " + table.Sig(b.Input.Power/scale, 4) + " " + unit + ", " + b.Input.State() + "; " + fr +
		". Output " + table.Sig(b.Output()/scale, 4) + " " + unit + " (" + table.Fixed(100*b.Fraction(), 3) + " % of the input)." +
		" Peak irradiance I₀ = 2P/(π wx wy) after each element from the beam radii there. " + beam.SafetyNote
}

// Table returns the budget as a table: a row for the input and one per
// [Row], with the element, its position z (mm), what acted, its
// transmission (%, three decimals), the power after it (four significant
// digits, in the unit of [Budget.PowerUnit]), the fraction of the input
// (%, three decimals) and the on-axis peak irradiance I₀ = 2P/(π wx wy)
// after it (W/cm², four significant digits). The caption is
// [Budget.Caption], which ends with the laser-safety note.
func (b Budget) Table() table.Table {
	scale, unit := b.PowerUnit()
	t := table.Table{
		Caption: b.Caption(),
		Header:  []string{"element", "z (mm)", "acted", "transmission (%)", "power (" + unit + ")", "of input (%)", "peak I₀ (W/cm²)"},
	}
	t.Rows = append(t.Rows, []string{"input", "0.00", b.Input.State(), "", table.Sig(b.Input.Power/scale, 4), "100.000", table.Sig(b.Irradiance*1e-4, 4)})
	for _, r := range b.Rows {
		var what []string
		for _, a := range r.Actions {
			what = append(what, a.Cause.String()+": "+a.Detail)
		}
		acted := strings.Join(what, "; ")
		if acted == "" {
			acted = "—"
		}
		t.Rows = append(t.Rows, []string{r.Name, table.In(r.Z, units.Millimeter, 2), acted, table.Fixed(100*r.Transmission, 3),
			table.Sig(r.Power/scale, 4), table.Fixed(100*r.Fraction, 3), table.Sig(r.Irradiance*1e-4, 4)})
	}
	return t
}

// String returns the table as plain text ([table.Table.Text]), whose
// caption carries the laser-safety note.
func (b Budget) String() string { return b.Table().Text() }
