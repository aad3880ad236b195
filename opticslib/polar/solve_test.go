package polar_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestHalfWaveForAzimuth(t *testing.T) {
	// Closed form θ = (ψ + ψ')/2 from the half-wave rule ψ' = 2θ − ψ
	// (Goldstein, Polarized Light, 3rd ed. [from memory]); checked by applying the
	// plate: the output azimuth is the wanted one to 1e-12 rad (atan2 of
	// rounded Stokes parameters), θ in (−45°, 45°].
	vec := mustOf[polar.Jones](t)
	ang := mustOf[units.Angle](t)
	mat := mustOf[polar.JonesMatrix](t)
	for _, test := range []struct{ psi, chi, want float64 }{
		{0, 0, 45}, {0, 0, 90}, {10, 0, -30}, {90, 0, 0}, {30, 20, 75}, {-80, -10, 80}, {0, 0, 0},
	} {
		in := vec(polar.Elliptical(units.Angle(test.psi)*units.Degree, units.Angle(test.chi)*units.Degree, 1))
		th := ang(polar.HalfWaveForAzimuth(in, units.Angle(test.want)*units.Degree))
		if th <= -45*units.Degree || th > 45*units.Degree {
			t.Errorf("HalfWaveForAzimuth(ψ = %g°, %g°) = %v, want in (−45°, 45°]", test.psi, test.want, th.Degrees())
		}
		out := mat(polar.HalfWave(th)).Apply(in).Ellipse()
		if !angleNear(out.Azimuth, units.Angle(test.want)*units.Degree, 1e-12) {
			t.Errorf("HalfWaveForAzimuth(ψ = %g°, %g°) = %.12g°: output azimuth %.12g°", test.psi, test.want, th.Degrees(), out.Azimuth.Degrees())
		}
	}
	// Rotating x light to 45°: the plate at 22.5° (twice the angle rule).
	x := vec(polar.Linear(0, 1))
	if th := ang(polar.HalfWaveForAzimuth(x, 45*units.Degree)); !scalar.EqualWithinAbs(th.Degrees(), 22.5, 1e-12) {
		t.Errorf("HalfWaveForAzimuth(x, 45°) = %.15g°, want 22.5°", th.Degrees())
	}
	if _, err := polar.HalfWaveForAzimuth(vec(polar.Circular(polar.Right, 1)), 0); !errors.Is(err, polar.ErrUnreachable) {
		t.Errorf("HalfWaveForAzimuth(circular) error = %v, want ErrUnreachable", err)
	}
}

func TestHalfWaveForSplit(t *testing.T) {
	// Closed form from Malus's law for the x power after the plate,
	// f = (1 + cos 2χ cos 2ψ')/2; checked through an ideal PBS: the
	// transmitted (p) fraction is f to 1e-14 (rounding). Elliptical light
	// cannot reach f beyond (1 ± cos 2χ)/2 (ErrUnreachable).
	vec := mustOf[polar.Jones](t)
	ang := mustOf[units.Angle](t)
	mat := mustOf[polar.JonesMatrix](t)
	pbs := mustOf[polar.Ports](t)(polar.PolarizingBeamSplitter(math.Inf(1), math.Inf(1)))
	for _, test := range []struct{ psi, chi, f float64 }{
		{90, 0, 0.3}, {0, 0, 0}, {0, 0, 1}, {37, 0, 0.5}, {-20, 0, 0.999}, {10, 20, 0.6}, {10, 20, 0.5 + 0.5*math.Cos(40*math.Pi/180)},
		{0, 45, 0.5},
	} {
		in := vec(polar.Elliptical(units.Angle(test.psi)*units.Degree, units.Angle(test.chi)*units.Degree, 2))
		th := ang(polar.HalfWaveForSplit(in, test.f))
		out := mat(polar.HalfWave(th)).Apply(in)
		if got := pbs.Transmitted.Apply(out).Power() / 2; !scalar.EqualWithinAbs(got, test.f, 1e-14) {
			t.Errorf("HalfWaveForSplit(ψ %g°, χ %g°, %g) = %.10g°: transmitted fraction %.17g", test.psi, test.chi, test.f, th.Degrees(), got)
		}
	}
	in := vec(polar.Elliptical(0, 20*units.Degree, 1))
	if _, err := polar.HalfWaveForSplit(in, 0.95); !errors.Is(err, polar.ErrUnreachable) {
		t.Errorf("HalfWaveForSplit(χ = 20°, 0.95) error = %v, want ErrUnreachable (limit %.4f)", err, 0.5+0.5*math.Cos(40*math.Pi/180))
	}
}

