package polar_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Bad user data returns a *ParamError naming the function, the parameter
// and the value with its unit; never a panic or a NaN. The wording is the
// project's own (internal/errtext).
func TestParamErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	x := polar.Jones{X: 1}
	for _, test := range []struct {
		name string
		call func() error
		want string
		is   error
	}{
		{"Polarizer NaN", func() error { _, err := polar.Polarizer(units.Angle(nan)); return err },
			"polar: Polarizer: transmission axis θ = NaN° (NaN rad): must be finite", nil},
		{"PartialPolarizer ER < 1", func() error { _, err := polar.PartialPolarizer(0, 0.001); return err },
			"polar: PartialPolarizer: extinction ratio Tmax/Tmin = 0.001: must be ≥ 1 (Tmax/Tmin, for example 1000 for 1000:1; +Inf for an ideal part); a ratio given as Tmin/Tmax is its reciprocal, 1/0.001", nil},
		{"PartialPolarizer NaN", func() error { _, err := polar.PartialPolarizer(0, nan); return err }, "extinction ratio Tmax/Tmin = NaN", nil},
		{"PartialPolarizer Inf angle", func() error { _, err := polar.PartialPolarizer(units.Angle(inf), 10); return err }, "transmission axis θ = +Inf°", nil},
		{"Retarder", func() error { _, err := polar.Retarder(0, units.Angle(inf)); return err }, "polar: Retarder: retardance Γ = +Inf° (+Inf rad): must be finite", nil},
		{"HalfWave", func() error { _, err := polar.HalfWave(units.Angle(nan)); return err }, "polar: HalfWave: fast axis θ = NaN°", nil},
		{"QuarterWave", func() error { _, err := polar.QuarterWave(units.Angle(-inf)); return err }, "polar: QuarterWave: fast axis θ = -Inf°", nil},
		{"Rotator", func() error { _, err := polar.Rotator(units.Angle(nan)); return err }, "polar: Rotator: rotation ρ = NaN°", nil},
		{"Faraday direction", func() error { _, err := polar.FaradayRotator(1, 0); return err }, "polar: FaradayRotator: direction = 0: must be Forward or Backward", nil},
		{"PBS", func() error { _, err := polar.PolarizingBeamSplitter(inf, 0.5); return err }, "polar: PolarizingBeamSplitter: reflected extinction ratio Rs/Rp = 0.5: must be ≥ 1", nil},
		{"Interface n1 0", func() error { _, err := polar.Interface(0, 1.5, 0); return err }, "polar: Interface: index n1 = 0: must be positive and finite", nil},
		{"Interface n2 < 0", func() error { _, err := polar.Interface(1, -1.5, 0); return err }, "polar: Interface: index n2 = -1.5: must be positive and finite", nil},
		{"Interface angle", func() error { _, err := polar.Interface(1, 1.5, 90*units.Degree); return err }, "polar: Interface: angle of incidence θi = 90° (1.5708 rad): must be in [0°, 90°)", nil},
		{"Interface negative angle", func() error { _, err := polar.Interface(1, 1.5, -units.Degree); return err }, "angle of incidence θi = -1°", nil},
		{"Brewster", func() error { _, err := polar.Brewster(1, nan); return err }, "polar: Brewster: index n2 = NaN: must be positive and finite", nil},
		{"CriticalAngle", func() error { _, err := polar.CriticalAngle(1.5, 1.5); return err }, "polar: CriticalAngle: index n2 = 1.5: must be below n1 = 1.5 for total internal reflection", nil},
		{"Linear power", func() error { _, err := polar.Linear(0, -1); return err }, "polar: Elliptical: power P = -1: must be non-negative and finite", nil},
		{"Circular handedness", func() error { _, err := polar.Circular(7, 1); return err }, "polar: Circular: handedness = 7: must be Right or Left", nil},
		{"Trace no light", func() error { _, err := polar.Trace(polar.Jones{}); return err }, "polar: Trace: input = ((0+0i), (0+0i)): must carry light: no light (zero power)", polar.ErrNoLight},
		{"Trace NaN input", func() error { _, err := polar.Trace(polar.Jones{X: complex(nan, 0)}); return err }, "input = ((NaN+0i), (0+0i)): components must be finite", nil},
		{"Trace bad element", func() error {
			_, err := polar.Trace(x, polar.Element{Name: "W1", Matrix: polar.JonesMatrix{XX: complex(inf, 0)}})
			return err
		}, `polar: Trace: element "W1" = (+Inf+0i): entries must be finite`, nil},
		{"HalfWaveForSplit f", func() error { _, err := polar.HalfWaveForSplit(x, 1.2); return err }, "polar: HalfWaveForSplit: fraction along x f = 1.2: must be in [0, 1]", nil},
		{"HalfWaveForAzimuth NaN", func() error { _, err := polar.HalfWaveForAzimuth(x, units.Angle(nan)); return err }, "wanted azimuth ψ' = NaN°", nil},
		{"QuarterWaveForCircular dark", func() error { _, err := polar.QuarterWaveForCircular(polar.Jones{}, polar.Right); return err }, "no light", polar.ErrNoLight},
		{"QuarterWaveForCircular h", func() error { _, err := polar.QuarterWaveForCircular(x, 0); return err }, "handedness = 0: must be Right or Left", nil},
		{"PlateForMaxPower Γ", func() error { _, err := polar.PlateForMaxPower(x, units.Angle(nan), polar.Identity()); return err }, "polar: PlateForMaxPower: retardance Γ = NaN°", nil},
		{"PlateForMinPower after", func() error {
			_, err := polar.PlateForMinPower(x, 1, polar.JonesMatrix{YY: complex(nan, 0)})
			return err
		}, "polar: PlateForMinPower: following elements = (NaN+0i): entries must be finite", nil},
		{"Stokes", func() error { return polar.Stokes{S0: -1}.Validate() }, "polar: Stokes: power S0 = -1: must be non-negative", nil},
		{"Stokes NaN", func() error { return polar.Stokes{S0: 1, S2: nan}.Validate() }, "polar: Stokes: parameters = (1, 0, NaN, 0): must be finite", nil},
	} {
		err := test.call()
		var pe *polar.ParamError
		if !errors.As(err, &pe) {
			t.Errorf("%s: error = %v, want a *polar.ParamError", test.name, err)
			continue
		}
		if !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: error = %q, want it to contain %q", test.name, err.Error(), test.want)
		}
		if test.is != nil && !errors.Is(err, test.is) {
			t.Errorf("%s: error = %v, want errors.Is %v", test.name, err, test.is)
		}
	}
}

