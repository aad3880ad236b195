package plan

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// degrees formats an angle in [0, 2π) as degrees with one decimal in
// [0, 360): an angle that rounds to 360.0 prints as 0.0.
func degrees(a units.Angle) string {
	s := table.Fixed(a.Degrees(), 1)
	if s == "360.0" {
		return "0.0"
	}
	return s
}

// kindText describes a part for the table: "thin lens", "mirror 45°
// left", "plate 10°".
func kindText(p Part) string {
	s := p.Kind.String()
	switch {
	case p.Kind == paraxial.KindMirror && p.Turn != 0:
		s += " " + table.Sig(p.AOI.Degrees(), 4) + "° " + p.Turn.String()
	case p.Kind == paraxial.KindMirror:
		s += " " + table.Sig(p.AOI.Degrees(), 4) + "°"
	case p.Kind == paraxial.KindPlate && p.AOI != 0:
		s += " " + table.Sig(p.AOI.Degrees(), 4) + "°"
	}
	return s
}

// Table returns the positions to build from, one row per part in path
// order: its name and kind (a mirror with its angle of incidence and
// fold side), the board position of the beam axis at the part (x, y),
// the nearest hole (column, row, counted from 1 at the origin corner)
// and the offset from it (dx, dy), the beam direction (arriving → leaving
// at a mirror), the normal of a mirror's face or a tilted plate, the
// path position z of the part's centre from the input plane, the
// clearance of the beam to the footprint where the beam passes the part
// on another segment, and, with a beam, its 1/e² radius w in the board
// plane. Lengths are in the board's unit (mm on a metric board, inches
// on an imperial one; w always in mm), angles in degrees counterclockwise
// from +x. Empty cells are not applicable.
func (p Plan) Table() table.Table {
	u, sym := p.Board.Grid.unit()
	dec := 1
	if u == units.Inch {
		dec = 2
	}
	in := func(l units.Length) string { return table.In(l, u, dec) }
	t := table.Table{
		Caption: "Table plan on a " + p.Board.String() + ": positions from the origin corner, holes counted from 1 there, angles counterclockwise from +x",
		Header: []string{"part", "kind", "x (" + sym + ")", "y (" + sym + ")", "hole (col, row)", "dx (" + sym + ")", "dy (" + sym + ")",
			"beam (°)", "normal (°)", "z (" + sym + ")", "clearance (" + sym + ")"},
	}
	if p.HasBeam {
		t.Header = append(t.Header, "w (mm)")
	}
	for _, pt := range p.Parts {
		dir := degrees(pt.In)
		if pt.Kind == paraxial.KindMirror {
			dir += " → " + degrees(pt.Out)
		}
		normal := ""
		if pt.Kind == paraxial.KindMirror || pt.AOI != 0 {
			normal = degrees(pt.Normal)
		}
		clear := ""
		if pt.ClearSegment >= 0 && !math.IsInf(float64(pt.Clearance), 0) {
			clear = in(pt.Clearance)
		}
		row := []string{pt.Name, kindText(pt), in(pt.At.X), in(pt.At.Y),
			strconv.Itoa(pt.Hole.Col) + ", " + strconv.Itoa(pt.Hole.Row), in(pt.Hole.Offset.X), in(pt.Hole.Offset.Y),
			dir, normal, in(pt.Center), clear}
		if p.HasBeam {
			row = append(row, table.In(pt.W, units.Millimeter, 3))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}
