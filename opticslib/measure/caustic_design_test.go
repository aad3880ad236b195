package measure_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/stat"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// causticNoisyFit fits one seeded noisy R17 scan of b (x) and, if y.w0 != 0, of y
// too, with relative width errors rel, weighted by them.
func causticNoisyFit(t testing.TB, rng *rand.Rand, lambda units.Length, x, y causticBeam, rel float64) measure.CausticFit {
	t.Helper()
	z := causticR17Planes(x.z0, x.zR(lambda, 1))
	noisy := func(b causticBeam) ([]units.Length, []units.Length) {
		d := causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1)
		out := make([]units.Length, len(d))
		for i := range d {
			out[i] = d[i] * units.Length(1+rel*rng.NormFloat64())
		}
		return out, causticScaled(d, rel)
	}
	s := measure.WidthScan{Source: "bench scan", Z: z, Kind: measure.SecondMomentDiameter}
	if y.w0 == 0 {
		s.Round, s.SigmaRound = noisy(x)
	} else {
		s.X, s.SigmaX = noisy(x)
		s.Y, s.SigmaY = noisy(y)
	}
	f, err := measure.FitCaustic(s, measure.CausticOptions{Wavelength: lambda})
	if err != nil {
		t.Fatalf("FitCaustic error: %v", err)
	}
	return f
}

func TestCausticFitBeam(t *testing.T) {
	// The beam of package beam built from the fit has the fitted waist,
	// position and M² (beam.FromWaist, whose formulas package beam checks
	// against Kogelnik & Li): rel 1e-12 for the round trip through q
	// (a few roundings), abs 1e-15 m for the offset.
	lambda := 1064 * units.Nanometer
	rng := rand.New(rand.NewPCG(1, 1))
	xb, yb := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}, causticBeam{135 * units.Micrometer, 158 * units.Millimeter, 1.45}
	at := 40 * units.Millimeter
	round := causticNoisyFit(t, rng, lambda, xb, causticBeam{}, 0.01)
	in, err := round.Beam(at)
	if err != nil {
		t.Fatalf("Beam error: %v", err)
	}
	g, ok := in.(beam.Gaussian)
	if !ok {
		t.Fatalf("Beam of a round fit is %T, want beam.Gaussian", in)
	}
	check := func(what string, g beam.Gaussian, a measure.AxisFit) {
		if !scalar.EqualWithinRel(float64(g.WaistRadius()), float64(a.W0.Value), 1e-12) ||
			!scalar.EqualWithinAbs(float64(g.WaistOffset()), float64(a.Z0.Value-at), 1e-15) ||
			g.BeamQuality() != a.M2.Value || g.Wavelength != lambda || g.Index != 1 {
			t.Errorf("%s: beam w0 = %v, waist offset %v, M² %g, λ %v; want %v, %v, %g, %v", what, g.WaistRadius(), g.WaistOffset(), g.BeamQuality(), g.Wavelength, a.W0.Value, a.Z0.Value-at, a.M2.Value, lambda)
		}
	}
	check("round", g, round.X)
	if g2, err := round.Gaussian(at); err != nil || g2 != g {
		t.Errorf("Gaussian(at) = %v, %v; want %v", g2, err, g)
	}
	xy := causticNoisyFit(t, rng, lambda, xb, yb, 0.01)
	in, err = xy.Beam(at)
	if err != nil {
		t.Fatalf("Beam(x/y) error: %v", err)
	}
	a, ok := in.(beam.Astigmatic)
	if !ok {
		t.Fatalf("Beam of an x/y fit is %T, want beam.Astigmatic", in)
	}
	check("x", a.X, xy.X)
	check("y", a.Y, xy.Y)
	if _, err := xy.Gaussian(at); !errors.Is(err, measure.ErrInput) {
		t.Errorf("Gaussian of an x/y fit: error %v, want ErrInput", err)
	}
	if _, err := (measure.CausticFit{}).Beam(0); !errors.Is(err, measure.ErrNotFitted) {
		t.Errorf("Beam of the zero CausticFit: error %v, want ErrNotFitted", err)
	}
	// M² below 1: within 3σ of 1 it becomes 1; far below it is an error.
	z := causticR17Planes(xb.z0, xb.zR(lambda, 1))
	d := causticWidths(xb, z, measure.SecondMomentDiameter, lambda, 1)
	low, err := measure.FitCaustic(measure.WidthScan{Z: z, Round: d, Kind: measure.SecondMomentDiameter}, measure.CausticOptions{Wavelength: 1.4 * lambda})
	if err != nil {
		t.Fatalf("FitCaustic error: %v", err)
	}
	if _, err := low.Beam(at); !errors.Is(err, measure.ErrNotPhysical) || !strings.Contains(err.Error(), "is below 1 by more than 3 standard uncertainties") {
		t.Errorf("Beam with M² = %v: error %v, want ErrNotPhysical", low.X.M2, err)
	}
	// A TEM₀₀ beam with 2 % width errors; this seed's draw gives
	// M² = 0.982 ± 0.013.
	near := causticNoisyFit(t, rand.New(rand.NewPCG(0, 9)), lambda, causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.0}, causticBeam{}, 0.02)
	if !(near.X.M2.Value < 1 && near.X.M2.Value+3*near.X.M2.Sigma >= 1) {
		t.Fatalf("the seeded draw gives M² = %v, not just below 1; pick another seed", near.X.M2)
	}
	if g, err := near.Gaussian(at); err != nil || g.BeamQuality() != 1 || !scalar.EqualWithinRel(float64(g.WaistRadius()), float64(near.X.W0.Value), 1e-12) {
		t.Errorf("Beam with M² = %v: M² %v, w0 %v, %v; want M² = 1 and the fitted w0 %v", near.X.M2, g.BeamQuality(), g.WaistRadius(), err, near.X.W0.Value)
	}
	if !strings.Contains(strings.Join(near.Warnings, "\n"), "is below 1, which no beam has") {
		t.Errorf("warnings %q, want the M² < 1 warning", near.Warnings)
	}
}

