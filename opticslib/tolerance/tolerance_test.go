package tolerance_test

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/tolerance"
	"github.com/beamnote/beamnote/opticslib/units"
)

const (
	mm   = units.Millimeter
	um   = units.Micrometer
	nm   = units.Nanometer
	mrad = units.Milliradian
)

// relay is an invented 1064 nm bench path of five thin lenses (eleven
// elements): a 2× Galilean expander (L1, L2), a 4f relay (L3, L4) and a
// focusing lens L5 after the labelled space "gap", with the laser's
// 0.5 mm waist at the input plane.
func relay(t testing.TB) (paraxial.System, beam.Gaussian) {
	t.Helper()
	sys, err := paraxial.NewBuilder().Space(40 * mm).ThinLens(-50 * mm).Label("L1").
		Space(50 * mm).ThinLens(100 * mm).Label("L2").
		Space(100 * mm).ThinLens(100 * mm).Label("L3").
		Space(200 * mm).ThinLens(100 * mm).Label("L4").
		Space(150 * mm).Label("gap").ThinLens(200 * mm).Label("L5").Space(200 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	return sys, in
}

// relayStudy tolerances the relay's focus (waist radius within 5 % and
// position within 2 mm of nominal) against placements σ of every lens and
// uniform focal errors ±rel, with fast measures.
func relayStudy(t testing.TB, sigma units.Length, rel float64) tolerance.Study {
	t.Helper()
	sys, in := relay(t)
	var ps []tolerance.Perturbation
	for _, l := range []string{"L1", "L2", "L3", "L4", "L5"} {
		ps = append(ps, tolerance.Placement(l, tolerance.Normal(sigma)), tolerance.FocalError(l, tolerance.Uniform(rel)))
	}
	ws, err := beam.Waists(sys, in)
	if err != nil {
		t.Fatal(err)
	}
	w := ws.Last()
	return tolerance.Study{System: sys, Perturbations: ps, Beam: in,
		Goals: []design.Goal{
			design.Near("focus waist", design.WaistRadius(in), w.Radius, 0.05*w.Radius),
			design.Near("focus z", design.WaistZ(in), w.Z, 2*mm),
		},
		Fast: map[string]tolerance.Fast{"focus waist": tolerance.WaistRadius(), "focus z": tolerance.WaistZ()},
	}
}

func run(t testing.TB, s tolerance.Study, o tolerance.Options) tolerance.Result {
	t.Helper()
	r, err := s.MonteCarlo(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestTiltedLensMirrorLimit: a mirror is refraction into n' = −n, so the
// tilted-lens formulas with n = −1 must give the tilted mirror's
// f_t = f cos θ and f_s = f/cos θ (Kogelnik, Ippen, Dienes & Shank,
// IEEE J. Quantum Electron. QE-8, 373 (1972) [from memory]), here read
// from the matrices of paraxial.Mirror (C = −1/f).
func TestTiltedLensMirrorLimit(t *testing.T) {
	const f = 100 * mm
	for _, deg := range []float64{0, 3, 10, 30, 60} {
		th := units.Angle(deg) * units.Degree
		ft, fs := tolerance.TiltedLens(f, th, -1)
		mx, my := paraxial.Mirror(-2*f, th)
		// Identities of a few rounding units (a cosine and two divisions).
		if !scalar.EqualWithinRel(float64(ft), -1/mx.C, 1e-14) || !scalar.EqualWithinRel(float64(fs), -1/my.C, 1e-14) {
			t.Errorf("TiltedLens(100 mm, %g°, n = −1) = (%v, %v), want the mirror's (%v, %v)", deg, ft, fs, units.Length(-1/mx.C), units.Length(-1/my.C))
		}
	}
}

// TestTiltedLensMartin: for a glass lens the tilted foci follow Martin's
// spectacle-lens formulas F_s = F(1 + sin²θ/(2n)), F_t = F_s/cos²θ (L. C.
// Martin, Technical Optics, 1948 [from memory]; W. F. Harris, Optom. Vis.
// Sci. 2002 [from memory]) to fourth order: expanding Coddington's k =
// (n cos θ' − cos θ)/(n − 1) gives 1 + s²/(2n) + s⁴(n² + n + 1)/(8n³) + …
// (s = sin θ; our expansion), so the difference from Martin's k must be
// that s⁴ term within O(s⁶).
func TestTiltedLensMartin(t *testing.T) {
	const f = -80 * mm // a diverging lens: the same relative change
	for _, n := range []float64{1.45, 1.5, 1.8} {
		for _, th := range []units.Angle{0.001, 0.01, 0.05, 0.1} {
			ft, fs := tolerance.TiltedLens(f, th, n)
			s, c := math.Sin(float64(th)), math.Cos(float64(th))
			martin := 1 + s*s/(2*n)
			k := float64(f / fs)
			s4 := s * s * s * s
			if d := k - martin - s4*(n*n+n+1)/(8*n*n*n); math.Abs(d) > s4*s*s+1e-15 {
				t.Errorf("n = %g, θ = %v: k − Martin − s⁴ term = %g, want O(s⁶) = %g", n, th, d, s4*s*s)
			}
			if !scalar.EqualWithinRel(float64(ft), float64(fs)*c*c, 1e-15) {
				t.Errorf("n = %g, θ = %v: f_t = %v, want f_s cos²θ = %v", n, th, ft, fs*units.Length(c*c))
			}
		}
	}
	if ft, fs := tolerance.TiltedLens(f, 0, 1.5); ft != f || fs != f {
		t.Errorf("TiltedLens at θ = 0 = (%v, %v), want f = %v in both planes", ft, fs, f)
	}
}

// singleLens images an object at z = 0 through a thin lens of f = 100 mm
// at s = 300 mm: s' = sf/(s − f) = 150 mm, the image at z = 450 mm.
func singleLens(t *testing.T, ps ...tolerance.Perturbation) tolerance.Study {
	t.Helper()
	sys, err := paraxial.NewBuilder().Space(300 * mm).ThinLens(100 * mm).Label("L").Space(100 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	return tolerance.Study{System: sys, Perturbations: ps,
		Goals: []design.Goal{design.Near("image z", design.ImageZ(0), 450*mm, 1*mm)}}
}

// TestSensitivityImageDistance: Gaussian lens equation 1/s + 1/s' = 1/f
// at a fixed object distance s: ds'/df = (s'/f)² and d²s'/df² =
// 2s²/(s − f)³ (analytic), so for a relative error ε (df = f dε) the
// image moves by f(s'/f)² = s'²/f = 0.225 m per unit of ε with
// curvature 2f²s²/(s − f)³ = 0.225 m. A placement dz of the lens moves
// the image by 1 − (s'/s)² = 0.75 per unit (the image follows the lens,
// minus the longitudinal magnification m² = (s'/s)²; analytic).
func TestSensitivityImageDistance(t *testing.T) {
	st := singleLens(t, tolerance.FocalError("L", tolerance.Normal(0.01)), tolerance.Placement("L", tolerance.Normal(0.2*mm)))
	sens, err := st.Sensitivity()
	if err != nil {
		t.Fatal(err)
	}
	s, f, sp := 0.3, 0.1, 0.15
	// Tolerances: central differences with h = σ/10 have truncation
	// g'''h²/6 = 0.34·(1e-3)²/6 = 6e-8 m on 0.225 m for the focal slope
	// (3e-7 relative) and g''''h²/12 ≈ 6e-8 m for its curvature; the
	// placement's h = 20 µm on lengths of 100 mm gives ~1e-7 relative.
	for _, c := range []struct {
		name      string
		got, want float64
		rel       float64
	}{
		{"∂z'/∂ε", sens.Slope[0][0], sp * sp / f, 1e-6},
		{"∂²z'/∂ε²", sens.Curvature[0][0], 2 * f * f * s * s / ((s - f) * (s - f) * (s - f)), 1e-6},
		{"∂z'/∂z_L", sens.Slope[0][1], 1 - (sp/s)*(sp/s), 1e-6},
		{"nominal", sens.Nominal[0], s + sp, 1e-12},
		{"linear σ", sens.Spread[0], math.Hypot(sp*sp/f*0.01, 0.75*0.2e-3), 1e-6},
	} {
		if !scalar.EqualWithinRel(c.got, c.want, c.rel) {
			t.Errorf("%s = %.12g, want %.12g (rel. tol. %g)", c.name, c.got, c.want, c.rel)
		}
	}
	if !scalar.EqualWithinRel(sens.Steps[0], 0.001, 1e-15) || !scalar.EqualWithinRel(sens.Steps[1], float64(20*um), 1e-15) {
		t.Errorf("steps = %v, want σ/10 = [0.001 2e-05]", sens.Steps)
	}
	tab := sens.Table()
	if got := tab.Cell(0, 2); got != "2.25 mm/%" {
		t.Errorf("table cell ∂z'/∂ε = %q, want \"2.25 mm/%%\" (0.225 m per unit = 2.25 mm per per cent)", got)
	}
	if got := tab.Cell(0, 3); got != "0.75 mm/mm" {
		t.Errorf("table cell ∂z'/∂z_L = %q, want \"0.75 mm/mm\"", got)
	}
}

// TestMonteCarloAgainstLinear: for small tolerances every goal is linear
// in the errors, so its Monte Carlo standard deviation must equal the
// linear (root-sum-square) estimate within the sampling error of a
// standard deviation, σ/√(2(N − 1)) for normal values (the sampling
// variance of s² is 2σ⁴/(N − 1); normal errors through a linear map stay
// normal). Four standard errors: a false alarm once in 16 000 runs. The
// mean must lie within 4σ/√N of nominal plus the second-order shift.
func TestMonteCarloAgainstLinear(t *testing.T) {
	st := relayStudy(t, 5*um, 0.0005)
	for i := range st.Perturbations {
		st.Perturbations[i].Dist.Shape = tolerance.ShapeNormal
	}
	sens, err := st.Sensitivity()
	if err != nil {
		t.Fatal(err)
	}
	r := run(t, st, tolerance.Options{Trials: 40000, Seed: 7})
	for i, g := range r.Goals {
		if d := math.Abs(g.Std - sens.Spread[i]); d > 4*g.StdErr {
			t.Errorf("%s: Monte Carlo σ = %.6g, linear estimate %.6g: differ by %.2g, more than 4 standard errors (%.2g)", g.Name, g.Std, sens.Spread[i], d, 4*g.StdErr)
		}
		if d := math.Abs(g.Mean - sens.Nominal[i] - sens.Shift[i]); d > 4*g.Std/math.Sqrt(float64(g.N)) {
			t.Errorf("%s: mean %.9g differs from nominal + shift %.9g by %.2g, more than 4σ/√N", g.Name, g.Mean, sens.Nominal[i]+sens.Shift[i], d)
		}
	}
	if r.Failed != 0 || r.Yield.Met != r.Trials {
		t.Errorf("small tolerances: %d failed, yield %v; want every build good", r.Failed, r.Yield)
	}
}

// TestYieldAnalytic: a normal spacing error σ on the last space moves
// the total length by exactly the error, so the share within ±1.5σ is
// erf(1.5/√2) = 0.866386 and, for a uniform error ±t, the share within
// ±0.6t is 0.6 (analytic). The Monte Carlo yield must agree within four
// of its binomial standard errors.
func TestYieldAnalytic(t *testing.T) {
	sys, in := relay(t)
	for _, c := range []struct {
		d    tolerance.Distribution
		tol  units.Length
		want float64
	}{
		{tolerance.Normal(0.2 * mm), 0.3 * mm, math.Erf(1.5 / math.Sqrt2)},
		{tolerance.Uniform(0.5 * mm), 0.3 * mm, 0.6},
	} {
		st := tolerance.Study{System: sys, Beam: in,
			Perturbations: []tolerance.Perturbation{tolerance.Spacing("gap", c.d)},
			Goals:         []design.Goal{design.Near("length", design.TotalLength(), sys.Length(), c.tol)},
			Fast:          map[string]tolerance.Fast{"length": tolerance.TotalLength()},
		}
		r := run(t, st, tolerance.Options{Trials: 20000, Seed: 3})
		y := r.Yield
		if math.Abs(y.Fraction-c.want) > 4*y.StdErr || y.StdErr != math.Sqrt(y.Fraction*(1-y.Fraction)/20000) {
			t.Errorf("%s error: yield %v, want %.6f within 4 standard errors", c.d.Shape, y, c.want)
		}
		if g := r.Goals[0]; !scalar.EqualWithinRel(g.Std, c.d.Sigma(), 0.03) {
			// 3 %: beyond 4 standard errors of s (0.5 % for N = 20000,
			// normal; 0.4 % for the uniform, whose kurtosis is lower).
			t.Errorf("%s error: σ of the length = %v, want the error's σ %v", c.d.Shape, units.Length(g.Std), units.Length(c.d.Sigma()))
		}
	}
}

// sameBits reports whether two value tables are identical bit for bit.
func sameBits(a, b [][]float64) bool {
	if len(a) != len(b) {
		return false
	}
	for g := range a {
		if len(a[g]) != len(b[g]) {
			return false
		}
		for i := range a[g] {
			if math.Float64bits(a[g][i]) != math.Float64bits(b[g][i]) {
				return false
			}
		}
	}
	return true
}

// TestSeedsReproduce: the same seed gives bit-identical builds and
// statistics for 1, 2 and 8 workers (each build's errors come from its
// own stream, the reduction runs in build order); another seed other
// builds; a shorter run is the start of a longer one.
func TestSeedsReproduce(t *testing.T) {
	st := relayStudy(t, 0.1*mm, 0.01)
	st.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 140*mm, 160*mm), Goal: "focus z"}
	ref := run(t, st, tolerance.Options{Trials: 3000, Seed: 42, Workers: 1})
	for _, w := range []int{2, 8} {
		r := run(t, st, tolerance.Options{Trials: 3000, Seed: 42, Workers: w})
		if !sameBits(r.Values, ref.Values) || !sameBits([][]float64{r.Compensator.Values}, [][]float64{ref.Compensator.Values}) || r.String() != ref.String() {
			t.Errorf("%d workers: results differ from 1 worker", w)
		}
	}
	other := run(t, st, tolerance.Options{Trials: 3000, Seed: 43, Workers: 2})
	if other.Values[0][0] == ref.Values[0][0] || other.Goals[0].Mean == ref.Goals[0].Mean {
		t.Errorf("seeds 42 and 43 give the same builds")
	}
	short := run(t, st, tolerance.Options{Trials: 700, Seed: 42, Workers: 2})
	cut := [][]float64{ref.Values[0][:700], ref.Values[1][:700]}
	if !sameBits(short.Values, cut) {
		t.Errorf("700 builds are not the first 700 of 3000 with the same seed")
	}
}

// routesStudy is an invented 780 nm path with every kind of
// perturbation: two lenses and a concave mirror at 5° (focal errors,
// tilts, placements, a spacing), six goals with fast forms, and L2's
// shift as compensator for the waist position.
func routesStudy(t testing.TB) tolerance.Study {
	sys, err := paraxial.NewBuilder().Space(100*mm).ThinLens(100*mm).Label("L1").
		Space(150*mm).Label("gap").ConcaveMirror(400*mm, 5*units.Degree).Label("M").
		Space(120 * mm).ThinLens(50 * mm).Label("L2").Space(80 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.6 * mm, Wavelength: 780 * nm, WaistZ: 20 * mm})
	if err != nil {
		t.Fatal(err)
	}
	mode, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 40 * um, Wavelength: 780 * nm, WaistZ: -10 * mm})
	if err != nil {
		t.Fatal(err)
	}
	ws, _ := beam.Waists(sys, in)
	w := ws.Last()
	st := tolerance.Study{System: sys, Beam: in,
		Perturbations: []tolerance.Perturbation{
			tolerance.Placement("L1", tolerance.Normal(0.2*mm)),
			tolerance.Spacing("gap", tolerance.Uniform(0.3*mm)),
			tolerance.FocalError("M", tolerance.Normal(0.01)),
			tolerance.Tilt("M", tolerance.Normal(5*mrad)),
			tolerance.Tilt("L2", tolerance.Uniform(20*mrad)).WithIndex(1.8),
			tolerance.FocalError("L2", tolerance.Normal(0.005)),
			tolerance.Placement("L2", tolerance.Normal(0.1*mm)),
		},
		Goals: []design.Goal{
			design.Near("waist", design.WaistRadius(in), w.Radius, 0.015*w.Radius),
			design.Near("waist z", design.WaistZ(in), w.Z, 0.5*mm),
			design.AtMost("divergence", design.Divergence(in), 20*mrad),
			design.AtLeast("coupling", design.Coupling(in, mode), 0.61),
			design.AtMost("length", design.TotalLength(), 450.2*mm),
			design.AtMost("radius at end", design.RadiusAt(in, ""), 1*mm),
		},
		Fast: map[string]tolerance.Fast{"waist": tolerance.WaistRadius(), "waist z": tolerance.WaistZ(), "divergence": tolerance.Divergence(),
			"coupling": tolerance.Coupling(mode), "length": tolerance.TotalLength(), "radius at end": tolerance.RadiusAtEnd()},
		Compensator: &tolerance.Compensator{Variable: design.Shift("L2", -3*mm, 3*mm), Goal: "waist z"},
	}
	return st
}

