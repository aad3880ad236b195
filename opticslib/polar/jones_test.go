package polar_test

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// mustOf returns a function that passes on a value and stops the test t
// on an error: vec := mustOf[polar.Jones](t); v := vec(polar.Linear(0, 1)).
func mustOf[T any](t *testing.T) func(T, error) T {
	return func(v T, err error) T {
		t.Helper()
		if err != nil {
			t.Fatalf("unexpected error: %v", err)
		}
		return v
	}
}

// jonesNear reports |a − b| ≤ tol componentwise (power amplitudes of
// order 1, so an absolute tolerance).
func jonesNear(a, b polar.Jones, tol float64) bool {
	return cmplx.Abs(a.X-b.X) <= tol && cmplx.Abs(a.Y-b.Y) <= tol
}

// sameState reports whether a and b are the same state up to a common
// phase: |⟨a|b⟩|² = |a|²|b|² within tol (relative).
func sameState(a, b polar.Jones, tol float64) bool {
	in := cmplx.Conj(a.X)*b.X + cmplx.Conj(a.Y)*b.Y
	return math.Abs(sqAbs(in)-a.Power()*b.Power()) <= tol*a.Power()*b.Power()
}

func sqAbs(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

// angleNear compares two azimuths modulo 180° (an ellipse's azimuth is
// defined modulo 180°).
func angleNear(a, b units.Angle, tol float64) bool {
	d := math.Remainder(float64(a-b), math.Pi)
	return math.Abs(d) <= tol
}

func randomJones(rng *rand.Rand) polar.Jones {
	return polar.Jones{X: complex(rng.NormFloat64(), rng.NormFloat64()), Y: complex(rng.NormFloat64(), rng.NormFloat64())}
}

func TestMalusLaw(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// Malus's law I = I0 cos²(θ − ψ) for linear light at ψ through an ideal
	// polarizer at θ (D. H. Goldstein, Polarized Light, 3rd ed., 2011 [from memory];
	// reference-checks R39, from Azzam & Bashara). Tolerance abs 1e-15:
	// a few roundings of sin and cos on values ≤ 1.
	const tol = 1e-15
	for _, test := range []struct{ psi, theta float64 }{
		{0, 0}, {0, 30}, {0, 45}, {0, 60}, {0, 90}, {10, 100}, {-20, 37}, {123, 45}, {45, -45},
	} {
		in := vec(polar.Linear(units.Angle(test.psi)*units.Degree, 2.5))
		p := mat(polar.Polarizer(units.Angle(test.theta) * units.Degree))
		got := p.Apply(in).Power() / 2.5
		c := math.Cos((test.theta - test.psi) * math.Pi / 180)
		if !scalar.EqualWithinAbs(got, c*c, tol) {
			t.Errorf("Polarizer(%g°) on Linear(%g°): fraction %.17g, want cos² = %.17g (Malus)", test.theta, test.psi, got, c*c)
		}
		// The output lies along the axis.
		if got > 1e-12 && !angleNear(p.Apply(in).Ellipse().Azimuth, units.Angle(test.theta)*units.Degree, 1e-9) {
			t.Errorf("Polarizer(%g°) output azimuth %v, want %g°", test.theta, p.Apply(in).Ellipse().Azimuth, test.theta)
		}
	}
}

func TestHalfWaveRotates(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// A half-wave plate at θ turns linear light along x by 2θ, and in
	// general mirrors an azimuth ψ to 2θ − ψ (reference-checks R39, Azzam &
	// Bashara [from memory]; Goldstein, Polarized Light [from memory]).
	// Power is kept (a waveplate is lossless). Tolerance 1e-12 rad on the
	// azimuth (atan2 of rounded Stokes parameters, conditioned by S0 = 1)
	// and 1e-14 on the ellipticity and power.
	for _, test := range []struct{ psi, theta float64 }{
		{0, 0}, {0, 10}, {0, 22.5}, {0, 45}, {0, 67.5}, {0, -30}, {30, 10}, {-50, 20}, {80, 170},
	} {
		in := vec(polar.Linear(units.Angle(test.psi)*units.Degree, 1))
		out := mat(polar.HalfWave(units.Angle(test.theta) * units.Degree)).Apply(in)
		want := units.Angle(2*test.theta-test.psi) * units.Degree
		e := out.Ellipse()
		if !angleNear(e.Azimuth, want, 1e-12) {
			t.Errorf("HalfWave(%g°) on Linear(%g°): azimuth %.12g°, want %.12g°", test.theta, test.psi, e.Azimuth.Degrees(), want.Degrees())
		}
		if math.Abs(float64(e.Ellipticity)) > 1e-14 || !scalar.EqualWithinAbs(out.Power(), 1, 1e-14) {
			t.Errorf("HalfWave(%g°) on Linear(%g°): χ = %g rad, P = %.17g, want linear, 1", test.theta, test.psi, float64(e.Ellipticity), out.Power())
		}
	}
}

func TestQuarterWaveCircular(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// A quarter-wave plate at 45° to linear light gives |S3/S0| = 1
	// (reference-checks R39); with the package's convention (Collett,
	// Field Guide to Polarization [from memory]: right-handed = (1, i)/√2,
	// S3 > 0) the plate at +45° to x-light gives right-handed light, at −45°
	// left-handed. Tolerance abs 1e-15: exact apart from rounding of
	// cos(π/4) and sin(π/4).
	x := vec(polar.Linear(0, 1))
	for _, test := range []struct {
		theta float64
		want  polar.Handedness
		s3    float64
	}{{45, polar.Right, 1}, {-45, polar.Left, -1}, {135, polar.Left, -1}} {
		out := mat(polar.QuarterWave(units.Angle(test.theta) * units.Degree)).Apply(x)
		s := out.Stokes()
		if !scalar.EqualWithinAbs(s.S3/s.S0, test.s3, 1e-15) {
			t.Errorf("QuarterWave(%g°) on x: S3/S0 = %.17g, want %g", test.theta, s.S3/s.S0, test.s3)
		}
		want := vec(polar.Circular(test.want, 1))
		if !sameState(out, want, 1e-15) {
			t.Errorf("QuarterWave(%g°) on x = %v, want %v light %v", test.theta, out, test.want, want)
		}
	}
	// The Jones vector of Circular(Right) is (1, i)/√2 (to the rounding of
	// cos 45° and sin 45°, a few ulps).
	r := vec(polar.Circular(polar.Right, 1))
	if !jonesNear(r, polar.Jones{X: complex(1/math.Sqrt2, 0), Y: complex(0, 1/math.Sqrt2)}, 1e-15) {
		t.Errorf("Circular(Right, 1) = %v, want (1, i)/√2", r)
	}
}

func TestCrossedPolarizersWithMiddle(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// Crossed ideal polarizers pass nothing; a third one at 45° between
	// them passes cos²45°·cos²45° = 1/4 (Malus's law twice, an analytic
	// identity). Tolerance abs 1e-15 (rounding), 1e-30 for the crossed pair.
	in := vec(polar.Linear(0, 1))
	p0 := mat(polar.Polarizer(0))
	p45 := mat(polar.Polarizer(45 * units.Degree))
	p90 := mat(polar.Polarizer(90 * units.Degree))
	if got := p0.Then(p90).Apply(in).Power(); got > 1e-30 {
		t.Errorf("crossed polarizers pass %g, want 0", got)
	}
	if got := p0.Then(p45).Then(p90).Apply(in).Power(); !scalar.EqualWithinAbs(got, 0.25, 1e-15) {
		t.Errorf("0°, 45°, 90° polarizers pass %.17g, want 0.25", got)
	}
	// Beam order matters: the same three in the order 0°, 90°, 45° pass 0.
	if got := p0.Then(p90).Then(p45).Apply(in).Power(); got > 1e-30 {
		t.Errorf("0°, 90°, 45° polarizers pass %g, want 0", got)
	}
}

func TestThenIsBeamOrder(t *testing.T) {
	mat := mustOf[polar.JonesMatrix](t)
	// m.Then(n).Apply(v) == n.Apply(m.Apply(v)): the first element met
	// is applied first (the package's definition; rounding only, 1e-15).
	rng := rand.New(rand.NewPCG(1, 1))
	for range 50 {
		a := mat(polar.Retarder(units.Angle(rng.Float64()*4), units.Angle(rng.Float64()*7)))
		b := mat(polar.PartialPolarizer(units.Angle(rng.Float64()*4), 1+100*rng.Float64()))
		v := randomJones(rng)
		if got, want := a.Then(b).Apply(v), b.Apply(a.Apply(v)); !jonesNear(got, want, 1e-14) {
			t.Errorf("a.Then(b).Apply(v) = %v, want b.Apply(a.Apply(v)) = %v", got, want)
		}
	}
}

func TestPartialPolarizerLeak(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// Definition of the extinction ratio ER = Tmax/Tmin: light across the
	// axis keeps 1/ER, along it all (a diattenuator, Collett [from
	// memory]); +Inf is the ideal polarizer, 1 the identity. Rounding only:
	// the leaked amplitude √(1/ER) comes out of a cancellation between
	// entries of order 1, so its error is a few 1e-16 absolute and the
	// leaked power's 2·√(1/ER)·1e-15.
	for _, er := range []float64{1, 10, 1000, 1e6, math.Inf(1)} {
		for _, th := range []float64{0, 30, 90} {
			p := mat(polar.PartialPolarizer(units.Angle(th)*units.Degree, er))
			along := vec(polar.Linear(units.Angle(th)*units.Degree, 1))
			across := vec(polar.Linear(units.Angle(th+90)*units.Degree, 1))
			if got := p.Apply(along).Power(); !scalar.EqualWithinAbsOrRel(got, 1, 1e-15, 1e-15) {
				t.Errorf("PartialPolarizer(%g°, %g) along: %.17g, want 1", th, er, got)
			}
			if got := p.Apply(across).Power(); !scalar.EqualWithinAbs(got, 1/er, 2*math.Sqrt(1/er)*1e-15+1e-30) {
				t.Errorf("PartialPolarizer(%g°, %g) across: %.17g, want %.17g", th, er, got, 1/er)
			}
		}
	}
}

func TestStokesFullyPolarized(t *testing.T) {
	// For a Jones vector S0² = S1² + S2² + S3² (Born & Wolf, Principles of
	// Optics, §1.4.2 [from memory]); an algebraic identity, so rel 1e-14
	// (a few roundings in squares of order S0²).
	rng := rand.New(rand.NewPCG(1, 1))
	for range 200 {
		v := randomJones(rng)
		s := v.Stokes()
		lhs, rhs := s.S0*s.S0, s.S1*s.S1+s.S2*s.S2+s.S3*s.S3
		if !scalar.EqualWithinRel(lhs, rhs, 1e-14) {
			t.Errorf("%v: S0² = %.17g, S1²+S2²+S3² = %.17g", v, lhs, rhs)
		}
		if dop := s.DegreeOfPolarization(); !scalar.EqualWithinAbs(dop, 1, 1e-14) {
			t.Errorf("%v: DOP = %.17g, want 1", v, dop)
		}
		if err := s.Validate(); err != nil {
			t.Errorf("%v: Validate() = %v, want nil", v, err)
		}
	}
}

func TestEllipticalStokes(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	// Stokes parameters of an ellipse (ψ, χ): P(1, cos2χ cos2ψ, cos2χ sin2ψ,
	// sin2χ) (Born & Wolf §1.4.2 [from memory]; Collett [from memory]), and
	// Ellipse() inverts them. Rounding only: abs 1e-15 on the parameters,
	// 1e-12 rad on the angles away from circular light (asin is steep at 1).
	for _, test := range []struct{ psi, chi float64 }{
		{0, 0}, {30, 10}, {-60, -20}, {89, 44}, {-10, -44.9}, {45, 0}, {0, 45}, {0, -45},
	} {
		psi, chi := test.psi*math.Pi/180, test.chi*math.Pi/180
		v := vec(polar.Elliptical(units.Angle(psi), units.Angle(chi), 3))
		s := v.Stokes()
		want := polar.Stokes{S0: 3, S1: 3 * math.Cos(2*chi) * math.Cos(2*psi), S2: 3 * math.Cos(2*chi) * math.Sin(2*psi), S3: 3 * math.Sin(2*chi)}
		for i, pair := range [][2]float64{{s.S0, want.S0}, {s.S1, want.S1}, {s.S2, want.S2}, {s.S3, want.S3}} {
			if !scalar.EqualWithinAbs(pair[0], pair[1], 3e-15) {
				t.Errorf("Elliptical(%g°, %g°).Stokes() S%d = %.17g, want %.17g", test.psi, test.chi, i, pair[0], pair[1])
			}
		}
		e := v.Ellipse()
		if math.Abs(test.chi) < 45 && (!angleNear(e.Azimuth, units.Angle(psi), 1e-9) || !scalar.EqualWithinAbs(float64(e.Ellipticity), chi, 1e-9)) {
			t.Errorf("Elliptical(%g°, %g°).Ellipse() = (%g°, %g°)", test.psi, test.chi, e.Azimuth.Degrees(), e.Ellipticity.Degrees())
		}
	}
}

func TestDegreeOfPolarizationMixture(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	// Incoherent beams add their Stokes vectors (G. G. Stokes 1852; Born &
	// Wolf §10.8.3 [from memory]); DOP = |(S1, S2, S3)|/S0. Cases with
	// closed forms: x (P1) with y (P2): |P1 − P2|/(P1 + P2); equal orthogonal
	// beams: 0 (unpolarized); x with right circular, equal power: S =
	// (2, 1, 0, 1), DOP = √2/2. Rounding only: abs 1e-15.
	lin := func(psi float64, p float64) polar.Stokes {
		return vec(polar.Linear(units.Angle(psi)*units.Degree, p)).Stokes()
	}
	rc := vec(polar.Circular(polar.Right, 1)).Stokes()
	lc := vec(polar.Circular(polar.Left, 1)).Stokes()
	for _, test := range []struct {
		name string
		s    polar.Stokes
		want float64
	}{
		{"x 3 + y 1", lin(0, 3).Add(lin(90, 1)), 0.5},
		{"x 1 + y 1", lin(0, 1).Add(lin(90, 1)), 0},
		{"+45° 1 + −45° 1", lin(45, 1).Add(lin(-45, 1)), 0},
		{"right + left", rc.Add(lc), 0},
		{"x 1 + right 1", lin(0, 1).Add(rc), math.Sqrt2 / 2},
		{"x 0.2 + unpolarized 0.8", lin(0, 0.2).Add(polar.Stokes{S0: 0.8}), 0.2},
		{"no light", polar.Stokes{}, 0},
	} {
		if got := test.s.DegreeOfPolarization(); !scalar.EqualWithinAbs(got, test.want, 1e-15) {
			t.Errorf("%s: DOP = %.17g, want %.17g", test.name, got, test.want)
		}
		if err := test.s.Validate(); err != nil {
			t.Errorf("%s: Validate() = %v", test.name, err)
		}
	}
	if err := (polar.Stokes{S0: 1, S1: 1, S3: 0.5}).Validate(); err == nil {
		t.Errorf("Validate() of S0 < |S| = nil, want an error")
	}
}

func TestFaradayDoublePass(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	mat := mustOf[polar.JonesMatrix](t)
	// Faraday rotation is non-reciprocal, optical activity reciprocal
	// (Goldstein, Polarized Light, 3rd ed. [from memory]):
	// - a rotator ρ, a mirror and the rotator again return the light as a
	//   plain mirror does (the rotation undoes itself);
	// - a Faraday rotator ρ, a mirror and the rotator again turn it by 2ρ:
	//   at ρ = 45° light along x returns along y;
	// - Faraday mirror (M. Martinelli, Opt. Commun. 72, 341 (1989) [from
	//   memory]): with ρ = 45° the round trip through any reciprocal
	//   retarder W, the Faraday mirror and W backwards equals the Faraday
	//   mirror alone (det W = 1), so the birefringence cancels; and the
	//   returning light, in laboratory axes, is orthogonal to the phase
	//   conjugate of the input, uᵀv = 0, for every input v.
	// Rounding only: abs 1e-14.
	const tol = 1e-14
	rng := rand.New(rand.NewPCG(1, 1))
	rho := 45 * units.Degree
	f := mat(polar.FaradayRotator(rho, polar.Forward))
	b := mat(polar.FaradayRotator(rho, polar.Backward))
	frm := f.Then(polar.Mirror()).Then(b)
	x := vec(polar.Linear(0, 1))
	if got := frm.Apply(x); !sameState(got, vec(polar.Linear(90*units.Degree, 1)), tol) {
		t.Errorf("Faraday 45° double pass of x = %v, want y", got)
	}
	for range 50 {
		r := units.Angle(rng.Float64() * 3)
		rot := mat(polar.Rotator(r))
		v := randomJones(rng)
		if got, want := rot.Then(polar.Mirror()).Then(rot.Reverse()).Apply(v), polar.Mirror().Apply(v); !jonesNear(got, want, tol*4) {
			t.Errorf("Rotator(%v) double pass = %v, want the mirror's %v", r, got, want)
		}
		fr := mat(polar.FaradayRotator(r, polar.Forward)).Then(polar.Mirror()).Then(mat(polar.FaradayRotator(r, polar.Backward)))
		rot2 := mat(polar.Rotator(-2 * r))
		if got, want := fr.Apply(v), polar.Mirror().Then(rot2).Apply(v); !jonesNear(got, want, tol*4) {
			t.Errorf("FaradayRotator(%v) double pass = %v, want R(−2ρ)·Mirror = %v", r, got, want)
		}
		w := mat(polar.Retarder(units.Angle(rng.Float64()*4), units.Angle(rng.Float64()*7)))
		if got, want := w.Then(frm).Then(w.Reverse()).Apply(v), frm.Apply(v); !jonesNear(got, want, tol*4) {
			t.Errorf("retarder + Faraday mirror + retarder back = %v, want the Faraday mirror alone %v", got, want)
		}
		u := frm.Apply(v)
		uLab := polar.Jones{X: -u.X, Y: u.Y} // return frame → laboratory axes
		if dot := uLab.X*v.X + uLab.Y*v.Y; cmplx.Abs(dot) > tol*v.Power() {
			t.Errorf("Faraday mirror: uᵀv = %v, want 0", dot)
		}
	}
}

func TestReverseOfReciprocalElements(t *testing.T) {
	mat := mustOf[polar.JonesMatrix](t)
	// In the return frame (x reversed) a polarizer or waveplate at θ
	// appears at −θ (geometry of the frame; Potton, Rep. Prog. Phys. 67,
	// 717 (2004) [from memory] for Q Jᵀ Q). Rounding only: 1e-15.
	for _, th := range []float64{0, 20, 45, 71, -33} {
		a := units.Angle(th) * units.Degree
		p, pm := mat(polar.Polarizer(a)), mat(polar.Polarizer(-a))
		w, wm := mat(polar.Retarder(a, 1.1)), mat(polar.Retarder(-a, 1.1))
		if !matrixNear(p.Reverse(), pm, 1e-15) || !matrixNear(w.Reverse(), wm, 1e-15) {
			t.Errorf("Reverse at %g°: polarizer %v (want %v), retarder %v (want %v)", th, p.Reverse(), pm, w.Reverse(), wm)
		}
	}
}

func matrixNear(a, b polar.JonesMatrix, tol float64) bool {
	return cmplx.Abs(a.XX-b.XX) <= tol && cmplx.Abs(a.XY-b.XY) <= tol && cmplx.Abs(a.YX-b.YX) <= tol && cmplx.Abs(a.YY-b.YY) <= tol
}

func TestPolarizingBeamSplitter(t *testing.T) {
	vec := mustOf[polar.Jones](t)
	ports := mustOf[polar.Ports](t)
	// Energy conservation of an ideal splitter: Tp + Rs = 1 for any input
	// (an identity of the two projections), the transmitted port along x
	// (p), the reflected along y (s); with finite extinction the leaks are
	// 1/ER by the definition of the ratio. Rounding only: 1e-15.
	rng := rand.New(rand.NewPCG(1, 1))
	ideal := ports(polar.PolarizingBeamSplitter(math.Inf(1), math.Inf(1)))
	for range 20 {
		v := randomJones(rng)
		pt, pr := ideal.Transmitted.Apply(v).Power(), ideal.Reflected.Apply(v).Power()
		if !scalar.EqualWithinRel(pt+pr, v.Power(), 1e-15) || !scalar.EqualWithinRel(pt, sqAbs(v.X), 1e-15) {
			t.Errorf("ideal PBS of %v: T = %g, R = %g, want %g + %g", v, pt, pr, sqAbs(v.X), sqAbs(v.Y))
		}
	}
	leaky := ports(polar.PolarizingBeamSplitter(1000, 50))
	x, y := vec(polar.Linear(0, 1)), vec(polar.Linear(90*units.Degree, 1))
	if got := leaky.Transmitted.Apply(y).Power(); !scalar.EqualWithinRel(got, 1e-3, 1e-14) {
		t.Errorf("PBS(1000, 50) transmits s: %g, want 1e-3", got)
	}
	if got := leaky.Reflected.Apply(x).Power(); !scalar.EqualWithinRel(got, 0.02, 1e-14) {
		t.Errorf("PBS(1000, 50) reflects p: %g, want 0.02", got)
	}
}

func TestRotatedMatchesElements(t *testing.T) {
	// Rotated is R(−θ)·J·R(θ) (Collett, Field Guide to Polarization [from
	// memory]): the frame diagonal forms turned by θ must equal the
	// elements built at θ from their closed forms. Rounding only: 1e-15.
	mat := mustOf[polar.JonesMatrix](t)
	for _, deg := range []float64{0, 17, 45, 90, -61, 200} {
		th := units.Angle(deg) * units.Degree
		g := 0.9
		ret := polar.JonesMatrix{XX: cmplx.Exp(complex(0, g/2)), YY: cmplx.Exp(complex(0, -g/2))}
		if got, want := ret.Rotated(th), mat(polar.Retarder(th, units.Angle(g))); !matrixNear(got, want, 1e-15) {
			t.Errorf("diag retarder Rotated(%g°) = %v, want Retarder = %v", deg, got, want)
		}
		if got, want := (polar.JonesMatrix{XX: 1}).Rotated(th), mat(polar.Polarizer(th)); !matrixNear(got, want, 1e-15) {
			t.Errorf("diag(1, 0).Rotated(%g°) = %v, want Polarizer = %v", deg, got, want)
		}
	}
}

func TestValueTypesDoNotAllocate(t *testing.T) {
	// Small math types are values (the project's style rule 3): the
	// arithmetic allocates nothing.
	a := polar.JonesMatrix{XX: 1, XY: 0.5i, YX: -0.2, YY: 0.7}
	v := polar.Jones{X: 1, Y: 1i}
	var sink polar.Jones
	var ms polar.Mueller
	if n := testing.AllocsPerRun(100, func() {
		sink = a.Then(a).Then(a.Reverse()).Apply(v)
		ms = a.Mueller().Then(a.Mueller())
	}); n != 0 {
		t.Errorf("Then, Apply, Reverse, Mueller allocate %g times per run, want 0", n)
	}
	_, _ = sink, ms
}
