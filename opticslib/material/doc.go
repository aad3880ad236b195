// Package material gives refractive indices for the ray tracer: named
// dispersion formulas (Sellmeier, Cauchy, Ciddor air, IAPWS water), each
// a [Material] value with its validity range, its convention and its
// source.
//
// # Conventions
//
// Wavelengths are [units.Length] values in metres. Inside the formulas,
// and only there, wavelengths are in µm and Sellmeier Cᵢ in µm², as the
// sources print them.
//
// Published index data come in two conventions, which this package keeps
// apart ([Basis]):
//
//   - [RelativeToAir]: the index relative to air, as a function of the
//     wavelength in that air. Glass catalogues (Schott) and Malitson's
//     fused silica, CaF2 and sapphire fits are of this kind.
//   - [Absolute]: the index relative to vacuum, as a function of the
//     vacuum wavelength: Ciddor's air, IAPWS R9-97 water, Daimon &
//     Masumura's water, [Constant] and [Vacuum].
//
// [Material.Index] always returns the absolute index at the vacuum
// wavelength λ0, which is what the tracer needs; for a [RelativeToAir]
// formula
//
//	n_abs(λ0) = n_rel(λ_air)·n_air(λ0),   λ_air = λ0/n_air(λ0)
//
// where n_air is the formula's reference air, [ReferenceAir]: 20 °C,
// 101 325 Pa, dry, 450 ppm CO2, evaluated with Ciddor's equations. The
// temperature and pressure are those of the Schott catalogue (SCHOTT,
// TIE-29 "Refractive index and dispersion", 2016 [from memory]) and of
// Malitson's measurements at 20 °C [from memory]; dryness and the CO2
// fraction are this package's choice, as the sources do not state them.
// Mixing the conventions costs n·(n_air − 1) ≈ 4e-4 in n for a glass.
// [Material.IndexInAir] gives the catalogue convention (relative to the
// reference air, air wavelength); [Material.Abbe] uses it for the
// [RelativeToAir] formulas (absolute indices for the others), so the
// Schott nd and vd are reproduced.
//
// Derivatives ([Material.Dispersion], [Material.GroupIndex]) are
// analytic and taken with respect to the vacuum wavelength, through the
// air conversion for [RelativeToAir] formulas.
//
// # Validity ranges
//
// Each formula has the range of wavelengths over which its source fitted
// it, in the formula's convention ([Material.Range]). Outside it
// [Material.Index] still returns the formula's value with a nil error;
// [Material.CheckRange] returns a [*RangeError] that the caller shows as
// a warning (and, for air, also when the state lies outside the range
// Ciddor tested). Far outside, at the poles of a dispersion formula, the
// formula gives no real index; Index then returns an error wrapping
// [ErrNoRealIndex] rather than NaN.
//
// # Formulas and sources
//
//   - Sellmeier, n² − 1 = Σ Bᵢλ²/(λ² − Cᵢ): [Sellmeier] (Cᵢ in µm²),
//     [SellmeierFromResonances] (resonance wavelengths Lᵢ, Cᵢ = Lᵢ²).
//   - Catalogue ([ByName]): fused silica (I. H. Malitson, J. Opt. Soc. Am.
//     55, 1205 (1965)), CaF2 (Malitson, Appl. Opt. 2, 1103 (1963)),
//     sapphire o and e (Malitson & Dodge, J. Opt. Soc. Am. 62, 1405
//     (1972), coefficients from M. J. Dodge, Handbook of Laser Science and
//     Technology IV, CRC 1986), Schott N-BK7, N-SF11, F2, N-F2 (Schott
//     data sheets), air and water.
//   - Air: P. E. Ciddor, "Refractive index of air: new equations for the
//     visible and near infrared", Appl. Opt. 35, 1566–1573 (1996), with
//     temperature (°C), pressure (Pa), relative humidity (0–1) and CO2
//     (ppm): [Air], [AirOf], [AirWavelength], [VacuumWavelength].
//   - Water: IAPWS R9-97 with the density from the IAPWS-IF97 region-1
//     Gibbs equation ([Water]), and the Daimon & Masumura (2007)
//     Sellmeier fits at 19, 20, 21.5 and 24 °C ([WaterDaimonMasumura]).
//   - [ModelGlass]: a two-term Cauchy glass through (nd, vd), for the
//     visible; [Constant]: a fixed index.
//
// # Errors and panics
//
// Constructors validate their input and return a [*Error] naming the
// material, the parameter and the value with its unit; the methods of a
// Material return a [*Error] for a wavelength that is not positive and
// finite, for the zero Material ([ErrZeroMaterial]) and where the
// formula gives no real index. No function panics on user data or
// returns NaN or ±Inf with a nil error (except [Material.Abbe], which
// returns +Inf together with [ErrNoDispersion] for a non-dispersive
// medium). Index, IndexInAir, Dispersion, GroupIndex and CheckRange (when
// it returns nil) do not allocate.
package material