// TestRoutesAgree: the fast route and the generic route (systems rebuilt
// by paraxial's edits, goals by design's measures) give the same value in
// every build to 1e-9, for every kind of perturbation (placements, a
// spacing, focal errors and tilts of a lens and of a curved mirror at
// incidence) and with a compensator; they compose the same matrices in
// another order, so they agree to rounding, ~1e-14 relative.
func TestRoutesAgree(t *testing.T) {
	st := routesStudy(t)
	o := tolerance.Options{Trials: 300, Seed: 5}
	fast := run(t, st, o)
	o.Generic = true
	gen := run(t, st, o)
	if !fast.Fast || gen.Fast {
		t.Fatalf("routes: fast run Fast = %v, generic run Fast = %v", fast.Fast, gen.Fast)
	}
	for g := range fast.Values {
		for i := range fast.Values[g] {
			a, b := fast.Values[g][i], gen.Values[g][i]
			if math.IsNaN(a) != math.IsNaN(b) || math.Abs(a-b) > 1e-9*math.Abs(b)+1e-18 {
				t.Fatalf("goal %s, build %d: fast %.15g, generic %.15g", st.Goals[g].Name, i, a, b)
			}
		}
	}
	for i, a := range fast.Compensator.Values {
		if b := gen.Compensator.Values[i]; math.Abs(a-b) > 1e-9*float64(mm) {
			t.Fatalf("build %d: compensator fast %.15g, generic %.15g", i, a, b)
		}
	}
	if fast.Failed != gen.Failed || fast.Compensator.AtLimit != gen.Compensator.AtLimit || fast.Yield.Met != gen.Yield.Met {
		t.Errorf("fast: %d failed, %d at a limit, %d met; generic %d, %d, %d", fast.Failed, fast.Compensator.AtLimit, fast.Yield.Met, gen.Failed, gen.Compensator.AtLimit, gen.Yield.Met)
	}
}

