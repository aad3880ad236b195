package measure

import (
	"math"
	"testing"
)

func TestFrameIndexRange(t *testing.T) {
	// Pixel index ranges of an area's bounding box: clamped to the frame
	// in floating point, so that huge or infinite bounds (a noisy frame's
	// early moments) give the whole frame rather than an overflowed int.
	for _, test := range []struct {
		lo, hi, pitch float64
		n, i0, i1     int
	}{
		{0, 9, 1, 10, 0, 9},
		{-0.5, 3.2, 1, 10, 0, 3},
		{2.0000001, 2.9, 1, 10, 3, 2}, // no pixel centre inside
		{-1e300, 1e300, 1e-6, 640, 0, 639},
		{math.Inf(-1), math.Inf(1), 5e-6, 480, 0, 479},
		{1e300, math.Inf(1), 1, 10, 1, 0},
		{-5, -1, 1, 10, 1, 0},
	} {
		i0, i1 := frameIndexRange(test.lo, test.hi, test.pitch, test.n)
		empty := i0 > i1 && test.i0 > test.i1
		if !empty && (i0 != test.i0 || i1 != test.i1) {
			t.Errorf("frameIndexRange(%g, %g, %g, %d) = %d, %d, want %d, %d", test.lo, test.hi, test.pitch, test.n, i0, i1, test.i0, test.i1)
		}
	}
}
