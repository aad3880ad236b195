// Package sweep runs a what-if study in one call: a list of values of one
// design parameter (a spacing, a focal length, a working distance), a
// function that builds the system for a value, and the quantities to
// report; the result is a table with units in its headers (and, through
// optplot, a figure), with no hand-built rows. [Grid] does the same over
// two parameters at once.
//
//	res, err := sweep.Over("lens gap", []units.Length{116 * mm, 118 * mm, 120 * mm}, expander,
//		sweep.OutputWaistZ(laser), sweep.RadiusAtEnd(laser))
//
// Values are SI internally (metres for lengths); each length column is shown
// in the unit that suits it (µm, mm or m). The package imports paraxial,
// beam and design (whose measures the built-in quantities are) and nothing
// from plotting or the kernel.
package sweep

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Kind says how a [Quantity]'s values are measured.
type Kind int

// The kinds of quantity.
const (
	// KindLength values are lengths in metres, shown in µm, mm or m.
	KindLength Kind = iota
	// KindNumber values are numbers in the Quantity's Unit ("" for a
	// dimensionless one, "%" for a percentage already multiplied by 100).
	KindNumber
)

// Quantity is one value reported for each case of a sweep.
type Quantity struct {
	// Name is the column name without the unit, for example "w at M1".
	Name string
	// Kind and Unit say how the values are measured (Unit for KindNumber).
	Kind Kind
	Unit string
	// Of computes the value for the system of one case, in SI units.
	Of func(sys paraxial.System) (float64, error)
}

// Length returns a length quantity computed by f.
func Length(name string, f func(paraxial.System) (units.Length, error)) Quantity {
	return Quantity{Name: name, Kind: KindLength, Of: func(s paraxial.System) (float64, error) {
		v, err := f(s)
		return float64(v), err
	}}
}

// Number returns a quantity in unit computed by f ("" for a dimensionless
// one).
func Number(name, unit string, f func(paraxial.System) (float64, error)) Quantity {
	return Quantity{Name: name, Kind: KindNumber, Unit: unit, Of: f}
}

// The built-in quantities measure as package design does, so that a
// what-if sweep and a design goal on the same quantity agree to the bit:
// each is a thin wrapper over a design measure.

// OutputWaistZ is the position of the waist of the beam leaving the
// system (beam.Waists, last element), from the input plane
// ([design.WaistZ]).
func OutputWaistZ(in beam.Input) Quantity {
	return Length("output waist z", design.WaistZ(in))
}

// OutputWaistRadius is the waist radius of the beam leaving the system
// ([design.WaistRadius]).
func OutputWaistRadius(in beam.Input) Quantity {
	return Length("output w0", design.WaistRadius(in))
}

// RadiusAtEnd is the beam radius (x) at the output plane of the system
// ([design.RadiusAt] with no label).
func RadiusAtEnd(in beam.Input) Quantity {
	return Length("w at the output plane", design.RadiusAt(in, ""))
}

// RadiusAt is the beam radius (x) just after the part labelled label
// ([design.RadiusAt]; an empty label means the output plane).
func RadiusAt(in beam.Input, label string) Quantity {
	return Length("w at "+label, design.RadiusAt(in, label))
}

// ImageZ is the position of the image of the object plane at z = object
// (tangential plane), from the input plane ([design.ImageZ]).
func ImageZ(object units.Length) Quantity {
	return Length("image z", design.ImageZ(object))
}

// Magnification is the transverse magnification of the object plane at
// z = object (tangential plane; [design.Magnification]).
func Magnification(object units.Length) Quantity {
	return Number("magnification", "", design.Magnification(object))
}

// OfGoal is the value a design goal measures, named as the goal: a length
// for a goal on lengths (metres), a number in "mrad" for one on angles
// (the bench's unit for divergence and tilt) and a plain number
// otherwise; optplot.BandOf gives the goal's range in the same unit.
// Sweep it to see where the goal is met, and shade the range in the
// figure.
func OfGoal(g design.Goal) Quantity {
	of := func(s paraxial.System) (float64, error) {
		t, err := g.Target(s)
		return t.Value, err
	}
	switch g.Unit() {
	case "m":
		return Quantity{Name: g.Name, Kind: KindLength, Of: of}
	case "rad":
		return Number(g.Name, "mrad", func(s paraxial.System) (float64, error) {
			v, err := of(s)
			return v * 1e3, err
		})
	}
	return Number(g.Name, g.Unit(), of)
}

// Result is a finished sweep: the parameter values and, for each quantity,
// its value in every case.
type Result struct {
	// Parameter names the swept parameter; Values are its values when it
	// is a length ([Over]), and Cases the names of the cases when it is
	// not ([Cases]; Values is then nil).
	Parameter string
	Values    []units.Length
	Cases     []string
	// Quantities are the reported quantities; Data[q][i] is quantity q in
	// case i, in SI units.
	Quantities []Quantity
	Data       [][]float64
}

// ErrNoCases is returned by [Over] and [Cases] for an empty list of
// values or quantities.
var ErrNoCases = errors.New("sweep: need at least one parameter value and one quantity")

// Over builds the system for every value of the parameter named param
// with build, and computes every quantity for it. It returns an error
// naming the parameter value and the quantity that failed, and one for a
// non-finite value.
func Over(param string, values []units.Length, build func(units.Length) (paraxial.System, error), qs ...Quantity) (Result, error) {
	r, err := run(values, func(v units.Length) string { return param + " = " + v.String() }, build, qs)
	if err != nil {
		return Result{}, err
	}
	r.Parameter = param
	r.Values = append([]units.Length(nil), values...)
	return r, nil
}

