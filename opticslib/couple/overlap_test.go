package couple_test

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/units"
)

func waist(t *testing.T, w, z units.Length, lambda units.Length, m2 float64) beam.Gaussian {
	t.Helper()
	g, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: w, WaistZ: z, M2: m2})
	if err != nil {
		t.Fatalf("FromWaist(w = %v, z = %v) error: %v", w, z, err)
	}
	return g
}

func mustOverlap(t *testing.T, a, b beam.Input, m couple.Misalignment) couple.Coupling {
	t.Helper()
	c, err := couple.Overlap(a, b, m)
	if err != nil {
		t.Fatalf("Overlap error: %v", err)
	}
	return c
}

// R13 of the project's reference checks (Kogelnik 1964 [from memory];
// Joyce & DeLoach 1984 [from memory]): equal waists offset by zR couple
// 0.8, by 2zR 0.5, exactly. Tolerance 1e-13: a handful of operations on
// values of order 1, no cancellation.
func TestR13WaistOffset(t *testing.T) {
	const lambda = 1064 * units.Nanometer
	w := 50 * units.Micrometer
	zr := units.Length(math.Pi * float64(w*w) / float64(lambda))
	for _, test := range []struct {
		dz   units.Length
		want float64
	}{{0, 1}, {zr, 0.8}, {2 * zr, 0.5}, {-zr, 0.8}} {
		a := waist(t, w, 0, lambda, 1)
		b := waist(t, w, test.dz, lambda, 1)
		if got := mustOverlap(t, a, b, couple.Misalignment{}).Efficiency; !scalar.EqualWithinAbs(got, test.want, 1e-13) {
			t.Errorf("Overlap(waists %v apart) = %.15g, want %g", test.dz, got, test.want)
		}
		if got := couple.AxialCoupling(w, w, test.dz, lambda, 1); !scalar.EqualWithinAbs(got, test.want, 1e-13) {
			t.Errorf("AxialCoupling(dz = %v) = %.15g, want %g", test.dz, got, test.want)
		}
	}
}

// R13's closed form for different waists and waist separations against
// the general overlap, and its q form η = 4 Im q1 Im q2/|q1* − q2|² at a
// common plane (both forms from R13; the identity is algebraic, so the
// tolerance is rounding: rel 1e-12).
func TestAxialCouplingAgainstOverlap(t *testing.T) {
	const lambda = 780 * units.Nanometer
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 50 {
		w1 := units.Length(20e-6 + 500e-6*rng.Float64())
		w2 := units.Length(20e-6 + 500e-6*rng.Float64())
		z1 := units.Length((rng.Float64() - 0.5) * 0.4)
		z2 := units.Length((rng.Float64() - 0.5) * 0.4)
		a, b := waist(t, w1, z1, lambda, 1), waist(t, w2, z2, lambda, 1)
		got := mustOverlap(t, a, b, couple.Misalignment{}).Efficiency
		want := couple.AxialCoupling(w1, w2, z2-z1, lambda, 1)
		if !scalar.EqualWithinRel(got, want, 1e-12) {
			t.Errorf("case %d: Overlap = %.15g, AxialCoupling = %.15g", i, got, want)
		}
		q1, q2 := a.Q, b.Q
		qform := 4 * imag(q1) * imag(q2) / math.Pow(cmplx.Abs(cmplx.Conj(q1)-q2), 2)
		if !scalar.EqualWithinRel(got, qform, 1e-12) {
			t.Errorf("case %d: Overlap = %.15g, q form = %.15g", i, got, qform)
		}
	}
}

