package paraxial

import (
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Kind identifies the type of an [Element] or of a [Component].
//
// The element kinds (KindSpace … KindPlanarInterface, KindMirror,
// KindCylindricalLens, KindMatrix, KindDiaphragm) occur in [System.Elements]. Only
// KindSpace has a nonzero axial length; every other element kind is a
// zero-thickness surface with Length = 0 located at Z.
//
// KindThickLens and KindPlate name components: the [Builder] expands a
// thick lens or a plate into surface, glass space, surface, so they never
// appear as the Kind of an element; they appear in [Component.Kind] and in
// the [*ElementError] of a rejected thick lens or plate.
//
// New kinds are appended; the values are stable.
type Kind int

// Element and component kinds.
const (
	// KindSpace is a homogeneous gap of finite length; see [Space].
	// Z is its entrance, Length ≥ 0 its axial length.
	KindSpace Kind = iota
	// KindThinLens is a zero-thickness lens in one medium; see [ThinLens].
	KindThinLens
	// KindSphericalInterface is a curved refracting surface; see
	// [SphericalInterface].
	KindSphericalInterface
	// KindPlanarInterface is a flat refracting surface; see
	// [PlanarInterface]. Inside a tilted plate its Tilt is nonzero and X
	// and Y differ (see [TiltedPlanarInterface]).
	KindPlanarInterface
	// KindMirror is a flat or curved mirror, possibly at an angle of
	// incidence, in the unfolded representation; see [Mirror]. Zero
	// length; X and Y differ when Tilt ≠ 0.
	KindMirror
	// KindCylindricalLens is a thin lens with power in one plane only;
	// see [CylindricalLens]. Zero length; X and Y differ.
	KindCylindricalLens
	// KindMatrix is a user-supplied pair of matrices of zero length, see
	// [Builder.Matrix].
	KindMatrix
	// KindThickLens names a thick-lens component (two surfaces and the
	// glass between them); see [Builder.ThickLens].
	KindThickLens
	// KindPlate names a plane-parallel plate component; see
	// [Builder.Plate].
	KindPlate
	// KindDiaphragm is an opaque screen with an opening (an iris, a field
	// diaphragm, a pinhole or a slit) of zero length; its matrices are the
	// identity and its Aperture is the opening. See [Builder.Diaphragm].
	KindDiaphragm
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
	case KindMirror:
		return "mirror"
	case KindCylindricalLens:
		return "cylindrical lens"
	case KindMatrix:
		return "matrix"
	case KindThickLens:
		return "thick lens"
	case KindPlate:
		return "plate"
	case KindDiaphragm:
		return "diaphragm"
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// Plane selects one of the two principal planes of an astigmatic system.
// The tangential plane (X) is the plane of incidence of tilted mirrors and
// plates; the sagittal plane (Y) is perpendicular to it. For a
// rotationally symmetric system they coincide.
//
// Only the two constants below are valid. The builder and the analyses
// reject other values with an error wrapping [ErrPlane]; the accessors
// that cannot return an error ([System.Matrix], [Element.Matrix]) panic on
// them, as on any other programming error.
type Plane int

// The two planes.
const (
	// Tangential is the x plane, the plane of incidence.
	Tangential Plane = iota
	// Sagittal is the y plane.
	Sagittal
)

// String returns "tangential" or "sagittal".
func (p Plane) String() string {
	switch p {
	case Tangential:
		return "tangential"
	case Sagittal:
		return "sagittal"
	}
	return "Plane(" + strconv.Itoa(int(p)) + ")"
}

func (p Plane) valid() bool { return p == Tangential || p == Sagittal }

// mustPlane panics on a Plane value other than the two constants.
func mustPlane(p Plane) {
	if !p.valid() {
		panic("paraxial: " + p.String() + " is neither Tangential nor Sagittal")
	}
}

// Element is one member of a [System]: a gap or a zero-thickness surface,
// with its position and transfer matrices. Elements are created by a
// [Builder]; their fields are copies, and changing them does not change the
// System.
//
// # Axial extent
//
// Only spaces have length. Every other kind sits at one plane Z with
// Length = 0. A thick lens or a plate is three elements (front surface,
// a space in glass, back surface) grouped as a [Component]; a tilted
// plate's space has the geometric path length inside the glass along the
// axis ray. Positions Z are path lengths along the (unfolded) optical axis:
// a mirror does not reverse z.
type Element struct {
	// Kind is the element type.
	Kind Kind
	// lim holds Aperture.Limits in each plane, computed when the system is
	// assembled, for the ray traces (next to Kind and Z, which the traces
	// read too).
	lim [2]limit
	// Label is an optional user name, set by [Builder.Label].
	Label string
	// Z is the axial position of the element's entrance, in metres from
	// the input plane. A surface sits at Z; a space runs from Z to
	// Z+Length.
	Z units.Length
	// Length is the axial length in metres: the gap length for a space,
	// zero for every other kind.
	Length units.Length
	// Focal is the focal length in metres of a thin or cylindrical lens,
	// and of a curved mirror at normal incidence (f = −R/2, positive for
	// a concave mirror); zero for other kinds and for flat mirrors.
	Focal units.Length
	// Radius is the radius of curvature of a spherical interface or a
	// curved mirror in metres, positive when the centre of curvature lies
	// after the vertex (so a concave mirror facing the light has R < 0);
	// zero for other kinds and for flat mirrors.
	Radius units.Length
	// Tilt is the angle of incidence of the axis ray on a mirror or on a
	// surface of a tilted plate, in radians; zero otherwise.
	Tilt units.Angle
	// Plane is the plane in which a cylindrical lens has power; zero
	// (Tangential) for other kinds.
	Plane Plane
	// Aperture is the clear aperture (the zero value is unlimited), a
	// shape on the part's own surface, set by [Builder.Aperture] or
	// [Builder.Diaphragm]. On a space it is a tube checked along the whole
	// gap. The matrices do not clip rays; [System.Trace] flags rays beyond
	// it, [System.Stops] uses it to find the stop, and beam.Clipping
	// computes the power it passes.
	Aperture Opening
	// Call is the number of the [Builder] call that added the element,
	// counted from 1, and Method the name of that call ("ThickLens"); the
	// three elements of a thick lens share one call. Error messages name
	// elements by call and label, never by element index.
	Call   int
	Method string
	// IndexIn and IndexOut are the refractive indices before and after
	// the element; they are equal for every kind except interfaces.
	IndexIn, IndexOut float64
	// X and Y are the tangential and sagittal transfer matrices. They
	// differ for cylindrical lenses, tilted mirrors, tilted-plate surfaces
	// and user matrices given with different planes.
	X, Y Matrix
}

// limit is the interval of transverse positions an opening passes in one
// plane, widened by the tie margin; ok is false when it does not limit.
type limit struct {
	lo, hi float64
	ok     bool
}

// IsSurface reports whether e has zero thickness (every kind except
// [KindSpace]).
func (e Element) IsSurface() bool { return e.Kind != KindSpace }

// Matrix returns the element's transfer matrix in plane p (X for
// Tangential, Y for Sagittal). It panics if p is not one of the two
// planes.
func (e Element) Matrix(p Plane) Matrix {
	mustPlane(p)
	return e.matrix(p)
}

// matrix returns the element matrix in plane p, reading any value other
// than Sagittal as Tangential (callers have validated p).
func (e Element) matrix(p Plane) Matrix {
	if p == Sagittal {
		return e.Y
	}
	return e.X
}

// Name returns how messages and tables refer to e: its label in quotes
// and the builder call, for example `ThickLens "L2" (call 4)`, or the
// call alone, `Space (call 5)`, when it has no label.
func (e Element) Name() string {
	return callName(e.Method, e.Label, e.Call, e.Kind)
}

// callName is the subject of a message about builder call n of method m
// with label l; kind k stands in for a method of elements not made by a
// builder call.
func callName(m, l string, n int, k Kind) string {
	s := m
	if s == "" {
		s = k.String()
	}
	if l != "" {
		s += " " + errtext.Quote(l)
	}
	if n > 0 {
		s += " (call " + strconv.Itoa(n) + ")"
	}
	return s
}

// Concave reports whether e is a concave (converging) mirror: a mirror
// with positive focal length.
func (e Element) Concave() bool { return e.Kind == KindMirror && e.Focal > 0 }

// Convex reports whether e is a convex (diverging) mirror.
func (e Element) Convex() bool { return e.Kind == KindMirror && e.Focal < 0 }

// Component is a group of consecutive elements added by one builder call
// that form one physical part: a thick lens or a plate. It is described by
// the fields below; the elements are Elements()[First : Last+1].
type Component struct {
	// Kind is KindThickLens or KindPlate.
	Kind Kind
	// Label is the label given with [Builder.Label], or "".
	Label string
	// First and Last are the indices of the front surface and the back
	// surface; the glass space is First+1.
	First, Last int
	// Z is the position of the front vertex and Length the path length
	// of the axis ray inside the glass, in metres (Z and Length of the
	// glass space).
	Z, Length units.Length
	// Thickness is the centre thickness measured along the surface
	// normal, in metres; it equals Length except for a tilted plate.
	Thickness units.Length
	// R1 and R2 are the front and back radii in metres (sign convention
	// of the package); ±Inf for a flat surface, see [Flat].
	R1, R2 units.Length
	// Index is the refractive index of the glass.
	Index float64
	// Tilt is the angle of incidence on a tilted plate, in radians.
	Tilt units.Angle
	// Aperture is the clear aperture of the front surface.
	Aperture Opening
}
