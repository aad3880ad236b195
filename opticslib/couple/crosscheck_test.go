package couple_test

// Cross-checks of package couple against independent reference
// computations in Python with numpy and scipy
// (testdata/crosscheck/couple_*.py):
//
//   - couple_overlap.py: the overlap integral summed on a grid from the
//     fields themselves (the Go code uses the closed Gaussian integral): a
//     full 2-D (x, y) grid for TEM₀₀ pairs, and a 2-D (x1, x2) grid of the
//     Gaussian Schell-model cross-spectral density for beams with M² > 1;
//   - couple_lp01.py: the exact LP₀₁ mode of a step-index fibre and the
//     Gaussian that overlaps it best, against Marcuse's fit.
//
// The tests skip when the interpreter or the modules are missing, except
// under CI=true, where they fail (see runRef). They run in parallel: the
// grid quadrature alone takes about 3 s.

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/units"
)

type xcAxis [3]float64 // waist radius, waist position, M²

type xcBeam struct {
	X xcAxis `json:"x"`
	Y xcAxis `json:"y"`
}

type xcCase struct {
	Lambda0 float64 `json:"lambda0"`
	N       float64 `json:"n"`
	A       xcBeam  `json:"a"`
	B       xcBeam  `json:"b"`
	DX      float64 `json:"dx"`
	DY      float64 `json:"dy"`
	TX      float64 `json:"tx"`
	TY      float64 `json:"ty"`
}

func xcInput(t *testing.T, c xcCase, b xcBeam) beam.Astigmatic {
	t.Helper()
	spec := func(a xcAxis) beam.WaistSpec {
		return beam.WaistSpec{Wavelength: units.Length(c.Lambda0), WaistRadius: units.Length(a[0]), WaistZ: units.Length(a[1]), M2: a[2], Index: c.N}
	}
	g, err := beam.FromWaists(spec(b.X), spec(b.Y))
	if err != nil {
		t.Fatalf("FromWaists: %v", err)
	}
	return g
}

// Tolerance: abs 1e-9. The grid sums converge spectrally for Gaussians
// (the script reports the change from 301 to 401 points per side, which
// must itself stay below 1e-10); a wrong closed form (a missing
// curvature term, a sign of the tilt against the curvature, a factor 2
// in an exponent) is off by 1e-3 or more in these cases.
func TestCrossCheckOverlap(t *testing.T) {
	t.Parallel()
	const tol = 1e-9
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []xcCase
	for i := range 24 {
		lam := 0.5e-6 + 1.2e-6*rng.Float64()
		ax := func(m2 float64) xcAxis {
			w := 40e-6 + 160e-6*rng.Float64()
			zr := math.Pi * w * w / (m2 * lam)
			return xcAxis{w, (rng.Float64() - 0.5) * 3 * zr, m2}
		}
		m2 := 1.0
		if i%4 == 3 {
			m2 = 1 + 1.5*rng.Float64()
		}
		c := xcCase{Lambda0: lam, N: 1, A: xcBeam{ax(m2), ax(1)}, B: xcBeam{ax(1), ax(1)}}
		if i%6 == 5 {
			c.N = 1.45
		}
		if i%3 != 0 { // misaligned: offsets up to ~0.7 w, tilts up to ~0.7 θ0
			w := c.A.X[0]
			th := lam / (math.Pi * w)
			c.DX, c.DY = (rng.Float64()-0.5)*1.4*w, (rng.Float64()-0.5)*1.4*w
			c.TX, c.TY = (rng.Float64()-0.5)*1.4*th, (rng.Float64()-0.5)*1.4*th
		}
		cases = append(cases, c)
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			Eta float64 `json:"eta"`
			Err float64 `json:"err"`
		} `json:"cases"`
	}
	pyref.Run(t, "couple_overlap.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxDiff float64
	for i, c := range cases {
		r := ref.Cases[i]
		if r.Err > tol/10 {
			t.Errorf("case %d: grid change %.3g exceeds %.0e; reference not converged", i, r.Err, tol/10)
			continue
		}
		got, err := couple.Overlap(xcInput(t, c, c.A), xcInput(t, c, c.B), couple.Misalignment{
			DX: units.Length(c.DX), DY: units.Length(c.DY), TiltX: units.Angle(c.TX), TiltY: units.Angle(c.TY)})
		if err != nil {
			t.Errorf("case %d: %v", i, err)
			continue
		}
		maxDiff = math.Max(maxDiff, math.Abs(got.Efficiency-r.Eta))
		if !scalar.EqualWithinAbs(got.Efficiency, r.Eta, tol) {
			t.Errorf("case %d: Overlap = %.12g, grid quadrature %.12g (%+v)", i, got.Efficiency, r.Eta, c)
		}
	}
	t.Logf("%d cases against %s: max |Δη| = %.3g", len(cases), ref.Reference, maxDiff)
}

