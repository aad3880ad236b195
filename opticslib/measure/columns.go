package measure

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/internal/unitcsv"
	"github.com/beamnote/beamnote/opticslib/units"
)

// MaxColumnRows is the largest number of data rows [ReadColumns] accepts
// (about a million: far more than any scan, small enough to keep a
// mistaken file from filling the memory of a notebook kernel).
const MaxColumnRows = 1 << 20

// columnsMaxBytes is the largest input [ReadColumns] reads, 64 MiB.
const columnsMaxBytes = 64 << 20

// Columns is a table of numbers read from a CSV file whose column names
// carry their units, for example
//
//	# caustic scan behind the focusing lens, 2026-11-30
//	z_mm,dx_um,dy_um
//	80,412.0,398.5
//	90,309.7,301.2
//
// # Format
//
// The first line that is neither blank nor a comment is the header. A
// comment line starts with '#'. The separator is a comma, a semicolon or
// a tab, whichever of them the header line contains most often. Cells
// are numbers with a decimal point (strconv.ParseFloat syntax, surrounding
// spaces ignored). Rows with every cell empty are skipped, and empty cells
// after the last column (a trailing separator) are ignored. A UTF-8 byte
// order mark before the header is removed.
//
// A column name is a quantity and a unit, written quantity_unit
// ("z_mm", "sigma_dx_um": the unit is what follows the last
// underscore), quantity (unit) or quantity [unit] ("z (mm)"). Quantities
// and units are matched without regard to case. Length units are nm, um
// (or µm, μm), mm, cm, m and in (25.4 mm); angle units are rad, mrad,
// urad (or µrad) and deg. A column without a unit is allowed for
// quantities that have none (a frame number, a note); asking for it as a
// length is an error that says how to name it.
//
// Columns holds the cells as text; [Columns.Lengths], [Columns.Angles] and
// [Columns.Numbers] parse a column when asked and report the first bad
// cell by line. The zero value is an empty table.
type Columns struct {
	// Source names the input in messages, usually the file name.
	Source string
	// Names holds the column names as written in the header (trimmed).
	Names []string
	cells [][]string
	lines []int
}

// Column describes one column of a [Columns] table.
type Column struct {
	// Index is the column's position in the header, from 0.
	Index int
	// Name is the column name as written, "dx_um".
	Name string
	// Quantity is the quantity asked for, "dx", and Unit the unit as
	// written, "um" (empty for a column without a unit).
	Quantity, Unit string
}

