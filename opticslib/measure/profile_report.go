package measure

import (
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// profileDecimals returns the decimals for lengths shown in unit u: 0.1 µm
// resolution in µm and mm, 1 µm in metres.
func profileDecimals(u units.Length) int {
	switch u {
	case units.Micrometer:
		return 1
	case units.Millimeter:
		return 4
	}
	return 6
}

// Table returns the profile as a table: one row per axis (the frame's x
// and y with the centroid, the principal axes u and v), with the D4σ
// diameter, the second-moment radius w = 2σ and the axis direction from x;
// a note with the ellipticity; then one row per warning. The caption names
// the frame, the baseline correction and the iterations. Lengths are in
// the unit that suits each column (table.LengthUnit).
func (p Profile) Table() table.Table {
	cu, cs := table.LengthUnit(p.CentroidX, p.CentroidY)
	wu, ws := table.LengthUnit(p.X.D4Sigma(), p.Y.D4Sigma(), p.U.D4Sigma(), p.V.D4Sigma())
	cd, wd := profileDecimals(cu), profileDecimals(wu)
	t := table.Table{
		Caption: p.caption(),
		Header:  []string{"axis", "centroid (" + cs + ")", "D4σ (" + ws + ")", "w = 2σ (" + ws + ")", "direction (°)", "note"},
	}
	deg := func(a units.Angle) string { return table.Fixed(a.Degrees(), 2) }
	row := func(axis, c string, w MomentWidth, dir units.Angle, note string) {
		t.Rows = append(t.Rows, []string{axis, c, table.In(w.D4Sigma(), wu, wd), table.In(w.Radius(), wu, wd), deg(dir), note})
	}
	row("x", table.In(p.CentroidX, cu, cd), p.X, 0, "")
	row("y", table.In(p.CentroidY, cu, cd), p.Y, 90*units.Degree, "")
	row("u (principal)", "", p.U, p.Azimuth, "ellipticity "+table.Fixed(p.Ellipticity(), 3))
	row("v (principal)", "", p.V, p.Azimuth+90*units.Degree, "")
	for _, w := range p.Warnings {
		t.Rows = append(t.Rows, []string{"warning", "", "", "", "", w.Error()})
	}
	return t
}

// caption returns the table caption.
func (p Profile) caption() string {
	var b strings.Builder
	b.WriteString("Beam profile")
	if p.Name != "" {
		b.WriteString(" " + p.Name)
	}
	b.WriteString(" (ISO 11146-1 second moments; " + p.baselineText() + "; " + strconv.Itoa(p.Iterations) + " area iterations)")
	return b.String()
}

// baselineText describes the baseline correction.
func (p Profile) baselineText() string {
	var parts []string
	if p.Dark {
		parts = append(parts, "dark frame subtracted")
	}
	switch p.Baseline {
	case BorderOffset:
		parts = append(parts, "offset "+table.Sig(p.Offset, 4)+" from the "+strconv.Itoa(p.Border)+"-pixel border")
	default:
		parts = append(parts, "no offset subtracted")
	}
	return strings.Join(parts, ", ") + ", noise " + table.Sig(p.Noise, 3)
}

// String returns a summary of the profile, one quantity per line, lengths
// with four significant digits, then one line per warning.
func (p Profile) String() string {
	q := func(l units.Length) string { return table.LengthSig(l, 4) }
	var b strings.Builder
	b.WriteString("beam profile")
	if p.Name != "" {
		b.WriteString(" " + p.Name)
	}
	b.WriteString(" (ISO 11146-1 second moments)\n")
	b.WriteString("  centroid x = " + q(p.CentroidX) + ", y = " + q(p.CentroidY) + "\n")
	b.WriteString("  D4σ x = " + q(p.X.D4Sigma()) + ", y = " + q(p.Y.D4Sigma()) + " (w = 2σ: " + q(p.X.Radius()) + ", " + q(p.Y.Radius()) + ")\n")
	b.WriteString("  principal axes at " + table.Fixed(p.Azimuth.Degrees(), 2) + "°: D4σ " + q(p.U.D4Sigma()) + " × " + q(p.V.D4Sigma()) +
		" (w = 2σ: " + q(p.U.Radius()) + " × " + q(p.V.Radius()) + "), ellipticity " + table.Fixed(p.Ellipticity(), 3) + "\n")
	b.WriteString("  integration area " + q(2*p.Area.HalfU) + " × " + q(2*p.Area.HalfV) + " (" + strconv.Itoa(p.Area.Pixels) + " pixels) after " + strconv.Itoa(p.Iterations) + " iterations\n")
	b.WriteString("  " + p.baselineText() + "; width uncertainty from noise " + table.Sig(100*p.WidthNoise, 2) + " %\n")
	for _, w := range p.Warnings {
		b.WriteString("  warning: " + w.Error() + "\n")
	}
	return strings.TrimSuffix(b.String(), "\n")
}
