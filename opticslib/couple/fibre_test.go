package couple_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Marcuse's fit at the LP₁₁ cut-off: w/a = 0.65 + 1.619 V^−3/2 +
// 2.879 V^−6 (Marcuse 1977 [from memory]; the coefficients as the issue
// quotes them) is 1.09896 at V = 2.405, the "w ≈ 1.1a at cut-off" of the
// fibre literature (common practice, no single source). The digits are
// the formula's, evaluated independently with Python's float arithmetic
// to 7 places: rel 1e-6. The fit grows as V falls (w/a = 1.267387 at
// V = 2.0, 1.784024 at V = 1.5, same evaluation).
func TestMarcuseRatio(t *testing.T) {
	for _, test := range []struct{ v, want float64 }{
		{2.405, 1.0989627}, {2.0, 1.2673873}, {1.5, 1.7840237},
	} {
		if got := couple.MarcuseRatio(test.v); !scalar.EqualWithinRel(got, test.want, 1e-6) {
			t.Errorf("MarcuseRatio(%g) = %.7g, want %.7g", test.v, got, test.want)
		}
	}
	if !math.IsNaN(couple.MarcuseRatio(0)) { // documented special case, no outside reference
		t.Errorf("MarcuseRatio(0) is not NaN")
	}
}

// FibreFromCore: V = 2πa·NA/λ0 (Gloge 1971 [from memory]) and w =
// a·MarcuseRatio(V) (Marcuse 1977 [from memory]); the NA is the core's
// and enters only through V: the mode divergence λ0/(πw) (the Gaussian
// far field, Kogelnik & Li 1966) is below the NA, since w > a and
// λ0/(πa) = 2NA/V < NA for V > 2 (analytic). For a fibre of core 4.0 µm
// and NA 0.12 at 633 nm: V = 2π·2 µm·0.12/633 nm = 2.38225, w/a =
// 1.10607 (formula, evaluated in Python), MFD 4.42427 µm (rel 1e-5, the
// digits given; rel 1e-14 for V and w against the same formulas in Go,
// rounding).
func TestFibreFromCore(t *testing.T) {
	f, err := couple.FibreFromCore(4*units.Micrometer, 0.12, 633*units.Nanometer)
	if err != nil {
		t.Fatal(err)
	}
	v := 2 * math.Pi * 2e-6 * 0.12 / 633e-9
	if !scalar.EqualWithinRel(f.V, v, 1e-14) {
		t.Errorf("V = %.15g, want %.15g", f.V, v)
	}
	if want := 2e-6 * couple.MarcuseRatio(v); !scalar.EqualWithinRel(float64(f.ModeRadius), want, 1e-14) {
		t.Errorf("ModeRadius = %v, want %v", f.ModeRadius, units.Length(want))
	}
	if !scalar.EqualWithinRel(f.MFD().Micrometers(), 4.42427, 1e-5) {
		t.Errorf("MFD = %v, want 4.42427 µm", f.MFD())
	}
	if div := 633e-9 / (math.Pi * float64(f.ModeRadius)); div > 0.12 {
		t.Errorf("mode divergence %g ≥ NA", div)
	}
}

