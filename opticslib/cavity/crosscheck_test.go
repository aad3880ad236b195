package cavity_test

// Cross-check of package cavity against an independent reference written
// in Python with numpy and scipy (testdata/crosscheck/cavity_modes.py):
// the script unfolds the cavities itself, conjugates the full loop matrix
// to each plane (a similarity transform, where the Go code composes the
// rotated product), takes the eigenvectors with numpy.linalg.eig,
// accumulates the Gouy phase by dense sampling and numpy.unwrap (where
// the Go code sums per-element increments), and finds the Airy half
// maximum with scipy.optimize.brentq on 1/|1 − ρe^{iδ}|² (where the Go
// code uses the arcsin closed form). The test skips when the interpreter
// or the modules are missing; CI has them.

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// xcElement is an element as the reference script reads it.
type xcElement struct {
	Kind string  `json:"kind"` // "space", "thin", "mirror"
	D    float64 `json:"d,omitempty"`
	F    float64 `json:"f,omitempty"`
	K    float64 `json:"k"`   // mirror curvature 1/R, concave positive
	AOI  float64 `json:"aoi"` // mirror angle of incidence, rad
}

type xcCase struct {
	Type    string      `json:"type"`
	M1      float64     `json:"m1"`
	M2      float64     `json:"m2"`
	Path    []xcElement `json:"path,omitempty"`
	Loop    []xcElement `json:"loop,omitempty"`
	Lambda0 float64     `json:"lambda0"`
	Z       []float64   `json:"z"`
}

// xcMirror adds a mirror of curvature k (1/m, concave positive, 0 flat) at
// angle th to b and returns its description.
func xcMirror(b *paraxial.Builder, k float64, th units.Angle) xcElement {
	switch {
	case k > 0:
		b.ConcaveMirror(units.Length(1/k), th)
	case k < 0:
		b.ConvexMirror(units.Length(-1/k), th)
	default:
		b.FlatMirror(th)
	}
	return xcElement{Kind: "mirror", K: k, AOI: float64(th)}
}

func endMirror(k float64) cavity.Mirror {
	switch {
	case k > 0:
		return cavity.Mirror{Shape: cavity.Concave, Radius: units.Length(1 / k)}
	case k < 0:
		return cavity.Mirror{Shape: cavity.Convex, Radius: units.Length(-1 / k)}
	}
	return cavity.Mirror{}
}

// xcRandom returns a seeded random cavity and its description: a linear
// cavity with a lens and a tilted curved fold mirror in some paths, or (if
// ring) a ring of tilted curved and flat mirrors, sometimes with a lens.
func xcRandom(t *testing.T, rng *rand.Rand, ring bool) (cavity.Cavity, xcCase) {
	t.Helper()
	lambda := []float64{633e-9, 1064e-9, 1550e-9}[rng.IntN(3)]
	curv := func() float64 {
		switch rng.IntN(5) {
		case 0:
			return 0
		case 1:
			return -1 / (0.5 + 3*rng.Float64())
		}
		return 1 / (0.05 + 2*rng.Float64())
	}
	var (
		c   cavity.Cavity
		x   xcCase
		err error
	)
	if !ring {
		b := paraxial.NewBuilder()
		var path []xcElement
		space := func(d float64) {
			b.Space(units.Length(d))
			path = append(path, xcElement{Kind: "space", D: d})
		}
		space(0.02 + 0.3*rng.Float64())
		if rng.IntN(2) == 0 {
			f := 0.05 + 0.5*rng.Float64()
			b.ThinLens(units.Length(f))
			path = append(path, xcElement{Kind: "thin", F: f})
			space(0.02 + 0.3*rng.Float64())
		}
		if rng.IntN(2) == 0 {
			path = append(path, xcMirror(b, 1/(0.1+rng.Float64()), units.Angle(0.35*rng.Float64())))
			space(0.02 + 0.4*rng.Float64())
		}
		p, err := b.Build()
		if err != nil {
			t.Fatal(err)
		}
		k1, k2 := curv(), curv()
		c, err = cavity.Linear(cavity.LinearSpec{M1: endMirror(k1), M2: endMirror(k2), Path: p, Wavelength: units.Length(lambda)})
		x = xcCase{Type: "linear", M1: k1, M2: k2, Path: path, Lambda0: lambda}
	} else {
		b := paraxial.NewBuilder()
		var loop []xcElement
		space := func(d float64) {
			b.Space(units.Length(d))
			loop = append(loop, xcElement{Kind: "space", D: d})
		}
		th := units.Angle(0.02 + 0.3*rng.Float64())
		k := 1 / (0.05 + 0.4*rng.Float64())
		loop = append(loop, xcMirror(b, k, th))
		space(0.03 + 0.4*rng.Float64())
		loop = append(loop, xcMirror(b, k*(0.7+0.6*rng.Float64()), th))
		space(0.05 + 0.5*rng.Float64())
		if rng.IntN(2) == 0 {
			f := 0.1 + rng.Float64()
			b.ThinLens(units.Length(f))
			loop = append(loop, xcElement{Kind: "thin", F: f})
			space(0.05 + 0.3*rng.Float64())
		}
		loop = append(loop, xcMirror(b, 0, th))
		space(0.05 + 0.5*rng.Float64())
		for range rng.IntN(2) {
			loop = append(loop, xcMirror(b, 0, th))
			space(0.05 + 0.3*rng.Float64())
		}
		l, err := b.Build()
		if err != nil {
			t.Fatal(err)
		}
		c, err = cavity.Ring(cavity.RingSpec{Loop: l, Wavelength: units.Length(lambda)})
		x = xcCase{Type: "ring", Loop: loop, Lambda0: lambda}
	}
	if err != nil {
		t.Fatal(err)
	}
	return c, x
}

