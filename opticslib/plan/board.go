package plan

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Grid is the hole standard of a breadboard: it fixes the unit of the
// position table as well as the thread the holes take.
type Grid int

// The two hole standards.
const (
	// Metric boards have M6 tapped holes on a 25 mm pitch; tables are in
	// millimetres.
	Metric Grid = iota
	// Imperial boards have 1/4-20 tapped holes on a 1 in pitch; tables
	// are in inches.
	Imperial
)

// String returns "metric" or "imperial".
func (g Grid) String() string {
	switch g {
	case Metric:
		return "metric"
	case Imperial:
		return "imperial"
	}
	return "Grid(" + strconv.Itoa(int(g)) + ")"
}

// Thread returns the hole thread of the standard: "M6" or "1/4-20".
func (g Grid) Thread() string {
	if g == Imperial {
		return "1/4-20"
	}
	return "M6"
}

// unit returns the length unit of tables for g and its symbol.
func (g Grid) unit() (units.Length, string) {
	if g == Imperial {
		return units.Inch, "in"
	}
	return units.Millimeter, "mm"
}

// Board is a breadboard or optical table top seen from above, with its
// origin at one corner, X along its first side and Y along the second
// (see the package documentation).
type Board struct {
	// SizeX and SizeY are the board's sides along x and y, in metres.
	SizeX, SizeY units.Length
	// Grid is the hole standard; it sets the unit of the position table.
	Grid Grid
	// Pitch is the hole spacing in metres, the same along x and y.
	Pitch units.Length
	// Margin is the distance from the edges x = 0 and y = 0 to the
	// centre of the first hole, in metres.
	Margin units.Length
}

// MetricBoard returns a metric board of sides x and y (metres): M6 holes
// on a 25 mm pitch, the first hole 12.5 mm from the edges, so that a
// 600 mm side has 24 holes placed symmetrically (the usual layout of
// metric breadboards; common practice, no single source). Write
// MetricBoard(900*units.Millimeter, 600*units.Millimeter).
func MetricBoard(x, y units.Length) Board {
	return Board{SizeX: x, SizeY: y, Grid: Metric, Pitch: 25 * units.Millimeter, Margin: 12.5 * units.Millimeter}
}

// ImperialBoard returns an imperial board of sides x and y (metres):
// 1/4-20 holes on a 1 in pitch, the first hole 0.5 in from the edges
// (common practice, no single source). Write
// ImperialBoard(36*units.Inch, 24*units.Inch).
func ImperialBoard(x, y units.Length) Board {
	return Board{SizeX: x, SizeY: y, Grid: Imperial, Pitch: units.Inch, Margin: units.Inch / 2}
}

// Validate returns nil for a usable board and a [*ParamError] wrapping
// [ErrBoard] naming the first bad value otherwise: a size or pitch that
// is not positive and finite, a margin that is negative, not finite or
// larger than a side, or an unknown grid.
func (b Board) Validate() error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Subject: "board", Param: param, Value: v, Reason: reason, Err: ErrBoard}
	}
	switch {
	case b.Grid != Metric && b.Grid != Imperial:
		return bad("grid", int(b.Grid), "must be Metric or Imperial")
	case !positive(b.SizeX):
		return bad("size x", b.SizeX, "must be positive and finite")
	case !positive(b.SizeY):
		return bad("size y", b.SizeY, "must be positive and finite")
	case !positive(b.Pitch):
		return bad("hole pitch", b.Pitch, "must be positive and finite")
	case !(b.Margin >= 0) || math.IsInf(float64(b.Margin), 0):
		return bad("first-hole margin", b.Margin, "must be non-negative and finite")
	case b.Margin > b.SizeX || b.Margin > b.SizeY:
		return bad("first-hole margin", b.Margin, "must not exceed the board's sides "+b.sizeText())
	}
	return nil
}

// positive reports whether l is positive and finite (NaN fails).
func positive(l units.Length) bool { return l > 0 && !math.IsInf(float64(l), 0) }

// Holes returns the number of hole columns (along x) and rows (along y):
// the holes at Margin + k·Pitch that lie on the board, at least one each
// way.
func (b Board) Holes() (cols, rows int) {
	n := func(side units.Length) int {
		// A relative 1e-9 keeps the last hole of a side that is an exact
		// multiple of the pitch (600 mm / 25 mm) from being lost to
		// rounding.
		k := math.Floor(float64((side-b.Margin)/b.Pitch) + 1e-9)
		return max(1, int(math.Min(k, 1e6))+1)
	}
	return n(b.SizeX), n(b.SizeY)
}

// Hole is a tapped hole of a board, numbered from 1 at the origin corner.
type Hole struct {
	// Col and Row are the hole's column (along x) and row (along y),
	// counted from 1 at the origin corner.
	Col, Row int
	// At is the hole's centre.
	At Point
	// Offset is the position that was snapped to the hole minus the
	// hole's centre: where to put the part relative to the hole.
	Offset Point
}

// HoleAt returns the centre of hole (col, row), counted from 1 at the
// origin: (Margin + (col−1)·Pitch, Margin + (row−1)·Pitch). Numbers out
// of the board's range give positions off the board; nothing is checked.
func (b Board) HoleAt(col, row int) Point {
	return Point{X: b.Margin + units.Length(col-1)*b.Pitch, Y: b.Margin + units.Length(row-1)*b.Pitch}
}

// Nearest returns the hole of the board nearest to p and p's offset
// from it. Off the board, it is the nearest hole on the board.
func (b Board) Nearest(p Point) Hole {
	cols, rows := b.Holes()
	idx := func(v units.Length, n int) int {
		k := math.Round(float64((v - b.Margin) / b.Pitch))
		return int(math.Min(math.Max(k, 0), float64(n-1))) + 1
	}
	h := Hole{Col: idx(p.X, cols), Row: idx(p.Y, rows)}
	h.At = b.HoleAt(h.Col, h.Row)
	h.Offset = Point{X: p.X - h.At.X, Y: p.Y - h.At.Y}
	return h
}

// Contains reports whether p lies on the board or its edge.
func (b Board) Contains(p Point) bool {
	return p.X >= 0 && p.X <= b.SizeX && p.Y >= 0 && p.Y <= b.SizeY
}

// String describes the board, for example "900 × 600 mm metric
// breadboard (M6 on 25 mm)".
func (b Board) String() string {
	u, _ := b.Grid.unit()
	return b.sizeText() + " " + b.Grid.String() + " breadboard (" + b.Grid.Thread() + " on " + trimmed(b.Pitch, u) + ")"
}

// sizeText returns "900 × 600 mm" or "36 × 24 in".
func (b Board) sizeText() string {
	u, sym := b.Grid.unit()
	return table.Sig(float64(b.SizeX/u), 6) + " × " + table.Sig(float64(b.SizeY/u), 6) + " " + sym
}

// trimmed formats l in the table unit u of a grid (units.Millimeter or
// units.Inch) with six significant digits, trailing zeros removed, and
// the unit symbol: "25 mm", "0.5 in".
func trimmed(l, u units.Length) string {
	sym := "mm"
	if u == units.Inch {
		sym = "in"
	}
	return table.Sig(float64(l/u), 6) + " " + sym
}
