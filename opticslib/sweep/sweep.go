// Package sweep runs a what-if study in one call: a list of values of one
// design parameter (a spacing, a focal length, a working distance), a
// function that builds the system for a value, and the quantities to
// report; the result is a table with units in its headers (and, through
// optplot, a figure), with no hand-built rows.
//
//	res, err := sweep.Over("lens gap", []units.Length{116 * mm, 118 * mm, 120 * mm}, expander,
//		sweep.OutputWaistZ(laser), sweep.RadiusAtEnd(laser))
//
// Values are SI internally (metres for lengths); each length column is shown
// in the unit that suits it (µm, mm or m). The package imports paraxial and
// beam and nothing from plotting or the kernel.
package sweep

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
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

// OutputWaistZ is the position of the waist of the beam leaving the
// system (beam.Waists, last element), from the input plane.
func OutputWaistZ(in beam.Input) Quantity {
	return Length("output waist z", func(s paraxial.System) (units.Length, error) {
		ws, err := beam.Waists(s, in)
		return ws.Last().Z, err
	})
}

// OutputWaistRadius is the waist radius of the beam leaving the system.
func OutputWaistRadius(in beam.Input) Quantity {
	return Length("output w0", func(s paraxial.System) (units.Length, error) {
		ws, err := beam.Waists(s, in)
		return ws.Last().Radius, err
	})
}

// RadiusAtEnd is the beam radius at the output plane of the system.
func RadiusAtEnd(in beam.Input) Quantity {
	return Length("w at the output plane", func(s paraxial.System) (units.Length, error) {
		g, err := beam.AtXY(s, in, s.Length())
		return g.X.Radius(), err
	})
}

// RadiusAt is the beam radius (x) just after the part labelled label.
func RadiusAt(in beam.Input, label string) Quantity {
	return Length("w at "+label, func(s paraxial.System) (units.Length, error) {
		p, err := s.Part(label)
		if err != nil {
			return 0, err
		}
		g, err := beam.AtXY(s, in, p.End)
		return g.X.Radius(), err
	})
}

// ImageZ is the position of the image of the object plane at z = object
// (tangential plane), from the input plane.
func ImageZ(object units.Length) Quantity {
	return Length("image z", func(s paraxial.System) (units.Length, error) {
		c, err := s.Image(object, paraxial.Tangential)
		return c.Image, err
	})
}

// Magnification is the transverse magnification of the object plane at
// z = object (tangential plane).
func Magnification(object units.Length) Quantity {
	return Number("magnification", "", func(s paraxial.System) (float64, error) {
		c, err := s.Image(object, paraxial.Tangential)
		return c.Magnification, err
	})
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
	r, err := run(param, values, func(v units.Length) string { return v.String() }, build, qs)
	if err != nil {
		return Result{}, err
	}
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
	r, err := run(param, values, name, build, qs)
	if err != nil {
		return Result{}, err
	}
	for _, v := range values {
		r.Cases = append(r.Cases, name(v))
	}
	return r, nil
}

// run is the one loop of [Over] and [Cases].
func run[P any](param string, values []P, name func(P) string, build func(P) (paraxial.System, error), qs []Quantity) (Result, error) {
	if len(values) == 0 || len(qs) == 0 || build == nil {
		return Result{}, ErrNoCases
	}
	r := Result{Parameter: param, Quantities: qs, Data: make([][]float64, len(qs))}
	for q := range qs {
		r.Data[q] = make([]float64, len(values))
	}
	for i, v := range values {
		where := param + " = " + name(v)
		sys, err := build(v)
		if err != nil {
			return Result{}, &Error{Case: where, Err: err}
		}
		for q, qt := range qs {
			x, err := qt.Of(sys)
			if err != nil {
				return Result{}, &Error{Case: where, Quantity: qt.Name, Err: err}
			}
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return Result{}, &Error{Case: where, Quantity: qt.Name, Err: errors.New("value is not finite")}
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
func (r Result) Column(q int) ([]float64, string) {
	qt := r.Quantities[q]
	out := make([]float64, len(r.Data[q]))
	if qt.Kind != KindLength {
		copy(out, r.Data[q])
		return out, qt.Unit
	}
	ls := make([]units.Length, len(out))
	for i, v := range r.Data[q] {
		ls[i] = units.Length(v)
	}
	u, sym := table.LengthUnit(ls...)
	for i, v := range r.Data[q] {
		out[i] = v / float64(u)
	}
	return out, sym
}

// ParameterColumn returns the parameter values in the unit they are shown
// in, and its symbol.
func (r Result) ParameterColumn() ([]float64, string) {
	u, sym := table.LengthUnit(r.Values...)
	out := make([]float64, len(r.Values))
	for i, v := range r.Values {
		out[i] = float64(v / u)
	}
	return out, sym
}

// Label returns the column header of quantity q, with its unit.
func (r Result) Label(q int) string {
	_, u := r.Column(q)
	if u == "" {
		return r.Quantities[q].Name
	}
	return r.Quantities[q].Name + " (" + u + ")"
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
func (r Result) Find(name string) (int, error) {
	for q, qt := range r.Quantities {
		if qt.Name == name {
			return q, nil
		}
	}
	names := ""
	for i, qt := range r.Quantities {
		if i > 0 {
			names += ", "
		}
		names += strconv.Quote(qt.Name)
	}
	return -1, errors.New("sweep: no quantity " + strconv.Quote(name) + "; the sweep has " + names)
}
