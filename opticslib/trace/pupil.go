package trace

import (
	"math"
	"math/rand/v2"
)

// PupilGrid returns the points of an n × n square grid over the pupil's
// bounding square, spacing 2/(n−1) in normalised pupil coordinates, that
// lie in the unit disc: the grid has a point at the centre for odd n and
// the four rim points (±1, 0), (0, ±1) for every n ≥ 2. The order is row
// by row, Y ascending, X ascending within a row. n = 1 gives the centre
// alone; n < 1 gives nil.
//
// Every point stands for the same area of the pupil (a square cell of side
// 2/(n−1)), so equal weights integrate over the pupil with an error of
// order 1/n from the cells the rim cuts: this is the sampling to use for
// RMS spot radii, wavefront errors and Strehl ratios.
func PupilGrid(n int) []PupilPoint {
	switch {
	case n < 1:
		return nil
	case n == 1:
		return []PupilPoint{{}}
	}
	d := 2 / float64(n-1)
	out := make([]PupilPoint, 0, n*n*4/5+4)
	for j := range n {
		y := gridCoord(j, n, d)
		for i := range n {
			x := gridCoord(i, n, d)
			if x*x+y*y <= 1+1e-12 {
				out = append(out, PupilPoint{X: x, Y: y})
			}
		}
	}
	return out
}

// gridCoord returns −1 + i·d, exactly 0 at the centre of an odd grid and
// exactly ±1 at the ends.
func gridCoord(i, n int, d float64) float64 {
	switch {
	case i == n-1:
		return 1
	case 2*i == n-1:
		return 0
	}
	return -1 + float64(i)*d
}

// PupilHexapolar returns the centre and rings k = 1 … rings of 6k points
// each at radius k/rings, the first point of each ring on +Y, going
// towards +X (clockwise seen from the image): 1 + 3 rings (rings+1)
// points. rings = 0 gives the centre alone; rings < 0 gives nil.
//
// The rings are evenly spaced in radius so that the rim is sampled (a spot
// diagram shows its extent), which makes the points unequal in area: the
// outer ring stands for half an annulus. Use [PupilGrid] or [PupilRandom]
// for RMS radii, wavefront errors and Strehl ratios.
func PupilHexapolar(rings int) []PupilPoint {
	if rings < 0 {
		return nil
	}
	out := make([]PupilPoint, 1, 1+3*rings*(rings+1))
	for k := 1; k <= rings; k++ {
		r := float64(k) / float64(rings)
		for j := range 6 * k {
			a := 2 * math.Pi * float64(j) / float64(6*k)
			out = append(out, PupilPoint{X: r * math.Sin(a), Y: r * math.Cos(a)})
		}
	}
	return out
}

// PupilRandom returns n points drawn uniformly over the unit disc
// (ρ = √u₁, θ = 2πu₂) from a PCG generator seeded with seed
// (math/rand/v2, rand.NewPCG(seed, 0x9e3779b97f4a7c15)): the same seed
// gives the same points on every machine. n < 1 gives nil. Equal weights
// integrate over the pupil with a statistical error of order 1/√n.
func PupilRandom(n int, seed uint64) []PupilPoint {
	if n < 1 {
		return nil
	}
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	out := make([]PupilPoint, n)
	for i := range out {
		r := math.Sqrt(rng.Float64())
		a := 2 * math.Pi * rng.Float64()
		out[i] = PupilPoint{X: r * math.Cos(a), Y: r * math.Sin(a)}
	}
	return out
}
