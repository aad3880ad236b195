package trace_test

// Cross-check of trace.System.Trace against an independent NumPy trace
// (testdata/crosscheck/trace_rays.py, after G. H. Spencer and
// M. V. R. K. Murty, "General ray-tracing procedure", J. Opt. Soc. Am. 52,
// 672–678 (1962)), run with the system interpreter /usr/bin/python3
// (Debian's python3-numpy; the python3 first on PATH may not see it). The
// test skips when the interpreter or the modules are missing; CI has them.

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/spatial/r3"
)

// xcTraceSurface is a surface as trace_rays.py reads it: metres, the
// absolute index N after a refracting surface.
type xcTraceSurface struct {
	Kind        string  `json:"kind"` // "refract", "reflect", "stop"
	Radius      float64 `json:"radius"`
	Conic       float64 `json:"conic"`
	ClearRadius float64 `json:"clear_radius"`
	N           float64 `json:"n"`
	Thickness   float64 `json:"thickness"`
}

// xcTraceRays is a batch of rays as trace_rays.py reads and writes it.
type xcTraceRays struct {
	X   []float64 `json:"x"`
	Y   []float64 `json:"y"`
	Z   []float64 `json:"z"`
	L   []float64 `json:"L"`
	M   []float64 `json:"M"`
	N   []float64 `json:"N"`
	OPL []float64 `json:"opl"`
}

// xcTraceCase is one system and its rays.
type xcTraceCase struct {
	NObject  float64          `json:"n_object"`
	Surfaces []xcTraceSurface `json:"surfaces"`
	Rays     xcTraceRays      `json:"rays"`
	sys      trace.System
	scale    float64 // path-length scale: start distance plus Σ|thickness|, metres
}

// xcTraceResult is the reference's answer for one case.
type xcTraceResult struct {
	Status []string `json:"status"`
	Stop   []int32  `json:"stop"`
	xcTraceRays
	Margin struct {
		Aperture     []float64 `json:"aperture"`     // metres
		Behind       []float64 `json:"behind"`       // metres
		Discriminant []float64 `json:"discriminant"` // relative
		Root         []float64 `json:"root"`         // relative
		Branch       []float64 `json:"branch"`       // dimensionless
		Refraction   []float64 `json:"refraction"`   // relative
	} `json:"margin"`
}

// xcStatus maps the reference's status words to the trace's statuses.
var xcStatus = map[string]trace.Status{
	"ok": trace.OK, "missed": trace.Missed, "tir": trace.TotalReflection,
	"blocked": trace.Blocked, "backward": trace.Backward, "invalid": trace.Invalid,
}

// xcUniform returns a uniform number in [lo, hi).
func xcUniform(rng *rand.Rand, lo, hi float64) float64 { return lo + (hi-lo)*rng.Float64() }

// xcSigned returns a uniform magnitude in [lo, hi) with a random sign.
func xcSigned(rng *rand.Rand, lo, hi float64) float64 {
	v := xcUniform(rng, lo, hi)
	if rng.IntN(2) == 0 {
		return -v
	}
	return v
}

