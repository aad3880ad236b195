// Package polar describes polarized light with Jones calculus: Jones
// vectors and matrices, the usual elements (polarizers, waveplates,
// rotators, Faraday rotators, polarizing beam splitters, Fresnel
// reflection and transmission at a dielectric interface), Stokes vectors
// and Mueller matrices for partially polarized light, a power budget
// along a chain of elements, and solvers for waveplate angles.
//
// Like the other physics packages it never imports plotting, presentation
// or the kernel; results that are worth showing ([Budget], [Fresnel])
// have a Table method that the notebook layer renders.
//
// # Frame and angles
//
// A beam is described in a right-handed frame x, y, z with z along the
// direction of travel. Angles are [units.Angle] values measured from x
// towards y: anticlockwise as seen by an observer looking into the
// oncoming beam (towards the source), with x to the right and y up. The
// axis of a polarizer, the fast axis of a waveplate, the azimuth of a
// polarization ellipse and the rotation of a rotator all use this sense.
//
// # Jones vectors, time convention and handedness
//
// A [Jones] vector (X, Y) holds the complex amplitudes of the field at a
// plane, E(t) = Re[(X x̂ + Y ŷ) e^{iωt}], so a plane wave is written
// e^{i(ωt − kz)} and a component delayed in time has a more negative
// phase. Amplitudes are power amplitudes: |X|² + |Y|² is the power of the
// beam in the caller's unit (W when the input is normalised to the power
// in W), and every element of the package keeps this, so powers are read
// off the vectors after any chain.
//
// Handedness is named as by M. Born & E. Wolf (Principles of Optics,
// §1.4.2 [from memory]) and D. H. Goldstein, Polarized Light, 3rd ed., 2011 [from
// memory]: light is right-handed when the field turns clockwise as seen
// facing the source. With the time convention above right-handed circular
// light is (1, i)/√2 and has S3 > 0, as in E. Collett, Field Guide to
// Polarization, SPIE 2005 [from memory]. A quarter-wave plate with its
// fast axis at +45° makes right-handed light from light polarized along x
// (see [Handedness], [QuarterWave]).
//
// # Composition in beam order
//
// [JonesMatrix.Then] composes in the order light meets the elements: the
// first element met is applied first, so a.Then(b).Apply(v) is
// b·(a·v), and a chain reads a.Then(b).Then(c), as paraxial.Matrix.Then
// does for ray matrices. [Trace] takes the elements in the same order and
// reports the power and state after each one.
//
// # Elements
//
// Each element is a function returning a [JonesMatrix] (and an error for
// parameters that are not finite or out of range): [Polarizer],
// [PartialPolarizer] (finite extinction ratio), [Retarder] (any
// retardance; [HalfWave] and [QuarterWave]), [Rotator] (optical
// activity), [FaradayRotator], [Mirror], [PolarizingBeamSplitter] (both
// ports), and [Interface] for the Fresnel coefficients of a dielectric
// interface, with [Fresnel.Reflection] and [Fresnel.Transmission] as
// Jones matrices, [Brewster] and [CriticalAngle].
//
// # Going back: the return frame and non-reciprocity
//
// Light coming back after a mirror at normal incidence is described in
// the return frame: x reversed, y kept, z reversed, again right-handed.
// [Mirror] maps the beam frame into it, and [JonesMatrix.Reverse] gives
// the matrix of a reciprocal element crossed backwards (Q Jᵀ Q with
// Q = diag(1, −1)). A Faraday rotator is not reciprocal: its rotation
// keeps its sense in the laboratory, so [FaradayRotator] takes the
// direction, and a double pass f.Then(Mirror()).Then(b) turns the
// polarization by twice the single-pass rotation instead of undoing it.
//
// # Stokes and Mueller
//
// [Jones.Stokes] gives the Stokes parameters of fully polarized light;
// [Stokes] also holds partially polarized light, with
// [Stokes.DegreeOfPolarization], and incoherent beams add
// ([Stokes.Add]). [JonesMatrix.Mueller] is the Mueller matrix of an
// element, M = A (J ⊗ J*) A⁻¹, so that the two calculi agree.
//
// # Solvers
//
// [HalfWaveForAzimuth], [HalfWaveForSplit] and [QuarterWaveForCircular]
// are closed forms; [PlateForMaxPower] and [PlateForMinPower] find the
// angle of any retarder before any following element with gonum/optimize.
//
// # Errors and panics
//
// Element functions, constructors ([Linear], [Circular], [Elliptical]),
// [Interface], [Trace] and the solvers validate their input and return a
// [*ParamError] that names the function, the parameter and its value in
// its unit (non-finite angles, indices ≤ 0, extinction ratios below 1,
// inputs without light), wrapping [ErrUnreachable] or [ErrNoLight] where
// that is the reason. Nothing in the package panics on user data or
// returns NaN without an error; the methods of [Jones], [JonesMatrix],
// [Stokes] and [Mueller] are pure arithmetic that follows IEEE-754 for
// values that were not validated, with their special cases documented.
// Nothing modifies its arguments, and the small types are values that do
// not allocate.
package polar