// Pure size mismatch 4w1²w2²/(w1² + w2²)² (R13 with Δz = 0, R40 with
// d = θ = 0) and R40's offset and tilt factors exp(−2d²/(w1² + w2²)),
// exp(−2(πθ/λ)² w1²w2²/(w1² + w2²)) at a common waist plane (Marcuse 1977
// [from memory]), against the general overlap; and the R40 check value
// w = 5 µm, d = 1 µm → 0.960789 (rel 1e-6, the digits given).
func TestR40Misalignment(t *testing.T) {
	const lambda = 1550 * units.Nanometer
	w := 5 * units.Micrometer
	if got := couple.WaistPlaneCoupling(w, w, 1*units.Micrometer, 0, lambda, 1); !scalar.EqualWithinRel(got, 0.960789, 1e-6) {
		t.Errorf("WaistPlaneCoupling(5 µm, 5 µm, d = 1 µm) = %.7g, want 0.960789 (R40)", got)
	}
	c := mustOverlap(t, waist(t, w, 0, lambda, 1), waist(t, w, 0, lambda, 1), couple.Misalignment{DX: 1 * units.Micrometer})
	if !scalar.EqualWithinRel(c.Efficiency, 0.960789, 1e-6) {
		t.Errorf("Overlap(5 µm, 5 µm, DX = 1 µm) = %.7g, want 0.960789 (R40)", c.Efficiency)
	}
	rng := rand.New(rand.NewPCG(2, 1))
	for i := range 60 {
		w1 := units.Length(2e-6 + 20e-6*rng.Float64())
		w2 := units.Length(2e-6 + 20e-6*rng.Float64())
		d := units.Length((rng.Float64() - 0.5) * 10e-6)
		th := units.Angle((rng.Float64() - 0.5) * 0.1)
		a, b := waist(t, w1, 0, lambda, 1), waist(t, w2, 0, lambda, 1)
		want := couple.WaistPlaneCoupling(w1, w2, d, th, lambda, 1)
		// Offset and tilt in x only: the y factor is the size mismatch
		// per axis, √(4w1²w2²/(w1²+w2²)²).
		got := mustOverlap(t, a, b, couple.Misalignment{DX: d, TiltX: th})
		// Rounding only; exponents up to ~10 lose a few digits: rel 1e-11.
		if !scalar.EqualWithinAbsOrRel(got.Efficiency, want, 1e-300, 1e-11) {
			t.Errorf("case %d: Overlap(w1 %v, w2 %v, d %v, θ %v) = %.15g, R40 closed form %.15g", i, w1, w2, d, th, got.Efficiency, want)
		}
		size := 4 * float64(w1*w1*w2*w2) / math.Pow(float64(w1*w1+w2*w2), 2)
		if !scalar.EqualWithinRel(got.Aligned, size, 1e-12) || !scalar.EqualWithinRel(couple.AxialCoupling(w1, w2, 0, lambda, 1), size, 1e-12) {
			t.Errorf("case %d: aligned %.15g, AxialCoupling(dz = 0) %.15g, want size mismatch %.15g", i, got.Aligned, couple.AxialCoupling(w1, w2, 0, lambda, 1), size)
		}
		// Offset alone with equal waists: exp(−d²/w²) (R40), here in y.
		eq := mustOverlap(t, a, a, couple.Misalignment{DY: d})
		if want := math.Exp(-float64(d*d) / float64(w1*w1)); !scalar.EqualWithinRel(eq.Efficiency, want, 1e-12) {
			t.Errorf("case %d: equal waists, DY = %v: %.15g, want exp(−d²/w²) = %.15g", i, d, eq.Efficiency, want)
		}
	}
}

// Identical modes couple 1 (an analytic identity: the normalisation of
// the overlap integral, |⟨u|u⟩|² = ⟨u|u⟩²), for round, elliptical and
// astigmatic beams with curvature. Tolerance 1e-14 (rounding of |a + a*|
// against 2 Re a).
func TestIdenticalModes(t *testing.T) {
	const lambda = 633 * units.Nanometer
	round := waist(t, 0.3*units.Millimeter, -0.25, lambda, 1)
	ast, err := beam.FromWaists(
		beam.WaistSpec{Wavelength: lambda, WaistRadius: 0.2 * units.Millimeter, WaistZ: 0.1},
		beam.WaistSpec{Wavelength: lambda, WaistRadius: 0.7 * units.Millimeter, WaistZ: -0.4})
	if err != nil {
		t.Fatal(err)
	}
	for _, in := range []beam.Input{round, ast} {
		if got := mustOverlap(t, in, in, couple.Misalignment{}).Efficiency; !scalar.EqualWithinAbs(got, 1, 1e-14) {
			t.Errorf("Overlap(b, b) = %.17g, want 1", got)
		}
	}
}