// xcTraceSystem returns a seeded random system of 4–7 surfaces: refracting
// spheres, conics (k in [−2, 1]) and planes that alternate between air and
// glasses of index 1.45–1.95 (steep rays inside the denser glasses meet
// total internal reflection at the exit surfaces), some with clear radii
// that block the outer rays, a concave or convex conic mirror when mirror
// is set (the thicknesses after it negative), a stop when stop is set; and
// the flat image plane 10–60 mm after the last surface. Thin spacings
// between curved surfaces make some surfaces cross within the rays'
// heights (rays that end Backward), and strongly curved ones have a rim
// that some rays pass beyond (Missed).
func xcTraceSystem(t *testing.T, rng *rand.Rand, mirror, stop bool) xcTraceCase {
	const mm = 1e-3
	count := 4 + rng.IntN(4)
	mirrorAt, stopAt := -1, -1
	if mirror {
		mirrorAt = 1 + rng.IntN(count-1)
	}
	if stop {
		for stopAt = rng.IntN(count); stopAt == mirrorAt; stopAt = rng.IntN(count) {
		}
	}
	c := xcTraceCase{NObject: 1, scale: 5 * mm}
	if rng.IntN(2) == 0 {
		c.NObject = 1.00027 // air as an absolute index
	}
	var surfs []trace.Surface
	n, glass, dir := c.NObject, false, 1.0
	for i := range count {
		var f trace.Surface
		var x xcTraceSurface
		switch i {
		case mirrorAt:
			f.Kind, x.Kind = trace.Reflect, "reflect"
			f.Radius = units.Length(xcSigned(rng, 40*mm, 300*mm))
			if rng.IntN(2) == 0 {
				f.ClearRadius = units.Length(xcUniform(rng, 8*mm, 14*mm))
			}
			dir = -dir
		case stopAt:
			f.Kind, x.Kind = trace.Stop, "stop"
			f.ClearRadius = units.Length(xcUniform(rng, 4*mm, 8*mm))
		default:
			f.Kind, x.Kind = trace.Refract, "refract"
			glass = !glass
			prev := n
			n = c.NObject
			if glass {
				n = xcUniform(rng, 1.45, 1.95)
			}
			f.Medium = trace.Index(n)
			switch {
			case !glass && prev > 1.7 && rng.IntN(2) == 0:
				// The exit from a dense glass, strongly curved: steep
				// incidence on its outer zone, total internal reflection.
				f.Radius = units.Length(xcSigned(rng, 10*mm, 20*mm))
			case rng.IntN(5) > 0:
				f.Radius = units.Length(xcSigned(rng, 12*mm, 150*mm))
			}
			if rng.IntN(3) == 0 {
				f.ClearRadius = units.Length(xcUniform(rng, 7*mm, 12*mm))
			}
		}
		if f.Radius != 0 && rng.IntN(2) == 0 {
			f.Conic = xcUniform(rng, -2, 1)
		}
		d := xcUniform(rng, 3*mm, 25*mm)
		switch {
		case i == count-1:
			d = xcUniform(rng, 10*mm, 60*mm)
		case glass:
			d = xcUniform(rng, 2*mm, 10*mm)
		}
		f.Thickness = units.Length(dir * d)
		c.scale += d
		x.Radius, x.Conic, x.ClearRadius, x.N, x.Thickness = float64(f.Radius), f.Conic, float64(f.ClearRadius), n, float64(f.Thickness)
		surfs = append(surfs, f)
		c.Surfaces = append(c.Surfaces, x)
	}
	sys, err := trace.New(trace.Index(c.NObject), surfs...)
	if err != nil {
		t.Fatalf("trace.New(random system) error: %v", err)
	}
	c.sys = sys
	return c
}

// xcTraceRaysFor returns count seeded skew rays starting at z = −5 mm:
// heights x, y within ±6 mm, direction tangents within ±0.25 (about 14°
// in each plane), every 7th with a starting optical path of up to 1 mm;
// every 53rd starts axially 50 mm past the first vertex (Backward there),
// every 61st has a direction of length 1.001 (Invalid: far above the
// 1e-12 allowance).
func xcTraceRaysFor(rng *rand.Rand, count int) *trace.Rays {
	r := trace.NewRays(count)
	for i := range count {
		ray := trace.RayFromAngles(xcSigned(rng, 0, 6e-3), xcSigned(rng, 0, 6e-3), -5e-3,
			xcSigned(rng, 0, 0.25), xcSigned(rng, 0, 0.25))
		if i%7 == 0 {
			ray.OPL = xcUniform(rng, 0, 1e-3)
		}
		if i%53 == 7 {
			ray = trace.RayFromAngles(ray.Position.X, ray.Position.Y, 50e-3, 0, 0)
		}
		if i%61 == 3 {
			ray.Direction = r3.Scale(1.001, ray.Direction)
		}
		r.Set(i, ray)
	}
	return r
}

// xcCopyRays returns a copy of r.
func xcCopyRays(r *trace.Rays) *trace.Rays {
	c := trace.NewRays(r.Len())
	for i := range r.Len() {
		c.Set(i, r.Ray(i))
	}
	return c
}

