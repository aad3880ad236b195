package trace_test

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/spatial/r3"
)

const mm = units.Millimeter

var lambda = 587.5618 * units.Nanometer

// axisCrossing returns the z (metres) where the traced ray r (in a
// meridional plane y–z) crosses the axis.
func axisCrossing(r trace.Ray) float64 {
	return r.Position.Z - r.Position.Y*r.Direction.Z/r.Direction.Y
}

// TestSingleSphere checks reference-checks R33: exact refraction at one
// convex spherical surface, R = 50 mm, n 1 → 1.5, rays parallel to the
// axis at height h cross the axis at L′ = R + R sin I′/sin(I − I′) from
// the vertex, sin I = h/R, sin I′ = sin I/1.5 (the trigonometric trace,
// R. Kingslake & R. B. Johnson, Lens Design Fundamentals, 2nd ed.,
// Academic Press 2010, §2.3 [formula from memory]). Tolerance 1e-12
// relative: both are exact; the difference is rounding.
func TestSingleSphere(t *testing.T) {
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Refract, Radius: 50 * mm, Medium: trace.Index(1.5), Thickness: 200 * mm})
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct{ h, want float64 }{
		{5, 149.666015673}, {10, 148.656110874}, {20, 144.487934739},
	} {
		r, st, _, err := sys.TraceRay(lambda, trace.RayFromAngles(0, test.h*1e-3, -1e-3, 0, 0))
		if err != nil || st != trace.OK {
			t.Fatalf("h = %v mm: status %v, err %v", test.h, st, err)
		}
		got := axisCrossing(r) / 1e-3
		// Closed form at full precision.
		sinI := test.h / 50
		sinIp := sinI / 1.5
		want := 50 + 50*sinIp/math.Sin(math.Asin(sinI)-math.Asin(sinIp))
		if !scalar.EqualWithinAbsOrRel(got, want, 0, 1e-12) {
			t.Errorf("h = %v mm: crossing %.12f mm, closed form %.12f", test.h, got, want)
		}
		if !scalar.EqualWithinAbs(got, test.want, 1e-9) {
			t.Errorf("h = %v mm: crossing %.12f mm, R33 %.9f", test.h, got, test.want)
		}
	}
}

// TestMirrors checks reference-checks R35: a concave sphere R = 100 mm
// brings a parallel ray at height h = R sin θ across the axis R/(2 cos θ)
// from the centre of curvature; a paraboloid (k = −1) of the same vertex
// radius brings every height to R/2 (the focus property of the parabola,
// an analytic identity).
func TestMirrors(t *testing.T) {
	for _, k := range []float64{0, -1} {
		sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Reflect, Radius: -100 * mm, Conic: k, Thickness: -50 * mm})
		if err != nil {
			t.Fatal(err)
		}
		for _, h := range []float64{1e-3, 1, 10, 30, 60, 80} {
			if k == 0 && h > 70 {
				continue
			}
			r, st, _, err := sys.TraceRay(lambda, trace.RayFromAngles(0, h*1e-3, -100e-3, 0, 0))
			if err != nil || st != trace.OK {
				t.Fatalf("k = %v, h = %v mm: status %v, err %v", k, h, st, err)
			}
			got := axisCrossing(r) / 1e-3 // mm from the vertex (negative: in front)
			want := -50.0
			if k == 0 {
				cos := math.Sqrt(1 - (h/100)*(h/100))
				want = -(100 - 100/(2*cos))
			}
			if !scalar.EqualWithinAbs(got, want, 1e-10) {
				t.Errorf("k = %v, h = %v mm: crossing %.12f mm, want %.12f", k, h, got, want)
			}
		}
	}
}

// TestThroughCentre checks R35's last case: a ray aimed at the centre of
// curvature meets the surface along the normal, so refraction leaves its
// direction unchanged (Snell's law at normal incidence).
func TestThroughCentre(t *testing.T) {
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Refract, Radius: 50 * mm, Medium: trace.Index(1.5), Thickness: 10 * mm})
	if err != nil {
		t.Fatal(err)
	}
	d := r3.Unit(r3.Vec{Y: -10e-3, Z: 150e-3})
	in := trace.Ray{Position: r3.Vec{Y: 10e-3, Z: -100e-3}, Direction: d}
	path, st, _, err := sys.Path(lambda, in)
	if err != nil || st != trace.OK {
		t.Fatal(st, err)
	}
	got := path[1].Direction
	if math.Abs(got.X-d.X) > 1e-15 || math.Abs(got.Y-d.Y) > 1e-15 || math.Abs(got.Z-d.Z) > 1e-15 {
		t.Errorf("direction after the surface %v, want unchanged %v", got, d)
	}
}

