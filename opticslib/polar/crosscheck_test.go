package polar_test

// Cross-check of package polar against an independent reference written
// in Python with numpy (testdata/crosscheck/polar_jones.py): the element
// matrices built as R(−θ)·D·R(θ) and composed with numpy's complex matrix
// products, Stokes parameters from the coherency matrix, Mueller matrices
// from A (J ⊗ J*) A⁻¹ with numpy.kron and numpy.linalg.inv, and the
// Fresnel coefficients from Fresnel's sine and tangent forms (the Go code
// uses closed-form entries, the Pauli-trace form of the Mueller matrix and
// the n cos θ forms). The test skips when the interpreter or numpy is
// missing; CI has them.

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

type xcElement struct {
	Kind  string   `json:"kind"`
	Theta float64  `json:"theta,omitempty"`
	Gamma float64  `json:"gamma,omitempty"`
	Rho   float64  `json:"rho,omitempty"`
	ER    *float64 `json:"er,omitempty"`
	Dir   string   `json:"dir,omitempty"`
}

type xcChain struct {
	Input    [2][2]float64 `json:"input"`
	Elements []xcElement   `json:"elements"`
}

type xcFresnel struct {
	N1    float64 `json:"n1"`
	N2    float64 `json:"n2"`
	Theta float64 `json:"theta"`
}

// xcRandomElement returns a seeded random element as the script reads it
// and as package polar builds it.
func xcRandomElement(t *testing.T, rng *rand.Rand) (xcElement, polar.JonesMatrix) {
	mat := mustOf[polar.JonesMatrix](t)
	th := 2 * math.Pi * (rng.Float64() - 0.5)
	er := math.Pow(10, 1+5*rng.Float64())
	switch rng.IntN(9) {
	case 0:
		return xcElement{Kind: "polarizer", Theta: th}, mat(polar.Polarizer(units.Angle(th)))
	case 1:
		return xcElement{Kind: "partial", Theta: th, ER: &er}, mat(polar.PartialPolarizer(units.Angle(th), er))
	case 2, 3:
		g := 4 * math.Pi * (rng.Float64() - 0.5)
		return xcElement{Kind: "retarder", Theta: th, Gamma: g}, mat(polar.Retarder(units.Angle(th), units.Angle(g)))
	case 4:
		return xcElement{Kind: "rotator", Rho: th}, mat(polar.Rotator(units.Angle(th)))
	case 5:
		dir, d := "forward", polar.Forward
		if rng.IntN(2) == 0 {
			dir, d = "backward", polar.Backward
		}
		return xcElement{Kind: "faraday", Rho: th, Dir: dir}, mat(polar.FaradayRotator(units.Angle(th), d))
	case 6:
		return xcElement{Kind: "mirror"}, polar.Mirror()
	case 7:
		p := mustOf[polar.Ports](t)(polar.PolarizingBeamSplitter(er, math.Inf(1)))
		return xcElement{Kind: "pbs_t", ER: &er}, p.Transmitted
	}
	p := mustOf[polar.Ports](t)(polar.PolarizingBeamSplitter(math.Inf(1), er))
	return xcElement{Kind: "pbs_r", ER: &er}, p.Reflected
}

func TestCrossCheckJonesNumPy(t *testing.T) {
	// Tolerances: up to 8 products of 2×2 matrices with entries ≤ 1 in
	// magnitude and inputs |v|² ≤ 20: rounding ~1e-15 per product, so abs
	// 1e-13 on amplitudes, powers, Stokes parameters and Mueller entries
	// (entries ≤ 1). A wrong sign convention (handedness, the retarder's
	// phase, the Faraday return) or element order is off by order 1.
	const tol = 1e-13
	rng := rand.New(rand.NewPCG(1, 1))
	var (
		chains []xcChain
		mats   []polar.JonesMatrix
		steps  [][]polar.Element
		inputs []polar.Jones
	)
	for range 60 {
		v := polar.Jones{X: complex(2*rng.Float64()-1, 2*rng.Float64()-1), Y: complex(2*rng.Float64()-1, 2*rng.Float64()-1)}
		c := xcChain{Input: [2][2]float64{{real(v.X), imag(v.X)}, {real(v.Y), imag(v.Y)}}}
		m := polar.Identity()
		var els []polar.Element
		for range 1 + rng.IntN(8) {
			xe, j := xcRandomElement(t, rng)
			c.Elements = append(c.Elements, xe)
			m = m.Then(j)
			els = append(els, polar.Element{Name: xe.Kind, Matrix: j})
		}
		chains, mats, steps, inputs = append(chains, c), append(mats, m), append(steps, els), append(inputs, v)
	}
	var ref struct {
		Reference string `json:"reference"`
		Chains    []struct {
			Out         [2][2]float64 `json:"out"`
			Powers      []float64     `json:"powers"`
			Stokes      [4]float64    `json:"stokes"`
			Mueller     [4][4]float64 `json:"mueller"`
			MuellerImag float64       `json:"mueller_imag"`
		} `json:"chains"`
	}
	pyref.Run(t, "polar_jones.py", map[string]any{"chains": chains}, &ref)
	if len(ref.Chains) != len(chains) {
		t.Fatalf("reference returned %d chains, want %d", len(ref.Chains), len(chains))
	}
	var maxV, maxM float64
	for i, r := range ref.Chains {
		want := polar.Jones{X: complex(r.Out[0][0], r.Out[0][1]), Y: complex(r.Out[1][0], r.Out[1][1])}
		got := mats[i].Apply(inputs[i])
		d := math.Max(cmplx.Abs(got.X-want.X), cmplx.Abs(got.Y-want.Y))
		maxV = math.Max(maxV, d)
		if d > tol {
			t.Errorf("chain %d (%v): output %v, want %v (numpy)", i, chains[i].Elements, got, want)
		}
		b := mustOf[polar.Budget](t)(polar.Trace(inputs[i], steps[i]...))
		for k, s := range b.Steps {
			if math.Abs(s.Power-r.Powers[k]) > tol {
				t.Errorf("chain %d step %d: power %.17g, want %.17g (numpy)", i, k, s.Power, r.Powers[k])
			}
		}
		s := got.Stokes()
		for k, g := range [4]float64{s.S0, s.S1, s.S2, s.S3} {
			if math.Abs(g-r.Stokes[k]) > tol {
				t.Errorf("chain %d: S%d = %.17g, want %.17g (numpy)", i, k, g, r.Stokes[k])
			}
		}
		if r.MuellerImag > tol {
			t.Errorf("chain %d: reference Mueller matrix has |Im| = %g; reference not real", i, r.MuellerImag)
		}
		m := mats[i].Mueller()
		for a := range 4 {
			for c := range 4 {
				maxM = math.Max(maxM, math.Abs(m[a][c]-r.Mueller[a][c]))
				if math.Abs(m[a][c]-r.Mueller[a][c]) > tol {
					t.Errorf("chain %d: Mueller[%d][%d] = %.17g, want %.17g (numpy kron)", i, a, c, m[a][c], r.Mueller[a][c])
				}
			}
		}
	}
	t.Logf("%d chains against %s: max |Δv| = %.3g, max |ΔM| = %.3g", len(chains), ref.Reference, maxV, maxM)
}