func TestCrossCheckTraceNumPy(t *testing.T) {
	// Independent reference: NumPy reference trace,
	// testdata/crosscheck/trace_rays.py, after Spencer & Murty 1962 —
	// the conic's quadratic solved from the ray's point rather than from
	// the vertex's tangent plane, the normal from the slope of the sag
	// formula (W. J. Smith, Modern Optical Engineering, 4th ed., 2008
	// [from memory]) rather than from the gradient of the implicit form,
	// Snell's law as n′s′ = n s + (n′cos θ′ − n cos θ) N̂ with n and n′
	// rather than μ = n/n′, the optical path from the Euclidean length of
	// each segment rather than the ray parameter, all rays per surface
	// with masks rather than ray by ray.
	//
	// Checks, per ray: the status and the stop surface must agree; then
	// the position (its point on the image plane, or where it stopped),
	// the direction and the optical path must agree to
	//
	//	|Δposition|, |ΔOPL| ≤ 1e-13·S + 1e-15 m (S: the case's path-length
	//	scale, start distance + Σ|thickness|, 0.03–0.2 m),
	//	|Δdirection cosine| ≤ 2e-13.
	//
	// The two traces do the same arithmetic in different orders (the
	// reference from the ray's point, tens of millimetres from the
	// surface, Go from the tangent plane), so each intersection differs
	// by a few ulp of the distances travelled (ulp(0.1 m) ≈ 1.4e-17 m),
	// and a direction by a few ulp of 1 (2.2e-16) times the refraction's
	// leverage; an error in direction grows into position over the
	// following spacings (≲ S) and is magnified at each later refraction
	// (by up to n′cos θ′ / (n cos θ) ~ 10 for the steeper rays here).
	// Over ≤ 7 surfaces that is ≲ 1e2 ulp: the tolerances are about
	// 450 ulp of S (ulp(x) ≈ 2.2e-16·x) and 900 ulp of 1, about 10 times
	// the largest differences seen (logged: ≈ 50 ulp of S in position and
	// path, ≈ 60 ulp of 1 in direction), while a wrong root, normal or
	// index ratio moves a ray by micrometres or more (a reference with the
	// conic term dropped from its normal, or with the other root, fails
	// thousands of these checks).
	//
	// Rays near a decision are left out of the comparison, since rounding
	// can legitimately put them either side: within 1 nm of a clear
	// radius or of starting on the surface (|t| < 1 nm), or within a
	// relative 1e-9 of a tangent ray (discriminant), of equally near roots,
	// of a conic's rim (branch) or of the critical angle (refraction). The
	// two traces' decision quantities differ by ≲ 1e-15 relative (1e-17 m
	// in lengths), six orders below these thresholds, and the thresholds
	// are small enough that the random rays almost never fall inside
	// them: the test requires that fewer than 0.2 % are left out. For the
	// value comparison the thresholds are 1e-6 relative (1 µm): a ray
	// within 1e-6 of the critical angle leaves with cos θ′ ~ 1e-3, which
	// magnifies a rounding difference in cos θ by ~1e3 beyond the
	// tolerance's budget; its status is still compared.
	const (
		marginLen    = 1e-9 // metres: clear radius, distance to the surface
		marginRel    = 1e-9 // relative: tangent, equal roots, rim, critical angle
		valueMargin  = 1e-6 // relative and metres: the stricter test for the values
		posTolScale  = 1e-13
		posTolAbs    = 1e-15 // metres
		dirTol       = 2e-13
		maxLeftOut   = 0.002
		raysPerCase  = 600 // three tiles of the batch trace
		systemsCount = 12
	)
	wavelength := 587.5618 * units.Nanometer
	rng := rand.New(rand.NewPCG(1, 1))
	var cases []xcTraceCase
	var traced []*trace.Rays
	var mirrors, stops, conics, hyperboloids, planes int
	for i := range systemsCount {
		c := xcTraceSystem(t, rng, i%2 == 1, i%3 != 1)
		for _, s := range c.Surfaces {
			switch {
			case s.Kind == "reflect":
				mirrors++
			case s.Kind == "stop":
				stops++
			case s.Radius == 0:
				planes++
			}
			if s.Conic != 0 {
				conics++
			}
			if s.Conic < -1 {
				hyperboloids++
			}
		}
		rays := xcTraceRaysFor(rng, raysPerCase)
		c.Rays = xcTraceRays{X: rays.X, Y: rays.Y, Z: rays.Z, L: rays.L, M: rays.M, N: rays.N, OPL: rays.OPL}
		// Two worker counts: the result must not depend on them (Trace's
		// promise), and the one compared with NumPy varies by case.
		got := xcCopyRays(rays)
		other := xcCopyRays(rays)
		procs := 1 + i%3
		if err := c.sys.Trace(wavelength, got, procs); err != nil {
			t.Fatalf("case %d: Trace(%d workers) error: %v", i, procs, err)
		}
		if err := c.sys.Trace(wavelength, other, 4); err != nil {
			t.Fatalf("case %d: Trace(4 workers) error: %v", i, err)
		}
		for j := range raysPerCase {
			a, b := got.Ray(j), other.Ray(j)
			if a != b || got.Status[j] != other.Status[j] || got.Stop[j] != other.Stop[j] {
				t.Fatalf("case %d, ray %d: Trace with %d workers = %+v %v at %d, with 4 workers %+v %v at %d",
					i, j, procs, a, got.Status[j], got.Stop[j], b, other.Status[j], other.Stop[j])
			}
		}
		cases = append(cases, c)
		traced = append(traced, got)
	}
	if mirrors == 0 || stops == 0 || conics == 0 || hyperboloids == 0 || planes == 0 {
		t.Fatalf("random systems lack a feature: %d mirrors, %d stops, %d conics (%d hyperboloids), %d planes",
			mirrors, stops, conics, hyperboloids, planes)
	}

	var out struct {
		Reference string          `json:"reference"`
		Cases     []xcTraceResult `json:"cases"`
	}
	pyref.Run(t, "trace_rays.py", map[string]any{"cases": cases}, &out)
	if len(out.Cases) != len(cases) {
		t.Fatalf("trace_rays.py returned %d cases, want %d", len(out.Cases), len(cases))
	}
	t.Logf("reference: %s", out.Reference)

	var seen [trace.Invalid + 1]int
	var total, leftOut, valuesLeftOut, compared int
	var worstPos, worstDir, worstOPL float64 // in units of the tolerances
	for i, c := range cases {
		got, want := traced[i], out.Cases[i]
		if len(want.Status) != raysPerCase || len(want.X) != raysPerCase || len(want.Margin.Refraction) != raysPerCase {
			t.Fatalf("case %d: trace_rays.py returned %d statuses, %d rays, want %d", i, len(want.Status), len(want.X), raysPerCase)
		}
		posTol := posTolScale*c.scale + posTolAbs
		for j := range raysPerCase {
			total++
			m := want.Margin
			lenMargin := min(m.Aperture[j], m.Behind[j])
			relMargin := min(m.Discriminant[j], m.Root[j], m.Branch[j], m.Refraction[j])
			if lenMargin < marginLen || relMargin < marginRel {
				leftOut++
				continue
			}
			st, ok := xcStatus[want.Status[j]]
			if !ok {
				t.Fatalf("case %d, ray %d: trace_rays.py status %q is not a status", i, j, want.Status[j])
			}
			seen[st]++
			if got.Status[j] != st || got.Stop[j] != want.Stop[j] {
				t.Errorf("case %d, ray %d (%+v): Trace status %v at surface %d, NumPy reference trace (trace_rays.py, after Spencer & Murty 1962) %v at %d",
					i, j, xcStartRay(c.Rays, j), got.Status[j], got.Stop[j], st, want.Stop[j])
				continue
			}
			if lenMargin < valueMargin || relMargin < valueMargin {
				valuesLeftOut++
				continue
			}
			compared++
			r := got.Ray(j)
			dp := max(math.Abs(r.Position.X-want.X[j]), math.Abs(r.Position.Y-want.Y[j]), math.Abs(r.Position.Z-want.Z[j]))
			dd := max(math.Abs(r.Direction.X-want.L[j]), math.Abs(r.Direction.Y-want.M[j]), math.Abs(r.Direction.Z-want.N[j]))
			do := math.Abs(r.OPL - want.OPL[j])
			worstPos, worstDir, worstOPL = max(worstPos, dp/posTol), max(worstDir, dd/dirTol), max(worstOPL, do/posTol)
			if dp > posTol || dd > dirTol || do > posTol {
				t.Errorf("case %d, ray %d (%v at %d): Trace = position (%.17g, %.17g, %.17g), direction (%.17g, %.17g, %.17g), OPL %.17g;\n"+
					"NumPy reference trace (trace_rays.py, after Spencer & Murty 1962) = (%.17g, %.17g, %.17g), (%.17g, %.17g, %.17g), %.17g;\n"+
					"differences %.3g m, %.3g, %.3g m, tolerances %.3g m, %.3g, %.3g m",
					i, j, st, got.Stop[j], r.Position.X, r.Position.Y, r.Position.Z, r.Direction.X, r.Direction.Y, r.Direction.Z, r.OPL,
					want.X[j], want.Y[j], want.Z[j], want.L[j], want.M[j], want.N[j], want.OPL[j], dp, dd, do, posTol, dirTol, posTol)
			}
		}
	}
	t.Logf("%d rays in %d systems: statuses %v (ok, missed, TIR, blocked, backward, invalid); %d left out near a decision, %d more kept out of the value comparison, %d values compared",
		total, len(cases), seen, leftOut, valuesLeftOut, compared)
	t.Logf("largest differences, in units of the tolerances: position %.3g, direction %.3g, OPL %.3g", worstPos, worstDir, worstOPL)
	if float64(leftOut) > maxLeftOut*float64(total) {
		t.Errorf("%d of %d rays left out near a decision, want ≤ %.1f %%", leftOut, total, 100*maxLeftOut)
	}
	// Every status must be exercised, and most rays must take part in the
	// value comparison, or the cross-check proves little.
	for st, count := range seen {
		if count == 0 {
			t.Errorf("status %v never occurred among the compared rays", trace.Status(st))
		}
	}
	if seen[trace.OK] < total/5 {
		t.Errorf("%d of %d rays reached the image plane, want ≥ 20 %%", seen[trace.OK], total)
	}
}

// xcStartRay formats ray j of a batch for a message.
func xcStartRay(r xcTraceRays, j int) string {
	return fmt.Sprintf("start (%.17g, %.17g, %.17g) dir (%.17g, %.17g, %.17g)", r.X[j], r.Y[j], r.Z[j], r.L[j], r.M[j], r.N[j])
}
