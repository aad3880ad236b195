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
	if !math.IsNaN(couple.MarcuseRatio(0)) {
		t.Errorf("MarcuseRatio(0) is not NaN")
	}
}

// FibreFromCore: V = 2πa·NA/λ0 and w = a·MarcuseRatio(V); the NA is the
// core's and enters only through V: the mode divergence λ0/(πw) is well
// below the NA. For a fibre of core 4.0 µm and NA 0.12 at 633 nm: V =
// 2π·2 µm·0.12/633 nm = 2.38225, w/a = 1.10607 (formula, evaluated in
// Python), MFD 4.42427 µm (rel 1e-5, the digits given).
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
	for _, test := range []struct {
		d        units.Length
		na       float64
		sentinel error
		text     string
	}{
		{9 * units.Micrometer, 0.14, couple.ErrNotSingleMode, "V-number 2πa·NA/λ0 = 6.25"},
		{2 * units.Micrometer, 0.05, couple.ErrOutsideFit, "V-number"},
		{-1 * units.Micrometer, 0.1, nil, "couple: fibre: core diameter = -1 µm: must be positive and finite"},
		{4 * units.Micrometer, 1.2, nil, "core numerical aperture NA = 1.2"},
	} {
		_, err := couple.FibreFromCore(test.d, test.na, 633*units.Nanometer)
		if err == nil || (test.sentinel != nil && !errors.Is(err, test.sentinel)) || !strings.Contains(err.Error(), test.text) {
			t.Errorf("FibreFromCore(%v, %g) error = %v, want %q (wrapping %v)", test.d, test.na, err, test.text, test.sentinel)
		}
	}
	if _, err := couple.FibreFromMFD(-5*units.Micrometer, 1550*units.Nanometer); err == nil ||
		err.Error() != "couple: fibre: mode-field diameter MFD = -5 µm: must be positive and finite" {
		t.Errorf("FibreFromMFD(−5 µm) error = %v", err)
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
	tb := fc.Table()
	if err := tb.Validate(); err != nil || len(tb.Rows) < 10 || !strings.Contains(tb.Text(), "1 dB offset tolerance") {
		t.Errorf("FibreCoupling.Table() = %v (err %v)", tb.Text(), err)
	}
	if _, err := f.Couple(waist(t, w, 0, 1310*units.Nanometer, 1), couple.Misalignment{}); !errors.Is(err, couple.ErrMismatch) {
		t.Errorf("Couple at 1310 nm into a 1550 nm fibre: error = %v, want ErrMismatch", err)
	}
}
