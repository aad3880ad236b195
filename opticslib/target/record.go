package target

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// A Record is the plain-text record of a design's targets, one line per
// target in the order the design states them, units in every line, so
// that a version-control diff shows a design change:
//
//	# beamnote design record: 01-imaging-relay.ipynb
//	# produced by: beamnote 1a2b3c4, go1.26.8, 2026-12-02T06:10:00Z
//	# target<TAB>value<TAB>wanted<TAB>result
//	relay magnification<TAB>-2.00031<TAB>-2 ± 0.01<TAB>met
//	relay working distance<TAB>24.3102 mm<TAB>20 … 30 mm<TAB>met
//
// Values keep [Digits] significant digits. The header says what produced
// the record; [Compare] ignores it.
type Record struct {
	// Source names what the targets come from (a notebook file name).
	Source string
	// Producer says what produced the record: the beamnote commit, the Go
	// version and the date (UTC).
	Producer string
	// Targets are the targets in the order stated.
	Targets []Target
}

const (
	recordTitle    = "# beamnote design record: "
	recordProducer = "# produced by: "
	recordColumns  = "# target\tvalue\twanted\tresult"
)

// RecordLine returns t's line in a [Record]: name, value, wanted range
// and result, tab-separated, units in the line. [ParseRecordLine] reads it
// back.
func (t Target) RecordLine() string {
	result := "met"
	if !t.Met() {
		result = "MISSED: " + t.Problem()
	}
	return clean(t.Name) + "\t" + t.ValueText() + "\t" + t.Wanted() + "\t" + result
}

// clean replaces tabs and line breaks in a name by spaces, so that a
// record line stays one line of four fields.
func clean(s string) string {
	return strings.Map(func(r rune) rune {
		if r == '\t' || r == '\n' || r == '\r' {
			return ' '
		}
		return r
	}, s)
}

// WriteTo writes the record in its text form.
func (r Record) WriteTo(w io.Writer) (int64, error) {
	var b strings.Builder
	b.WriteString(recordTitle + clean(r.Source) + "\n")
	b.WriteString(recordProducer + clean(r.Producer) + "\n")
	b.WriteString(recordColumns + "\n")
	for _, t := range r.Targets {
		b.WriteString(t.RecordLine() + "\n")
	}
	n, err := io.WriteString(w, b.String())
	return int64(n), err
}

// String returns the record's text form.
func (r Record) String() string {
	var b strings.Builder
	r.WriteTo(&b)
	return b.String()
}

// LineError is an error in line Line (from 1) of a record.
type LineError struct {
	Line   int
	Text   string
	Reason string
}

func (e *LineError) Error() string {
	return "target: record line " + strconv.Itoa(e.Line) + " " + strconv.Quote(e.Text) + ": " + e.Reason
}

// ReadRecord reads a record in the form [Record.WriteTo] writes. Blank
// lines and other comment lines are skipped; a line that is not a target
// is a [*LineError].
func ReadRecord(rd io.Reader) (Record, error) {
	var r Record
	sc := bufio.NewScanner(rd)
	sc.Buffer(make([]byte, 0, 64<<10), 1<<20)
	n := 0
	for sc.Scan() {
		n++
		s := strings.TrimRight(sc.Text(), "\r")
		switch {
		case strings.HasPrefix(s, recordTitle):
			r.Source = strings.TrimPrefix(s, recordTitle)
			continue
		case strings.HasPrefix(s, recordProducer):
			r.Producer = strings.TrimPrefix(s, recordProducer)
			continue
		case strings.TrimSpace(s) == "" || strings.HasPrefix(s, "#"):
			continue
		}
		t, err := ParseRecordLine(s)
		if err != nil {
			return Record{}, &LineError{Line: n, Text: s, Reason: err.Error()}
		}
		r.Targets = append(r.Targets, t)
	}
	if err := sc.Err(); err != nil {
		return Record{}, fmt.Errorf("target: reading record: %w", err)
	}
	return r, nil
}