func TestCrossCheckModes(t *testing.T) {
	// Tolerances. The Go solve is a closed form on the rotated product;
	// numpy's eig (LAPACK dgeev) of the conjugated matrix has an error of
	// about eps·‖M‖/|λ1 − λ2| = eps·‖M‖/(2√(1 − m²)); the cases keep
	// |m| < 0.95 (√(1 − m²) > 0.31) and ‖M‖ ≲ 1e2, so both are good to
	// ~1e-13: rel 1e-10 on w, abs 1e-10·|1/q| on 1/R (it passes through 0
	// at a waist), abs 1e-12 on the half-trace. The unwrapped Gouy phase
	// is exact at the end of the loop up to rounding of arg (~1e-15 per
	// sample): abs 1e-10 rad. A wrong branch or a lost tilt factor is off
	// by 0.01–3 rad.
	rng := rand.New(rand.NewPCG(1, 1))
	var (
		cavs  []cavity.Cavity
		cases []xcCase
	)
	for nRing, nLinear := 0, 0; nRing < 20 || nLinear < 20; {
		ring := nRing < nLinear
		c, x := xcRandom(t, rng, ring)
		s, _ := c.Stability()
		if !s.Stable() || math.Abs(s.X.HalfTrace) > 0.95 || math.Abs(s.Y.HalfTrace) > 0.95 {
			continue
		}
		if ring {
			nRing++
		} else {
			nLinear++
		}
		l := float64(c.Length())
		x.Z = []float64{0, 0.07 * l, 0.31 * l, 0.5 * l, 0.77 * l, l}
		cavs, cases = append(cavs, c), append(cases, x)
	}
	rhos := []float64{0.2, 0.5, 0.9, 0.99, 0.999, 0.9999}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			HalfTrace []float64   `json:"half_trace"`
			W         [][]float64 `json:"w"`
			InvR      [][]float64 `json:"inv_r"`
			Gouy      []float64   `json:"gouy"`
		} `json:"cases"`
		Airy []struct {
			FWHM    float64 `json:"fwhm"`
			Finesse float64 `json:"finesse"`
		} `json:"airy"`
	}
	pyref.Run(t, "cavity_modes.py", map[string]any{"cases": cases, "airy": rhos}, &ref)
	if len(ref.Cases) != len(cases) || len(ref.Airy) != len(rhos) {
		t.Fatalf("reference returned %d cases and %d Airy values, want %d and %d", len(ref.Cases), len(ref.Airy), len(cases), len(rhos))
	}
	var maxW, maxInvR, maxGouy float64
	nRing, nBranch := 0, 0
	for i, x := range cases {
		r := ref.Cases[i]
		if x.Type == "ring" {
			nRing++
		}
		if x.Type == "ring" != (cavs[i].Kind() == cavity.KindRing) {
			t.Fatalf("case %d: description %s for a %v cavity", i, x.Type, cavs[i].Kind())
		}
		s, _ := cavs[i].Stability()
		for p, st := range []cavity.PlaneStability{s.X, s.Y} {
			if !scalar.EqualWithinAbs(st.HalfTrace, r.HalfTrace[p], 1e-12) {
				t.Errorf("case %d (%s), plane %d: HalfTrace = %.15g, want %.15g (numpy)", i, x.Type, p, st.HalfTrace, r.HalfTrace[p])
			}
		}
		sp, err := cavs[i].ModeSpacing()
		if err != nil {
			t.Errorf("case %d: ModeSpacing error: %v", i, err)
			continue
		}
		if sp.X.Phase > math.Pi || sp.Y.Phase > math.Pi {
			nBranch++
		}
		for p, psi := range []units.Angle{sp.X.Phase, sp.Y.Phase} {
			maxGouy = math.Max(maxGouy, math.Abs(float64(psi)-r.Gouy[p]))
			if !scalar.EqualWithinAbs(float64(psi), r.Gouy[p], 1e-10) {
				t.Errorf("case %d (%s), plane %d: round-trip Gouy phase = %.15g, want %.15g (numpy.unwrap)", i, x.Type, p, psi, r.Gouy[p])
			}
		}
		for j, z := range x.Z {
			m, err := cavs[i].Eigenmode(units.Length(z))
			if err != nil {
				t.Errorf("case %d: Eigenmode(%g) error: %v", i, z, err)
				continue
			}
			for p, g := range []struct{ w, invR, scale float64 }{
				{float64(m.Beam.X.Radius()), m.Beam.X.WavefrontCurvature(), 1 / math.Abs(imag(m.Beam.X.Q))},
				{float64(m.Beam.Y.Radius()), m.Beam.Y.WavefrontCurvature(), 1 / math.Abs(imag(m.Beam.Y.Q))},
			} {
				maxW = math.Max(maxW, math.Abs(g.w-r.W[j][p])/r.W[j][p])
				maxInvR = math.Max(maxInvR, math.Abs(g.invR-r.InvR[j][p])/g.scale)
				if !scalar.EqualWithinRel(g.w, r.W[j][p], 1e-10) {
					t.Errorf("case %d (%s), z = %g, plane %d: w = %.15g, want %.15g (numpy.linalg.eig)", i, x.Type, z, p, g.w, r.W[j][p])
				}
				if !scalar.EqualWithinAbs(g.invR, r.InvR[j][p], 1e-10*g.scale) {
					t.Errorf("case %d (%s), z = %g, plane %d: 1/R = %.15g, want %.15g (numpy.linalg.eig)", i, x.Type, z, p, g.invR, r.InvR[j][p])
				}
			}
		}
	}

	// Airy: a lossless linear cavity with R1 = R2 = ρ has round-trip
	// amplitude factor ρ. brentq stops at 4 eps relative; the reference's
	// |1 − ρe^{iδ}|² loses digits to cancellation near ρ = 1 (1 − ρ cos δ
	// ~ 1e-4 at ρ = 0.9999, so ~1e-12 relative): rel 1e-9.
	var maxF float64
	for i, rho := range rhos {
		c := twoMirror(t, flat(rho), flat(rho), 100*mm)
		a, err := c.Airy()
		if err != nil {
			t.Errorf("ρ = %g: Airy error: %v", rho, err)
			continue
		}
		maxF = math.Max(maxF, math.Abs(a.Finesse-ref.Airy[i].Finesse)/ref.Airy[i].Finesse)
		if !scalar.EqualWithinRel(a.Finesse, ref.Airy[i].Finesse, 1e-9) {
			t.Errorf("ρ = %g: Finesse = %.15g, want %.15g (brentq on the Airy function)", rho, a.Finesse, ref.Airy[i].Finesse)
		}
		if want := a.FSR * ref.Airy[i].FWHM / (2 * math.Pi); !scalar.EqualWithinRel(a.Linewidth, want, 1e-9) {
			t.Errorf("ρ = %g: Linewidth = %.15g Hz, want FSR·FWHM/2π = %.15g Hz", rho, a.Linewidth, want)
		}
	}
	if nBranch < 5 {
		t.Errorf("only %d cases with a round-trip Gouy phase above π (the branch arccos((A+D)/2) misses), want at least 5", nBranch)
	}
	t.Logf("%d cavities (%d rings, %d with ψ > π) against %s: max rel Δw = %.3g, max |Δ(1/R)|/|1/q| = %.3g, max |Δψ| = %.3g rad; Airy finesse max rel Δ = %.3g",
		len(cases), nRing, nBranch, ref.Reference, maxW, maxInvR, maxGouy, maxF)
}