// TestCompensator: with the gap re-set in every build the focus is put
// back where it belongs (the root tolerance is 1e-12 of the bounds,
// 0.16 pm here), its linear slope against every error vanishes, and a
// compensator with too little travel is left at its bounds and says so.
func TestCompensator(t *testing.T) {
	st := relayStudy(t, 0.1*mm, 0.01)
	st.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 100*mm, 200*mm), Goal: "focus z"}
	r := run(t, st, tolerance.Options{Trials: 2000, Seed: 1})
	c := r.Compensator
	if c.AtLimit != 0 || r.Goals[1].Yield.Met != r.Trials {
		t.Errorf("wide compensator: %d builds at a limit, focus z met in %v; want none and all", c.AtLimit, r.Goals[1].Yield)
	}
	if z := r.Goals[1]; z.Std > 1e-9 || math.Abs(z.Mean-z.Nominal) > 1e-9 {
		t.Errorf("compensated focus z: mean %v, σ %v; want the nominal %v within 1 nm", units.Length(z.Mean), units.Length(z.Std), units.Length(z.Nominal))
	}
	if !(c.Std > 1e-4) || c.Nominal != float64(150*mm) {
		t.Errorf("compensator spread %v around %v: the gap must move (focus z moves by 4.4 mm, 1:1 with the gap)", units.Length(c.Std), units.Length(c.Nominal))
	}
	sens, err := st.Sensitivity()
	if err != nil {
		t.Fatal(err)
	}
	for j, p := range sens.Parameters {
		// Root error 1e-13 m over 2h = 2e-5 m (placement) or 2e-3
		// (focal): below 1e-8 m/m; 1e-6 leaves room.
		if math.Abs(sens.Slope[1][j]) > 1e-6 {
			t.Errorf("compensated slope of focus z against %s = %g, want 0", p, sens.Slope[1][j])
		}
	}
	st.Compensator.Variable = design.Spacing("gap", 149*mm, 151*mm)
	r = run(t, st, tolerance.Options{Trials: 2000, Seed: 1})
	c = r.Compensator
	if c.AtLimit == 0 || c.Min != float64(149*mm) || c.Max != float64(151*mm) {
		t.Errorf("±1 mm of travel for a 4.4 mm spread: %d at a limit, range %v … %v; want some, at the bounds", c.AtLimit, units.Length(c.Min), units.Length(c.Max))
	}
	if !strings.Contains(r.Table().Caption, "builds at a limit") {
		t.Errorf("caption %q does not report the compensator", r.Table().Caption)
	}
}

