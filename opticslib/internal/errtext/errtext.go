// Package errtext formats the parameter errors of the optics packages
// (paraxial, beam, wave) in one way:
//
//	pkg: subject: parameter = value unit: reason: cause
//
// so that every message names where the problem is, the parameter, and the
// value with its unit. Values are formatted by [Value].
package errtext

import (
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Value formats v for an error message: a [units.Length] with its unit
// ("12.7 mm"), a [units.Angle] in degrees and radians ("95° (1.65806
// rad)"), since users type angles in either, a float64 with 'g' and all
// digits, an int in decimal, a complex128 as (re+imi), a string as it is, and a fmt.Stringer by its
// String method. A nil value gives "".
func Value(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case units.Length:
		return x.String()
	case units.Angle:
		return strconv.FormatFloat(x.Degrees(), 'g', 6, 64) + "° (" + x.String() + ")"
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	case int:
		return strconv.Itoa(x)
	case complex128:
		return strconv.FormatComplex(x, 'g', -1, 128)
	case string:
		return x
	case interface{ String() string }:
		return x.String()
	}
	return "?"
}

// Message returns "pkg: subject: param = value: reason: cause", leaving out
// the empty parts (and " = value" when v is nil). A cause whose text starts
// with "pkg: " has that prefix removed, so wrapped sentinels of the same
// package do not repeat it.
func Message(pkg, subject, param string, v any, reason string, cause error) string {
	var b strings.Builder
	b.WriteString(pkg)
	b.WriteString(":")
	sep := " "
	add := func(s string) {
		if s == "" {
			return
		}
		b.WriteString(sep)
		b.WriteString(s)
		sep = ": "
	}
	add(subject)
	if param != "" {
		p := param
		if v != nil {
			p += " = " + Value(v)
		}
		add(p)
	}
	add(reason)
	if cause != nil {
		add(strings.TrimPrefix(cause.Error(), pkg+": "))
	}
	return b.String()
}

// Quote returns s in double quotes, cut after 32 runes with "…" (never
// inside a multi-byte character).
func Quote(s string) string {
	const max = 32
	r := []rune(s)
	if len(r) > max {
		s = string(r[:max]) + "…"
	}
	return strconv.Quote(s)
}
