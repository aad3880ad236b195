package beam_test

// Cross-checks of package beam against independent reference computations
// written in Python with numpy and scipy (testdata/crosscheck/*.py). Each
// test writes its seeded cases as JSON, runs the script with the system
// interpreter /usr/bin/python3 (Debian's python3-numpy and python3-scipy;
// the python3 first on PATH may not see them), and compares. The scripts
// compute from first principles (direct quadrature, reduced ABCD matrices,
// unwrapped phase), not by re-running the Go algorithms. The tests skip
// when the interpreter or the modules are missing; CI has them.

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestCrossCheckCircularTransmission(t *testing.T) {
	// Independent reference: scipy.integrate.dblquad (QUADPACK) of the
	// elliptical TEM₀₀ irradiance over the disc, SciPy 1.10 (Debian 12),
	// testdata/crosscheck/beam_transmission.py; for round beams also the
	// closed form 1 − exp(−2a²/w²) (Siegman, Lasers, §17.1 [from memory])
	// evaluated with numpy's expm1. The Go code uses a different method
	// (closed radial integral, trapezoidal angular one).
	//
	// Tolerance: abs 1e-12. The script asks dblquad for epsabs = epsrel =
	// 1e-13 at each level on a quadrant (×4), and T ≤ 1; the Go side stops
	// at 1e-14. Both are far below 1e-12; a wrong formula (for example a
	// swapped wx/wy weight or a missing factor 2 in the exponent) is off by
	// 1e-3 or more. The reported dblquad error estimate must also stay below
	// the tolerance, so the reference is known to be good enough.
	const tol = 1e-12
	type xcase struct {
		A  float64 `json:"a"`
		Wx float64 `json:"wx"`
		Wy float64 `json:"wy"`
	}
	cases := []xcase{
		{A: 1e-3, Wx: 1e-3, Wy: 1e-3},        // round, a = w: 1 − e⁻²
		{A: 1.5e-3, Wx: 1e-3, Wy: 1e-3},      // the 98.9 % of DefaultMinTransmission
		{A: 0.05e-3, Wx: 1e-3, Wy: 1e-3},     // small a/w, expm1 regime
		{A: 1e-3, Wx: 1e-3, Wy: 2e-3},        // elliptical
		{A: 1e-3, Wx: 2e-3, Wy: 1e-3},        // same, axes swapped
		{A: 2e-3, Wx: 0.2e-3, Wy: 5e-3},      // strongly elliptical, 25:1
		{A: 0.3e-3, Wx: 10e-6, Wy: 50e-6},    // tiny beam, big aperture
		{A: 10e-6, Wx: 2e-3, Wy: 3e-3},       // tiny aperture
		{A: 4e-3, Wx: 1.9e-3, Wy: 1.1e-3},    // near-total transmission
		{A: 0.7e-3, Wx: 0.35e-3, Wy: 3.5e-3}, // 10:1
	}
	rng := rand.New(rand.NewPCG(1, 1))
	for range 20 {
		wx := 0.1e-3 + 3e-3*rng.Float64()
		ratio := math.Exp((2*rng.Float64() - 1) * math.Log(10)) // wy/wx in [0.1, 10]
		wy := wx * ratio
		if rng.IntN(4) == 0 {
			wy = wx // round beams get the closed form too
		}
		a := (0.2 + 2.8*rng.Float64()) * math.Sqrt(wx*wy)
		cases = append(cases, xcase{A: a, Wx: wx, Wy: wy})
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			T      float64  `json:"t"`
			AbsErr float64  `json:"abserr"`
			Closed *float64 `json:"closed"`
		} `json:"cases"`
	}
	pyref.Run(t, "beam_transmission.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxDiff, maxClosed float64
	for i, test := range cases {
		r := ref.Cases[i]
		got := beam.CircularTransmission(units.Length(test.A), units.Length(test.Wx), units.Length(test.Wy))
		if r.AbsErr > tol {
			t.Errorf("case %d: dblquad error estimate %.3g exceeds the tolerance %.0e; reference not accurate enough", i, r.AbsErr, tol)
			continue
		}
		maxDiff = math.Max(maxDiff, math.Abs(got-r.T))
		if !scalar.EqualWithinAbs(got, r.T, tol) {
			t.Errorf("CircularTransmission(%g, %g, %g) = %.16g, want %.16g (dblquad), diff %.3g",
				test.A, test.Wx, test.Wy, got, r.T, got-r.T)
		}
		if r.Closed == nil {
			continue
		}
		// Round beam: closed form, rounding only (a few operations on
		// values ≤ 1): abs 1e-15, plus rel 1e-14 for tiny T from small a/w.
		maxClosed = math.Max(maxClosed, math.Abs(got-*r.Closed))
		if !scalar.EqualWithinAbsOrRel(got, *r.Closed, 1e-15, 1e-14) {
			t.Errorf("CircularTransmission(%g, %g, %g) = %.16g, want %.16g (closed form, numpy)",
				test.A, test.Wx, test.Wy, got, *r.Closed)
		}
	}
	t.Logf("%d cases against %s: max |ΔT| = %.3g (dblquad), %.3g (closed form)", len(cases), ref.Reference, maxDiff, maxClosed)
}

