package optplot

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
)

// niceTicks places labelled ticks at a 1–2–5 step giving about target
// labels (default 6), with unlabelled minor ticks between them. Every
// label carries as many decimals as the step needs, so adjacent labels
// always differ ("1.00 1.05 1.10", never "1.0 1.1 1.1"), and all labels of
// an axis have the same number of decimals. Values of magnitude 10⁶ or
// more, or steps below 10⁻⁴, are written in exponent form with enough
// significant digits to tell the ticks apart.
type niceTicks struct{ target int }

var _ plot.Ticker = niceTicks{}

// tickStep returns the major step for [lo, hi] with about n labels: the
// largest 1–2–5 step that still gives at least 0.6 n intervals, and the
// number of minor intervals per step.
func tickStep(lo, hi float64, n int) (step float64, minor int) {
	span := hi - lo
	mag := math.Pow(10, math.Floor(math.Log10(span/float64(n)))+1)
	for range 4 {
		for _, m := range []struct {
			f     float64
			minor int
		}{{5, 5}, {2, 4}, {1, 5}} {
			if span/(m.f*mag) >= 0.6*float64(n) {
				return m.f * mag, m.minor
			}
		}
		mag /= 10
	}
	return mag, 5
}

// Ticks implements plot.Ticker.
func (t niceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || !finite(lo) || !finite(hi) {
		return nil
	}
	n := t.target
	if n <= 0 {
		n = 6
	}
	step, minor := tickStep(lo, hi, n)
	fmtv := tickFormat(lo, hi, step)
	ms := step / float64(minor)
	var ticks []plot.Tick
	// Bound the loop: a range of a few steps gives a few dozen ticks.
	for k := math.Ceil(lo/ms - 1e-9); k*ms <= hi+1e-9*ms && len(ticks) < 1000; k++ {
		v := k * ms
		tk := plot.Tick{Value: v}
		if r := math.Round(v / step); math.Abs(v/step-r) < 1e-6 {
			tk.Value = r * step
			tk.Label = fmtv(tk.Value)
		}
		ticks = append(ticks, tk)
	}
	return ticks
}

// tickFormat returns the label format for ticks at multiples of step in
// [lo, hi].
func tickFormat(lo, hi, step float64) func(float64) string {
	big := math.Max(math.Abs(lo), math.Abs(hi))
	if big >= 1e6 || step < 1e-4 {
		// Significant digits: from the leading digit of the largest
		// value down to the digit of the step.
		digits := int(math.Floor(math.Log10(big))-math.Floor(math.Log10(step)+1e-9)) + 1
		digits = max(1, min(digits, 15))
		return func(v float64) string {
			if v == 0 {
				return "0"
			}
			return strconv.FormatFloat(v, 'e', digits-1, 64)
		}
	}
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	return func(v float64) string {
		if math.Abs(v) < step*1e-6 {
			v = 0 // no "-0.00"
		}
		return strconv.FormatFloat(v, 'f', dec, 64)
	}
}
