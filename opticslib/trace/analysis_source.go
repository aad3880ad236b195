package trace

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Errors of the analyses, wrapped by [*ParamError] or returned as they are;
// test for them with errors.Is.
var (
	// ErrNoRays: no ray of the pupil reached the plane analysed (all
	// blocked, missed or totally reflected); the result returned with it
	// holds the counts of lost rays.
	ErrNoRays = errors.New("trace: no ray reached the image plane")
	// ErrChief: the chief ray (the pupil centre) did not reach the image
	// plane, so there is no reference for fans and wavefronts.
	ErrChief = errors.New("trace: the chief ray did not reach the image plane")
	// ErrAfocal: the light leaves the system collimated (the paraxial
	// marginal ray leaves parallel to the axis), so there is no focus.
	ErrAfocal = errors.New("trace: the system is afocal for this source (no focus)")
)

// ImagePlane returns the z in metres of the system's image plane, the
// plane the trace ends on ([System.Vertex] of Len()): the plane to give
// [System.Spot], [System.RayFans] and [System.Wavefront] to analyse the
// system as built.
func (s System) ImagePlane() units.Length {
	if !s.built {
		return 0
	}
	return units.Length(s.vertex[len(s.surfs)])
}

// Validate checks the source: a field angle below 90° in magnitude (zero
// for a finite object, which has a height instead), a finite object
// distance ≥ 0, a finite object height (zero for an object at infinity), a
// pupil radius > 0, a finite pupil plane after the object, and a Gaussian
// radius ≥ 0. Errors are [*ParamError]s naming the field with its value
// and unit.
func (src Source) Validate() error {
	bad := func(param string, v any, reason string) error {
		return &ParamError{Subject: "source", Param: param, Value: v, Reason: reason}
	}
	switch {
	case !finite(float64(src.Field)) || math.Abs(float64(src.Field)) >= math.Pi/2:
		return bad("field angle", src.Field, "must be finite and below 90° in magnitude")
	case !finite(float64(src.ObjectDistance)) || src.ObjectDistance < 0:
		return bad("object distance", src.ObjectDistance, "must be finite and ≥ 0 (0: object at infinity)")
	case !finite(float64(src.ObjectHeight)):
		return bad("object height", src.ObjectHeight, "must be finite")
	case src.ObjectDistance == 0 && src.ObjectHeight != 0:
		return bad("object height", src.ObjectHeight, "an object at infinity (object distance 0) has a field angle, not a height")
	case src.ObjectDistance != 0 && src.Field != 0:
		return bad("field angle", src.Field, "a finite object (object distance > 0) has a height, not a field angle")
	case !finite(float64(src.PupilRadius)) || !(src.PupilRadius > 0):
		return bad("pupil radius", src.PupilRadius, "must be positive and finite")
	case !finite(float64(src.PupilZ)):
		return bad("pupil z", src.PupilZ, "must be finite")
	case !finite(float64(src.GaussianRadius)) || src.GaussianRadius < 0:
		return bad("Gaussian radius w", src.GaussianRadius, "must be finite and ≥ 0 (0: uniform illumination)")
	}
	return nil
}

// Weight returns the pupil intensity weight of the pupil point p: 1 for
// uniform illumination, exp(−2r²/w²) for a Gaussian beam of 1/e² radius
// w = GaussianRadius, r = |p|·PupilRadius the radius in the pupil. The
// amplitude is its square root, exp(−r²/w²).
func (src Source) Weight(p PupilPoint) float64 {
	if src.GaussianRadius == 0 {
		return 1
	}
	r2 := (p.X*p.X + p.Y*p.Y) * float64(src.PupilRadius) * float64(src.PupilRadius)
	w := float64(src.GaussianRadius)
	return math.Exp(-2 * r2 / (w * w))
}

// collimated reports whether the object is at infinity.
func (src Source) collimated() bool { return src.ObjectDistance == 0 }

// objectZ returns the z of the object point.
func (s System) objectZ(src Source) float64 {
	return s.vertex[0] - float64(src.ObjectDistance)
}

