package polar_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

func muellerNear(a, b polar.Mueller, tol float64) bool {
	for i := range 4 {
		for j := range 4 {
			if math.Abs(a[i][j]-b[i][j]) > tol {
				return false
			}
		}
	}
	return true
}

func stokesNear(a, b polar.Stokes, tol float64) bool {
	return math.Abs(a.S0-b.S0) <= tol && math.Abs(a.S1-b.S1) <= tol && math.Abs(a.S2-b.S2) <= tol && math.Abs(a.S3-b.S3) <= tol
}

// randomElement returns one of the package's elements with seeded random
// parameters.
func randomElement(t *testing.T, rng *rand.Rand) polar.JonesMatrix {
	mat := mustOf[polar.JonesMatrix](t)
	a := units.Angle(2 * math.Pi * rng.Float64())
	switch rng.IntN(6) {
	case 0:
		return mat(polar.Polarizer(a))
	case 1:
		return mat(polar.PartialPolarizer(a, 1+1e3*rng.Float64()))
	case 2:
		return mat(polar.Retarder(a, units.Angle(2*math.Pi*rng.Float64())))
	case 3:
		return mat(polar.Rotator(a))
	case 4:
		f := mustOf[polar.Fresnel](t)(polar.Interface(1, 1+rng.Float64(), units.Angle(1.5*rng.Float64())))
		return f.Reflection()
	}
	return mat(polar.FaradayRotator(a, polar.Backward))
}

func TestMuellerMatchesJones(t *testing.T) {
	// Mueller–Jones consistency: for a non-depolarizing element,
	// M(J)·S(v) = S(J v) and M(J1 then J2) = M(J1) then M(J2)
	// (Azzam & Bashara, Ellipsometry and Polarized Light, 1977, §2.11
	// [from memory]). Identities: abs 1e-13 on values of order |v|² ≤ 20
	// (products of a few entries of order 1).
	rng := rand.New(rand.NewPCG(1, 1))
	for range 200 {
		j1, j2 := randomElement(t, rng), randomElement(t, rng)
		v := randomJones(rng)
		m1 := j1.Mueller()
		if got, want := m1.Apply(v.Stokes()), j1.Apply(v).Stokes(); !stokesNear(got, want, 1e-13) {
			t.Errorf("M(J)·S(v) = %v, want S(J v) = %v (J = %v)", got, want, j1)
		}
		if got, want := j1.Then(j2).Mueller(), m1.Then(j2.Mueller()); !muellerNear(got, want, 1e-14) {
			t.Errorf("M(J1.Then(J2)) = %v, want M(J1).Then(M(J2)) = %v", got, want)
		}
	}
}

