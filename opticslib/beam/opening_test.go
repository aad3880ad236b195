package beam_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestCrossCheckOpeningTransmission(t *testing.T) {
	// Independent reference: scipy.integrate.dblquad (QUADPACK) of the
	// TEM₀₀ irradiance over the opening, with the footprint on a tilted
	// part (wx/cos θ, wy) computed on the Python side,
	// testdata/crosscheck/beam_opening.py. The Go side uses Gauss–Legendre
	// over a chord parametrisation with the inner integral as erf, or the
	// slit's closed form.
	//
	// Tolerance: abs 1e-10. dblquad is asked for 1e-13 per level and must
	// report an error estimate below 1e-11; the Go quadrature stops at a
	// relative change of 1e-13. A wrong projection (cos θ applied to y, or
	// not at all) or a wrong offset sign is off by 1e-3 or more.
	const tol = 1e-10
	type xcase struct {
		Shape  string  `json:"shape"`
		A      float64 `json:"a"`
		Cx     float64 `json:"cx"`
		Cy     float64 `json:"cy"`
		Across string  `json:"across"`
		Tilt   float64 `json:"tilt_deg"`
		Wx     float64 `json:"wx"`
		Wy     float64 `json:"wy"`
	}
	cases := []xcase{
		// A round 10 mm mirror (clear radius 4.5 mm) at 45° and a 3.1 mm beam.
		{Shape: "circle", A: 4.5e-3, Tilt: 45, Wx: 3.1e-3, Wy: 3.1e-3},
		// The same mirror with the beam 1 mm off centre in each direction.
		{Shape: "circle", A: 4.5e-3, Cx: 1e-3, Tilt: 45, Wx: 3.1e-3, Wy: 3.1e-3},
		{Shape: "circle", A: 4.5e-3, Cy: -1e-3, Tilt: 45, Wx: 3.1e-3, Wy: 3.1e-3},
		// A 50 µm pinhole, beam w = 20 µm, 10 µm off centre.
		{Shape: "circle", A: 25e-6, Cx: 10e-6, Wx: 20e-6, Wy: 20e-6},
		{Shape: "circle", A: 25e-6, Cx: 7e-6, Cy: -7e-6, Wx: 20e-6, Wy: 30e-6},
		// A pinhole far off the beam: almost nothing passes.
		{Shape: "circle", A: 25e-6, Cx: 60e-6, Wx: 20e-6, Wy: 20e-6},
		// Slits, centred and offset, across x and across y, one tilted.
		{Shape: "slit", A: 50e-6, Across: "x", Wx: 80e-6, Wy: 80e-6},
		{Shape: "slit", A: 50e-6, Cx: 30e-6, Across: "x", Wx: 80e-6, Wy: 40e-6},
		{Shape: "slit", A: 0.2e-3, Cy: 0.1e-3, Across: "y", Wx: 1e-3, Wy: 0.3e-3},
		{Shape: "slit", A: 0.5e-3, Across: "x", Tilt: 30, Wx: 0.6e-3, Wy: 0.6e-3},
	}
	rng := rand.New(rand.NewPCG(1, 1))
	for range 16 {
		w := 0.2e-3 + 2e-3*rng.Float64()
		c := xcase{Shape: "circle", A: (0.5 + 2*rng.Float64()) * w, Wx: w, Wy: w * (0.5 + rng.Float64()),
			Cx: (rng.Float64() - 0.5) * w, Cy: (rng.Float64() - 0.5) * w, Tilt: 60 * rng.Float64()}
		cases = append(cases, c)
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			T      float64 `json:"t"`
			AbsErr float64 `json:"abserr"`
		} `json:"cases"`
	}
	pyref.Run(t, "beam_opening.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	maxDiff := 0.0
	for i, test := range cases {
		r := ref.Cases[i]
		if r.AbsErr > tol/10 {
			t.Errorf("case %d: dblquad error estimate %.3g too large for the tolerance", i, r.AbsErr)
			continue
		}
		o := paraxial.ClearRadius(units.Length(test.A))
		if test.Shape == "slit" {
			across := paraxial.Tangential
			if test.Across == "y" {
				across = paraxial.Sagittal
			}
			o = paraxial.SlitOfWidth(units.Length(2*test.A), across)
		}
		o = o.Offset(units.Length(test.Cx), units.Length(test.Cy))
		got := beam.Transmission(o, units.Angle(test.Tilt)*units.Degree, units.Length(test.Wx), units.Length(test.Wy))
		maxDiff = math.Max(maxDiff, math.Abs(got-r.T))
		if !scalar.EqualWithinAbs(got, r.T, tol) {
			t.Errorf("case %d %+v: Transmission = %.15g, want %.15g (dblquad)", i, test, got, r.T)
		}
	}
	t.Logf("%d openings against %s: max |ΔT| = %.2g", len(cases), ref.Reference, maxDiff)
}

