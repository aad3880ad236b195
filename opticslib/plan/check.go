package plan

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Check names what a [Warning] found.
type Check int

// The checks of a plan, in the order their warnings are listed.
const (
	// Collision: two parts' footprints overlap.
	Collision Check = iota
	// OffBoard: a part's footprint reaches beyond the board's edge.
	OffBoard
	// BeamThrough: the beam axis crosses the footprint of a part it is
	// not meant to meet (a part on another segment of the path).
	BeamThrough
	// BeamGrazes: the beam's 1/e² band cuts into the footprint of a part
	// it is not meant to meet, while its axis passes (only with a beam).
	BeamGrazes
	// BeamOffBoard: the beam axis leaves the board.
	BeamOffBoard
)

// String returns the check's name as tables show it: "collision", "off
// board", "beam through part", "beam grazes part", "beam off board".
func (c Check) String() string {
	switch c {
	case Collision:
		return "collision"
	case OffBoard:
		return "off board"
	case BeamThrough:
		return "beam through part"
	case BeamGrazes:
		return "beam grazes part"
	case BeamOffBoard:
		return "beam off board"
	}
	return "Check(" + strconv.Itoa(int(c)) + ")"
}

// Warning is one finding of the checks of a plan.
type Warning struct {
	// Check is what was found.
	Check Check
	// Parts holds the indices in [Plan.Parts] of the parts concerned:
	// two for a collision, one for the other part checks, none for the
	// beam off the board.
	Parts []int
	// Segment is the index in [Plan.Segments] of the beam segment
	// concerned, −1 for the part checks.
	Segment int
	// At is where: the centroid of the overlap of two footprints, the
	// footprint corner farthest off the board, the point where the beam
	// enters the part or comes closest to it, or where it leaves the
	// board.
	At Point
	// Amount is how much, in metres: the overlap depth of two footprints
	// (the least shift that parts them, [Overlap]), how far a footprint
	// reaches beyond the edge, the length of beam inside the part, how
	// deep the band cuts into it; zero for the beam off the board.
	Amount units.Length
	// Text is the warning in one line, naming the parts and the place in
	// board coordinates (mm), for example
	//
	//	"M2" and "L3" collide: the footprints overlap by 4.2 mm at (512.5, 300.0) mm
	Text string
}

// String returns w.Text.
func (w Warning) String() string { return w.Text }

// Warnings is the list of findings of a plan's checks.
type Warnings []Warning

// Of returns the warnings of check c.
func (ws Warnings) Of(c Check) Warnings {
	var out Warnings
	for _, w := range ws {
		if w.Check == c {
			out = append(out, w)
		}
	}
	return out
}

// Table returns the warnings as a table: the check, the place in board
// coordinates (mm) and the warning's text.
func (ws Warnings) Table() table.Table {
	t := table.Table{Caption: "Table-plan checks: " + strconv.Itoa(len(ws)) + " warnings", Header: []string{"check", "x (mm)", "y (mm)", "warning"}}
	if len(ws) == 1 {
		t.Caption = "Table-plan checks: 1 warning"
	}
	for _, w := range ws {
		t.Rows = append(t.Rows, []string{w.Check.String(), table.In(w.At.X, units.Millimeter, 1), table.In(w.At.Y, units.Millimeter, 1), w.Text})
	}
	return t
}

// tolerance is the least overlap, reach beyond an edge or length of beam
// inside a part that is reported, 1 µm: far below what a mount is placed
// to, and far above the rounding of positions on a metre-sized board
// (1e-16 relative), so that parts that merely touch are not flagged.
const tolerance = 1 * units.Micrometer

// where formats a board point for warnings: "(512.5, 300.0) mm", with
// inches too on an imperial board.
func (p Plan) where(at Point) string {
	s := "(" + table.In(at.X, units.Millimeter, 1) + ", " + table.In(at.Y, units.Millimeter, 1) + ") mm"
	if p.Board.Grid == Imperial {
		s += " = (" + table.In(at.X, units.Inch, 2) + ", " + table.In(at.Y, units.Inch, 2) + ") in"
	}
	return s
}

func mmText(l units.Length) string { return table.In(l, units.Millimeter, 1) + " mm" }

// onSegment reports whether the beam is meant to meet part p on segment
// s: the part's path range touches the segment's.
func onSegment(p Part, s Segment) bool {
	return p.End >= s.Z0 && p.Z <= s.Z1
}

