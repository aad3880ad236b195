package trace_test

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestStrehlR37 checks reference-checks R37: Maréchal's 1 − (2πσ/λ)² and
// Mahajan's exp(−(2πσ/λ)²) (Born & Wolf, Principles of Optics, §9.1
// [from memory]; V. N. Mahajan, J. Opt. Soc. Am. 72, 1258 (1982)) at σ =
// λ/14, 0.05λ and 0.1λ, tolerance 1e-5 (the values are given to 5
// decimals).
func TestStrehlR37(t *testing.T) {
	for _, test := range []struct {
		sigma, mahajan, marechal float64 // σ in waves
	}{{1.0 / 14, 0.81757, 0.79858}, {0.05, 0.90602, 0.90130}, {0.1, 0.67383, 0.60522}} {
		w := trace.Wavefront{Wavelength: lambda, RMS: units.Length(test.sigma) * lambda}
		st := w.Strehl()
		if !scalar.EqualWithinAbs(st.Mahajan, test.mahajan, 1e-5) || !scalar.EqualWithinAbs(st.Marechal, test.marechal, 1e-5) {
			t.Errorf("σ = %.4fλ: Mahajan %.5f, Maréchal %.5f; want %.5f, %.5f", test.sigma, st.Mahajan, st.Marechal, test.mahajan, test.marechal)
		}
		if st.Pupil != 0 {
			t.Errorf("no samples: Pupil = %v, want 0", st.Pupil)
		}
	}
}

// TestStrehlRandomLowOrder checks R37's informal accuracy figure: for
// random combinations of defocus, astigmatism, coma and spherical
// aberration scaled to σ ≤ λ/14 on a 61 × 61 grid, the pupil average is
// within about 1e-3 of the exponential form (an informal figure of the
// reference-checks file, not a bound: the exponential is an
// approximation whose error, of order (2πσ/λ)⁴ ≈ 0.04 times a shape
// factor, depends on the aberration). Over 200 seeded cases the median
// difference is 2.1e-4 and the largest 4.6e-3 (σ near λ/14); the
// tolerances are 1e-3 on the median and 6e-3 on the largest.
func TestStrehlRandomLowOrder(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	pupil := trace.PupilGrid(61)
	worst := 0.0
	var diffs []float64
	for range 200 {
		c := [6]float64{}
		for j := range c {
			c[j] = rng.NormFloat64()
		}
		opd := make([]float64, len(pupil))
		var mean float64
		for i, p := range pupil {
			r2 := p.X*p.X + p.Y*p.Y
			opd[i] = c[0]*(2*r2-1) + c[1]*(p.X*p.X-p.Y*p.Y) + c[2]*2*p.X*p.Y + c[3]*(3*r2-2)*p.Y + c[4]*(3*r2-2)*p.X + c[5]*(6*r2*r2-6*r2+1)
			mean += opd[i] / float64(len(pupil))
		}
		var v float64
		for i := range opd {
			opd[i] -= mean
			v += opd[i] * opd[i] / float64(len(pupil))
		}
		sigma := float64(lambda) * (0.02 + rng.Float64()*(1.0/14-0.02))
		for i := range opd {
			opd[i] *= sigma / math.Sqrt(v)
		}
		w := trace.Wavefront{Wavelength: lambda, Pupil: pupil, OPD: opd, RMS: units.Length(sigma)}
		st := w.Strehl()
		worst = math.Max(worst, math.Abs(st.Pupil-st.Mahajan))
		diffs = append(diffs, math.Abs(st.Pupil-st.Mahajan))
	}
	slices.Sort(diffs)
	median := diffs[len(diffs)/2]
	if worst > 6e-3 || median > 1e-3 {
		t.Errorf("|pupil average − exp form| over 200 cases: median %.2e, largest %.2e; want ≤ 1e-3, 6e-3", median, worst)
	}
	t.Logf("|pupil average − exp form| over 200 cases: median %.2e, largest %.2e", median, worst)
}

