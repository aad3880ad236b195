// Package table holds the one table type of beamnote: a caption, a header
// row whose column names carry their units, and rows of already formatted
// cells. The physics packages return their reports as a [Table]; the
// notebook layer (kernel/nb) renders it as HTML, and [Table.Text] renders it
// as aligned plain text for terminals and logs.
//
// # Cell conventions
//
// Lengths are formatted by the producer in the unit its header names (for
// example "z (mm)"), a flat surface or wavefront as "∞", and an empty cell
// means "not applicable". Cells are plain text; renderers escape them.
package table

import (
	"strconv"
	"strings"
	"unicode/utf8"
)

// Table is a small report table.
type Table struct {
	// Caption is the title line; it may be empty.
	Caption string
	// Header holds the column names, with units in parentheses.
	Header []string
	// Rows holds the data cells, one slice per row. Rows shorter than the
	// header are padded with empty cells; extra cells are dropped by the
	// renderers (see [Table.Validate]).
	Rows [][]string
}

// Validate returns an error if a row has more cells than the header.
func (t Table) Validate() error {
	for i, r := range t.Rows {
		if len(r) > len(t.Header) {
			return &RowError{Caption: t.Caption, Row: i, Cells: len(r), Header: len(t.Header)}
		}
	}
	return nil
}

// RowError reports a row with more cells than the header.
type RowError struct {
	Caption            string
	Row, Cells, Header int
}

// Error implements the error interface.
func (e *RowError) Error() string {
	return "table " + strconv.Quote(e.Caption) + ": row " + strconv.Itoa(e.Row) + " has " + strconv.Itoa(e.Cells) + " cells, header has " + strconv.Itoa(e.Header)
}

// Cell returns the cell of row i in column j, or "" beyond the row's end.
func (t Table) Cell(i, j int) string {
	if i < len(t.Rows) && j < len(t.Rows[i]) {
		return t.Rows[i][j]
	}
	return ""
}

// Text renders t with columns aligned on rune counts, the caption on the
// first line, a rule of dashes under the header and no trailing spaces.
func (t Table) Text() string {
	width := make([]int, len(t.Header))
	for j, h := range t.Header {
		width[j] = utf8.RuneCountInString(h)
		for i := range t.Rows {
			width[j] = max(width[j], utf8.RuneCountInString(t.Cell(i, j)))
		}
	}
	var b strings.Builder
	if t.Caption != "" {
		b.WriteString(t.Caption + "\n")
	}
	line := func(cell func(j int) string) {
		var l strings.Builder
		for j := range t.Header {
			c := cell(j)
			if j > 0 {
				l.WriteString("  ")
			}
			l.WriteString(c)
			l.WriteString(strings.Repeat(" ", width[j]-utf8.RuneCountInString(c)))
		}
		b.WriteString(strings.TrimRight(l.String(), " "))
		b.WriteString("\n")
	}
	line(func(j int) string { return t.Header[j] })
	line(func(j int) string { return strings.Repeat("-", width[j]) })
	for i := range t.Rows {
		line(func(j int) string { return t.Cell(i, j) })
	}
	return b.String()
}

// String returns [Table.Text], so that fmt prints a table readably.
func (t Table) String() string { return t.Text() }
