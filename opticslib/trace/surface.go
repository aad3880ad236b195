package trace

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Medium is a transparent medium: anything with a name and an absolute
// refractive index at a vacuum wavelength. The materials of package
// material satisfy it; [Index] makes a medium of fixed index.
//
// A medium that also has a method
//
//	CheckRange(vacuum units.Length) error
//
// (the materials do) is asked by [System.Check] whether the wavelength lies
// inside its formula's validity range.
type Medium interface {
	// Name is how messages and tables name the medium.
	Name() string
	// Index returns the absolute refractive index (relative to vacuum) at
	// the vacuum wavelength.
	Index(vacuum units.Length) (float64, error)
}

// fixed is a medium of constant index.
type fixed struct {
	name string
	n    float64
}

func (f fixed) Name() string                        { return f.name }
func (f fixed) Index(units.Length) (float64, error) { return f.n, nil }

// Index returns a medium of constant refractive index n at every
// wavelength, named "n = 1.5168". It is what [FromParaxial] uses for a
// medium that is given no material.
func Index(n float64) Medium {
	return fixed{name: "n = " + strconv.FormatFloat(n, 'g', -1, 64), n: n}
}

// Kind is what a [Surface] does to a ray.
type Kind uint8

// The surface kinds.
const (
	// Refract: a refracting surface (Snell's law in vector form) into the
	// surface's Medium.
	Refract Kind = iota
	// Reflect: a mirror (the law of reflection); the medium continues and
	// the ray travels back along z, so the next Thickness is negative.
	Reflect
	// Stop: an opaque screen with a round opening of ClearRadius (an iris,
	// a diaphragm) on a plane; the ray's direction is unchanged.
	Stop
	// Ideal: an ideal thin lens of focal length Focal on a plane: the
	// direction tangents change as u′ = u − x/f, v′ = v − y/f, which
	// focuses a collimated beam on the axis without aberration. It stands
	// for a paraxial thin lens, which has no shape to trace.
	Ideal
)

// String returns "refract", "reflect", "stop" or "ideal lens".
func (k Kind) String() string {
	switch k {
	case Refract:
		return "refract"
	case Reflect:
		return "reflect"
	case Stop:
		return "stop"
	case Ideal:
		return "ideal lens"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// Surface is one surface of a sequential system, in the system's fixed
// frame: z is the optical axis, the light enters travelling towards +z,
// and the vertex of surface i+1 lies Thickness (signed) after the vertex
// of surface i.
//
// The surface is the conic of revolution with vertex curvature c = 1/R
// and conic constant k,
//
//	z(r) = c r² / (1 + √(1 − (1+k) c² r²)),  r² = x² + y²,
//
// a sphere for k = 0, a paraboloid for k = −1, a hyperboloid for
// k < −1, a prolate ellipsoid for −1 < k < 0 and an oblate one for k > 0
// (the usual conic form; W. T. Welford, Aberrations of Optical Systems,
// Adam Hilger 1986, §2.4 [from memory]). Only the branch through the
// vertex is traced: a ray that meets the surface only on the far branch
// (beyond a sphere's equator) has missed it.
type Surface struct {
	// Label names the surface in messages and tables (optional).
	Label string
	// Kind is what the surface does.
	Kind Kind
	// Radius is the vertex radius of curvature in metres, positive when
	// the centre of curvature lies at larger z than the vertex, in the
	// fixed frame (so after a mirror, where the light travels towards −z,
	// a surface convex towards the light has R < 0). Zero is flat.
	// Stop and Ideal surfaces are flat and must leave it zero.
	Radius units.Length
	// Conic is the conic constant k (dimensionless); zero is a sphere.
	Conic float64
	// ClearRadius is the radius of the clear aperture in metres,
	// centred on the axis; a ray that meets the surface farther from
	// the axis is blocked. Zero is unlimited (except for a Stop, which
	// needs it).
	ClearRadius units.Length
	// Focal is the focal length of an Ideal surface in metres, positive
	// for a converging lens; zero for other kinds.
	Focal units.Length
	// Medium is the medium after a Refract surface. Reflect, Stop and
	// Ideal surfaces keep the medium before them and ignore it.
	Medium Medium
	// Thickness is the signed axial distance in metres from this
	// surface's vertex to the next vertex, or, for the last surface, to
	// the image plane. Its sign follows the direction of travel: positive
	// until the first mirror, negative after it, and so on.
	Thickness units.Length
}

// name is how messages refer to surface i.
func (s Surface) name(i int) string {
	n := "surface " + strconv.Itoa(i)
	if s.Label != "" {
		n += " " + errtext.Quote(s.Label)
	}
	return n
}

// Curvature returns the vertex curvature c = 1/R in 1/m (zero for a flat
// surface).
func (s Surface) Curvature() float64 {
	if s.Radius == 0 {
		return 0
	}
	return 1 / float64(s.Radius)
}

// Sag returns the surface's z at height r from the axis, in metres,
//
//	z(r) = c r² / (1 + √(1 − (1+k) c² r²)),
//
// and false where the conic has no point at that height (beyond a
// sphere's or an ellipsoid's rim).
func (s Surface) Sag(r units.Length) (units.Length, bool) {
	c := s.Curvature()
	r2 := float64(r) * float64(r)
	d := 1 - (1+s.Conic)*c*c*r2
	if d < 0 {
		return 0, false
	}
	return units.Length(c * r2 / (1 + math.Sqrt(d))), true
}
