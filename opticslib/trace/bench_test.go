package trace

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// benchSystem is an invented 10-surface relay of four singlets and a
// cemented doublet, spheres with clear apertures.
func benchSystem(tb testing.TB) System {
	const mm = units.Millimeter
	g1, g2 := Index(1.5168), Index(1.6200)
	air := Index(1)
	s, err := New(air,
		Surface{Radius: 60 * mm, ClearRadius: 12 * mm, Medium: g1, Thickness: 5 * mm},
		Surface{Radius: -60 * mm, ClearRadius: 12 * mm, Medium: air, Thickness: 30 * mm},
		Surface{Radius: 40 * mm, ClearRadius: 11 * mm, Medium: g1, Thickness: 6 * mm},
		Surface{Radius: -30 * mm, ClearRadius: 11 * mm, Medium: g2, Thickness: 2 * mm},
		Surface{Radius: -120 * mm, ClearRadius: 11 * mm, Medium: air, Thickness: 25 * mm},
		Surface{Radius: -25 * mm, ClearRadius: 9 * mm, Medium: g2, Thickness: 3 * mm},
		Surface{Radius: 80 * mm, ClearRadius: 9 * mm, Medium: air, Thickness: 20 * mm},
		Surface{Radius: 100 * mm, ClearRadius: 12 * mm, Medium: g1, Thickness: 5 * mm},
		Surface{Radius: -45 * mm, ClearRadius: 12 * mm, Medium: air, Thickness: 15 * mm},
		Surface{Kind: Stop, ClearRadius: 10 * mm, Thickness: 40 * mm},
	)
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

func benchRays(n int) *Rays {
	rng := rand.New(rand.NewPCG(1, 1))
	r := NewRays(n)
	for i := range n {
		r.Set(i, RayFromAngles((rng.Float64()*2-1)*8e-3, (rng.Float64()*2-1)*8e-3, -2e-3, (rng.Float64()*2-1)*0.02, (rng.Float64()*2-1)*0.02))
	}
	return r
}

// BenchmarkTrace traces rays through the 10-surface relay (11 ops with the
// image plane), by kernel and worker count; ns/ray-surface counts the ten
// surfaces. The rays are reset from a saved copy outside the timer.
func BenchmarkTrace(b *testing.B) {
	s := benchSystem(b)
	for _, n := range []int{1 << 12, 1 << 14, 1 << 17} {
		for _, vec := range []bool{true, false} {
			if vec && !useVector {
				continue
			}
			for _, procs := range []int{1, 2} {
				name := "n=" + strconv.Itoa(n) + "/procs=" + strconv.Itoa(procs) + "/vector=" + strconv.FormatBool(vec)
				b.Run(name, func(b *testing.B) {
					saved := useVector
					useVector = vec
					defer func() { useVector = saved }()
					src := benchRays(n)
					r := benchRays(n)
					b.ReportAllocs()
					for b.Loop() {
						b.StopTimer()
						copy(r.X, src.X)
						copy(r.Y, src.Y)
						copy(r.Z, src.Z)
						copy(r.L, src.L)
						copy(r.M, src.M)
						copy(r.N, src.N)
						copy(r.OPL, src.OPL)
						b.StartTimer()
						if err := s.Trace(633e-9, r, procs); err != nil {
							b.Fatal(err)
						}
					}
					b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(n*s.Len()), "ns/ray-surface")
				})
			}
		}
	}
}
