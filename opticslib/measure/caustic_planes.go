package measure

import (
	"math"
	"slices"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ISOPlanes is the fewest measurement planes ISO 11146-1 asks for in a
// caustic scan.
const ISOPlanes = 10

// causticISOShare is the share of the planes that [CheckPlanes] accepts
// as "about half": at least 40 % of them (4 of 10) within one Rayleigh
// length and 40 % beyond two. The standard gives no number; 40 % is this
// package's reading of "about half".
const causticISOShare = 0.4

// PlaneCheck is the measurement-plane rule of ISO 11146-1 (clause 9;
// reference-checks R17) applied to one axis of a scan: at least
// [ISOPlanes] planes, about half of them within one Rayleigh length of the
// waist (either side) and about half beyond two Rayleigh lengths.
type PlaneCheck struct {
	// Planes is the number of planes; Inside counts those with
	// |z − z0| ≤ zR, Outside those with |z − z0| ≥ 2zR and Between the
	// rest.
	Planes, Inside, Between, Outside int
	// Problems says, one sentence each, how the planes break the rule
	// and what to add; it is empty when they follow it.
	Problems []string
}

// OK reports whether the planes follow the rule.
func (c PlaneCheck) OK() bool { return len(c.Problems) == 0 }

// CheckPlanes applies the measurement-plane rule of ISO 11146-1 to the
// plane positions z of one axis, for a waist at z0 with Rayleigh length
// zR (metres): at least [ISOPlanes] planes, and at least 40 % of them
// (this package's reading of the standard's "about half") with
// |z − z0| ≤ zR and 40 % with |z − z0| ≥ 2zR. A non-positive or
// non-finite zR is reported as a problem.
func CheckPlanes(z []units.Length, z0, zR units.Length) PlaneCheck {
	c := PlaneCheck{Planes: len(z)}
	if !causticFinite(float64(zR)) || zR <= 0 || !causticFinite(float64(z0)) {
		c.Problems = []string{"the Rayleigh length " + zR.String() + " or waist position " + z0.String() + " is not usable for the plane rule"}
		return c
	}
	for _, v := range z {
		switch d := math.Abs(float64(v - z0)); {
		case d <= float64(zR):
			c.Inside++
		case d >= 2*float64(zR):
			c.Outside++
		default:
			c.Between++
		}
	}
	n := c.Planes
	need := func(have int) int {
		// The fewest planes to add to one group so that it holds its share
		// of the grown total.
		k := 0
		for float64(have+k) < math.Ceil(causticISOShare*float64(max(n+k, ISOPlanes))-1e-9) {
			k++
		}
		return k
	}
	q := func(l units.Length) string { return table.LengthSig(l, 4) }
	nn := strconv.Itoa(n)
	addIn, addOut := need(c.Inside), need(c.Outside)
	if addIn > 0 {
		c.Problems = append(c.Problems, strconv.Itoa(c.Inside)+" of "+nn+" planes lie within one Rayleigh length of the waist (z0 ± zR = "+q(z0-zR)+" … "+q(z0+zR)+"), where ISO 11146-1 asks for about half: add "+strconv.Itoa(addIn)+" there")
	}
	if addOut > 0 {
		p := strconv.Itoa(c.Outside) + " of " + nn + " planes lie beyond two Rayleigh lengths (z ≤ " + q(z0-2*zR) + " or z ≥ " + q(z0+2*zR) + "), where ISO 11146-1 asks for about half: add " + strconv.Itoa(addOut) + " there"
		if c.Between > 0 {
			p += " (" + strconv.Itoa(c.Between) + " lie between one and two Rayleigh lengths, where they add little)"
		}
		c.Problems = append(c.Problems, p)
	}
	if short := ISOPlanes - (n + addIn + addOut); short > 0 {
		c.Problems = append(c.Problems, nn+" planes: ISO 11146-1 asks for at least "+strconv.Itoa(ISOPlanes)+"; add "+strconv.Itoa(short))
	}
	return c
}

// Plane proposal: five planes evenly within ±zR of the waist, five in
// the far zone 2.2zR ≤ |z − z0| ≤ 5zR (a 10 % margin beyond 2zR so that
// an error in the estimated zR does not move them into the gap; at 5zR the
// beam is 5.1 times the waist, within reach of a camera that sees the
// waist).
const (
	causticPlanesEach = 5
	causticFarStart   = 2.2
	causticFarEnd     = 5.0
)

// ProposePlanes returns ten plane positions (metres, on the axis of z0)
// that follow the rule of ISO 11146-1 for a beam with its waist at z0 and
// Rayleigh length zR, from an estimate such as a first scan's fit: five
// evenly spread within z0 ± zR (at ±0.8, ±0.4 and 0 zR) and five in the
// far zone 2.2 zR … 5 zR from the waist on either side, shared between the
// sides by the room each has. Positions are rounded to a step of 1, 2 or
// 5 × 10ⁿ m no larger than zR/10, and kept within [railMin, railMax]
// (both zero: no bound; swapped if reversed). Where the rail cuts a zone,
// the planes are spread over the part inside it, and a zone wholly
// outside gets none: fewer than ten planes come back ([CheckPlanes] on
// the result says what is missing). It returns nil for a zR that is not
// positive and finite.
func ProposePlanes(z0, zR, railMin, railMax units.Length) []units.Length {
	if !causticFinite(float64(zR)) || zR <= 0 || !causticFinite(float64(z0)) || !causticFinite(float64(railMin)) || !causticFinite(float64(railMax)) {
		return nil
	}
	c, r := float64(z0), float64(zR)
	return causticPropose(causticZones{
		in: [2]float64{c - r, c + r}, left: [2]float64{c - causticFarEnd*r, c - causticFarStart*r},
		right: [2]float64{c + causticFarStart*r, c + causticFarEnd*r}, zR: r,
	}, railMin, railMax)
}

// causticZones are the zones of a proposal: the waist zone and the far
// zones before and after it, and the Rayleigh length that sets the
// rounding step.
type causticZones struct {
	in, left, right [2]float64
	zR              float64
}

// causticPropose spreads five planes over the waist zone and five over the
// far zones of z, within the rail, and rounds them (see ProposePlanes).
func causticPropose(z causticZones, railMin, railMax units.Length) []units.Length {
	lo, hi := math.Inf(-1), math.Inf(1)
	if railMin != 0 || railMax != 0 {
		lo, hi = float64(min(railMin, railMax)), float64(max(railMin, railMax))
	}
	clip := func(zone [2]float64) (float64, float64, float64) {
		a, b := math.Max(zone[0], lo), math.Min(zone[1], hi)
		return a, b, math.Max(0, b-a)
	}
	var out []float64
	spread := func(a, b float64, k int) {
		for j := range k {
			out = append(out, a+(float64(j)+0.5)*(b-a)/float64(k))
		}
	}
	if a, b, l := clip(z.in); l > 0 {
		spread(a, b, causticPlanesEach)
	}
	la, lb, ll := clip(z.left)
	ra, rb, rl := clip(z.right)
	if ll+rl > 0 {
		nl := int(math.Round(causticPlanesEach * ll / (ll + rl)))
		spread(la, lb, nl)
		spread(ra, rb, causticPlanesEach-nl)
	}
	// Round to a step of 1, 2 or 5 × 10ⁿ no larger than zR/10.
	decade := math.Pow(10, math.Floor(math.Log10(z.zR/10)))
	step := decade
	for _, m := range []float64{2, 5} {
		if m*decade <= z.zR/10 {
			step = m * decade
		}
	}
	res := make([]units.Length, 0, len(out))
	for _, v := range out {
		v = math.Round(v/step) * step
		if v > hi {
			v = math.Floor(hi/step) * step
		}
		if v < lo {
			v = math.Ceil(lo/step) * step
		}
		res = append(res, units.Length(v))
	}
	slices.Sort(res)
	return slices.Compact(res)
}

// causticProposeAxes returns one set of planes for all fitted axes: for
// x and y, five planes within one Rayleigh length of both waists and five
// beyond 2.2 Rayleigh lengths of both (and within 5 of both), when the
// waists are close enough for such zones to exist; otherwise the planes
// of each axis together.
func causticProposeAxes(fits []AxisFit, railMin, railMax units.Length) []units.Length {
	if len(fits) == 1 {
		return fits[0].Proposal
	}
	z := causticZones{
		in: [2]float64{math.Inf(-1), math.Inf(1)}, left: [2]float64{math.Inf(-1), math.Inf(1)},
		right: [2]float64{math.Inf(-1), math.Inf(1)}, zR: math.Inf(1),
	}
	for _, a := range fits {
		c, r := float64(a.Z0.Value), float64(a.RayleighRange.Value)
		z.in = [2]float64{math.Max(z.in[0], c-r), math.Min(z.in[1], c+r)}
		z.left = [2]float64{math.Max(z.left[0], c-causticFarEnd*r), math.Min(z.left[1], c-causticFarStart*r)}
		z.right = [2]float64{math.Max(z.right[0], c+causticFarStart*r), math.Min(z.right[1], c+causticFarEnd*r)}
		z.zR = math.Min(z.zR, r)
	}
	if z.in[1] > z.in[0] && (z.left[1] > z.left[0] || z.right[1] > z.right[0]) {
		if p := causticPropose(z, railMin, railMax); len(p) >= ISOPlanes {
			ok := true
			for _, a := range fits {
				ok = ok && CheckPlanes(p, a.Z0.Value, a.RayleighRange.Value).OK()
			}
			if ok {
				return p
			}
		}
	}
	var out []units.Length
	for _, a := range fits {
		out = append(out, a.Proposal...)
	}
	slices.Sort(out)
	return slices.Compact(out)
}
