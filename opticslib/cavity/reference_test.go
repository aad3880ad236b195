package cavity_test

// Reference checks R19–R25 of ../shared/reference-checks.md (section D,
// Fabry–Perot and two-mirror cavities). Each check names its source and
// its tolerance. "Quoted" values are the digits printed in the reference
// list; they are compared to half a unit in their last digit. Closed forms
// evaluated in the test are compared with tolerances set by float64
// rounding.

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

const (
	mm   = units.Millimeter
	nm   = units.Nanometer
	heNe = 632.8 * nm
	c0   = 299792458.0 // m/s, exact (SI definition of the metre)
)

func concave(r units.Length, refl float64) cavity.Mirror {
	return cavity.Mirror{Shape: cavity.Concave, Radius: r, Reflectivity: refl}
}

func flat(refl float64) cavity.Mirror { return cavity.Mirror{Shape: cavity.Flat, Reflectivity: refl} }

// twoMirror returns the empty linear cavity m1–m2 of spacing d at the HeNe
// wavelength.
func twoMirror(t *testing.T, m1, m2 cavity.Mirror, d units.Length) cavity.Cavity {
	t.Helper()
	c, err := cavity.Linear(cavity.LinearSpec{M1: m1, M2: m2, Spacing: d, Wavelength: heNe})
	if err != nil {
		t.Fatalf("Linear(%v, %v, %v) error: %v", m1, m2, d, err)
	}
	return c
}

// quoted reports whether got rounds to want printed with the relative
// resolution res (half a unit in the last quoted digit).
func quoted(got, want, res float64) bool { return scalar.EqualWithinRel(got, want, res) }