func TestQuarterWaveForCircular(t *testing.T) {
	// Closed form θ = ψ ± 45° (R39: a quarter-wave plate at 45° to linear
	// light gives |S3/S0| = 1); the handedness per the package's
	// convention. Checked by applying the plate: S3/S0 = ±1 to 1e-15.
	vec := mustOf[polar.Jones](t)
	ang := mustOf[units.Angle](t)
	mat := mustOf[polar.JonesMatrix](t)
	for _, psi := range []float64{0, 10, 45, 90, -60, 170} {
		in := vec(polar.Linear(units.Angle(psi)*units.Degree, 1))
		for _, h := range []polar.Handedness{polar.Right, polar.Left} {
			th := ang(polar.QuarterWaveForCircular(in, h))
			s := mat(polar.QuarterWave(th)).Apply(in).Stokes()
			want := 1.0
			if h == polar.Left {
				want = -1
			}
			if !scalar.EqualWithinAbs(s.S3/s.S0, want, 1e-15) {
				t.Errorf("QuarterWaveForCircular(ψ = %g°, %v) = %g°: S3/S0 = %.17g, want %g", psi, h, th.Degrees(), s.S3/s.S0, want)
			}
		}
	}
	if th := ang(polar.QuarterWaveForCircular(vec(polar.Linear(0, 1)), polar.Right)); !scalar.EqualWithinAbs(th.Degrees(), 45, 1e-12) {
		t.Errorf("QuarterWaveForCircular(x, Right) = %g°, want 45°", th.Degrees())
	}
	if _, err := polar.QuarterWaveForCircular(vec(polar.Elliptical(0, 5*units.Degree, 1)), polar.Right); !errors.Is(err, polar.ErrUnreachable) {
		t.Errorf("QuarterWaveForCircular(elliptical) error = %v, want ErrUnreachable", err)
	}
}

func TestPlateForMaxPowerClosedForms(t *testing.T) {
	// Where a closed form exists, the numerical search must find it:
	// a half-wave plate before a polarizer at φ passes all of linear light
	// at ψ when θ = (ψ + φ)/2 (mod 90°), and nothing at θ = (ψ + φ)/2 + 45°
	// (the half-wave rule, Goldstein [from memory]); a quarter-wave plate
	// before a right-circular analyser passes all of linear light at
	// θ = ψ + 45°. The power is quadratic about the optimum, so an angle
	// error δ costs ~δ²: fractions to 1e-12, angles to 1e-5 rad
	// (√(1e-12) with the curvature of order 1; BFGS usually does far better).
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	set := mustOf[polar.Setting](t)
	for _, test := range []struct{ psi, phi float64 }{{0, 0}, {0, 90}, {20, 50}, {-30, 10}, {80, -80}} {
		in := vec(polar.Linear(units.Angle(test.psi)*units.Degree, 4))
		an := mat(polar.Polarizer(units.Angle(test.phi) * units.Degree))
		mx := set(polar.PlateForMaxPower(in, math.Pi, an))
		if !scalar.EqualWithinAbs(mx.Fraction, 1, 1e-12) || !scalar.EqualWithinAbs(mx.Power, 4, 4e-12) ||
			!angleNear(2*mx.FastAxis, units.Angle(test.psi+test.phi)*units.Degree, 2e-5) {
			t.Errorf("PlateForMaxPower(HWP, ψ %g°, φ %g°) = %.8g° (%.15g), want %.8g° mod 90° (1)", test.psi, test.phi, mx.FastAxis.Degrees(), mx.Fraction, (test.psi+test.phi)/2)
		}
		mn := set(polar.PlateForMinPower(in, math.Pi, an))
		if !scalar.EqualWithinAbs(mn.Fraction, 0, 1e-12) || !angleNear(2*mn.FastAxis, units.Angle(test.psi+test.phi+90)*units.Degree, 2e-5) {
			t.Errorf("PlateForMinPower(HWP, ψ %g°, φ %g°) = %.8g° (%.3g), want %.8g° mod 90° (0)", test.psi, test.phi, mn.FastAxis.Degrees(), mn.Fraction, (test.psi+test.phi)/2+45)
		}
		if mx.FastAxis < 0 || mx.FastAxis >= math.Pi {
			t.Errorf("PlateForMaxPower angle %v outside [0°, 180°)", mx.FastAxis)
		}
	}
	// Right-circular analyser: QWP at 45° (R) then a left QWP... built as a
	// quarter-wave plate at −45° (right circular → x) and a polarizer at 0.
	rightAnalyser := mat(polar.QuarterWave(-45 * units.Degree)).Then(mat(polar.Polarizer(0)))
	for _, psi := range []float64{0, 30, -70} {
		in := vec(polar.Linear(units.Angle(psi)*units.Degree, 1))
		mx := set(polar.PlateForMaxPower(in, math.Pi/2, rightAnalyser))
		if !scalar.EqualWithinAbs(mx.Fraction, 1, 1e-12) || !angleNear(mx.FastAxis, units.Angle(psi+45)*units.Degree, 1e-5) {
			t.Errorf("PlateForMaxPower(QWP, ψ %g°, right analyser) = %.8g° (%.15g), want %g° (1)", psi, mx.FastAxis.Degrees(), mx.Fraction, psi+45)
		}
	}
}