// Marcuse's fit of the mode-field radius, w/a = 0.65 + 1.619 V^(−3/2) +
// 2.879 V^(−6) (D. Marcuse, "Loss analysis of single-mode fiber splices",
// Bell Syst. Tech. J. 56, 703–718 (1977) [from memory]), against the
// radius of the Gaussian that overlaps the exact LP₀₁ mode best, computed
// by SciPy from the LP₀₁ eigenvalue equation of the weakly guiding
// step-index fibre, u J1(u)/J0(u) = w K1(w)/K0(w), u² + w² = V² (D. Gloge,
// "Weakly guiding fibers", Appl. Opt. 10, 2252–2258 (1971) [from memory]),
// with numerical integration of the overlap and a 1-D maximisation
// (testdata/crosscheck/couple_lp01.py). The Go code has no exact mode, so
// this tests the fit itself over the range FibreFromCore accepts,
// 1.2 ≤ V ≤ 2.405.
//
// Tolerances:
//   - Marcuse states about 1 % accuracy for 1.2 ≤ V ≤ 2.4 [from memory].
//     Measured with this script on a 0.01 grid in V: the largest
//     deviation is +0.804 % at V = 2.27 (the fit's radius is larger), the
//     most negative −0.218 % at V = 1.38, and 0.778 % at the cut-off. The
//     tolerance is 0.81 %, just above the measured largest: a coefficient
//     off by 10 % (1.619 → 1.78 moves w/a by 4 % at V = 2.3) fails.
//   - The exact optimum Gaussian collects η = 0.9439 of the mode at
//     V = 1.2, rising with V to 0.9967 at V = 2.405; η > 0.99 holds only
//     from V ≈ 1.93 (measured, same script). Checked: η rises with V,
//     η ≥ 0.94 over the range, η > 0.99 for V ≥ 2.0. So at the low end of
//     the fit's range a Gaussian model of the mode misses up to 5.6 % of
//     the power, whatever its radius.
//   - Reference self-checks: eigenvalue residual ≤ 1e-12, quad's error
//     estimate ≤ 1e-9, and the quadrature of the mode power equal to its
//     closed form by the Lommel integrals to 1e-12 (see the script).
func TestCrossCheckMarcuseLP01(t *testing.T) {
	t.Parallel()
	const (
		devTol   = 0.0081 // relative, |fit/exact − 1|
		etaLow   = 0.94   // over 1.2 ≤ V ≤ 2.405
		etaHigh  = 0.99   // for V ≥ etaHighV
		etaHighV = 2.0
	)
	var vs []float64
	for i := range 25 {
		vs = append(vs, 1.2+0.05*float64(i)) // 1.2 … 2.4
	}
	vs = append(vs, 2.27, couple.LP11Cutoff) // the measured worst case, and the end of FibreFromCore's range
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			V        float64 `json:"v"`
			Residual float64 `json:"residual"`
			Ratio    float64 `json:"ratio"`
			Eta      float64 `json:"eta"`
			QuadErr  float64 `json:"quad_err"`
			PowerErr float64 `json:"power_err"`
		} `json:"cases"`
	}
	pyref.Run(t, "couple_lp01.py", map[string]any{"v": vs}, &ref)
	if len(ref.Cases) != len(vs) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(vs))
	}
	var maxDev, devV, minEta = 0.0, 0.0, 1.0
	prevEta := 0.0
	for i, r := range ref.Cases {
		v := vs[i]
		if r.Residual > 1e-12 || r.QuadErr > 1e-9 || r.PowerErr > 1e-12 {
			t.Errorf("V = %g: reference not converged (residual %.3g, quad error %.3g, power vs closed form %.3g)", v, r.Residual, r.QuadErr, r.PowerErr)
			continue
		}
		dev := couple.MarcuseRatio(v)/r.Ratio - 1
		if math.Abs(dev) > math.Abs(maxDev) {
			maxDev, devV = dev, v
		}
		if math.Abs(dev) > devTol {
			t.Errorf("MarcuseRatio(%g) = %.6f, exact optimum Gaussian %.6f: deviation %+.3f %%, want within %.2f %%", v, couple.MarcuseRatio(v), r.Ratio, 100*dev, 100*devTol)
		}
		minEta = math.Min(minEta, r.Eta)
		if r.Eta < etaLow || (v >= etaHighV && r.Eta <= etaHigh) || r.Eta > 1 {
			t.Errorf("V = %g: best Gaussian overlap with LP01 = %.6f, want ≥ %g (and > %g for V ≥ %g)", v, r.Eta, etaLow, etaHigh, etaHighV)
		}
		if i < 25 && r.Eta <= prevEta {
			t.Errorf("V = %g: best overlap %.6f does not rise with V (previous %.6f)", v, r.Eta, prevEta)
		}
		if i < 25 {
			prevEta = r.Eta
		}
	}
	t.Logf("%d V-numbers against %s: largest deviation of Marcuse's fit %+.3f %% at V = %.3g; best Gaussian overlap %.4f … %.4f",
		len(vs), ref.Reference, 100*maxDev, devV, minEta, ref.Cases[len(vs)-1].Eta)
}
