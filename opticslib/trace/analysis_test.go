package trace_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// planoConvex returns reference-checks R36's lens: n = 1.5168, R =
// 51.68 mm, t = 4 mm, curved side first or flat side first, with the
// image plane 100 mm after the second vertex.
func planoConvex(t testing.TB, curvedFirst bool) trace.System {
	t.Helper()
	glass := trace.Index(1.5168)
	r1, r2 := 51.68*mm, units.Length(0)
	if !curvedFirst {
		r1, r2 = 0, -51.68*mm
	}
	sys, err := trace.New(trace.Index(1),
		trace.Surface{Label: "front", Kind: trace.Refract, Radius: r1, Medium: glass, Thickness: 4 * mm},
		trace.Surface{Label: "back", Kind: trace.Refract, Radius: r2, Medium: trace.Index(1), Thickness: 100 * mm})
	if err != nil {
		t.Fatal(err)
	}
	return sys
}

// paraboloid returns a concave paraboloid mirror of vertex radius 200 mm
// (focal length 100 mm) with its image plane at the focus shifted by dz
// (along the returning light, −z).
func paraboloid(t testing.TB, dz units.Length) trace.System {
	t.Helper()
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Reflect, Radius: -200 * mm, Conic: -1, Thickness: -100*mm - dz})
	if err != nil {
		t.Fatal(err)
	}
	return sys
}

// TestR36LongitudinalSpherical checks reference-checks R36's exact trace:
// the plano-convex lens n = 1.5168, R = 51.68 mm, t = 4 mm at h = 5 mm has
// LSA 0.27298 mm curved side first and 1.08130 mm flat side first (a
// reference computation of the reference-checks file; the values are
// given to 1e-5 mm, so the tolerance is 6e-6 mm, half a unit of the last
// digit plus rounding). LSA = paraxial focus − rim crossing, so the
// shift (crossing − paraxial) is −LSA. Their ratio is 3.961 (R36; the
// thin-lens bracket ratio 3.928, Jenkins & White form [from memory]).
func TestR36LongitudinalSpherical(t *testing.T) {
	lsa := map[bool]float64{}
	for _, test := range []struct {
		curvedFirst bool
		want        float64 // mm
	}{{true, 0.27298}, {false, 1.08130}} {
		sys := planoConvex(t, test.curvedFirst)
		la, err := sys.SphericalAberration(lambda, 5*mm, 11)
		if err != nil {
			t.Fatal(err)
		}
		got := -la.Shift[len(la.Shift)-1] / 1e-3
		if la.Height[len(la.Height)-1] != 5e-3 {
			t.Fatalf("rim height %v, want 5 mm", la.Height[len(la.Height)-1])
		}
		if !scalar.EqualWithinAbs(got, test.want, 6e-6) {
			t.Errorf("curved first %v: LSA at 5 mm = %.6f mm, want %.5f (R36)", test.curvedFirst, got, test.want)
		}
		lsa[test.curvedFirst] = got
		// Shifts grow with height (undercorrected), the axial one is 0.
		if la.Shift[0] != 0 || la.Height[0] != 0 {
			t.Errorf("axial entry (%v, %v), want (0, 0)", la.Height[0], la.Shift[0])
		}
		for i := 1; i < len(la.Shift); i++ {
			if !(la.Shift[i] < la.Shift[i-1]) {
				t.Errorf("shift at %v mm = %v not below the one at %v mm", la.Height[i], la.Shift[i], la.Height[i-1])
			}
		}
	}
	if r := lsa[false] / lsa[true]; !scalar.EqualWithinAbs(r, 3.961, 5e-4) {
		t.Errorf("LSA ratio flat first / curved first = %.4f, want 3.961 (R36)", r)
	}
}