// causticSelfWaist returns the waist after a thin lens of focal length f for an
// input waist of radius w0 and Rayleigh length zR at distance s before
// the lens (S. A. Self, "Focusing of spherical Gaussian beams", Appl.
// Opt. 22, 658–661 (1983) [equation numbers not checked]; valid for M² beams with
// the beam's own zR): the distance after the lens and the radius.
func causticSelfWaist(w0, zR, s, f float64) (sOut, wOut float64) {
	den := (s-f)*(s-f) + zR*zR
	return f + f*f*(s-f)/den, w0 * f / math.Sqrt(den)
}

func TestPropagateWaistReferences(t *testing.T) {
	// 1. Free space: the output waist is the input waist, so its position
	// from the input plane is Z0 − at, its radius W0 and its Rayleigh
	// length zR, each with the fit's own standard uncertainty (an
	// identity). Tolerance for the linearised σ: rel 1e-6, the
	// finite-difference error of a step of 1e-3 σ (truncation ~1e-6 (σ/p)²,
	// rounding ~1e-9).
	//
	// 2. A thin lens (Self 1983, causticSelfWaist) for the nominal values: rel
	// 1e-10 (a few roundings through the ABCD law and Self's closed form).
	//
	// 3. A cylindrical lens acting in x only: y leaves as it came (1.), x
	// as Self says (2.).
	//
	// 4. Monte-Carlo against linearised: the same σ within 4/√(2N) (the
	// sampling error of a standard deviation from N draws) plus 2 % for
	// the curvature of the propagation at 1 % width errors.
	lambda := 1064 * units.Nanometer
	rng := rand.New(rand.NewPCG(2, 2))
	xb, yb := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}, causticBeam{135 * units.Micrometer, 158 * units.Millimeter, 1.45}
	round := causticNoisyFit(t, rng, lambda, xb, causticBeam{}, 0.01)
	xy := causticNoisyFit(t, rng, lambda, xb, yb, 0.01)
	at := 400 * units.Millimeter // the system starts 400 mm along the rail, after the scanned waist
	mm := units.Millimeter
	free, _ := paraxial.NewBuilder().Space(300 * mm).Build()
	lens, _ := paraxial.NewBuilder().Space(200 * mm).ThinLens(150 * mm).Space(300 * mm).Build()
	cyl, _ := paraxial.NewBuilder().Space(200*mm).CylindricalLens(150*mm, paraxial.Tangential).Space(300 * mm).Build()

	near := func(what string, got, want measure.Uncertain[units.Length], relV, relS float64) {
		t.Helper()
		if !scalar.EqualWithinAbsOrRel(float64(got.Value), float64(want.Value), 1e-15, relV) || relS > 0 && !scalar.EqualWithinRel(float64(got.Sigma), float64(want.Sigma), relS) {
			t.Errorf("%s = %v (%.12g ± %.6g), want %v (%.12g ± %.6g)", what, got, float64(got.Value), float64(got.Sigma), want, float64(want.Value), float64(want.Sigma))
		}
	}
	u := func(v, s units.Length) measure.Uncertain[units.Length] {
		return measure.Uncertain[units.Length]{Value: v, Sigma: s}
	}

	w, err := round.PropagateWaist(free, at, measure.PropagationOptions{})
	if err != nil {
		t.Fatalf("PropagateWaist(free space) error: %v", err)
	}
	a := round.X
	near("free space: Z", w.X.Z, u(a.Z0.Value-at, a.Z0.Sigma), 1e-12, 1e-6)
	near("free space: radius", w.X.Radius, a.W0, 1e-12, 1e-6)
	near("free space: zR", w.X.RayleighRange, a.RayleighRange, 1e-12, 1e-6)
	near("free space: after the system", w.X.AfterSystem, u(a.Z0.Value-at-300*mm, a.Z0.Sigma), 1e-12, 1e-6)
	if !w.Round || w.Method != measure.Linearised {
		t.Errorf("free space: Round %v, Method %v; want true, Linearised", w.Round, w.Method)
	}

	self := func(a measure.AxisFit) (z, r units.Length) {
		s := float64(200*mm - (a.Z0.Value - at)) // waist-to-lens distance
		so, wo := causticSelfWaist(float64(a.W0.Value), float64(a.RayleighRange.Value), s, float64(150*mm))
		return 200*mm + units.Length(so), units.Length(wo)
	}
	lin, err := round.PropagateWaist(lens, at, measure.PropagationOptions{})
	if err != nil {
		t.Fatalf("PropagateWaist(lens) error: %v", err)
	}
	zs, rs := self(round.X)
	near("thin lens: Z", lin.X.Z, u(zs, 0), 1e-10, 0)
	near("thin lens: radius", lin.X.Radius, u(rs, 0), 1e-10, 0)
	const n = 20000
	mc, err := round.PropagateWaist(lens, at, measure.PropagationOptions{Method: measure.MonteCarlo, Samples: n, Seed: 7})
	if err != nil {
		t.Fatalf("PropagateWaist(lens, Monte Carlo) error: %v", err)
	}
	lim := 4/math.Sqrt(2*n) + 0.02
	near("thin lens, Monte Carlo: Z", mc.X.Z, lin.X.Z, 1e-15, lim)
	near("thin lens, Monte Carlo: radius", mc.X.Radius, lin.X.Radius, 1e-15, lim)
	if mc.Samples != n || mc.Method != measure.MonteCarlo || math.Abs(float64(mc.X.MeanZ-mc.X.Z.Value)) > 4*float64(mc.X.Z.Sigma)/math.Sqrt(n)+0.02*float64(mc.X.Z.Sigma) {
		t.Errorf("Monte Carlo: %d samples, method %v, mean Z %v vs nominal %v", mc.Samples, mc.Method, mc.X.MeanZ, mc.X.Z)
	}
	again, _ := round.PropagateWaist(lens, at, measure.PropagationOptions{Method: measure.MonteCarlo, Samples: n, Seed: 7})
	if again != mc {
		t.Errorf("Monte Carlo with the same seed differs: %+v vs %+v", again, mc)
	}

	wc, err := xy.PropagateWaist(cyl, at, measure.PropagationOptions{})
	if err != nil {
		t.Fatalf("PropagateWaist(cylindrical lens) error: %v", err)
	}
	zs, rs = self(xy.X)
	near("cylindrical lens: x Z", wc.X.Z, u(zs, 0), 1e-10, 0)
	near("cylindrical lens: x radius", wc.X.Radius, u(rs, 0), 1e-10, 0)
	near("cylindrical lens: y Z", wc.Y.Z, u(xy.Y.Z0.Value-at, xy.Y.Z0.Sigma), 1e-12, 1e-6)
	near("cylindrical lens: y radius", wc.Y.Radius, xy.Y.W0, 1e-12, 1e-6)
	if wc.Round {
		t.Errorf("cylindrical lens: Round = true")
	}
}

