// Package paraxial models rotationally symmetric optical systems in the
// paraxial (first-order) approximation with 2×2 ray-transfer (ABCD) matrices.
//
// # Units
//
// Lengths are in metres (see package units). In a [Matrix], B is in metres,
// C in 1/m, and A and D are dimensionless. Ray heights are [units.Length],
// ray angles are [units.Angle] in radians.
//
// # Rays and angles
//
// A [Ray] is the column vector (y, θ): the height y above the axis and the
// slope angle θ ≈ dy/dz. The angles are un-reduced: θ is the geometric slope
// in the local medium, not the reduced angle n·θ. Consequently
//
//	det M = n_in / n_out
//
// for any system (A. Gerrard & J. M. Burch, Introduction to Matrix Methods
// in Optics, Wiley 1975, ch. 2 [from memory]). A system that starts and ends
// in the same medium has det M = 1.
//
// # Signs
//
// Light travels towards +z. Heights are positive above the axis, angles are
// positive for rays rising towards +z. A radius of curvature R is positive
// when the centre of curvature lies after the vertex (at larger z), so a
// surface that is convex towards the incoming light has R > 0. A focal
// length f is positive for a converging lens.
//
// # Elements and positions
//
// A [System] is an ordered list of [Element]s: free-space gaps ([KindSpace])
// with a length, and zero-thickness surfaces (thin lenses, spherical and
// planar interfaces) located at an axial position. Elements are numbered
// from 0 in the order they were added to the [Builder]; error messages use
// the same numbering. Positions z are measured from the input plane, z = 0.
// Every element carries a tangential (X) and a sagittal (Y) matrix; they are
// equal for the rotationally symmetric elements of this package, and are
// kept separate so that astigmatic elements can be added later.
// [System.Matrix] and [System.MatrixTo] return the tangential (X) matrices.
//
// # Errors and panics
//
// The element constructors ([Space], [ThinLens], [SphericalInterface],
// [PlanarInterface]) and the [Matrix] methods are pure arithmetic: they never
// fail, and degenerate input follows IEEE-754 (for example ThinLens(0) has
// C = -Inf). User data is validated once, by [Builder]: the first bad value
// is kept (a sticky error) and returned by [Builder.Build] as an
// [*ElementError] naming the element index, kind, parameter and value.
// Functions panic only on programmer error: [System.Element] with an index
// out of range.
//
// Nothing in this package modifies its arguments. A [System] is immutable;
// methods that return slices return copies.
package paraxial
