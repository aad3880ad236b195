package trace_test

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestSeidelR36 checks the Seidel S_I of reference-checks R36's
// plano-convex lens (n = 1.5168, R = 51.68 mm, t = 4 mm, h = 5 mm) through
// δz = −S_I/(2 n′ u′²):
//
//   - flat side first, the flat surface in the collimated beam adds
//     nothing and the curved one sees the full height, so the thick-lens
//     sum equals the thin-lens value of R36, 1.07677 mm (Welford's
//     thin-lens S_I, stock.SphericalSeidel, W. T. Welford, Aberrations of
//     Optical Systems, 1986, §7.3 [from memory]), tolerance 1e-5 mm;
//   - curved side first the 4 mm of glass lowers the rim ray on the flat
//     surface: the thick-lens sum is 0.7 % below R36's thin-lens 0.27410
//     mm (tolerance 1 %), and it is the h → 0 limit of the exact LSA,
//     checked against the exact LSA at h = 0.25 mm scaled by (5/0.25)²
//     (fifth-order terms: the exact/third-order ratio at 5 mm is 1.0028,
//     so 7e-6 at 0.25 mm; tolerance 2e-5 relative).
//   - both sums agree with stock.SphericalSeidel's thin-lens formula to
//     the same 1 % (flat first: 1e-9).
func TestSeidelR36(t *testing.T) {
	for _, test := range []struct {
		curvedFirst bool
		thin        float64 // R36 third-order LSA, mm
		tol         float64 // relative
		shape       float64 // Coddington q
	}{{true, 0.27410, 0.01, 1}, {false, 1.07677, 1e-5, -1}} {
		sys := planoConvex(t, test.curvedFirst)
		sd, err := sys.Seidel(lambda, trace.Source{PupilRadius: 5 * mm})
		if err != nil {
			t.Fatal(err)
		}
		got := -float64(sd.LongitudinalSpherical()) / 1e-3
		if !scalar.EqualWithinRel(got, test.thin, test.tol) {
			t.Errorf("curved first %v: Seidel LSA %.6f mm, R36 third order %.5f (tol %g)", test.curvedFirst, got, test.thin, test.tol)
		}
		thin := float64(stock.SphericalSeidel(5*mm, 100*mm, 1.5168, test.shape, -1))
		if tol := map[bool]float64{true: 0.01, false: 1e-9}[test.curvedFirst]; !scalar.EqualWithinRel(sd.Sum.SI, thin, tol) {
			t.Errorf("curved first %v: S_I %.6g m, thin-lens %.6g", test.curvedFirst, sd.Sum.SI, thin)
		}
		la, err := sys.SphericalAberration(lambda, 0.25*mm, 2)
		if err != nil {
			t.Fatal(err)
		}
		limit := -la.Shift[1] * 400 / 1e-3
		if !scalar.EqualWithinRel(got, limit, 2e-5) {
			t.Errorf("curved first %v: Seidel LSA %.7f mm, exact LSA at 0.25 mm × 400 = %.7f", test.curvedFirst, got, limit)
		}
	}
}

