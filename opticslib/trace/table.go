package trace

import (
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
)

// Table returns the system's surfaces, one row each and a last row for
// the image plane: number, label, kind, vertex z, radius (flat for 0),
// conic constant, clear radius (unlimited for 0) and the medium after
// the surface, lengths in mm.
func (s System) Table() table.Table {
	t := table.Table{
		Caption: "Surfaces for the real-ray trace (object space: " + s.objectName() + ")",
		Header:  []string{"#", "label", "kind", "z (mm)", "R (mm)", "k", "clear radius (mm)", "medium after"},
	}
	mm := func(v float64) string { return table.Fixed(v*1e3, 3) }
	for i, f := range s.surfs {
		r := "flat"
		if f.Radius != 0 {
			r = mm(float64(f.Radius))
		}
		a := "unlimited"
		if f.ClearRadius > 0 {
			a = mm(float64(f.ClearRadius))
		}
		k := table.Sig(f.Conic, 4)
		if f.Kind == Ideal {
			r, k = "f = "+mm(float64(f.Focal)), ""
		}
		t.Rows = append(t.Rows, []string{strconv.Itoa(i), f.Label, f.Kind.String(), mm(s.vertex[i]), r, k, a, s.MediumAfter(i).Name()})
	}
	if s.built {
		t.Rows = append(t.Rows, []string{"", "image plane", "", mm(s.vertex[len(s.surfs)]), "flat", "", "", ""})
	}
	return t
}

func (s System) objectName() string {
	if s.object == nil {
		return "none"
	}
	return s.object.Name()
}