// xcElement is an element as the reference script reads it.
type xcElement struct {
	Kind string  `json:"kind"` // "space", "thin", "sphere", "planar"
	D    float64 `json:"d,omitempty"`
	F    float64 `json:"f,omitempty"`
	R    float64 `json:"r,omitempty"`
	N2   float64 `json:"n2,omitempty"`
}

// xcRandomSystem returns a seeded random rotationally symmetric system of
// thin lenses, spherical surfaces and gaps, some of which end in glass
// behind a planar interface, together with its description for the
// reference script and the input index.
func xcRandomSystem(t *testing.T, rng *rand.Rand) (paraxial.System, []xcElement, float64) {
	t.Helper()
	nIn := 1.0
	if rng.IntN(4) == 0 {
		nIn = 1.33 // starts in water
	}
	b := paraxial.NewBuilder().Medium(nIn)
	var els []xcElement
	space := func(d float64) {
		b.Space(units.Length(d))
		els = append(els, xcElement{Kind: "space", D: d})
	}
	space(0.02 + 0.2*rng.Float64())
	for range 1 + rng.IntN(5) {
		sign := 1.0
		if rng.IntN(2) == 0 {
			sign = -1
		}
		switch rng.IntN(3) {
		case 0, 1:
			f := sign * (0.05 + 0.4*rng.Float64())
			b.ThinLens(units.Length(f))
			els = append(els, xcElement{Kind: "thin", F: f})
		case 2:
			n2 := 1 + 0.9*rng.Float64()
			if rng.IntN(3) == 0 {
				n2 = 1
			}
			r := sign * (0.03 + 0.3*rng.Float64())
			b.Interface(units.Length(r), n2)
			els = append(els, xcElement{Kind: "sphere", R: r, N2: n2})
		}
		space(0.02 + 0.3*rng.Float64())
	}
	if rng.IntN(2) == 0 {
		// Planar interface into glass; the beam ends there (zR and R scale
		// by n2/n1, w continuous).
		n2 := 1.45 + 0.5*rng.Float64()
		b.PlanarInterface(n2)
		els = append(els, xcElement{Kind: "planar", N2: n2})
		space(0.01 + 0.05*rng.Float64())
	}
	sys, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	return sys, els, nIn
}

type xcBeamCase struct {
	NIn      float64     `json:"n_in"`
	Lambda0  float64     `json:"lambda0"`
	QIn      [2]float64  `json:"q_in"`
	Elements []xcElement `json:"elements"`
	Z        []float64   `json:"z"`
	GouyZ    []float64   `json:"gouy_z"`
}

type xcBeamResult struct {
	W    []float64    `json:"w"`
	InvR []float64    `json:"inv_r"`
	Q    [][2]float64 `json:"q"`
	N    []float64    `json:"n"`
	Gouy []float64    `json:"gouy"`
}

