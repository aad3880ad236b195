// Package paraxial models optical systems in the paraxial (first-order)
// approximation with 2×2 ray-transfer (ABCD) matrices: elements, systems,
// cardinal points, imaging, stops and pupils, and ray traces with
// vignetting flags.
//
// # Units
//
// Lengths are in metres (see package units), so a caller writes
// 150*units.Millimeter. In a [Matrix], B is in metres, C in 1/m, and A and
// D are dimensionless; powers are in 1/m (dioptres). Ray heights are
// [units.Length], ray angles [units.Angle] in radians.
//
// # Rays and angles
//
// A [Ray] is the column vector (y, θ): the height y above the axis and the
// slope angle θ ≈ dy/dz. The angles are un-reduced: θ is the geometric
// slope in the local medium, not the reduced angle n·θ. Consequently
//
//	det M = n_in / n_out
//
// for any system (A. Gerrard & J. M. Burch, Introduction to Matrix Methods
// in Optics, Wiley 1975, ch. 2 [from memory]). A system that starts and
// ends in the same medium has det M = 1. [Matrix.Reduced] converts to the
// reduced form acting on (y, n·θ), whose determinant is always 1:
//
//	A_red = A,  B_red = B/n_in,  C_red = n_out·C,  D_red = n_out·D/n_in
//
// and [MatrixFromReduced] converts back.
//
// # Order of multiplication
//
// Each element's matrix acts on the ray that the elements before it have
// delivered. A system whose N elements the light meets in the order
// 0, 1, …, N−1 therefore has the matrix
//
//	M = M_{N−1} ⋯ M₁ M₀
//
// in which the element met first stands rightmost, next to the input ray,
// and the last one leftmost. [Matrix.Then] builds the same product in the
// order of the light, since a.Then(b) is b·a:
//
//	M₀.Then(M₁).Then(M₂) … .Then(M_{N−1}) == M
//
// # Signs
//
// Light travels towards +z. Heights are positive above the axis, angles are
// positive for rays rising towards +z. A radius of curvature R is positive
// when the centre of curvature lies after the vertex (at larger z), so a
// surface that is convex towards the incoming light has R > 0, and a
// concave mirror facing the light has R < 0 (focal length f = −R/2 > 0).
// A focal length f is positive for a converging element. A flat surface is
// never written as R = 0: use [Builder.PlanarInterface] or the radius
// [Flat].
//
// # Elements and positions
//
// A [System] is an ordered list of [Element]s. Only spaces ([KindSpace])
// have axial length; every other element is a zero-thickness surface at
// one position Z with Length = 0:
//
//	kind                    length   notes
//	space                   Length   gap in one medium, Z = entrance
//	thin lens               0        f
//	spherical interface     0        R, n → n'
//	planar interface        0        n → n'; tilted inside a tilted plate
//	mirror                  0        R (0 = flat), Tilt; unfolded, z keeps increasing
//	cylindrical lens        0        f in one Plane
//	matrix                  0        user X and Y
//	diaphragm               0        Aperture (circle or slit)
//
// A thick lens ([Builder.ThickLens]) and a plane-parallel plate
// ([Builder.Plate]) are each expanded into three elements, front surface,
// a space in the glass, back surface, grouped as a [Component]; the glass
// space carries the thickness (for a tilted plate, the path length of the
// axis ray in the glass). A beam or ray can therefore be followed inside
// the glass with [System.MatrixTo] and [System.IndexAt].
//
// Positions z are measured from the input plane, z = 0, along the unfolded
// axis. Positions relative to a part need no index arithmetic:
// [System.Part] returns a labelled part's entrance and exit positions, and
// the what-if edits take labels ([System.WithSpace], [System.Move],
// [System.Replace]). Every element records the [Builder] call that added
// it ([Element.Call], [Element.Method]); messages name parts by call and
// label ([Element.Name], for example `ThickLens "L2" (call 4)`), never by
// the index of an expanded element.
//
// # Mirrors
//
// Mirrors are entered as the part is labelled: [Builder.ConcaveMirror]
// and [Builder.ConvexMirror] take the positive radius of curvature printed
// on the part, [Builder.MirrorOfFocalLength] a signed focal length (f > 0
// concave), [Builder.FlatMirror] nothing but the angle of incidence. The
// signed radius of the convention above is kept for refracting surfaces
// ([Builder.Interface], [Builder.ThickLens]) and for [Element.Radius];
// [System.Prescription] prints mirrors as concave or convex.
//
// # Clear apertures
//
// A clear aperture is an [Opening]: a circle or a slit on the part's own
// surface, possibly offset from the axis, with an optional threshold of its
// own for the clipping check. Build it from a diameter ([ClearDiameter],
// as optics, irises and pinholes are sold; [OneInchOptic],
// [HalfInchOptic]) or a radius ([ClearRadius]); the argument types keep a
// diameter from being passed as a radius. On a part met at angle θ, the
// opening limits the tangential plane to its edges × cos θ ([Opening.Limits]);
// the beam package stretches the beam's footprint by 1/cos θ instead. An
// aperture on a space is a tube, checked along its length.
//
// Focal distances (FFL, BFL), vertices and real/virtual flags refer to
// the first and last optical surface; a [KindDiaphragm] (iris, field
// mask) is not an optical surface. Zero tests on computed matrix entries
// (pupils at infinity, stop conjugate to the object) are relative to the
// size of the terms that cancel in the entry, never exact comparisons.
//
// # Tangential and sagittal planes
//
// Every element carries a tangential (X) and a sagittal (Y) matrix. They
// are equal for rotationally symmetric elements and differ for
// cylindrical lenses, mirrors and plates at an angle of incidence, and user
// matrices. Every analysis and accessor takes the [Plane] as a parameter:
// [System.Matrix](p), [System.MatrixTo](z, p), [System.Cardinal](p), …
//
// # One walk
//
// Every analysis here and in package beam walks a system in one way,
// [System.Walk] (pieces: the part of each space inside a range, each
// surface at a position in it, the input and output media beyond the
// ends), so that the rules at the boundaries of a range are the same
// everywhere.
//
// # Systems are values
//
// A [System] is immutable. What-if edits ([System.WithSpace],
// [System.Move], [System.Replace], [System.Reverse]) return a new System and
// leave the old one unchanged; a built system can be reused as a sub-assembly with
// [Builder.Append]. Methods that return slices return copies. Nothing in
// this package modifies its arguments.
//
// # Errors and panics
//
// The matrix constructors ([Space], [ThinLens], [SphericalInterface],
// [PlanarInterface], [ThickLens], [Mirror], …) and the [Matrix] methods are
// pure arithmetic: they never fail, and degenerate input follows IEEE-754
// (for example ThinLens(0) has C = -Inf). User data is validated once, by
// [Builder]: the first bad value (NaN, ±Inf, n ≤ 0, negative thickness,
// zero radius, …) is kept (a sticky error) and returned by [Builder.Build]
// as an [*ElementError] naming the builder call and its label, the
// parameter and the value with its unit (angles in degrees and radians);
// an overflow of the composed matrix (finite but extreme inputs) is an
// [*ElementError] wrapping [ErrOverflow] that names the part where it
// happened. The zero [System] is not a system: analyses and edits return
// [ErrNotBuilt] for it. An unknown [Plane] value is [ErrPlane]. Analyses return sentinel errors ([ErrEmpty], [ErrAfocal],
// [ErrNoStop], …) rather than NaN or Inf; degenerate but meaningful
// results (an afocal system, a pupil at infinity) are reported by flags
// with zero values, never by infinities. The one deliberate infinity is
// the named radius [Flat], which a [Component] reports for a plane side.
//
// Functions panic only on programmer error: an element index out of range
// in [System.Element], and a Plane value other than the two constants in
// the accessors that return no error ([System.Matrix], [Element.Matrix]).
package paraxial
