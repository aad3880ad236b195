// Package cavity models optical resonators built from the elements of
// package paraxial: two-mirror standing-wave cavities with optional
// intracavity elements ([Linear]) and travelling-wave ring cavities with
// curved mirrors at oblique incidence ([Ring]). For each it gives the
// stability in the tangential and sagittal planes, the Gaussian eigenmode
// at any plane of the round trip, the free spectral range, the finesse and
// linewidth from the mirror reflectivities and losses, the round-trip Gouy
// phase and the transverse-mode spacing, and the spectrum of the
// transverse modes within one FSR with the degenerate and near-degenerate
// geometries flagged.
//
// # The round trip
//
// A [Cavity] is a round trip of paraxial elements, a [paraxial.System]
// built with [paraxial.Builder] ([Cavity.Loop]), so every matrix is a
// [paraxial.Matrix] per [paraxial.Plane] and every walk along it is
// [paraxial.System.Walk]. The unfolded loop runs from a reference plane
// z = 0 to z = [Cavity.Length], the same plane reached again. A linear
// cavity's loop is M1 (at z = 0), the path from M1 to M2, M2 (at
// z = d) and the reversed path (labelled "return"); a ring's loop is the
// user's own. As in package paraxial, the plane at a position z lies just
// after any surface at z: the plane z = 0 of a linear cavity is the beam
// leaving M1.
//
// # Units and conventions
//
// Lengths are in metres ([units.Length]), the wavelength λ0 is the vacuum
// wavelength, frequencies are float64 Hz, times float64 seconds and
// phases [units.Angle] radians. Mirrors are entered as the part is
// labelled: a [Shape] (Flat, Concave, Convex) and the positive radius of
// curvature printed on it; for g-parameters a concave mirror has R > 0
// (g = 1 − d/R). Reflectivities are power reflectivities R in (0, 1].
// The beam parameter q and its sign convention are those of package beam
// (1/q = 1/R − iλ/(πw²), field ∝ exp(−ikz), H. Kogelnik & T. Li, Appl.
// Opt. 5, 1550 (1966)); the Gouy phase advances by −arg(A + B/q) through
// a matrix, positive along free space, and higher-order modes lie at
// higher frequencies. The transverse indices of TEM_mn are m in the
// tangential (x) and n in the sagittal (y) plane.
//
// # Planes
//
// Every result holds both planes, X tangential (the plane of incidence of
// tilted mirrors, the plane of a ring) and Y sagittal, as
// [beam.Astigmatic] does; they are equal for a cavity without tilted or
// cylindrical parts. A curved mirror of focal length f met at angle θ
// focuses like f·cos θ in the tangential plane and f/cos θ in the
// sagittal one (H. Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank,
// "Astigmatically compensated cavities for CW dye lasers", IEEE J. Quantum
// Electron. QE-8, 373–379 (1972) [from memory for the title]), so a ring
// or a folded cavity is astigmatic and may be stable in one plane only.
//
// # Stability and the boundary
//
// A round trip is Stable for |A + D|/2 < 1, Unstable for |A + D|/2 > 1
// and Marginal on the boundary |A + D|/2 = 1 ([Cavity.Stability]). The
// boundary cases are marginal in two different ways ([Boundary]):
//
//   - round trip ±I (the symmetric confocal cavity, g1 = g2 = 0, is −I):
//     every ray retraces itself after one or two round trips and every q
//     reproduces itself; the ABCD matrix singles out no mode;
//   - |A + D|/2 = 1 otherwise (planar g1 = g2 = 1, concentric
//     g1 = g2 = −1, hemispherical and the other g1·g2 = 0 or 1 cases):
//     rays walk off linearly with the number of round trips and the
//     Gaussian mode has an infinite (or zero) radius somewhere.
//
// # Errors and panics
//
// [Linear] and [Ring] validate the spec once and return a [*ParamError]
// naming the mirror or field, the parameter and the value with its unit
// (the message format of internal/errtext). The analyses return
// [*ParamError] values wrapping the sentinels [ErrUnstable] (no confined
// mode in a plane), [ErrDegenerate] (a ±I round trip without a chosen
// mode), [ErrNoReflectivity] and [ErrLowFinesse]; test with errors.Is.
// No result carries NaN or ±Inf. The zero Cavity is not a cavity
// ([ErrNotBuilt]). The one panic is [Spacing.Offset] with a negative mode
// index, a programming error. Nothing in the package modifies its
// arguments; the package imports neither plotting nor the kernel.
//
// # Display
//
// Results render themselves: [Cavity], [Stability], [Mode], [Airy],
// [Spacing] and [Spectrum] have a Table method returning a table.Table
// (headers with units) and a String method returning its text.
package cavity
