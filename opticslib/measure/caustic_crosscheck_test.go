package measure_test

// Cross-check of FitCaustic against an independent reference in Python
// (testdata/crosscheck/measure_caustic.py): scipy.optimize.curve_fit for
// the coefficients and covariance of d² = A + Bz + Cz² in the raw z
// coordinate (with sigma and absolute_sigma for the weighted fit),
// numpy.polyfit as a second solver, ISO 11146-1's formulas for the beam
// parameters and complex-step gradients for their uncertainties. The Go
// code fits in a centred coordinate with gonum's QR and derives the
// parameters with analytic gradients, so agreement checks the method, not
// a re-run of the same arithmetic. The test skips when /usr/bin/python3
// or numpy/scipy are missing; CI has them.

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/units"
)

type causticXCase struct {
	Z         []float64 `json:"z"`
	D         []float64 `json:"d"`
	SigmaD    []float64 `json:"sigma_d"`
	Weighting string    `json:"weighting"`
	Lambda0   float64   `json:"lambda0"`
	N         float64   `json:"n"`
	scan      measure.WidthScan
	wt        measure.Weighting
}

type causticXResult struct {
	ABC        [3]float64         `json:"abc"`
	Cov        [3][3]float64      `json:"cov"`
	ABCPolyfit [3]float64         `json:"abc_polyfit"`
	Z0         float64            `json:"z0"`
	D0         float64            `json:"d0"`
	Theta      float64            `json:"theta"`
	ZR         float64            `json:"zr"`
	M2         float64            `json:"m2"`
	Sigma      map[string]float64 `json:"sigma"`
	Chi2       float64            `json:"chi2"`
}

