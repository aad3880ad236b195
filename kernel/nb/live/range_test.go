package live

import (
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Slider arithmetic: positions, values, formatting. The checks are exact
// identities of the grid Min + k·Step (no physics).

const mm = units.Millimeter

func TestRangeErrors(t *testing.T) {
	ok := Range{Name: "L1–L2 gap", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}
	with := func(f func(*Range)) []Range { r := ok; f(&r); return []Range{r} }
	for _, test := range []struct {
		rs   []Range
		want string
	}{
		{nil, "live: no slider given"},
		{with(func(r *Range) { r.Name = " " }), "live: slider 1: Name is empty"},
		{[]Range{ok, ok}, `live: slider "L1–L2 gap": the name is used by another slider`},
		{with(func(r *Range) { r.Step = 0 }), `live: slider "L1–L2 gap": Step = 0 m: must be positive`},
		{with(func(r *Range) { r.Min = units.Length(math.NaN()) }), `live: slider "L1–L2 gap": Min = NaN m: must be finite`},
		{with(func(r *Range) { r.Max = 100 * mm }), `live: slider "L1–L2 gap": Max = 100 mm: must be above Min = 110 mm`},
		{with(func(r *Range) { r.Start = 140 * mm }), `live: slider "L1–L2 gap": Start = 140 mm: must lie between Min = 110 mm and Max = 130 mm`},
		{with(func(r *Range) { r.Step = units.Micrometer }), `live: slider "L1–L2 gap": Step = 1 µm: gives 20001 positions from Min = 110 mm to Max = 130 mm, more than 10000`},
		{with(func(r *Range) { r.Step = 1e-300 }), `more than 10000`},
	} {
		_, err := check(test.rs)
		if err == nil || !strings.Contains(err.Error(), test.want) {
			t.Errorf("check(%+v) = %v, want %q", test.rs, err, test.want)
		}
	}
	if _, err := check([]Range{ok}); err != nil {
		t.Errorf("check(%+v) = %v", ok, err)
	}
}

func TestSliderPositions(t *testing.T) {
	for _, test := range []struct {
		r          Range
		n, start   int
		last       units.Length
		text, span string
	}{
		// 20 mm in 0.5 mm steps: 41 positions, the start on the grid.
		{Range{Name: "a", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}, 40, 20, 130 * mm, "120.0 mm", "110.0 mm"},
		// 10 mm in 3 mm steps: 0, 3, 6, 9 and the shorter last step to 10.
		{Range{Name: "b", Min: 0, Max: 10 * mm, Step: 3 * mm, Start: 4 * mm}, 4, 1, 10 * mm, "3 mm", "0 mm"},
		// Below 1 mm the values are shown in µm.
		{Range{Name: "c", Min: 100 * units.Micrometer, Max: 900 * units.Micrometer, Step: 25 * units.Micrometer, Start: 900 * units.Micrometer}, 32, 32, 900 * units.Micrometer, "900 µm", "100 µm"},
	} {
		ss, err := check([]Range{test.r})
		if err != nil {
			t.Errorf("check(%+v): %v", test.r, err)
			continue
		}
		s := ss[0]
		if s.n != test.n || s.start != test.start {
			t.Errorf("%s: n, start = %d, %d, want %d, %d", test.r.Name, s.n, s.start, test.n, test.start)
		}
		if got := s.value(s.n); got != test.last {
			t.Errorf("%s: value(n) = %v, want %v", test.r.Name, got, test.last)
		}
		if got := s.value(-3); got != test.r.Min {
			t.Errorf("%s: value(-3) = %v, want Min %v", test.r.Name, got, test.r.Min)
		}
		if got := s.text(s.value(s.start)); got != test.text {
			t.Errorf("%s: text(start) = %q, want %q", test.r.Name, got, test.text)
		}
		if got := s.text(s.Min); got != test.span {
			t.Errorf("%s: text(Min) = %q, want %q", test.r.Name, got, test.span)
		}
	}
	// A start on the grid is passed to render exactly as given.
	ss, _ := check([]Range{{Name: "gap", Min: 140 * mm, Max: 180 * mm, Step: 0.1 * mm, Start: 163.7 * mm}})
	if got := ss[0].value(ss[0].start); got != 163.7*mm {
		t.Errorf("value(start) = %v (%.17g m), want 163.7 mm exactly", got, float64(got))
	}
}

func TestPoints(t *testing.T) {
	one, _ := check([]Range{{Name: "gap", Min: 110 * mm, Max: 130 * mm, Step: mm, Start: 120 * mm}})
	var got []string
	for _, p := range points(one) {
		got = append(got, describe(one, p.pos)+" ("+p.what+")")
	}
	want := []string{"gap = 110 mm (minimum)", "gap = 120 mm (start)", "gap = 130 mm (maximum)"}
	if !slices.Equal(got, want) {
		t.Errorf("points, one slider = %q, want %q", got, want)
	}
	// Two sliders, the second starting at its minimum: that point is the start.
	two, _ := check([]Range{
		{Name: "a", Min: 0, Max: 10 * mm, Step: mm, Start: 5 * mm},
		{Name: "b", Min: 0, Max: 4 * mm, Step: mm, Start: 0},
	})
	got = nil
	for _, p := range points(two) {
		got = append(got, describe(two, p.pos))
	}
	want = []string{"a = 5 mm, b = 0 mm", "a = 0 mm, b = 0 mm", "a = 10 mm, b = 0 mm", "a = 5 mm, b = 4 mm"}
	if !slices.Equal(got, want) {
		t.Errorf("points, two sliders = %q, want %q", got, want)
	}
}

// The page's messages: "ready", "m seq k0,k1", "d seq k0,k1"; anything
// else is ignored, positions are clamped, a message older than the newest
// applied moves nothing (gonb may deliver out of order), and a burst
// leaves one wake-up with the latest positions (LatestOnly).
func TestStateReceive(t *testing.T) {
	s := &state{pos: []int{3, 0}, n: []int{10, 4}, wake: make(chan struct{}, 1)}
	for _, v := range []any{"ready", "m 1 7,0", "m 3 99,-2", "m 2 1,1", "m 4 1", "x 5 1,1", "m x 1,1", "m 6 1,y", 3.0, "0=8"} {
		s.receive(v)
	}
	pos, ready, done, moves := s.snapshot()
	if !slices.Equal(pos, []int{10, 0}) || !ready || done || moves != 3 {
		t.Errorf("after the messages: pos %v ready %v done %v moves %d, want [10 0] true false 3", pos, ready, done, moves)
	}
	if len(s.wake) != 1 {
		t.Errorf("%d wake-ups pending, want 1", len(s.wake))
	}
	s.receive("d 9 5,2")
	if pos, _, done, _ := s.snapshot(); !done || !slices.Equal(pos, []int{5, 2}) {
		t.Errorf("after done: pos %v done %v, want [5 2] true", pos, done)
	}
}

func TestDecimalsAndHuman(t *testing.T) {
	for _, test := range []struct {
		x    float64
		want int
	}{{110, 0}, {0.5, 1}, {0.1, 1}, {0.25, 2}, {1.0 / 3, 6}, {163.7, 1}} {
		if got := decimals(test.x); got != test.want {
			t.Errorf("decimals(%v) = %d, want %d", test.x, got, test.want)
		}
	}
	for _, test := range []struct {
		d    time.Duration
		want string
	}{{5 * time.Minute, "5 min"}, {90 * time.Second, "90 s"}, {1500 * time.Millisecond, "1.5 s"}, {200 * time.Millisecond, "200ms"}} {
		if got := human(test.d); got != test.want {
			t.Errorf("human(%v) = %q, want %q", test.d, got, test.want)
		}
	}
}
