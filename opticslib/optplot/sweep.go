package optplot

import (
	"github.com/beamnote/beamnote/opticslib/sweep"
)

// Sweep returns a figure of a what-if study (sweep.Over): the quantities
// named (all of them when none is named) against the swept parameter, one
// line each, in the units of the study's table. The named quantities must
// share a unit, so that they can share the y axis.
func Sweep(r sweep.Result, names ...string) (Figure, error) {
	if len(r.Quantities) == 0 || len(r.Values) == 0 {
		return Figure{}, &ParamError{Func: "Sweep", Param: "sweep", Reason: "has no cases; make it with sweep.Over"}
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
	var series []Series
	unit := ""
	for i, q := range qs {
		y, u := r.Column(q)
		if i == 0 {
			unit = u
		} else if u != unit {
			return Figure{}, &ParamError{Func: "Sweep", Param: "quantity " + r.Quantities[q].Name, Value: u,
				Reason: "has another unit than " + r.Quantities[qs[0]].Name + " (" + unit + "); plot them in two figures"}
		}
		series = append(series, Series{Label: r.Quantities[q].Name, X: x, Y: y})
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