// symbols maps the display unit symbols to the SI unit and its factor.
var symbols = map[string]struct {
	unit   string
	factor float64
}{
	"":     {"", 1},
	"nm":   {"m", 1e-9},
	"µm":   {"m", 1e-6},
	"um":   {"m", 1e-6},
	"mm":   {"m", 1e-3},
	"m":    {"m", 1},
	"µrad": {"rad", 1e-6},
	"mrad": {"rad", 1e-3},
	"rad":  {"rad", 1},
}

// quantity parses "<number>[ <unit>]" to an SI value and its SI unit.
func quantity(s string) (float64, string, error) {
	s = strings.TrimSpace(s)
	num, sym, _ := strings.Cut(s, " ")
	v, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, "", errors.New("value " + strconv.Quote(s) + " is not a number with a unit")
	}
	u, ok := symbols[strings.TrimSpace(sym)]
	if !ok {
		return 0, "", errors.New("unit " + strconv.Quote(sym) + " is not one of nm, µm, mm, m, µrad, mrad, rad or none")
	}
	return v * u.factor, u.unit, nil
}

// ParseRecordLine parses one target line of a record (see
// [Target.RecordLine]). The value's unit and the wanted range's must be of
// one kind (both lengths, both angles or both plain numbers).
func ParseRecordLine(s string) (Target, error) {
	f := strings.Split(s, "\t")
	if len(f) != 4 {
		return Target{}, errors.New("has " + strconv.Itoa(len(f)) + " tab-separated fields, want 4 (target, value, wanted, result)")
	}
	t := Target{Name: f[0], Want: math.NaN()}
	if strings.TrimSpace(t.Name) == "" {
		return Target{}, errors.New("has no target name")
	}
	v, unit, err := quantity(f[1])
	if err != nil {
		return Target{}, err
	}
	t.Value, t.Unit = v, unit
	// The wanted range carries its unit once, at the end: the factor of
	// the last field applies to the first number too.
	w := strings.TrimSpace(f[2])
	same := func(u string) error {
		if u != unit {
			return errors.New("wanted range " + strconv.Quote(w) + " is in " + describe(u) + ", the value in " + describe(unit))
		}
		return nil
	}
	scaled := func(a, rest string) (float64, float64, error) {
		b, u, err := quantity(rest)
		if err != nil {
			return 0, 0, err
		}
		if err := same(u); err != nil {
			return 0, 0, err
		}
		_, sym, _ := strings.Cut(strings.TrimSpace(rest), " ")
		x, err := strconv.ParseFloat(strings.TrimSpace(a), 64)
		if err != nil {
			return 0, 0, errors.New("wanted range " + strconv.Quote(w) + ": " + strconv.Quote(a) + " is not a number")
		}
		return x * symbols[strings.TrimSpace(sym)].factor, b, nil
	}
	// limit parses the one limit of a one-sided range.
	limit := func(s string) (float64, error) {
		v, u, err := quantity(s)
		if err == nil {
			err = same(u)
		}
		return v, err
	}
	switch {
	case strings.HasPrefix(w, "≥ "):
		lo, err := limit(strings.TrimPrefix(w, "≥ "))
		if err != nil {
			return Target{}, err
		}
		t.Kind, t.Lo, t.Hi = KindAtLeast, lo, math.Inf(1)
	case strings.HasPrefix(w, "≤ "):
		hi, err := limit(strings.TrimPrefix(w, "≤ "))
		if err != nil {
			return Target{}, err
		}
		t.Kind, t.Lo, t.Hi = KindAtMost, math.Inf(-1), hi
	case strings.Contains(w, " ± "):
		a, b, _ := strings.Cut(w, " ± ")
		want, tol, err := scaled(a, b)
		if err != nil {
			return Target{}, err
		}
		t.Kind, t.Want, t.Tol, t.Lo, t.Hi = KindNear, want, tol, want-tol, want+tol
	case strings.Contains(w, " … "):
		a, b, _ := strings.Cut(w, " … ")
		lo, hi, err := scaled(a, b)
		if err != nil {
			return Target{}, err
		}
		t.Kind, t.Lo, t.Hi, t.Want, t.Tol = KindBetween, lo, hi, lo+(hi-lo)/2, (hi-lo)/2
	default:
		return Target{}, errors.New("wanted range " + strconv.Quote(w) + " is not \"a ± tol\", \"lo … hi\", \"≥ min\" or \"≤ max\"")
	}
	return t, nil
}

