// Package beam propagates Gaussian beams (TEM₀₀, embedded-Gaussian M²
// beams, elliptical and simple-astigmatic beams) through paraxial optical
// systems with the complex beam parameter q and the ABCD law, and checks
// clear apertures and irradiance along the path.
//
// # Units
//
// Lengths are in metres (see package units), including the wavelength. The
// wavelength stored in a [Gaussian] is the vacuum wavelength λ0; the
// wavelength in a medium of refractive index n is λ = λ0/n. Angles are in
// radians.
//
// # The q parameter and its sign convention
//
// For a field written with the propagation factor exp(−ikz) (H. Kogelnik &
// T. Li, "Laser beams and resonators", Appl. Opt. 5, 1550–1567 (1966)), the
// beam parameter is defined by
//
//	1/q = 1/R − i λ/(π w²),   λ = λ0/n
//
// and in a homogeneous medium
//
//	q = z + i zR,   zR = π w0² n/λ0
//
// where z is the signed distance from the waist to the plane (z > 0 past
// the waist, where the beam diverges and R > 0) and zR is the Rayleigh
// range. Im q = zR > 0 for every physical beam.
//
// # The ABCD law and refractive index
//
// With the un-reduced ray angles of package paraxial (det M = n1/n2), q as
// defined above transforms directly as
//
//	q2 = (A q1 + B)/(C q1 + D)
//
// Derivation: in reduced form the ray vector is (y, nθ), the reduced matrix
// is  = A, B̂ = B/n1, Ĉ = n2·C, D̂ = n2·D/n1 (det = 1), and the invariant
// beam parameter is q̂ = q/n (A. E. Siegman, Lasers, 1986, ch. 20 [from
// memory]). Substituting,
//
//	(Â q̂1 + B̂)/(Ĉ q̂1 + D̂) = (A q1 + B)/(n2 (C q1 + D)) = q2/n2
//
// so q/n obeys the reduced law exactly when q obeys the un-reduced one. A
// planar interface n1 → n2 ([paraxial.PlanarInterface]) therefore maps q to
// q·n2/n1: the radius w is unchanged, and zR and R both scale by n2/n1.
//
// # Gouy phase
//
// The on-axis Gouy phase relative to the waist is ψ = arctan(z/zR). Through
// a general ABCD system it advances by −arg(A + B/q1) (Siegman, Lasers,
// ch. 20 [from memory]); this is additive over cascaded elements, and the
// package accumulates it element by element so that it is not reduced
// modulo 2π.
//
// # M² beams
//
// A beam with propagation ratio M² > 1 is treated as an embedded Gaussian
// (A. E. Siegman, Proc. SPIE 1224, 2 (1990) [from memory]): q is the
// parameter of the embedded TEM₀₀ beam and obeys the ABCD law unchanged,
// and every radius is M = √M² times the embedded one. Equivalently, the
// TEM₀₀ formulas hold with the effective wavelength M²λ0, for example
// zR = πW0²n/(M²λ0). See [Gaussian.WithM2].
//
// # Astigmatic beams and systems
//
// Every [paraxial.Element] has a tangential (X) and a sagittal (Y) matrix.
// An [Astigmatic] beam holds an independent Gaussian for each, and the
// system functions ([AtXY], [Waists], [Sample], [Extremes], [Clipping])
// take an [Input]: a [Gaussian] for a round beam, or an [Astigmatic] one.
// The x part follows the X matrices and the y part the Y matrices, which
// is what cylindrical lenses and mirrors used off normal incidence need.
// [At] returns a single Gaussian and refuses ([ErrAstigmaticSystem]) a
// plane where the two matrices differ.
//
// # Clipping, irradiance and laser safety
//
// [Clipping] checks every clear aperture of a system: the fraction of the
// power a centred beam passes ([Transmission]: 1 − exp(−2a²/w²) for a
// round beam and a centred circle; closed forms for slits; quadrature for
// offset and elliptical cases), with the footprint of the beam on a tilted
// part stretched by 1/cos θ, tubes checked along their length, and a flag
// below a threshold (default 99 %, or the opening's own for a pinhole or
// slit meant to clip). [Caustic.Irradiance] gives the on-axis peak
// irradiance 2P/(π wx wy) along the path and its exact maximum. Wherever
// irradiance or focused power is shown, show [SafetyNote] with it: these
// are beam-optics estimates, never exposure limits or a safety clearance;
// local laser-safety rules and the responsible laser safety officer
// decide.
//
// # Constructors
//
// Beams are entered with a spec whose fields say what each number is:
// [FromWaist] with a [WaistSpec] (waist radius or diameter, waist position,
// vacuum wavelength, M², medium index), [FromWaists] for elliptical and
// astigmatic beams, [FromProfile] with a [ProfileSpec] for a beam measured
// at one plane. WaistZ is the waist's position relative to the plane where
// the beam is given, positive when the waist lies after it.
// [Gaussian.WithM2] keeps the waist radius and position and changes the
// Rayleigh range. [Gaussian.HalfDivergence] is the half-angle θ = M²λ/(πw0)
// and [Gaussian.FullDivergence] the full angle 2θ that ISO 11146-1 quotes.
// The constructors reject beams beyond [MaxDivergence] (the paraxial
// range).
//
// # Errors and panics
//
// Constructors ([FromWaist], [FromWaists], [FromProfile], [FromQ], [Gaussian.WithM2])
// and the system functions ([At], [AtXY], [Waists], [Sample],
// [SampleRange], [Extremes], [Clipping], [Caustic.Irradiance]) validate
// their input and return a [*ParamError] or a sentinel error; they never panic on user data and never
// return NaN or ±Inf in a result, except the documented +Inf radius of
// curvature exactly at a waist. The methods of [Gaussian] are pure
// arithmetic and follow IEEE-754 for a Gaussian that was not validated.
// Nothing in the package modifies its arguments.
package beam