// Valid but extreme inputs give finite results: the element functions
// and Interface never return NaN for data they accept.
func TestNoSilentNaN(t *testing.T) {
	finite := func(m polar.JonesMatrix) bool {
		for _, z := range []complex128{m.XX, m.XY, m.YX, m.YY} {
			if math.IsNaN(real(z)) || math.IsNaN(imag(z)) || math.IsInf(real(z), 0) || math.IsInf(imag(z), 0) {
				return false
			}
		}
		return true
	}
	for _, a := range []units.Angle{0, 1e-300, 1e15, -1e15, math.MaxFloat64} {
		for _, f := range []func(units.Angle) (polar.JonesMatrix, error){polar.Polarizer, polar.HalfWave, polar.QuarterWave, polar.Rotator} {
			m, err := f(a)
			if err != nil || !finite(m) {
				t.Errorf("element(%g rad) = %v, %v, want a finite matrix", float64(a), m, err)
			}
		}
	}
	for _, er := range []float64{1, math.MaxFloat64, math.Inf(1)} {
		if m, err := polar.PartialPolarizer(0.3, er); err != nil || !finite(m) {
			t.Errorf("PartialPolarizer(0.3, %g) = %v, %v", er, m, err)
		}
	}
	for _, pair := range [][2]float64{{1, 1}, {1e-300, 1}, {1, 1e300}, {4, 1}, {1, 4}} {
		for _, th := range []units.Angle{0, 1e-12, 0.7, units.Angle(math.Nextafter(math.Pi/2, 0))} {
			f, err := polar.Interface(pair[0], pair[1], th)
			if err != nil {
				t.Errorf("Interface(%g, %g, %g) error %v", pair[0], pair[1], float64(th), err)
				continue
			}
			rs, rp := f.Reflectance()
			ts, tp := f.Transmittance()
			for _, v := range []float64{rs, rp, ts, tp} {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Errorf("Interface(%g, %g, %g) = R %g %g, T %g %g: not finite", pair[0], pair[1], float64(th), rs, rp, ts, tp)
				}
			}
			if !finite(f.Reflection()) || !finite(f.Transmission()) {
				t.Errorf("Interface(%g, %g, %g) Jones matrices not finite", pair[0], pair[1], float64(th))
			}
		}
	}
	if e := (polar.Jones{}).Ellipse(); e != (polar.Ellipse{}) {
		t.Errorf("Jones{}.Ellipse() = %v, want the zero Ellipse", e)
	}
}