// Launch returns the rays of the source through the pupil points, one ray
// per point and in their order, ready for [System.Trace] (the samplers
// [PupilGrid], [PupilHexapolar] and [PupilRandom] say where the centre,
// the chief ray, is; the analyses trace their own chief ray). Pupil point
// (x, y) is the point (x·a, y·a, PupilZ) of the entrance pupil plane,
// a = PupilRadius.
//
// For an object at infinity every ray has the direction (0, sin θ, cos θ),
// θ = Field, and passes through its pupil point; it starts on the plane
// wavefront (perpendicular to the direction) that lies wholly before the
// first surface within the beam, with OPL = 0, so the optical paths are
// measured from one plane wavefront. The plane is the pupil plane's
// wavefront when that lies before the first surface, else one moved back
// to below the least z of the first surface over the beam (its sag at the
// beam's radius on it, the clear radius if smaller, found in four rounds
// as the tilted beam widens with the depth), less a margin of 1 % of the
// depth plus 1 µm. For a finite object every ray starts at the
// object point (0, ObjectHeight, Vertex(0) − ObjectDistance) with OPL = 0,
// aimed at its pupil point, so the optical paths are measured from the
// object point's sphere; the pupil plane must lie after the object.
//
// Errors: a [*ParamError] for an invalid source ([Source.Validate]), a pupil
// point outside the unit disc or not finite (naming its index), an empty
// pupil, or [ErrNotBuilt].
func (s System) Launch(src Source, pupil []PupilPoint) (*Rays, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if err := src.Validate(); err != nil {
		return nil, err
	}
	if err := checkPupil(pupil); err != nil {
		return nil, err
	}
	a := float64(src.PupilRadius)
	pz := float64(src.PupilZ)
	r := NewRays(len(pupil))
	if !src.collimated() {
		oz := s.objectZ(src)
		if !(pz > oz) {
			return nil, &ParamError{Subject: "source", Param: "pupil z", Value: src.PupilZ,
				Reason: "must lie after the object point (z = " + units.Length(oz).String() + ")"}
		}
		oy := float64(src.ObjectHeight)
		for i, p := range pupil {
			dx, dy, dz := p.X*a, p.Y*a-oy, pz-oz
			inv := 1 / math.Sqrt(dx*dx+dy*dy+dz*dz)
			r.X[i], r.Y[i], r.Z[i] = 0, oy, oz
			r.L[i], r.M[i], r.N[i] = dx*inv, dy*inv, dz*inv
		}
		return r, nil
	}
	sin, cos := math.Sincos(float64(src.Field))
	// The least z of the first surface within the beam.
	zmin := pz
	if len(s.surfs) > 0 {
		v0 := s.vertex[0]
		f := s.surfs[0]
		// The beam's radius where it meets the surface grows with the
		// depth of the sag it meets: a few rounds settle it (the last
		// with a margin of 1e-3 of the depth).
		depth := 0.0
		for range 4 {
			rad := a + math.Abs(sin/cos)*(math.Abs(pz-v0)+1.001*depth)
			if f.ClearRadius > 0 {
				rad = math.Min(rad, float64(f.ClearRadius))
			}
			depth = -sagBound(f, rad)
		}
		zmin = math.Min(pz, v0-1.01*depth-1e-6)
	}
	// Start on the wavefront through the pupil centre moved back by s0
	// along the direction, far enough that every start point has z ≤ zmin.
	s0 := math.Min(0, (zmin-pz)/cos-a*math.Abs(sin))
	for i, p := range pupil {
		x, y := p.X*a, p.Y*a
		t := s0 - y*sin // (P − C)·d = y sin θ
		r.X[i], r.Y[i], r.Z[i] = x, y+t*sin, pz+t*cos
		r.L[i], r.M[i], r.N[i] = 0, sin, cos
	}
	return r, nil
}

// checkPupil returns a *ParamError for an empty pupil or a point that is
// not finite or lies outside the unit disc (naming its index).
func checkPupil(pupil []PupilPoint) error {
	if len(pupil) == 0 {
		return &ParamError{Param: "pupil", Reason: "has no points (PupilGrid(n) with n ≥ 1, PupilHexapolar(rings ≥ 0), PupilRandom(n ≥ 1))"}
	}
	for i, p := range pupil {
		if !finite(p.X) || !finite(p.Y) || p.X*p.X+p.Y*p.Y > 1+1e-9 {
			return &ParamError{Subject: "pupil point " + strconv.Itoa(i), Param: "(x, y)",
				Value:  "(" + strconv.FormatFloat(p.X, 'g', -1, 64) + ", " + strconv.FormatFloat(p.Y, 'g', -1, 64) + ")",
				Reason: "must be finite and inside the unit disc (normalised pupil coordinates)"}
		}
	}
	return nil
}

