package paraxial_test

// Cross-check of paraxial.System.Cardinal against an independent reference
// written with numpy (testdata/crosscheck/paraxial_cardinal.py), run with
// the system interpreter /usr/bin/python3 (Debian's python3-numpy and
// python3-scipy; the python3 first on PATH may not see them). The test
// skips when the interpreter or the modules are missing; CI has them.

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// xcElement is an element as the reference script reads it; curvatures
// C = 1/R in 1/m, 0 for a flat surface.
type xcElement struct {
	Kind string  `json:"kind"` // "space", "thick", "thin", "sphere"
	D    float64 `json:"d,omitempty"`
	C1   float64 `json:"c1"`
	C2   float64 `json:"c2"`
	T    float64 `json:"t,omitempty"`
	N    float64 `json:"n,omitempty"`
	F    float64 `json:"f,omitempty"`
	C    float64 `json:"c"`
	N2   float64 `json:"n2,omitempty"`
}

// xcRadius converts a curvature to the builder's radius (Flat for 0).
func xcRadius(c float64) units.Length {
	if c == 0 {
		return paraxial.Flat
	}
	return units.Length(1 / c)
}

// xcCurvature returns a random surface curvature in 1/m: |R| in 20–300 mm,
// either sign, flat one time in five.
func xcCurvature(rng *rand.Rand) float64 {
	if rng.IntN(5) == 0 {
		return 0
	}
	r := 0.02 + 0.28*rng.Float64()
	if rng.IntN(2) == 0 {
		r = -r
	}
	return 1 / r
}