// TestLensTiltIsEven: a lens at normal incidence tilted either way gives
// the same astigmatism, so the slope is exactly zero and the whole effect
// is the second-order shift of the mean, ½ g” σ², which the Monte Carlo
// mean must show (g = g0 + ½g”θ² + O(θ⁴): the mean of ½g”θ² is ½g”σ²,
// its σ is ½|g”|σ²√2 for a normal θ).
func TestLensTiltIsEven(t *testing.T) {
	sys, in := relay(t)
	ws, _ := beam.Waists(sys, in)
	st := tolerance.Study{System: sys, Beam: in,
		Perturbations: []tolerance.Perturbation{tolerance.Tilt("L5", tolerance.Normal(50*mrad))},
		Goals:         []design.Goal{design.Near("focus z", design.WaistZ(in), ws.Last().Z, 1*mm)},
		Fast:          map[string]tolerance.Fast{"focus z": tolerance.WaistZ()},
	}
	sens, err := st.Sensitivity()
	if err != nil {
		t.Fatal(err)
	}
	if sens.Slope[0][0] != 0 || !(sens.Curvature[0][0] < 0) {
		t.Fatalf("tilt of L5: slope %g, curvature %g; want 0 and negative (the tangential focus shortens)", sens.Slope[0][0], sens.Curvature[0][0])
	}
	r := run(t, st, tolerance.Options{Trials: 20000, Seed: 11})
	g := r.Goals[0]
	// 4 standard errors of the mean, plus the θ⁴ term: at σ = 50 mrad
	// its mean is 3σ⁴ g''''/24, a few per cent of the shift, allowed as
	// 5 % of it.
	if d := math.Abs(g.Mean - g.Nominal - sens.Shift[0]); d > 4*g.Std/math.Sqrt(float64(g.N))+0.05*math.Abs(sens.Shift[0]) {
		t.Errorf("tilt only: mean shift %v, second-order estimate %v", units.Length(g.Mean-g.Nominal), units.Length(sens.Shift[0]))
	}
	if !(g.Max <= g.Nominal) {
		t.Errorf("a tilt shortens the tangential focus: max %v above nominal %v", units.Length(g.Max), units.Length(g.Nominal))
	}
}

