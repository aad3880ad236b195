package material_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/units"
)

// birchDowns is the updated Edlén equation of K. P. Birch & M. J. Downs,
// "An updated Edlén equation for the refractive index of air", Metrologia
// 30, 155–162 (1993), with the correction in Metrologia 31, 315–316
// (1994) [constants from memory, matching a stored implementation that
// cites the NIST Engineering Metrology Toolbox]; t in °C, p in Pa, f the
// water-vapour partial pressure in Pa, vacuum wavelength in µm.
func birchDowns(lambda, t, p, f float64) float64 {
	s := 1 / (lambda * lambda)
	ns := 1e-8 * (8342.54 + 2406147/(130-s) + 15998/(38.9-s))
	ntp := p * ns / 96095.43 * (1 + 1e-8*(0.601-0.00972*t)*p) / (1 + 0.0036610*t)
	return 1 + ntp - f*(3.7345-0.0401*s)*1e-10
}

// Ciddor (1996) at his standard dry air (15 °C, 101 325 Pa, 450 ppm) is
// his dry-air dispersion equation unchanged: the density ratio is 1 and
// the CO2 factor 1, an identity of the formula (rel 1e-15).
func TestCiddorStandardAir(t *testing.T) {
	m, err := material.AirOf(material.StandardAir())
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range []float64{0.3, 0.5, 0.633, 1.0, 1.6} {
		s := 1 / (l * l)
		want := 1 + 1e-8*(5792105/(238.0185-s)+167917/(57.362-s))
		got, err := m.Index(units.Length(l) * um)
		if err != nil || !scalar.EqualWithinRel(got, want, 1e-15) {
			t.Errorf("standard air Index(%g µm) = %.15f, %v, want %.15f", l, got, err, want)
		}
	}
}

// NIST Engineering Metrology Toolbox, Ciddor calculator: 633 nm, 20 °C,
// 101.325 kPa, dry, 450 ppm gives n = 1.000271800 [from memory; the
// computed value agrees to 2e-10, which supports the recollection].
// Tolerance 1e-9, one unit of the ninth decimal as remembered.
func TestCiddorNIST(t *testing.T) {
	m, _ := material.AirOf(material.ReferenceAir())
	got, err := m.Index(633 * nm)
	if err != nil || !scalar.EqualWithinAbs(got, 1.000271800, 1e-9) {
		t.Errorf("reference air Index(633 nm) = %.10f, %v, want 1.000271800", got, err)
	}
}

// Ciddor against Birch & Downs (1993/94): Ciddor (1996) reports that the
// two agree to about 1e-8 in the visible near standard conditions [from
// memory]. Found here: dry air at 15–25 °C, 101 325 Pa, 0.4–0.7 µm agree
// within 2.7e-9 (tolerance 5e-9); with 50 % humidity at 20 °C within
// 2e-8 (the water-vapour terms differ most; tolerance 2e-8).
func TestCiddorBirchDowns(t *testing.T) {
	for _, test := range []struct {
		a   material.Air
		tol float64
	}{
		{material.Air{Temperature: 15, Pressure: 101325, CO2: 450}, 5e-9},
		{material.Air{Temperature: 20, Pressure: 101325, CO2: 450}, 5e-9},
		{material.Air{Temperature: 25, Pressure: 101325, CO2: 450}, 5e-9},
		{material.Air{Temperature: 20, Pressure: 101325, RelativeHumidity: 0.5, CO2: 450}, 2e-8},
	} {
		m, err := material.AirOf(test.a)
		if err != nil {
			t.Fatal(err)
		}
		// Water-vapour partial pressure for Birch & Downs, from the
		// same saturation pressure and enhancement factor as Ciddor's
		// mole fraction: f = x_w·p.
		f := 0.0
		if test.a.RelativeHumidity > 0 {
			T := test.a.Temperature + 273.15
			svp := math.Exp(1.2378847e-5*T*T - 1.9121316e-2*T + 33.93711047 - 6.3431645e3/T)
			f = test.a.RelativeHumidity * svp * (1.00062 + 3.14e-8*test.a.Pressure + 5.6e-7*test.a.Temperature*test.a.Temperature)
		}
		for _, l := range []float64{0.4, 0.5, 0.6328, 0.7} {
			got, _ := m.Index(units.Length(l) * um)
			want := birchDowns(l, test.a.Temperature, test.a.Pressure, f)
			if !scalar.EqualWithinAbs(got, want, test.tol) {
				t.Errorf("%s at %g µm: Ciddor %.10f, Birch–Downs %.10f, difference %.2e > %.0e", m.Name(), l, got, want, got-want, test.tol)
			}
		}
	}
}

// Vacuum ↔ air wavelength conversion: the round trip returns the
// wavelength to rel 1e-15 (a few ulp; the fixed point converges to the
// last bit), and λ0 − λ_air = λ_air(n − 1) ≈ 0.172 nm at 633 nm.
func TestAirWavelengthRoundTrip(t *testing.T) {
	for _, a := range []material.Air{material.ReferenceAir(), {Temperature: 30, Pressure: 90e3, RelativeHumidity: 0.8, CO2: 800}} {
		for _, l := range []units.Length{300 * nm, 633 * nm, 1550 * nm} {
			la, err := material.AirWavelength(l, a)
			if err != nil {
				t.Fatal(err)
			}
			back, err := material.VacuumWavelength(la, a)
			if err != nil || !scalar.EqualWithinRel(float64(back), float64(l), 1e-15) {
				t.Errorf("VacuumWavelength(AirWavelength(%v)) = %.17g, %v", l, float64(back), err)
			}
		}
	}
	la, _ := material.AirWavelength(633*nm, material.ReferenceAir())
	if d := (633*nm - la).Nanometers(); !scalar.EqualWithinAbs(d, 0.172, 0.001) {
		t.Errorf("λ0 − λ_air at 633 nm = %.4f nm, want 0.172 nm", d)
	}
}

// AirOf validates each field and names it with its value and unit.
func TestAirOfErrors(t *testing.T) {
	base := material.ReferenceAir()
	for _, test := range []struct {
		mod  func(*material.Air)
		want string
	}{
		{func(a *material.Air) { a.Temperature = -300 }, "temperature t = -300 °C"},
		{func(a *material.Air) { a.Temperature = math.NaN() }, "temperature t = NaN °C"},
		{func(a *material.Air) { a.Pressure = 0 }, "pressure p = 0 Pa"},
		{func(a *material.Air) { a.RelativeHumidity = 1.5 }, "relative humidity h = 1.5"},
		{func(a *material.Air) { a.CO2 = -1 }, "CO2 fraction x_c = -1 ppm"},
		{func(a *material.Air) { a.Temperature, a.RelativeHumidity = 120, 1 }, "water boils"},
	} {
		a := base
		test.mod(&a)
		_, err := material.AirOf(a)
		var e *material.Error
		if !errors.As(err, &e) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("AirOf(%+v) error = %v, want *Error containing %q", a, err, test.want)
		}
	}
	// Physical but outside Ciddor's tested range: accepted, and
	// CheckRange warns naming the field.
	m, err := material.AirOf(material.Air{Temperature: 20, Pressure: 60e3, CO2: 450})
	if err != nil {
		t.Fatal(err)
	}
	var re *material.RangeError
	if err := m.CheckRange(633 * nm); !errors.As(err, &re) || !strings.Contains(err.Error(), "pressure p = 60000 Pa") {
		t.Errorf("CheckRange at 60 kPa = %v, want a *RangeError naming the pressure", err)
	}
}
