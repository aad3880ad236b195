package plan

// Geometry tests: the separating axis test against polygon clipping
// (Sutherland–Hodgman) on random rectangles, both against closed forms,
// and the Liang–Barsky clip and the segment distance against dense
// sampling.

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// randRect returns a rectangle with its centre in a 0.2 m square, sides
// from 1 mm to 100 mm and any orientation.
func randRect(r *rand.Rand) Rect {
	return Rect{
		Center: Point{X: units.Length(0.2 * r.Float64()), Y: units.Length(0.2 * r.Float64())},
		Axis:   units.Angle(2 * math.Pi * r.Float64()),
		Depth:  units.Length(0.001 + 0.099*r.Float64()),
		Width:  units.Length(0.001 + 0.099*r.Float64()),
	}
}

func clipArea(a, b Rect) float64 {
	ca, cb := a.corners(), b.corners()
	ar, _ := polygonArea(clipConvex(ca[:], cb[:]))
	return math.Abs(ar)
}

// TestOverlapAgainstClipping: two rectangles overlap (positive SAT depth)
// exactly when the polygon clipping of one by the other leaves a positive
// area. The SAT and Sutherland–Hodgman (1974) are independent algorithms.
// Cases whose depth lies within 1e-9 m of zero (touching to rounding) are
// skipped: there the sign of either is decided by rounding, and an area
// of a sliver 1e-9 m deep is below 1e-20 m², the threshold used (the
// clipped area of disjoint rectangles is zero or rounding, ~1e-30 m²).
func TestOverlapAgainstClipping(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 13))
	overlapping, skipped := 0, 0
	for i := range 20000 {
		a, b := randRect(r), randRect(r)
		d := float64(Overlap(a, b))
		if math.Abs(d) < 1e-9 {
			skipped++
			continue
		}
		area := clipArea(a, b)
		if (d > 0) != (area > 1e-20) {
			t.Errorf("case %d: Overlap = %g m, clipped area = %g m²: they disagree (a = %+v, b = %+v)", i, d, area, a, b)
		}
		if d > 0 {
			overlapping++
		}
		// Symmetry of both tests.
		if d2 := float64(Overlap(b, a)); math.Abs(d2-d) > 1e-15 {
			t.Errorf("case %d: Overlap(a, b) = %g, Overlap(b, a) = %g", i, d, d2)
		}
		// The intersection is no larger than either rectangle.
		small := math.Min(float64(a.Depth*a.Width), float64(b.Depth*b.Width))
		if area > small*(1+1e-12) {
			t.Errorf("case %d: clipped area %g m² exceeds the smaller rectangle, %g m²", i, area, small)
		}
	}
	// Both outcomes must be well represented for the test to mean much.
	if overlapping < 2000 || overlapping > 18000 {
		t.Errorf("%d of 20000 random pairs overlap: the sample does not test both outcomes", overlapping)
	}
	if skipped > 10 {
		t.Errorf("%d cases skipped as touching", skipped)
	}
}

// TestOverlapClosedForms: axis-aligned rectangles overlap by the smaller
// of the overlaps of their sides' intervals, and a square and the same
// square turned 45° about its centre meet in a regular octagon of
// inradius s/2, of area 8·(s/2)²·tan(π/8) = 2(√2 − 1)s² (elementary
// geometry). Tolerances: the depths are a few operations on lengths of
// 0.1 m, 1e-15 m; the shoelace area sums products of coordinates of
// ~0.1 m, each rounded by ~1e-18 m², for an area of ~1e-4 m²: 1e-13
// relative.
func TestOverlapClosedForms(t *testing.T) {
	const mm = units.Millimeter
	a := Rect{Center: Point{X: 50 * mm, Y: 50 * mm}, Depth: 40 * mm, Width: 20 * mm} // x 30…70, y 40…60
	b := Rect{Center: Point{X: 80 * mm, Y: 55 * mm}, Depth: 30 * mm, Width: 40 * mm} // x 65…95, y 35…75
	if got, want := float64(Overlap(a, b)), 5e-3; math.Abs(got-want) > 1e-15 {
		t.Errorf("Overlap(axis-aligned) = %g m, want %g (x intervals overlap 5 mm, y 20 mm)", got, want)
	}
	if got, want := clipArea(a, b), 5e-3*20e-3; math.Abs(got-want) > 1e-13*want {
		t.Errorf("clipped area (axis-aligned) = %g m², want %g", got, want)
	}
	far := b
	far.Center.X = 101 * mm // x 86…116: a gap of 16 mm
	if got := float64(Overlap(a, far)); !(got < 0) {
		t.Errorf("Overlap(separated) = %g m, want negative", got)
	}
	s := 30 * mm
	sq := Rect{Center: Point{X: 10 * mm, Y: -20 * mm}, Depth: s, Width: s}
	turned := sq
	turned.Axis = 45 * units.Degree
	want := 2 * (math.Sqrt2 - 1) * float64(s*s)
	if got := clipArea(sq, turned); math.Abs(got-want) > 1e-13*want {
		t.Errorf("square ∩ square at 45°: area = %g m², want 2(√2−1)s² = %g", got, want)
	}
	// The penetration along the square's own side normal: the turned
	// square reaches s/√2 from the centre, so depth = s/2 + s/√2.
	if got, want := float64(Overlap(sq, turned)), float64(s)/2+float64(s)/math.Sqrt2; math.Abs(got-want) > 1e-15 {
		t.Errorf("Overlap(square, square at 45°) = %g m, want s/2 + s/√2 = %g", got, want)
	}
}