// TestSeidelMirrors checks reference-checks R35's mirrors in third order:
// a sphere of radius R0 = 100 mm for an object at infinity has S_I =
// 2h⁴/R0³ (Welford's mirror sum with n′ = −n; the LSA that follows,
// h²/(4R0), is the first term of R35's R0/2·(1/cos θ − 1)), checked
// against the closed form to 1e-12 and against the exact LSA at h = 1 mm
// to 1e-4 (the next term is (3/4)θ² = 7.5e-5 relative); a paraboloid
// (k = −1) has S_I = 0 (its exact focus is perfect), to rounding: below
// 1e-14 of the sphere's.
func TestSeidelMirrors(t *testing.T) {
	const h, r0 = 1e-3, 0.1
	var sphere float64
	for _, k := range []float64{0, -1} {
		sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Reflect, Radius: -100 * mm, Conic: k, Thickness: -50 * mm})
		if err != nil {
			t.Fatal(err)
		}
		sd, err := sys.Seidel(lambda, trace.Source{PupilRadius: h * units.Meter, Field: 1 * units.Degree})
		if err != nil {
			t.Fatal(err)
		}
		if k == 0 {
			sphere = sd.Sum.SI
			if want := 2 * math.Pow(h, 4) / math.Pow(r0, 3); !scalar.EqualWithinRel(sd.Sum.SI, want, 1e-12) {
				t.Errorf("sphere mirror S_I = %g m, want 2h⁴/R³ = %g", sd.Sum.SI, want)
			}
			la, err := sys.SphericalAberration(lambda, h*units.Meter, 2)
			if err != nil {
				t.Fatal(err)
			}
			// Light travels −z after the mirror: the rim crosses at larger z.
			if got, exact := float64(sd.LongitudinalSpherical()), la.Shift[1]; !scalar.EqualWithinRel(got, exact, 1e-4) {
				t.Errorf("sphere mirror third-order LSA %g m, exact %g", got, exact)
			}
			continue
		}
		if math.Abs(sd.Sum.SI) > 1e-14*sphere {
			t.Errorf("paraboloid S_I = %g m, want 0", sd.Sum.SI)
		}
	}
}

// TestSeidelAplanatic checks reference-checks R34's aplanatic points: a
// sphere R = 10 mm of n = 1.5 with the object at the aplanatic point R/n
// from the centre images it without spherical aberration or coma to all
// orders (Born & Wolf §4.2.3 [from memory]), so S_I = S_II = 0, to
// rounding: 1e-12 of the S_I of the same surface with the object at
// R/n + 1 mm.
func TestSeidelAplanatic(t *testing.T) {
	const R = 10e-3
	sys, err := trace.New(trace.Index(1.5), trace.Surface{Kind: trace.Refract, Radius: -R * units.Meter, Medium: trace.Index(1), Thickness: 20 * mm})
	if err != nil {
		t.Fatal(err)
	}
	scale := 0.0
	for _, d := range []float64{R + R/1.5 + 1e-3, R + R/1.5} {
		src := trace.Source{ObjectDistance: units.Length(d), ObjectHeight: 0.1 * mm, PupilZ: -5 * mm, PupilRadius: 1 * mm}
		sd, err := sys.Seidel(lambda, src)
		if err != nil {
			t.Fatal(err)
		}
		if scale == 0 {
			scale = math.Abs(sd.Sum.SI)
			continue
		}
		if math.Abs(sd.Sum.SI) > 1e-12*scale || math.Abs(sd.Sum.SII) > 1e-12*scale {
			t.Errorf("aplanatic S_I = %g, S_II = %g, want 0 (scale %g)", sd.Sum.SI, sd.Sum.SII, scale)
		}
	}
}

// TestSeidelPetzval checks S_IV = −H² Σ c Δ(1/n) against the closed form
// for the plano-convex lens, curved side first, field 2°, pupil 5 mm at
// the first vertex: H = ū·a (the Lagrange invariant at the pupil, ū =
// tan 2°) and Σ c Δ(1/n) = (1/n − 1)/R₁ (the flat surface adds nothing);
// that is −H²·(−φ/n) with φ = (n−1)/R₁ the lens's power, the Petzval sum of
// a thin lens (Welford 1986, §7.4 [from memory]). Tolerance 1e-12.
func TestSeidelPetzval(t *testing.T) {
	const n, r1 = 1.5168, 51.68e-3
	sys := planoConvex(t, true)
	src := trace.Source{Field: 2 * units.Degree, PupilRadius: 5 * mm}
	sd, err := sys.Seidel(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	H := math.Tan(2*math.Pi/180) * 5e-3
	want := -H * H * (1/n - 1) / r1
	if !scalar.EqualWithinRel(sd.Sum.SIV, want, 1e-12) || !scalar.EqualWithinRel(sd.Lagrange, H, 1e-12) {
		t.Errorf("S_IV = %g, want %g; H = %g, want %g", sd.Sum.SIV, want, sd.Lagrange, H)
	}
	if !scalar.EqualWithinRel(sd.Petzval, (1/n-1)/r1, 1e-12) {
		t.Errorf("Petzval sum %g /m, want %g", sd.Petzval, (1/n-1)/r1)
	}
}

// TestSeidelIdealLens checks that an ideal lens adds no aberration (it
// images every conjugate perfectly): all sums zero.
func TestSeidelIdealLens(t *testing.T) {
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Ideal, Focal: 50 * mm, Thickness: 60 * mm})
	if err != nil {
		t.Fatal(err)
	}
	sd, err := sys.Seidel(lambda, trace.Source{ObjectDistance: 300 * mm, ObjectHeight: 5 * mm, PupilRadius: 4 * mm, PupilZ: -10 * mm})
	if err != nil {
		t.Fatal(err)
	}
	if sd.Sum != (trace.SeidelTerms{}) {
		t.Errorf("ideal lens sums %+v, want zero", sd.Sum)
	}
}

