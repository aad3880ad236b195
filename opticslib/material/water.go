package material

import (
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// IAPWS R9-97 coefficients (IAPWS, "Release on the refractive index of
// ordinary water substance as a function of wavelength, temperature and
// pressure", Erlangen, 1997, table 1 [C: the values as given in several
// independent implementations of the release]).
const (
	r997a0    = 0.244257733
	r997a1    = 9.74634476e-3
	r997a2    = -3.73234996e-3
	r997a3    = 2.68678472e-4
	r997a4    = 1.58920570e-3
	r997a5    = 2.45934259e-3
	r997a6    = 0.900704920
	r997a7    = -1.66626219e-2
	r997LUV   = 0.2292020
	r997LIR   = 5.432937
	r997Tref  = 273.15 // K
	r997Rho   = 1000   // kg/m³
	r997Lref  = 0.589  // µm
	r997Tmin  = 261.15 // K: −12 °C
	r997Tmax  = 773.15 // K: 500 °C
	r997RhoHi = 1060   // kg/m³
)

// waterCoef is the state of R9-97: reduced density and temperature.
type waterCoef struct{ rho, t float64 }

// g returns A/ρ̄ of R9-97 and its first two derivatives with respect to
// y = Λ² = (λ/λref)².
func (w waterCoef) g(y float64) (g, g1, g2 float64) {
	qu := y - r997LUV*r997LUV
	qi := y - r997LIR*r997LIR
	g = r997a0 + r997a1*w.rho + r997a2*w.t + r997a3*y*w.t + r997a4/y + r997a5/qu + r997a6/qi + r997a7*w.rho*w.rho
	g1 = r997a3*w.t - r997a4/(y*y) - r997a5/(qu*qu) - r997a6/(qi*qi)
	g2 = 2*r997a4/(y*y*y) + 2*r997a5/(qu*qu*qu) + 2*r997a6/(qi*qi*qi)
	return g, g1, g2
}

// index returns n at the vacuum wavelength l0 (µm):
// (n² − 1)/(n² + 2) = A, n² = (1 + 2A)/(1 − A).
func (w waterCoef) index(l0 float64) float64 {
	x := l0 / r997Lref
	g, _, _ := w.g(x * x)
	A := w.rho * g
	return math.Sqrt((1 + 2*A) / (1 - A))
}

// derivs returns n and its derivatives with respect to l0 (µm).
func (w waterCoef) derivs(l0 float64) (n, d1, d2 float64) {
	x := l0 / r997Lref
	y := x * x
	g, g1, g2 := w.g(y)
	A, A1, A2 := w.rho*g, w.rho*g1, w.rho*g2
	y1, y2 := 2*l0/(r997Lref*r997Lref), 2/(r997Lref*r997Lref)
	q := 1 - A
	N := (1 + 2*A) / q
	NA, NAA := 3/(q*q), 6/(q*q*q)
	N1 := NA * A1 * y1
	N2 := NAA*(A1*y1)*(A1*y1) + NA*(A2*y1*y1+A1*y2)
	return sqrtDerivs(N, N1, N2)
}

// IAPWS-IF97 region 1 (IAPWS R7-97(2012), "Revised release on the IAPWS
// industrial formulation 1997 for the thermodynamic properties of water
// and steam", table 2 [C: as given in independent implementations, and
// checked here against the release's verification table 5]).
var if97r1 = [34]struct {
	i, j int
	n    float64
}{
	{0, -2, 0.14632971213167}, {0, -1, -0.84548187169114}, {0, 0, -0.37563603672040e1},
	{0, 1, 0.33855169168385e1}, {0, 2, -0.95791963387872}, {0, 3, 0.15772038513228},
	{0, 4, -0.16616417199501e-1}, {0, 5, 0.81214629983568e-3}, {1, -9, 0.28319080123804e-3},
	{1, -7, -0.60706301565874e-3}, {1, -1, -0.18990068218419e-1}, {1, 0, -0.32529748770505e-1},
	{1, 1, -0.21841717175414e-1}, {1, 3, -0.52838357969930e-4}, {2, -3, -0.47184321073267e-3},
	{2, 0, -0.30001780793026e-3}, {2, 1, 0.47661393906987e-4}, {2, 3, -0.44141845330846e-5},
	{2, 17, -0.72694996297594e-15}, {3, -4, -0.31679644845054e-4}, {3, 0, -0.28270797985312e-5},
	{3, 6, -0.85205128120103e-9}, {4, -5, -0.22425281908000e-5}, {4, -2, -0.65171222895601e-6},
	{4, 10, -0.14341729937924e-12}, {5, -8, -0.40516996860117e-6}, {8, -11, -0.12734301741641e-8},
	{8, -6, -0.17424871230634e-9}, {21, -29, -0.68762131295531e-18}, {23, -31, 0.14478307828521e-19},
	{29, -38, 0.26335781662795e-22}, {30, -39, -0.11947622640071e-22}, {31, -40, 0.18228094581404e-23},
	{32, -41, -0.93537087292458e-25},
}

// if97Volume returns the specific volume (m³/kg) of IF97 region 1 at T
// kelvin and p pascals: v = (R T/p)·π·γπ, π = p/16.53 MPa, τ = 1386 K/T,
// γπ = Σ −nᵢ Iᵢ (7.1 − π)^(Iᵢ−1) (τ − 1.222)^Jᵢ.
func if97Volume(T, p float64) float64 {
	const R = 461.526 // J/(kg K), IF97
	pi := p / 16.53e6
	tau := 1386 / T
	var gp float64
	for _, c := range if97r1 {
		if c.i == 0 {
			continue
		}
		gp -= c.n * float64(c.i) * math.Pow(7.1-pi, float64(c.i-1)) * math.Pow(tau-1.222, float64(c.j))
	}
	return R * T / p * pi * gp
}

// if97Psat returns the saturation pressure (Pa) at T kelvin from the IF97
// region-4 equation (R7-97(2012), eq. 30 [from memory for the number],
// coefficients table 34), valid 273.15–647.096 K.
func if97Psat(T float64) float64 {
	const (
		n1  = 0.11670521452767e4
		n2  = -0.72421316703206e6
		n3  = -0.17073846940092e2
		n4  = 0.12020824702470e5
		n5  = -0.32325550322333e7
		n6  = 0.14915108613530e2
		n7  = -0.48232657361591e4
		n8  = 0.40511340542057e6
		n9  = -0.23855557567849
		n10 = 0.65017534844798e3
	)
	th := T + n9/(T-n10)
	A := th*th + n1*th + n2
	B := n3*th*th + n4*th + n5
	C := n6*th*th + n7*th + n8
	r := 2 * C / (-B + math.Sqrt(B*B-4*A*C))
	return 1e6 * r * r * r * r
}

// waterR997 returns the R9-97 material at the temperature T (K) and the
// density rho (kg/m³), without checks beyond R9-97's own ranges.
func waterR997(name string, T, rho float64) Material {
	return Material{
		name:   name,
		source: "IAPWS R9-97, \"Release on the refractive index of ordinary water substance as a function of wavelength, temperature and pressure\" (1997); density from IAPWS-IF97 region 1 (R7-97(2012))",
		kind:   kindWater,
		basis:  Absolute,
		lo:     0.2 * units.Micrometer,
		hi:     1.1 * units.Micrometer,
		w:      waterCoef{rho: rho / r997Rho, t: T / r997Tref},
	}
}

// Water returns liquid water at the temperature tempC (°C) and pressure
// (Pa) as an [Absolute] material: the IAPWS R9-97 formula for the
// Lorentz–Lorenz function,
//
//	(n² − 1)/(n² + 2)/ρ̄ = a0 + a1ρ̄ + a2T̄ + a3Λ²T̄ + a4/Λ² + a5/(Λ² − Λuv²) + a6/(Λ² − Λir²) + a7ρ̄²
//
// with ρ̄ = ρ/1000 kg m⁻³, T̄ = T/273.15 K, Λ = λ0/0.589 µm, and the
// density ρ(T, p) from the IAPWS-IF97 region-1 Gibbs equation. R9-97
// covers 0.2–1.1 µm (the validity range, vacuum wavelengths), −12 to
// 500 °C and 0–1060 kg/m³ (about 1 GPa for the liquid); IF97 region 1,
// which supplies the density, narrows the state to 0–350 °C and from the
// saturation pressure up to 100 MPa. The name is "water (t °C, p Pa)".
//
// It returns a [*Error] naming the parameter for a temperature outside
// 0–350 °C or a pressure above 100 MPa or not finite, and one wrapping
// [ErrNotLiquid] for a pressure below the saturation pressure at tempC.
func Water(tempC, pressure float64) (Material, error) {
	name := "water (" + withUnit(tempC, "°C") + ", " + withUnit(pressure, "Pa") + ")"
	if !(tempC >= 0 && tempC <= 350) {
		return Material{}, &Error{Material: name, Param: "temperature t", Value: withUnit(tempC, "°C"), Reason: "must be 0 – 350 °C (IAPWS-IF97 region 1)"}
	}
	if !(pressure > 0 && pressure <= 100e6) {
		return Material{}, &Error{Material: name, Param: "pressure p", Value: withUnit(pressure, "Pa"), Reason: "must be positive and at most 100 MPa (IAPWS-IF97 region 1)"}
	}
	T := tempC + 273.15
	if ps := if97Psat(T); pressure < ps {
		return Material{}, &Error{Material: name, Param: "pressure p", Value: withUnit(pressure, "Pa"),
			Reason: "below the saturation pressure " + withUnit(float64(float32(ps)), "Pa") + " at this temperature", Err: ErrNotLiquid}
	}
	return waterR997(name, T, 1/if97Volume(T, pressure)), nil
}

// Daimon & Masumura (2007) four-term Sellmeier coefficients for distilled
// water, n² − 1 = Σ Bᵢλ²/(λ² − Cᵢ), absolute index, vacuum wavelengths in
// µm, valid 0.182–1.129 µm [C: as distributed by the refractiveindex.info
// database, which cites M. Daimon & A. Masumura, "Measurement of the
// refractive index of distilled water from the near-infrared region to
// the ultraviolet region", Appl. Opt. 46, 3811–3820 (2007)].
var daimon = [4]struct {
	t    float64
	b, c [4]float64
}{
	{19.0, [4]float64{5.672526103e-1, 1.736581125e-1, 2.121531502e-2, 1.138493213e-1},
		[4]float64{5.085550461e-3, 1.814938654e-2, 2.617260739e-2, 1.073888649e1}},
	{20.0, [4]float64{5.684027565e-1, 1.726177391e-1, 2.086189578e-2, 1.130748688e-1},
		[4]float64{5.101829712e-3, 1.821153936e-2, 2.620722293e-2, 1.069792721e1}},
	{21.5, [4]float64{5.689093832e-1, 1.719708856e-1, 2.062501582e-2, 1.123965424e-1},
		[4]float64{5.110301794e-3, 1.825180155e-2, 2.624158904e-2, 1.067505178e1}},
	{24.0, [4]float64{5.666959820e-1, 1.731900098e-1, 2.095951857e-2, 1.125228406e-1},
		[4]float64{5.084151894e-3, 1.818488474e-2, 2.625439472e-2, 1.073842352e1}},
}

// WaterDaimonMasumura returns distilled water at tempC from the
// four-term Sellmeier fits of M. Daimon & A. Masumura, Appl. Opt. 46,
// 3811–3820 (2007): [Absolute], vacuum wavelengths 0.182–1.129 µm, at
// atmospheric pressure. The fits exist only at 19, 20, 21.5 and 24 °C; any
// other temperature is refused with a [*Error] wrapping [ErrNoData] that
// lists the four (use [Water] for other states). At 20 °C it agrees with
// [Water] at 101 325 Pa to within 1.5e-5 over 0.35–0.9 µm (within 3e-6
// over 0.4–0.8 µm) and 1.5e-4 over 0.2–1.1 µm (largest at 0.25 µm and
// 1.1 µm; see the tests).
func WaterDaimonMasumura(tempC float64) (Material, error) {
	for _, d := range daimon {
		if tempC != d.t {
			continue
		}
		name := "water (Daimon & Masumura, " + strconv.FormatFloat(d.t, 'g', -1, 64) + " °C)"
		m, err := Sellmeier(name, d.b[:], d.c[:], 0.182*units.Micrometer, 1.129*units.Micrometer, Absolute,
			"M. Daimon & A. Masumura, \"Measurement of the refractive index of distilled water from the near-infrared region to the ultraviolet region\", Appl. Opt. 46, 3811–3820 (2007)")
		if err != nil {
			panic("material: " + err.Error()) // fixed coefficients: cannot fail
		}
		return m, nil
	}
	return Material{}, &Error{Material: "water (Daimon & Masumura)", Param: "temperature t", Value: withUnit(tempC, "°C"),
		Reason: "the fits exist only at 19, 20, 21.5 and 24 °C", Err: ErrNoData}
}
