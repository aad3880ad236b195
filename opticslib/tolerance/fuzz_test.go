package tolerance_test

import (
	"context"
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/tolerance"
	"github.com/beamnote/beamnote/opticslib/units"
)

// FuzzStudy builds a study of the relay from arbitrary perturbation
// data: it must never panic, refuse bad data with an error, and a run
// it accepts must account for every build (measured with finite values,
// or failed).
func FuzzStudy(f *testing.F) {
	f.Add(uint8(0), uint8(0), 1e-4, "L1", 0.0, uint64(1), false)
	f.Add(uint8(1), uint8(1), 0.3e-3, "gap", 0.0, uint64(2), true)
	f.Add(uint8(2), uint8(0), 0.01, "L3", 0.0, uint64(3), false)
	f.Add(uint8(3), uint8(1), 0.05, "L5", 1.7, uint64(4), false)
	f.Add(uint8(3), uint8(0), 0.2, "L2", 1.0, uint64(5), false)  // index 1: refused
	f.Add(uint8(0), uint8(0), 0.5, "L1", 0.0, uint64(6), true)   // half a metre: builds fail
	f.Add(uint8(2), uint8(2), 0.01, "L1", 0.0, uint64(7), false) // unknown shape
	f.Add(uint8(9), uint8(0), 0.01, "L1", 0.0, uint64(8), false) // unknown kind
	f.Add(uint8(1), uint8(0), math.NaN(), "gap", 0.0, uint64(9), false)
	f.Add(uint8(0), uint8(0), 1e-4, "", 0.0, uint64(10), false)
	f.Fuzz(func(t *testing.T, kind, shape uint8, width float64, label string, index float64, seed uint64, generic bool) {
		st := relayStudy(t, 0.1*units.Millimeter, 0.01)
		d := tolerance.Distribution{Shape: tolerance.Shape(shape), Width: width, Unit: []string{"m", "m", "", "rad"}[kind%4]}
		st.Perturbations = []tolerance.Perturbation{{Kind: tolerance.Kind(kind), Label: label, Dist: d, Index: index}}
		if err := st.Validate(); err != nil {
			if err.Error() == "" {
				t.Errorf("empty error message")
			}
			return
		}
		_, _ = st.Sensitivity()
		const n = 64
		r, err := st.MonteCarlo(context.Background(), tolerance.Options{Trials: n, Seed: seed, Generic: generic})
		if err != nil {
			t.Fatalf("a validated study failed to run: %v", err)
		}
		for g, vs := range r.Values {
			measured := 0
			for _, v := range vs {
				if !math.IsNaN(v) {
					if math.IsInf(v, 0) {
						t.Fatalf("goal %d: infinite value", g)
					}
					measured++
				}
			}
			if measured+r.Failed != n || r.Goals[g].N != measured {
				t.Fatalf("goal %d: %d measured + %d failed ≠ %d builds", g, measured, r.Failed, n)
			}
		}
		_ = r.Table()
	})
}
