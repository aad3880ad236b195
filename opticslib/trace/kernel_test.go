package trace

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// randomSystem returns a seeded random system of spheres, conics, mirrors
// and stops with clear apertures, chosen so that rays miss, are blocked,
// meet total internal reflection and go backwards as well as pass.
func randomSystem(t testing.TB, rng *rand.Rand) System {
	var surfs []Surface
	dir := 1.0
	for i := range 3 + rng.IntN(6) {
		f := Surface{Kind: Refract, Medium: Index(1 + rng.Float64()), Thickness: units.Length(dir * (1e-3 + 20e-3*rng.Float64()))}
		switch rng.IntN(6) {
		case 0:
			f.Kind, f.Medium = Reflect, nil
			dir = -dir
			f.Thickness = -f.Thickness
		case 1:
			f.Kind, f.Medium, f.ClearRadius = Stop, nil, units.Length(2e-3+5e-3*rng.Float64())
		}
		if f.Kind != Stop && rng.IntN(4) > 0 {
			f.Radius = units.Length((rng.Float64()*2 - 1) * 60e-3)
			if rng.IntN(2) == 0 {
				f.Conic = rng.Float64()*5 - 3
			}
		}
		if f.Kind != Stop && rng.IntN(2) == 0 {
			f.ClearRadius = units.Length(3e-3 + 10e-3*rng.Float64())
		}
		if i%3 == 2 {
			f.Medium = Index(1)
		}
		if f.Kind == Reflect {
			f.Medium = nil
		}
		surfs = append(surfs, f)
	}
	s, err := New(Index(1), surfs...)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func randomRays(rng *rand.Rand, n int) *Rays {
	r := NewRays(n)
	for i := range n {
		ray := RayFromAngles((rng.Float64()*2-1)*8e-3, (rng.Float64()*2-1)*8e-3, -5e-3, (rng.Float64()*2-1)*0.3, (rng.Float64()*2-1)*0.3)
		if i%97 == 5 {
			ray.Direction.X = math.NaN() // an invalid start
		}
		if i%89 == 7 {
			ray.Position.Z = 0.5 // starts past the first surface
		}
		r.Set(i, ray)
	}
	return r
}

// TestVectorKernelBits checks that the vector kernel gives the portable
// kernel's results bit for bit (the kernels promise it; see stepAVX2),
// over seeded random systems and ray counts that are not multiples of 4,
// with 1, 2 and 8 workers, and that every status occurs.
func TestVectorKernelBits(t *testing.T) {
	if !useVector {
		t.Skip("no vector kernel on this machine")
	}
	defer func() { useVector = true }()
	rng := rand.New(rand.NewPCG(1, 1))
	var seen [Invalid + 1]int
	for trial := range 40 {
		s := randomSystem(t, rng)
		n := 1000 + rng.IntN(7)
		seed := rng.Uint64()
		ref := randomRays(rand.New(rand.NewPCG(seed, 2)), n)
		useVector = false
		if err := s.Trace(633e-9, ref, 1); err != nil {
			t.Fatal(err)
		}
		useVector = true
		for _, procs := range []int{1, 2, 8} {
			got := randomRays(rand.New(rand.NewPCG(seed, 2)), n)
			if err := s.Trace(633e-9, got, procs); err != nil {
				t.Fatal(err)
			}
			for i := range n {
				a, b := []float64{ref.X[i], ref.Y[i], ref.Z[i], ref.L[i], ref.M[i], ref.N[i], ref.OPL[i]},
					[]float64{got.X[i], got.Y[i], got.Z[i], got.L[i], got.M[i], got.N[i], got.OPL[i]}
				for j := range a {
					if math.Float64bits(a[j]) != math.Float64bits(b[j]) && !(math.IsNaN(a[j]) && math.IsNaN(b[j])) {
						t.Fatalf("trial %d, procs %d, ray %d, coordinate %d: vector %v, portable %v", trial, procs, i, j, b[j], a[j])
					}
				}
				if ref.Status[i] != got.Status[i] || ref.Stop[i] != got.Stop[i] {
					t.Fatalf("trial %d, procs %d, ray %d: vector %v at %d, portable %v at %d", trial, procs, i, got.Status[i], got.Stop[i], ref.Status[i], ref.Stop[i])
				}
			}
		}
		for i := range n {
			seen[ref.Status[i]]++
		}
	}
	for st, c := range seen {
		if c == 0 {
			t.Errorf("status %v never occurred", Status(st))
		}
	}
	t.Logf("statuses over the trials: %v", seen)
}
