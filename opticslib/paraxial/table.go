package paraxial

import (
	"html"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Table is a small text table for reports and notebooks: a caption, a
// header row and data rows of plain-text cells. Lengths in the tables of
// this package are printed in millimetres with the unit in the header.
// Pass the fields to a notebook table display, or render with
// [Table.Text] or [Table.HTML].
type Table struct {
	// Caption is the title line; it may be empty.
	Caption string
	// Header holds the column names, with units in parentheses.
	Header []string
	// Rows holds the data cells, one slice per row.
	Rows [][]string
}

func cellAt(r []string, j int) string {
	if j < len(r) {
		return r[j]
	}
	return ""
}

// Text renders t with columns aligned on rune counts, the caption on the
// first line, a rule of dashes under the header and no trailing spaces. Rows shorter than the
// header are padded with empty cells; extra cells are dropped.
func (t Table) Text() string {
	width := make([]int, len(t.Header))
	for j, h := range t.Header {
		width[j] = utf8.RuneCountInString(h)
		for _, r := range t.Rows {
			width[j] = max(width[j], utf8.RuneCountInString(cellAt(r, j)))
		}
	}
	var b strings.Builder
	if t.Caption != "" {
		b.WriteString(t.Caption + "\n")
	}
	line := func(r []string) {
		var l strings.Builder
		for j := range t.Header {
			c := cellAt(r, j)
			if j > 0 {
				l.WriteString("  ")
			}
			l.WriteString(c)
			l.WriteString(strings.Repeat(" ", width[j]-utf8.RuneCountInString(c)))
		}
		b.WriteString(strings.TrimRight(l.String(), " "))
		b.WriteString("\n")
	}
	line(t.Header)
	rule := make([]string, len(t.Header))
	for j := range rule {
		rule[j] = strings.Repeat("-", width[j])
	}
	line(rule)
	for _, r := range t.Rows {
		line(r)
	}
	return b.String()
}

// HTML renders t as an HTML table fragment with every cell escaped; the
// class attribute is "paraxial-table".
func (t Table) HTML() string {
	var b strings.Builder
	b.WriteString(`<table class="paraxial-table">`)
	if t.Caption != "" {
		b.WriteString("<caption>" + html.EscapeString(t.Caption) + "</caption>")
	}
	b.WriteString("<thead><tr>")
	for _, h := range t.Header {
		b.WriteString("<th>" + html.EscapeString(h) + "</th>")
	}
	b.WriteString("</tr></thead><tbody>")
	for _, r := range t.Rows {
		b.WriteString("<tr>")
		for j := range t.Header {
			b.WriteString("<td>" + html.EscapeString(cellAt(r, j)) + "</td>")
		}
		b.WriteString("</tr>")
	}
	b.WriteString("</tbody></table>")
	return b.String()
}

// mmCell formats a length in mm with the given decimals; "flat" for an
// infinite radius and "" for zero when blank is set.
func mmCell(l units.Length, dec int, blank bool) string {
	v := float64(l)
	switch {
	case math.IsInf(v, 0):
		return "flat"
	case blank && v == 0:
		return ""
	}
	x := v / 1e-3
	if x == 0 {
		x = 0 // no "-0"
	}
	return strconv.FormatFloat(x, 'f', dec, 64)
}

func numCell(v float64, dec int) string {
	if v == 0 {
		v = 0
	}
	return strconv.FormatFloat(v, 'f', dec, 64)
}

// Prescription returns the element list of s as a table, one row per
// element: number, kind, label, position z, length, radius or focal
// length, index after the element, angle of incidence and clear-aperture
// radius (lengths in mm to 3 decimals, indices to 4). Surfaces of a thick
// lens or plate are marked with the component kind. Empty cells mean "not
// applicable" (or an unlimited aperture).
func (s System) Prescription() Table {
	t := Table{
		Caption: "Prescription",
		Header:  []string{"#", "element", "label", "z (mm)", "length (mm)", "R / f (mm)", "n after", "tilt (°)", "clear radius (mm)"},
	}
	part := make([]string, len(s.elems))
	for _, c := range s.comps {
		for i := c.First; i <= c.Last; i++ {
			part[i] = " (" + c.Kind.String() + ")"
		}
	}
	for i, e := range s.elems {
		rf := ""
		switch e.Kind {
		case KindThinLens:
			rf = "f " + mmCell(e.Focal, 3, false)
		case KindCylindricalLens:
			rf = "f " + mmCell(e.Focal, 3, false) + " " + e.Plane.String()
		case KindSphericalInterface:
			rf = "R " + mmCell(e.Radius, 3, false)
		case KindMirror:
			rf = "R flat"
			if e.Radius != 0 {
				rf = "R " + mmCell(e.Radius, 3, false)
			}
		case KindPlanarInterface:
			rf = "flat"
		case KindSpace, KindMatrix, KindThickLens, KindPlate, KindDiaphragm:
		}
		tilt := ""
		if e.Tilt != 0 {
			tilt = numCell(e.Tilt.Degrees(), 2)
		}
		t.Rows = append(t.Rows, []string{
			strconv.Itoa(i), e.Kind.String() + part[i], e.Label,
			mmCell(e.Z, 3, false), mmCell(e.Length, 3, !(e.Kind == KindSpace)),
			rf, numCell(e.IndexOut, 4), tilt, mmCell(e.Aperture, 3, true),
		})
	}
	return t
}

// Table returns the cardinal data of c as a two-column table (quantity,
// value in mm or the unit given), or the magnifications of an afocal
// system.
func (c Cardinal) Table() Table {
	t := Table{Caption: "Cardinal points (" + c.Plane.String() + ")", Header: []string{"quantity", "value"}}
	add := func(name, v string) { t.Rows = append(t.Rows, []string{name, v}) }
	if c.Afocal {
		add("afocal", "yes")
		add("angular magnification", numCell(c.AngularMagnification, 4))
		add("transverse magnification", numCell(c.TransverseMagnification, 4))
		return t
	}
	add("power Φ (1/m)", numCell(c.Power, 4))
	add("EFL (mm)", mmCell(c.EFL, 3, false))
	add("front focal length f (mm)", mmCell(c.FrontFocalLength, 3, false))
	add("rear focal length f' (mm)", mmCell(c.RearFocalLength, 3, false))
	add("FFL (mm)", mmCell(c.FFL, 3, false))
	add("BFL (mm)", mmCell(c.BFL, 3, false))
	add("front focal point F, z (mm)", mmCell(c.FrontFocal, 3, false))
	add("rear focal point F', z (mm)", mmCell(c.RearFocal, 3, false))
	add("front principal plane H, z (mm)", mmCell(c.FrontPrincipal, 3, false))
	add("rear principal plane H', z (mm)", mmCell(c.RearPrincipal, 3, false))
	add("front nodal point N, z (mm)", mmCell(c.FrontNodal, 3, false))
	add("rear nodal point N', z (mm)", mmCell(c.RearNodal, 3, false))
	return t
}

// ConjugateTable returns an object–image table of cs: object and image
// positions (mm), transverse and angular magnification, and whether object
// and image are real.
func ConjugateTable(cs []Conjugate) Table {
	t := Table{Caption: "Object–image table", Header: []string{"object z (mm)", "image z (mm)", "magnification", "angular magnification", "object", "image"}}
	kind := func(real bool) string {
		if real {
			return "real"
		}
		return "virtual"
	}
	for _, c := range cs {
		t.Rows = append(t.Rows, []string{mmCell(c.Object, 3, false), mmCell(c.Image, 3, false), numCell(c.Magnification, 4),
			numCell(c.AngularMagnification, 4), kind(c.RealObject), kind(c.RealImage)})
	}
	return t
}

// Table returns the aperture analysis as a two-column table.
func (a Apertures) Table() Table {
	t := Table{Caption: "Stop, pupils and field (" + a.Plane.String() + ")", Header: []string{"quantity", "value"}}
	add := func(name, v string) { t.Rows = append(t.Rows, []string{name, v}) }
	pupil := func(name string, p Pupil) {
		if p.AtInfinity {
			add(name, "at infinity (telecentric)")
			return
		}
		add(name+" z (mm)", mmCell(p.Z, 3, false))
		add(name+" radius (mm)", mmCell(p.Radius, 3, false))
	}
	add("aperture stop", "element "+strconv.Itoa(a.Stop))
	add("stop radius (mm)", mmCell(a.StopRadius, 3, false))
	pupil("entrance pupil", a.Entrance)
	pupil("exit pupil", a.Exit)
	if !a.Object.Infinite {
		add("object-space NA", numCell(a.ObjectNA, 4))
	}
	add("image-space NA", numCell(a.ImageNA, 4))
	if a.WorkingFNumber > 0 {
		add("working f-number", numCell(a.WorkingFNumber, 2))
	}
	if a.FNumber > 0 {
		add("f-number", numCell(a.FNumber, 2))
	}
	if a.FieldStop < 0 {
		add("field stop", "none")
		return t
	}
	add("field stop", "element "+strconv.Itoa(a.FieldStop))
	if a.Object.Infinite {
		add("half field of view (°)", numCell(a.HalfField.Angle.Degrees(), 3))
		add("unvignetted half field (°)", numCell(a.UnvignettedField.Angle.Degrees(), 3))
	} else {
		add("half field height (mm)", mmCell(a.HalfField.Height, 3, false))
		add("unvignetted half field (mm)", mmCell(a.UnvignettedField.Height, 3, false))
	}
	return t
}
