package trace

import (
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestSeidelDistortionForm checks the division-free S_V of [System.Seidel]
// against Welford's form S_V = (Ā/A)(S_III + S_IV) per surface, on a
// two-lens system with a conic, a finite object and a stop between the
// lenses, where no A vanishes. Tolerance 1e-10 relative (rounding of the
// different sums).
func TestSeidelDistortionForm(t *testing.T) {
	const mm = units.Millimeter
	g := Index(1.62)
	sys, err := New(Index(1),
		Surface{Kind: Refract, Radius: 40 * mm, Medium: g, Thickness: 5 * mm},
		Surface{Kind: Refract, Radius: -120 * mm, Conic: -3, Medium: Index(1), Thickness: 10 * mm},
		Surface{Kind: Stop, ClearRadius: 5 * mm, Thickness: 10 * mm},
		Surface{Kind: Refract, Radius: -35 * mm, Medium: Index(1.7), Thickness: 3 * mm},
		Surface{Kind: Refract, Radius: 200 * mm, Conic: 0.5, Medium: Index(1), Thickness: 60 * mm})
	if err != nil {
		t.Fatal(err)
	}
	src := Source{ObjectDistance: 400 * mm, ObjectHeight: 20 * mm, PupilZ: 8 * mm, PupilRadius: 6 * mm}
	sd, err := sys.Seidel(587.6*units.Nanometer, src)
	if err != nil {
		t.Fatal(err)
	}
	idx, _ := sys.Indices(587.6 * units.Nanometer)
	nu := sys.signedIndices(idx)
	m, c := sys.marginal(nu, src), sys.chief(nu, src)
	for i, f := range sys.surfs {
		if f.Kind != Refract {
			continue
		}
		cv := f.Curvature()
		A := nu[i] * (m.u[i] + m.h[i]*cv)
		Ab := nu[i] * (c.u[i] + c.h[i]*cv)
		st := sd.Surfaces[i]
		want := Ab / A * (st.SIII + st.SIV)
		if f.Conic != 0 {
			// The conic's δS_V = δS_III·h̄/h, not (Ā/A)·δS_III.
			k := f.Conic * cv * cv * cv * (nu[i+1] - nu[i])
			h, hb := m.h[i], c.h[i]
			want = Ab/A*(st.SIII-k*h*h*hb*hb+st.SIV) + k*h*hb*hb*hb
		}
		if !scalar.EqualWithinAbsOrRel(st.SV, want, 1e-22, 1e-10) {
			t.Errorf("surface %d: S_V = %g, (Ā/A)(S_III + S_IV) = %g", i, st.SV, want)
		}
	}
}