// TestSeidelStopShift checks the sums, the conic terms included, against
// the stop-shift equations: moving the entrance pupil changes the chief
// ray to h̄* = h̄ + E h on every surface, and
//
//	S_I* = S_I,  S_II* = S_II + E S_I,  S_III* = S_III + 2E S_II + E² S_I,
//	S_IV* = S_IV,  S_V* = S_V + E(3 S_III + S_IV) + 3E² S_II + E³ S_I
//
// (Welford 1986, §8.5 [from memory]; they follow from the sums' forms).
// For an object at infinity both chief rays have the slope ū = tan θ, and
// at vertex 0 the marginal ray has h = a, so E = ū (z₁ − z₂)/a for pupils
// at z₁ and z₂. A paraboloid mirror and a lens with a hyperboloidal
// surface; tolerance 1e-9 of the largest sum (rounding).
func TestSeidelStopShift(t *testing.T) {
	par, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Reflect, Radius: -200 * mm, Conic: -1, Thickness: -100 * mm})
	if err != nil {
		t.Fatal(err)
	}
	asph, err := trace.New(trace.Index(1),
		trace.Surface{Kind: trace.Refract, Radius: 30 * mm, Conic: -2.2, Medium: trace.Index(1.6), Thickness: 5 * mm},
		trace.Surface{Kind: trace.Refract, Radius: -80 * mm, Conic: 0.7, Medium: trace.Index(1), Thickness: 40 * mm})
	if err != nil {
		t.Fatal(err)
	}
	for name, sys := range map[string]trace.System{"paraboloid": par, "aspheric lens": asph} {
		const a, theta = 4e-3, 0.03
		z1, z2 := 0.0, -30e-3
		s1, err := sys.Seidel(lambda, trace.Source{Field: theta, PupilRadius: a * units.Meter, PupilZ: units.Length(z1)})
		if err != nil {
			t.Fatal(err)
		}
		s2, err := sys.Seidel(lambda, trace.Source{Field: theta, PupilRadius: a * units.Meter, PupilZ: units.Length(z2)})
		if err != nil {
			t.Fatal(err)
		}
		E := math.Tan(theta) * (z1 - z2) / a
		o, n := s1.Sum, s2.Sum
		scale := math.Max(math.Max(math.Abs(o.SI), math.Abs(o.SII)), math.Max(math.Abs(o.SIII), math.Abs(n.SV)))
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"S_I", n.SI, o.SI},
			{"S_II", n.SII, o.SII + E*o.SI},
			{"S_III", n.SIII, o.SIII + 2*E*o.SII + E*E*o.SI},
			{"S_IV", n.SIV, o.SIV},
			{"S_V", n.SV, o.SV + E*(3*o.SIII+o.SIV) + 3*E*E*o.SII + E*E*E*o.SI},
		} {
			if !scalar.EqualWithinAbs(c.got, c.want, 1e-9*scale) {
				t.Errorf("%s: %s after the stop shift %g, stop-shift equation %g", name, c.what, c.got, c.want)
			}
		}
	}
}
