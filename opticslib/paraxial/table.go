package paraxial

import (
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// mmCell formats a length in mm with the given decimals; "∞" for an
// infinite radius and "" for zero when blank is set.
func mmCell(l units.Length, dec int, blank bool) string {
	if blank && l == 0 {
		return ""
	}
	return table.Fixed(float64(l)/1e-3, dec)
}

func numCell(v float64, dec int) string { return table.Fixed(v, dec) }

// openingCell describes a clear aperture in mm: "Ø 25.4", "slit 0.1 (x)",
// with its offset when it has one.
func openingCell(o Opening) string {
	if !o.Limited() {
		return ""
	}
	c := "Ø " + mmCell(o.Diameter(), 3, false)
	if o.Shape == Slit {
		c = "slit " + mmCell(o.Diameter(), 3, false) + " (" + planeName(o.Across) + ")"
	}
	if o.OffsetX != 0 || o.OffsetY != 0 {
		c += " at (" + mmCell(o.OffsetX, 3, false) + ", " + mmCell(o.OffsetY, 3, false) + ")"
	}
	return c
}

func planeName(p Plane) string {
	if p == Sagittal {
		return "y"
	}
	return "x"
}

// Table returns the element list of s (its prescription) as a table, one row per
// element: builder call, kind, label, position z, length, radius or focal
// length (mirrors as concave or convex with the radius printed on the
// part), index after the element, angle of incidence and clear aperture as
// a diameter (lengths in mm to 3 decimals, indices to 4). Surfaces of a
// thick lens or plate are marked with the component kind. Empty cells mean
// "not applicable" (or an unlimited aperture).
func (s System) Table() table.Table {
	t := table.Table{
		Caption: "Prescription",
		Header:  []string{"call", "element", "label", "z (mm)", "length (mm)", "R / f (mm)", "n after", "tilt (°)", "clear aperture (mm)"},
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
			switch {
			case e.Concave():
				rf = "concave, R " + mmCell(-e.Radius, 3, false)
			case e.Convex():
				rf = "convex, R " + mmCell(e.Radius, 3, false)
			default:
				rf = "flat"
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
			strconv.Itoa(e.Call) + " " + e.Method, e.Kind.String() + part[i], e.Label,
			mmCell(e.Z, 3, false), mmCell(e.Length, 3, !(e.Kind == KindSpace)),
			rf, numCell(e.IndexOut, 4), tilt, openingCell(e.Aperture),
		})
	}
	return t
}

// Table returns the cardinal data of c as a two-column table (quantity,
// value in mm or the unit given), or the magnifications of an afocal
// system.
func (c Cardinal) Table() table.Table {
	t := table.Table{Caption: "Cardinal points (" + c.Plane.String() + ")", Header: []string{"quantity", "value"}}
	add := func(name, v string) { t.Rows = append(t.Rows, []string{name, v}) }
	if c.Afocal {
		add("afocal", "yes")
		add("angular magnification", numCell(c.AngularMagnification, 4))
		add("transverse magnification", numCell(c.TransverseMagnification, 4))
		return t
	}
	add("power Φ (1/m)", numCell(c.Power, 4))
	add("EFL (mm)", mmCell(c.EFL, 3, false))
	add("object focal length f, H→F (mm)", mmCell(c.ObjectFocalLength, 3, false))
	add("image focal length f', H'→F' (mm)", mmCell(c.ImageFocalLength, 3, false))
	add("FFL, F→first vertex (mm)", mmCell(c.FFL, 3, false))
	add("BFL, last vertex→F' (mm)", mmCell(c.BFL, 3, false))
	add("front focal point F, z (mm)", mmCell(c.FrontFocalPoint, 3, false))
	add("rear focal point F', z (mm)", mmCell(c.RearFocalPoint, 3, false))
	add("front principal plane H, z (mm)", mmCell(c.FrontPrincipalPlane, 3, false))
	add("rear principal plane H', z (mm)", mmCell(c.RearPrincipalPlane, 3, false))
	add("front nodal point N, z (mm)", mmCell(c.FrontNodalPoint, 3, false))
	add("rear nodal point N', z (mm)", mmCell(c.RearNodalPoint, 3, false))
	return t
}

// Table returns the object–image table of cs: object and image positions
// (mm), transverse and angular magnification, and whether object and image
// are real.
func (cs Conjugates) Table() table.Table {
	t := table.Table{Caption: "Object–image table", Header: []string{"object z (mm)", "image z (mm)", "magnification", "angular magnification", "object", "image"}}
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

// Table returns the imaging solution c as a one-row object–image table.
func (c Conjugate) Table() table.Table {
	t := Conjugates{c}.Table()
	t.Caption = "Imaging solution (" + c.Plane.String() + ")"
	return t
}

// Table returns the aperture analysis as a two-column table.
func (a Stops) Table() table.Table {
	t := table.Table{Caption: "Stop, pupils and field (" + a.Plane.String() + ")", Header: []string{"quantity", "value"}}
	add := func(name, v string) { t.Rows = append(t.Rows, []string{name, v}) }
	pupil := func(name string, p Pupil) {
		if p.AtInfinity {
			add(name, "at infinity (telecentric)")
			return
		}
		add(name+" z (mm)", mmCell(p.Z, 3, false))
		add(name+" radius (mm)", mmCell(p.Radius, 3, false))
	}
	add("aperture stop", a.StopName)
	add("stop half-opening (mm)", mmCell(a.StopRadius, 3, false))
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
	add("field stop", a.FieldStopName)
	if a.Object.Infinite {
		add("half field of view (°)", numCell(a.HalfField.Angle.Degrees(), 3))
		add("unvignetted half field (°)", numCell(a.UnvignettedField.Angle.Degrees(), 3))
	} else {
		add("half field height (mm)", mmCell(a.HalfField.Height, 3, false))
		add("unvignetted half field (mm)", mmCell(a.UnvignettedField.Height, 3, false))
	}
	return t
}
