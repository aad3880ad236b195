package stock

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/internal/unitcsv"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Limits of [Read].
const (
	// MaxLenses is the largest number of lens rows a stock file may hold.
	MaxLenses = 10000
	// maxBytes is the largest stock file read, 4 MiB.
	maxBytes = 4 << 20
)

// The columns of a stock file: the quantity, whether it is a length (its
// name must then carry a unit), and the canonical name used in messages
// when the column is absent.
type column int

const (
	colLabel column = iota
	colKind
	colFocal
	colR1
	colR2
	colCT
	colDiameter
	colMaterial
	colIndex
	colCount
	colNote
	numColumns
)

var columns = [numColumns]struct {
	quantity string
	length   bool
	about    string
}{
	colLabel:    {"label", false, "the lens's name, unique in the file"},
	colKind:     {"kind", false, kindList()},
	colFocal:    {"f", true, "focal length"},
	colR1:       {"r1", true, "front radius (inf for flat)"},
	colR2:       {"r2", true, "back radius (inf for flat)"},
	colCT:       {"ct", true, "centre thickness"},
	colDiameter: {"diameter", true, "outer diameter"},
	colMaterial: {"material", false, glassList() + ", or any name with an index"},
	colIndex:    {"index", false, "refractive index"},
	colCount:    {"count", false, "how many the lab owns"},
	colNote:     {"note", false, "free text"},
}

// columnHelp lists the stock columns for messages.
func columnHelp() string {
	var parts []string
	for _, c := range columns {
		n := c.quantity
		if c.length {
			n += "_<unit>"
		}
		parts = append(parts, n)
	}
	return strings.Join(parts, ", ")
}

// Read reads a stock file from r; source names r in messages (a file
// name; "" for "input"). The format:
//
//	# Optics drawer B, room 2.14 (invented); radii: R > 0 when the centre
//	# of curvature lies after the surface, inf for a flat side
//	label,kind,f_mm,r1_mm,r2_mm,ct_mm,diameter_mm,material,count,note
//	PCX-050-A,plano-convex,50,,,,25.4,N-BK7,2,
//	BCX-100-A,biconvex,,102.4,-102.4,3.6,25.4,N-BK7,1,"scratch at edge, fine for alignment"
//	ACH-200-A,achromat,200,,,,25.4,,1,cemented doublet
//
// # Format
//
// The first line that is neither blank nor a comment (#) is the header;
// the separator is a comma, a semicolon or a tab, whichever the header
// contains most often; cells may be quoted as CSV allows ("a, b"). Rows
// with every cell empty are skipped. A UTF-8 byte order mark is removed.
//
// The columns, in any order, matched without regard to case:
//
//	label          required, unique: the lens's name
//	kind           required: plano-convex, biconvex, plano-concave,
//	               biconcave, meniscus or achromat
//	f_<unit>       focal length, positive for a converging lens
//	r1_<unit>      front radius; r2_<unit> back radius: positive when the
//	               centre of curvature lies after the surface, towards
//	               where the light goes (package paraxial's convention),
//	               so a biconvex lens has r1 > 0 > r2; inf, ∞ or flat
//	               for a flat side
//	ct_<unit>      centre thickness (needed with the radii)
//	diameter_<unit> required: outer diameter
//	material       N-BK7, fused silica or N-SF11 (see [GlassIndex]), or
//	               any name when index is given
//	index          refractive index; overrides the material's nd
//	count          required: how many the lab owns (a whole number ≥ 1)
//	note           free text
//
// A length column's name carries its unit as quantity_unit, quantity
// (unit) or quantity [unit]: nm, um (µm), mm, cm, m or in (25.4 mm).
// Each row gives f, or r1, r2 and ct, or both (see [Spec] and
// [LensFromSpec] for how each is used and checked); an empty cell is
// "not given". An unknown column is an error (put remarks in note).
//
// It returns a [*ParamError] wrapping [ErrInput] (or [ErrNotPhysical]) that
// names the source and line, the column, and the value with its unit: a
// missing header or required column, an unknown or repeated column, a
// length column without a unit, a cell that is not a number, a label
// used twice, and every error of [LensFromSpec]; one wrapping [ErrEmpty]
// for a file without lens rows. An error from r is returned wrapped.
func Read(r io.Reader, source string) (Stock, error) {
	if source == "" {
		source = "input"
	}
	data, err := io.ReadAll(io.LimitReader(r, maxBytes+1))
	if err != nil {
		return Stock{}, fmt.Errorf("stock: %s: %w", source, err)
	}
	if len(data) > maxBytes {
		return Stock{}, &ParamError{Where: source, Param: "size", Reason: "exceeds " + strconv.Itoa(maxBytes>>20) + " MiB: not a stock file", Err: ErrInput}
	}
	// The CSV framing below (separator choice, comments, byte order mark,
	// line numbers) follows measure.ReadColumns, whose cell accessors
	// parse numbers only; a stock file also holds text and empty cells.
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = unitcsv.Separator(data)
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	at := func(line int) string { return source + " line " + strconv.Itoa(line) }
	read := func() ([]string, int, error) {
		rec, err := cr.Read()
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, 0, &ParamError{Where: at(pe.Line), Reason: "CSV syntax: " + pe.Err.Error(), Err: ErrInput}
			}
			return nil, 0, err
		}
		line, _ := cr.FieldPos(0)
		return rec, line, nil
	}
	header, hline, err := read()
	if err == io.EOF {
		return Stock{}, &ParamError{Where: source, Param: "header", Reason: "no header line: the first line that is not a comment must name the columns (" + columnHelp() + ")", Err: ErrEmpty}
	}
	if err != nil {
		return Stock{}, err
	}
	for len(header) > 0 && strings.TrimSpace(header[len(header)-1]) == "" {
		header = header[:len(header)-1]
	}
	h, err := parseHeader(header, at(hline))
	if err != nil {
		return Stock{}, err
	}
	st := Stock{Source: source}
	seen := map[string]int{}
	for {
		rec, line, err := read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return Stock{}, err
		}
		if unitcsv.AllEmpty(rec) {
			continue
		}
		for len(rec) > len(header) && strings.TrimSpace(rec[len(rec)-1]) == "" {
			rec = rec[:len(rec)-1]
		}
		if len(rec) != len(header) {
			return Stock{}, &ParamError{Where: at(line), Param: "row", Value: len(rec),
				Reason: "cells, but the header has " + strconv.Itoa(len(header)) + " (" + strings.Join(header, ", ") + ")", Err: ErrInput}
		}
		if len(st.Lenses) == MaxLenses {
			return Stock{}, &ParamError{Where: at(line), Param: "rows", Reason: "more than MaxLenses = " + strconv.Itoa(MaxLenses), Err: ErrInput}
		}
		l, err := h.lens(rec, at(line))
		if err != nil {
			return Stock{}, err
		}
		key := strings.ToLower(l.Label)
		if prev, ok := seen[key]; ok {
			return Stock{}, &ParamError{Where: at(line), Param: h.names.label, Value: errtext.Quote(l.Label),
				Reason: "is used twice (first on line " + strconv.Itoa(prev) + "); labels must be unique", Err: ErrInput}
		}
		seen[key] = line
		st.Lenses = append(st.Lenses, l)
	}
	if len(st.Lenses) == 0 {
		return Stock{}, &ParamError{Where: source, Reason: "has a header but no lens rows", Err: ErrEmpty}
	}
	return st, nil
}

