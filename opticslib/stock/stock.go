package stock

import (
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Stock is the lenses a lab owns, in the order of its file.
type Stock struct {
	// Source names where the stock was read ("lens-drawer.csv"), "" for
	// one made in code.
	Source string
	// Lenses holds one entry per kind of lens owned, each with its
	// count.
	Lenses []Lens
}

// Len returns the number of entries (not the number of lenses: see
// [Stock.Count]).
func (s Stock) Len() int { return len(s.Lenses) }

// Count returns the number of lenses owned, the sum of the counts.
func (s Stock) Count() int {
	n := 0
	for _, l := range s.Lenses {
		n += l.Count
	}
	return n
}

// Lens returns the entry labelled label (matched without regard to case)
// and whether there is one.
func (s Stock) Lens(label string) (Lens, bool) {
	for _, l := range s.Lenses {
		if strings.EqualFold(l.Label, label) {
			return l, true
		}
	}
	return Lens{}, false
}

func (s Stock) where() string {
	if s.Source == "" {
		return "stock"
	}
	return "stock " + s.Source
}

// Validate checks every lens ([Lens.Validate]) and that no label is used
// twice (without regard to case). It returns a [*ParamError] wrapping
// [ErrEmpty] for a stock without lenses.
func (s Stock) Validate() error {
	if len(s.Lenses) == 0 {
		return &ParamError{Where: s.where(), Reason: "has no lenses", Err: ErrEmpty}
	}
	seen := map[string]bool{}
	for _, l := range s.Lenses {
		if err := l.Validate(); err != nil {
			return err
		}
		k := strings.ToLower(l.Label)
		if seen[k] {
			return &ParamError{Where: s.where(), Param: "label", Value: errtext.Quote(l.Label), Reason: "is used by two entries; labels must be unique", Err: ErrInput}
		}
		seen[k] = true
	}
	return nil
}

// Table returns one row per entry: label, kind, focal length, radii and
// thickness (empty when not given; "∞" for a flat side), diameter, clear
// diameter, index, count and note. Radii derived from the focal length are
// shown in parentheses.
func (s Stock) Table() table.Table {
	t := table.Table{
		Caption: "Lens stock",
		Header:  []string{"label", "kind", "f (mm)", "R1 (mm)", "R2 (mm)", "ct (mm)", "Ø (mm)", "clear Ø (mm)", "index", "count", "note"},
	}
	if s.Source != "" {
		t.Caption += " " + s.Source
	}
	t.Caption += " (" + strconv.Itoa(len(s.Lenses)) + " entries, " + strconv.Itoa(s.Count()) + " lenses)"
	mm := func(l units.Length, dec int) string { return table.In(l, units.Millimeter, dec) }
	for _, l := range s.Lenses {
		r1, r2, ct, n := "", "", "", ""
		if l.Kind != Achromat {
			r1, r2 = mm(l.R1, 2), mm(l.R2, 2)
			if !l.FromRadii {
				r1, r2 = "("+r1+")", "("+r2+")"
			}
			n = strconv.FormatFloat(l.Index, 'f', 4, 64)
		} else if l.Index > 0 {
			n = strconv.FormatFloat(l.Index, 'f', 4, 64)
		}
		if l.Thickness > 0 {
			ct = mm(l.Thickness, 2)
		}
		kind := l.Kind.String()
		if l.Material != "" {
			kind += ", " + l.Material
		}
		t.Rows = append(t.Rows, []string{l.Label, kind, mm(l.Focal, 2), r1, r2, ct, mm(l.Diameter, 1), mm(2*l.ClearRadius(), 2), n, strconv.Itoa(l.Count), l.Note})
	}
	return t
}

// String returns the table as text.
func (s Stock) String() string { return s.Table().Text() }
