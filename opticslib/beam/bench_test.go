package beam

// Benchmarks only (STYLE rule 14); no values are checked here.

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

var sinkCaustic Caustic

// BenchmarkSample measures the caustic of a 20-element path (10 spaces
// and 10 lenses) at 10⁴ samples; the target is under 2 ms.
func BenchmarkSample(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 1))
	bl := paraxial.NewBuilder()
	for range 10 {
		bl.Space(units.Length(0.05 + 0.1*rng.Float64())).ThinLens(units.Length(0.05 + 0.2*rng.Float64()))
	}
	sys, err := bl.Build()
	if err != nil {
		b.Fatal(err)
	}
	in, err := FromWaist(WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * nm})
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int{1_000, 10_000} {
		b.Run("elements=20/samples="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				c, err := Sample(sys, in, n)
				if err != nil {
					b.Fatal(err)
				}
				sinkCaustic = c
			}
		})
	}
}