func TestCrossCheckCardinalNumPy(t *testing.T) {
	// Independent reference: reduced matrices (A. Gerrard & J. M. Burch,
	// Introduction to Matrix Methods in Optics, Wiley 1975, ch. II [from
	// memory]) composed with numpy, and the
	// cardinal points found by tracing their defining rays with
	// numpy.linalg.solve (parallel ray → F', H'; ray leaving parallel → F,
	// H; unit angular magnification → N, N'), not by the closed formulas
	// of Cardinal's doc. For a single thick lens in air also the thick-lens
	// closed forms for power and principal planes (W. J. Smith, Modern
	// Optical Engineering, 4th ed., McGraw-Hill 2008, ch. 2 [from memory]).
	// testdata/crosscheck/paraxial_cardinal.py.
	//
	// Tolerance: abs 1e-12·s with s = |EFL| + |z₂| + |z₁| for positions and
	// lengths, rel 1e-12 for the power. Every quantity is a vertex position
	// plus a ratio of matrix entries of size ≲ s, computed through ≤ 20
	// products of float64 entries; rounding is ~1e-15·s, and the 1e3 margin
	// covers cancellation in C for weak systems. A sign or principal-plane
	// error is of order the lens thickness, ≳ 1e-3 m.
	const tol = 1e-12
	type xcase struct {
		NIn      float64     `json:"n_in"`
		Elements []xcElement `json:"elements"`
		sys      paraxial.System
	}
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []xcase
	for i := range 40 {
		nIn := 1.0
		kind := i % 4 // 0: one thick lens in air; 1: several lenses in air; 2: in water; 3: ends in glass
		if kind == 2 {
			nIn = 1.33
		}
		b := paraxial.NewBuilder().Medium(nIn)
		var els []xcElement
		space := func(d float64) {
			b.Space(units.Length(d))
			els = append(els, xcElement{Kind: "space", D: d})
		}
		thick := func() {
			c1, c2 := xcCurvature(rng), xcCurvature(rng)
			if c1 == 0 && c2 == 0 {
				c1 = 10 // a plate has no power; make it a plano lens
			}
			th, n := 0.002+0.02*rng.Float64(), 1.45+0.5*rng.Float64()
			b.ThickLens(xcRadius(c1), xcRadius(c2), units.Length(th), n)
			els = append(els, xcElement{Kind: "thick", C1: c1, C2: c2, T: th, N: n})
		}
		space(0.01 + 0.1*rng.Float64())
		switch kind {
		case 0:
			thick()
		default:
			for range 2 + rng.IntN(2) {
				if rng.IntN(3) == 0 {
					f := 0.05 + 0.3*rng.Float64()
					if rng.IntN(2) == 0 {
						f = -f
					}
					b.ThinLens(units.Length(f))
					els = append(els, xcElement{Kind: "thin", F: f})
				} else {
					thick()
				}
				space(0.005 + 0.1*rng.Float64())
			}
			if kind == 3 {
				c := xcCurvature(rng)
				if c == 0 {
					c = -8
				}
				n2 := 1.4 + 0.4*rng.Float64()
				b.Interface(xcRadius(c), n2)
				els = append(els, xcElement{Kind: "sphere", C: c, N2: n2})
			}
		}
		space(0.01 + 0.1*rng.Float64())
		sys, err := b.Build()
		if err != nil {
			t.Fatalf("case %d: Build() error: %v", i, err)
		}
		cases = append(cases, xcase{NIn: nIn, Elements: els, sys: sys})
	}
	type values struct {
		Power               float64 `json:"power"`
		EFL                 float64 `json:"efl"`
		FFL                 float64 `json:"ffl"`
		BFL                 float64 `json:"bfl"`
		FrontFocalPoint     float64 `json:"front_focal"`
		RearFocalPoint      float64 `json:"rear_focal"`
		FrontPrincipalPlane float64 `json:"front_principal"`
		RearPrincipalPlane  float64 `json:"rear_principal"`
		FrontNodalPoint     float64 `json:"front_nodal"`
		RearNodalPoint      float64 `json:"rear_nodal"`
		Z1                  float64 `json:"z1"`
		Z2                  float64 `json:"z2"`
		NOut                float64 `json:"n_out"`
		ClosedForm          *struct {
			EFL                 float64 `json:"efl"`
			FrontPrincipalPlane float64 `json:"front_principal"`
			RearPrincipalPlane  float64 `json:"rear_principal"`
			BFL                 float64 `json:"bfl"`
			FFL                 float64 `json:"ffl"`
		} `json:"thick_lens_closed_form"`
	}
	var ref struct {
		Reference string   `json:"reference"`
		Cases     []values `json:"cases"`
	}
	pyref.Run(t, "paraxial_cardinal.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxRel, maxClosed float64
	nClosed := 0
	for i, test := range cases {
		r := ref.Cases[i]
		c, err := test.sys.Cardinal(paraxial.Tangential)
		if err != nil {
			t.Errorf("case %d: Cardinal error: %v", i, err)
			continue
		}
		if c.Afocal {
			t.Errorf("case %d: Afocal = true, want false (reference power %g /m)", i, r.Power)
			continue
		}
		s := math.Abs(r.EFL) + math.Abs(r.Z2) + math.Abs(r.Z1)
		for _, q := range []struct {
			name      string
			got, want float64
		}{
			{"FirstVertex", float64(c.FirstVertex), r.Z1},
			{"LastVertex", float64(c.LastVertex), r.Z2},
			{"EFL", float64(c.EFL), r.EFL},
			{"FFL", float64(c.FFL), r.FFL},
			{"BFL", float64(c.BFL), r.BFL},
			{"FrontFocal", float64(c.FrontFocalPoint), r.FrontFocalPoint},
			{"RearFocal", float64(c.RearFocalPoint), r.RearFocalPoint},
			{"FrontPrincipal", float64(c.FrontPrincipalPlane), r.FrontPrincipalPlane},
			{"RearPrincipal", float64(c.RearPrincipalPlane), r.RearPrincipalPlane},
			{"FrontNodal", float64(c.FrontNodalPoint), r.FrontNodalPoint},
			{"RearNodal", float64(c.RearNodalPoint), r.RearNodalPoint},
			{"RearFocalLength", float64(c.ImageFocalLength), r.NOut * r.EFL},      // f' = n'/Φ
			{"FrontFocalLength", float64(c.ObjectFocalLength), -test.NIn * r.EFL}, // f = −n/Φ
		} {
			maxRel = math.Max(maxRel, math.Abs(q.got-q.want)/s)
			if !scalar.EqualWithinAbs(q.got, q.want, tol*s) {
				t.Errorf("case %d: Cardinal().%s = %.15g, want %.15g (numpy ray trace)", i, q.name, q.got, q.want)
			}
		}
		if !scalar.EqualWithinRel(c.Power, r.Power, tol) {
			t.Errorf("case %d: Cardinal().Power = %.15g, want %.15g (numpy)", i, c.Power, r.Power)
		}
		if c.IndexOut != r.NOut {
			t.Errorf("case %d: Cardinal().IndexOut = %g, want %g", i, c.IndexOut, r.NOut)
		}
		if r.ClosedForm == nil {
			continue
		}
		// The thick-lens closed forms: the same rounding argument and tolerance.
		nClosed++
		h := r.ClosedForm
		for _, q := range []struct {
			name      string
			got, want float64
		}{
			{"EFL", float64(c.EFL), h.EFL},
			{"FFL", float64(c.FFL), h.FFL},
			{"BFL", float64(c.BFL), h.BFL},
			{"FrontPrincipal", float64(c.FrontPrincipalPlane), h.FrontPrincipalPlane},
			{"RearPrincipal", float64(c.RearPrincipalPlane), h.RearPrincipalPlane},
		} {
			maxClosed = math.Max(maxClosed, math.Abs(q.got-q.want)/s)
			if !scalar.EqualWithinAbs(q.got, q.want, tol*s) {
				t.Errorf("case %d: Cardinal().%s = %.15g, want %.15g (thick-lens closed forms)", i, q.name, q.got, q.want)
			}
		}
	}
	t.Logf("%d systems against %s: max |Δ|/s = %.3g (ray trace), %.3g (thick-lens closed forms, %d lenses)",
		len(cases), ref.Reference, maxRel, maxClosed, nClosed)
}