func TestCrossCheckABCD(t *testing.T) {
	// Independent reference: the ABCD law in reduced form, q̂ = q/n,
	// q̂₂ = (Â q̂₁ + B̂)/(Ĉ q̂₁ + D̂) with 1/q̂ = n/R − iλ0/(πw²) (Kogelnik & Li,
	// Appl. Opt. 5, 1550 (1966); Siegman, Lasers, ch. 20 [from memory]), the
	// reduced element matrices of Gerrard & Burch (1975) composed with numpy,
	// testdata/crosscheck/beam_abcd.py. Package beam uses the un-reduced
	// matrices on q itself, so agreement checks its documented index
	// handling too.
	//
	// Tolerances: float64 rounding through ≤ 13 matrix products and one
	// Möbius map, amplified by cancellation in C q + D when the beam is
	// strongly focused (condition number ≲ 1e3 for these systems): rel
	// 1e-11 on w and |q|; 1/R is compared with abs 1e-11·|1/q| because it
	// passes through zero at a waist, where a relative test is meaningless.
	const relTol = 1e-11
	rng := rand.New(rand.NewPCG(1, 1))
	var (
		systems []paraxial.System
		inputs  []beam.Gaussian
		cases   []xcBeamCase
	)
	for range 40 {
		sys, els, nIn := xcRandomSystem(t, rng)
		lambda := []float64{633e-9, 1064e-9, 1550e-9}[rng.IntN(3)]
		g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: units.Length(0.1e-3 + 1.5e-3*rng.Float64()), WaistZ: units.Length(0.4 * (rng.Float64() - 0.5)), Wavelength: units.Length(lambda), Index: nIn})
		if err != nil {
			t.Fatalf("FromWaist error: %v", err)
		}
		// Planes: the middle of every gap, the output plane, and a plane
		// 30 mm beyond it in the output medium.
		var zs []float64
		for _, e := range sys.Elements() {
			if e.Kind == paraxial.KindSpace {
				zs = append(zs, float64(e.Z+e.Length/2))
			}
		}
		zs = append(zs, float64(sys.Length()), float64(sys.Length())+0.03)
		systems, inputs = append(systems, sys), append(inputs, g)
		cases = append(cases, xcBeamCase{NIn: nIn, Lambda0: lambda, QIn: [2]float64{real(g.Q), imag(g.Q)}, Elements: els, Z: zs, GouyZ: []float64{}})
	}
	var ref struct {
		Reference string         `json:"reference"`
		Cases     []xcBeamResult `json:"cases"`
	}
	pyref.Run(t, "beam_abcd.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxW, maxInvR, maxQ float64
	for i, test := range cases {
		r := ref.Cases[i]
		for j, z := range test.Z {
			got, err := beam.At(systems[i], inputs[i], units.Length(z))
			if err != nil {
				t.Errorf("case %d: At(z = %g) error: %v", i, z, err)
				continue
			}
			wantQ := complex(r.Q[j][0], r.Q[j][1])
			w := float64(got.Radius())
			invR := got.WavefrontCurvature()
			scale := cmplx.Abs(1 / wantQ)
			maxW = math.Max(maxW, math.Abs(w-r.W[j])/r.W[j])
			maxInvR = math.Max(maxInvR, math.Abs(invR-r.InvR[j])/scale)
			maxQ = math.Max(maxQ, cmplx.Abs(got.Q-wantQ)/cmplx.Abs(wantQ))
			if !scalar.EqualWithinRel(w, r.W[j], relTol) {
				t.Errorf("case %d: At(z = %g).Radius() = %.15g, want %.15g (reduced ABCD, numpy)", i, z, w, r.W[j])
			}
			if !scalar.EqualWithinAbs(invR, r.InvR[j], relTol*scale) {
				t.Errorf("case %d: At(z = %g).WavefrontCurvature() = %.15g, want %.15g (reduced ABCD, numpy)", i, z, invR, r.InvR[j])
			}
			if cmplx.Abs(got.Q-wantQ) > relTol*cmplx.Abs(wantQ) {
				t.Errorf("case %d: At(z = %g).Q = %v, want %v (reduced ABCD, numpy)", i, z, got.Q, wantQ)
			}
			// The index is data, not arithmetic: exact.
			if got.Index != r.N[j] {
				t.Errorf("case %d: At(z = %g).Index = %g, want %g", i, z, got.Index, r.N[j])
			}
		}
	}
	t.Logf("%d systems against %s: max rel Δw = %.3g, max |Δ(1/R)|·|q| = %.3g, max |Δq|/|q| = %.3g", len(cases), ref.Reference, maxW, maxInvR, maxQ)
}