// TestProgressAndCancel: progress comes at the start and at the end,
// never decreasing; a run cancelled once builds are under way returns
// the builds finished (the first ones, as a shorter run has them) and an
// error wrapping context.Canceled; a cancelled context runs nothing.
func TestProgressAndCancel(t *testing.T) {
	st := relayStudy(t, 0.1*mm, 0.01)
	var calls [][2]int
	run(t, st, tolerance.Options{Trials: 5000, Seed: 2, Progress: func(d, n int) { calls = append(calls, [2]int{d, n}) }})
	if len(calls) < 2 || calls[0] != [2]int{0, 5000} || calls[len(calls)-1] != [2]int{5000, 5000} {
		t.Errorf("progress calls %v: want (0, 5000) first and (5000, 5000) last", calls)
	}
	for i := 1; i < len(calls); i++ {
		if calls[i][0] < calls[i-1][0] {
			t.Errorf("progress went back: %v", calls)
		}
	}
	// Cancel once builds are under way (the generic route, ~40 µs a
	// build, runs for seconds): the result holds the first builds.
	ref := run(t, st, tolerance.Options{Trials: 2000, Seed: 2, Generic: true})
	ctx, cancel := context.WithCancel(context.Background())
	o := tolerance.Options{Trials: 200000, Seed: 2, Generic: true, Progress: func(d, n int) {
		if d > 0 {
			cancel()
		}
	}}
	part, err := st.MonteCarlo(ctx, o)
	if !errors.Is(err, context.Canceled) || part.Trials == 0 || part.Trials >= 200000 || part.Requested != 200000 || part.Trials%256 != 0 {
		t.Fatalf("cancelled run: %d of %d builds, error %v; want some whole blocks of 256 and context.Canceled", part.Trials, part.Requested, err)
	}
	k := min(part.Trials, 2000)
	if !sameBits([][]float64{part.Values[0][:k], part.Values[1][:k]}, [][]float64{ref.Values[0][:k], ref.Values[1][:k]}) {
		t.Errorf("the %d builds of a cancelled run are not the first builds of the seed", part.Trials)
	}
	none, err := st.MonteCarlo(ctx, tolerance.Options{Trials: 100, Seed: 2})
	if !errors.Is(err, context.Canceled) || none.Trials != 0 {
		t.Errorf("run on a cancelled context: %d builds, %v", none.Trials, err)
	}
}

