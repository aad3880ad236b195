package material

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Air is the state of moist air for Ciddor's formula.
type Air struct {
	// Temperature t in degrees Celsius (°C); T = t + 273.15 K.
	Temperature float64
	// Pressure p, total pressure in pascals (Pa).
	Pressure float64
	// RelativeHumidity h as a fraction, 0 (dry) to 1 (saturated).
	RelativeHumidity float64
	// CO2 is the carbon-dioxide mole fraction x_c in ppm (µmol/mol).
	CO2 float64
}

// ReferenceAir returns the air to which the [RelativeToAir] formulas of
// this package (Schott glasses, Malitson silica, CaF2, sapphire, and
// [ModelGlass]) are referred: 20 °C, 101 325 Pa, dry, 450 ppm CO2. The
// temperature and pressure are those of the Schott catalogue (SCHOTT,
// TIE-29 "Refractive index and dispersion", 2016 [from memory]) and of
// Malitson's measurements at 20 °C [from memory]; dry air and 450 ppm are
// this package's choice, since the sources do not state them (humidity
// of 50 % would change n_air by about −1e-8 and so n_abs of a glass by
// about 1.5e-8).
func ReferenceAir() Air {
	return Air{Temperature: 20, Pressure: 101325, RelativeHumidity: 0, CO2: 450}
}

// StandardAir returns Ciddor's standard dry air: 15 °C, 101 325 Pa, dry,
// 450 ppm CO2 (P. E. Ciddor, "Refractive index of air: new equations for
// the visible and near infrared", Appl. Opt. 35, 1566–1573 (1996)), in
// which his dry-air dispersion equation holds as it stands.
func StandardAir() Air {
	return Air{Temperature: 15, Pressure: 101325, RelativeHumidity: 0, CO2: 450}
}

// Validate returns a [*Error] naming the field, its value and unit when a
// field is not physical: a temperature at or below −273.15 °C or not
// finite, a pressure not positive and finite, a relative humidity outside
// 0–1, a CO2 fraction outside 0–1e6 ppm, or humid air whose water-vapour
// mole fraction reaches 1 (boiling). States that are physical but outside
// the range Ciddor tested are accepted; [Material.CheckRange] warns about
// them.
func (a Air) Validate() error {
	switch {
	case !(a.Temperature > -273.15) || math.IsInf(a.Temperature, 1):
		return &Error{Material: "air", Param: "temperature t", Value: withUnit(a.Temperature, "°C"), Reason: "must be above −273.15 °C and finite"}
	case !(a.Pressure > 0) || math.IsInf(a.Pressure, 1):
		return &Error{Material: "air", Param: "pressure p", Value: withUnit(a.Pressure, "Pa"), Reason: "must be positive and finite"}
	case !(a.RelativeHumidity >= 0 && a.RelativeHumidity <= 1):
		return &Error{Material: "air", Param: "relative humidity h", Value: withUnit(a.RelativeHumidity, "(fraction)"), Reason: "must be between 0 and 1"}
	case !(a.CO2 >= 0 && a.CO2 <= 1e6):
		return &Error{Material: "air", Param: "CO2 fraction x_c", Value: withUnit(a.CO2, "ppm"), Reason: "must be between 0 and 1e6 ppm"}
	}
	if xw := a.vapourFraction(); !(xw < 1) {
		return &Error{Material: "air", Param: "relative humidity h", Value: withUnit(a.RelativeHumidity, "(fraction)"),
			Reason: "gives a water-vapour mole fraction of 1 or more at this temperature and pressure (the water boils)"}
	}
	return nil
}

// outsideTested names the first field outside the ranges over which
// Ciddor (1996) states the formula is valid: −40 to +100 °C, 80–120 kPa,
// 0–100 % humidity, 0–2000 ppm CO2 [from memory], or returns "".
func (a Air) outsideTested() string {
	switch {
	case a.Temperature < -40 || a.Temperature > 100:
		return "temperature t = " + withUnit(a.Temperature, "°C") + " outside Ciddor's tested range −40 °C – 100 °C"
	case a.Pressure < 80e3 || a.Pressure > 120e3:
		return "pressure p = " + withUnit(a.Pressure, "Pa") + " outside Ciddor's tested range 80 kPa – 120 kPa"
	case a.CO2 > 2000:
		return "CO2 fraction x_c = " + withUnit(a.CO2, "ppm") + " outside Ciddor's tested range 0 – 2000 ppm"
	}
	return ""
}

