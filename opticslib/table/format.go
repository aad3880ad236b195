package table

import (
	"math"
	"strconv"
)

func itoa(i int) string { return strconv.Itoa(i) }

func strconvQuote(s string) string { return strconv.Quote(s) }

// Fixed formats v with dec decimals, "∞" or "−∞" for an infinite value
// (a flat surface or wavefront), and never "-0".
func Fixed(v float64, dec int) string {
	switch {
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "−∞"
	case v == 0:
		v = 0
	}
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if z := strconv.FormatFloat(0, 'f', dec, 64); s == "-"+z {
		return z
	}
	return s
}