// ReadColumns reads a CSV table with units in the column names (see
// [Columns] for the format) from r; source names r in messages (a file
// name, "" for "input"). It reads at most 64 MiB and [MaxColumnRows] data
// rows.
//
// It returns a [*ParamError] wrapping [ErrInput] that names the source and
// line for a missing header, an empty or repeated column name, a row with
// more or fewer cells than the header, or a CSV syntax error (a stray
// quote); an error from r is returned wrapped as it is. A header with no
// rows is not an error here; the functions that use the columns say how
// many rows they need.
func ReadColumns(r io.Reader, source string) (Columns, error) {
	c := Columns{Source: source}
	data, err := io.ReadAll(io.LimitReader(r, columnsMaxBytes+1))
	if err != nil {
		return Columns{}, fmt.Errorf("measure: %s: %w", c.where(), err)
	}
	if len(data) > columnsMaxBytes {
		return Columns{}, &ParamError{Where: c.where(), Param: "size", Reason: "input exceeds " + strconv.Itoa(columnsMaxBytes>>20) + " MiB", Err: ErrInput}
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = unitcsv.Separator(data)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	read := func() ([]string, int, error) {
		rec, err := cr.Read()
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, 0, &ParamError{Where: c.whereLine(pe.Line), Reason: "CSV syntax: " + pe.Err.Error(), Err: ErrInput}
			}
			return nil, 0, err
		}
		line, _ := cr.FieldPos(0)
		return rec, line, nil
	}
	header, hline, err := read()
	if err == io.EOF {
		return Columns{}, &ParamError{Where: c.where(), Param: "header", Reason: "no header line: the first line that is not a comment must name the columns with their units, for example z_mm,d_um", Err: ErrInput}
	}
	if err != nil {
		return Columns{}, err
	}
	for len(header) > 0 && strings.TrimSpace(header[len(header)-1]) == "" {
		header = header[:len(header)-1]
	}
	for j, h := range header {
		h = strings.TrimSpace(h)
		if h == "" {
			return Columns{}, &ParamError{Where: c.whereLine(hline), Param: "column " + strconv.Itoa(j+1), Reason: "has no name", Err: ErrInput}
		}
		for _, prev := range c.Names {
			if strings.EqualFold(prev, h) {
				return Columns{}, &ParamError{Where: c.whereLine(hline), Param: "column " + h, Reason: "appears twice in the header", Err: ErrInput}
			}
		}
		c.Names = append(c.Names, h)
	}
	if len(c.Names) == 0 {
		return Columns{}, &ParamError{Where: c.whereLine(hline), Param: "header", Reason: "names no columns", Err: ErrInput}
	}
	for {
		rec, line, err := read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return Columns{}, err
		}
		if unitcsv.AllEmpty(rec) {
			continue
		}
		for len(rec) > len(c.Names) && strings.TrimSpace(rec[len(rec)-1]) == "" {
			rec = rec[:len(rec)-1]
		}
		if len(rec) != len(c.Names) {
			return Columns{}, &ParamError{Where: c.whereLine(line), Param: "row", Value: len(rec),
				Reason: "cells, but the header has " + strconv.Itoa(len(c.Names)) + " (" + strings.Join(c.Names, ", ") + ")", Err: ErrInput}
		}
		if len(c.cells) == MaxColumnRows {
			return Columns{}, &ParamError{Where: c.whereLine(line), Param: "rows", Reason: "more than MaxColumnRows = " + strconv.Itoa(MaxColumnRows), Err: ErrInput}
		}
		c.cells = append(c.cells, rec)
		c.lines = append(c.lines, line)
	}
	return c, nil
}

// Len returns the number of data rows.
func (c Columns) Len() int { return len(c.cells) }

// Where returns how messages name data row i: "scan.csv line 7". It
// panics if i is out of range.
func (c Columns) Where(i int) string { return c.whereLine(c.lines[i]) }

func (c Columns) where() string {
	if c.Source == "" {
		return "input"
	}
	return c.Source
}

func (c Columns) whereLine(line int) string { return c.where() + " line " + strconv.Itoa(line) }

// Has reports whether the table has a column of quantity q (with any
// unit or none).
func (c Columns) Has(q string) bool {
	for _, n := range c.Names {
		if _, ok := unitcsv.Split(n, q); ok {
			return true
		}
	}
	return false
}

// Column returns the column of quantity q. It returns a [*ParamError]
// wrapping [ErrInput] if there is none (the message lists the columns
// there are) or if two columns give q ("z_mm" and "z_um").
func (c Columns) Column(q string) (Column, error) {
	col, found := Column{Index: -1}, ""
	for j, n := range c.Names {
		u, ok := unitcsv.Split(n, q)
		if !ok {
			continue
		}
		if found != "" {
			return Column{}, &ParamError{Where: c.where(), Param: "columns " + found + " and " + n, Reason: "both give " + q + "; keep one", Err: ErrInput}
		}
		col, found = Column{Index: j, Name: n, Quantity: q, Unit: u}, n
	}
	if found == "" {
		return Column{}, &ParamError{Where: c.where(), Param: "column " + q, Reason: "missing; the columns are " + strings.Join(c.Names, ", "), Err: ErrInput}
	}
	return col, nil
}

