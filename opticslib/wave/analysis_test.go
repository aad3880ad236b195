package wave_test

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

func TestPowerPeakAndCuts(t *testing.T) {
	// A waist of radius w0 with unit amplitude on axis carries
	// ∫exp(−2r²/w0²) dA = πw0²/2 (2-D) and w0·√(π/2) per unit length
	// (1-D) (analytic). The sampled sums equal the integrals up to
	// aliasing terms ~exp(−π²w0²/(2Dx²)) (Poisson summation), negligible
	// at w0 = 10 Dx, so rel 1e-12 (rounding of N² terms). The axis cuts of
	// a separable elliptical Gaussian are 1-D Gaussians of the two radii
	// (second-moment radius, rel 1e-12), and the peak is the axis sample
	// with |u|² = 1.
	dx := 4 * units.Micrometer
	wx, wy := 40*units.Micrometer, 60*units.Micrometer
	g := gaussGrid(t, wx, wy, 128, dx)
	if got, want := g.Power(), math.Pi*float64(wx*wy)/2; !scalar.EqualWithinRel(got, want, 1e-12) {
		t.Errorf("Grid.Power() = %.15g, want πwxwy/2 = %.15g", got, want)
	}
	b, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: wx, Wavelength: 1 * units.Micrometer})
	l, _ := wave.LineFromBeam(b, 256, dx)
	if got, want := l.Power(), float64(wx)*math.Sqrt(math.Pi/2); !scalar.EqualWithinRel(got, want, 1e-12) {
		t.Errorf("Line.Power() = %.15g, want w0·√(π/2) = %.15g", got, want)
	}
	if got := g.AlongX().SecondMomentRadius(); !scalar.EqualWithinRel(float64(got), float64(wx), 1e-12) {
		t.Errorf("AlongX().SecondMomentRadius() = %v, want %v", got, wx)
	}
	if got := g.AlongY().SecondMomentRadius(); !scalar.EqualWithinRel(float64(got), float64(wy), 1e-12) {
		t.Errorf("AlongY().SecondMomentRadius() = %v, want %v", got, wy)
	}
	if x, y, p := g.Peak(); x != 0 || y != 0 || !scalar.EqualWithinRel(p, 1, 1e-15) {
		t.Errorf("Grid.Peak() = (%v, %v, %g), want (0, 0, 1)", x, y, p)
	}
	// A decentred bright sample.
	s := wave.Grid{U: make([]complex128, 64), N: 8, Dx: dx, Wavelength: 1e-6, Index: 1}
	s.U[2*8+5] = 3i
	if x, y, p := s.Peak(); x != dx || y != -2*dx || p != 9 {
		t.Errorf("Peak of a sample at (i, j) = (5, 2) = (%v, %v, %g), want (%v, %v, 9)", x, y, p, dx, -2*dx)
	}
	if x, p := (wave.Line{}).Peak(); x != 0 || p != 0 {
		t.Errorf("empty Line Peak() = (%v, %g), want (0, 0)", x, p)
	}
	if got := l.Irradiance(); len(got) != len(l.U) || got[128] != 1 {
		t.Errorf("Line.Irradiance() has %d samples, axis %g; want %d, 1", len(got), got[128], len(l.U))
	}
}

func TestRadialProfile(t *testing.T) {
	// The ring means of exp(−2r²/w²) (w = 12 Dx) against the profile at
	// the ring's mean radius (analytic). With the mean radius the
	// first-order term cancels and ½·I″·var(r) is left, var(r) ≤ Dx²/12
	// for a ring one sample wide, |I″| ≤ 4/w² of the peak: 1.2e-3 here;
	// tolerance 1.5e-3, measured 6e-4. Ring 0 is the axis sample alone:
	// exact. Taking k·Dx as the radius instead would be off by up to
	// 1.4e-2 (measured) in the innermost rings, which hold few samples,
	// mostly outside k·Dx.
	dx := 2 * units.Micrometer
	w := 12 * dx
	g := gaussGrid(t, w, w, 128, dx)
	r, p := g.RadialProfile()
	if len(p) != 64 || len(r) != 64 || p[0] != 1 || r[0] != 0 {
		t.Fatalf("RadialProfile: %d rings, axis (%v, %g); want 64, (0, 1)", len(p), r[0], p[0])
	}
	worst := 0.0
	for k, v := range p {
		x := float64(r[k] / w)
		worst = math.Max(worst, math.Abs(v-math.Exp(-2*x*x)))
		if d := float64(r[k]/dx) - float64(k); math.Abs(d) > 0.5 {
			t.Errorf("ring %d: mean radius %v outside the ring", k, r[k])
		}
	}
	if worst > 1.5e-3 {
		t.Errorf("RadialProfile max |ring mean − exp(−2r̄²/w²)| = %.3g, want ≤ 1.5e-3", worst)
	}
	t.Logf("RadialProfile: max deviation %.3g of the peak", worst)
}

