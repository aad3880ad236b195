package live

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// MaxPositions is the most positions a slider may have ((Max−Min)/Step
// + 1): a slider a few hundred pixels wide cannot show more, and the page
// sends the position as a whole number.
const MaxPositions = 10000

// Range is one slider of a live what-if: a length from Min to Max in steps
// of Step, starting at Start. The slider's positions are Min, Min + Step,
// Min + 2·Step, … and Max (the last step is shorter when Max − Min is not
// a whole number of steps); Start is moved to the nearest position. The
// page shows the value in mm, µm or m as table.LengthUnit picks for Min
// and Max, with the decimals Min, Max and Step need (at most 6).
//
//	live.Range{Name: "L1–L2 gap", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}
type Range struct {
	// Name labels the slider and the values shown with each figure.
	Name string
	// Min and Max are the ends of the slider (m), Min < Max.
	Min, Max units.Length
	// Step is the distance between two positions (m), > 0.
	Step units.Length
	// Start is the value the slider starts at (m), Min ≤ Start ≤ Max.
	Start units.Length
}

// slider is a validated Range with its positions.
type slider struct {
	Range
	n     int          // positions 0 … n
	start int          // the position of Start
	unit  units.Length // display unit
	sym   string
	dec   int // decimals shown
}

// check validates the ranges of a call.
func check(rs []Range) ([]slider, error) {
	if len(rs) == 0 {
		return nil, fmt.Errorf("live: no slider given")
	}
	out := make([]slider, len(rs))
	names := map[string]bool{}
	for i, r := range rs {
		if strings.TrimSpace(r.Name) == "" {
			return nil, fmt.Errorf("live: slider %d: Name is empty: every slider needs a label", i+1)
		}
		if names[r.Name] {
			return nil, fmt.Errorf("live: slider %q: the name is used by another slider: the values shown with the figure would be ambiguous", r.Name)
		}
		names[r.Name] = true
		s, err := newSlider(r)
		if err != nil {
			return nil, err
		}
		out[i] = s
	}
	return out, nil
}

func newSlider(r Range) (slider, error) {
	bad := func(param string, v units.Length, reason string) error {
		return fmt.Errorf("live: slider %q: %s = %v: %s", r.Name, param, v, reason)
	}
	for _, p := range []struct {
		name string
		v    units.Length
	}{{"Min", r.Min}, {"Max", r.Max}, {"Step", r.Step}, {"Start", r.Start}} {
		if math.IsNaN(float64(p.v)) || math.IsInf(float64(p.v), 0) {
			return slider{}, bad(p.name, p.v, "must be finite")
		}
	}
	switch {
	case r.Step <= 0:
		return slider{}, bad("Step", r.Step, "must be positive")
	case r.Max <= r.Min:
		return slider{}, bad("Max", r.Max, fmt.Sprintf("must be above Min = %v", r.Min))
	case r.Start < r.Min || r.Start > r.Max:
		return slider{}, bad("Start", r.Start, fmt.Sprintf("must lie between Min = %v and Max = %v", r.Min, r.Max))
	}
	// A span that is a whole number of steps up to rounding has no
	// shorter last step.
	steps := float64((r.Max - r.Min) / r.Step)
	steps = math.Ceil(steps - 1e-9*math.Max(1, steps))
	if steps+1 > MaxPositions {
		return slider{}, bad("Step", r.Step, fmt.Sprintf("gives %s positions from Min = %v to Max = %v, more than %d", strconv.FormatFloat(steps+1, 'g', 15, 64), r.Min, r.Max, MaxPositions))
	}
	s := slider{Range: r, n: int(steps)}
	s.start = s.nearest(r.Start)
	s.unit, s.sym = table.LengthUnit(r.Min, r.Max)
	s.dec = max(decimals(float64(r.Min/s.unit)), decimals(float64(r.Max/s.unit)), decimals(float64(r.Step/s.unit)))
	return s, nil
}

// value is the length at position k (clamped to 0 … n): Min + k·Step,
// Max at the last position, and Start exactly at its own position when
// Start lies on the grid.
func (s slider) value(k int) units.Length {
	k = max(0, min(k, s.n))
	switch {
	case k == s.n:
		return s.Max
	case k == 0:
		return s.Min
	}
	v := s.Min + units.Length(k)*s.Step
	if k == s.start && math.Abs(float64(v-s.Start)) <= 1e-9*float64(s.Step) {
		return s.Start
	}
	return v
}

// nearest is the position nearest to v.
func (s slider) nearest(v units.Length) int {
	best, bd := 0, math.Inf(1)
	k := int(math.Round(float64((v - s.Min) / s.Step)))
	for _, c := range []int{k - 1, k, k + 1, s.n} {
		if c < 0 || c > s.n {
			continue
		}
		if d := math.Abs(float64(s.value0(c) - v)); d < bd {
			best, bd = c, d
		}
	}
	return best
}

// value0 is value without the Start rule (used to find Start's position).
func (s slider) value0(k int) units.Length {
	if k >= s.n {
		return s.Max
	}
	return s.Min + units.Length(k)*s.Step
}

// text formats v as the page shows it: "121.5 mm".
func (s slider) text(v units.Length) string {
	return table.Fixed(float64(v/s.unit), s.dec) + " " + s.sym
}

// plain formats a number in the display unit for the page's script,
// with enough digits to give back the same float64.
func plain(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// decimals is the number of decimals (0 … 6) that shows x exactly up to
// rounding.
func decimals(x float64) int {
	for d := 0; d < 6; d++ {
		y := x * math.Pow10(d)
		if math.Abs(y-math.Round(y)) <= 1e-6*math.Max(1, math.Abs(y)) {
			return d
		}
	}
	return 6
}

// values are the lengths at positions pos.
func values(ss []slider, pos []int) []units.Length {
	v := make([]units.Length, len(ss))
	for i, s := range ss {
		v[i] = s.value(pos[i])
	}
	return v
}

// describe writes the values at pos: "L1–L2 gap = 121.5 mm, L2–L3 gap = 80 mm".
func describe(ss []slider, pos []int) string {
	parts := make([]string, len(ss))
	for i, s := range ss {
		parts[i] = s.Name + " = " + s.text(s.value(pos[i]))
	}
	return strings.Join(parts, ", ")
}