func TestCrossCheckGouy(t *testing.T) {
	// Independent reference: the on-axis amplitude after a system is
	// ∝ 1/(A + B/q₁) (Siegman, Lasers, ch. 20 [from memory]), so the
	// accumulated Gouy phase is −arg(A(z) + B(z)/q₁) for the cumulative
	// matrix M(z), sampled densely along the path and unwrapped with numpy.unwrap
	// (testdata/crosscheck/beam_abcd.py). beam.Sample instead sums
	// per-element increments; both must give the same unreduced phase,
	// beyond π through several foci.
	//
	// Tolerance: abs 1e-10 rad. Rounding of arg near a tight focus, where
	// |A + B/q₁| = w/w₁ ≈ 1e-2 and the error is eps/1e-2, summed over
	// ≤ 30 increments, is ≲ 1e-13; an error in a Gouy increment (a sign,
	// or a lens that wrongly adds phase) is of order 0.1 rad or more.
	const tol = 1e-10
	rng := rand.New(rand.NewPCG(1, 1))
	var (
		cases   []xcBeamCase
		samples [][]float64
	)
	for len(cases) < 12 {
		// Focusing relays: positive lenses, so the beam passes several foci.
		b := paraxial.NewBuilder()
		var els []xcElement
		d := 0.05 + 0.2*rng.Float64()
		b.Space(units.Length(d))
		els = append(els, xcElement{Kind: "space", D: d})
		for range 1 + rng.IntN(4) {
			f := 0.05 + 0.2*rng.Float64()
			if rng.IntN(4) == 0 {
				f = -f
			}
			d := 0.05 + 0.4*rng.Float64()
			b.ThinLens(units.Length(f)).Space(units.Length(d))
			els = append(els, xcElement{Kind: "thin", F: f}, xcElement{Kind: "space", D: d})
		}
		sys, err := b.Build()
		if err != nil {
			t.Fatalf("Build() error: %v", err)
		}
		g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: units.Length(0.2e-3 + 0.6e-3*rng.Float64()), WaistZ: units.Length(0.1 * rng.Float64()), Wavelength: 1064e-9})
		if err != nil {
			t.Fatalf("FromWaist error: %v", err)
		}
		c, err := beam.Sample(sys, g, 100)
		if err != nil {
			t.Fatalf("Sample error: %v", err)
		}
		gx, _ := c.GouyPhase()
		gouy := make([]float64, len(gx))
		zs := make([]float64, len(c.Z))
		for i := range c.Z {
			gouy[i], zs[i] = float64(gx[i]), float64(c.Z[i])
		}
		samples = append(samples, gouy)
		cases = append(cases, xcBeamCase{NIn: 1, Lambda0: 1064e-9, QIn: [2]float64{real(g.Q), imag(g.Q)}, Elements: els, Z: []float64{}, GouyZ: zs})
	}
	var ref struct {
		Reference string         `json:"reference"`
		Cases     []xcBeamResult `json:"cases"`
	}
	pyref.Run(t, "beam_abcd.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxDiff, maxTotal float64
	for i, test := range cases {
		r := ref.Cases[i]
		if len(r.Gouy) != len(test.GouyZ) {
			t.Errorf("case %d: reference returned %d Gouy values, want %d", i, len(r.Gouy), len(test.GouyZ))
			continue
		}
		got := samples[i]
		for j, z := range test.GouyZ {
			g := got[j] - got[0]
			maxDiff = math.Max(maxDiff, math.Abs(g-r.Gouy[j]))
			if !scalar.EqualWithinAbs(g, r.Gouy[j], tol) {
				t.Errorf("case %d: Sample Gouy(z = %g) − Gouy(0) = %.15g, want %.15g (numpy.unwrap)", i, z, g, r.Gouy[j])
			}
		}
		maxTotal = math.Max(maxTotal, math.Abs(r.Gouy[len(r.Gouy)-1]))
	}
	t.Logf("%d systems against %s: max |Δψ| = %.3g rad (largest total phase %.3f rad)", len(cases), ref.Reference, maxDiff, maxTotal)
}