// The overlap is symmetric in the two beams (|⟨a|b⟩| = |⟨b|a⟩|, an
// identity of the integral), with curvature, M² > 1 in one beam,
// offsets and tilts. Rel 1e-12: the two orders round differently.
func TestOverlapSymmetric(t *testing.T) {
	const lambda = 1030 * units.Nanometer
	rng := rand.New(rand.NewPCG(3, 1))
	spec := func(m2 float64) beam.WaistSpec {
		return beam.WaistSpec{Wavelength: lambda, WaistRadius: units.Length(30e-6 + 300e-6*rng.Float64()),
			WaistZ: units.Length((rng.Float64() - 0.5) * 0.2), M2: m2}
	}
	for i := range 40 {
		m2 := 1.0
		if i%3 == 0 {
			m2 = 1 + 2*rng.Float64()
		}
		a, err := beam.FromWaists(spec(m2), spec(1))
		if err != nil {
			t.Fatal(err)
		}
		b, err := beam.FromWaists(spec(1), spec(m2))
		if err != nil {
			t.Fatal(err)
		}
		m := couple.Misalignment{DX: units.Length((rng.Float64() - 0.5) * 2e-4), DY: units.Length((rng.Float64() - 0.5) * 2e-4),
			TiltX: units.Angle((rng.Float64() - 0.5) * 4e-3), TiltY: units.Angle((rng.Float64() - 0.5) * 4e-3)}
		ab, ba := mustOverlap(t, a, b, m), mustOverlap(t, b, a, m)
		if !scalar.EqualWithinAbsOrRel(ab.Efficiency, ba.Efficiency, 1e-300, 1e-12) {
			t.Errorf("case %d: Overlap(a, b) = %.15g, Overlap(b, a) = %.15g", i, ab.Efficiency, ba.Efficiency)
		}
		neg := mustOverlap(t, a, b, couple.Misalignment{DX: -m.DX, DY: -m.DY, TiltX: -m.TiltX, TiltY: -m.TiltY})
		if !scalar.EqualWithinAbsOrRel(ab.Efficiency, neg.Efficiency, 1e-300, 1e-12) {
			t.Errorf("case %d: Overlap(m) = %.15g, Overlap(−m) = %.15g", i, ab.Efficiency, neg.Efficiency)
		}
	}
}

// Gaussian Schell model: a beam of M² > 1 into the TEM₀₀ mode equal to
// its embedded Gaussian couples 2/(M² + 1) per axis, the weight of the
// fundamental in a geometric mixture of Hermite–Gaussian modes of
// M² = 2n + 1 (Siegman, Lasers, 1986, ch. 16 [from memory] for HG M²;
// Starikov & Wolf 1982 [from memory] for the mixture). Rel 1e-12.
func TestSchellModelBound(t *testing.T) {
	const lambda = 1064 * units.Nanometer
	for _, m2 := range []float64{1, 1.1, 1.5, 3, 10} {
		src := waist(t, 0.4*units.Millimeter, 0.3, lambda, m2)
		emb := beam.Gaussian{Q: src.Q, Wavelength: src.Wavelength, Index: src.Index}
		c := mustOverlap(t, src, emb, couple.Misalignment{})
		want := math.Pow(2/(m2+1), 2)
		if !scalar.EqualWithinRel(c.Efficiency, want, 1e-12) || !scalar.EqualWithinRel(c.Bound, want, 1e-12) {
			t.Errorf("M² = %g: coupling into the embedded Gaussian = %.15g (bound %.15g), want (2/(M²+1))² = %.15g", m2, c.Efficiency, c.Bound, want)
		}
		if m2 > 1 && !strings.Contains(c.Model, "Schell") {
			t.Errorf("M² = %g: Model = %q, want the Gaussian Schell model named", m2, c.Model)
		}
		// Any other target collects less.
		other := waist(t, 0.4*units.Millimeter, 0.3, lambda, 1)
		if o := mustOverlap(t, src, other, couple.Misalignment{}).Efficiency; m2 > 1 && o > c.Efficiency {
			t.Errorf("M² = %g: target of the real waist collects %.15g > %.15g", m2, o, c.Efficiency)
		}
	}
}

