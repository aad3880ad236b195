package paraxial

// Benchmarks only (STYLE rule 14); no values are checked here.

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// benchBulkSystem is the 10-element system of BenchmarkTrace: seeded
// random elements, the last one with a 5 mm clear radius; the first
// element gets one too, so that two aperture tests run per ray.
func benchBulkSystem(b *testing.B) System {
	rng := rand.New(rand.NewPCG(4, 4))
	bl, _ := randomBuilder(rng, 10)
	bl.Aperture(ClearRadius(5 * units.Millimeter))
	s, err := bl.Build()
	if err != nil {
		b.Fatal(err)
	}
	return s
}

var sinkErr error

// BenchmarkTraceBulk traces 10⁶ rays through 10 elements at once,
// keeping the height of every ray at every element and its vignetting
// flag (the work of BenchmarkTrace, structure-of-arrays), on one core and
// on all cores. Bytes per op is the memory the trace must move: 16 B read
// and 8 B written per ray and element row, plus the mask.
func BenchmarkTraceBulk(b *testing.B) {
	s := benchBulkSystem(b)
	const n = 1_000_000
	rng := rand.New(rand.NewPCG(3, 3))
	ys, thetas := make([]float64, n), make([]float64, n)
	for k := range n {
		ys[k], thetas[k] = 1e-3*rng.Float64(), 1e-3*rng.Float64()
	}
	heights := make([]float64, s.Len()*n)
	mask := NewRayMask(n)
	for _, procs := range []int{1, 0} {
		name := "rays=1e6/elements=10/procs=" + strconv.Itoa(procs)
		if procs == 0 {
			name = "rays=1e6/elements=10/procs=all"
		}
		b.Run(name, func(b *testing.B) {
			b.SetBytes(int64(16*n + 8*len(heights) + 8*len(mask)))
			b.ReportAllocs()
			for b.Loop() {
				sinkErr = s.TraceBulk(Tangential, ys, thetas, heights, nil, mask, procs)
			}
		})
	}
}

// BenchmarkTraceBulkStores compares the vector kernel's ordinary and
// non-temporal stores (bulkStreamBytes) on one core, for rows that fit in
// a large last-level cache (80 MB) and rows that do not (320 MB).
func BenchmarkTraceBulkStores(b *testing.B) {
	if !useBulkVector {
		b.Skip("no vector kernel on this platform")
	}
	s := benchBulkSystem(b)
	rng := rand.New(rand.NewPCG(3, 3))
	for _, n := range []int{1_000_000, 4_000_000} {
		ys, thetas := make([]float64, n), make([]float64, n)
		for k := range n {
			ys[k], thetas[k] = 1e-3*rng.Float64(), 1e-3*rng.Float64()
		}
		heights := aligned32(s.Len() * n)
		mask := NewRayMask(n)
		for _, stream := range []bool{false, true} {
			b.Run("rows="+strconv.Itoa(8*len(heights)>>20)+"MB/stream="+strconv.FormatBool(stream), func(b *testing.B) {
				a := bulkArgs{n: n, ys: ys, thetas: thetas, heights: heights, blocked: mask,
					ops: s.program(Tangential, true, nil), stream: stream}
				b.SetBytes(int64(16*n + 8*len(heights) + 8*len(mask)))
				b.ReportAllocs()
				for b.Loop() {
					a.trace(0, n)
				}
			})
		}
	}
}

var sinkFloats []float64

// BenchmarkMemoryCopy measures this machine's copy bandwidth on slices far
// larger than the caches, the memory floor against which TraceBulk is
// judged: SetBytes counts the bytes read plus the bytes written, so the
// MB/s column is the bandwidth.
func BenchmarkMemoryCopy(b *testing.B) {
	const n = 10_000_000 // 80 MB, like the heights of 10⁶ rays × 10 elements
	src, dst := make([]float64, n), make([]float64, n)
	for i := range src {
		src[i] = float64(i)
	}
	b.Run("copy/80MB", func(b *testing.B) {
		b.SetBytes(2 * 8 * n)
		b.ReportAllocs()
		for b.Loop() {
			copy(dst, src)
		}
		sinkFloats = dst
	})
	// A loop that writes each value with an ordinary store, as the trace
	// does (copy may use non-temporal stores for large sizes).
	b.Run("scale/80MB", func(b *testing.B) {
		b.SetBytes(2 * 8 * n)
		b.ReportAllocs()
		for b.Loop() {
			d := dst[:len(src)]
			for i, v := range src {
				d[i] = 2 * v
			}
		}
		sinkFloats = dst
	})
}
