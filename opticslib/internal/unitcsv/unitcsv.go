// Package unitcsv holds the rules that the CSV readers of the opticslib
// packages (measure's tables, stock's lens drawers) share for files with
// units in the column names: the separator, blank rows, a column name's
// unit ("z_mm", "w (um)", "x [in]") and the length and angle units.
package unitcsv

import (
	"bytes"
	"math"
	"strings"
)

// Separator returns the separator of the header line of data: the most
// frequent of ',', ';' and '\t' on the first line that is neither blank
// nor a comment ('#'), ',' when there is none and on ties.
func Separator(data []byte) rune {
	for line := range bytes.Lines(data) {
		l := bytes.TrimSpace(line)
		if len(l) == 0 || l[0] == '#' {
			continue
		}
		best, n := ',', bytes.Count(line, []byte{','})
		for _, sep := range []rune{';', '\t'} {
			if k := bytes.Count(line, []byte(string(sep))); k > n {
				best, n = sep, k
			}
		}
		return best
	}
	return ','
}

// AllEmpty reports whether every cell of rec is blank.
func AllEmpty(rec []string) bool {
	for _, s := range rec {
		if strings.TrimSpace(s) != "" {
			return false
		}
	}
	return true
}

// Split returns the unit of column name for quantity q, and whether name
// is a column of q: q itself (no unit), q_unit with no further
// underscore in unit, q (unit) or q [unit]; q is matched without regard
// to case.
func Split(name, q string) (unit string, ok bool) {
	if strings.EqualFold(name, q) {
		return "", true
	}
	if len(name) <= len(q) || !strings.EqualFold(name[:len(q)], q) {
		return "", false
	}
	rest := name[len(q):]
	if rest[0] == '_' {
		u := rest[1:]
		return u, u != "" && !strings.ContainsAny(u, "_ ([")
	}
	rest = strings.TrimSpace(rest)
	for _, br := range []string{"()", "[]"} {
		if len(rest) >= 2 && rest[0] == br[0] && rest[len(rest)-1] == br[1] {
			u := strings.TrimSpace(rest[1 : len(rest)-1])
			return u, u != ""
		}
	}
	return "", false
}

// lengthUnits are the length units by lower-case symbol, as the number of
// units per metre (an exact integer, so that a division converts with one
// rounding: "150" mm is exactly 0.15 m) or, for the inch, minus the
// metres per unit (0.0254 m exactly, by the 1959 international yard).
var lengthUnits = map[string]float64{
	"nm": 1e9, "um": 1e6, "µm": 1e6, "μm": 1e6, "mm": 1e3, "cm": 1e2, "m": 1, "in": -0.0254,
}

// angleUnits are the angle units by lower-case symbol, in radians per
// unit.
var angleUnits = map[string]float64{
	"rad": 1, "mrad": 1e-3, "urad": 1e-6, "µrad": 1e-6, "μrad": 1e-6, "deg": math.Pi / 180, "°": math.Pi / 180,
}

// The units Metres and Radians accept, for messages.
const (
	LengthList = "nm, um (µm), mm, cm, m or in"
	AngleList  = "rad, mrad, urad (µrad) or deg"
)

// Metres returns a converter of values in the length unit u (any case) to
// metres, and whether u is a length unit.
func Metres(u string) (func(v float64) float64, bool) {
	k, ok := lengthUnits[strings.ToLower(u)]
	if !ok {
		return nil, false
	}
	if k < 0 {
		return func(v float64) float64 { return v * -k }, true
	}
	return func(v float64) float64 { return v / k }, true
}

// Radians returns the number of radians per unit of the angle unit u (any
// case), and whether u is an angle unit.
func Radians(u string) (float64, bool) {
	k, ok := angleUnits[strings.ToLower(u)]
	return k, ok
}