// The tolerances come from the exact Gaussian form: for equal waists the
// 1 dB offset is w√(0.1 ln 10) = 0.47985 w (R40 with η = 10^−0.1), and at
// the returned offset and tilt the efficiency is OneDecibel of the
// aligned one. Rel 1e-12.
func TestTolerances(t *testing.T) {
	const lambda = 1310 * units.Nanometer
	w := 4.6 * units.Micrometer
	c := mustOverlap(t, waist(t, w, 0, lambda, 1), waist(t, w, 0, lambda, 1), couple.Misalignment{})
	dx, dy, err := c.OffsetTolerance(couple.OneDecibel)
	if err != nil {
		t.Fatal(err)
	}
	want := float64(w) * math.Sqrt(0.1*math.Log(10))
	if !scalar.EqualWithinRel(float64(dx), want, 1e-12) || !scalar.EqualWithinRel(float64(dy), want, 1e-12) {
		t.Errorf("OffsetTolerance(1 dB) = %v, %v, want %v", dx, dy, units.Length(want))
	}
	tx, _, err := c.TiltTolerance(couple.OneDecibel)
	if err != nil {
		t.Fatal(err)
	}
	theta0 := float64(lambda) / (math.Pi * float64(w))
	if !scalar.EqualWithinRel(float64(tx), theta0*math.Sqrt(0.1*math.Log(10)), 1e-12) {
		t.Errorf("TiltTolerance(1 dB) = %v, want 0.4799 θ0 = %v", tx, units.Angle(theta0*math.Sqrt(0.1*math.Log(10))))
	}
	// A mismatched, curved pair: the tolerance reproduces the fraction.
	// The misalignment factor of two Gaussians is exactly Gaussian in d
	// and θ (the Gaussian integral; Joyce & DeLoach 1984 [from memory]),
	// so the offset and tilt that leave the fraction must give it back
	// through the full overlap, to rounding.
	a, b := waist(t, 5*units.Micrometer, 20*units.Micrometer, lambda, 1), waist(t, 3.5*units.Micrometer, 0, lambda, 1)
	c = mustOverlap(t, a, b, couple.Misalignment{})
	for _, frac := range []float64{couple.OneDecibel, 0.5, 0.99} {
		dx, _, _ := c.OffsetTolerance(frac)
		_, ty, _ := c.TiltTolerance(frac)
		if got := mustOverlap(t, a, b, couple.Misalignment{DX: dx}).Efficiency / c.Aligned; !scalar.EqualWithinRel(got, frac, 1e-12) {
			t.Errorf("fraction %g: η(dx)/η0 = %.15g", frac, got)
		}
		if got := mustOverlap(t, a, b, couple.Misalignment{TiltY: ty}).Efficiency / c.Aligned; !scalar.EqualWithinRel(got, frac, 1e-12) {
			t.Errorf("fraction %g: η(θy)/η0 = %.15g", frac, got)
		}
	}
	if _, _, err := c.OffsetTolerance(1); err == nil {
		t.Errorf("OffsetTolerance(1) error = nil, want a *ParamError")
	}
}