// Numbers returns the cells of the column of quantity q as numbers in the
// unit they are written in, and the column. It returns a [*ParamError]
// wrapping [ErrInput] for a missing column (see [Columns.Column]), an
// empty cell or one that is not a number, naming the line, and one
// wrapping [ErrNotPhysical] for a value that is not finite (NaN, Inf, or
// beyond the float64 range).
func (c Columns) Numbers(q string) ([]float64, Column, error) {
	col, err := c.Column(q)
	if err != nil {
		return nil, Column{}, err
	}
	out := make([]float64, len(c.cells))
	for i, row := range c.cells {
		s := strings.TrimSpace(row[col.Index])
		param := "column " + col.Name
		if s == "" {
			return nil, Column{}, &ParamError{Where: c.Where(i), Param: param, Reason: "empty cell", Err: ErrInput}
		}
		v, err := strconv.ParseFloat(s, 64)
		var ne *strconv.NumError
		if errors.As(err, &ne) && ne.Err == strconv.ErrSyntax {
			reason := "is not a number"
			if strings.Contains(s, ",") {
				reason += " (write decimals with a point, 1.5 not 1,5)"
			}
			return nil, Column{}, &ParamError{Where: c.Where(i), Param: param, Value: errtext.Quote(s), Reason: reason, Err: ErrInput}
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, Column{}, &ParamError{Where: c.Where(i), Param: param, Value: errtext.Quote(s), Reason: "must be a finite number", Err: ErrNotPhysical}
		}
		out[i] = v
	}
	return out, col, nil
}

// Lengths returns the column of quantity q in metres. Besides the errors
// of [Columns.Numbers] it returns a [*ParamError] wrapping [ErrInput] when
// the column has no unit, an angle unit ("z_deg"), or a unit that is not
// one of nm, um (µm, μm), mm, cm, m and in.
func (c Columns) Lengths(q string) ([]units.Length, error) {
	col, err := c.Column(q)
	if err != nil {
		return nil, err
	}
	toMetres, ok := unitcsv.Metres(col.Unit)
	if !ok {
		return nil, c.unitError(col, "a length", unitcsv.LengthList)
	}
	vs, _, err := c.Numbers(q)
	if err != nil {
		return nil, err
	}
	out := make([]units.Length, len(vs))
	for i, v := range vs {
		out[i] = units.Length(toMetres(v))
		if math.IsInf(float64(out[i]), 0) {
			return nil, &ParamError{Where: c.Where(i), Param: "column " + col.Name, Value: v, Reason: "overflows in metres", Err: ErrNotPhysical}
		}
	}
	return out, nil
}

// Angles returns the column of quantity q in radians. Besides the errors
// of [Columns.Numbers] it returns a [*ParamError] wrapping [ErrInput] when
// the column has no unit, a length unit, or a unit that is not one of
// rad, mrad, urad (µrad) and deg.
func (c Columns) Angles(q string) ([]units.Angle, error) {
	col, err := c.Column(q)
	if err != nil {
		return nil, err
	}
	k, ok := unitcsv.Radians(col.Unit)
	if !ok {
		return nil, c.unitError(col, "an angle", unitcsv.AngleList)
	}
	vs, _, err := c.Numbers(q)
	if err != nil {
		return nil, err
	}
	out := make([]units.Angle, len(vs))
	for i, v := range vs {
		out[i] = units.Angle(v * k)
	}
	return out, nil
}

// unitError explains why col's unit does not fit a quantity of kind what.
func (c Columns) unitError(col Column, what, list string) error {
	var reason string
	_, isLen := unitcsv.Metres(col.Unit)
	_, isAngle := unitcsv.Radians(col.Unit)
	switch {
	case col.Unit == "":
		reason = "has no unit; " + col.Quantity + " is " + what + ": name the column " + col.Quantity + "_<unit> with <unit> one of " + list
	case isLen:
		reason = col.Unit + " is a length unit, but " + col.Quantity + " is " + what + " (" + list + ")"
	case isAngle:
		reason = col.Unit + " is an angle unit, but " + col.Quantity + " is " + what + " (" + list + ")"
	default:
		reason = "unit " + strconv.Quote(col.Unit) + " is not understood; " + col.Quantity + " is " + what + " (" + list + ")"
	}
	return &ParamError{Where: c.where(), Param: "column " + col.Name, Reason: reason, Err: ErrInput}
}