// ReadFile reads the stock file at path with [Read]; messages name the
// file by its base name. It returns a [*ParamError] wrapping [ErrInput]
// and the os error (errors.Is(err, fs.ErrNotExist) works) for a file that
// cannot be opened.
func ReadFile(path string) (Stock, error) {
	f, err := os.Open(path)
	if err != nil {
		return Stock{}, &ParamError{Where: path, Reason: "cannot be opened", Err: fmt.Errorf("%w (%w)", ErrInput, err)}
	}
	defer f.Close()
	return Read(f, filepath.Base(path))
}

// header is a parsed stock header: the cell index of each column (−1 when
// absent), the metres per unit of each length column, and the names used
// in messages.
type header struct {
	index    [numColumns]int
	toMetres [numColumns]func(float64) float64
	names    fieldNames
	name     [numColumns]string
}

func parseHeader(cells []string, where string) (header, error) {
	var h header
	for i := range h.index {
		h.index[i] = -1
	}
	for j, raw := range cells {
		name := strings.TrimSpace(raw)
		if name == "" {
			return header{}, &ParamError{Where: where, Param: "column " + strconv.Itoa(j+1), Reason: "has no name", Err: ErrInput}
		}
		found := false
		for c, def := range columns {
			u, ok := unitcsv.Split(name, def.quantity)
			if !ok {
				continue
			}
			found = true
			if h.index[c] >= 0 {
				return header{}, &ParamError{Where: where, Param: "column " + name, Reason: "repeats column " + h.name[c] + "; keep one", Err: ErrInput}
			}
			switch {
			case def.length && u == "":
				return header{}, &ParamError{Where: where, Param: "column " + name, Reason: "has no unit; it is a length: name it " + def.quantity + "_<unit> with <unit> one of " + unitcsv.LengthList, Err: ErrInput}
			case def.length:
				k, ok := unitcsv.Metres(u)
				if !ok {
					return header{}, &ParamError{Where: where, Param: "column " + name, Reason: "unit " + strconv.Quote(u) + " is not a length unit (" + unitcsv.LengthList + ")", Err: ErrInput}
				}
				h.toMetres[c] = k
			case u != "":
				return header{}, &ParamError{Where: where, Param: "column " + name, Reason: def.quantity + " has no unit; name the column " + def.quantity, Err: ErrInput}
			}
			h.index[c], h.name[c] = j, name
		}
		if !found {
			return header{}, &ParamError{Where: where, Param: "column " + errtext.Quote(name), Reason: "is not a stock column; the columns are " + columnHelp() + " (put remarks in note)", Err: ErrInput}
		}
	}
	for _, c := range []column{colLabel, colKind, colDiameter, colCount} {
		if h.index[c] < 0 {
			n := columns[c].quantity
			if columns[c].length {
				n += "_<unit>"
			}
			return header{}, &ParamError{Where: where, Param: "column " + n, Reason: "missing (" + columns[c].about + "); the columns are " + columnHelp(), Err: ErrInput}
		}
	}
	if h.index[colFocal] < 0 && h.index[colR1] < 0 {
		return header{}, &ParamError{Where: where, Param: "columns f_<unit> and r1_<unit>", Reason: "both missing: give the focal length, or the radii r1, r2 and thickness ct", Err: ErrInput}
	}
	for c := range h.name {
		if h.name[c] == "" {
			h.name[c] = columns[c].quantity
			if columns[c].length {
				h.name[c] += "_mm"
			}
		}
	}
	c := func(i column) string { return "column " + h.name[i] }
	h.names = fieldNames{label: c(colLabel), kind: c(colKind), focal: c(colFocal), r1: c(colR1), r2: c(colR2),
		ct: c(colCT), diameter: c(colDiameter), material: c(colMaterial), index: c(colIndex), count: c(colCount)}
	return h, nil
}

