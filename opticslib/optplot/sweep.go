package optplot

import (
	"github.com/beamnote/beamnote/opticslib/sweep"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Sweep returns a figure of a what-if study (sweep.Over): the quantities
// named (all of them when none is named) against the swept parameter, one
// line each, in the units of the study's table. The named quantities must
// share a unit, so that they can share the y axis.
func Sweep(r sweep.Result, names ...string) (Figure, error) {
	if len(r.Quantities) > 0 && r.Values == nil && len(r.Cases) > 0 {
		return Figure{}, &ParamError{Func: "Sweep", Param: "sweep", Value: r.Parameter, Reason: "is over named cases (sweep.Cases), which have no numeric axis; show its table", Err: ErrSeries}
	}
	if len(r.Quantities) == 0 || len(r.Values) == 0 {
		return Figure{}, &ParamError{Func: "Sweep", Param: "sweep", Reason: "has no cases; make it with sweep.Over", Err: ErrSeries}
	}
	var qs []int
	if len(names) == 0 {
		for q := range r.Quantities {
			qs = append(qs, q)
		}
	}
	for _, n := range names {
		q, err := r.Find(n)
		if err != nil {
			return Figure{}, err
		}
		qs = append(qs, q)
	}
	x, xu := r.ParameterColumn()
	// Lengths share one display unit, chosen over all the plotted values;
	// numbers must have the same unit to share the axis.
	var all []units.Length
	for _, q := range qs {
		if r.Quantities[q].Kind == sweep.KindLength {
			for _, v := range r.Data[q] {
				all = append(all, units.Length(v))
			}
		}
	}
	lu, lsym := table.LengthUnit(all...)
	var series []Series
	unit := ""
	for i, q := range qs {
		qt := r.Quantities[q]
		u := qt.Unit
		y := append([]float64(nil), r.Data[q]...)
		if qt.Kind == sweep.KindLength {
			u = lsym
			for j := range y {
				y[j] /= float64(lu)
			}
		}
		if i == 0 {
			unit = u
		} else if u != unit || (qt.Kind == sweep.KindLength) != (r.Quantities[qs[0]].Kind == sweep.KindLength) {
			return Figure{}, &ParamError{Func: "Sweep", Param: "quantity " + qt.Name, Value: u,
				Reason: "has another unit than " + r.Quantities[qs[0]].Name + " (" + unit + "); plot them in two figures", Err: ErrSeries}
		}
		series = append(series, Series{Label: qt.Name, X: x, Y: y})
	}
	ylabel := r.Quantities[qs[0]].Name
	if len(qs) > 1 {
		ylabel = "value"
	}
	if unit != "" {
		ylabel += " (" + unit + ")"
	}
	return Lines("What if the "+r.Parameter+" changes", r.Parameter+" ("+xu+")", ylabel, series...)
}
