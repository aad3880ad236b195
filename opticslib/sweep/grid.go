package sweep

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Param is one swept parameter of a [Grid]: its name ("L1 position") and
// its values in metres, finite and strictly increasing.
type Param struct {
	Name   string
	Values []units.Length
}

// Steps returns n equally spaced lengths from lo to hi, both included
// (lo + (hi − lo)·k/(n − 1), the last exactly hi); n = 1 gives lo alone.
// It returns nil for n < 1.
func Steps(lo, hi units.Length, n int) []units.Length {
	if n < 1 {
		return nil
	}
	out := make([]units.Length, n)
	for k := range out {
		out[k] = lo
		if n > 1 {
			out[k] = lo + (hi-lo)*units.Length(k)/units.Length(n-1)
		}
	}
	if n > 1 {
		out[n-1] = hi
	}
	return out
}

// Column returns the values in the unit they are shown in
// (table.LengthUnit) and its symbol.
func (p Param) Column() ([]float64, string) { return lengthColumn(p.Values) }

// Label returns the parameter's axis or column name with its unit,
// "L1 position (mm)".
func (p Param) Label() string {
	_, u := p.Column()
	return p.Name + " (" + u + ")"
}

// ErrValues is wrapped by the error of [Grid] for parameter values that
// are not finite and strictly increasing.
var ErrValues = errors.New("sweep: parameter values must be finite and strictly increasing")

func (p Param) check() error {
	for i, v := range p.Values {
		if math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) || (i > 0 && !(v > p.Values[i-1])) {
			return &Error{Case: p.Name + " value " + strconv.Itoa(i+1) + " = " + v.String(), Err: ErrValues}
		}
	}
	return nil
}

// GridResult is a finished two-parameter sweep ([Grid]): every quantity
// at every pair of values of A and B.
type GridResult struct {
	// A and B are the two parameters.
	A, B Param
	// Quantities are the reported quantities; Data[q] holds quantity q
	// at every pair, in SI units, A's index outer: Data[q][i·len(B.Values)
	// + j] is the value at A.Values[i], B.Values[j] ([GridResult.At]).
	Quantities []Quantity
	Data       [][]float64
}

// Grid is [Over] for two parameters at once: it builds the system for
// every pair of values of a and b with build and computes every quantity
// for it (len(a.Values)·len(b.Values) systems, a outer). It returns
// [ErrNoCases] for no values or no quantity, an error wrapping
// [ErrValues] naming the parameter and value when a parameter's values
// are not finite and strictly increasing, and an error naming both
// values and the quantity when a case fails or a value is not finite.
//
//	res, err := sweep.Grid(sweep.Param{Name: "L1 position", Values: sweep.Steps(20*mm, 60*mm, 41)},
//		sweep.Param{Name: "lens gap", Values: sweep.Steps(110*mm, 130*mm, 41)}, expander,
//		sweep.OutputWaistRadius(laser))
func Grid(a, b Param, build func(a, b units.Length) (paraxial.System, error), qs ...Quantity) (GridResult, error) {
	if len(a.Values) == 0 || len(b.Values) == 0 || build == nil {
		return GridResult{}, ErrNoCases
	}
	for _, p := range []Param{a, b} {
		if err := p.check(); err != nil {
			return GridResult{}, err
		}
	}
	pairs := make([][2]units.Length, 0, len(a.Values)*len(b.Values))
	for _, x := range a.Values {
		for _, y := range b.Values {
			pairs = append(pairs, [2]units.Length{x, y})
		}
	}
	r, err := run(pairs, func(v [2]units.Length) string {
		return a.Name + " = " + v[0].String() + ", " + b.Name + " = " + v[1].String()
	}, func(v [2]units.Length) (paraxial.System, error) { return build(v[0], v[1]) }, qs)
	if err != nil {
		return GridResult{}, err
	}
	return GridResult{A: Param{a.Name, append([]units.Length(nil), a.Values...)}, B: Param{b.Name, append([]units.Length(nil), b.Values...)},
		Quantities: r.Quantities, Data: r.Data}, nil
}

// At returns quantity q at A.Values[i] and B.Values[j], in SI units. It
// panics if an index is out of range.
func (r GridResult) At(q, i, j int) float64 {
	if i < 0 || i >= len(r.A.Values) || j < 0 || j >= len(r.B.Values) {
		panic("sweep: GridResult.At index out of range")
	}
	return r.Data[q][i*len(r.B.Values)+j]
}

// Column returns quantity q's values at every pair (A's index outer) in
// the unit they are shown in, one unit for all, and its symbol.
func (r GridResult) Column(q int) ([]float64, string) { return column(r.Quantities[q], r.Data[q]) }

// Label returns the column header of quantity q, with its unit.
func (r GridResult) Label(q int) string { return label(r.Quantities[q], r.Data[q]) }

// Find returns the index of the quantity named name, or an error listing
// the names there are.
func (r GridResult) Find(name string) (int, error) { return find(r.Quantities, name) }

// Table returns the sweep in long form: one row per pair of values (A's
// index outer), the two parameters first, four significant digits.
func (r GridResult) Table() table.Table {
	av, _ := r.A.Column()
	bv, _ := r.B.Column()
	t := table.Table{
		Caption: "What if the " + r.A.Name + " and the " + r.B.Name + " change",
		Header:  []string{r.A.Label(), r.B.Label()},
	}
	cols := make([][]float64, len(r.Quantities))
	for q := range r.Quantities {
		cols[q], _ = r.Column(q)
		t.Header = append(t.Header, r.Label(q))
	}
	for i := range av {
		for j := range bv {
			row := []string{table.Sig(av[i], 4), table.Sig(bv[j], 4)}
			for q := range cols {
				row = append(row, table.Sig(cols[q][i*len(bv)+j], 4))
			}
			t.Rows = append(t.Rows, row)
		}
	}
	return t
}
