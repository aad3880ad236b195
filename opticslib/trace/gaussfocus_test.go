package trace_test

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestGaussianFocusIdeal checks the focus of a Gaussian beam of 1/e²
// radius w = 2 mm through a perfect system (a paraboloid of focal length
// f = 100 mm, pupil radius 5 mm, so the beam's edge amplitude is e^{−6.25})
// against the Gaussian-beam focus w_f = λ f/(π w) (H. Kogelnik & T. Li,
// Appl. Opt. 5, 1550 (1966); A. E. Siegman, Lasers, 1986, ch. 17), to
// 1 %: the grid's second moment of a sampled, truncated Gaussian. The
// peak ratio at the focus is 1 (no aberration) to 1e-9, and falls off
// either side.
func TestGaussianFocusIdeal(t *testing.T) {
	sys := paraboloid(t, 0)
	src := trace.Source{PupilRadius: 5 * mm, GaussianRadius: 2 * mm}
	zf := sys.ImagePlane()
	planes := []units.Length{zf + 0.5*mm, zf, zf - 0.5*mm}
	g, err := sys.GaussianFocus(lambda, src, 64, planes)
	if err != nil {
		t.Fatal(err)
	}
	want := float64(lambda) * 0.1 / (math.Pi * 2e-3)
	if !scalar.EqualWithinRel(float64(g.Radius), want, 0.01) || !scalar.EqualWithinRel(float64(g.IdealRadius), want, 0.01) {
		t.Errorf("focus radius %v, ideal %v; want λf/(πw) = %v", float64(g.Radius), float64(g.IdealRadius), want)
	}
	if g.Best != zf || !scalar.EqualWithinAbs(g.PeakRatio, 1, 1e-9) {
		t.Errorf("best plane %v, peak ratio %v; want %v, 1", g.Best, g.PeakRatio, zf)
	}
	if !(g.Peak[0] < g.Peak[1] && g.Peak[2] < g.Peak[1]) {
		t.Errorf("peaks %v: not highest at the focus", g.Peak)
	}
	t.Logf("radius %.6g m, ideal %.6g, λf/(πw) %.6g", float64(g.Radius), float64(g.IdealRadius), want)
}

// TestGaussianFocusAberrated checks the peak ratio of a Gaussian beam
// through the plano-convex lens (flat side first, pupil 4 mm, w =
// 1.6 mm) on its paraxial focal plane against the pupil-average Strehl
// ratio of the same grid with Gaussian weights: the two are the same sum
// when the peak lies at the chief ray's point (an axial, symmetric
// focus), so the tolerance is 1e-9. The beam's best plane lies before
// the paraxial focus (undercorrected), with a higher peak, inside the
// planes scanned.
func TestGaussianFocusAberrated(t *testing.T) {
	sys := planoConvex(t, false)
	src := trace.Source{PupilRadius: 4 * mm, GaussianRadius: 1.6 * mm}
	zp, err := sys.ParaxialFocus(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	planes := []units.Length{zp - 400e-6, zp - 300e-6, zp - 200e-6, zp - 100e-6, zp}
	g, err := sys.GaussianFocus(lambda, src, 64, planes)
	if err != nil {
		t.Fatal(err)
	}
	w, err := sys.Wavefront(lambda, src, trace.PupilGrid(64), zp)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := g.Peak[4], w.Strehl().Pupil; !scalar.EqualWithinAbs(got, want, 1e-9) {
		t.Errorf("peak ratio at the paraxial focus %.9f, pupil Strehl %.9f", got, want)
	}
	if !(g.Best < zp && g.Best > planes[0] && g.PeakRatio > g.Peak[4]) {
		t.Errorf("best plane %v (peak %v), paraxial %v (peak %v)", g.Best, g.PeakRatio, zp, g.Peak[4])
	}
	t.Logf("peaks %v, Strehl at paraxial %v", g.Peak, w.Strehl())
}

// TestGaussianFocusErrors checks the refused inputs.
func TestGaussianFocusErrors(t *testing.T) {
	sys := paraboloid(t, 0)
	src := trace.Source{PupilRadius: 5 * mm, GaussianRadius: 2 * mm}
	for _, n := range []int{0, 7, 257} {
		if _, err := sys.GaussianFocus(lambda, src, n, nil); err == nil {
			t.Errorf("GaussianFocus(samples = %d) no error", n)
		}
	}
	if _, err := sys.GaussianFocus(lambda, src, 16, []units.Length{units.Length(math.Inf(1))}); err == nil {
		t.Error("GaussianFocus(plane +Inf) no error")
	}
}
