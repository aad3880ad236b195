package beam

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Exact maximum of the peak irradiance for an astigmatic beam. Two equal
// Rayleigh ranges zR with the x and y foci at ∓d: with t = z/zR,
// wx²wy² ∝ (1 + (t − δ)²)(1 + (t + δ)²), δ = d/zR, whose derivative is
// 4t(1 + t² − δ²). For δ = 2 the product is smallest at t = ±√3, neither
// at a focus (t = ±2) nor midway (analytic identity; w(z) per Kogelnik &
// Li 1966): there wx·wy = 4 W0², against √17 W0² at a focus. The caustic's
// samples (11, plus the foci) miss ±√3, so the largest sample is lower; the
// exact maximum 2P/(4π W0²) is checked to rel 1e-9 (roots polished by
// Newton steps).
func TestIrradianceExactMaximum(t *testing.T) {
	const (
		w0     = 0.1 * mm
		lambda = 1064 * nm
	)
	zR := math.Pi * float64(w0*w0) / float64(lambda)
	d := 2 * zR
	gx, err := FromWaist(WaistSpec{WaistRadius: w0, WaistZ: units.Length(zR*4 - d), Wavelength: lambda})
	if err != nil {
		t.Fatal(err)
	}
	gy, err := FromWaist(WaistSpec{WaistRadius: w0, WaistZ: units.Length(zR*4 + d), Wavelength: lambda})
	if err != nil {
		t.Fatal(err)
	}
	sys := mustBuild(t, paraxial.NewBuilder().Space(units.Length(8*zR)))
	c, err := Sample(sys, Astigmatic{X: gx, Y: gy}, 11)
	if err != nil {
		t.Fatal(err)
	}
	ir, err := c.Irradiance(1)
	if err != nil {
		t.Fatal(err)
	}
	// (1 + (√3 − 2)²)(1 + (√3 + 2)²) = 16, so wx·wy = 4 W0².
	want := 2 / (math.Pi * 4 * float64(w0*w0))
	if !scalar.EqualWithinAbsOrRel(ir.Max, want, 0, 1e-9) {
		t.Errorf("Max = %.12g W/m², want %.12g", ir.Max, want)
	}
	tz := (float64(ir.MaxZ) - 4*zR) / zR
	if !scalar.EqualWithinAbsOrRel(math.Abs(tz), math.Sqrt(3), 0, 1e-6) {
		t.Errorf("MaxZ at t = %.8f Rayleigh ranges from the midpoint, want ±√3", tz)
	}
	sampled := 0.0
	for _, v := range ir.Peak {
		sampled = math.Max(sampled, v)
	}
	if !(sampled < ir.Max*(1-1e-3)) {
		t.Errorf("largest sample %.6g is not below the exact maximum %.6g", sampled, ir.Max)
	}
	// A round beam: the maximum is at the focus.
	round, _ := Sample(sys, gx, 11)
	irr, _ := round.Irradiance(1)
	if !scalar.EqualWithinAbsOrRel(irr.Max, 2/(math.Pi*float64(w0*w0)), 0, 1e-12) {
		t.Errorf("round beam Max = %.12g, want 2P/(π W0²)", irr.Max)
	}
}

