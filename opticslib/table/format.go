package table

import (
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/units"
)

// infinite returns "∞" or "−∞" for an infinite v.
func infinite(v float64) (string, bool) {
	switch {
	case math.IsInf(v, 1):
		return "∞", true
	case math.IsInf(v, -1):
		return "−∞", true
	}
	return "", false
}

// Fixed formats v with dec decimals, "∞" or "−∞" for an infinite value
// (a flat surface or wavefront), and never "-0".
func Fixed(v float64, dec int) string {
	if s, ok := infinite(v); ok {
		return s
	}
	if v == 0 {
		v = 0
	}
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if z := strconv.FormatFloat(0, 'f', dec, 64); s == "-"+z {
		return z
	}
	return s
}

// LengthUnit returns the display unit for a column of lengths and its
// symbol: µm when the largest magnitude is below 1 mm, mm below 10 m,
// metres above; non-finite values are ignored (mm for none).
func LengthUnit(vs ...units.Length) (units.Length, string) {
	m := 0.0
	for _, v := range vs {
		if a := math.Abs(float64(v)); !math.IsInf(a, 0) && !math.IsNaN(a) {
			m = math.Max(m, a)
		}
	}
	switch {
	case m > 0 && m < 1e-3:
		return units.Micrometer, "µm"
	case m >= 10:
		return units.Meter, "m"
	}
	return units.Millimeter, "mm"
}

// In formats l in the unit u with dec decimals ("∞" for an infinite
// length, see [Fixed]).
func In(l, u units.Length, dec int) string { return Fixed(float64(l/u), dec) }

// Sig formats v with n significant digits, trailing zeros removed:
// without an exponent for 1e-4 ≤ |v| < 1e6 (5320 with n = 3 is "5320"),
// with one outside; "∞" for +Inf.
func Sig(v float64, n int) string {
	if s, ok := infinite(v); ok {
		return s
	}
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a < 1e-4 || a >= 1e6 {
		return strconv.FormatFloat(v, 'g', n, 64)
	}
	// Round to n significant digits first, then print them in 'f' form.
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', n, 64), 64)
	dec := max(0, n-1-int(math.Floor(math.Log10(math.Abs(r)))))
	s := strconv.FormatFloat(r, 'f', dec, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// AngleSig formats an angle with n significant digits in rad, mrad or
// µrad, as units.Angle.String chooses the unit.
func AngleSig(a units.Angle, n int) string {
	v := float64(a)
	switch m := math.Abs(v); {
	case m >= 1 || m == 0:
		return Sig(v, n) + " rad"
	case m >= 1e-3:
		return Sig(v/1e-3, n) + " mrad"
	}
	return Sig(v/1e-6, n) + " µrad"
}

// Quantity formats a length with four significant digits in the unit that
// suits it (nm, µm, mm or m), for example "420 µm" or "1.241 m"; "∞" for
// an infinite one.
func Quantity(l units.Length) string { return LengthSig(l, 4) }

// LengthSig formats a length with n significant digits in the unit that
// suits it: nm below 1 µm, µm below 1 mm, mm below 1 m, metres above;
// "∞" for an infinite one.
func LengthSig(l units.Length, n int) string {
	v := float64(l)
	a := math.Abs(v)
	switch {
	case math.IsInf(v, 0):
		return Sig(v, n)
	case a == 0:
		return "0 m"
	case a < 1e-6:
		return Sig(v/1e-9, n) + " nm"
	case a < 1e-3:
		return Sig(v/1e-6, n) + " µm"
	case a < 1:
		return Sig(v/1e-3, n) + " mm"
	}
	return Sig(v, n) + " m"
}

// Power formats a power in watts with four significant digits in W, mW or
// µW, for example "5 mW".
func Power(p float64) string {
	switch a := math.Abs(p); {
	case a >= 1:
		return Sig(p, 4) + " W"
	case a >= 1e-3:
		return Sig(p*1e3, 4) + " mW"
	}
	return Sig(p*1e6, 4) + " µW"
}
