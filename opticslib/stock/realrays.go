package stock

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Aberration chooses how [Search] estimates a candidate's spherical
// aberration, the score's aberration term and the lenses' orientation.
type Aberration int

const (
	// ThirdOrder is thin-lens shape-factor theory ([SphericalSeidel]),
	// the default: fast enough for every combination.
	ThirdOrder Aberration = iota
	// RealRays traces real rays through the thick lenses (package trace)
	// for every candidate that meets the goals, in each orientation, and
	// takes the orientation of least RMS wavefront error. The rays come
	// from the beam's centre of curvature at L1 (parallel for a
	// collimated beam) and fill the pupil of radius MarginalFactor·w
	// there ([RealRayCount] meridional rays at equal-area radii); the
	// wavefront is each ray's optical path on the plane of the last
	// vertex (the eikonal), fitted by a + b y² (piston and defocus) by
	// least squares, and the RMS of the residual is the estimate: the
	// real-ray counterpart of [SphericalRMS], which is the same fit to
	// W040 ρ⁴ over a uniform pupil. A lens listed without a thickness gets
	// one ([EdgeThickness]); an achromat is an ideal lens.
	RealRays
)

// String returns "third order" or "real rays".
func (a Aberration) String() string {
	switch a {
	case ThirdOrder:
		return "third order"
	case RealRays:
		return "real rays"
	}
	return "Aberration(" + strconv.Itoa(int(a)) + ")"
}

// Real-ray model constants.
const (
	// RealRayCount is the number of meridional rays of the real-ray
	// estimate, at equal-area radii ρⱼ = √((j + ½)/n) of the pupil, so
	// that equal weights stand for a uniformly filled pupil.
	RealRayCount = 32
	// EdgeThickness is the edge thickness the real-ray model gives a lens
	// listed without a centre thickness: the centre thickness is the
	// difference of the two sags at the rim plus 1.5 mm (a typical
	// catalogue singlet; common practice, no single source).
	EdgeThickness = 1.5 * units.Millimeter
)

// realGeometry returns the centre thickness the real-ray model uses for l.
func realGeometry(l Lens) units.Length {
	if l.Thickness > 0 {
		return l.Thickness
	}
	r := float64(l.Diameter) / 2
	sag := func(R units.Length) float64 {
		c := curvature(R)
		rr := math.Min(r, 0.999/math.Max(math.Abs(c), 1e-300))
		return c * rr * rr / (1 + math.Sqrt(1-c*c*rr*rr))
	}
	return units.Length(math.Max(sag(l.R1)-sag(l.R2), 0)) + EdgeThickness
}

