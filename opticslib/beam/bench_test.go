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
	sys, ast := benchPath(b)
	in, err := FromWaist(WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * nm})
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct {
		name string
		in   Input
		n    int
	}{{"round", in, 1_000}, {"round", in, 10_000}, {"astigmatic", ast, 10_000}} {
		b.Run("elements=20/"+c.name+"/samples="+strconv.Itoa(c.n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				c, err := Sample(sys, c.in, c.n)
				if err != nil {
					b.Fatal(err)
				}
				sinkCaustic = c
			}
		})
	}
}

var sinkAngles []units.Angle

// BenchmarkGouyPhase measures the on-demand Gouy phase of an astigmatic
// caustic (both planes) at 10⁴ samples: one arctangent per sample and
// plane.
func BenchmarkGouyPhase(b *testing.B) {
	sys, ast := benchPath(b)
	c, err := Sample(sys, ast, 10_000)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		sinkAngles, _ = c.GouyPhase()
	}
}

// benchPath returns the 20-element path of the Sample benchmarks (10
// seeded spaces and 10 lenses) and an astigmatic beam (separate waists,
// M² 1.3 in y), which needs both planes.
func benchPath(b *testing.B) (paraxial.System, Astigmatic) {
	rng := rand.New(rand.NewPCG(1, 1))
	bl := paraxial.NewBuilder()
	for range 10 {
		bl.Space(units.Length(0.05 + 0.1*rng.Float64())).ThinLens(units.Length(0.05 + 0.2*rng.Float64()))
	}
	sys, err := bl.Build()
	if err != nil {
		b.Fatal(err)
	}
	ast, err := FromWaists(WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * nm},
		WaistSpec{WaistRadius: 0.3 * mm, WaistZ: 20 * mm, Wavelength: 1064 * nm, M2: 1.3})
	if err != nil {
		b.Fatal(err)
	}
	return sys, ast
}