// sagBound returns the least sag (metres, relative to the vertex) of the
// surface within radius r: its sag at r, or at the rim of a sphere or
// ellipsoid that ends before r.
func sagBound(f Surface, r float64) float64 {
	if z, ok := f.Sag(units.Length(r)); ok {
		return math.Min(0, float64(z))
	}
	c := f.Curvature()
	// Beyond the rim: the rim height 1/(|c|√(1+k)) has sag 1/(c(1+k)).
	return math.Min(0, 1/(c*(1+f.Conic)))
}

// traced is a source's rays after the trace: the chief ray, four rim rays
// (for the image-space aperture), then the pupil points.
type traced struct {
	src   Source
	field units.Angle // the field angle (of the object point for a finite object)
	pupil []PupilPoint
	rays  *Rays
	nImg  float64 // absolute index of image space
	zImg  float64 // z of the image plane
}

// Indices of the chief ray, the rim rays and the first pupil ray in a
// traced batch.
const (
	tracedChief = 0
	tracedRim   = 1
	tracedPupil = 5
)

// traceSource launches and traces the chief ray, the four rim rays and
// the pupil at the vacuum wavelength.
func (s System) traceSource(vacuum units.Length, src Source, pupil []PupilPoint) (traced, error) {
	if err := s.Validate(); err != nil {
		return traced{}, err
	}
	idx, err := s.Indices(vacuum)
	if err != nil {
		return traced{}, err
	}
	if err := checkPupil(pupil); err != nil {
		return traced{}, err
	}
	all := make([]PupilPoint, 0, tracedPupil+len(pupil))
	all = append(all, PupilPoint{}, PupilPoint{Y: 1}, PupilPoint{Y: -1}, PupilPoint{X: 1}, PupilPoint{X: -1})
	all = append(all, pupil...)
	r, err := s.Launch(src, all)
	if err != nil {
		return traced{}, err
	}
	if err := s.Trace(vacuum, r, 0); err != nil {
		return traced{}, err
	}
	return traced{src: src, field: s.fieldAngle(src), pupil: pupil, rays: r, nImg: idx[len(idx)-1], zImg: s.vertex[len(s.surfs)]}, nil
}

// at returns ray i's crossing of the plane z (it must have reached the
// image plane).
func (t traced) at(i int, z float64) (x, y float64) {
	r := t.rays
	dz := z - r.Z[i]
	return r.X[i] + dz*r.L[i]/r.N[i], r.Y[i] + dz*r.M[i]/r.N[i]
}

// chiefErr returns an error wrapping ErrChief when the chief ray is lost.
func (t traced) chiefErr() error {
	if st := t.rays.Status[tracedChief]; st != OK {
		return &ParamError{Subject: "chief ray", Reason: st.String() + " at surface " + strconv.Itoa(int(t.rays.Stop[tracedChief])), Err: ErrChief}
	}
	return nil
}

// imageSine returns the sine of the image-space cone's half-angle about
// the chief ray: the mean over the rim rays that reached the image of
// |d × d_chief|, or, if none did, the largest over the pupil rays; 0 if
// none is known.
func (t traced) imageSine() float64 {
	r := t.rays
	c := tracedChief
	if r.Status[c] != OK {
		return 0
	}
	sinTo := func(i int) float64 {
		cx := r.M[i]*r.N[c] - r.N[i]*r.M[c]
		cy := r.N[i]*r.L[c] - r.L[i]*r.N[c]
		cz := r.L[i]*r.M[c] - r.M[i]*r.L[c]
		return math.Sqrt(cx*cx + cy*cy + cz*cz)
	}
	sum, n := 0.0, 0
	for i := tracedRim; i < tracedPupil; i++ {
		if r.Status[i] == OK {
			sum += sinTo(i)
			n++
		}
	}
	if n > 0 {
		return sum / float64(n)
	}
	m := 0.0
	for i := tracedPupil; i < r.Len(); i++ {
		if r.Status[i] == OK {
			m = math.Max(m, sinTo(i))
		}
	}
	return m
}