// OverlapSeparated carries beam a over the gap (q → q + gap, Kogelnik &
// Li 1966): two waists given at their own waist planes a gap apart couple
// as R13's closed form says (Kogelnik 1964 [from memory]). Rel 1e-12,
// rounding.
func TestOverlapSeparated(t *testing.T) {
	const lambda = 532 * units.Nanometer
	w1, w2, gap := 0.1*units.Millimeter, 0.15*units.Millimeter, 37*units.Millimeter
	c, err := couple.OverlapSeparated(waist(t, w1, 0, lambda, 1), waist(t, w2, 0, lambda, 1), gap, couple.Misalignment{})
	if err != nil {
		t.Fatal(err)
	}
	if want := couple.AxialCoupling(w1, w2, gap, lambda, 1); !scalar.EqualWithinRel(c.Efficiency, want, 1e-12) {
		t.Errorf("OverlapSeparated = %.15g, want AxialCoupling = %.15g", c.Efficiency, want)
	}
}

// Errors name the parameter with its value and unit and wrap the
// sentinels; no NaN comes back. No outside reference: the texts are the
// package's own message format (opticslib/internal/errtext), and the
// 0.5 rad tilt limit is beam.MaxDivergence.
func TestOverlapErrors(t *testing.T) {
	a := waist(t, 1*units.Millimeter, 0, 633*units.Nanometer, 1)
	b := waist(t, 1*units.Millimeter, 0, 532*units.Nanometer, 1)
	p := waist(t, 1*units.Millimeter, 0, 633*units.Nanometer, 1.5)
	for _, test := range []struct {
		a, b     beam.Input
		m        couple.Misalignment
		sentinel error
		text     string
	}{
		{a, b, couple.Misalignment{}, couple.ErrMismatch, "couple: beam b: vacuum wavelength λ0 = 532 nm: differs from beam a's 633 nm"},
		{p, p, couple.Misalignment{}, couple.ErrTwoPartial, "M² of beam b = 1.5"},
		{a, a, couple.Misalignment{DX: units.Length(math.NaN())}, nil, "couple: misalignment: offset DX = NaN m: must be finite"},
		{a, a, couple.Misalignment{TiltY: 1}, nil, "tilt = 57.2958° (1 rad)"},
		{a, nil, couple.Misalignment{}, nil, "couple: beam b: is nil"},
		{beam.Gaussian{}, a, couple.Misalignment{}, nil, "couple: beam a: beam:"},
	} {
		_, err := couple.Overlap(test.a, test.b, test.m)
		var pe *couple.ParamError
		if !errors.As(err, &pe) {
			t.Errorf("Overlap error = %v, want a *ParamError", err)
			continue
		}
		if test.sentinel != nil && !errors.Is(err, test.sentinel) {
			t.Errorf("Overlap error = %v, want it to wrap %v", err, test.sentinel)
		}
		if !strings.Contains(err.Error(), test.text) {
			t.Errorf("Overlap error = %q, want it to contain %q", err, test.text)
		}
	}
	if v := couple.AxialCoupling(-1, 1, 0, 1e-6, 1); !math.IsNaN(v) {
		t.Errorf("AxialCoupling(w1 = −1) = %g, want NaN (documented)", v)
	}
}

// TestMatchedEfficiencyAtMostOne: the overlap of a beam with itself is 1
// (Cauchy–Schwarz; the normalised overlap of a field with itself), and the
// result must never exceed 1 by rounding, whatever the curvature.
func TestMatchedEfficiencyAtMostOne(t *testing.T) {
	for _, z := range []float64{0, 1e-3, 0.0044, 0.1, 0.6, 3} {
		for _, w0 := range []float64{2e-6, 255.8e-6, 0.52e-3, 4e-3} {
			g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: units.Length(w0), Wavelength: 1550e-9, WaistZ: units.Length(z)})
			if err != nil {
				t.Fatal(err)
			}
			c, err := couple.Overlap(g, g, couple.Misalignment{})
			if err != nil {
				t.Fatal(err)
			}
			if c.Efficiency > 1 || c.Aligned > 1 || c.Efficiency < 1-1e-12 {
				t.Errorf("w0 %g m, waist at %g m: self-overlap η = %.17g (aligned %.17g), want 1 and never above", w0, z, c.Efficiency, c.Aligned)
			}
		}
	}
}