func TestFSRR19(t *testing.T) {
	// R19 [X]: FSR = c/(2nL), Born & Wolf, Principles of Optics, §7.6
	// [from memory for the section]; c exact by the SI definition.
	// Quoted to 7 digits (rel 5e-7); the closed form itself is compared to
	// rel 1e-15 (one division and the sum of the loop's spaces).
	glass, err := paraxial.NewBuilder().Medium(1.5).Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	etalon, err := cavity.Linear(cavity.LinearSpec{M1: flat(0.9), M2: flat(0.9), Path: glass, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct {
		name         string
		c            cavity.Cavity
		want, quoted float64
	}{
		{"L = 0.1 m, n = 1", twoMirror(t, flat(0), flat(0), 100*mm), c0 / (2 * 0.1), 1.498962e9},
		{"solid etalon n = 1.5, L = 10 mm", etalon, c0 / (2 * 1.5 * 0.01), 9.993082e9},
	} {
		got := test.c.FSR()
		if !scalar.EqualWithinRel(got, test.want, 1e-15) {
			t.Errorf("%s: FSR() = %.16g Hz, want c/(2nL) = %.16g Hz", test.name, got, test.want)
		}
		if !quoted(got, test.quoted, 5e-7) {
			t.Errorf("%s: FSR() = %.10g Hz, want %.7g Hz (R19)", test.name, got, test.quoted)
		}
	}
	if got, want := etalon.OpticalLength(), units.Length(2*1.5*0.01); !scalar.EqualWithinRel(float64(got), float64(want), 1e-15) {
		t.Errorf("etalon OpticalLength() = %v, want 2nL = %v", got, want)
	}
	if got := etalon.Length(); !scalar.EqualWithinRel(float64(got), 0.02, 1e-15) {
		t.Errorf("etalon Length() = %v, want 2L = 20 mm", got)
	}
}

func TestFinesseR20(t *testing.T) {
	// R20 [X]: F = 4R/(1−R)², 𝓕 = π√R/(1−R), FWHM = FSR/𝓕,
	// T_min = 1/(1+F), and the exact Airy width Δδ = 4 arcsin(1/√F),
	// 𝓕 = π/(2 arcsin(1/√F)) (Born & Wolf §7.6 [from memory]). L = 0.1 m,
	// two equal lossless mirrors, so ρ = R.
	//
	// Tolerances: the quoted finesse values have 8 significant digits
	// (rel 2e-8, half a unit of the last digit of 29.803765 is 1.7e-8);
	// the FWHM column 5–7 digits; F is compared with the closed form to
	// rel 1e-12 (ρ goes through exp(½ ln R²), whose rounding is amplified
	// by 1/(1−ρ) ≤ 1e3 in F: ≲ 1e-13).
	for _, test := range []struct {
		r, bigF, approx, fwhm, fwhmRes float64
		exact                          float64 // 0: not quoted
	}{
		{0.9, 360, 29.803765, 50.294e6, 1e-5, 29.789956},
		{0.99, 39600, 312.584522, 4.795382e6, 1e-7, 0},
		{0.999, 3.996e6, 3140.021464, 477.373e3, 1e-6, 0},
	} {
		c := twoMirror(t, flat(test.r), flat(test.r), 100*mm)
		a, err := c.Airy()
		if err != nil {
			t.Errorf("R = %g: Airy() error: %v", test.r, err)
			continue
		}
		if want := 4 * test.r / ((1 - test.r) * (1 - test.r)); !scalar.EqualWithinRel(a.CoefficientOfFinesse, want, 1e-12) {
			t.Errorf("R = %g: CoefficientOfFinesse = %.15g, want 4R/(1−R)² = %.15g", test.r, a.CoefficientOfFinesse, want)
		}
		if !scalar.EqualWithinRel(a.CoefficientOfFinesse, test.bigF, 1e-9) {
			t.Errorf("R = %g: CoefficientOfFinesse = %.10g, want %g (R20)", test.r, a.CoefficientOfFinesse, test.bigF)
		}
		if !quoted(a.FinesseApprox, test.approx, 2e-8) {
			t.Errorf("R = %g: FinesseApprox = %.10g, want %.9g (R20)", test.r, a.FinesseApprox, test.approx)
		}
		if got := a.FSR / a.FinesseApprox; !quoted(got, test.fwhm, test.fwhmRes) {
			t.Errorf("R = %g: FSR/FinesseApprox = %.10g Hz, want %.7g Hz (R20 FWHM column)", test.r, got, test.fwhm)
		}
		if test.exact != 0 && !quoted(a.Finesse, test.exact, 2e-8) {
			t.Errorf("R = %g: Finesse (exact Airy) = %.10g, want %.8g (R20 exactness test)", test.r, a.Finesse, test.exact)
		}
		wantExact := math.Pi / (2 * math.Asin(1/math.Sqrt(test.bigF)))
		if !scalar.EqualWithinRel(a.Finesse, wantExact, 1e-12) {
			t.Errorf("R = %g: Finesse = %.15g, want π/(2 arcsin(1/√F)) = %.15g", test.r, a.Finesse, wantExact)
		}
		if got, want := a.Linewidth, a.FSR/a.Finesse; !scalar.EqualWithinRel(got, want, 1e-15) {
			t.Errorf("R = %g: Linewidth = %g, want FSR/Finesse = %g", test.r, got, want)
		}
		if want := 1 / (1 + test.bigF); !scalar.EqualWithinRel(a.Contrast, want, 1e-12) {
			t.Errorf("R = %g: Contrast = %.15g, want T_min = 1/(1+F) = %.15g (R20)", test.r, a.Contrast, want)
		}
	}
	// R20: the approximation agrees with the exact Airy finesse within
	// 5e-4 relative at R = 0.9 and 1e-7 at R = 0.999.
	for _, test := range []struct{ r, within float64 }{{0.9, 5e-4}, {0.999, 1e-7}} {
		a, err := twoMirror(t, flat(test.r), flat(test.r), 100*mm).Airy()
		if err != nil {
			t.Fatal(err)
		}
		if d := (a.FinesseApprox - a.Finesse) / a.Finesse; d <= 0 || d > test.within {
			t.Errorf("R = %g: (FinesseApprox − Finesse)/Finesse = %.3g, want in (0, %g] (R20)", test.r, d, test.within)
		}
	}
}

func TestFinesseUnequalMirrorsAndLoss(t *testing.T) {
	// Two unequal mirrors: 𝓕 ≈ π(R1R2)^{1/4}/(1 − √(R1R2)) (R20 [M source;
	// analytic]); a ring of three mirrors with a round-trip loss has
	// ρ² = R1R2R3(1 − loss). Both closed forms to rel 1e-12 (a few
	// logarithms and exponentials, amplified by 1/(1 − ρ) ≲ 200).
	c := twoMirror(t, flat(0.99), concave(1, 0.9), 100*mm)
	a, err := c.Airy()
	if err != nil {
		t.Fatal(err)
	}
	p := 0.99 * 0.9
	if want := math.Pi * math.Pow(p, 0.25) / (1 - math.Sqrt(p)); !scalar.EqualWithinRel(a.FinesseApprox, want, 1e-12) {
		t.Errorf("R1 = 0.99, R2 = 0.9: FinesseApprox = %.15g, want π(R1R2)^¼/(1 − √(R1R2)) = %.15g", a.FinesseApprox, want)
	}
	if !scalar.EqualWithinRel(a.RoundTripPower, p, 1e-15) {
		t.Errorf("RoundTripPower = %.16g, want R1R2 = %.16g", a.RoundTripPower, p)
	}

	loop, err := paraxial.NewBuilder().
		FlatMirror(30*units.Degree).Label("A").Space(100*mm).
		FlatMirror(30*units.Degree).Label("B").Space(100*mm).
		ConcaveMirror(1, 30*units.Degree).Label("C").Space(100 * mm).
		Build()
	if err != nil {
		t.Fatal(err)
	}
	ring, err := cavity.Ring(cavity.RingSpec{Loop: loop, Reflectivity: map[string]float64{"A": 0.999, "B": 0.998, "C": 0.997}, Loss: 0.001, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	a, err = ring.Airy()
	if err != nil {
		t.Fatal(err)
	}
	p = 0.999 * 0.998 * 0.997 * (1 - 0.001)
	if !scalar.EqualWithinRel(a.RoundTripPower, p, 1e-14) {
		t.Errorf("ring RoundTripPower = %.16g, want R1R2R3(1 − loss) = %.16g", a.RoundTripPower, p)
	}
	rho := math.Sqrt(p)
	if want := math.Pi * math.Sqrt(rho) / (1 - rho); !scalar.EqualWithinRel(a.FinesseApprox, want, 1e-11) {
		t.Errorf("ring FinesseApprox = %.15g, want π√ρ/(1 − ρ) = %.15g", a.FinesseApprox, want)
	}
	if want := c0 / 0.3; !scalar.EqualWithinRel(a.FSR, want, 1e-15) {
		t.Errorf("ring FSR = %.16g Hz, want c/(perimeter) = %.16g Hz", a.FSR, want)
	}
}

func TestPhotonLifetime(t *testing.T) {
	// τ = t_rt/δ_c with δ_c = −ln(R1R2) (A. E. Siegman, Lasers, 1986,
	// ch. 11 [from memory]): L = 0.1 m, R = 0.99 gives
	// τ = (0.2 m/c)/(−ln 0.9801) = 33.19 ns. Closed form to rel 1e-14. The
	// Lorentzian limit 2πτΔν → 1 holds to (1 − ρ)²/12 relative [derived
	// from the series of arcsin and ln; analytic]: 1e-6 at ρ = 0.999.
	a, err := twoMirror(t, flat(0.99), flat(0.99), 100*mm).Airy()
	if err != nil {
		t.Fatal(err)
	}
	if want := (0.2 / c0) / -math.Log(0.99*0.99); !scalar.EqualWithinRel(a.PhotonLifetime, want, 1e-14) {
		t.Errorf("PhotonLifetime = %.15g s, want t_rt/(−ln R1R2) = %.15g s", a.PhotonLifetime, want)
	}
	a, err = twoMirror(t, flat(0.999), flat(0.999), 100*mm).Airy()
	if err != nil {
		t.Fatal(err)
	}
	if got := 2 * math.Pi * a.PhotonLifetime * a.Linewidth; math.Abs(got-1) > 1e-6 {
		t.Errorf("R = 0.999: 2π·τ·Δν = %.12g, want 1 within 1e-6", got)
	}
}

func TestAiryErrors(t *testing.T) {
	// No FWHM below ρ = 3 − 2√2 = 0.1716 (where (1 − ρ)/(2√ρ) = 1); ρ = 0.2
	// still has one. Lossless and unspecified mirrors are errors.
	if _, err := twoMirror(t, flat(0.1), flat(0.1), 100*mm).Airy(); !errors.Is(err, cavity.ErrLowFinesse) {
		t.Errorf("R = 0.1: Airy() error = %v, want ErrLowFinesse", err)
	}
	if a, err := twoMirror(t, flat(0.2), flat(0.2), 100*mm).Airy(); err != nil || a.Finesse <= 0 {
		t.Errorf("R = 0.2: Airy() = %v, %v, want a finesse", a.Finesse, err)
	}
	if _, err := twoMirror(t, flat(1), flat(1), 100*mm).Airy(); err == nil || !strings.Contains(err.Error(), "lossless") {
		t.Errorf("R = 1, no loss: Airy() error = %v, want the lossless-cavity error", err)
	}
	if _, err := twoMirror(t, flat(0), flat(0), 100*mm).Airy(); !errors.Is(err, cavity.ErrNoReflectivity) {
		t.Errorf("no reflectivities: Airy() error = %v, want ErrNoReflectivity", err)
	}
}

func TestStabilityR21(t *testing.T) {
	// R21 [X]: g = 1 − L/R, stable for 0 < g1g2 < 1 (Kogelnik & Li 1966;
	// Siegman, Lasers, ch. 19 [from memory]). Symmetric R = 1 m: L = 0.5
	// stable (0.25), L = 1 confocal (0, boundary, round trip exactly −I),
	// L = 2 concentric (1, boundary), L = 2.5 unstable (2.25); planar (1,
	// boundary); flat + R = L (0, boundary, hemispherical, not −I).
	// g-parameters and the half-trace are exact in binary for these
	// inputs up to one rounding: abs 1e-15.
	for _, test := range []struct {
		name     string
		m1, m2   cavity.Mirror
		d        units.Length
		g1g2     float64
		class    cavity.Class
		boundary cavity.Boundary
		note     string
		modeErr  error
	}{
		{"L = 0.5", concave(1, 0), concave(1, 0), 0.5, 0.25, cavity.Stable, cavity.Inside, "", nil},
		{"confocal L = R = 1", concave(1, 0), concave(1, 0), 1, 0, cavity.Marginal, cavity.MinusIdentity, "symmetric confocal", nil},
		{"concentric L = 2", concave(1, 0), concave(1, 0), 2, 1, cavity.Marginal, cavity.EdgePlus, "concentric", cavity.ErrUnstable},
		{"L = 2.5", concave(1, 0), concave(1, 0), 2.5, 2.25, cavity.Unstable, cavity.Inside, "", cavity.ErrUnstable},
		{"planar", flat(0), flat(0), 0.5, 1, cavity.Marginal, cavity.EdgePlus, "planar", cavity.ErrUnstable},
		{"hemispherical, flat + R = L", flat(0), concave(1, 0), 1, 0, cavity.Marginal, cavity.EdgeMinus, "hemispherical", cavity.ErrUnstable},
		{"convex–concave L = R1 + R2", cavity.Mirror{Shape: cavity.Convex, Radius: 1}, concave(3, 0), 2, 1, cavity.Marginal, cavity.EdgePlus, "centres of curvature coincide", cavity.ErrUnstable},
		{"convex–concave, g1g2 < 0", cavity.Mirror{Shape: cavity.Convex, Radius: 1}, concave(3, 0), 4, -5 / 3.0, cavity.Unstable, cavity.Inside, "", cavity.ErrUnstable},
	} {
		c := twoMirror(t, test.m1, test.m2, test.d)
		s, err := c.Stability()
		if err != nil {
			t.Errorf("%s: Stability() error: %v", test.name, err)
			continue
		}
		for _, p := range []cavity.PlaneStability{s.X, s.Y} {
			if !p.HasG || !scalar.EqualWithinAbs(p.G1*p.G2, test.g1g2, 1e-15) {
				t.Errorf("%s, %v: g1·g2 = %g·%g = %.17g, want %g (R21)", test.name, p.Plane, p.G1, p.G2, p.G1*p.G2, test.g1g2)
			}
			if !scalar.EqualWithinAbs(p.HalfTrace, 2*test.g1g2-1, 1e-15) {
				t.Errorf("%s, %v: HalfTrace = %.17g, want 2g1g2 − 1 = %g", test.name, p.Plane, p.HalfTrace, 2*test.g1g2-1)
			}
			if p.Class != test.class || p.Boundary != test.boundary {
				t.Errorf("%s, %v: class %v, boundary %v, want %v, %v (R21)", test.name, p.Plane, p.Class, p.Boundary, test.class, test.boundary)
			}
			if !strings.Contains(p.Note, test.note) {
				t.Errorf("%s, %v: Note = %q, want it to contain %q", test.name, p.Plane, p.Note, test.note)
			}
		}
		_, err = c.Eigenmode(0)
		if test.modeErr == nil && err != nil || test.modeErr != nil && !errors.Is(err, test.modeErr) {
			t.Errorf("%s: Eigenmode(0) error = %v, want %v", test.name, err, test.modeErr)
		}
	}
	// The round trip from just after M1 of an empty cavity is
	// [[2g2 − 1, 2d g2], [−2/R1·(2g2 − 1) − 2/R2, 4g1g2 − 2g2 − 1]] (the
	// product Space·M2·Space·M1 worked by hand; analytic): for R1 = R2 = 1 m,
	// d = 0.5 m (g = 0.5) that is [[0, 0.5], [−2, −1]], exact in binary.
	s, _ := twoMirror(t, concave(1, 0), concave(1, 0), 0.5).Stability()
	if m := s.X.RoundTrip; m != (paraxial.Matrix{A: 0, B: 0.5, C: -2, D: -1}) {
		t.Errorf("g = 0.5: RoundTrip = %+v, want [[0, 0.5], [−2, −1]]", m)
	}
	// R21 edge case: the symmetric confocal round trip is exactly −I.
	s, _ = twoMirror(t, concave(1, 0), concave(1, 0), 1).Stability()
	if m := s.X.RoundTrip; m != (paraxial.Matrix{A: -1, D: -1}) {
		t.Errorf("confocal RoundTrip = %+v, want exactly −I (R21)", m)
	}
	// The hemispherical round trip has A + D = −2 but is not −I.
	s, _ = twoMirror(t, flat(0), concave(1, 0), 1).Stability()
	if m := s.X.RoundTrip; m.A+m.D != -2 || m == (paraxial.Matrix{A: -1, D: -1}) {
		t.Errorf("hemispherical RoundTrip = %+v, want A + D = −2 and not −I (R21)", m)
	}
}

func TestDegenerateRoundTrips(t *testing.T) {
	// Round trips of ±I other than the symmetric confocal cavity have no
	// chosen mode (ErrDegenerate). A flat–flat cavity with a lens of focal
	// length f at its centre, f from each mirror (a cat's eye), has the
	// one-way matrix [[0, f], [−1/f, 0]] and the round trip −I (analytic:
	// P·P = −I). A ring of two 4f relays (each −I) is +I. The accumulated
	// Gouy phase is still defined: an f–f system has A + B/q = f/q, a Gouy
	// phase arg q, and maps q to −f²/q, so two in a row give
	// arg q + (π − arg q) = π whatever q [analytic]. The cat's eye has two
	// f–f passes per round trip (π), the two relays four (2π). Tolerance
	// 1e-12 rad (a handful of increments, each rounded to ~1e-16).
	f := 100 * mm
	path, err := paraxial.NewBuilder().Space(f).ThinLens(f).Label("lens").Space(f).Build()
	if err != nil {
		t.Fatal(err)
	}
	eye, err := cavity.Linear(cavity.LinearSpec{M1: flat(0), M2: flat(0), Path: path, Wavelength: heNe})
	if err != nil {
		t.Fatal(err)
	}
	relay := func(b *paraxial.Builder) *paraxial.Builder {
		return b.Space(f).ThinLens(f).Space(2 * f).ThinLens(f).Space(f)
	}
	loop, err := relay(relay(paraxial.NewBuilder().FlatMirror(10 * units.Degree))).Build()
	if err != nil {
		t.Fatal(err)
	}
	ring, err := cavity.Ring(cavity.RingSpec{Loop: loop, Wavelength: heNe})
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct {
		name     string
		c        cavity.Cavity
		boundary cavity.Boundary
		psi      float64
	}{
		{"cat's eye", eye, cavity.MinusIdentity, math.Pi},
		{"two 4f relays", ring, cavity.PlusIdentity, 2 * math.Pi},
	} {
		s, _ := test.c.Stability()
		if s.X.Boundary != test.boundary || s.Y.Boundary != test.boundary {
			t.Errorf("%s: boundary %v, %v, want %v", test.name, s.X.Boundary, s.Y.Boundary, test.boundary)
		}
		if _, err := test.c.Eigenmode(0); !errors.Is(err, cavity.ErrDegenerate) {
			t.Errorf("%s: Eigenmode(0) error = %v, want ErrDegenerate", test.name, err)
		}
		sp, err := test.c.ModeSpacing()
		if err != nil {
			t.Errorf("%s: ModeSpacing() error: %v", test.name, err)
			continue
		}
		if !scalar.EqualWithinAbs(float64(sp.X.Phase), test.psi, 1e-12) || !scalar.EqualWithinAbs(float64(sp.Y.Phase), test.psi, 1e-12) {
			t.Errorf("%s: round-trip Gouy phase = %.15g, %.15g rad, want %.15g", test.name, sp.X.Phase, sp.Y.Phase, test.psi)
		}
	}
}

func TestSymmetricEigenmodeR22(t *testing.T) {
	// R22 [X]: R1 = R2 = 1 m, L = 0.5 m, λ = 632.8 nm:
	// w0² = (λ/2π)√(L(2R−L)) → 295.3307 µm at the centre,
	// w_m² = (λR/π)√(L/(2R−L)) → 341.0185 µm at the mirrors (Kogelnik & Li
	// 1966, symmetric-resonator formulas [from memory for the equation
	// numbers]). Rel 1e-9 against the closed forms (as R22 asks; the
	// round-trip solve has a few roundings), and the quoted 7 digits to
	// rel 2e-7. The wavefront at each mirror matches the mirror: |R| = 1 m.
	const lam, r, l = 632.8e-9, 1.0, 0.5
	c := twoMirror(t, concave(1, 0), concave(1, 0), 0.5)
	w0 := math.Sqrt(lam / (2 * math.Pi) * math.Sqrt(l*(2*r-l)))
	wm := math.Sqrt(lam * r / math.Pi * math.Sqrt(l/(2*r-l)))
	for _, test := range []struct {
		z, w, quoted float64
		atWaist      bool
	}{
		{0, wm, 341.0185e-6, false},
		{0.25, w0, 295.3307e-6, true},
		{0.5, wm, 341.0185e-6, false},
		{0.75, w0, 295.3307e-6, true}, // the return pass
		{1, wm, 341.0185e-6, false},
	} {
		m, err := c.Eigenmode(units.Length(test.z))
		if err != nil {
			t.Errorf("Eigenmode(%g) error: %v", test.z, err)
			continue
		}
		for _, g := range []struct {
			name string
			w    float64
		}{{"x", float64(m.Beam.X.Radius())}, {"y", float64(m.Beam.Y.Radius())}} {
			if !scalar.EqualWithinRel(g.w, test.w, 1e-9) {
				t.Errorf("Eigenmode(%g).Beam.%s.Radius() = %.12g, want %.12g (R22 closed form)", test.z, g.name, g.w, test.w)
			}
			if !quoted(g.w, test.quoted, 2e-7) {
				t.Errorf("Eigenmode(%g).Beam.%s.Radius() = %.9g, want %.7g (R22)", test.z, g.name, g.w, test.quoted)
			}
		}
		if test.atWaist {
			if off := m.Beam.X.WaistOffset(); math.Abs(float64(off)) > 1e-12 {
				t.Errorf("Eigenmode(%g): waist offset %v, want 0 (the waist is at the centre)", test.z, off)
			}
			continue
		}
		if rr := math.Abs(float64(m.Beam.X.WavefrontRadius())); !scalar.EqualWithinRel(rr, r, 1e-9) {
			t.Errorf("Eigenmode(%g): |wavefront radius| = %.12g m, want the mirror radius %g m", test.z, rr, r)
		}
	}
	// By label: the beam leaving M2.
	m, err := c.EigenmodeAtPart("M2")
	if err != nil || m.Z != 0.5 || !scalar.EqualWithinRel(float64(m.Beam.X.Radius()), wm, 1e-9) {
		t.Errorf("EigenmodeAtPart(M2) = z %v, w %v, %v; want z = 0.5 m, w = %.7g m", m.Z, m.Beam.X.Radius(), err, wm)
	}
}

func TestConfocalR23(t *testing.T) {
	// R23 [X]: R = L = 1 m, λ = 632.8 nm: w0 = √(λL/2π) = 317.3535 µm at
	// the centre, w_mirror = √2·w0 = 448.8056 µm, zR = L/2 (G. D. Boyd &
	// J. P. Gordon, Bell Syst. Tech. J. 40, 489 (1961) [from memory];
	// Kogelnik & Li 1966). The round trip is −I, so the mode is the
	// package's documented symmetric choice (Mode.Chosen). Rel 1e-12
	// against the closed forms (one square root and a propagation over
	// L/2), quoted digits to rel 2e-7. The degenerate geometry is flagged.
	const lam, l = 632.8e-9, 1.0
	c := twoMirror(t, concave(1, 0), concave(1, 0), 1)
	w0 := math.Sqrt(lam * l / (2 * math.Pi))
	for _, test := range []struct{ z, w, quoted float64 }{
		{0, math.Sqrt2 * w0, 448.8056e-6},
		{0.5, w0, 317.3535e-6},
		{1, math.Sqrt2 * w0, 448.8056e-6},
		{2, math.Sqrt2 * w0, 448.8056e-6},
	} {
		m, err := c.Eigenmode(units.Length(test.z))
		if err != nil {
			t.Errorf("Eigenmode(%g) error: %v", test.z, err)
			continue
		}
		if !m.Chosen {
			t.Errorf("Eigenmode(%g).Chosen = false, want true (round trip −I)", test.z)
		}
		if w := float64(m.Beam.X.Radius()); !scalar.EqualWithinRel(w, test.w, 1e-12) || !quoted(w, test.quoted, 2e-7) {
			t.Errorf("Eigenmode(%g) w = %.12g, want %.12g ≈ %.7g (R23)", test.z, w, test.w, test.quoted)
		}
		if zr := float64(m.Beam.X.RayleighRange()); !scalar.EqualWithinRel(zr, l/2, 1e-12) {
			t.Errorf("Eigenmode(%g) zR = %.15g, want L/2", test.z, zr)
		}
	}
	sp, err := c.ModeSpacing()
	if err != nil {
		t.Fatal(err)
	}
	if d := sp.X.Degeneracy; d.P != 1 || d.Q != 2 || !d.Exact || d.Name != "confocal" {
		t.Errorf("confocal Degeneracy = %+v, want exact 1/2 named confocal (R23)", d)
	}
	if !scalar.EqualWithinRel(sp.X.Spacing, sp.FSR/2, 1e-12) {
		t.Errorf("confocal transverse-mode spacing = %g, want FSR/2 = %g", sp.X.Spacing, sp.FSR/2)
	}
	w := strings.Join(c.Warnings(), "\n")
	for _, want := range []string{"symmetric confocal", "confocal (ψ/2π = 1/2)"} {
		if !strings.Contains(w, want) {
			t.Errorf("Warnings() = %q, want it to mention %q (R23: flag degenerate cavities)", w, want)
		}
	}
}

func TestDegenerateGeometriesFlagged(t *testing.T) {
	// R23: planar, confocal and concentric cavities are degenerate; near
	// them the low orders crowd TEM₀₀ (facts of the trade 6, common
	// practice, no single source). For symmetric cavities
	// ψ/2π = arccos(±√(g1g2))/π (Kogelnik & Li 1966), so: near-planar
	// g = 0.9999 (R = 1000 m, L = 0.1 m): 0.0045 ≈ 0/1; near-concentric
	// g = −0.9999: 0.9955 ≈ 1/1; near-confocal g = 0.005: 0.4968, order 2
	// at 0.0064 FSR ≈ 1/2; and the exact re-entrant 1/3 of g = 0.5 (R22's
	// cavity). g = ±0.999 would be 0.0142 FSR off, outside the 1 % window.
	for _, test := range []struct {
		name string
		r, d units.Length
		p, q int
		dn   string
	}{
		{"near-planar", 1000, 0.1, 0, 1, "near-planar"},
		{"near-concentric", 1, 1.9999, 1, 1, "near-concentric"},
		{"near-confocal", 1, 0.995, 1, 2, "near-confocal"},
		{"re-entrant 1/3", 1, 0.5, 1, 3, "re-entrant 1/3"},
	} {
		c := twoMirror(t, concave(test.r, 0), concave(test.r, 0), test.d)
		sp, err := c.ModeSpacing()
		if err != nil {
			t.Errorf("%s: ModeSpacing() error: %v", test.name, err)
			continue
		}
		if d := sp.X.Degeneracy; d.P != test.p || d.Q != test.q || d.Name != test.dn {
			t.Errorf("%s: Degeneracy = %+v, want %d/%d %q", test.name, d, test.p, test.q, test.dn)
		}
		if w := strings.Join(c.Warnings(), "\n"); !strings.Contains(w, test.dn) {
			t.Errorf("%s: Warnings() = %q, want %q", test.name, w, test.dn)
		}
	}
	// A generic cavity (g = 0.7, ψ/2π = 0.2532…) is not flagged below
	// order 10 within 1 %: Q = 4 gives 1.0128 − 1 = 0.0128.
	c := twoMirror(t, concave(1, 0), concave(1, 0), 0.3)
	if sp, _ := c.ModeSpacing(); sp.X.Degeneracy.Q != 0 {
		// Not every g is free of low-order fractions; this one is.
		t.Errorf("g = 0.7: Degeneracy = %+v, want none", sp.X.Degeneracy)
	}
	if w := c.Warnings(); len(w) != 0 {
		t.Errorf("g = 0.7: Warnings() = %q, want none", w)
	}
}

func TestModeSpacingR25(t *testing.T) {
	// R25 [X][C formula]: ν_qmn = FSR·[q + (m+n+1) arccos(±√(g1g2))/π],
	// sign of g1 (and g2); Δν_T = FSR·arccos(±√(g1g2))/π (Kogelnik & Li
	// 1966 [from memory for the equation number]).
	//   symmetric g = 0.5, L = 0.5 m: Δν_T = FSR/3 = 99.93082 MHz;
	//   plano-concave L = 0.25 m, R = 1 m: FSR/6 of 599.5849 MHz = 99.93082 MHz;
	//   near-concentric g1 = g2 = −0.9: Δν_T/FSR = arccos(−0.9)/π = 0.856434,
	//   where the naive arccos((A+D)/2)/2π = arccos(0.62)/2π = 0.143566 is
	//   the wrong branch.
	// Tolerances: the quoted 7 digits (rel 5e-7 for MHz, abs 5e-7 for the
	// fraction); the closed form to abs 1e-12 in ψ/2π (sum of a few
	// arctangent increments).
	for _, test := range []struct {
		name       string
		m1, m2     cavity.Mirror
		d          units.Length
		g1         float64 // for the sign rule
		want       float64 // Hz, quoted; 0 to skip
		wantFrac   float64 // quoted ψ/2π; 0 to skip
		naiveWrong bool
	}{
		{"symmetric g = 0.5", concave(1, 0), concave(1, 0), 0.5, 0.5, 99.93082e6, 0, false},
		{"plano-concave", flat(0), concave(1, 0), 0.25, 1, 99.93082e6, 0, false},
		{"near-concentric g = −0.9", concave(1, 0), concave(1, 0), 1.9, -0.9, 0, 0.856434, true},
	} {
		c := twoMirror(t, test.m1, test.m2, test.d)
		sp, err := c.ModeSpacing()
		if err != nil {
			t.Errorf("%s: ModeSpacing() error: %v", test.name, err)
			continue
		}
		st, _ := c.Stability()
		g1g2 := st.X.G1 * st.X.G2
		frac := float64(sp.X.Phase) / (2 * math.Pi)
		want := math.Acos(math.Copysign(math.Sqrt(g1g2), test.g1)) / math.Pi
		if !scalar.EqualWithinAbs(frac, want, 1e-12) {
			t.Errorf("%s: ψ/2π = %.15g, want arccos(±√(g1g2))/π = %.15g (R25)", test.name, frac, want)
		}
		if test.want != 0 && !quoted(sp.X.Spacing, test.want, 5e-7) {
			t.Errorf("%s: transverse-mode spacing = %.10g Hz, want %.7g Hz (R25)", test.name, sp.X.Spacing, test.want)
		}
		if test.wantFrac != 0 && !scalar.EqualWithinAbs(frac, test.wantFrac, 5e-7) {
			t.Errorf("%s: ψ/2π = %.9g, want %.6f (R25 sign rule)", test.name, frac, test.wantFrac)
		}
		naive := math.Acos(st.X.HalfTrace) / (2 * math.Pi)
		if test.naiveWrong && math.Abs(naive-frac) < 0.1 {
			t.Errorf("%s: ψ/2π = %.6f agrees with the naive arccos((A+D)/2)/2π = %.6f; want the other branch", test.name, frac, naive)
		}
		if got, want := sp.Offset(2, 1), 3*sp.X.Spacing; !scalar.EqualWithinRel(got, want, 1e-15) {
			t.Errorf("%s: Offset(2, 1) = %g, want 3·Δν_T = %g", test.name, got, want)
		}
	}
}

func TestGouyAgainstGParameters(t *testing.T) {
	// The resonance formula of R25 over many stable two-mirror cavities,
	// all four sign quadrants of (g1, g2) in the stable region, plano and
	// convex mirrors included: ψ = 2 arccos(sgn(g1)√(g1g2)) and
	// m = 2g1g2 − 1 (Kogelnik & Li 1966). Abs 1e-10 rad: the accumulated
	// increments and the closed form each round to ~1e-15, amplified near
	// g1g2 → 0, 1 (not sampled closer than 0.02).
	d := units.Length(0.3)
	mirror := func(g float64) cavity.Mirror {
		// g = 1 − d/R → R = d/(1 − g); R < 0 is a convex mirror.
		switch r := float64(d) / (1 - g); {
		case g == 1:
			return flat(0)
		case r > 0:
			return concave(units.Length(r), 0)
		default:
			return cavity.Mirror{Shape: cavity.Convex, Radius: units.Length(-r)}
		}
	}
	n := 0
	for _, g1 := range []float64{-3, -1.5, -0.9, -0.5, -0.2, 0.2, 0.5, 0.9, 1, 1.5, 3} {
		for _, g2 := range []float64{-3, -1.5, -0.9, -0.5, -0.2, 0.2, 0.5, 0.9, 1, 1.5, 3} {
			p := g1 * g2
			if p < 0.02 || p > 0.98 {
				continue
			}
			n++
			c := twoMirror(t, mirror(g1), mirror(g2), d)
			st, _ := c.Stability()
			if !scalar.EqualWithinAbs(st.X.G1, g1, 1e-13) || !scalar.EqualWithinAbs(st.X.G2, g2, 1e-13) {
				t.Errorf("g = (%g, %g): Stability g = (%.15g, %.15g)", g1, g2, st.X.G1, st.X.G2)
			}
			if !scalar.EqualWithinAbs(st.X.HalfTrace, 2*p-1, 1e-13) {
				t.Errorf("g = (%g, %g): HalfTrace = %.15g, want 2g1g2 − 1 = %.15g", g1, g2, st.X.HalfTrace, 2*p-1)
			}
			sp, err := c.ModeSpacing()
			if err != nil {
				t.Errorf("g = (%g, %g): ModeSpacing() error: %v", g1, g2, err)
				continue
			}
			want := 2 * math.Acos(math.Copysign(math.Sqrt(p), g1))
			if !scalar.EqualWithinAbs(float64(sp.X.Phase), want, 1e-10) {
				t.Errorf("g = (%g, %g): ψ = %.15g, want 2 arccos(sgn(g1)√(g1g2)) = %.15g", g1, g2, sp.X.Phase, want)
			}
		}
	}
	if n < 20 {
		t.Errorf("only %d stable cases sampled", n)
	}
}
