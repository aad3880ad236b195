package beam

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestPowerR09(t *testing.T) {
	// reference-checks R09 [X]: fraction inside r = w is 1 − e⁻² =
	// 0.864665; I0 = 2P/(πw²) = 636.6198 W/m² for 1 mW and 1 mm; an
	// aperture of diameter πw passes 0.992808 and one of radius 1.5w
	// passes 0.988891 (πw rule: A. E. Siegman, Lasers, University Science Books 1986, §17.1 [section from memory]).
	// Values quoted to 6–7 significant digits: rel 1e-6. Closed form
	// against expm1: rel 1e-15.
	const quoted = 1e-6
	w := 1 * mm
	for _, test := range []struct {
		name      string
		got, want float64
	}{
		{"T(r = w)", CircularTransmission(w, w, w), 0.864665},
		{"T(r = w) closed", CircularTransmission(w, w, w), 1 - math.Exp(-2)},
		{"I0(1 mW, 1 mm)", PeakIrradiance(1e-3, w, w), 636.6198},
		{"T(diameter πw)", CircularTransmission(units.Length(math.Pi/2)*w, w, w), 0.992808},
		{"T(1.5 w)", CircularTransmission(1.5*w, w, w), 0.988891},
	} {
		if !scalar.EqualWithinAbsOrRel(test.got, test.want, 0, quoted) {
			t.Errorf("R09 %s = %.9g, want %.9g", test.name, test.got, test.want)
		}
	}
	for _, test := range []struct {
		name string
		got  float64
		nan  bool
		want float64
	}{
		{"a = 0", CircularTransmission(0, w, w), false, 0},
		{"a < 0", CircularTransmission(-w, w, 2*w), false, 0},
		{"a = +Inf", CircularTransmission(units.Length(math.Inf(1)), w, 2*w), false, 1},
		{"w = 0", CircularTransmission(w, 0, w), true, 0},
		{"a NaN", CircularTransmission(units.Length(math.NaN()), w, w), true, 0},
	} {
		if test.nan != math.IsNaN(test.got) || (!test.nan && test.got != test.want) {
			t.Errorf("CircularTransmission %s = %g, want %g (NaN %v)", test.name, test.got, test.want, test.nan)
		}
	}
}

func TestEllipticalTransmission(t *testing.T) {
	// Elliptical beam through a circular aperture against a direct 2-D
	// integration of I = 2/(π wx wy) exp(−2x²/wx² − 2y²/wy²) over the disc
	// (scipy.integrate.dblquad, epsabs 1e-14, epsrel 1e-13; computed once
	// with Python 3 / SciPy 1.10 and quoted to 13 digits): rel 1e-12.
	for _, test := range []struct {
		a, wx, wy float64
		want      float64
	}{
		{1.5, 1, 2, 0.8350815997497799},
		{1, 1, 3, 0.4225657142761497},
		{2, 0.5, 1, 0.9999261388572294},
		{1, 3, 1, 0.4225657142761497}, // x ↔ y symmetry
	} {
		got := CircularTransmission(units.Length(test.a*1e-3), units.Length(test.wx*1e-3), units.Length(test.wy*1e-3))
		if !scalar.EqualWithinAbsOrRel(got, test.want, 0, 1e-12) {
			t.Errorf("CircularTransmission(%g, %g, %g mm) = %.15g, want %.15g", test.a, test.wx, test.wy, got, test.want)
		}
	}
	// Property (geometry): the disc of radius a contains the square of
	// half-side a/√2 and lies inside the square of half-side a, whose
	// transmissions are products of error functions, erf(√2 s/wx)·
	// erf(√2 s/wy) (separable Gaussian). Bounds hold to rounding (1e-14).
	rng := rand.New(rand.NewPCG(1, 1))
	sq := func(s, wx, wy float64) float64 { return math.Erf(math.Sqrt2*s/wx) * math.Erf(math.Sqrt2*s/wy) }
	for i := range 500 {
		wx := 0.01 + rng.Float64()
		wy := wx * math.Exp(4*(rng.Float64()-0.5)) // aspect up to e² ≈ 7.4
		a := 3 * rng.Float64() * math.Max(wx, wy)
		got := CircularTransmission(units.Length(a), units.Length(wx), units.Length(wy))
		lo, hi := sq(a/math.Sqrt2, wx, wy), sq(a, wx, wy)
		if got < lo-1e-14 || got > hi+1e-14 {
			t.Errorf("case %d: T(a %g, wx %g, wy %g) = %.15g outside the square bounds [%.15g, %.15g]", i, a, wx, wy, got, lo, hi)
		}
	}
}

