package measure_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestCrossCheckKnifeEdge(t *testing.T) {
	// Independent reference: testdata/crosscheck/measure_knife.py, SciPy
	// 1.10 / NumPy 1.24 (Debian 12). The fit is scipy.optimize.curve_fit
	// (MINPACK Levenberg–Marquardt, forward-difference Jacobian) on the erf
	// model with scipy.special.erf, absolute_sigma=False; the Go code uses
	// BFGS with an analytic gradient and Gauss–Newton refinement, so the
	// two meet only at the least-squares minimum. The inversion (scipy's
	// erfinv, numpy's lstsq) and the clip rule are recomputed from the
	// package's documented definitions.
	//
	// Tolerances:
	//   - fit parameters: |Δθ| ≤ 1e-4 σθ + 1e-12 scale. Both stop at the
	//     minimum to far better than its statistical uncertainty; MINPACK's
	//     forward-difference Jacobian (steps of √eps = 1.5e-8 relative) and
	//     xtol = 1e-15 place its minimum within ≈1e-6 σ (6e-7 σ measured).
	//     A wrong gradient or an early stop is off by 1e-2 σ or more.
	//   - parameter uncertainties: rel 1e-5, the forward-difference
	//     Jacobian's error in (JᵀJ)⁻¹ (2.4e-6 measured) with margin; a covariance not
	//     scaled by the residual variance, or scaled by n instead of n − 4,
	//     is off by 10 % or more.
	//   - inversion w, x0: rel 1e-10 of w (the same small linear problem,
	//     QR here, SVD in lstsq: rounding ≲1e-13, amplified by erf⁻¹ near
	//     5 %/95 %).
	//   - clip w, x0: rel 1e-12 of w (a few interpolations).
	type xcase struct {
		X     []float64 `json:"x"`
		P     []float64 `json:"p"`
		Sigma []float64 `json:"sigma"`
	}
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []xcase
	var scans []measure.KnifeScan
	for i := range 24 {
		w := 0.05e-3 + 2e-3*rng.Float64()
		x0 := w * (rng.Float64() - 0.5)
		n := 20 + rng.IntN(150)
		lo, hi := x0-(2.5+1.5*rng.Float64())*w, x0+(2.5+1.5*rng.Float64())*w
		p0, pmax := 0.05*(rng.Float64()-0.3), 0.1+10*rng.Float64()
		noise := pmax * math.Pow(10, -3+1.7*rng.Float64()) // 0.1 % to 5 % of Pmax
		given := i%3 == 2
		cover := i%2 == 1
		c := xcase{}
		s := measure.KnifeScan{}
		for j := range n {
			x := lo + (hi-lo)*float64(j)/float64(n-1)
			e := math.Erf(math.Sqrt2 * (x - x0) / w)
			if cover {
				e = -e
			}
			sg := noise
			if given {
				sg = noise * (0.5 + (1+e)/2) // more noise on the bright side
				c.Sigma = append(c.Sigma, sg)
			}
			p := p0 + pmax/2*(1+e) + sg*rng.NormFloat64()
			c.X, c.P = append(c.X, x), append(c.P, p)
			s.Positions, s.Powers = append(s.Positions, units.Length(x)), append(s.Powers, p)
		}
		s.PowerUncertainties = c.Sigma
		cases, scans = append(cases, c), append(scans, s)
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			Fit struct {
				P0, Pmax, X0, W float64
				SD              [4]float64 `json:"sd"`
				Ier             int        `json:"ier"`
			} `json:"fit"`
			Inversion struct {
				W, X0  float64
				Points int
			} `json:"inversion"`
			Clip struct{ W, X0 float64 } `json:"clip"`
		} `json:"cases"`
	}
	pyref.Run(t, "measure_knife.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxPull, maxSD, maxInv, maxClip float64
	for i, s := range scans {
		r := ref.Cases[i]
		k, err := measure.KnifeEdgeFromScan(s)
		if err != nil {
			t.Errorf("case %d: KnifeEdgeFromScan error: %v", i, err)
			continue
		}
		if r.Fit.Ier < 1 || r.Fit.Ier > 4 {
			t.Errorf("case %d: curve_fit ier = %d, reference did not converge", i, r.Fit.Ier)
			continue
		}
		w := float64(k.Radius.Value)
		for _, c := range []struct {
			name               string
			got, want, sd, ref float64
			gotSD              float64
		}{
			{"Background", k.Background.Value, r.Fit.P0, r.Fit.SD[0], r.Fit.Pmax, k.Background.Sigma},
			{"Power", k.Power.Value, r.Fit.Pmax, r.Fit.SD[1], r.Fit.Pmax, k.Power.Sigma},
			{"Center", float64(k.Center.Value), r.Fit.X0, r.Fit.SD[2], w, float64(k.Center.Sigma)},
			{"Radius", w, r.Fit.W, r.Fit.SD[3], w, float64(k.Radius.Sigma)},
		} {
			if d := math.Abs(c.got - c.want); d > 1e-4*c.sd+1e-12*c.ref {
				t.Errorf("case %d: %s = %.12g, want %.12g (curve_fit), diff %.2g σ", i, c.name, c.got, c.want, d/c.sd)
			}
			maxPull = math.Max(maxPull, math.Abs(c.got-c.want)/c.sd)
			if rel := math.Abs(c.gotSD/c.sd - 1); rel > 1e-5 {
				t.Errorf("case %d: %s uncertainty = %.9g, want %.9g (curve_fit pcov), rel %.2g", i, c.name, c.gotSD, c.sd, rel)
			}
			maxSD = math.Max(maxSD, math.Abs(c.gotSD/c.sd-1))
		}
		if k.Inversion.Points != r.Inversion.Points {
			t.Errorf("case %d: Inversion.Points = %d, want %d", i, k.Inversion.Points, r.Inversion.Points)
		}
		for _, c := range [][3]float64{
			{float64(k.Inversion.Radius.Value), r.Inversion.W, 1e-10},
			{float64(k.Inversion.Center), r.Inversion.X0, 1e-10},
			{float64(k.Clip.Radius.Value), r.Clip.W, 1e-12},
			{float64(k.Clip.Center), r.Clip.X0, 1e-12},
		} {
			if d := math.Abs(c[0] - c[1]); d > c[2]*w {
				t.Errorf("case %d: cross-check value %.15g, want %.15g (numpy/scipy), diff %.2g w", i, c[0], c[1], d/w)
			}
		}
		maxInv = math.Max(maxInv, math.Abs(float64(k.Inversion.Radius.Value)-r.Inversion.W)/w)
		maxClip = math.Max(maxClip, math.Abs(float64(k.Clip.Radius.Value)-r.Clip.W)/w)
	}
	t.Logf("%d scans against %s: fit max |Δθ| = %.2g σ, uncertainties max rel %.2g, inversion max |Δw|/w = %.2g, clip %.2g",
		len(cases), ref.Reference, maxPull, maxSD, maxInv, maxClip)
}
