package measure

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

func TestKnifeFitIterationLimit(t *testing.T) {
	// A fit cut off after one BFGS iteration has not converged, and says
	// so. (No natural scan that passes the checks before the fit is known
	// to make BFGS run away, so the limit is lowered here.)
	defer func(n int) { knifeMaxIterations = n }(knifeMaxIterations)
	knifeMaxIterations = 1
	rng := rand.New(rand.NewPCG(1, 1))
	var s KnifeScan
	for i := range 41 {
		x := -3e-3 + 6e-3*float64(i)/40
		s.Positions = append(s.Positions, units.Length(x))
		s.Powers = append(s.Powers, 0.5*(1+math.Erf(math.Sqrt2*x/1e-3))+0.01*rng.NormFloat64())
	}
	_, err := KnifeEdgeFromScan(s)
	var pe *ParamError
	if !errors.Is(err, ErrNotConverged) || !errors.As(err, &pe) || pe.Param != "BFGS iterations" {
		t.Errorf("KnifeEdgeFromScan with one BFGS iteration: error %v, want a *ParamError on \"BFGS iterations\" wrapping ErrNotConverged", err)
	}
}

func TestKnifeRuns(t *testing.T) {
	// Wald & Wolfowitz (1940): for n₊ = n₋ = 5, μ = 2·25/10 + 1 = 6 and
	// σ² = 2·25·(50 − 10)/(100·9) = 20/9.
	runs, mean, sd := knifeRuns([]float64{1, 1, -1, -1, -1, 1, -1, 1, 1, -1})
	if runs != 6 || math.Abs(mean-6) > 1e-15 || math.Abs(sd-math.Sqrt(20.0/9)) > 1e-15 {
		t.Errorf("knifeRuns = %d, %g, %g, want 6, 6, %g", runs, mean, sd, math.Sqrt(20.0/9))
	}
	// A zero joins the run before it.
	if runs, _, _ := knifeRuns([]float64{1, 0, 1, -1, 0, -1}); runs != 2 {
		t.Errorf("knifeRuns with zeros = %d runs, want 2", runs)
	}
}

func TestKnifeDecimals(t *testing.T) {
	for _, test := range []struct {
		sigma, mag float64
		want       int
	}{
		{0.0070, 1.0005, 4}, // 1.0005 ± 0.0070
		{1.8, 999.4, 1},     // 999.4 ± 1.8
		{0, 1, 5},           // six digits of the value
		{25, 1000, 0},
		{0.012, 0, 3},
	} {
		if got := knifeDecimals(test.sigma, test.mag); got != test.want {
			t.Errorf("knifeDecimals(%g, %g) = %d, want %d", test.sigma, test.mag, got, test.want)
		}
	}
}