func describe(unit string) string {
	switch unit {
	case "m":
		return "a length unit"
	case "rad":
		return "an angle unit"
	}
	return "no unit (a plain number)"
}

// A Change is a target whose value moved between two records, or that one
// of them lacks.
type Change struct {
	// Name is the target's name.
	Name string
	// Old and New are the target in the older and the newer record; a
	// zero Target (empty Name) where a record lacks it.
	Old, New Target
	// Reason says what changed: "moved by 0.21 mm (tolerance 0.1 mm)",
	// "now missed", "now met", "new target", "no longer stated", "unit
	// changed from mm to rad".
	Reason string
}

// String returns "<name>: <reason> (<old value> → <new value>)".
func (c Change) String() string {
	s := c.Name + ": " + c.Reason
	switch {
	case c.Old.Name != "" && c.New.Name != "":
		s += " (" + c.Old.ValueText() + " → " + c.New.ValueText() + ")"
	case c.New.Name != "":
		s += " (" + c.New.ValueText() + ")"
	case c.Old.Name != "":
		s += " (was " + c.Old.ValueText() + ")"
	}
	return s
}

// Compare lists what changed from the record old to the record new, in
// new's order, then the targets old has and new lacks. Targets are
// matched by name (the k-th of a repeated name with the k-th). A target
// changed if its value moved by more than its tolerance (Tol; a
// one-sided target, which has none: if its recorded digits differ), if it
// passed and now misses or the reverse, or if its unit changed.
func Compare(old, new Record) []Change {
	type key struct {
		name string
		k    int
	}
	keys := func(ts []Target) []key {
		seen := map[string]int{}
		ks := make([]key, len(ts))
		for i, t := range ts {
			ks[i] = key{t.Name, seen[t.Name]}
			seen[t.Name]++
		}
		return ks
	}
	oldKeys := keys(old.Targets)
	byKey := make(map[key]Target, len(old.Targets))
	for i, t := range old.Targets {
		byKey[oldKeys[i]] = t
	}
	var out []Change
	newKeys := keys(new.Targets)
	matched := map[key]bool{}
	for i, t := range new.Targets {
		o, ok := byKey[newKeys[i]]
		if !ok {
			out = append(out, Change{Name: t.Name, New: t, Reason: "new target"})
			continue
		}
		matched[newKeys[i]] = true
		if r := changed(o, t); r != "" {
			out = append(out, Change{Name: t.Name, Old: o, New: t, Reason: r})
		}
	}
	for i, t := range old.Targets {
		if !matched[oldKeys[i]] {
			out = append(out, Change{Name: t.Name, Old: t, Reason: "no longer stated"})
		}
	}
	return out
}

// changed returns why target o became t, "" if it did not change.
func changed(o, t Target) string {
	switch {
	case o.Unit != t.Unit:
		return "unit changed from " + describe(o.Unit) + " to " + describe(t.Unit)
	case o.Met() && !t.Met():
		return "now missed: " + t.Problem()
	case !o.Met() && t.Met():
		return "now met"
	}
	d := t.Value - o.Value
	tol := t.Tol
	if t.Kind == KindAtLeast || t.Kind == KindAtMost {
		if o.ValueText() != t.ValueText() {
			return "moved by " + signed(t, d) + " (one-sided target: no tolerance)"
		}
		return ""
	}
	if math.Abs(d) > tol || d != d {
		return "moved by " + signed(t, d) + " (tolerance " + t.format(tol) + ")"
	}
	return ""
}

func signed(t Target, d float64) string {
	if d >= 0 {
		return "+" + t.format(d)
	}
	return "−" + t.format(-d)
}
