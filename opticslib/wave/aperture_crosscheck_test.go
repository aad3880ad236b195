package wave_test

import (
	"errors"
	"math"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

// focusSetup is the geometry of the clipped-focus checks: λ0 = 1064 nm,
// f = 100 mm, N = 512 and the spacing of critical sampling, N·Dx² = λ0 f
// (Dx = 14.4 µm, window 7.4 mm). At critical sampling the paraxial
// angular-spectrum step from the lens to its back focal plane is exactly
// the discrete Fourier transform of the clipped field (the lens chirp and
// the kernel's chirp cancel sample by sample, and both are N-periodic for
// even N), sampled at λ0 f/(N Dx) = Dx; the lens phase is sampled below
// the Nyquist frequency everywhere in the window (ThinLens's condition
// Dx < λ0 f/(2 x_max) holds for x_max < N·Dx/2). The aperture has
// diameter D = 64 Dx (0.92 mm), so the Airy zero 1.21967 λ0 f/D lies
// 9.8 samples from the axis.
type focusSetup struct {
	n      int
	lambda units.Length
	f      units.Length
	dx     units.Length
	a      units.Length // aperture radius
}

func newFocusSetup() focusSetup {
	s := focusSetup{n: 512, lambda: 1064 * units.Nanometer, f: 100 * units.Millimeter}
	s.dx = units.Length(math.Sqrt(float64(s.lambda) * float64(s.f) / float64(s.n)))
	s.a = 32 * s.dx
	return s
}

// input returns the field at the lens: a collimated Gaussian of 1/e²
// radius w (unit amplitude on axis), or a uniform plane wave for w = 0.
func (s focusSetup) input(t *testing.T, w units.Length) wave.Grid {
	t.Helper()
	if w == 0 {
		g := wave.Grid{U: make([]complex128, s.n*s.n), N: s.n, Dx: s.dx, Wavelength: s.lambda, Index: 1}
		for i := range g.U {
			g.U[i] = 1
		}
		return g
	}
	b, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: s.lambda})
	if err != nil {
		t.Fatalf("FromWaist(%v) error: %v", w, err)
	}
	g, err := wave.GridFromBeam(beam.Astigmatic{X: b, Y: b}, s.n, s.dx)
	if err != nil {
		t.Fatalf("GridFromBeam error: %v", err)
	}
	return g
}

// focus clips in with the aperture of radius s.a, applies the lens and
// propagates to its back focal plane. It returns the focal field and the
// transmitted fraction. A hard edge reaches the Nyquist frequency, so
// Propagate reports ErrUndersampled (with its result); the checks below
// measure what that costs.
func (s focusSetup) focus(t *testing.T, in wave.Grid) (wave.Grid, float64) {
	t.Helper()
	clipped, T, err := in.Clip(paraxial.ClearDiameter(2 * s.a))
	if err != nil {
		t.Fatalf("Clip error: %v", err)
	}
	lensed, err := clipped.ThinLens(s.f)
	if err != nil {
		t.Fatalf("ThinLens error: %v", err)
	}
	out, err := lensed.Propagate(s.f, wave.Paraxial)
	if err != nil && !errors.Is(err, wave.ErrUndersampled) {
		t.Fatalf("Propagate error: %v", err)
	}
	return out, T
}

