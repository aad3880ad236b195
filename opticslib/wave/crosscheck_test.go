package wave_test

// Cross-check of package wave against an independent angular-spectrum
// propagator written with numpy.fft (testdata/crosscheck/wave_fft.py), run
// with the system interpreter /usr/bin/python3 (Debian's python3-numpy and
// python3-scipy; the python3 first on PATH may not see them). The test
// skips when the interpreter or the modules are missing; CI has them.

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

// xcMaxDiff returns max_i |u_i − ref_i| / max_i |ref_i|.
func xcMaxDiff(u []complex128, re, im []float64) float64 {
	var d, peak float64
	for i := range u {
		r := complex(re[i], im[i])
		d = math.Max(d, cmplx.Abs(u[i]-r))
		peak = math.Max(peak, cmplx.Abs(r))
	}
	return d / peak
}

func TestCrossCheckPropagateNumPy(t *testing.T) {
	// Independent reference: an angular-spectrum propagator written with
	// numpy.fft (pocketfft) and numpy.fft.fftfreq, with the kernels of the
	// package doc (exp(−ikz) envelopes, Kogelnik & Li 1966; Goodman,
	// Introduction to Fourier Optics, ch. 3–4 [from memory]), numpy 1.24
	// (Debian 12), testdata/crosscheck/wave_fft.py. It checks gonum dsp/fourier usage
	// (normalisation, frequency order, odd and non-power-of-two N) and the
	// kernel sign. The script also returns the analytic Gaussian beam at z,
	// which fixes the sign convention from first principles: with the
	// opposite sign the beam would travel −z.
	//
	// Tolerances, peak-normalised field differences:
	//   - Go vs numpy, same kernel: 1e-12. Two FFTs of N ≤ 1024 points
	//     round to ~log₂N·eps ≈ 1e-15 relative to the peak; the kernel
	//     phase z κ²/(2k) reaches ~1e3 rad at Nyquist, so its argument
	//     rounds to ~1e-13 rad, on components of negligible amplitude.
	//   - paraxial kernel vs the analytic beam: 1e-11. The sampled
	//     Gaussian is band-limited to e^(−(3π)²) ≈ 3e-39 at Nyquist
	//     (dx = w0/6) and is ≤ e^(−100) at the window edge (≥ 40 w), so
	//     only rounding is left, as above, plus the analytic formula's.
	//   - second-moment radius: rel 1e-12 Go vs numpy (same field, sums of
	//     N terms); rel 1e-10 vs the 1/e² radius of the q-law (the
	//     discrete moment of a well-sampled Gaussian equals the continuous
	//     one up to terms like e^(−π² w²/dx²), negligible, so rounding).
	const (
		fieldTol  = 1e-12
		beamTol   = 1e-11
		momentTol = 1e-12
		qlawTol   = 1e-10
	)
	type xcase struct {
		Re      []float64  `json:"re"`
		Im      []float64  `json:"im"`
		Dx      float64    `json:"dx"`
		Lambda0 float64    `json:"lambda0"`
		N       float64    `json:"n"`
		QIn     [2]float64 `json:"q_in"`
		Z       float64    `json:"z"`
		Kernel  string     `json:"kernel"`
		kern    wave.Kernel
		in      wave.Line
	}
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []xcase
	for _, size := range []int{512, 729, 1000, 1024, 1001, 768} {
		w0 := 50e-6 + 150e-6*rng.Float64()
		lambda := []float64{633e-9, 1064e-9}[rng.IntN(2)]
		n := []float64{1, 1.5}[rng.IntN(2)]
		zR := math.Pi * w0 * w0 * n / lambda
		g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: units.Length(w0), WaistZ: units.Length(zR * (2*rng.Float64() - 1)), Wavelength: units.Length(lambda), Index: n})
		if err != nil {
			t.Fatalf("FromWaist error: %v", err)
		}
		dx := w0 / 6
		in, err := wave.LineFromBeam(g, size, units.Length(dx))
		if err != nil {
			t.Fatalf("LineFromBeam error: %v", err)
		}
		re, im := make([]float64, size), make([]float64, size)
		for i, u := range in.U {
			re[i], im[i] = real(u), imag(u)
		}
		z := zR * (4*rng.Float64() - 2) // ±2 zR, forwards and backwards
		for _, kern := range []wave.Kernel{wave.Paraxial, wave.Exact} {
			cases = append(cases, xcase{Re: re, Im: im, Dx: dx, Lambda0: lambda, N: n, QIn: [2]float64{real(g.Q), imag(g.Q)},
				Z: z, Kernel: kern.String(), kern: kern, in: in})
		}
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			Re         []float64 `json:"re"`
			Im         []float64 `json:"im"`
			AnalyticRe []float64 `json:"analytic_re"`
			AnalyticIm []float64 `json:"analytic_im"`
			W2         float64   `json:"w2"`
			W2Analytic float64   `json:"w2_analytic"`
			WQ         float64   `json:"w_q"`
		} `json:"cases"`
	}
	pyref.Run(t, "wave_fft.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	var maxField, maxBeam, maxMoment, maxQlaw, maxNonParaxial float64
	for i, test := range cases {
		r := ref.Cases[i]
		got, err := test.in.Propagate(units.Length(test.Z), test.kern)
		if err != nil {
			t.Errorf("case %d (N = %d, %v): Propagate(%g) error: %v", i, len(test.Re), test.kern, test.Z, err)
			continue
		}
		if len(r.Re) != len(got.U) {
			t.Errorf("case %d: reference returned %d samples, want %d", i, len(r.Re), len(got.U))
			continue
		}
		d := xcMaxDiff(got.U, r.Re, r.Im)
		maxField = math.Max(maxField, d)
		if d > fieldTol {
			t.Errorf("case %d (N = %d, %v, z = %g): max |u − u_numpy|/peak = %.3g, want ≤ %g", i, len(test.Re), test.kern, test.Z, d, fieldTol)
		}
		w := float64(got.SecondMomentRadius())
		maxMoment = math.Max(maxMoment, math.Abs(w-r.W2)/r.W2)
		if !scalar.EqualWithinRel(w, r.W2, momentTol) {
			t.Errorf("case %d (N = %d, %v): SecondMomentRadius() = %.15g, want %.15g (numpy)", i, len(test.Re), test.kern, w, r.W2)
		}
		da := xcMaxDiff(got.U, r.AnalyticRe, r.AnalyticIm)
		if test.kern == wave.Exact {
			// The exact kernel differs from the paraxial beam by the
			// non-paraxial phase ~z κ⁴/(8k³), physics not error; logged.
			maxNonParaxial = math.Max(maxNonParaxial, da)
			continue
		}
		maxBeam = math.Max(maxBeam, da)
		if da > beamTol {
			t.Errorf("case %d (N = %d, paraxial, z = %g): max |u − u_beam|/peak = %.3g, want ≤ %g (analytic Gaussian beam)", i, len(test.Re), test.Z, da, beamTol)
		}
		maxQlaw = math.Max(maxQlaw, math.Abs(w-r.WQ)/r.WQ)
		if !scalar.EqualWithinRel(w, r.WQ, qlawTol) {
			t.Errorf("case %d (N = %d, paraxial): SecondMomentRadius() = %.15g, want q-law w = %.15g", i, len(test.Re), w, r.WQ)
		}
	}
	t.Logf("%d propagations against %s: max field Δ = %.3g (vs numpy), %.3g (paraxial vs analytic beam), "+
		"rel Δ second-moment radius = %.3g (vs numpy), %.3g (vs q-law); exact-kernel departure from the paraxial beam %.3g",
		len(cases), ref.Reference, maxField, maxBeam, maxMoment, maxQlaw, maxNonParaxial)
}