// The round 10 mm mirror at 45° of a fold: 4.5 mm clear radius, beam
// 3.1 mm. Entering "4.5 mm × cos 45°" as a circle by hand gives 87.8 %;
// the footprint on the round mirror passes 93.6 % (the value the SciPy
// check above confirms to 1e-10). The test pins the difference, which the
// by-hand projection got wrong.
func TestTiltedMirrorNotHandProjected(t *testing.T) {
	const mm = units.Millimeter
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 3.1 * mm, Wavelength: 638 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	sys, err := paraxial.NewBuilder().Space(1 * mm).FlatMirror(45 * units.Degree).Label("M1").Aperture(paraxial.ClearRadius(4.5 * mm)).Space(1 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	clips, err := beam.Clipping(sys, in, 0)
	if err != nil || len(clips) != 1 {
		t.Fatalf("Clipping = %v, %v", clips, err)
	}
	byHand := beam.CircularTransmission(4.5*mm*units.Length(math.Cos(math.Pi/4)), 3.1*mm, 3.1*mm)
	if got := clips[0].Transmission; !(got > 0.935 && got < 0.937) || !(byHand < 0.879) {
		t.Errorf("45° mirror passes %.4f (by-hand projection %.4f); want ≈ 0.936 and ≈ 0.878", got, byHand)
	}
	if !scalar.EqualWithinAbsOrRel(float64(clips[0].Footprint()), 3.1e-3*math.Sqrt2, 0, 1e-6) {
		t.Errorf("footprint %v, want 3.1 mm·√2 = 4.384 mm", clips[0].Footprint())
	}
}

// A tube (an aperture on a space) is checked along its whole length: a
// 1 mm-radius tube around a 1 mm beam passes 1 − e⁻² = 86.5 % (R09 closed
// form); before, tubes were skipped and the path reported no clip.
func TestTubeClips(t *testing.T) {
	const mm = units.Millimeter
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	sys, err := paraxial.NewBuilder().Space(10 * mm).Space(50 * mm).Label("tube").Aperture(paraxial.ClearRadius(1 * mm)).Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	clips, err := beam.Clipping(sys, in, 0)
	if err != nil || len(clips) != 1 {
		t.Fatalf("Clipping = %+v, %v; want one check of the tube", clips, err)
	}
	c := clips[0]
	// w grows by (60 mm/zR)²/2 ≈ 4e-4 relative at the tube's far end
	// (zR = 2.95 m): the worst plane is the exit at 60 mm, and T there is
	// the closed form with that w (rel 1e-12).
	if want := -math.Expm1(-2 * float64(1*mm/c.W) * float64(1*mm/c.W)); !c.Low || !scalar.EqualWithinAbsOrRel(c.Transmission, want, 0, 1e-12) ||
		!scalar.EqualWithinAbsOrRel(float64(c.Z), 60e-3, 0, 1e-12) || c.Name != `Space "tube" (call 2)` {
		t.Errorf("tube check %+v; want flagged at z = 60 mm with T = %.6f", c, want)
	}
}

// A pinhole meant to clip carries its own threshold: the path-wide 99 %
// does not flag it, its own 50 % does when it is too small. By the closed
// form T = 1 − exp(−2a²/w²) (R09; Siegman, Lasers, §17.1 [from memory]) a
// 60 µm pinhole passes 98.9 % of a 20 µm beam and a 20 µm one 39.3 %.
func TestOwnThreshold(t *testing.T) {
	const um = units.Micrometer
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 20 * um, Wavelength: 532 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct {
		d   units.Length
		low bool
	}{{60 * um, false}, {20 * um, true}} {
		sys, err := paraxial.NewBuilder().Space(1 * units.Millimeter).
			Diaphragm(paraxial.ClearDiameter(test.d).WithMinTransmission(0.5)).Label("pinhole").Space(1 * units.Millimeter).Build()
		if err != nil {
			t.Fatal(err)
		}
		clips, err := beam.Clipping(sys, in, 0)
		if err != nil {
			t.Fatal(err)
		}
		c := clips[0]
		if c.Low != test.low || !c.OwnThreshold || c.MinTransmission != 0.5 {
			t.Errorf("Ø %v pinhole: %+v; want Low = %v with its own 50 %% threshold", test.d, c, test.low)
		}
	}
}