func TestPlateForMaxPowerAgainstScan(t *testing.T) {
	// For random retardances, inputs and analysers the optimum must be at
	// least as good as a dense scan (0.01° steps over 180°; between scan
	// points the power changes by at most ~(0.005° in rad)²·|P''| ≈ 1e-7,
	// so the search may beat the scan but never lose to it by more than
	// rounding, 1e-12).
	rng := rand.New(rand.NewPCG(1, 1))
	mat := mustOf[polar.JonesMatrix](t)
	set := mustOf[polar.Setting](t)
	for range 30 {
		in := randomJones(rng)
		gamma := units.Angle(2 * math.Pi * rng.Float64())
		after := randomElement(t, rng).Then(mat(polar.PartialPolarizer(units.Angle(3*rng.Float64()), 1+1e4*rng.Float64())))
		mx := set(polar.PlateForMaxPower(in, gamma, after))
		mn := set(polar.PlateForMinPower(in, gamma, after))
		scanMax, scanMin := math.Inf(-1), math.Inf(1)
		for k := range 18000 {
			th := units.Angle(float64(k) * 0.01 * math.Pi / 180)
			f := mat(polar.Retarder(th, gamma)).Then(after).Apply(in).Power() / in.Power()
			scanMax, scanMin = math.Max(scanMax, f), math.Min(scanMin, f)
		}
		if mx.Fraction < scanMax-1e-12 || mx.Fraction > scanMax+2e-7 {
			t.Errorf("PlateForMaxPower(Γ = %v) = %.15g at %.6g°, scan max %.15g", gamma, mx.Fraction, mx.FastAxis.Degrees(), scanMax)
		}
		if mn.Fraction > scanMin+1e-12 || mn.Fraction < scanMin-2e-7 {
			t.Errorf("PlateForMinPower(Γ = %v) = %.15g at %.6g°, scan min %.15g", gamma, mn.Fraction, mn.FastAxis.Degrees(), scanMin)
		}
	}
}

func TestPlateForMaxPowerFlat(t *testing.T) {
	// Γ = 0: the plate does nothing, every angle is optimal, θ = 0 is
	// returned (documented special case).
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	s := mustOf[polar.Setting](t)(polar.PlateForMaxPower(vec(polar.Linear(0.3, 1)), 0, mat(polar.Polarizer(0))))
	c := math.Cos(0.3)
	if s.FastAxis != 0 || !scalar.EqualWithinAbs(s.Fraction, c*c, 1e-15) {
		t.Errorf("PlateForMaxPower(Γ = 0) = %v, %.17g, want 0, %.17g", s.FastAxis, s.Fraction, c*c)
	}
}