// TestAplanatic checks reference-checks R34: a sphere of radius R = 10 mm
// and n = 1.5; rays from the aplanatic point R/n inside it leave as if
// from the virtual point nR from the centre, whatever their angle
// (M. Born & E. Wolf, Principles of Optics, 7th ed., Cambridge 1999,
// §4.2.3 [section from memory]; an analytic identity). The tolerance is
// 1e-12 of R: rounding only.
func TestAplanatic(t *testing.T) {
	const R = 10e-3
	// Exit surface convex towards +z with its vertex at z = 0: centre at
	// z = −R. The source lies at centre − R/n (away from the exit).
	sys, err := trace.New(trace.Index(1.5), trace.Surface{Kind: trace.Refract, Radius: -R * units.Meter, Medium: trace.Index(1), Thickness: 20 * mm})
	if err != nil {
		t.Fatal(err)
	}
	_ = sys
	// Convex towards +z means the centre lies at smaller z: R < 0 in the
	// fixed frame.
	centre := -R
	src := centre - R/1.5
	for _, deg := range []float64{5, 20, 40} {
		a := deg * math.Pi / 180
		in := trace.Ray{Position: r3.Vec{Z: src}, Direction: r3.Vec{Y: math.Sin(a), Z: math.Cos(a)}}
		path, st, _, err := sys.Path(lambda, in)
		if err != nil || st != trace.OK {
			t.Fatalf("%v°: status %v, err %v", deg, st, err)
		}
		out := path[1]
		zv := axisCrossing(out) // virtual crossing, behind the surface
		if got, want := centre-zv, 1.5*R; !scalar.EqualWithinAbs(got, want, 1e-12*R*1e3) {
			t.Errorf("%v°: virtual point %.15g m from the centre, want nR = %.15g", deg, got, want)
		}
	}
}

// TestCriticalAngleFusedSilica checks reference-checks R38 with Sellmeier
// indices: inside fused silica (Malitson 1965, J. Opt. Soc. Am. 55, 1205)
// at 1.55 µm in air, n = 1.444024 relative to air, the critical angle is
// 43.829°: a ray 0.005° below it leaves the glass and one 0.005° above it
// ends with TotalReflection (not NaN). The glass and the air are absolute
// indices in the glass formula's reference air, so their ratio is the
// catalogue's relative index (material's conventions); 0.005° is far
// above the 1e-6 uncertainty of the index.
func TestCriticalAngleFusedSilica(t *testing.T) {
	silica, err := material.ByName("fused silica")
	if err != nil {
		t.Fatal(err)
	}
	air, err := material.AirOf(material.ReferenceAir())
	if err != nil {
		t.Fatal(err)
	}
	vac, err := material.VacuumWavelength(1.55*units.Micrometer, material.ReferenceAir())
	if err != nil {
		t.Fatal(err)
	}
	s, err := trace.New(silica, trace.Surface{Label: "exit face", Kind: trace.Refract, Medium: air, Thickness: 10 * mm})
	if err != nil {
		t.Fatal(err)
	}
	const critical = 43.829
	for _, test := range []struct {
		deg  float64
		want trace.Status
	}{{critical - 0.005, trace.OK}, {critical + 0.005, trace.TotalReflection}, {60, trace.TotalReflection}} {
		a := test.deg * math.Pi / 180
		ray := trace.Ray{Position: r3.Vec{Z: -1e-3}, Direction: r3.Vec{Y: math.Sin(a), Z: math.Cos(a)}}
		out, st, _, err := s.TraceRay(vac, ray)
		if err != nil {
			t.Fatal(err)
		}
		if st != test.want {
			t.Errorf("%.3f°: status %v, want %v", test.deg, st, test.want)
		}
		if st == trace.OK && !(out.Direction.Z > 0 && out.Direction.Z < 0.02) {
			t.Errorf("%.3f°: leaves at N = %v, want grazing", test.deg, out.Direction.Z)
		}
	}
}