// Ciddor (1996) constants, section 2 and appendix A [C: the values as
// printed in many implementations of the paper; equation numbers from
// memory].
const (
	ciddorK0 = 238.0185 // µm⁻²
	ciddorK1 = 5792105  // µm⁻²
	ciddorK2 = 57.362   // µm⁻²
	ciddorK3 = 167917   // µm⁻²
	ciddorW0 = 295.235  // µm⁻⁰
	ciddorW1 = 2.6422   // µm²
	ciddorW2 = -0.032380
	ciddorW3 = 0.004028
	ciddorCF = 1.022

	gasR  = 8.314510 // J/(mol K), as in Ciddor
	molMw = 0.018015 // kg/mol, water
)

// svp is the saturation vapour pressure over water in Pa at T kelvin
// (Ciddor 1996, appendix, from the BIPM 1981/91 density formula).
func svp(T float64) float64 {
	const (
		A = 1.2378847e-5
		B = -1.9121316e-2
		C = 33.93711047
		D = -6.3431645e3
	)
	return math.Exp(A*T*T + B*T + C + D/T)
}

// compressibility returns Z of moist air (BIPM 1981/91, as in Ciddor 1996).
func compressibility(p, T, xw float64) float64 {
	const (
		a0 = 1.58123e-6
		a1 = -2.9331e-8
		a2 = 1.1043e-10
		b0 = 5.707e-6
		b1 = -2.051e-8
		c0 = 1.9898e-4
		c1 = -2.376e-6
		d  = 1.83e-11
		e  = -0.765e-8
	)
	t := T - 273.15
	pt := p / T
	return 1 - pt*(a0+a1*t+a2*t*t+(b0+b1*t)*xw+(c0+c1*t)*xw*xw) + pt*pt*(d+e*xw*xw)
}

// vapourFraction returns the mole fraction of water vapour x_w.
func (a Air) vapourFraction() float64 {
	if a.RelativeHumidity == 0 {
		return 0
	}
	const (
		alpha = 1.00062
		beta  = 3.14e-8
		gamma = 5.6e-7
	)
	t := a.Temperature
	f := alpha + beta*a.Pressure + gamma*t*t
	return f * a.RelativeHumidity * svp(t+273.15) / a.Pressure
}

// airCoef holds the two wavelength-independent factors of Ciddor's
// formula for one state:
//
//	n − 1 = 1e-8·[ra·(k1/(k0 − σ²) + k3/(k2 − σ²)) + rw·cf·(w0 + w1σ² + w2σ⁴ + w3σ⁶)]
//
// with ra = (ρ_a/ρ_axs)·(1 + 0.534e-6(x_c − 450)) and rw = ρ_w/ρ_ws.
type airCoef struct{ ra, rw float64 }

// coef computes Ciddor's density ratios for the state a (assumed valid).
func (a Air) coef() airCoef {
	T := a.Temperature + 273.15
	xw := a.vapourFraction()
	ma := 1e-3 * (28.9635 + 12.011e-6*(a.CO2-400)) // kg/mol, dry air with x_c
	// Standard dry air (15 °C, 101 325 Pa) and standard water vapour
	// (20 °C, 1333 Pa).
	rhoAxs := 101325 * ma / (compressibility(101325, 288.15, 0) * gasR * 288.15)
	rhoWs := 1333 * molMw / (compressibility(1333, 293.15, 1) * gasR * 293.15)
	Z := compressibility(a.Pressure, T, xw)
	rhoA := a.Pressure * ma * (1 - xw) / (Z * gasR * T)
	rhoW := a.Pressure * molMw * xw / (Z * gasR * T)
	return airCoef{
		ra: rhoA / rhoAxs * (1 + 0.534e-6*(a.CO2-450)),
		rw: rhoW / rhoWs,
	}
}

// index returns n_air at the vacuum wavelength l0 in µm.
func (c airCoef) index(l0 float64) float64 {
	s := 1 / (l0 * l0)
	dry := ciddorK1/(ciddorK0-s) + ciddorK3/(ciddorK2-s)
	wv := ciddorCF * (ciddorW0 + s*(ciddorW1+s*(ciddorW2+s*ciddorW3)))
	return 1 + 1e-8*(c.ra*dry+c.rw*wv)
}

