package trace

import (
	"strconv"

	"gonum.org/v1/gonum/spatial/r3"
)

// Status is how a ray's trace ended.
type Status uint8

// The ray statuses. A ray that stops keeps the position, direction and
// optical path it had when it left the last surface it passed (never NaN),
// and [Rays.Stop] holds the index of the surface where it stopped.
const (
	// OK: the ray reached the image plane.
	OK Status = iota
	// Missed: the ray does not meet the surface (no real intersection
	// with the conic, or only on the branch away from the vertex, such as
	// beyond a sphere's equator), or runs parallel to the image plane.
	Missed
	// TotalReflection: the ray meets a refracting surface beyond the
	// critical angle (total internal reflection).
	TotalReflection
	// Blocked: the ray meets the surface outside its clear radius, or a
	// stop outside its opening.
	Blocked
	// Backward: the surface lies behind the ray (the ray would have to
	// travel backwards to reach it): the ray starts past the first
	// surface, or two surfaces cross within the ray's height (an edge
	// thickness below zero).
	Backward
	// Invalid: the starting ray is not finite or its direction is not a
	// unit vector (|d|² off 1 by more than 1e-12).
	Invalid
)

// String returns the status in words, for example "total internal
// reflection".
func (s Status) String() string {
	switch s {
	case OK:
		return "ok"
	case Missed:
		return "missed the surface"
	case TotalReflection:
		return "total internal reflection"
	case Blocked:
		return "blocked by the clear aperture"
	case Backward:
		return "surface behind the ray"
	case Invalid:
		return "invalid start"
	}
	return "Status(" + strconv.Itoa(int(s)) + ")"
}

// Ray is one ray: a point, a unit direction and the optical path length
// travelled, in the system's fixed frame.
type Ray struct {
	// Position is the ray's point in metres (z along the axis, vertex 0
	// at z = 0).
	Position r3.Vec
	// Direction is the unit direction vector (direction cosines L, M, N).
	Direction r3.Vec
	// OPL is the optical path length in metres from the start, Σ n·s with
	// the absolute index n of each medium and the geometric length s of
	// each segment.
	OPL float64
}

// RayFromAngles returns the ray starting at (x, y, z) metres whose
// direction makes tangents tanX = L/N and tanY = M/N with the axis,
// travelling towards +z.
func RayFromAngles(x, y, z, tanX, tanY float64) Ray {
	d := r3.Unit(r3.Vec{X: tanX, Y: tanY, Z: 1})
	return Ray{Position: r3.Vec{X: x, Y: y, Z: z}, Direction: d}
}

// Rays is a batch of rays in structure-of-arrays layout, the form the
// batch trace reads and overwrites in place: coordinates in metres in the
// system's fixed frame, direction cosines, optical path lengths in metres,
// and after a trace each ray's status and the surface where it stopped.
// All slices have the same length; make a batch with [NewRays].
type Rays struct {
	X, Y, Z []float64
	L, M, N []float64
	OPL     []float64
	// Status is set by the trace.
	Status []Status
	// Stop is, after a trace, the index of the surface where the ray
	// stopped (Len() for the image plane), and −1 for a ray that reached
	// the image plane.
	Stop []int32
}

// NewRays returns a batch of n rays, all zero (set them with [Rays.Set]
// or through the slices).
func NewRays(n int) *Rays {
	if n < 0 {
		panic("trace: negative ray count")
	}
	f := make([]float64, 7*n)
	return &Rays{
		X: f[0:n:n], Y: f[n : 2*n : 2*n], Z: f[2*n : 3*n : 3*n],
		L: f[3*n : 4*n : 4*n], M: f[4*n : 5*n : 5*n], N: f[5*n : 6*n : 6*n],
		OPL:    f[6*n : 7*n : 7*n],
		Status: make([]Status, n),
		Stop:   make([]int32, n),
	}
}

// Len returns the number of rays.
func (r *Rays) Len() int { return len(r.X) }

// Set stores ray i.
func (r *Rays) Set(i int, ray Ray) {
	r.X[i], r.Y[i], r.Z[i] = ray.Position.X, ray.Position.Y, ray.Position.Z
	r.L[i], r.M[i], r.N[i] = ray.Direction.X, ray.Direction.Y, ray.Direction.Z
	r.OPL[i] = ray.OPL
}

// Ray returns ray i.
func (r *Rays) Ray(i int) Ray {
	return Ray{
		Position:  r3.Vec{X: r.X[i], Y: r.Y[i], Z: r.Z[i]},
		Direction: r3.Vec{X: r.L[i], Y: r.M[i], Z: r.N[i]},
		OPL:       r.OPL[i],
	}
}

// check panics when the slices of r differ in length.
func (r *Rays) check() {
	n := len(r.X)
	if len(r.Y) != n || len(r.Z) != n || len(r.L) != n || len(r.M) != n || len(r.N) != n ||
		len(r.OPL) != n || len(r.Status) != n || len(r.Stop) != n {
		panic("trace: Rays slices differ in length")
	}
}