// check runs the checks and fills pl.Warnings and the parts' clearances.
func (pl *Plan) check() {
	q := errtext.Quote
	var collide, off, through, grazes, leaves Warnings
	// Collisions: every pair of footprints, by the separating axis test.
	for i := range pl.Parts {
		for j := i + 1; j < len(pl.Parts); j++ {
			a, b := pl.Parts[i], pl.Parts[j]
			d := Overlap(a.Footprint, b.Footprint)
			if d <= tolerance {
				continue
			}
			ca, cb := a.Footprint.corners(), b.Footprint.corners()
			_, c := polygonArea(clipConvex(ca[:], cb[:]))
			collide = append(collide, Warning{Check: Collision, Parts: []int{i, j}, Segment: -1, At: c.point(), Amount: d,
				Text: q(a.Name) + " and " + q(b.Name) + " collide: the footprints overlap by " + mmText(d) + " at " + pl.where(c.point())})
		}
	}
	// Parts off the board: the corner farthest beyond an edge.
	bx, by := float64(pl.Board.SizeX), float64(pl.Board.SizeY)
	for i, p := range pl.Parts {
		worst, edge := 0.0, ""
		var at vec
		for _, c := range p.Footprint.corners() {
			for _, e := range []struct {
				d    float64
				name string
			}{{-c.x, "left edge (x = 0)"}, {c.x - bx, "right edge (x = " + mmText(pl.Board.SizeX) + ")"}, {-c.y, "front edge (y = 0)"}, {c.y - by, "back edge (y = " + mmText(pl.Board.SizeY) + ")"}} {
				if e.d > worst {
					worst, edge, at = e.d, e.name, c
				}
			}
		}
		if units.Length(worst) > tolerance {
			off = append(off, Warning{Check: OffBoard, Parts: []int{i}, Segment: -1, At: at.point(), Amount: units.Length(worst),
				Text: q(p.Name) + " reaches " + mmText(units.Length(worst)) + " beyond the " + edge + " at " + pl.where(at.point())})
		}
	}
	// The beam against the parts it is not meant to meet, segment by
	// segment; the clearance of each part on the way.
	for i := range pl.Parts {
		p := &pl.Parts[i]
		best, bestSeg := math.Inf(1), -1
		for k, s := range pl.Segments {
			if onSegment(*p, s) {
				continue
			}
			a, b := s.From.vec(), s.To.vec()
			if t0, t1, ok := clipSegment(p.Footprint, a, b); ok {
				if inside := units.Length(float64(t1-t0) * b.sub(a).norm()); inside > tolerance {
					at := a.add(b.sub(a).scale(t0)).point()
					through = append(through, Warning{Check: BeamThrough, Parts: []int{i}, Segment: k, At: at, Amount: inside,
						Text: "beam segment " + strconv.Itoa(k+1) + " (z " + table.In(s.Z0, units.Millimeter, 0) + "–" + table.In(s.Z1, units.Millimeter, 0) + " mm) passes through " + q(p.Name) + " for " + mmText(inside) + " from " + pl.where(at)})
				}
			}
			d, at := clearance(p.Footprint, s)
			if d < best {
				best, bestSeg = d, k
			}
			if pl.HasBeam && d < -float64(tolerance) {
				if _, _, ok := clipSegment(p.Footprint, a, b); !ok {
					grazes = append(grazes, Warning{Check: BeamGrazes, Parts: []int{i}, Segment: k, At: at.point(), Amount: units.Length(-d),
						Text: "the 1/e² band of beam segment " + strconv.Itoa(k+1) + " cuts " + mmText(units.Length(-d)) + " into " + q(p.Name) + " at " + pl.where(at.point())})
				}
			}
		}
		if bestSeg >= 0 {
			p.Clearance, p.ClearSegment = units.Length(best), bestSeg
		}
	}
	// The beam off the board: each point where the axis leaves it.
	for k, s := range pl.Segments {
		a, b := s.From.vec(), s.To.vec()
		d := b.sub(a)
		_, t1, ok := liangBarsky(a.x, a.y, d.x, d.y, 0, bx, 0, by)
		if !ok || units.Length(float64(1-t1)*d.norm()) <= tolerance {
			continue
		}
		at := a.add(d.scale(t1)).point()
		z := s.Z0 + units.Length(t1)*(s.Z1-s.Z0)
		edge := "an edge"
		switch tol := float64(tolerance); {
		case math.Abs(float64(at.X)) <= tol:
			edge = "the left edge"
		case math.Abs(float64(at.X)-bx) <= tol:
			edge = "the right edge"
		case math.Abs(float64(at.Y)) <= tol:
			edge = "the front edge"
		case math.Abs(float64(at.Y)-by) <= tol:
			edge = "the back edge"
		}
		leaves = append(leaves, Warning{Check: BeamOffBoard, Segment: k, At: at,
			Text: "the beam leaves the board across " + edge + " at " + pl.where(at) + ", z = " + mmText(z)})
	}
	for _, ws := range []Warnings{collide, off, through, grazes, leaves} {
		pl.Warnings = append(pl.Warnings, ws...)
	}
}

// clearance returns the least distance (m) from the beam on segment s to
// the rectangle r, and the point of the axis where it is attained: the
// distance from the axis less the 1/e² radius when the segment has beam
// samples, piece by piece between samples (each piece takes the larger
// radius at its ends, so the clearance errs small by at most the change
// of w between samples), the distance from the axis otherwise.
func clearance(r Rect, s Segment) (float64, vec) {
	a, b := s.From.vec(), s.To.vec()
	if len(s.Z) < 2 || s.Z1 <= s.Z0 {
		d, at := segmentRect(r, a, b)
		if len(s.W) > 0 {
			d -= float64(s.W[0])
		}
		return d, at
	}
	u := unit(float64(s.Direction))
	best, bestAt := math.Inf(1), a
	for i := 1; i < len(s.Z); i++ {
		p := a.add(u.scale(float64(s.Z[i-1] - s.Z0)))
		q := a.add(u.scale(float64(s.Z[i] - s.Z0)))
		d, at := segmentRect(r, p, q)
		d -= float64(max(s.W[i-1], s.W[i]))
		if d < best {
			best, bestAt = d, at
		}
	}
	return best, bestAt
}