func TestPropagateWaistStatistics(t *testing.T) {
	// The uncertainty carried to the output waist must describe the
	// scatter of the output waist over repeated measurements: seeded noisy
	// scans of one beam, each fitted and propagated through a focusing
	// lens. Reference: GUM (JCGM 100:2008, clause 5) linear propagation,
	// exact to first order. Tolerance: the scatter over the RMS reported
	// σ within 4/√(2N) + 0.03 of 1 (sampling error of a standard
	// deviation; 3 % for the variation of the reported σ and the
	// curvature at 1 % width errors); the mean within 4 standard errors
	// of the true beam's output waist (Self 1983) plus 1 % of σ.
	const draws = 600
	lambda := 1064 * units.Nanometer
	mm := units.Millimeter
	b := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}
	at := 400 * mm
	lens, _ := paraxial.NewBuilder().Space(200 * mm).ThinLens(150 * mm).Space(300 * mm).Build()
	sTrue := float64(200*mm - (b.z0 - at))
	zTrue, rTrue := causticSelfWaist(float64(b.w0), float64(b.zR(lambda, 1)), sTrue, float64(150*mm))
	zTrue += float64(200 * mm)
	rng := rand.New(rand.NewPCG(3, 3))
	var zs, rs, szs, srs []float64
	for range draws {
		f := causticNoisyFit(t, rng, lambda, b, causticBeam{}, 0.01)
		w, err := f.PropagateWaist(lens, at, measure.PropagationOptions{})
		if err != nil {
			t.Fatalf("PropagateWaist error: %v", err)
		}
		zs, szs = append(zs, float64(w.X.Z.Value)), append(szs, float64(w.X.Z.Sigma))
		rs, srs = append(rs, float64(w.X.Radius.Value)), append(srs, float64(w.X.Radius.Sigma))
	}
	for _, c := range []struct {
		what  string
		v, s  []float64
		truth float64
	}{{"output waist position", zs, szs, zTrue}, {"output waist radius", rs, srs, rTrue}} {
		mean, sd := stat.MeanStdDev(c.v, nil)
		var ms float64
		for _, s := range c.s {
			ms += s * s
		}
		rms := math.Sqrt(ms / draws)
		if lim := 4/math.Sqrt(2*draws) + 0.03; math.Abs(sd/rms-1) > lim {
			t.Errorf("%s: scatter %.4g / reported σ %.4g = %.4f, want 1 ± %.3f", c.what, sd, rms, sd/rms, lim)
		}
		if math.Abs(mean-c.truth) > 4*sd/math.Sqrt(draws)+0.01*sd {
			t.Errorf("%s: mean %.8g, want %.8g (Self 1983) within %.3g", c.what, mean, c.truth, 4*sd/math.Sqrt(draws))
		}
		t.Logf("%s: scatter/σ = %.4f, bias %.3g σ", c.what, sd/rms, (mean-c.truth)/sd)
	}
}

