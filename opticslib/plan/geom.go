package plan

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Point is a position on the board seen from above, in metres from the
// board's origin corner (see the package documentation): X along the
// board's first side, Y along its second.
type Point struct {
	X, Y units.Length
}

// vec is a board vector in metres, for the arithmetic. Products that are
// summed are written float64(a*b) + float64(c*d), which keeps Go from
// fusing them (FMA) on some CPUs, so that positions, and the figures
// drawn from them, are bit-identical everywhere (STYLE rule 13).
type vec struct{ x, y float64 }

func (p Point) vec() vec    { return vec{float64(p.X), float64(p.Y)} }
func (v vec) point() Point  { return Point{units.Length(v.x), units.Length(v.y)} }
func (v vec) add(w vec) vec { return vec{v.x + w.x, v.y + w.y} }
func (v vec) sub(w vec) vec { return vec{v.x - w.x, v.y - w.y} }
func (v vec) scale(f float64) vec {
	return vec{float64(f * v.x), float64(f * v.y)}
}
func dot(v, w vec) float64   { return float64(v.x*w.x) + float64(v.y*w.y) }
func cross(v, w vec) float64 { return float64(v.x*w.y) - float64(v.y*w.x) }
func (v vec) norm() float64  { return math.Hypot(v.x, v.y) }

// unit returns the unit vector at angle a (radians, counterclockwise
// from +x).
func unit(a float64) vec {
	s, c := math.Sincos(a)
	return vec{c, s}
}

// Rect is an oriented rectangle on the board: the footprint of a part
// seen from above.
type Rect struct {
	// Center is the centre of the rectangle.
	Center Point
	// Axis is the direction of the rectangle's Depth side,
	// counterclockwise from +x (radians): the optical axis of a lens or
	// plate, the face normal of a mirror.
	Axis units.Angle
	// Depth is the size along Axis and Width the size across it, in
	// metres (both ≥ 0).
	Depth, Width units.Length
}

// frame returns the centre, the unit vectors along Axis (u) and across
// it (v, u turned 90° counterclockwise), and the half sizes along them.
func (r Rect) frame() (c, u, v vec, hu, hv float64) {
	u = unit(float64(r.Axis))
	return r.Center.vec(), u, vec{-u.y, u.x}, float64(r.Depth) / 2, float64(r.Width) / 2
}

// Corners returns the four corners of r, counterclockwise, starting at
// the corner behind the centre (−Axis) and to its right.
func (r Rect) Corners() [4]Point {
	var out [4]Point
	for i, p := range r.corners() {
		out[i] = p.point()
	}
	return out
}

func (r Rect) corners() [4]vec {
	c, u, v, hu, hv := r.frame()
	return [4]vec{
		c.sub(u.scale(hu)).sub(v.scale(hv)),
		c.add(u.scale(hu)).sub(v.scale(hv)),
		c.add(u.scale(hu)).add(v.scale(hv)),
		c.sub(u.scale(hu)).add(v.scale(hv)),
	}
}

// local returns p in the frame of r: the coordinates along Axis and
// across it, from the centre.
func (r Rect) local(p vec) (a, b float64) {
	c, u, v, _, _ := r.frame()
	d := p.sub(c)
	return dot(d, u), dot(d, v)
}

// Contains reports whether p lies in r or on its edge.
func (r Rect) Contains(p Point) bool {
	a, b := r.local(p.vec())
	return math.Abs(a) <= float64(r.Depth)/2 && math.Abs(b) <= float64(r.Width)/2
}

// Overlap returns the penetration depth of a and b in metres by the
// separating axis theorem: for two convex polygons, the interiors are
// disjoint exactly when their projections onto one of the polygons' edge
// normals are disjoint (H. Minkowski's separating hyperplane theorem;
// for oriented boxes S. Gottschalk, M. C. Lin & D. Manocha, "OBBTree: a
// hierarchical structure for rapid interference detection", SIGGRAPH
// 1996, 171–180; C. Ericson, Real-Time Collision Detection, Morgan
// Kaufmann 2005, §4.4 [from memory]). Two rectangles have four such
// normals, their sides; on each, the overlap of the projections is
//
//	o = ra + rb − |(cb − ca)·n|,   r = (D/2)|u·n| + (W/2)|v·n|
//
// and Overlap returns the least o: positive when the rectangles overlap
// (the distance one must move to part them along the best of the four
// axes), zero when they touch, negative when a gap separates them (then
// −o is a lower bound of the gap, not the gap itself).
func Overlap(a, b Rect) units.Length {
	ca, ua, va, hua, hva := a.frame()
	cb, ub, vb, hub, hvb := b.frame()
	d := cb.sub(ca)
	depth := math.Inf(1)
	for _, n := range [4]vec{ua, va, ub, vb} {
		ra := float64(hua*math.Abs(dot(ua, n))) + float64(hva*math.Abs(dot(va, n)))
		rb := float64(hub*math.Abs(dot(ub, n))) + float64(hvb*math.Abs(dot(vb, n)))
		depth = math.Min(depth, ra+rb-math.Abs(dot(d, n)))
	}
	return units.Length(depth)
}