// TestClipSegmentAgainstSampling: the Liang–Barsky clip reports a segment
// as meeting a rectangle exactly when one of 2001 points along it lies
// inside, and its entry parameter t0 is within one sample step (5e-4)
// of the first inside sample. A segment that the clip finds cutting a
// corner between two samples (the sampled distance below one step) is
// skipped: sampling cannot tell.
func TestClipSegmentAgainstSampling(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 13))
	const n = 2000
	hits := 0
	for i := range 2000 {
		rc := randRect(r)
		p := vec{0.25*r.Float64() - 0.025, 0.25*r.Float64() - 0.025}
		q := vec{0.25*r.Float64() - 0.025, 0.25*r.Float64() - 0.025}
		first := -1.0
		minDist := math.Inf(1)
		for k := 0; k <= n; k++ {
			x := p.add(q.sub(p).scale(float64(k) / n))
			d := pointRect(rc, x)
			minDist = math.Min(minDist, d)
			if d == 0 && first < 0 {
				first = float64(k) / n
			}
		}
		t0, _, ok := clipSegment(rc, p, q)
		dist, _ := segmentRect(rc, p, q)
		// The exact distance is at most the sampled one, and not
		// smaller by more than half a sample step along the segment.
		step := q.sub(p).norm() / n
		if dist > minDist+1e-15 || dist < minDist-step {
			t.Errorf("case %d: segmentRect = %g m, sampled minimum %g m (step %g m)", i, dist, minDist, step)
		}
		if ok && first < 0 && minDist < step {
			continue // the segment cuts a corner between two samples
		}
		if ok != (first >= 0) {
			t.Errorf("case %d: clipSegment ok = %v, sampling finds inside = %v", i, ok, first >= 0)
			continue
		}
		if ok {
			hits++
			if math.Abs(t0-first) > 1.0/n {
				t.Errorf("case %d: entry t0 = %g, first inside sample at %g", i, t0, first)
			}
			if dist != 0 {
				t.Errorf("case %d: segmentRect = %g m for a segment that meets the rectangle", i, dist)
			}
		}
	}
	if hits < 100 {
		t.Errorf("only %d of 2000 random segments meet their rectangle", hits)
	}
}

// FuzzOverlap: the separating axis test and the clipping agree on any
// rectangles (sizes in metres), outside the touching band.
func FuzzOverlap(f *testing.F) {
	f.Add(0.05, 0.05, 0.0, 0.04, 0.02, 0.08, 0.055, 0.3, 0.03, 0.04)
	f.Add(0.0, 0.0, 0.0, 0.03, 0.03, 0.0, 0.0, 0.785398, 0.03, 0.03)
	f.Add(0.0, 0.0, 1.0, 0.01, 0.05, 0.2, 0.0, 2.0, 0.01, 0.01)
	f.Fuzz(func(t *testing.T, ax, ay, aa, ad, aw, bx, by, ba, bd, bw float64) {
		for _, v := range []float64{ax, ay, aa, ad, aw, bx, by, ba, bd, bw} {
			if !finite(v) || math.Abs(v) > 10 {
				return
			}
		}
		if ad < 1e-4 || aw < 1e-4 || bd < 1e-4 || bw < 1e-4 {
			return
		}
		a := Rect{Center: Point{X: units.Length(ax), Y: units.Length(ay)}, Axis: units.Angle(aa), Depth: units.Length(ad), Width: units.Length(aw)}
		b := Rect{Center: Point{X: units.Length(bx), Y: units.Length(by)}, Axis: units.Angle(ba), Depth: units.Length(bd), Width: units.Length(bw)}
		d := float64(Overlap(a, b))
		if math.Abs(d) < 1e-8 {
			return
		}
		if area := clipArea(a, b); (d > 0) != (area > 1e-18) {
			t.Errorf("Overlap = %g m, clipped area = %g m²", d, area)
		}
	})
}