func TestApertures(t *testing.T) {
	// A collimated beam w = 3 mm (zR = 26.6 m) on two lenses 1 mm apart:
	// a 4 mm clear radius passes 1 − exp(−2·16/9) = 0.97140 (< 99 %,
	// flagged), a 12.7 mm one passes 1 − exp(−35.8) ≈ 1 (R09 closed
	// form). Against the closed form with the reported radius: rel 1e-14;
	// against w = 3 mm: rel 1e-6, since w grows by (1 mm/zR)²/2 ≈ 7e-10.
	in := mustWaist(t, 3*mm, 0, 1064*nm, 1)
	sys := mustBuild(t, paraxial.NewBuilder().
		Space(1*mm).ThinLens(1).Label("L1").Aperture(paraxial.ClearRadius(4*mm)).
		Space(1*mm).ThinLens(-1).Aperture(paraxial.ClearRadius(12.7*mm)).
		Space(1*mm).ThinLens(1)) // no aperture: not checked
	clips, err := Clipping(sys, in, 0)
	if err != nil {
		t.Fatalf("Apertures error: %v", err)
	}
	if len(clips) != 2 {
		t.Fatalf("Apertures returned %d checks, want 2", len(clips))
	}
	c0, c1 := clips[0], clips[1]
	if want := -math.Expm1(-2 * float64(4*mm/c0.W) * float64(4*mm/c0.W)); !scalar.EqualWithinAbsOrRel(c0.Transmission, want, 0, 1e-14) {
		t.Errorf("L1 transmission = %.15g, want %.15g", c0.Transmission, want)
	}
	if !scalar.EqualWithinAbsOrRel(c0.Transmission, 1-math.Exp(-32.0/9), 0, 1e-6) || !c0.Low || c0.MinTransmission != DefaultMinTransmission {
		t.Errorf("L1 check = %+v, want T ≈ 0.97140, flagged, threshold 0.99", c0)
	}
	if c1.Low || c1.Name != "ThinLens (call 4)" || c1.Warning() != "" {
		t.Errorf("second lens check = %+v, want not flagged, named by its builder call", c1)
	}
	wantWarn := `ThinLens "L1" (call 2) at z = 1 mm: Ø 8 mm passes 97.14 % of the beam (w = 3 mm), below 99.00 %`
	if got := c0.Warning(); got != wantWarn {
		t.Errorf("Warning() = %q, want %q", got, wantWarn)
	}
	// A user threshold of 95 % clears L1.
	clips, err = Clipping(sys, in, 0.95)
	if err != nil || clips[0].Low {
		t.Errorf("Clipping(0.95) = %+v, %v; want L1 not flagged", clips, err)
	}
	for _, bad := range []float64{-0.1, 1.01, math.NaN(), math.Inf(1)} {
		if _, err := Clipping(sys, in, bad); err == nil || !strings.Contains(err.Error(), "minimum transmission") {
			t.Errorf("Clipping(%g) error = %v, want a minimum-transmission error", bad, err)
		}
	}
}

func TestIrradiance(t *testing.T) {
	// Peak irradiance along a caustic, 2P/(π wx wy) (R09), and the safety
	// note in every summary (project rule). The maximum sits at the focus,
	// which the sampler includes: it must equal 2P/(π W0²) of the R12 focus
	// (rel 1e-12: the same waist through the tracer and through Waists,
	// a few roundings each).
	in := mustWaist(t, 2*mm, 0, 1.064*um, 1)
	sys := mustBuild(t, paraxial.NewBuilder().ThinLens(0.1).Space(0.2))
	c, err := Sample(sys, in, 50)
	if err != nil {
		t.Fatalf("Sample error: %v", err)
	}
	ir, err := c.Irradiance(0.02)
	if err != nil {
		t.Fatalf("Irradiance error: %v", err)
	}
	ws, _ := Waists(sys, in)
	w0 := float64(ws[0].Radius)
	if want := 2 * 0.02 / (math.Pi * w0 * w0); !scalar.EqualWithinAbsOrRel(ir.Max, want, 0, 1e-12) {
		t.Errorf("Irradiance max = %.15g W/m², want %.15g at the R12 focus", ir.Max, want)
	}
	if !scalar.EqualWithinAbsOrRel(float64(ir.MaxZ), 99.99283e-3, 0, 5e-7) {
		t.Errorf("Irradiance max at z = %v, want 99.99283 mm (R12)", ir.MaxZ)
	}
	s := ir.Summary()
	if ir.Note != SafetyNote || !strings.HasSuffix(s, SafetyNote) || !strings.Contains(s, "P = 20 mW") {
		t.Errorf("Summary() = %q; want the power and the safety note", s)
	}
	for _, note := range []string{"laser safety officer", "not exposure limits"} {
		if !strings.Contains(SafetyNote, note) {
			t.Errorf("SafetyNote lacks %q", note)
		}
	}
	for _, p := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		if _, err := c.Irradiance(p); err == nil {
			t.Errorf("Irradiance(%g) error = nil", p)
		}
	}
	if _, err := (Caustic{}).Irradiance(1); err == nil {
		t.Errorf("empty caustic Irradiance error = nil")
	}
}