// TestWavefrontDefocus checks the wavefront of a perfect focus (a
// paraboloid of focal length 100 mm, pupil radius 5 mm) analysed on a
// plane δz = 0.1 mm beyond it: the OPD is pure defocus, PV = W020 =
// δz·NA²/2 and RMS = W020/(2√3) over the uniform disc (M. Born & E. Wolf,
// Principles of Optics, 7th ed., §9.3 [from memory]; V. N. Mahajan,
// Optical Imaging and Aberrations, Part II, SPIE 2001 [from memory]),
// with NA = sin U′ = (h/f)/(1 + h²/4f²) for the paraboloid. Tolerance
// 1e-3 relative: the exact defocus is δz(1 − cos U′), sin²U′/4 = 6e-4
// above δz·NA²/2 at the rim; the grid's rim cells bias the RMS by about
// as much. The pupil-average Strehl ratio matches the closed form
// sinc²(π W020/λ) of uniform defocus (Mahajan, same place [from memory])
// to 2e-3 (the grid's O(1/n) area error at n = 81).
func TestWavefrontDefocus(t *testing.T) {
	dz := 0.1 * mm
	sys := paraboloid(t, dz)
	src := trace.Source{PupilRadius: 5 * mm}
	w, err := sys.Wavefront(lambda, src, trace.PupilGrid(81), sys.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	na := 0.05 / (1 + 0.05*0.05/4)
	w020 := float64(dz) * na * na / 2
	if !scalar.EqualWithinRel(float64(w.PV), w020, 1e-3) {
		t.Errorf("defocus PV %g m, want δz NA²/2 = %g", float64(w.PV), w020)
	}
	if want := w020 / (2 * math.Sqrt(3)); !scalar.EqualWithinRel(float64(w.RMS), want, 1e-3) {
		t.Errorf("defocus RMS %g m, want W020/(2√3) = %g", float64(w.RMS), want)
	}
	x := math.Pi * w020 / float64(lambda)
	if got, want := w.Strehl().Pupil, math.Pow(math.Sin(x)/x, 2); !scalar.EqualWithinAbs(got, want, 2e-3) {
		t.Errorf("defocus Strehl %.5f, want sinc² = %.5f", got, want)
	}
	if !w.ExitPupilFinite || w.ExitPupil != 0 || !scalar.EqualWithinRel(float64(w.Radius), -0.1001, 1e-12) {
		t.Errorf("exit pupil %v (finite %v), radius %v; want 0, true, −100.1 mm", w.ExitPupil, w.ExitPupilFinite, w.Radius)
	}
	// At the focus itself the wavefront is perfect (rounding: 1e-15 m).
	sys0 := paraboloid(t, 0)
	w0, err := sys0.Wavefront(lambda, src, trace.PupilGrid(21), sys0.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	if w0.PV > 1e-15 {
		t.Errorf("paraboloid at focus PV %v, want 0", w0.PV)
	}
}

// TestWavefrontSpherical checks W040 = S_I/8 (Welford 1986, §8.2 [from
// memory]) against the traced OPD on the paraxial image plane of the
// plano-convex lens at a 1 mm pupil: OPD(rim) − OPD(centre) = −S_I/8 (the
// OPD's sign is opposite to Welford's W). Tolerance 1e-3 relative: the
// fifth-order part is about 2e-4 at h/f = 0.01.
func TestWavefrontSpherical(t *testing.T) {
	sys := planoConvex(t, true)
	src := trace.Source{PupilRadius: 1 * mm}
	zp, err := sys.ParaxialFocus(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	pupil := []trace.PupilPoint{{}, {Y: 1}, {X: 1}}
	w, err := sys.Wavefront(lambda, src, pupil, zp)
	if err != nil {
		t.Fatal(err)
	}
	sd, err := sys.Seidel(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	w040, _, _, _, _ := sd.Sum.Wavefront()
	for _, i := range []int{1, 2} {
		if got := w.OPD[i] - w.OPD[0]; !scalar.EqualWithinRel(got, -w040, 1e-3) {
			t.Errorf("OPD at %v − centre = %g m, want −S_I/8 = %g", w.Pupil[i], got, -w040)
		}
	}
}