func TestCrossCheckFresnelNumPy(t *testing.T) {
	// Tolerances: both sides evaluate closed forms with a handful of
	// operations, but Fresnel's sine/tangent forms cancel in θi − θt near
	// normal incidence and near n1 = n2, where their relative error grows
	// to ~1e-16/|θi − θt|; abs 1e-12 on coefficients ≤ 2 and powers ≤ 1
	// covers the cases drawn here (|θi − θt| > 1e-4), while a wrong sign
	// convention or a missing n cos θ factor is off by 1e-2 or more.
	const tol = 1e-12
	rng := rand.New(rand.NewPCG(2, 2))
	cases := []xcFresnel{{1, 1.5, 0}, {1.5, 1, 0}, {1, 1.5, math.Atan(1.5)}, {1.5, 1, math.Pi / 4}, {1, 1.5, math.Pi / 4}}
	for len(cases) < 200 {
		c := xcFresnel{N1: 1 + 1.5*rng.Float64(), N2: 1 + 1.5*rng.Float64(), Theta: 1.55 * rng.Float64()}
		thT := math.Asin(math.Min(1, c.N1*math.Sin(c.Theta)/c.N2))
		if math.Abs(c.Theta-thT) < 1e-4 || math.Abs(c.N1*math.Sin(c.Theta)/c.N2-1) < 1e-6 {
			continue // cancellation in the sine forms, or at the critical angle
		}
		cases = append(cases, c)
	}
	var ref struct {
		Reference string `json:"reference"`
		Fresnel   []struct {
			RS, RP, TS, TP [2]float64
			R, T           [2]float64
			TIR            bool `json:"tir"`
		} `json:"fresnel"`
	}
	pyref.Run(t, "polar_jones.py", map[string]any{"fresnel": cases}, &ref)
	if len(ref.Fresnel) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Fresnel), len(cases))
	}
	var maxD float64
	tirCount := 0
	for i, c := range cases {
		r := ref.Fresnel[i]
		f := mustOf[polar.Fresnel](t)(polar.Interface(c.N1, c.N2, units.Angle(c.Theta)))
		if f.TIR != r.TIR {
			t.Errorf("Interface(%g, %g, %g).TIR = %v, want %v", c.N1, c.N2, c.Theta, f.TIR, r.TIR)
			continue
		}
		if f.TIR {
			tirCount++
		}
		rs, rp := f.Reflectance()
		ts, tp := f.Transmittance()
		for _, p := range []struct {
			name string
			got  complex128
			want [2]float64
		}{{"r_s", f.RS, r.RS}, {"r_p", f.RP, r.RP}, {"t_s", f.TS, r.TS}, {"t_p", f.TP, r.TP},
			{"Rs", complex(rs, 0), [2]float64{r.R[0]}}, {"Rp", complex(rp, 0), [2]float64{r.R[1]}},
			{"Ts", complex(ts, 0), [2]float64{r.T[0]}}, {"Tp", complex(tp, 0), [2]float64{r.T[1]}}} {
			d := cmplx.Abs(p.got - complex(p.want[0], p.want[1]))
			maxD = math.Max(maxD, d)
			if d > tol {
				t.Errorf("Interface(%g, %g, %g°) %s = %v, want %v (numpy, Fresnel's sine forms)", c.N1, c.N2, c.Theta*180/math.Pi, p.name, p.got, complex(p.want[0], p.want[1]))
			}
		}
	}
	t.Logf("%d interfaces (%d with TIR) against %s: max |Δ| = %.3g", len(cases), tirCount, ref.Reference, maxD)
}