// Bad fibre input is a *ParamError naming the parameter and the value
// with its unit. A 9 µm core of NA 0.14 at 633 nm has V = 6.2534 > 2.405,
// the LP₁₁ cut-off (the first zero of J₀; Gloge 1971 [from memory]), so
// it is multimode there; the message gives the cut-off wavelength
// 2πa·NA/2.405 = 1.64603 µm above which it is single-mode. A 2 µm core
// of NA 0.05 has V = 0.4963 at 633 nm, below Marcuse's range, which ends
// at 2πa·NA/1.2 = 261.799 nm. (Values from the definitions, evaluated in
// Python, to the 6 digits the messages print.)
func TestFibreErrors(t *testing.T) {
	const lambda = 633 * units.Nanometer
	for _, test := range []struct {
		d        units.Length
		na       float64
		lambda   units.Length
		sentinel error
		texts    []string
	}{
		{9 * units.Micrometer, 0.14, lambda, couple.ErrNotSingleMode, []string{
			"couple: fibre: V-number 2πa·NA/λ0 = 6.2534", "core 9 µm, NA 0.14 at λ0 = 633 nm",
			"single-mode only above the cut-off wavelength 2πa·NA/2.405 = 1.64603 µm", "above the LP11 cut-off 2.405"}},
		{2 * units.Micrometer, 0.05, lambda, couple.ErrOutsideFit, []string{
			"V-number 2πa·NA/λ0 = 0.4963", "at λ0 = 633 nm", "the fit holds up to λ0 = 2πa·NA/1.2 = 261.799 nm", "below 1.2"}},
		{-1 * units.Micrometer, 0.1, lambda, nil, []string{"couple: fibre: core diameter = -1 µm: must be positive and finite"}},
		{units.Length(math.NaN()), 0.1, lambda, nil, []string{"couple: fibre: core diameter = NaN m"}},
		{4 * units.Micrometer, 1.2, lambda, nil, []string{"couple: fibre: core numerical aperture NA = 1.2: must lie between 0 and 1"}},
		{4 * units.Micrometer, 1, lambda, nil, []string{"core numerical aperture NA = 1: must lie between 0 and 1"}},
		{4 * units.Micrometer, 0, lambda, nil, []string{"core numerical aperture NA = 0: must lie between 0 and 1"}},
		{4 * units.Micrometer, -0.1, lambda, nil, []string{"core numerical aperture NA = -0.1"}},
		{4 * units.Micrometer, math.NaN(), lambda, nil, []string{"core numerical aperture NA = NaN"}},
		{4 * units.Micrometer, 0.12, 0, nil, []string{"couple: fibre: vacuum wavelength λ0 = 0 m: must be positive and finite"}},
		{4 * units.Micrometer, 0.12, units.Length(math.Inf(1)), nil, []string{"vacuum wavelength λ0 = +Inf m"}},
	} {
		_, err := couple.FibreFromCore(test.d, test.na, test.lambda)
		var pe *couple.ParamError
		if !errors.As(err, &pe) || (test.sentinel != nil && !errors.Is(err, test.sentinel)) {
			t.Errorf("FibreFromCore(%v, %g, %v) error = %v, want a *ParamError wrapping %v", test.d, test.na, test.lambda, err, test.sentinel)
			continue
		}
		for _, text := range test.texts {
			if !strings.Contains(err.Error(), text) {
				t.Errorf("FibreFromCore(%v, %g, %v) error = %q, want it to contain %q", test.d, test.na, test.lambda, err, text)
			}
		}
	}
	for _, test := range []struct {
		mfd, lambda units.Length
		want        string
	}{
		{-5 * units.Micrometer, 1550 * units.Nanometer, "couple: fibre: mode-field diameter MFD = -5 µm: must be positive and finite"},
		{0, 1550 * units.Nanometer, "couple: fibre: mode-field diameter MFD = 0 m: must be positive and finite"},
		{units.Length(math.NaN()), 1550 * units.Nanometer, "couple: fibre: mode-field diameter MFD = NaN m: must be positive and finite"},
		{10 * units.Micrometer, units.Length(math.NaN()), "couple: fibre: vacuum wavelength λ0 = NaN m: must be positive and finite"},
		{10 * units.Micrometer, -1550 * units.Nanometer, "couple: fibre: vacuum wavelength λ0 = -1.55 µm: must be positive and finite"},
	} {
		var pe *couple.ParamError
		if _, err := couple.FibreFromMFD(test.mfd, test.lambda); !errors.As(err, &pe) || err.Error() != test.want {
			t.Errorf("FibreFromMFD(%v, %v) error = %v, want %q", test.mfd, test.lambda, err, test.want)
		}
	}
}

// Coupling a beam at the fibre face: a beam whose waist equals the mode
// couples 1, and with an offset R40's exp(−d²/w²); a beam with a waist
// radius 20 % large couples the size mismatch 4·1.2²/(1 + 1.2²)² =
// 0.96816 (R13 with Δz = 0). Rel 1e-12.
func TestFibreCouple(t *testing.T) {
	const lambda = 1550 * units.Nanometer
	f, err := couple.FibreFromMFD(10.4*units.Micrometer, lambda)
	if err != nil {
		t.Fatal(err)
	}
	w := f.ModeRadius
	fc, err := f.Couple(waist(t, w, 0, lambda, 1), couple.Misalignment{DX: 2 * units.Micrometer})
	if err != nil {
		t.Fatal(err)
	}
	if want := math.Exp(-4e-12 / float64(w*w)); !scalar.EqualWithinRel(fc.Efficiency, want, 1e-12) {
		t.Errorf("Couple(matched, d = 2 µm) = %.15g, want %.15g", fc.Efficiency, want)
	}
	fc, err = f.Couple(waist(t, 1.2*w, 0, lambda, 1), couple.Misalignment{})
	if err != nil {
		t.Fatal(err)
	}
	if want := 4 * 1.44 / (2.44 * 2.44); !scalar.EqualWithinRel(fc.Efficiency, want, 1e-12) {
		t.Errorf("Couple(1.2 w) = %.15g, want %.15g", fc.Efficiency, want)
	}
	tb := fc.Table() // presentation only, no outside reference
	if err := tb.Validate(); err != nil || len(tb.Rows) < 10 || !strings.Contains(tb.Text(), "1 dB offset tolerance") {
		t.Errorf("FibreCoupling.Table() = %v (err %v)", tb.Text(), err)
	}
	// Modes of different wavelengths have no overlap at one plane (the
	// overlap integral needs one k); the package refuses them.
	if _, err := f.Couple(waist(t, w, 0, 1310*units.Nanometer, 1), couple.Misalignment{}); !errors.Is(err, couple.ErrMismatch) {
		t.Errorf("Couple at 1310 nm into a 1550 nm fibre: error = %v, want ErrMismatch", err)
	}
}
