package polar_test

import (
	"math"
	"math/cmplx"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestFresnelR39(t *testing.T) {
	// Reference-checks R39 (Born & Wolf, Principles of Optics, §1.5.2 [from
	// memory]): at normal incidence from air into n = 1.5,
	// R = ((n1 − n2)/(n1 + n2))² = 0.04 for s and p; an uncoated plate
	// (two surfaces, no multiple reflections) passes (1 − R)² = 0.9216; at
	// 45°: Rs = 0.0920134, Rp = 0.00846646 (listed to 6 digits, rel 1e-6).
	// Normal incidence is exact apart from rounding: rel 1e-15.
	fr := mustOf[polar.Fresnel](t)
	f := fr(polar.Interface(1, 1.5, 0))
	rs, rp := f.Reflectance()
	ts, tp := f.Transmittance()
	for _, test := range []struct {
		name      string
		got, want float64
	}{
		{"Rs(0°)", rs, 0.04}, {"Rp(0°)", rp, 0.04}, {"Ts(0°)", ts, 0.96}, {"Tp(0°)", tp, 0.96}, {"plate Ts²", ts * ts, 0.9216},
	} {
		if !scalar.EqualWithinRel(test.got, test.want, 1e-15) {
			t.Errorf("Interface(1, 1.5, 0°): %s = %.17g, want %.17g (R39)", test.name, test.got, test.want)
		}
	}
	// Sign convention of the package (Born & Wolf): r_p = −r_s at
	// normal incidence, r_s = (n1 − n2)/(n1 + n2) = −0.2.
	if !scalar.EqualWithinAbs(real(f.RS), -0.2, 1e-16) || !scalar.EqualWithinAbs(real(f.RP), 0.2, 1e-16) {
		t.Errorf("Interface(1, 1.5, 0°): r_s = %v, r_p = %v, want −0.2, +0.2", f.RS, f.RP)
	}
	// Same from the glass side: R is symmetric, r changes sign.
	if g := fr(polar.Interface(1.5, 1, 0)); !scalar.EqualWithinAbs(real(g.RS), 0.2, 1e-16) {
		t.Errorf("Interface(1.5, 1, 0°): r_s = %v, want +0.2", g.RS)
	}
	f45 := fr(polar.Interface(1, 1.5, 45*units.Degree))
	rs, rp = f45.Reflectance()
	if !scalar.EqualWithinRel(rs, 0.0920134, 1e-6) || !scalar.EqualWithinRel(rp, 0.00846646, 1e-6) {
		t.Errorf("Interface(1, 1.5, 45°): Rs = %.9g, Rp = %.9g, want 0.0920134, 0.00846646 (R39)", rs, rp)
	}
	// Fresnel's own forms (Born & Wolf §1.5.2 [from memory]):
	// r_s = −sin(θi − θt)/sin(θi + θt), r_p = tan(θi − θt)/tan(θi + θt),
	// an independent route to the same numbers: rel 1e-14.
	thi := math.Pi / 4
	tht := math.Asin(math.Sin(thi) / 1.5)
	wantRS, wantRP := -math.Sin(thi-tht)/math.Sin(thi+tht), math.Tan(thi-tht)/math.Tan(thi+tht)
	if !scalar.EqualWithinRel(real(f45.RS), wantRS, 1e-14) || !scalar.EqualWithinRel(real(f45.RP), wantRP, 1e-14) {
		t.Errorf("Interface(1, 1.5, 45°): r_s = %v, r_p = %v, want %.17g, %.17g (sine and tangent forms)", f45.RS, f45.RP, wantRS, wantRP)
	}
}

func TestBrewster(t *testing.T) {
	// tan θB = n2/n1 (Born & Wolf §1.5.3 [from memory]): atan(1.5) =
	// 56.30993° (R39) where Rp = 0 (to 1e-15 by R39: r_p is a difference of
	// rounded terms of order 1, so |r_p| ≲ 1e-16 and Rp ≲ 1e-32). Fused
	// silica at nd = 1.458464: 55.563° (R02, ±0.001°).
	ang := mustOf[units.Angle](t)
	fr := mustOf[polar.Fresnel](t)
	for _, test := range []struct {
		n1, n2, wantDeg, tolDeg float64
	}{
		{1, 1.5, 56.30993, 1e-5}, {1, 1.458464, 55.563, 1e-3}, {1.5, 1, 90 - 56.30993, 1e-5},
	} {
		b := ang(polar.Brewster(test.n1, test.n2))
		if !scalar.EqualWithinAbs(b.Degrees(), test.wantDeg, test.tolDeg) {
			t.Errorf("Brewster(%g, %g) = %.7g°, want %.7g°", test.n1, test.n2, b.Degrees(), test.wantDeg)
		}
		_, rp := fr(polar.Interface(test.n1, test.n2, b)).Reflectance()
		if rp > 1e-15 {
			t.Errorf("Interface(%g, %g, Brewster) Rp = %g, want 0", test.n1, test.n2, rp)
		}
	}
	// Reflected light at Brewster's angle is pure s: a polarizer's job.
	f := fr(polar.Interface(1, 1.5, ang(polar.Brewster(1, 1.5))))
	if e := f.Reflection().Apply(polar.Jones{X: 1, Y: 1}).Ellipse(); !angleNear(e.Azimuth, 90*units.Degree, 1e-12) {
		t.Errorf("reflection at Brewster's angle has azimuth %v, want 90° (s)", e.Azimuth)
	}
}

func TestFresnelEnergy(t *testing.T) {
	// R + T = 1 for s and p at a lossless interface (energy conservation;
	// Born & Wolf, Principles of Optics, §1.5.3 [from memory]) with the factor
	// n2 cos θt/(n1 cos θi) in T. An identity: abs 1e-14 (a few roundings
	// of terms ≤ 4). Also the power-normalised Jones matrices: the
	// reflected plus transmitted power of any input equals its power.
	fr := mustOf[polar.Fresnel](t)
	for _, pair := range [][2]float64{{1, 1.5}, {1.5, 1}, {1, 2.4}, {1.33, 1}, {1, 1.0001}, {1.7, 1.5}} {
		for deg := 0.0; deg < 90; deg += 0.5 {
			f := fr(polar.Interface(pair[0], pair[1], units.Angle(deg)*units.Degree))
			rs, rp := f.Reflectance()
			ts, tp := f.Transmittance()
			if !scalar.EqualWithinAbs(rs+ts, 1, 1e-14) || !scalar.EqualWithinAbs(rp+tp, 1, 1e-14) {
				t.Errorf("Interface(%g, %g, %g°): Rs + Ts = %.17g, Rp + Tp = %.17g, want 1", pair[0], pair[1], deg, rs+ts, rp+tp)
			}
			v := polar.Jones{X: complex(0.6, 0.3), Y: complex(-0.2, 0.7)}
			if got := f.Reflection().Apply(v).Power() + f.Transmission().Apply(v).Power(); !scalar.EqualWithinAbs(got, v.Power(), 1e-14) {
				t.Errorf("Interface(%g, %g, %g°): reflected + transmitted power %.17g, want %.17g", pair[0], pair[1], deg, got, v.Power())
			}
		}
	}
}

func TestTotalInternalReflection(t *testing.T) {
	// From n = 1.5 into air at 45° (beyond the critical angle 41.8103°):
	// |r_s| = |r_p| = 1 and T = 0, and the phases follow the closed forms
	// of Born & Wolf §1.5.4 [from memory] with n = n2/n1 (signs for the
	// package's e^{iωt}):
	//   tan(φs/2) = √(sin²θ − n²)/cos θ            → φs = 36.8699°
	//   tan(φp/2) = √(sin²θ − n²)/(n² cos θ)       → φp = 73.7398°
	//   tan((φp − φs)/2) = cos θ √(sin²θ − n²)/sin²θ = 1/3 → 36.8699°
	// Tolerances: |r| to 1e-15 (a ratio of conjugates); phases to 1e-14
	// rad (atan of rounded inputs) plus, near the critical angle, the
	// conditioning of the root: sin²θ − n² cancels, so both sides carry a
	// relative error of about 2e-16/(sin²θ − n²) in the root, and the phase
	// |φ| times that (4e-16·|φ|/(sin²θ − n²) allowed).
	fr := mustOf[polar.Fresnel](t)
	for _, test := range []struct{ n1, n2, deg float64 }{
		{1.5, 1, 45}, {1.5, 1, 60}, {1.5, 1, 89}, {1.444024, 1, 50}, {2.4, 1.33, 40}, {1.5, 1, 41.82},
	} {
		f := fr(polar.Interface(test.n1, test.n2, units.Angle(test.deg)*units.Degree))
		if !f.TIR {
			t.Errorf("Interface(%g, %g, %g°).TIR = false, want true", test.n1, test.n2, test.deg)
			continue
		}
		if !scalar.EqualWithinAbs(cmplx.Abs(f.RS), 1, 1e-15) || !scalar.EqualWithinAbs(cmplx.Abs(f.RP), 1, 1e-15) {
			t.Errorf("Interface(%g, %g, %g°): |r_s| = %.17g, |r_p| = %.17g, want 1", test.n1, test.n2, test.deg, cmplx.Abs(f.RS), cmplx.Abs(f.RP))
		}
		if ts, tp := f.Transmittance(); ts != 0 || tp != 0 {
			t.Errorf("Interface(%g, %g, %g°): T = %g, %g, want 0 under TIR", test.n1, test.n2, test.deg, ts, tp)
		}
		if _, ok := f.Refraction(); ok {
			t.Errorf("Interface(%g, %g, %g°).Refraction() ok, want no refracted beam", test.n1, test.n2, test.deg)
		}
		th := test.deg * math.Pi / 180
		n := test.n2 / test.n1
		root := math.Sqrt(math.Sin(th)*math.Sin(th) - n*n)
		wantS := 2 * math.Atan(root/math.Cos(th))
		wantP := 2 * math.Atan(root/(n*n*math.Cos(th)))
		wantD := 2 * math.Atan(math.Cos(th)*root/(math.Sin(th)*math.Sin(th)))
		ps, pp := f.ReflectionPhase()
		tol := 1e-14 + 4e-16*wantP/(root*root)
		if !scalar.EqualWithinAbs(float64(ps), wantS, tol) || !scalar.EqualWithinAbs(float64(pp), wantP, tol) || !scalar.EqualWithinAbs(float64(pp-ps), wantD, tol) {
			t.Errorf("Interface(%g, %g, %g°): φs = %.12g°, φp = %.12g°, Δ = %.12g°, want %.12g°, %.12g°, %.12g°", test.n1, test.n2, test.deg,
				ps.Degrees(), pp.Degrees(), (pp - ps).Degrees(), wantS*180/math.Pi, wantP*180/math.Pi, wantD*180/math.Pi)
		}
	}
	f := fr(polar.Interface(1.5, 1, 45*units.Degree))
	_, pp := f.ReflectionPhase()
	ps, _ := f.ReflectionPhase()
	if !scalar.EqualWithinAbs((pp - ps).Degrees(), 36.8699, 1e-4) {
		t.Errorf("TIR at 45° from n = 1.5: Δ = %.6g°, want 36.8699°", (pp - ps).Degrees())
	}
}

func TestCriticalAngle(t *testing.T) {
	// sin θc = n2/n1 (Snell with θt = 90°): n = 1.5 → 41.8103°; fused
	// silica at 1.55 µm, n = 1.444024 → 43.829° (R38); at nd = 1.458464 →
	// 43.287° (R02). Tolerance 1e-3° (R38 and R02 list three decimals),
	// 1e-4° for the 1.5 case (listed to four). Just below θc the interface
	// refracts, just above it reflects totally (R38: report TIR, not NaN).
	ang := mustOf[units.Angle](t)
	fr := mustOf[polar.Fresnel](t)
	for _, test := range []struct{ n1, want, tol float64 }{{1.5, 41.8103, 1e-4}, {1.444024, 43.829, 1e-3}, {1.458464, 43.287, 1e-3}} {
		c := ang(polar.CriticalAngle(test.n1, 1))
		if !scalar.EqualWithinAbs(c.Degrees(), test.want, test.tol) {
			t.Errorf("CriticalAngle(%g, 1) = %.6g°, want %g°", test.n1, c.Degrees(), test.want)
		}
		below := fr(polar.Interface(test.n1, 1, c-1e-9))
		above := fr(polar.Interface(test.n1, 1, c+1e-9))
		if below.TIR || !above.TIR {
			t.Errorf("Interface(%g, 1, θc ∓ 1 nrad): TIR = %v, %v, want false, true", test.n1, below.TIR, above.TIR)
		}
		if th, ok := below.Refraction(); !ok || math.IsNaN(float64(th)) {
			t.Errorf("Interface(%g, 1, θc − 1 nrad).Refraction() = %v, %v", test.n1, th, ok)
		}
	}
	if _, err := polar.CriticalAngle(1, 1.5); err == nil {
		t.Errorf("CriticalAngle(1, 1.5) error = nil, want an error (no TIR into a denser medium)")
	}
}

func TestFresnelTable(t *testing.T) {
	// The project's own layout; the numbers are R39's.
	f := mustOf[polar.Fresnel](t)(polar.Interface(1, 1.5, 45*units.Degree))
	want := "Fresnel coefficients, n1 = 1 → n2 = 1.5 at θi = 45.000°\n" +
		"component  |r|       arg r (°)  R         |t|       T\n" +
		"---------  --------  ---------  --------  --------  --------\n" +
		"s          0.303337  180.000    0.092013  0.696663  0.907987\n" +
		"p          0.092013  0.000      0.008466  0.728009  0.991534\n"
	if got := f.Table().Text(); got != want {
		t.Errorf("Table() =\n%s\nwant\n%s", got, want)
	}
}
