// Package stock holds the lenses a lab owns and searches them for the
// combinations that meet a design's goals: "which lenses from my drawer,
// at what spacings, give me this beam, and how precisely must I place
// them?"
//
// A [Stock] is read from a CSV file with our own columns and the units in
// the headers ([Read]: label, kind, f_mm or r1_mm, r2_mm and ct_mm,
// diameter_mm, material or index, count, note). Each entry is a [Lens]:
// its focal length from the thick-lens lensmaker's equation when the radii
// are given ([LensmakerFocal]), its Coddington shape factor
// ([Lens.ShapeFactor]), its clear aperture (90 % of the diameter,
// [ClearFraction]) and its paraxial models ([Lens.Thin], [Lens.Thick]).
//
// A [Search] tries every ordered pair or triple of stock lenses, each
// entry used no more often than the lab owns it, solves the spacings for
// its conditions ([Collimate], [WaistAt], [WaistSize]) and judges each
// solution against design goals ([design.Goal], [design.Problem]); the
// survivors are ranked by a score of total length, placement sensitivity,
// aperture fill and a third-order spherical-aberration estimate from
// thin-lens shape-factor theory ([SphericalSeidel]). [Result.Table] lists
// the best, [Result.RejectionTable] says why the others failed.
//
// # Conventions
//
// Lengths are metres ([units.Length]); stock files give them in the unit
// their header names. Radii follow package paraxial: R > 0 when the
// centre of curvature lies after the surface (towards +z, where the light
// goes), so a biconvex lens has R1 > 0 > R2; R1 is the front, the side
// the light meets first as the lens is listed; a flat side is
// [paraxial.Flat] (written inf in a file). Focal lengths are positive for
// converging lenses. Indices are at the helium d line (nd, 587.56 nm)
// unless the file gives another. Ray angles are slopes, positive for
// rising rays. Beam radii are 1/e² intensity radii.
//
// # Model
//
// The search puts thin lenses at the principal planes, in air, and follows
// the Gaussian beam's q parameter through them (H. Kogelnik & T. Li, Appl.
// Opt. 5, 1550 (1966)); the last spacing is solved in closed form by S. A.
// Self's thin-lens equation (Appl. Opt. 22, 658 (1983)), the first spacing
// of a triple by Brent's method ([design.Root]). Every solution is then
// built as a [paraxial.System] and judged with [design.Problem.Evaluate],
// so a candidate's targets are the design log's targets.
//
// # Errors
//
// Functions return a [*ParamError] that names the file and line, the lens,
// the condition, the goal or the bound, with the value and its unit; it
// wraps [ErrInput], [ErrNotPhysical], [ErrEmpty], [ErrBounds] or
// [ErrNoCandidate]. Nothing panics on user data. The formulas
// ([LensmakerFocal], [SphericalSeidel], …) are pure arithmetic and follow
// IEEE-754 for degenerate input.
package stock
