package couple_test

// Cross-checks of package couple against independent reference
// computations in Python with numpy (testdata/crosscheck/couple_*.py):
// the overlap integral summed on a grid from the fields themselves (the Go
// code uses the closed Gaussian integral): a full 2-D (x, y) grid for
// TEM₀₀ pairs, and a 2-D (x1, x2) grid of the Gaussian Schell-model
// cross-spectral density for beams with M² > 1. The test skips when the
// interpreter or the modules are missing; CI has them.

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
// (the script reports the change from 401 to 801 points per side, which
// must itself stay below 1e-10); a wrong closed form (a missing
// curvature term, a sign of the tilt against the curvature, a factor 2
// in an exponent) is off by 1e-3 or more in these cases.
func TestCrossCheckOverlap(t *testing.T) {
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
