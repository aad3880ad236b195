package paraxial

import (
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Kind identifies the type of an [Element].
type Kind int

// Element kinds.
const (
	// KindSpace is a homogeneous gap of finite length; see [Space].
	KindSpace Kind = iota
	// KindThinLens is a zero-thickness lens in one medium; see [ThinLens].
	KindThinLens
	// KindSphericalInterface is a curved refracting surface; see
	// [SphericalInterface].
	KindSphericalInterface
	// KindPlanarInterface is a flat refracting surface; see
	// [PlanarInterface].
	KindPlanarInterface
)

// String returns the lower-case name of k used in error messages, for
// example "thin lens".
func (k Kind) String() string {
	switch k {
	case KindSpace:
		return "space"
	case KindThinLens:
		return "thin lens"
	case KindSphericalInterface:
		return "spherical interface"
	case KindPlanarInterface:
		return "planar interface"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// Element is one member of a [System]: a gap or a zero-thickness surface,
// with its position and transfer matrices. Elements are created by a
// [Builder]; their fields are copies, and changing them does not change the
// System.
type Element struct {
	// Kind is the element type.
	Kind Kind
	// Label is an optional user name, set by [Builder.Label].
	Label string
	// Z is the axial position of the element's entrance, in metres from
	// the input plane. A surface sits at Z; a space runs from Z to
	// Z+Length.
	Z units.Length
	// Length is the axial length in metres: the gap length for a space,
	// zero for surfaces.
	Length units.Length
	// Focal is the focal length of a thin lens in metres (zero for other
	// kinds).
	Focal units.Length
	// Radius is the radius of curvature of a spherical interface in
	// metres, positive when the centre of curvature lies after the vertex
	// (zero for other kinds).
	Radius units.Length
	// Aperture is the clear-aperture radius in metres; zero means
	// unlimited. It is set by [Builder.Aperture] and is informational: the
	// paraxial matrices do not clip rays.
	Aperture units.Length
	// IndexIn and IndexOut are the refractive indices before and after
	// the element; they are equal for spaces and thin lenses.
	IndexIn, IndexOut float64
	// X and Y are the tangential and sagittal transfer matrices. They are
	// equal for every kind in this package.
	X, Y Matrix
}

// IsSurface reports whether e has zero thickness (every kind except
// [KindSpace]).
func (e Element) IsSurface() bool { return e.Kind != KindSpace }