// Constructors say what each value is, and reject a waist radius and a
// wavelength given in each other's place (w0 = 488 nm, λ0 = 0.42 mm has a
// half-divergence of 0.42e-3/(π·488e-9) ≈ 274 rad).
func TestConstructorPlausibility(t *testing.T) {
	_, err := FromWaist(WaistSpec{WaistRadius: 488 * nm, Wavelength: 0.42 * mm})
	if !errors.Is(err, ErrNotParaxial) || !strings.Contains(err.Error(), "are the two swapped?") || !strings.Contains(err.Error(), "273.") {
		t.Errorf("swapped w0 and λ0: error = %v, want ErrNotParaxial naming 274 rad and the swap", err)
	}
	// At the threshold: w0 = λ/(π·0.5) passes, a little less fails.
	w := units.Length(float64(633*nm) / (math.Pi * 0.5))
	if _, err := FromWaist(WaistSpec{WaistRadius: w * 1.001, Wavelength: 633 * nm}); err != nil {
		t.Errorf("w0 just above the paraxial limit: error %v", err)
	}
	if _, err := FromWaist(WaistSpec{WaistRadius: w * 0.999, Wavelength: 633 * nm}); !errors.Is(err, ErrNotParaxial) {
		t.Errorf("w0 just below the paraxial limit: error %v, want ErrNotParaxial", err)
	}
	if _, err := FromWaist(WaistSpec{WaistRadius: 1 * mm, WaistDiameter: 2 * mm, Wavelength: 633 * nm}); err == nil || !strings.Contains(err.Error(), "not both") {
		t.Errorf("radius and diameter: error %v, want 'not both'", err)
	}
	g, err := FromWaist(WaistSpec{WaistDiameter: 2 * mm, Wavelength: 633 * nm, M2: 1.3, Index: 1.5})
	if err != nil || !scalar.EqualWithinAbsOrRel(float64(g.WaistRadius()), 1e-3, 0, 1e-14) || g.BeamQuality() != 1.3 || g.Index != 1.5 {
		t.Errorf("diameter spec: %+v, %v; want w0 = 1 mm, M² = 1.3, n = 1.5", g, err)
	}
	// Full divergence is twice the half angle (ISO 11146-1 quotes the
	// full angle): Θ = 2 M² λ0/(n π w0).
	want := 2 * 1.3 * 633e-9 / (1.5 * math.Pi * 1e-3)
	if !scalar.EqualWithinAbsOrRel(float64(g.FullDivergence()), want, 0, 1e-14) || g.FullDivergence() != 2*g.HalfDivergence() {
		t.Errorf("FullDivergence = %v, want %g rad", g.FullDivergence(), want)
	}
}

// WaistZ > 0 puts the waist after the plane (a converging beam, R < 0),
// and WithM2 keeps the waist radius and position while zR shrinks by M²
// (Siegman 1990 [from memory]: zR = π W0² n/(M² λ0)).
func TestWaistSignAndWithM2(t *testing.T) {
	g, err := FromWaist(WaistSpec{WaistRadius: 0.5 * mm, WaistZ: 200 * mm, Wavelength: 633 * nm})
	if err != nil {
		t.Fatal(err)
	}
	if g.WaistOffset() != 200*mm || !(g.WavefrontRadius() < 0) {
		t.Errorf("WaistZ = +200 mm: WaistOffset %v, R %v; want +200 mm and a converging (R < 0) wavefront", g.WaistOffset(), g.WavefrontRadius())
	}
	sys := mustBuild(t, paraxial.NewBuilder().Space(400*mm))
	ws, _ := Waists(sys, g)
	if !scalar.EqualWithinAbsOrRel(float64(ws[0].Z), 0.2, 0, 1e-12) || !scalar.EqualWithinAbsOrRel(float64(ws[0].AfterElement), -0.2, 0, 1e-12) {
		t.Errorf("waist after the 400 mm space at z = %v, %v after its exit; want 200 mm and −200 mm", ws[0].Z, ws[0].AfterElement)
	}
	h, err := g.WithM2(2)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(float64(h.WaistRadius()), float64(g.WaistRadius()), 0, 1e-14) || h.WaistOffset() != g.WaistOffset() ||
		!scalar.EqualWithinAbsOrRel(float64(h.RayleighRange()), float64(g.RayleighRange())/2, 0, 1e-14) {
		t.Errorf("WithM2(2): w0 %v, offset %v, zR %v; want %v, %v, %v", h.WaistRadius(), h.WaistOffset(), h.RayleighRange(), g.WaistRadius(), g.WaistOffset(), g.RayleighRange()/2)
	}
}

