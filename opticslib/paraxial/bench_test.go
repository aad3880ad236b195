package paraxial

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

func randomElements(n int) []Matrix {
	rng := rand.New(rand.NewPCG(2, 2))
	b, _ := randomBuilder(rng, n)
	s, err := b.Build()
	if err != nil {
		panic(err)
	}
	ms := make([]Matrix, s.Len())
	for i, e := range s.elems {
		ms[i] = e.X
	}
	return ms
}

var sinkMatrix Matrix

func BenchmarkCompose(b *testing.B) {
	for _, n := range []int{10, 20} {
		ms := randomElements(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				m := Identity()
				for _, e := range ms {
					m = m.Then(e)
				}
				sinkMatrix = m
			}
		})
	}
}

var sinkRay Ray

func BenchmarkApply(b *testing.B) {
	ms := randomElements(10)
	m := Identity()
	for _, e := range ms {
		m = m.Then(e)
	}
	rays := make([]Ray, 1_000_000)
	rng := rand.New(rand.NewPCG(3, 3))
	for i := range rays {
		rays[i] = Ray{Y: units.Length(1e-3 * rng.Float64()), Theta: units.Angle(1e-3 * rng.Float64())}
	}
	out := make([]Ray, len(rays))
	b.Run("rays=1e6/elements=10", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			// Each ray's result goes to its own slot, as an array program
			// would write it (testdata/bench/numpy_side.py); summing into
			// one accumulator instead measured the add latency chain.
			for i, r := range rays {
				out[i] = m.Apply(r)
			}
		}
		sinkRay = out[len(out)-1]
	})
}

func BenchmarkBuild(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		bl := NewBuilder()
		for range 10 {
			bl.Space(0.1).ThinLens(0.1)
		}
		s, err := bl.Build()
		if err != nil {
			b.Fatal(err)
		}
		sinkMatrix = s.Matrix(Tangential)
	}
}

var sinkSteps []Step

// BenchmarkTrace traces 10⁶ rays element by element through a 10-element
// system with clear apertures (vignetting flags on), reusing one Step
// buffer: zero allocations per ray.
func BenchmarkTrace(b *testing.B) {
	rng := rand.New(rand.NewPCG(4, 4))
	bl, _ := randomBuilder(rng, 10)
	bl.Aperture(ClearRadius(5 * units.Millimeter))
	s, err := bl.Build()
	if err != nil {
		b.Fatal(err)
	}
	rays := make([]Ray, 1_000_000)
	for i := range rays {
		rays[i] = Ray{Y: units.Length(1e-3 * rng.Float64()), Theta: units.Angle(1e-3 * rng.Float64())}
	}
	dst := make([]Step, 0, s.Len()+2)
	b.Run("rays=1e6/elements=10", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			for _, r := range rays {
				dst, _ = s.Trace(r, 0, s.Length(), Tangential, dst)
			}
			sinkSteps = dst
		}
	})
}

var sinkCardinal Cardinal

func BenchmarkCardinal(b *testing.B) {
	rng := rand.New(rand.NewPCG(5, 5))
	bl, _ := randomBuilder(rng, 20)
	s, err := bl.Build()
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		sinkCardinal, _ = s.Cardinal(Tangential)
	}
}