func TestMuellerClosedForms(t *testing.T) {
	// Closed-form Mueller matrices (E. Collett, Field Guide to
	// Polarization, SPIE 2005 [from memory]), with C = cos 2θ, S = sin 2θ:
	//   ideal polarizer at θ: ½ [[1, C, S, 0], [C, C², CS, 0], [S, CS, S², 0], [0, 0, 0, 0]]
	//   retarder Γ, fast axis θ:
	//     [[1, 0, 0, 0],
	//      [0, C² + S² cos Γ, CS(1 − cos Γ), −S sin Γ],
	//      [0, CS(1 − cos Γ), S² + C² cos Γ,  C sin Γ],
	//      [0, S sin Γ,       −C sin Γ,       cos Γ]]
	//   rotator ρ: the rotation of (S1, S2) by 2ρ.
	// The sign of the sin Γ terms is that of the package's handedness (a
	// quarter-wave plate at +45° takes S1 to +S3). Rounding: abs 1e-15.
	mat := mustOf[polar.JonesMatrix](t)
	for _, deg := range []float64{0, 15, 45, 90, 123, -70} {
		th := deg * math.Pi / 180
		c, s := math.Cos(2*th), math.Sin(2*th)
		want := polar.Mueller{{0.5, c / 2, s / 2, 0}, {c / 2, c * c / 2, c * s / 2, 0}, {s / 2, c * s / 2, s * s / 2, 0}, {}}
		if got := mat(polar.Polarizer(units.Angle(th))).Mueller(); !muellerNear(got, want, 1e-15) {
			t.Errorf("Polarizer(%g°).Mueller() = %v, want %v", deg, got, want)
		}
		for _, g := range []float64{math.Pi / 2, math.Pi, 0.7, 4} {
			cg, sg := math.Cos(g), math.Sin(g)
			want := polar.Mueller{
				{1, 0, 0, 0},
				{0, c*c + s*s*cg, c * s * (1 - cg), -s * sg},
				{0, c * s * (1 - cg), s*s + c*c*cg, c * sg},
				{0, s * sg, -c * sg, cg},
			}
			if got := mat(polar.Retarder(units.Angle(th), units.Angle(g))).Mueller(); !muellerNear(got, want, 1e-15) {
				t.Errorf("Retarder(%g°, %g rad).Mueller() = %v, want %v", deg, g, got, want)
			}
		}
		c2, s2 := math.Cos(2*th), math.Sin(2*th)
		want = polar.Mueller{{1, 0, 0, 0}, {0, c2, -s2, 0}, {0, s2, c2, 0}, {0, 0, 0, 1}}
		if got := mat(polar.Rotator(units.Angle(th))).Mueller(); !muellerNear(got, want, 1e-15) {
			t.Errorf("Rotator(%g°).Mueller() = %v, want %v", deg, got, want)
		}
	}
}

func TestMuellerPartiallyPolarized(t *testing.T) {
	// Unpolarized light through an ideal polarizer: half the power, fully
	// polarized along the axis (Goldstein, Polarized Light, 3rd ed. [from memory]);
	// through a partial polarizer of extinction ER: power (1 + 1/ER)/2 and
	// DOP = (ER − 1)/(ER + 1) (the diattenuation of the part, from its
	// principal transmittances 1 and 1/ER). Rounding: abs 1e-15.
	mat := mustOf[polar.JonesMatrix](t)
	un := polar.Stokes{S0: 1}
	out := mat(polar.Polarizer(30 * units.Degree)).Mueller().Apply(un)
	if !scalar.EqualWithinAbs(out.S0, 0.5, 1e-15) || !scalar.EqualWithinAbs(out.DegreeOfPolarization(), 1, 1e-15) ||
		!angleNear(out.Ellipse().Azimuth, 30*units.Degree, 1e-12) {
		t.Errorf("unpolarized through Polarizer(30°) = %v (DOP %g, ψ %v), want S0 = 0.5, DOP 1, ψ 30°", out, out.DegreeOfPolarization(), out.Ellipse().Azimuth)
	}
	for _, er := range []float64{1, 10, 1000} {
		out := mat(polar.PartialPolarizer(0, er)).Mueller().Apply(un)
		if !scalar.EqualWithinAbs(out.S0, (1+1/er)/2, 1e-15) || !scalar.EqualWithinAbs(out.DegreeOfPolarization(), (er-1)/(er+1), 1e-15) {
			t.Errorf("unpolarized through PartialPolarizer(0, %g): S0 = %.17g, DOP = %.17g, want %.17g, %.17g", er, out.S0, out.DegreeOfPolarization(), (1+1/er)/2, (er-1)/(er+1))
		}
	}
	// Waveplates and rotators keep the degree of polarization of a mixture.
	mix := mustOf[polar.Jones](t)(polar.Linear(0, 0.3)).Stokes().Add(polar.Stokes{S0: 0.7})
	for _, m := range []polar.JonesMatrix{mat(polar.QuarterWave(20 * units.Degree)), mat(polar.Rotator(1))} {
		if got := m.Mueller().Apply(mix).DegreeOfPolarization(); !scalar.EqualWithinAbs(got, 0.3, 1e-15) {
			t.Errorf("DOP after a lossless element = %.17g, want 0.3", got)
		}
	}
}