// TestParaxialFocus checks the paraxial trace against a real ray at 1e-6
// of the pupil radius (whose aberration is 1e-12 of the rim's) and against
// R33's paraxial focus n₂R/(n₂ − n₁) = 150 mm; tolerance 1e-9 relative
// (the near-axis real ray's own rounding).
func TestParaxialFocus(t *testing.T) {
	sphere, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Refract, Radius: 50 * mm, Medium: trace.Index(1.5), Thickness: 200 * mm})
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct {
		name string
		sys  trace.System
		want float64 // m, 0: from the near-axis ray only
	}{
		{"R33 sphere", sphere, 0.150},
		{"plano-convex", planoConvex(t, true), 0},
		{"paraboloid", paraboloid(t, 0), -0.100},
	} {
		src := trace.Source{PupilRadius: 5 * mm}
		z, err := test.sys.ParaxialFocus(lambda, src)
		if err != nil {
			t.Fatal(test.name, err)
		}
		r, st, _, err := test.sys.TraceRay(lambda, trace.RayFromAngles(0, 5e-9, -1e-3, 0, 0))
		if err != nil || st != trace.OK {
			t.Fatal(test.name, st, err)
		}
		near := axisCrossing(r)
		if !scalar.EqualWithinAbsOrRel(float64(z), near, 0, 1e-9) {
			t.Errorf("%s: ParaxialFocus = %.12g m, near-axis ray %.12g", test.name, float64(z), near)
		}
		if test.want != 0 && !scalar.EqualWithinAbsOrRel(float64(z), test.want, 0, 1e-13) {
			t.Errorf("%s: ParaxialFocus = %.15g m, want %.15g", test.name, float64(z), test.want)
		}
	}
}

// TestBestFocusClosedForm checks that the closed-form least-RMS plane is
// a minimum of the RMS radius computed by Spot on planes around it: a
// step of 1 µm either side raises it (the quadratic's curvature is
// var(t) > 0), and the value agrees with Spot's RMS there to 1e-12
// relative (the same sums).
func TestBestFocusClosedForm(t *testing.T) {
	sys := planoConvex(t, false)
	src := trace.Source{PupilRadius: 5 * mm}
	pupil := trace.PupilGrid(31)
	f, err := sys.BestFocus(lambda, src, pupil)
	if err != nil {
		t.Fatal(err)
	}
	at := func(z units.Length) float64 {
		sp, err := sys.Spot(lambda, src, pupil, z)
		if err != nil {
			t.Fatal(err)
		}
		return float64(sp.RMS)
	}
	mid := at(f.Plane)
	if !scalar.EqualWithinAbsOrRel(mid, float64(f.RMS), 0, 1e-12) {
		t.Errorf("BestFocus RMS %v, Spot there %v", f.RMS, mid)
	}
	for _, d := range []units.Length{-1e-6, 1e-6} {
		if r := at(f.Plane + d); !(r > mid) {
			t.Errorf("RMS at best %+v = %v not above %v", d, r, mid)
		}
	}
	// The least-RMS plane of undercorrected spherical aberration lies
	// between the rim crossing and the paraxial focus.
	la, _ := sys.SphericalAberration(lambda, 5*mm, 2)
	rim := float64(la.Paraxial) + la.Shift[1]
	if !(float64(f.Plane) > rim && f.Plane < f.Paraxial) {
		t.Errorf("best plane %v not between the rim crossing %v and the paraxial focus %v", f.Plane, rim, f.Paraxial)
	}
}

// TestSpotParaboloid checks a paraboloid's axial spot at its focus: every
// ray crosses at the focus (R35, the focus property of the parabola), so
// the RMS radius is rounding (below 1e-15 m), and the Airy radius is
// 1.21967 λ/(2 NA) with NA = sin U′ of the rim ray, sin U′ = (h/f)/(1 +
// h²/(4f²)) for a paraboloid (h = 2f tan(U′/2), analytic), tolerance 1e-9.
func TestSpotParaboloid(t *testing.T) {
	sys := paraboloid(t, 0)
	src := trace.Source{PupilRadius: 10 * mm}
	sp, err := sys.Spot(lambda, src, trace.PupilGrid(21), sys.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	if sp.RMS > 1e-15 || sp.Geometric > 1e-15 {
		t.Errorf("paraboloid spot RMS %v, geometric %v, want 0", sp.RMS, sp.Geometric)
	}
	na := 0.1 / (1 + 0.01/4)
	if want := 1.2196698912665045 * float64(lambda) / (2 * na); !scalar.EqualWithinAbsOrRel(float64(sp.Airy), want, 0, 1e-9) {
		t.Errorf("Airy radius %v, want %v", float64(sp.Airy), want)
	}
	if sp.Traced() != len(trace.PupilGrid(21)) || sp.LostTotal() != 0 {
		t.Errorf("traced %d, lost %d", sp.Traced(), sp.LostTotal())
	}
	if !strings.Contains(sp.String(), "RMS radius") {
		t.Errorf("String() = %q", sp.String())
	}
}

// TestSpotOffAxis checks an off-axis spot through an ideal lens: every
// ray of a collimated beam at angle θ meets at (0, f tan θ) on the focal
// plane (the ideal lens's tangent law u′ = u − y/f, exact), to 1e-15 m.
func TestSpotOffAxis(t *testing.T) {
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Ideal, Focal: 100 * mm, Thickness: 100 * mm})
	if err != nil {
		t.Fatal(err)
	}
	src := trace.Source{Field: 2 * units.Degree, PupilRadius: 5 * mm, PupilZ: -20 * mm}
	sp, err := sys.Spot(lambda, src, trace.PupilHexapolar(4), sys.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	want := 0.1 * math.Tan(2*math.Pi/180)
	if !scalar.EqualWithinAbs(float64(sp.CentroidY), want, 1e-15) || !scalar.EqualWithinAbs(float64(sp.ChiefY), want, 1e-15) || sp.RMS > 1e-15 {
		t.Errorf("centroid y %v, chief y %v, RMS %v; want %v, %v, 0", float64(sp.CentroidY), float64(sp.ChiefY), sp.RMS, want, want)
	}
}