// lens parses one row.
func (h header) lens(rec []string, where string) (Lens, error) {
	cell := func(c column) string {
		if h.index[c] < 0 {
			return ""
		}
		return strings.TrimSpace(rec[h.index[c]])
	}
	bad := func(c column, s, reason string) error {
		return &ParamError{Where: where, Param: "column " + h.name[c], Value: errtext.Quote(s), Reason: reason, Err: ErrInput}
	}
	number := func(c column) (float64, error) {
		s := cell(c)
		if s == "" {
			return 0, nil
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			reason := "is not a number"
			if strings.Contains(s, ",") {
				reason += " (write decimals with a point, 1.5 not 1,5)"
			}
			var ne *strconv.NumError
			if errors.As(err, &ne) && ne.Err == strconv.ErrRange {
				reason = "is out of the float64 range"
			}
			return 0, bad(c, s, reason)
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, bad(c, s, "must be a finite number")
		}
		return v, nil
	}
	length := func(c column) (units.Length, error) {
		if c == colR1 || c == colR2 {
			switch strings.ToLower(strings.TrimLeft(cell(c), "+-")) {
			case "inf", "infinity", "∞", "flat":
				return paraxial.Flat, nil
			}
		}
		v, err := number(c)
		if err != nil || h.toMetres[c] == nil { // an absent column reads as 0
			return 0, err
		}
		return units.Length(h.toMetres[c](v)), nil
	}
	var s Spec
	var err error
	s.Label, s.Material, s.Note = cell(colLabel), cell(colMaterial), cell(colNote)
	if k := cell(colKind); k == "" {
		return Lens{}, &ParamError{Where: where, Param: "column " + h.name[colKind], Reason: "empty: say the kind (" + kindList() + ")", Err: ErrInput}
	} else if s.Kind, err = kindOf(k); err != nil {
		return Lens{}, bad(colKind, k, "is not a kind of lens ("+kindList()+")")
	}
	for _, f := range []struct {
		c   column
		dst *units.Length
	}{{colFocal, &s.Focal}, {colR1, &s.R1}, {colR2, &s.R2}, {colCT, &s.Thickness}, {colDiameter, &s.Diameter}} {
		if *f.dst, err = length(f.c); err != nil {
			return Lens{}, err
		}
		if f.c == colDiameter && cell(f.c) == "" {
			return Lens{}, &ParamError{Where: where, Param: "column " + h.name[f.c], Reason: "empty: every lens needs its diameter", Err: ErrInput}
		}
	}
	if s.Index, err = number(colIndex); err != nil {
		return Lens{}, err
	}
	switch c := cell(colCount); c {
	case "":
		return Lens{}, &ParamError{Where: where, Param: "column " + h.name[colCount], Reason: "empty: say how many the lab owns", Err: ErrInput}
	default:
		n, err := strconv.Atoi(c)
		if err != nil {
			return Lens{}, bad(colCount, c, "is not a whole number")
		}
		s.Count = n
	}
	l, err := makeLens(s, where, h.names)
	if err != nil {
		return Lens{}, err
	}
	l.Where = where
	return l, nil
}

func kindOf(s string) (Kind, error) {
	k, ok := ParseKind(s)
	if !ok {
		return 0, ErrInput
	}
	return k, nil
}