// TestHistogram: counts add up to the measured builds, the edges span
// the values, and the default bin count follows the Rice rule.
func TestHistogram(t *testing.T) {
	r := run(t, relayStudy(t, 0.1*mm, 0.01), tolerance.Options{Trials: 1000, Seed: 9})
	for _, bins := range []int{0, 7} {
		h, err := r.Histogram("focus z", bins)
		if err != nil {
			t.Fatal(err)
		}
		want := bins
		if bins == 0 {
			want = 20 // ⌈2·1000^(1/3)⌉
		}
		total := 0
		for _, c := range h.Counts {
			total += c
		}
		g := r.Goals[1]
		if len(h.Counts) != want || len(h.Edges) != want+1 || total != g.N || h.Edges[0] != g.Min || !(h.Edges[want] > g.Max) {
			t.Errorf("Histogram(bins %d): %d bins, %d edges, %d counted of %d, edges %g … %g for values %g … %g", bins, len(h.Counts), len(h.Edges), total, g.N, h.Edges[0], h.Edges[want], g.Min, g.Max)
		}
		if h.Wanted != "740.504 ± 2 mm" || h.Lo != g.Lo || h.Hi != g.Hi {
			t.Errorf("histogram wanted %q [%g, %g]", h.Wanted, h.Lo, h.Hi)
		}
	}
	if _, err := r.Histogram("nope", 0); err == nil || !strings.Contains(err.Error(), `"focus waist", "focus z"`) {
		t.Errorf("unknown goal: %v, want the goals listed", err)
	}
	if _, err := r.Histogram("focus z", -1); !errors.Is(err, tolerance.ErrOptions) {
		t.Errorf("bins −1: %v", err)
	}
}

// TestFailedBuilds: a placement error larger than the gap behind the
// part pushes it through its neighbour; such builds fail, meet nothing,
// and the first is reported.
func TestFailedBuilds(t *testing.T) {
	sys, err := paraxial.NewBuilder().Space(50 * mm).ThinLens(50 * mm).Label("L1").Space(1 * mm).ThinLens(80 * mm).Label("L2").Space(100 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.3 * mm, Wavelength: 633 * nm})
	st := tolerance.Study{System: sys, Beam: in,
		Perturbations: []tolerance.Perturbation{tolerance.Placement("L1", tolerance.Normal(1*mm))},
		Goals:         []design.Goal{design.AtLeast("waist", design.WaistRadius(in), 0)},
		Fast:          map[string]tolerance.Fast{"waist": tolerance.WaistRadius()},
	}
	for _, generic := range []bool{false, true} {
		r := run(t, st, tolerance.Options{Trials: 2000, Seed: 1, Generic: generic})
		// P(error > 1 mm) = P(z > 1) = 0.1587 for σ = 1 mm.
		if p := float64(r.Failed) / 2000; math.Abs(p-0.1587) > 4*math.Sqrt(0.1587*0.8413/2000) || r.Yield.Met != 2000-r.Failed {
			t.Errorf("generic %v: %d failed of 2000 (want ≈ 317), %d met", generic, r.Failed, r.Yield.Met)
		}
		if !strings.Contains(r.FirstFailure, `placement "L1"`) || !strings.Contains(r.FirstFailure, "negative gap") {
			t.Errorf("generic %v: first failure %q", generic, r.FirstFailure)
		}
		if g := r.Goals[0]; g.N != 2000-r.Failed {
			t.Errorf("generic %v: %d values for %d good builds", generic, g.N, 2000-r.Failed)
		}
	}
}