// realRMS returns the RMS wavefront error, in waves of the search's vacuum
// wavelength, of the lenses seq (stock indices, turned round where rev)
// whose thin models stand gaps apart, met by a beam of 1/e² radius w and
// wavefront curvature curv (1/m, positive diverging) at L1's thin-lens
// plane. Real rays from the beam's centre of curvature (or parallel,
// for curv = 0) fill the pupil of radius MarginalFactor·w there; the
// wavefront is the optical path of each ray on the plane of the last
// vertex (the eikonal), fitted by a + b y² (piston and defocus) by least
// squares; the RMS of the residual is the estimate, the real-ray
// counterpart of [SphericalRMS] (which is the same fit to W040ρ⁴ over a
// uniform pupil).
func (c *config) realRMS(seq []int, rev []bool, gaps []float64, w, curv float64) (float64, error) {
	var surfs []trace.Surface
	air := trace.Index(1)
	zthin := 0.0
	var first float64 // z of the first vertex in the L1-plane frame
	var firstSag float64
	h := MarginalFactor * w
	prevEnd := 0.0
	for i, k := range seq {
		l := c.lenses[k]
		if rev[i] {
			l = l.Reversed()
		}
		if i > 0 {
			zthin += gaps[i-1]
		}
		if l.Kind == Achromat || l.R1 == 0 && l.R2 == 0 {
			if len(surfs) > 0 {
				surfs[len(surfs)-1].Thickness = units.Length(zthin - prevEnd)
			} else {
				first = zthin
			}
			surfs = append(surfs, trace.Surface{Label: label(i), Kind: trace.Ideal, Focal: l.Focal})
			prevEnd = zthin
			continue
		}
		t := realGeometry(l)
		thick := l
		thick.Thickness = t
		dH, _ := thick.PrincipalPlanes()
		v1 := zthin - float64(dH)
		if len(surfs) > 0 {
			surfs[len(surfs)-1].Thickness = units.Length(v1 - prevEnd)
		} else {
			first = v1
			c1 := curvature(l.R1)
			if hh := math.Min(h, 0.999/math.Max(math.Abs(c1), 1e-300)); c1 != 0 {
				firstSag = math.Abs(c1 * hh * hh / (1 + math.Sqrt(1-c1*c1*hh*hh)))
			}
		}
		r := func(R units.Length) units.Length {
			if math.IsInf(float64(R), 0) {
				return 0
			}
			return R
		}
		surfs = append(surfs,
			trace.Surface{Label: label(i) + " front", Kind: trace.Refract, Radius: r(l.R1), Medium: trace.Index(l.Index), Thickness: t},
			trace.Surface{Label: label(i) + " back", Kind: trace.Refract, Radius: r(l.R2), Medium: air})
		prevEnd = v1 + float64(t)
	}
	sys, err := trace.New(air, surfs...)
	if err != nil {
		return 0, err
	}
	// Rays start on a plane before the first vertex and its sag, from the
	// beam's centre of curvature at z = −1/curv (L1-plane frame).
	zs := first - 2*firstSag - 1e-3
	// Ray 0 is a near-axis ray that finds the paraxial centre of the
	// outgoing wavefront; rays 1… fill the pupil.
	rays := trace.NewRays(RealRayCount + 1)
	for j := range RealRayCount + 1 {
		hj := h * 1e-6
		if j > 0 {
			hj = h * math.Sqrt((float64(j-1)+0.5)/RealRayCount)
		}
		var ray trace.Ray
		if curv == 0 {
			ray = trace.RayFromAngles(0, hj, zs-first, 0, 0)
		} else {
			R := 1 / curv
			s := math.Copysign(1, R)
			dy, dz := s*hj, s*R
			ys := hj + zs*dy/dz
			ray = trace.RayFromAngles(0, ys, zs-first, 0, dy/dz)
			// Path from the centre of curvature beyond the axial one.
			ray.OPL = s * (math.Hypot(ys, zs+R) - math.Abs(zs+R))
		}
		rays.Set(j, ray)
	}
	if err := sys.Trace(c.gx.Wavelength, rays, 1); err != nil {
		return 0, err
	}
	for j := range RealRayCount + 1 {
		if rays.Status[j] != trace.OK {
			return 0, errors.New("real ray at " + strconv.FormatFloat(float64(rays.Y[j])*1e3, 'g', 4, 64) +
				" mm: " + rays.Status[j].String() + " at " + sys.Surface(int(min(rays.Stop[j], int32(sys.Len()-1)))).Label)
		}
	}
	// The reference sphere through the axial point of the last vertex's
	// plane, centred where the near-axis ray crosses the axis (a plane for
	// a collimated output); each ray's optical path is carried on to it.
	zp := rays.Z[0]
	radius := math.Inf(1)
	if rays.M[0] != 0 {
		radius = -rays.Y[0] * rays.N[0] / rays.M[0]
	}
	var s0, s1, s2, t0, t1 float64
	opd := make([]float64, RealRayCount)
	hs := make([]float64, RealRayCount)
	for j := 1; j <= RealRayCount; j++ {
		y, w := rays.Y[j], rays.OPL[j]
		if math.Abs(radius) < 1e3 {
			// |P + s d − C| = |R| with C = (0, zp + R): the root near s = 0.
			py, pz := y, rays.Z[j]-(zp+radius)
			b := py*rays.M[j] + pz*rays.N[j]
			cc := py*py + pz*pz - radius*radius
			q := -(b + math.Copysign(math.Sqrt(b*b-cc), b))
			sr := cc / q
			w += sr
			y += sr * rays.M[j]
		}
		u := y * y
		opd[j-1], hs[j-1] = w, u
		s0++
		s1 += u
		s2 += u * u
		t0 += w
		t1 += u * w
	}
	// Least squares of the path on the sphere against y²: a + b y².
	det := s0*s2 - s1*s1
	b := (s0*t1 - s1*t0) / det
	a := (t0 - b*s1) / s0
	var ss float64
	for j := range RealRayCount {
		e := opd[j] - a - b*hs[j]
		ss += e * e
	}
	rms := math.Sqrt(ss/s0) / float64(c.gx.Wavelength)
	if !finite(rms) {
		return 0, errors.New("real-ray wavefront error is not finite")
	}
	return rms, nil
}

// realOrient sets cand's orientation and RMS from the real-ray model: of
// every allowed orientation (achromats are not turned round), the one
// with the smallest RMS wavefront error.
func (c *config) realOrient(cand *Candidate, seq []int, gaps []float64, q1 complex128) error {
	n := len(seq)
	w := float64(cand.Radii[0])
	curv := real(1 / q1)
	best, bestMask := math.Inf(1), 0
	var firstErr error
	var rev [3]bool
	for mask := 0; mask < 1<<n; mask++ {
		ok := true
		for i := range n {
			rev[i] = mask>>i&1 == 1
			l := c.lenses[seq[i]]
			if rev[i] && (l.Kind == Achromat || l.Reversed().R1 == l.R1 && l.Reversed().R2 == l.R2) {
				ok = false
			}
		}
		if !ok {
			continue
		}
		rms, err := c.realRMS(seq, rev[:n], gaps, w, curv)
		if err != nil {
			if firstErr == nil {
				firstErr = err
			}
			continue
		}
		if rms < best {
			best, bestMask = rms, mask
		}
	}
	if math.IsInf(best, 1) {
		return firstErr
	}
	for i := range n {
		cand.Reversed[i] = bestMask>>i&1 == 1
	}
	cand.RMS = best
	return nil
}