func TestPropagateWaistErrors(t *testing.T) {
	lambda := 1064 * units.Nanometer
	f := causticNoisyFit(t, rand.New(rand.NewPCG(4, 4)), lambda, causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}, causticBeam{}, 0.01)
	air, _ := paraxial.NewBuilder().Space(100 * units.Millimeter).Build()
	water, _ := paraxial.NewBuilder().Medium(1.33).Space(100 * units.Millimeter).Build()
	for _, test := range []struct {
		name     string
		sys      paraxial.System
		opt      measure.PropagationOptions
		sentinel error
		want     string
	}{
		{"index mismatch", water, measure.PropagationOptions{}, beam.ErrIndexMismatch, "input beam index n = 1"},
		{"bad method", air, measure.PropagationOptions{Method: 7}, measure.ErrInput, "Method = 7: must be Linearised or MonteCarlo"},
		{"too many samples", air, measure.PropagationOptions{Method: measure.MonteCarlo, Samples: 2_000_000}, measure.ErrInput, "Samples = 2000000: must be 0 (default 4000) or 2 … 1000000"},
		{"not built", paraxial.System{}, measure.PropagationOptions{}, paraxial.ErrNotBuilt, ""},
	} {
		_, err := f.PropagateWaist(test.sys, 0, test.opt)
		if !errors.Is(err, test.sentinel) || !strings.Contains(causticErrText(err), test.want) {
			t.Errorf("%s: PropagateWaist error = %v, want %v containing %q", test.name, err, test.sentinel, test.want)
		}
	}
}

func causticErrText(err error) string {
	if err == nil {
		return ""
	}
	return err.Error()
}

func TestPropagatedWaistTable(t *testing.T) {
	// Layout of the table and summary: this package's own.
	lambda := 1064 * units.Nanometer
	f := causticNoisyFit(t, rand.New(rand.NewPCG(5, 5)), lambda, causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}, causticBeam{}, 0.01)
	lens, _ := paraxial.NewBuilder().Space(200 * units.Millimeter).ThinLens(150 * units.Millimeter).Space(300 * units.Millimeter).Build()
	w, err := f.PropagateWaist(lens, 400*units.Millimeter, measure.PropagationOptions{Method: measure.MonteCarlo, Seed: 1})
	if err != nil {
		t.Fatalf("PropagateWaist error: %v", err)
	}
	tb := w.Table()
	want := []string{"axis", "waist z from the input (mm)", "after the system (mm)", "w0 (µm)", "zR (mm)"}
	if strings.Join(tb.Header, "|") != strings.Join(want, "|") || len(tb.Rows) != 1 || tb.Cell(0, 0) != "round" || !strings.Contains(tb.Cell(0, 3), " ± ") {
		t.Errorf("Table = %q / %q, want header %q and one round row", tb.Header, tb.Rows, want)
	}
	if !strings.Contains(tb.Caption, "Monte-Carlo sampling of the fit coefficients (4000 draws)") {
		t.Errorf("Caption = %q, want the method", tb.Caption)
	}
	if s := w.String(); !strings.Contains(s, "round: w0 = ") || !strings.Contains(s, "after the system") {
		t.Errorf("String() = %q", s)
	}
}
