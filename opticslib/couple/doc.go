// Package couple computes how much power one Gaussian beam puts into
// another beam's mode: the mode overlap of two Gaussian beams with size,
// waist-position, lateral and angular mismatch, coupling into a
// single-mode fibre from its mode-field diameter or from Marcuse's
// V-number model, the alignment tolerances that follow, and mode matching
// with thin lenses (closed forms for one and two lenses, and a bounded
// numerical solver) that returns a [paraxial.System].
//
// # Units and conventions
//
// Lengths are in metres ([units.Length]), the wavelength λ0 is the vacuum
// wavelength, angles are radians ([units.Angle]); efficiencies are power
// fractions in [0, 1]. Beams are [beam.Gaussian] (round) or
// [beam.Astigmatic] (elliptical or simple-astigmatic, principal axes along
// x and y) values, and the q parameter has the sign convention of package
// beam: 1/q = 1/R − iλ/(πw²), field ∝ exp(−ikz) (H. Kogelnik & T. Li,
// "Laser beams and resonators", Appl. Opt. 5, 1550–1567 (1966)). A
// [Misalignment] is the lateral offset and tilt of the second beam's axis
// relative to the first one's at the common plane (the tilt pivots at that
// plane), in the medium of the beams (k = 2πn/λ0).
//
// # The overlap integral
//
// For two fields at a common plane the power coupling efficiency is
//
//	η = |∫ u1* u2 dA|² / (∫|u1|² dA · ∫|u2|² dA)
//
// (Kogelnik 1964 [from memory]; W. B. Joyce & B. C. DeLoach, "Alignment
// of Gaussian beams", Appl. Opt. 23, 4187–4196 (1984) [from memory
// for the form]). For beams whose principal axes are x and y the fields
// separate, u(x, y) = u(x)·u(y), and η = ηx·ηy. In one transverse
// direction a TEM₀₀ field is u(x) = exp(−a (x − d)² − ikθx) with
//
//	a = ik/(2q) = 1/w² + ik/(2R)
//
// and the integral is the Gaussian one, ∫exp(−Ax² + Bx + C)dx =
// √(π/A)·exp(B²/(4A) + C). With beam 2 offset by d and tilted by θ:
//
//	ηx = 2√(Re a1 Re a2)/|a1* + a2| · exp(2 Re[B²/(4A) + C]),
//	A = a1* + a2,  B = 2a2 d − ikθ,  C = −a2 d²
//
// which is exact for TEM₀₀ beams with any curvature, size, waist position,
// offset and tilt (within the paraxial model). The closed forms of the
// special cases ([AxialCoupling], [WaistPlaneCoupling]) are limits of it
// and are tested against it.
//
// # Beams with M² > 1
//
// The overlap of a TEM₀₀ mode with a beam of M² > 1 is not fixed by M²:
// different mode mixtures with the same M² couple anywhere between 0 and 1.
// The package uses one stated model, the Gaussian Schell-model beam (A.
// Starikov & E. Wolf, "Coherent-mode representation of Gaussian
// Schell-model sources and of their radiation fields", J. Opt. Soc. Am. 72,
// 923–928 (1982) [from memory]): per axis the cross-spectral density at
// the plane is
//
//	W(x1, x2) = u(x1) u*(x2) exp(−(x1 − x2)²/(2σ²)),   σ = W/√(M⁴ − 1)
//
// with u the Gaussian of the real radius W and of the beam's wavefront
// curvature (the embedded Gaussian's). This coherence width gives the
// beam's far-field divergence M² times that of a coherent Gaussian of
// radius W. It is an incoherent sum of the Hermite–Gaussian modes of the
// embedded Gaussian with weights in geometric ratio, and the fraction in
// the fundamental one, the most that any single mode can collect, is
//
//	η_max = 2/(M² + 1)   per axis
//
// The coupling into the TEM₀₀ mode t is ⟨t|W|t⟩/(tr W·⟨t|t⟩), a 2-D
// Gaussian integral evaluated in closed form. At most one of the two beams
// may have M² > 1 (a mode is TEM₀₀); [Coupling.Model] says which model a
// result used. Treat the M² > 1 values as an estimate.
//
// # Fibres
//
// A [Fibre] is described by its mode radius w = MFD/2 at the working
// wavelength, from a data sheet ([FibreFromMFD]) or from Marcuse's fit to
// the step-index LP₀₁ mode ([FibreFromCore], [MarcuseRatio]):
//
//	w/a = 0.65 + 1.619 V^(−3/2) + 2.879 V^(−6),   V = 2πa·NA/λ0
//
// (D. Marcuse, "Loss analysis of single-mode fiber splices", Bell Syst.
// Tech. J. 56, 703–718 (1977) [from memory for the form of the fit]),
// within 0.81 % of the best-overlap Gaussian radius of the exact LP₀₁
// mode for 1.2 ≤ V ≤ 2.405 (measured; see [MarcuseRatio]). Above the
// LP₁₁ cut-off V = 2.405 the fibre is multimode and [FibreFromCore]
// returns an error wrapping [ErrNotSingleMode]. The numerical aperture of
// a single-mode fibre is the core's, √(n₁² − n₂²): it enters only through
// V, never as the divergence of the mode, which is λ0/(πw). Coupling at the fibre face is the overlap of the beam with the
// mode, a waist at the face; Fresnel reflection at the face is not
// included.
//
// # Mode matching
//
// [MatchOneLens] and [MatchTwoLenses] are closed forms (one lens:
// Kogelnik's formulas; two lenses of given focal lengths at a given
// length: a 1-D root search over the first lens position with the
// one-lens formula for the second), and [Solve] maximises the overlap over
// free focal lengths, positions and the total length within bounds with
// gonum/optimize's Nelder–Mead method from several starts; with
// [Problem].MinEfficiency set, an unreachable target is an error naming
// the best efficiency and the bounds active there. Every [Match]
// carries the [paraxial.System] (input plane to target plane), so its
// caustic can be drawn with optplot.
//
// # Errors and panics
//
// Functions that take beams, fibres or problems validate them and return a
// [*ParamError] (errors.Is with the sentinels of this package, or of
// package beam) naming the parameter with its value and unit; they never
// panic on user data and never return NaN in a result. The closed forms
// [AxialCoupling], [WaistPlaneCoupling] and [MarcuseRatio]
// are pure arithmetic and return NaN for invalid input, as documented on
// each. Nothing in the package modifies its arguments.
package couple