// TestLaunchConcaveFirst checks the start of the rays before a concave
// first surface (its sag is negative, so rays started on the pupil plane
// at the vertex would end Backward): all reach the image.
func TestLaunchConcaveFirst(t *testing.T) {
	sys, err := trace.New(trace.Index(1),
		trace.Surface{Kind: trace.Refract, Radius: -20 * mm, Medium: trace.Index(1.5), Thickness: 3 * mm},
		trace.Surface{Kind: trace.Refract, Radius: -15 * mm, Medium: trace.Index(1), Thickness: 50 * mm})
	if err != nil {
		t.Fatal(err)
	}
	src := trace.Source{Field: 5 * units.Degree, PupilRadius: 6 * mm}
	r, err := sys.Launch(src, trace.PupilGrid(11))
	if err != nil {
		t.Fatal(err)
	}
	// The start points lie on one plane wavefront: (P − P₀)·d = 0.
	for i := range r.Len() {
		d := (r.X[i]-r.X[0])*r.L[0] + (r.Y[i]-r.Y[0])*r.M[0] + (r.Z[i]-r.Z[0])*r.N[0]
		if math.Abs(d) > 1e-15 || r.OPL[i] != 0 {
			t.Errorf("ray %d starts %v m off the wavefront, OPL %v", i, d, r.OPL[i])
		}
	}
	if err := sys.Trace(lambda, r, 1); err != nil {
		t.Fatal(err)
	}
	for i, st := range r.Status {
		if st != trace.OK {
			t.Errorf("ray %d: %v at surface %d", i, st, r.Stop[i])
		}
	}
}

// TestSourceErrors checks that bad sources and pupils are refused with
// errors naming the parameter and its value.
func TestSourceErrors(t *testing.T) {
	sys := planoConvex(t, true)
	for _, test := range []struct {
		src   trace.Source
		pupil []trace.PupilPoint
		want  string
	}{
		{trace.Source{}, trace.PupilGrid(3), "pupil radius = 0 m"},
		{trace.Source{PupilRadius: -1 * mm}, trace.PupilGrid(3), "pupil radius = -1 mm"},
		{trace.Source{PupilRadius: 1 * mm, Field: 90 * units.Degree}, trace.PupilGrid(3), "field angle = 90°"},
		{trace.Source{PupilRadius: 1 * mm, ObjectHeight: 1 * mm}, trace.PupilGrid(3), "object height = 1 mm"},
		{trace.Source{PupilRadius: 1 * mm, ObjectDistance: -1 * mm}, trace.PupilGrid(3), "object distance = -1 mm"},
		{trace.Source{PupilRadius: 1 * mm, GaussianRadius: units.Length(math.NaN())}, trace.PupilGrid(3), "Gaussian radius w = NaN"},
		{trace.Source{PupilRadius: 1 * mm, ObjectDistance: 10 * mm, PupilZ: -20 * mm}, trace.PupilGrid(3), "pupil z = -20 mm"},
		{trace.Source{PupilRadius: 1 * mm}, nil, "pupil: has no points"},
		{trace.Source{PupilRadius: 1 * mm}, []trace.PupilPoint{{}, {X: 1, Y: 1}}, "pupil point 1"},
	} {
		_, err := sys.Spot(lambda, test.src, test.pupil, sys.ImagePlane())
		if err == nil || !strings.Contains(err.Error(), test.want) {
			t.Errorf("Spot(%+v) error %v, want one containing %q", test.src, err, test.want)
		}
	}
	if _, _, err := sys.RayFans(lambda, trace.Source{PupilRadius: mm}, 1, 0); err == nil || !strings.Contains(err.Error(), "rays n = 1") {
		t.Errorf("RayFans(n = 1) error %v", err)
	}
	if _, err := sys.SphericalAberration(lambda, 0, 5); err == nil || !strings.Contains(err.Error(), "pupil radius = 0 m") {
		t.Errorf("SphericalAberration(0 m) error %v", err)
	}
	// A blocked beam: no ray reaches the image.
	blocked, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Stop, ClearRadius: 1 * mm, Thickness: 10 * mm})
	if err != nil {
		t.Fatal(err)
	}
	_, err = blocked.Spot(lambda, trace.Source{PupilRadius: 5 * mm}, []trace.PupilPoint{{X: 0.9}, {Y: -0.8}}, 0)
	if !errors.Is(err, trace.ErrNoRays) {
		t.Errorf("blocked Spot error %v, want ErrNoRays", err)
	}
	sp, _ := blocked.Spot(lambda, trace.Source{PupilRadius: 5 * mm}, []trace.PupilPoint{{X: 0.9}, {Y: -0.8}}, 0)
	if sp.Lost[trace.Blocked] != 2 {
		t.Errorf("lost %v, want 2 blocked", sp.Lost)
	}
	if _, err := blocked.BestFocus(lambda, trace.Source{PupilRadius: 5 * mm}, trace.PupilGrid(5)); !errors.Is(err, trace.ErrAfocal) {
		t.Errorf("afocal BestFocus error %v, want ErrAfocal", err)
	}
}