func TestCrossCheckClippedFocusSciPy(t *testing.T) {
	// The focus of a clipped beam against an independent reference,
	// testdata/crosscheck/wave_aperture.py: the Fourier–Bessel (Hankel)
	// form of the focal field,
	//
	//	|E(r)| = (k/f)·|∫_0^a u(ρ) J0(kρr/f) ρ dρ|,   P_t = ∫_0^a |u|² 2πρ dρ
	//
	// by scipy.integrate.quad, with brentq for the first zero and a
	// nested quad for the encircled power. Cases, at the geometry of
	// focusSetup (D = 2a = 64 Dx, critical sampling):
	//
	//   - a uniformly lit aperture, the Airy pattern: first zero at
	//     r = 1.21967·λf/D (j_{1,1}/π, j_{1,1} = 3.8317) with 83.8 % of
	//     the power inside (1 − J0² − J1², Lord Rayleigh's formula; M. Born
	//     & E. Wolf, Principles of Optics, §8.5.2 [from memory]); the
	//     script also checks its quad results against the closed forms
	//     with scipy.special.j1;
	//   - a Gaussian truncated at a/w = 0.5, 1 and 1.5 (P. Belland &
	//     J. P. Crenn, "Changes in the characteristics of a Gaussian beam
	//     weakly diffracted by a circular aperture", Appl. Opt. 21,
	//     522–527 (1982) [from memory] for the integral).
	//
	// Compared, with tolerances and what sets them:
	//
	//   - the transmitted fraction against 1 − exp(−2a²/w²) (analytic;
	//     Siegman, Lasers, §17.1 [from memory]), within the midpoint-rule
	//     bound of aperture_test.go's edgeTol, (Dx²/12)·∮|∂I/∂n| dl/P =
	//     (4/3)(a·Dx/w²)²·e^(−2a²/w²) (measured 0.5–0.6 of it); uniform
	//     light: the mask area is exact, rel 1e-12;
	//   - the focal irradiance on the x axis, 40 samples (4 Airy zeros),
	//     normalised to the transmitted power T·P_in (the power a
	//     detector sees; the field itself lacks the edge light beyond the
	//     Nyquist frequency, see Grid.Clip): peak-normalised 5e-4. The
	//     back-focal-plane field is exactly the DFT of the sampled mask
	//     (focusSetup), so what is left is the difference between the
	//     grey-pixel disc and the true disc, and the focal pattern's
	//     periodic images N·Dx away; measured 0.9e-4–1.7e-4;
	//   - the peak relative to the untruncated Gaussian focus of the same
	//     input (beam.PeakIrradiance with the q-law radius at f) against
	//     (1 − e^(−a²/w²))², from the integral at r = 0 (analytic): rel
	//     5e-4, the same edge-pixel argument for the amplitude integral;
	//   - the first minimum (Line.FirstMinimum on the x cut, band-limited
	//     interpolation) against the first zero: rel 5e-4 (measured
	//     ≤ 1.4e-4);
	//   - the encircled power at 1.21967 and 2 λf/D (Grid.EncircledPower
	//     over T·P_in): 5e-4 plus the same midpoint-rule bound,
	//     (Dx²/12)·2πr·|∂I/∂r|/P_t, with ∂I/∂r from the reference
	//     samples (up to 1.9e-3 on the steep flank of the a/w = 1.5 focus;
	//     measured ≤ 8.7e-4).
	s := newFocusSetup()
	type xcase struct {
		A       float64   `json:"a"`
		W       *float64  `json:"w"`
		Lambda0 float64   `json:"lambda0"`
		N       float64   `json:"n"`
		F       float64   `json:"f"`
		X       []float64 `json:"x"`
		EER     []float64 `json:"ee_r"`
	}
	const nx = 40
	xs := make([]float64, nx)
	for m := range xs {
		xs[m] = float64(m) * float64(s.dx)
	}
	lfd := float64(s.lambda*s.f) / float64(2*s.a) // λf/D
	eeR := []float64{1.21967 * lfd, 2 * lfd}
	ratios := []float64{0, 0.5, 1, 1.5} // a/w; 0 = uniform
	var cases []xcase
	for _, r := range ratios {
		c := xcase{A: float64(s.a), Lambda0: float64(s.lambda), N: 1, F: float64(s.f), X: xs, EER: eeR}
		if r != 0 {
			w := float64(s.a) / r
			c.W = &w
		}
		cases = append(cases, c)
	}
	var ref struct {
		Reference string `json:"reference"`
		Airy      struct {
			FirstZero   float64 `json:"first_zero"`
			EEFirstZero float64 `json:"ee_first_zero"`
		} `json:"airy"`
		Cases []struct {
			Irradiance   []float64 `json:"irradiance"`
			Peak         float64   `json:"peak"`
			FirstMin     float64   `json:"first_min"`
			EE           []float64 `json:"ee"`
			Transmission float64   `json:"transmission"`
		} `json:"cases"`
	}
	pyref.Run(t, "wave_aperture.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	// The published constants, and scipy's values of them.
	if !scalar.EqualWithinAbs(ref.Airy.FirstZero, 1.21967, 5e-6) || !scalar.EqualWithinAbs(ref.Airy.EEFirstZero, 0.838, 5e-4) {
		t.Errorf("reference Airy constants %.6f, %.4f; want 1.21967 and 0.838 (Born & Wolf §8.5)", ref.Airy.FirstZero, ref.Airy.EEFirstZero)
	}
	const (
		irrTol  = 5e-4
		peakTol = 5e-4
		minTol  = 5e-4
		eeTol   = 5e-4
	)
	var maxI, maxMin, maxEE, maxT, maxPeak float64
	for i, r := range ratios {
		rc := ref.Cases[i]
		name := "uniform"
		var w units.Length
		if r != 0 {
			w = s.a / units.Length(r)
			name = "a/w = " + strconv.FormatFloat(r, 'g', -1, 64)
		}
		in := s.input(t, w)
		foc, T := s.focus(t, in)
		if r == 0 {
			if want := math.Pi * float64(s.a*s.a) / in.Power(); !scalar.EqualWithinRel(T, want, 1e-12) {
				t.Errorf("%s: T = %.15g, want πa²/window area %.15g", name, T, want)
			}
		} else {
			tol := edgeTol(s.a, 0, 0, s.dx, w)
			maxT = math.Max(maxT, math.Abs(T-rc.Transmission))
			if !scalar.EqualWithinAbs(T, rc.Transmission, tol) {
				t.Errorf("%s: T = %.9f, want 1 − exp(−2a²/w²) = %.9f within %.2g", name, T, rc.Transmission, tol)
			}
		}
		pt := T * in.Power()
		cut := foc.AlongX()
		irr := cut.Irradiance()[s.n/2:]
		var dI float64
		for m := range nx {
			dI = math.Max(dI, math.Abs(irr[m]/pt-rc.Irradiance[m]))
		}
		dI /= rc.Peak
		maxI = math.Max(maxI, dI)
		if dI > irrTol {
			t.Errorf("%s: focal irradiance max |I/P_t − ref|/I0 = %.3g, want ≤ %g", name, dI, irrTol)
		}
		if r != 0 {
			b, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: s.lambda})
			wf := b.Transform(paraxial.ThinLens(s.f).Then(paraxial.Space(s.f)), 1).Radius()
			ratio := irr[0] / beam.PeakIrradiance(in.Power(), wf, wf)
			want := -math.Expm1(-r * r)
			want *= want
			maxPeak = math.Max(maxPeak, math.Abs(ratio/want-1))
			if !scalar.EqualWithinRel(ratio, want, peakTol) {
				t.Errorf("%s: peak / untruncated focus = %.6f, want (1 − e^(−a²/w²))² = %.6f", name, ratio, want)
			}
		}
		x1, err := cut.FirstMinimum()
		if err != nil {
			t.Errorf("%s: FirstMinimum error: %v", name, err)
			continue
		}
		maxMin = math.Max(maxMin, math.Abs(float64(x1)/rc.FirstMin-1))
		if !scalar.EqualWithinRel(float64(x1), rc.FirstMin, minTol) {
			t.Errorf("%s: first minimum %v, want %v (first zero of E)", name, x1, units.Length(rc.FirstMin))
		}
		for k, rr := range eeR {
			p, err := foc.EncircledPower(units.Length(rr))
			if err != nil {
				t.Fatalf("EncircledPower error: %v", err)
			}
			m := int(math.Round(rr / float64(s.dx)))
			slope := math.Abs(rc.Irradiance[m+1]-rc.Irradiance[m-1]) / (2 * float64(s.dx))
			tol := eeTol + float64(s.dx*s.dx)/12*2*math.Pi*rr*slope
			maxEE = math.Max(maxEE, math.Abs(p/pt-rc.EE[k]))
			if !scalar.EqualWithinAbs(p/pt, rc.EE[k], tol) {
				t.Errorf("%s: encircled power at %v = %.6f of P_t, want %.6f within %.2g", name, units.Length(rr), p/pt, rc.EE[k], tol)
			}
		}
		if r == 0 {
			if got := float64(x1) / lfd; !scalar.EqualWithinRel(got, ref.Airy.FirstZero, minTol) {
				t.Errorf("Airy first zero %.6f λf/D, want %.6f", got, ref.Airy.FirstZero)
			}
		}
	}
	t.Logf("against %s: max |ΔT| = %.2g, max |ΔI|/I0 = %.2g, max rel Δpeak ratio = %.2g, max rel Δ first minimum = %.2g, max |Δ encircled| = %.2g",
		ref.Reference, maxT, maxI, maxPeak, maxMin, maxEE)
}