// TestErrors: bad studies and options are refused with a message naming
// the perturbation, goal, compensator or option.
func TestErrors(t *testing.T) {
	sys, in := relay(t)
	good := relayStudy(t, 0.1*mm, 0.01)
	flat, err := paraxial.NewBuilder().Space(50 * mm).FlatMirror(45 * units.Degree).Label("fold").Space(50 * mm).ThinLens(100 * mm).Label("L").Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	with := func(f func(s *tolerance.Study)) tolerance.Study {
		s := good
		s.Perturbations = append([]tolerance.Perturbation(nil), good.Perturbations...)
		s.Fast = map[string]tolerance.Fast{}
		for k, v := range good.Fast {
			s.Fast[k] = v
		}
		f(&s)
		return s
	}
	wrongBeam, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 1064 * nm})
	for _, c := range []struct {
		name string
		s    tolerance.Study
		want error
		text string
	}{
		{"unknown label", with(func(s *tolerance.Study) { s.Perturbations[0].Label = "L9" }), tolerance.ErrPerturbation, `placement "L9"`},
		{"length unit for a tilt", with(func(s *tolerance.Study) { s.Perturbations[0] = tolerance.Tilt("L1", tolerance.Normal(1*mm)) }), tolerance.ErrDistribution, "is in metres (a length); a tilt error is in radians"},
		{"zero width", with(func(s *tolerance.Study) { s.Perturbations[0] = tolerance.Placement("L1", tolerance.Normal(0*mm)) }), tolerance.ErrDistribution, "tolerance = 0 m: the width must be positive"},
		{"wide focal error", with(func(s *tolerance.Study) { s.Perturbations[1] = tolerance.FocalError("L1", tolerance.Normal(0.5)) }), tolerance.ErrDistribution, "another lens"},
		{"spacing of a lens", with(func(s *tolerance.Study) { s.Perturbations[0] = tolerance.Spacing("L1", tolerance.Normal(1*mm)) }), tolerance.ErrPerturbation, "is not a single space"},
		{"focal of a space", with(func(s *tolerance.Study) { s.Perturbations[0] = tolerance.FocalError("gap", tolerance.Normal(0.01)) }), tolerance.ErrPerturbation, "is a space or several elements"},
		{"twice", with(func(s *tolerance.Study) { s.Perturbations[2] = s.Perturbations[0] }), tolerance.ErrPerturbation, `placement "L1": is given twice`},
		{"glass index", with(func(s *tolerance.Study) {
			s.Perturbations[0] = tolerance.Tilt("L1", tolerance.Normal(mrad)).WithIndex(0.9)
		}), tolerance.ErrPerturbation, "glass index = 0.9"},
		{"flat mirror tilt", tolerance.Study{System: flat, Perturbations: []tolerance.Perturbation{tolerance.Tilt("fold", tolerance.Normal(mrad))}, Goals: good.Goals[:1]}, tolerance.ErrPerturbation, "pointing error"},
		{"fast for some goals", with(func(s *tolerance.Study) { delete(s.Fast, "focus z") }), tolerance.ErrFast, `goal "focus z": fast measure: is missing`},
		{"fast for no goal", with(func(s *tolerance.Study) { s.Fast["waist"] = tolerance.WaistRadius() }), tolerance.ErrFast, `Fast = "waist": names no goal`},
		{"fast swapped", with(func(s *tolerance.Study) { s.Fast["focus z"] = tolerance.WaistRadius() }), tolerance.ErrFast, `goal "focus z": fast measure value`},
		{"fast other beam", with(func(s *tolerance.Study) { s.Beam = wrongBeam }), tolerance.ErrFast, "differs from the goal's own measure"},
		{"fast no beam", with(func(s *tolerance.Study) { s.Beam = nil }), tolerance.ErrFast, "Beam: is nil"},
		{"compensator goal", with(func(s *tolerance.Study) {
			s.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 100*mm, 200*mm), Goal: "focus"}
		}), tolerance.ErrCompensator, `goal = "focus": names no goal`},
		{"compensator bounds", with(func(s *tolerance.Study) {
			s.Compensator = &tolerance.Compensator{Variable: design.Spacing("gap", 150*mm, 150*mm), Goal: "focus z"}
		}), tolerance.ErrCompensator, "need Min < Max"},
		{"compensator one-sided", tolerance.Study{System: sys, Perturbations: good.Perturbations,
			Goals:       []design.Goal{design.AtMost("w", design.WaistRadius(in), 1*mm)},
			Compensator: &tolerance.Compensator{Variable: design.Spacing("gap", 100*mm, 200*mm), Goal: "w"}}, tolerance.ErrCompensator, "is an at most goal"},
		{"compensator tilted lens", with(func(s *tolerance.Study) {
			s.Perturbations[0] = tolerance.Tilt("L5", tolerance.Normal(mrad))
			s.Compensator = &tolerance.Compensator{Variable: design.FocalLength("L5", 150*mm, 250*mm), Goal: "focus z"}
		}), tolerance.ErrCompensator, "is also tilted"},
		{"no perturbations", tolerance.Study{System: sys, Goals: good.Goals}, tolerance.ErrPerturbation, "perturbations: none given"},
		{"goal range", tolerance.Study{System: sys, Perturbations: good.Perturbations,
			Goals: []design.Goal{design.Near("w", design.WaistRadius(in), 1*mm, -1*um)}}, nil, `goal "w": wanted range`},
	} {
		err := c.s.Validate()
		var pe *tolerance.ParamError
		if !errors.As(err, &pe) || (c.want != nil && !errors.Is(err, c.want)) || !strings.Contains(err.Error(), c.text) {
			t.Errorf("%s: Validate() = %v; want a *ParamError wrapping %v containing %q", c.name, err, c.want, c.text)
		}
	}
	for _, o := range []tolerance.Options{{Trials: 0}, {Trials: tolerance.MaxTrials + 1}, {Trials: 10, Workers: -1}} {
		if _, err := good.MonteCarlo(context.Background(), o); !errors.Is(err, tolerance.ErrOptions) {
			t.Errorf("options %+v: %v, want ErrOptions", o, err)
		}
	}
	if err := (tolerance.Study{}).Validate(); !errors.Is(err, paraxial.ErrNotBuilt) {
		t.Errorf("zero Study: %v", err)
	}
}

