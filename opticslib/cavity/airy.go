package cavity

import "math"

// Airy is the longitudinal resonance of a cavity: the Airy function of the
// circulating (and transmitted) intensity against the round-trip phase δ,
//
//	I(δ) ∝ 1/|1 − ρ e^{iδ}|² = 1/[(1 − ρ)² (1 + F sin²(δ/2))]
//
// with the round-trip amplitude factor ρ = √(R1 R2 ⋯ (1 − loss)) and the
// coefficient of finesse F = 4ρ/(1 − ρ)² (M. Born & E. Wolf, Principles
// of Optics, §7.6 [from memory for the section]; for two mirrors of
// equal R, ρ = R and these are the textbook Fabry–Perot formulas of
// reference-checks R20).
type Airy struct {
	// FSR is the free spectral range in Hz ([Cavity.FSR]).
	FSR float64
	// RoundTripPower is ρ² = R1 R2 ⋯ (1 − loss), the fraction of the
	// circulating power left after one round trip.
	RoundTripPower float64
	// RoundTripAmplitude is ρ, the magnitude of the round-trip amplitude
	// factor (the product of the mirrors' amplitude reflectivities r = √R
	// and √(1 − loss)).
	RoundTripAmplitude float64
	// CoefficientOfFinesse is F = 4ρ/(1 − ρ)².
	CoefficientOfFinesse float64
	// Finesse is FSR/FWHM of the exact Airy function:
	//
	//	𝓕 = 2π/Δδ = π / (2 arcsin((1 − ρ)/(2√ρ))),   Δδ = 4 arcsin(1/√F)
	//
	// Δδ being the full width at half maximum in round-trip phase
	// (2 arcsin(1/√F) in the single-pass phase δ/2). For R1 = R2 = 0.9 it
	// is 29.789956 (reference-checks R20).
	Finesse float64
	// FinesseApprox is the common approximation
	//
	//	𝓕 ≈ π√ρ/(1 − ρ)
	//
	// (π(R1R2)^{1/4}/(1 − √(R1R2)) for two mirrors; 29.803765 for
	// R = 0.9), which overestimates the finesse by about (1 − ρ)²/(24ρ)
	// relative: 5e-4 at ρ = 0.9, 4e-8 at ρ = 0.999.
	FinesseApprox float64
	// Linewidth is the FWHM of the resonances in Hz, FSR/Finesse (exact
	// Airy width).
	Linewidth float64
	// PhotonLifetime is the 1/e decay time of the stored energy in
	// seconds, the round-trip time over the round-trip loss coefficient:
	//
	//	τ = t_rt / δ_c,   t_rt = 1/FSR,   δ_c = −ln(ρ²)
	//
	// (A. E. Siegman, Lasers, 1986, ch. 11 [from memory]). For ρ → 1,
	// 2π τ · Linewidth → 1.
	PhotonLifetime float64
	// Contrast is I_min/I_max = ((1 − ρ)/(1 + ρ))² = 1/(1 + F), the
	// off-resonance level of the Airy function (T_min of a lossless
	// symmetric etalon).
	Contrast float64
}

// Airy returns the resonance of c from the mirror reflectivities and the
// round-trip loss of its spec. Quantities near ρ = 1 are formed from
// ln ρ² = Σ ln Rᵢ + ln(1 − loss) with expm1 and log1p, so that 1 − ρ
// keeps its relative accuracy however good the mirrors are.
//
// It returns [ErrNotBuilt] for the zero Cavity, a [*ParamError] wrapping
// [ErrNoReflectivity] when no reflectivities were given, one for a
// lossless cavity (ρ = 1, infinite finesse), and, for ρ < 3 − 2√2, one
// wrapping [ErrLowFinesse] together with the Airy value without Finesse
// and Linewidth (the other fields are still meaningful).
func (c Cavity) Airy() (Airy, error) {
	if err := c.check(); err != nil {
		return Airy{}, err
	}
	if !c.haveR {
		return Airy{}, &ParamError{Param: "mirror reflectivities", Reason: "give Reflectivity for the mirrors to compute the finesse", Err: ErrNoReflectivity}
	}
	if c.lnP >= 0 {
		return Airy{}, &ParamError{Param: "round-trip power factor ρ²", Value: 1.0, Reason: "a lossless cavity (every R = 1, no loss) has an infinite finesse: give the mirror transmissions or a round-trip loss"}
	}
	a := Airy{FSR: c.FSR(), RoundTripPower: math.Exp(c.lnP), RoundTripAmplitude: math.Exp(c.lnP / 2)}
	rho := a.RoundTripAmplitude
	omr := -math.Expm1(c.lnP / 2) // 1 − ρ
	x := omr / (2 * math.Sqrt(rho))
	a.CoefficientOfFinesse = 1 / (x * x)
	a.FinesseApprox = math.Pi * math.Sqrt(rho) / omr
	a.PhotonLifetime = 1 / (a.FSR * -c.lnP)
	r := omr / (1 + rho)
	a.Contrast = r * r
	if x > 1 {
		return a, &ParamError{Param: "round-trip amplitude factor ρ", Value: rho, Reason: "is below 3 − 2√2 ≈ 0.1716", Err: ErrLowFinesse}
	}
	a.Finesse = math.Pi / (2 * math.Asin(x))
	a.Linewidth = a.FSR / a.Finesse
	return a, nil
}