// Cases is [Over] for a parameter that is not a length: a part from the
// drawer, a choice of mirror, a lens of the stock. Each case has a name,
// given by name(v), which the table shows in the parameter's column:
//
//	sweep.Cases("fold mirror", []paraxial.Opening{drawer, inch},
//		func(o paraxial.Opening) string { return "Ø " + o.Diameter().String() }, path, …)
func Cases[P any](param string, values []P, name func(P) string, build func(P) (paraxial.System, error), qs ...Quantity) (Result, error) {
	if name == nil {
		return Result{}, ErrNoCases
	}
	r, err := run(values, func(v P) string { return param + " = " + name(v) }, build, qs)
	if err != nil {
		return Result{}, err
	}
	r.Parameter = param
	for _, v := range values {
		r.Cases = append(r.Cases, name(v))
	}
	return r, nil
}

// run is the one loop of [Over], [Cases] and [Grid]: it builds the
// system of every case and computes every quantity for it. where names
// a case in errors ("lens gap = 118 mm").
func run[P any](values []P, where func(P) string, build func(P) (paraxial.System, error), qs []Quantity) (Result, error) {
	if len(values) == 0 || len(qs) == 0 || build == nil {
		return Result{}, ErrNoCases
	}
	for _, qt := range qs {
		if qt.Of == nil {
			return Result{}, &Error{Quantity: qt.Name, Err: errors.New("has no function (Of is nil)")}
		}
	}
	r := Result{Quantities: qs, Data: make([][]float64, len(qs))}
	for q := range qs {
		r.Data[q] = make([]float64, len(values))
	}
	for i, v := range values {
		sys, err := build(v)
		if err != nil {
			return Result{}, &Error{Case: where(v), Err: err}
		}
		for q, qt := range qs {
			x, err := qt.Of(sys)
			if err != nil {
				return Result{}, &Error{Case: where(v), Quantity: qt.Name, Err: err}
			}
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return Result{}, &Error{Case: where(v), Quantity: qt.Name, Err: errors.New("value is not finite")}
			}
			r.Data[q][i] = x
		}
	}
	return r, nil
}

// Error reports the case and quantity of a sweep that failed.
type Error struct {
	Case, Quantity string
	Err            error
}

// Error implements the error interface.
func (e *Error) Error() string {
	return errtext.Message("sweep", e.Case, e.Quantity, nil, "", e.Err)
}

// Unwrap returns e.Err.
func (e *Error) Unwrap() error { return e.Err }

// Column returns quantity q's values in the unit its column is shown in,
// and that unit's symbol ("" for a dimensionless number).
func (r Result) Column(q int) ([]float64, string) { return column(r.Quantities[q], r.Data[q]) }

// column returns data, the values of qt, in the unit they are shown in
// (for a length, the one table.LengthUnit chooses for all of them), and
// its symbol.
func column(qt Quantity, data []float64) ([]float64, string) {
	out := make([]float64, len(data))
	if qt.Kind != KindLength {
		copy(out, data)
		return out, qt.Unit
	}
	ls := make([]units.Length, len(out))
	for i, v := range data {
		ls[i] = units.Length(v)
	}
	u, sym := table.LengthUnit(ls...)
	for i, v := range data {
		out[i] = v / float64(u)
	}
	return out, sym
}

// ParameterColumn returns the parameter values in the unit they are shown
// in, and its symbol.
func (r Result) ParameterColumn() ([]float64, string) { return lengthColumn(r.Values) }

// lengthColumn returns vs in the unit table.LengthUnit chooses for them,
// and its symbol.
func lengthColumn(vs []units.Length) ([]float64, string) {
	u, sym := table.LengthUnit(vs...)
	out := make([]float64, len(vs))
	for i, v := range vs {
		out[i] = float64(v / u)
	}
	return out, sym
}

// Label returns the column header of quantity q, with its unit.
func (r Result) Label(q int) string { return label(r.Quantities[q], r.Data[q]) }

func label(qt Quantity, data []float64) string {
	_, u := column(qt, data)
	if u == "" {
		return qt.Name
	}
	return qt.Name + " (" + u + ")"
}

// Table returns the sweep as a table, one row per case, four significant
// digits.
func (r Result) Table() table.Table {
	pv, pu := r.ParameterColumn()
	head := r.Parameter + " (" + pu + ")"
	if r.Values == nil {
		head = r.Parameter
	}
	t := table.Table{Caption: "What if the " + r.Parameter + " changes", Header: []string{head}}
	cols := make([][]float64, len(r.Quantities))
	for q := range r.Quantities {
		cols[q], _ = r.Column(q)
		t.Header = append(t.Header, r.Label(q))
	}
	for i := range r.Data[0] {
		var row []string
		if r.Values == nil {
			row = []string{r.Cases[i]}
		} else {
			row = []string{table.Sig(pv[i], 4)}
		}
		for q := range cols {
			row = append(row, table.Sig(cols[q][i], 4))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// Find returns the index of the quantity named name, or an error listing
// the names there are.
func (r Result) Find(name string) (int, error) { return find(r.Quantities, name) }

func find(qs []Quantity, name string) (int, error) {
	for q, qt := range qs {
		if qt.Name == name {
			return q, nil
		}
	}
	names := ""
	for i, qt := range qs {
		if i > 0 {
			names += ", "
		}
		names += strconv.Quote(qt.Name)
	}
	return -1, errors.New("sweep: no quantity " + strconv.Quote(name) + "; the sweep has " + names)
}