// TestTables: the reports carry the units and the numbers they claim.
func TestTables(t *testing.T) {
	st := relayStudy(t, 0.1*mm, 0.01)
	sens, err := st.Sensitivity()
	if err != nil {
		t.Fatal(err)
	}
	tab := sens.Table()
	if tab.Header[2] != `placement "L1" (σ 100 µm)` || tab.Header[3] != `focal length "L1" (±1 %)` || !strings.HasSuffix(tab.Cell(0, 2), " µm/mm") {
		t.Errorf("sensitivity table header %q, cell %q", tab.Header[:4], tab.Cell(0, 2))
	}
	b := sens.Budget()
	if len(b.Rows) != 20 || b.Cell(0, 1) != `focal length "L3"` {
		t.Errorf("budget: %d rows, largest contribution to the waist %q; want 20 and L3's focal length", len(b.Rows), b.Cell(0, 1))
	}
	r := run(t, st, tolerance.Options{Trials: 500, Seed: 1})
	rt := r.Table()
	if !strings.HasPrefix(rt.Caption, "Monte Carlo over 500 builds (seed 1, fast route): all goals met in ") || rt.Cell(1, 7) != "740.504 ± 2 mm" {
		t.Errorf("Monte Carlo table caption %q, wanted cell %q", rt.Caption, rt.Cell(1, 7))
	}
	if err := rt.Validate(); err != nil {
		t.Error(err)
	}
}

// TestAppendedParts: parts of an appended sub-assembly ("tele/L1") can be
// perturbed; the rebuilt lens keeps its full label, so the two routes
// agree and a later placement of the same part still finds it.
func TestAppendedParts(t *testing.T) {
	tele, err := paraxial.NewBuilder().ThinLens(50 * mm).Label("L1").Space(200 * mm).ThinLens(150 * mm).Label("L2").Build()
	if err != nil {
		t.Fatal(err)
	}
	sys, err := paraxial.NewBuilder().Space(50 * mm).Append(tele).Label("tele").Space(300 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	in, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 633 * nm})
	ws, _ := beam.Waists(sys, in)
	st := tolerance.Study{System: sys, Beam: in,
		Perturbations: []tolerance.Perturbation{
			tolerance.FocalError("tele/L1", tolerance.Normal(0.01)),
			tolerance.Tilt("tele/L1", tolerance.Normal(10*mrad)),
			tolerance.Placement("tele/L1", tolerance.Normal(0.1*mm)),
		},
		Goals: []design.Goal{design.Near("waist", design.WaistRadius(in), ws.Last().Radius, 0.01*ws.Last().Radius)},
		Fast:  map[string]tolerance.Fast{"waist": tolerance.WaistRadius()},
	}
	fast := run(t, st, tolerance.Options{Trials: 200, Seed: 1})
	gen := run(t, st, tolerance.Options{Trials: 200, Seed: 1, Generic: true})
	if gen.Failed != 0 || fast.Failed != 0 {
		t.Fatalf("failed builds: generic %d (%s), fast %d", gen.Failed, gen.FirstFailure, fast.Failed)
	}
	for i, a := range fast.Values[0] {
		if b := gen.Values[0][i]; math.Abs(a-b) > 1e-9*b {
			t.Fatalf("build %d: fast %.15g, generic %.15g", i, a, b)
		}
	}
}
