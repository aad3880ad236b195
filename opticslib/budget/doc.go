// Package budget computes the power budget along an optical path: the power
// after every element of a [paraxial.System] for an input power, beam and
// polarization, from
//
//   - Fresnel losses of uncoated refracting surfaces (every interface where
//     the refractive index changes), at the angle of incidence the element
//     carries ([paraxial.Element.Tilt]: zero for ordinary surfaces, the
//     angle of a tilted plate's faces), with the s/p formulas of
//     [polar.Interface] applied to the beam's polarization state;
//   - stated coatings by label: an anti-reflection coating's residual
//     reflectance per surface ([Builder.AR]), a mirror's reflectance
//     ([Builder.Mirror]), a beam splitter's split ([Builder.Split]);
//   - clipping at clear apertures, the transmissions of [beam.Clipping] for
//     the input beam;
//   - polarizing elements inserted at labels as [polar.JonesMatrix] values
//     ([Builder.Insert]: a polarizer, a waveplate, a PBS port), acting on
//     the actual polarization state;
//   - stated coupling efficiencies at labels ([Builder.Coupling], for
//     example into a fibre).
//
// The result, [Budget], lists one [Row] per element where something acts
// (every surface, and spaces with a clear aperture or a statement), with
// what acted, its transmission, the power after it, the fraction of the
// input and the on-axis peak irradiance I₀ = 2P/(π wx wy) there
// ([beam.PeakIrradiance]). Its [Budget.Table] and [Budget.String] carry
// [beam.SafetyNote] in the caption, as everything that shows irradiance
// does. The figures are in package optplot (optplot.PowerBudget,
// optplot.IrradianceBudget); this package imports neither plotting nor
// the kernel.
//
// # Units
//
// Powers are in watts, irradiances in W/m² (the table prints W/cm²),
// lengths in metres (units.Length), angles in radians (units.Angle).
// Transmissions, reflectances, splits and coupling efficiencies are
// dimensionless fractions in [0, 1].
//
// # Polarization
//
// A polarized input is given by its Jones vector ([Input.Polarization];
// only its state counts, the power is [Input.Power]); the package follows
// the Jones vector through every Fresnel surface and inserted matrix, with
// amplitudes in √W so that |Ex|² + |Ey|² is the power in W (the
// convention of package polar). The zero Jones vector means unpolarized
// light: the package then follows the Stokes vector with the Mueller
// matrices of the same Jones matrices ([polar.JonesMatrix.Mueller]). At
// the first uncoated surface that is exactly the s/p average
// T = (Ts + Tp)/2 (M. Born & E. Wolf, Principles of Optics, §1.5 [from memory]); after a
// tilted surface the light is partially polarized and the next surfaces
// act on that state, not on the average again.
//
// The tangential plane of package paraxial (x, the plane in which mirrors
// and plates are tilted) is the plane of incidence, so the beam's x
// component is p and y is s at every tilted surface, the frame of
// [polar.Fresnel.Transmission]. Mirrors, coatings, clipping and couplings
// are polarization-independent power factors (their fields are scaled by
// the square root), and the path is unfolded as in package paraxial: the
// frame after a fold mirror continues the one before it. A reflection
// whose s/p phase or reflectance difference matters is entered with
// [Builder.Insert].
//
// # Order at one element
//
// At each element the effects act in this order: the clipping of its
// clear aperture (on the arriving beam), its surface (the stated coating,
// reflectance or split, or else the Fresnel transmission of an index
// change), the inserted Jones matrices in the order of the calls, and the
// coupling. A statement on a label acts on the labelled part ([paraxial.System.Part]):
// an AR coating on each of its refracting surfaces (a thin or cylindrical
// lens, which stands for two surfaces, gets (1 − R)²), a reflectance or
// split once at its first surface, inserts and couplings once after its
// last element. An element whose loss is not modelled and not stated (a
// mirror without a reflectance, a thin lens without AR, a user matrix)
// passes everything, and its row says so.
//
// # Errors and panics
//
// The [Builder] keeps the first error (a sticky error) and returns it from
// [Builder.Build]. Errors are [*ParamError] values in the library's one
// format, naming the call and its label, the parameter and the value with
// its unit:
//
//	budget: Mirror "M1" (call 2): reflectance R = 1.2: must be in [0, 1]
//
// wrapping [paraxial.ErrNoLabel] for an unknown label, [ErrConflict],
// [ErrNoSurface] or [ErrActive] where that is the reason. Nothing panics
// on user data, no result holds NaN or ±Inf, and nothing modifies its
// arguments.
package budget