func TestCrossCheckCaustic(t *testing.T) {
	// Tolerances. Coefficients: the two sides solve the same linear
	// least-squares problem in different coordinates; the raw-z problem of
	// the reference has a condition number up to ~1e5 for these scans
	// (z up to 0.6 m, spans of a few cm), so agreement to 1e-9 of the
	// magnitude |A| + |B|zmax + |C|zmax² of the terms is expected to hold
	// with margin (observed ≲ 1e-11). Covariances: rel 1e-7 of
	// √(Cii Cjj), for the same reason. Beam parameters: rel 1e-7 (z0 abs
	// 1e-7 zR), as 4AC − B² cancels by 1 + (z0/zR)² (up to 3e5 here) in
	// the raw coordinate, so about 3e-11 is expected. Their uncertainties:
	// rel 1e-11·(1 + (z0/zR)²), and no less than 1e-8: the reference's
	// quadratic form gᵀCg in the raw coordinate cancels by about
	// (z0/zR)² (observed: 3e-7 at z0/zR = 550). A wrong estimator is far
	// outside these: weights from the measured instead of the fitted
	// widths move the coefficients by 2.6e-5 to 4e-2 of the terms on
	// these cases; a missing factor 2 in σ(d²), or N − 2 instead of N − 3
	// degrees of freedom, changes the uncertainties by 5 % or more.
	const (
		coefTol  = 1e-9
		covTol   = 1e-7
		parTol   = 1e-7
		sigmaTol = 1e-11
	)
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []causticXCase
	weightings := []struct {
		name string
		wt   measure.Weighting
	}{{"uncertainty", measure.UncertaintyWeighted}, {"unweighted", measure.Unweighted}, {"relative", measure.RelativeWeighted}}
	for k := range 36 {
		lambda := []units.Length{532e-9, 1064e-9, 1550e-9}[rng.IntN(3)]
		n := 1.0
		if rng.IntN(4) == 0 {
			n = 1.33
		}
		b := causticBeam{units.Length(20e-6 + 480e-6*rng.Float64()), units.Length(0.05 + 0.35*rng.Float64()), 1 + 2*rng.Float64()}
		zR := b.zR(lambda, n)
		var z []units.Length
		if k%2 == 0 {
			z = causticR17Planes(b.z0, zR)
		} else {
			// Random planes, not following R17, 6 to 15 of them.
			for range 6 + rng.IntN(10) {
				z = append(z, b.z0+units.Length(-4+9*rng.Float64())*zR)
			}
		}
		rel := 0.005 + 0.025*rng.Float64()
		d := causticWidths(b, z, measure.SecondMomentDiameter, lambda, n)
		w := weightings[k%3]
		c := causticXCase{Weighting: w.name, Lambda0: float64(lambda), N: n, wt: w.wt}
		var sd []units.Length
		for i := range d {
			c.Z = append(c.Z, float64(z[i]))
			s := rel * float64(d[i])
			d[i] += units.Length(s * rng.NormFloat64())
			c.D = append(c.D, float64(d[i]))
			c.SigmaD = append(c.SigmaD, s)
			sd = append(sd, units.Length(s))
		}
		if w.wt != measure.UncertaintyWeighted {
			c.SigmaD, sd = nil, nil
		}
		c.scan = measure.WidthScan{Z: z, Round: d, SigmaRound: sd, Kind: measure.SecondMomentDiameter}
		cases = append(cases, c)
	}
	var ref struct {
		Reference string           `json:"reference"`
		Cases     []causticXResult `json:"cases"`
	}
	pyref.Run(t, "measure_caustic.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxCoef, maxCov, maxPar, maxSigma float64
	for i, c := range cases {
		r := ref.Cases[i]
		f, err := measure.FitCaustic(c.scan, measure.CausticOptions{Wavelength: units.Length(c.Lambda0), Index: c.N, Weighting: c.wt})
		if err != nil {
			t.Errorf("case %d: FitCaustic error: %v", i, err)
			continue
		}
		a := f.X
		zmax := 0.0
		for _, z := range c.Z {
			zmax = math.Max(zmax, math.Abs(z))
		}
		scale := math.Abs(r.ABC[0]) + math.Abs(r.ABC[1])*zmax + math.Abs(r.ABC[2])*zmax*zmax
		got := [3]float64{a.A, a.B, a.C}
		for j := range 3 {
			for _, want := range []float64{r.ABC[j], r.ABCPolyfit[j]} {
				dev := math.Abs(got[j]-want) / scale
				maxCoef = math.Max(maxCoef, dev)
				if dev > coefTol {
					t.Errorf("case %d (%s): coefficient %c = %.15g, want %.15g (curve_fit/polyfit), off by %.3g of the terms", i, c.Weighting, "ABC"[j], got[j], want, dev)
				}
			}
			for l := range 3 {
				dev := math.Abs(a.Covariance[j][l]-r.Cov[j][l]) / math.Sqrt(r.Cov[j][j]*r.Cov[l][l])
				maxCov = math.Max(maxCov, dev)
				if dev > covTol {
					t.Errorf("case %d (%s): covariance [%d][%d] = %.12g, want %.12g (curve_fit)", i, c.Weighting, j, l, a.Covariance[j][l], r.Cov[j][l])
				}
			}
		}
		for _, p := range []struct {
			name      string
			got, want float64
			abs       float64
			gs, ws    float64
		}{
			{"z0", float64(a.Z0.Value), r.Z0, parTol * r.ZR, float64(a.Z0.Sigma), r.Sigma["z0"]},
			{"d0", 2 * float64(a.W0.Value), r.D0, 0, 2 * float64(a.W0.Sigma), r.Sigma["d0"]},
			{"Θ", float64(a.Divergence.Value), r.Theta, 0, float64(a.Divergence.Sigma), r.Sigma["theta"]},
			{"zR", float64(a.RayleighRange.Value), r.ZR, 0, float64(a.RayleighRange.Sigma), r.Sigma["zr"]},
			{"M²", a.M2.Value, r.M2, 0, a.M2.Sigma, r.Sigma["m2"]},
		} {
			dev := math.Abs(p.got - p.want)
			if p.abs == 0 {
				dev /= math.Abs(p.want)
			} else {
				dev /= p.abs / parTol
			}
			maxPar = math.Max(maxPar, dev)
			if dev > parTol {
				t.Errorf("case %d (%s): %s = %.15g, want %.15g (ISO 11146-1 on curve_fit)", i, c.Weighting, p.name, p.got, p.want)
			}
			ds := math.Abs(p.gs-p.ws) / p.ws
			maxSigma = math.Max(maxSigma, ds)
			if ds > math.Max(1e-8, sigmaTol*(1+(r.Z0/r.ZR)*(r.Z0/r.ZR))) {
				t.Errorf("case %d (%s): σ(%s) = %.12g, want %.12g (complex-step gradients)", i, c.Weighting, p.name, p.gs, p.ws)
			}
		}
		if c.wt == measure.UncertaintyWeighted && math.Abs(a.ChiSquare-r.Chi2) > 1e-8*r.Chi2 {
			t.Errorf("case %d: χ² = %.12g, want %.12g", i, a.ChiSquare, r.Chi2)
		}
	}
	t.Logf("%d cases against %s: max coefficient deviation %.3g (of the terms), covariance %.3g, parameters %.3g, uncertainties %.3g (rel)",
		len(cases), ref.Reference, maxCoef, maxCov, maxPar, maxSigma)
}