// TestPupilSamplers checks the samplers' counts, order and range.
func TestPupilSamplers(t *testing.T) {
	if g := trace.PupilGrid(5); len(g) != 13 || g[0] != (trace.PupilPoint{X: 0, Y: -1}) {
		t.Errorf("PupilGrid(5) = %v, want 13 points from (0, −1)", g)
	}
	if h := trace.PupilHexapolar(3); len(h) != 37 || h[0] != (trace.PupilPoint{}) || h[len(h)-1].X*h[len(h)-1].X+h[len(h)-1].Y*h[len(h)-1].Y > 1+1e-15 {
		t.Errorf("PupilHexapolar(3) has %d points, want 37", len(h))
	}
	a, b := trace.PupilRandom(1000, 7), trace.PupilRandom(1000, 7)
	var mean float64
	for i := range a {
		if a[i] != b[i] {
			t.Fatal("PupilRandom not deterministic")
		}
		r2 := a[i].X*a[i].X + a[i].Y*a[i].Y
		if r2 > 1 {
			t.Fatalf("point %v outside the disc", a[i])
		}
		mean += r2 / 1000
	}
	// ⟨ρ²⟩ = 1/2 for a uniform disc; 1000 points: σ = 1/√(12·1000) ≈ 0.009.
	if math.Abs(mean-0.5) > 0.04 {
		t.Errorf("PupilRandom ⟨ρ²⟩ = %v, want 0.5 ± 0.04", mean)
	}
	if trace.PupilGrid(0) != nil || trace.PupilHexapolar(-1) != nil || trace.PupilRandom(0, 1) != nil {
		t.Error("empty samplers not nil")
	}
}

// TestSpotFiniteObject checks a finite object through an ideal lens of
// f = 50 mm: the object 150 mm before it at height 3 mm is imaged 75 mm
// after it (1/s + 1/s′ = 1/f) at height −1.5 mm (m = −s′/s), every ray
// meeting there (the ideal lens's tangent law images every conjugate
// perfectly), to 1e-15 m.
func TestSpotFiniteObject(t *testing.T) {
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Ideal, Focal: 50 * mm, Thickness: 75 * mm})
	if err != nil {
		t.Fatal(err)
	}
	src := trace.Source{ObjectDistance: 150 * mm, ObjectHeight: 3 * mm, PupilRadius: 4 * mm, PupilZ: -10 * mm}
	sp, err := sys.Spot(lambda, src, trace.PupilGrid(15), sys.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(float64(sp.CentroidY), -1.5e-3, 1e-15) || sp.RMS > 1e-15 {
		t.Errorf("image centroid y %v, RMS %v; want −1.5 mm, 0", float64(sp.CentroidY), sp.RMS)
	}
	if want := math.Atan2(3, 140); !scalar.EqualWithinAbs(float64(sp.Field), want, 1e-15) {
		t.Errorf("field %v rad, want %v", float64(sp.Field), want)
	}
}