// derivs returns n_air and its derivatives with respect to l0 (µm).
func (c airCoef) derivs(l0 float64) (n, d1, d2 float64) {
	s := 1 / (l0 * l0)
	s1 := -2 / (l0 * l0 * l0)
	s2 := 6 / (l0 * l0 * l0 * l0)
	q0, q2 := ciddorK0-s, ciddorK2-s
	f := c.ra*(ciddorK1/q0+ciddorK3/q2) + c.rw*ciddorCF*(ciddorW0+s*(ciddorW1+s*(ciddorW2+s*ciddorW3)))
	f1 := c.ra*(ciddorK1/(q0*q0)+ciddorK3/(q2*q2)) + c.rw*ciddorCF*(ciddorW1+s*(2*ciddorW2+3*s*ciddorW3))
	f2 := c.ra*(2*ciddorK1/(q0*q0*q0)+2*ciddorK3/(q2*q2*q2)) + c.rw*ciddorCF*(2*ciddorW2+6*s*ciddorW3)
	return 1 + 1e-8*f, 1e-8 * f1 * s1, 1e-8 * (f2*s1*s1 + f1*s2)
}

// vacuum returns the vacuum wavelength (µm) whose wavelength in this air
// is la (µm): the fixed point of λ0 = la·n(λ0).
func (c airCoef) vacuum(la float64) float64 {
	l0 := la * c.index(la)
	for range 3 {
		l0 = la * c.index(l0)
	}
	return l0
}

// referenceAir holds Ciddor's factors of [ReferenceAir].
var referenceAir = ReferenceAir().coef()

// AirOf returns moist air of the state a as an [Absolute] material
// following Ciddor (1996), valid for vacuum wavelengths 0.3–1.69 µm
// (Ciddor's stated range [from memory]; 1.69 µm is the limit quoted with
// the formula's dispersion data). The name is "air (t °C, p Pa, h %, x_c
// ppm)". It returns the error of [Air.Validate].
func AirOf(a Air) (Material, error) {
	if err := a.Validate(); err != nil {
		return Material{}, err
	}
	return Material{
		name:   "air (" + withUnit(a.Temperature, "°C") + ", " + withUnit(a.Pressure, "Pa") + ", " + withUnit(100*a.RelativeHumidity, "%") + " RH, " + withUnit(a.CO2, "ppm") + " CO2)",
		source: "P. E. Ciddor, \"Refractive index of air: new equations for the visible and near infrared\", Appl. Opt. 35, 1566–1573 (1996)",
		kind:   kindAir,
		basis:  Absolute,
		lo:     0.3 * units.Micrometer,
		hi:     1.69 * units.Micrometer,
		ref:    a.coef(),
		state:  a,
	}, nil
}

// AirWavelength returns the wavelength in the air a of light of vacuum
// wavelength λ0: λ_air = λ0/n_air(λ0) (Ciddor 1996). It returns a
// [*Error] for an invalid wavelength or air state.
func AirWavelength(vacuum units.Length, a Air) (units.Length, error) {
	m, err := AirOf(a)
	if err != nil {
		return 0, err
	}
	n, err := m.Index(vacuum)
	if err != nil {
		return 0, err
	}
	return units.Length(float64(vacuum) / n), nil
}

// VacuumWavelength returns the vacuum wavelength λ0 of light whose
// wavelength in the air a is λ_air: the solution of λ0 = λ_air·n_air(λ0),
// found by fixed-point iteration (each step gains a factor
// |d ln n/d ln λ| ≈ 1e-6, so four steps reach the last bit). It is the
// inverse of [AirWavelength] to rounding. It returns a [*Error] for an
// invalid wavelength or air state.
func VacuumWavelength(air units.Length, a Air) (units.Length, error) {
	m, err := AirOf(a)
	if err != nil {
		return 0, err
	}
	if err := m.checkWavelength(air, "air wavelength λ"); err != nil {
		return 0, err
	}
	l0 := m.ref.vacuum(float64(air / units.Micrometer))
	if math.IsNaN(l0) || math.IsInf(l0, 0) || !(l0 > 0) {
		return 0, m.noIndex(air)
	}
	return units.Length(l0) * units.Micrometer, nil
}