func TestEncircledPower(t *testing.T) {
	// A Gaussian encircles 1 − exp(−2r²/w²) of its power within r
	// (analytic; Siegman, Lasers, §17.1 [from memory]), within the
	// midpoint-rule bound edgeTol; EncircledPower weighs the samples as
	// Grid.Clip does, so it equals T·Power() of a centred aperture of the
	// same radius (rel 1e-12, the same sums). Special values: r = 0
	// encircles nothing and r = +Inf everything; negative and NaN radii
	// are errors.
	dx := 5 * units.Micrometer
	w := 30 * dx
	g := gaussGrid(t, w, w, 256, dx)
	for _, r := range []float64{0.3, 0.5, 1, 1.5, 2.5} {
		rad := units.Length(r) * w
		p, err := g.EncircledPower(rad)
		if err != nil {
			t.Errorf("EncircledPower(%v) error: %v", rad, err)
			continue
		}
		if want := -math.Expm1(-2 * r * r); !scalar.EqualWithinAbs(p/g.Power(), want, edgeTol(rad, 0, 0, dx, w)) {
			t.Errorf("EncircledPower(%g w)/Power = %.9f, want %.9f", r, p/g.Power(), want)
		}
		_, T, _ := g.Clip(paraxial.ClearDiameter(2 * rad))
		if !scalar.EqualWithinRel(p, T*g.Power(), 1e-12) {
			t.Errorf("EncircledPower(%g w) = %.15g, Clip T·Power = %.15g; want equal", r, p, T*g.Power())
		}
	}
	if p, err := g.EncircledPower(0); p != 0 || err != nil {
		t.Errorf("EncircledPower(0) = %g, %v; want 0, nil", p, err)
	}
	if p, err := g.EncircledPower(units.Length(math.Inf(1))); p != g.Power() || err != nil {
		t.Errorf("EncircledPower(+Inf) = %g, %v; want Power() = %g", p, err, g.Power())
	}
	for _, test := range []struct {
		r    units.Length
		want string
	}{
		{-1 * units.Micrometer, "wave: radius r = -1 µm: must be non-negative and not NaN"},
		{units.Length(math.NaN()), "wave: radius r = NaN m: must be non-negative and not NaN"},
	} {
		if _, err := g.EncircledPower(test.r); err == nil || err.Error() != test.want {
			t.Errorf("EncircledPower(%v) error = %v, want %q", test.r, err, test.want)
		}
	}
}

func TestFirstMinimumSlit(t *testing.T) {
	// A uniformly lit slit of width W focused by a lens has the
	// Fraunhofer pattern sinc²(πWx/(λf)) in the back focal plane, first
	// zero at x = λf/W (M. Born & E. Wolf, Principles of Optics, §8.5.1
	// [from memory]). Line, N = 4096 at critical sampling N·Dx² = λf,
	// W = 256 Dx: the focal field is the DFT of the sampled slit, whose
	// edges fall on samples (t = ½ there); that trapezoid sum
	// Σ'' e^{iθj} = sin(Mθ)·cot(θ/2) vanishes exactly at θ = π/M, so the
	// sampled pattern has its zero at λf/W too and FirstMinimum's
	// band-limited search finds it to its tolerance, 1e-9 Dx: rel 1e-8.
	const n = 4096
	lambda := 1 * units.Micrometer
	dx := 5 * units.Micrometer
	f := units.Length(n) * dx * dx / lambda
	l := wave.Line{U: make([]complex128, n), Dx: dx, Wavelength: lambda, Index: 1}
	for i := range l.U {
		l.U[i] = 1
	}
	W := 256 * dx
	c, _, err := l.Clip(paraxial.SlitOfWidth(W, paraxial.Tangential))
	if err != nil {
		t.Fatal(err)
	}
	c, err = c.ThinLens(f)
	if err != nil {
		t.Fatal(err)
	}
	foc, err := c.Propagate(f, wave.Paraxial)
	if err != nil && !errors.Is(err, wave.ErrUndersampled) {
		t.Fatal(err)
	}
	x1, err := foc.FirstMinimum()
	if want := lambda * f / W; err != nil || !scalar.EqualWithinRel(float64(x1), float64(want), 1e-8) {
		t.Errorf("slit focus FirstMinimum() = %v, %v; want λf/W = %v", x1, err, want)
	}
	// A Gaussian has no minimum; an invalid field is an error.
	b, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 50 * units.Micrometer, Wavelength: lambda})
	g, _ := wave.LineFromBeam(b, 256, dx)
	if _, err := g.FirstMinimum(); err == nil || err.Error() != "wave: irradiance along +x: has no local minimum inside the window" {
		t.Errorf("Gaussian FirstMinimum() error = %v, want no local minimum", err)
	}
	if _, err := (wave.Line{U: make([]complex128, 4)}).FirstMinimum(); err == nil {
		t.Errorf("FirstMinimum() of a Line with Dx = 0: error nil, want an *Error")
	}
}