// Results that cannot be computed are errors, never panics or huge
// allocations.
func TestLimits(t *testing.T) {
	g, _ := FromWaist(WaistSpec{WaistRadius: 1 * mm, Wavelength: 633 * nm})
	sys := mustBuild(t, paraxial.NewBuilder().Space(1))
	for _, n := range []int{MaxSamples + 1, math.MaxInt} {
		if _, err := Sample(sys, g, n); err == nil || !strings.Contains(err.Error(), "sample count n") {
			t.Errorf("Sample(n = %d) error = %v, want a sample-count error", n, err)
		}
	}
	var unbuilt paraxial.System
	for name, err := range map[string]error{
		"At":       func() error { _, err := At(unbuilt, g, 0); return err }(),
		"Waists":   func() error { _, err := Waists(unbuilt, g); return err }(),
		"Sample":   func() error { _, err := Sample(unbuilt, g, 10); return err }(),
		"Clipping": func() error { _, err := Clipping(unbuilt, g, 0); return err }(),
		"Extremes": func() error { _, err := Extremes(unbuilt, g); return err }(),
	} {
		if !errors.Is(err, paraxial.ErrNotBuilt) {
			t.Errorf("%s on the zero System: error = %v, want paraxial.ErrNotBuilt", name, err)
		}
	}
}

// A Brewster window with a 3 mm clear radius and a 1.5 mm beam: the
// footprint on the surface is 1.5 mm/cos θ, so T is that of a circle of
// 3 mm for an ellipse of semi-axes (1.5/cos θ, 1.5) mm (the SciPy check of
// Transmission covers that formula), the same on the entrance and the exit
// surface (the footprint is the same seen from either side).
func TestClippingTiltedPlate(t *testing.T) {
	th := units.Angle(math.Atan(1.5))
	sys := mustBuild(t, paraxial.NewBuilder().Space(10*mm).Plate(5*mm, 1.5, th).Aperture(paraxial.ClearRadius(3*mm)).Space(10*mm))
	g, _ := FromWaist(WaistSpec{WaistRadius: 1.5 * mm, Wavelength: 633 * nm})
	clips, err := Clipping(sys, g, 0)
	if err != nil || len(clips) != 2 {
		t.Fatalf("Clipping = %+v, %v; want two surfaces", clips, err)
	}
	want := Transmission(paraxial.ClearRadius(3*mm), th, g.Radius(), g.Radius())
	for _, c := range clips {
		// The beam barely grows over 10 mm (zR = 11 m): rel 1e-6.
		if !scalar.EqualWithinAbsOrRel(c.Transmission, want, 0, 1e-6) || !(want > 0.96 && want < 0.97) {
			t.Errorf("%s: T = %.6f, want %.6f (≈ 0.967)", c.Name, c.Transmission, want)
		}
	}
}

// At extreme ellipticity a centred circle of radius a passes the 1-D
// fraction erf(√2 a/wx) of a beam that is a line in y (wy → 0; the
// correction is of order (wy/a)²): a = wx = 1 mm, wy = 1 nm gives
// erf(√2) = 0.9544997 (analytic limit).
func TestTransmissionExtremeEllipse(t *testing.T) {
	got := CircularTransmission(1*mm, 1*mm, 1*nm)
	if want := math.Erf(math.Sqrt2); !scalar.EqualWithinAbsOrRel(got, want, 1e-9, 0) {
		t.Errorf("CircularTransmission(1 mm, 1 mm, 1 nm) = %.10f, want %.10f", got, want)
	}
	if v := Transmission(paraxial.ClearRadius(-1), 0, 1*mm, 1*mm); !math.IsNaN(v) {
		t.Errorf("Transmission of an invalid opening = %g, want NaN", v)
	}
}

// WithM2 and FromQ apply the paraxial-range check too, and every
// constructor returns the zero Gaussian with its error.
func TestParaxialRangeEverywhere(t *testing.T) {
	g, _ := FromWaist(WaistSpec{WaistRadius: 10 * um, Wavelength: 633 * nm})
	if h, err := g.WithM2(1e5); !errors.Is(err, ErrNotParaxial) || h != (Gaussian{}) {
		t.Errorf("WithM2(1e5) = %+v, %v; want the zero Gaussian and ErrNotParaxial", h, err)
	}
	if h, err := FromQ(complex(0, 1e-9), 633*nm, 1); !errors.Is(err, ErrNotParaxial) || h != (Gaussian{}) {
		t.Errorf("FromQ(i·1 nm) = %+v, %v; want the zero Gaussian and ErrNotParaxial", h, err)
	}
	if h, err := FromWaist(WaistSpec{WaistRadius: 488 * nm, Wavelength: 0.42 * mm}); err == nil || h != (Gaussian{}) {
		t.Errorf("FromWaist(swapped) = %+v, %v; want the zero Gaussian and an error", h, err)
	}
}