// clipConvex returns the part of the convex polygon subject (any
// orientation) inside the convex polygon clip (counterclockwise), by
// the Sutherland–Hodgman algorithm (I. E. Sutherland & G. W. Hodgman,
// "Reentrant polygon clipping", Commun. ACM 17, 32–42 (1974)): the
// subject is clipped against each edge's half-plane in turn.
func clipConvex(subject []vec, clip []vec) []vec {
	out := append([]vec(nil), subject...)
	for i := range clip {
		a, b := clip[i], clip[(i+1)%len(clip)]
		e := b.sub(a)
		inside := func(p vec) float64 { return cross(e, p.sub(a)) } // ≥ 0 inside (left of the edge)
		in := out
		out = nil
		for j := range in {
			p, q := in[j], in[(j+1)%len(in)]
			sp, sq := inside(p), inside(q)
			if sp >= 0 {
				out = append(out, p)
			}
			if (sp >= 0) != (sq >= 0) {
				t := sp / (sp - sq)
				out = append(out, p.add(q.sub(p).scale(t)))
			}
		}
		if len(out) == 0 {
			return nil
		}
	}
	return out
}

// polygonArea returns the signed area (m², positive counterclockwise)
// and the centroid of a simple polygon by the shoelace formula.
func polygonArea(p []vec) (area float64, centroid vec) {
	if len(p) < 3 {
		return 0, vec{}
	}
	var a, cx, cy float64
	for i := range p {
		q, r := p[i], p[(i+1)%len(p)]
		k := cross(q, r)
		a += k
		cx += float64((q.x + r.x) * k)
		cy += float64((q.y + r.y) * k)
	}
	if a == 0 {
		return 0, p[0]
	}
	return a / 2, vec{cx / (3 * a), cy / (3 * a)}
}

// clipSegment returns the parameters t0 ≤ t1 in [0, 1] of the part of
// the segment p + t(q − p) inside r, by the Liang–Barsky algorithm in
// r's own frame (Y.-D. Liang & B. A. Barsky, "A new concept and method
// for line clipping", ACM Trans. Graph. 3, 1–22 (1984)); ok is false
// when the segment misses r.
func clipSegment(r Rect, p, q vec) (t0, t1 float64, ok bool) {
	a0, b0 := r.local(p)
	a1, b1 := r.local(q)
	return liangBarsky(a0, b0, a1-a0, b1-b0, -float64(r.Depth)/2, float64(r.Depth)/2, -float64(r.Width)/2, float64(r.Width)/2)
}

// liangBarsky clips the segment (x0, y0) + t(dx, dy), t in [0, 1], to
// the box [xmin, xmax] × [ymin, ymax].
func liangBarsky(x0, y0, dx, dy, xmin, xmax, ymin, ymax float64) (t0, t1 float64, ok bool) {
	t0, t1 = 0, 1
	for _, c := range [4][2]float64{{-dx, x0 - xmin}, {dx, xmax - x0}, {-dy, y0 - ymin}, {dy, ymax - y0}} {
		pk, qk := c[0], c[1]
		if pk == 0 {
			if qk < 0 {
				return 0, 0, false
			}
			continue
		}
		t := qk / pk
		if pk < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return 0, 0, false
		}
	}
	return t0, t1, true
}

// pointRect returns the distance (m) from p to r, 0 inside.
func pointRect(r Rect, p vec) float64 {
	a, b := r.local(p)
	return math.Hypot(math.Max(0, math.Abs(a)-float64(r.Depth)/2), math.Max(0, math.Abs(b)-float64(r.Width)/2))
}

// closestOnSegment returns the point of the segment pq nearest to x.
func closestOnSegment(p, q, x vec) vec {
	d := q.sub(p)
	l2 := dot(d, d)
	if l2 == 0 {
		return p
	}
	t := math.Min(1, math.Max(0, dot(x.sub(p), d)/l2))
	return p.add(d.scale(t))
}

// segmentRect returns the distance (m) from the segment pq to r and the
// point of the segment where it is attained: 0 and the entry point when
// the segment meets r. For a segment and a convex polygon that do not
// meet, the least distance is attained at an end of the segment or at a
// corner of the polygon, so those are the only candidates.
func segmentRect(r Rect, p, q vec) (float64, vec) {
	if t0, _, ok := clipSegment(r, p, q); ok {
		return 0, p.add(q.sub(p).scale(t0))
	}
	best, at := pointRect(r, p), p
	if d := pointRect(r, q); d < best {
		best, at = d, q
	}
	for _, c := range r.corners() {
		x := closestOnSegment(p, q, c)
		if d := x.sub(c).norm(); d < best {
			best, at = d, x
		}
	}
	return best, at
}
