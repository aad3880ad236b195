package units

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestLengthString(t *testing.T) {
	for _, test := range []struct {
		l    Length
		want string
	}{
		{150 * Millimeter, "150 mm"},
		{632.8 * Nanometer, "632.8 nm"},
		{1.2 * Meter, "1.2 m"},
		{35 * Micrometer, "35 µm"},
		{-2.5 * Centimeter, "-25 mm"},
		{0, "0 m"},
		{Length(math.Copysign(0, -1)), "0 m"},
		{1 * Millimeter, "1 mm"},
		{999 * Micrometer, "999 µm"},
		{0.5 * Nanometer, "0.5 nm"},
		{1500 * Meter, "1500 m"},
		{1e7 * Meter, "1e+07 m"},
		{Length(math.Inf(1)), "+Inf m"},
		{Length(math.Inf(-1)), "-Inf m"},
		{Length(math.NaN()), "NaN m"},
	} {
		if got := test.l.String(); got != test.want {
			t.Errorf("Length(%g).String() = %q, want %q", float64(test.l), got, test.want)
		}
	}
}

func TestLengthAccessors(t *testing.T) {
	// Exact SI prefix definitions (BIPM SI Brochure, 9th ed., 2019): the
	// conversions divide by a power of ten, so they are correct to within
	// a couple of ulps; rel 1e-15 allows for that rounding.
	const tol = 1e-15
	l := 632.8 * Nanometer
	for _, test := range []struct {
		name      string
		got, want float64
	}{
		{"Meters", l.Meters(), 632.8e-9},
		{"Millimeters", l.Millimeters(), 632.8e-6},
		{"Micrometers", l.Micrometers(), 0.6328},
		{"Nanometers", l.Nanometers(), 632.8},
		{"Centimeter", (3 * Centimeter).Millimeters(), 30},
	} {
		if !scalar.EqualWithinAbsOrRel(test.got, test.want, 0, tol) {
			t.Errorf("%s() = %.17g, want %.17g", test.name, test.got, test.want)
		}
	}
}

func TestAngle(t *testing.T) {
	// Degree = π/180 rad by definition (BIPM SI Brochure, table 8);
	// round-tripping costs at most a few ulps, hence rel 1e-15.
	const tol = 1e-15
	for _, test := range []struct {
		a       Angle
		degrees float64
		str     string
	}{
		{180 * Degree, 180, "3.14159 rad"},
		{30 * Degree, 30, "523.599 mrad"},
		{Radian, 180 / math.Pi, "1 rad"},
		{25 * Milliradian, 0.025 * 180 / math.Pi, "25 mrad"},
		{402.853 * Microradian, 402.853e-6 * 180 / math.Pi, "402.853 µrad"},
		{0, 0, "0 rad"},
		{-90 * Degree, -90, "-1.5708 rad"},
		{Angle(math.NaN()), math.NaN(), "NaN rad"},
	} {
		got := test.a.Degrees()
		if !(math.IsNaN(got) && math.IsNaN(test.degrees)) && !scalar.EqualWithinAbsOrRel(got, test.degrees, 0, tol) {
			t.Errorf("Angle(%g).Degrees() = %.17g, want %.17g", float64(test.a), got, test.degrees)
		}
		if s := test.a.String(); s != test.str {
			t.Errorf("Angle(%g).String() = %q, want %q", float64(test.a), s, test.str)
		}
	}
}

// The SI prefixes are exact powers of ten (BIPM SI Brochure, 9th ed.,
// table 7); dividing by them costs at most one rounding, hence rel 1e-15.
func TestAngleSubmultiples(t *testing.T) {
	for _, test := range []struct {
		a          Angle
		mrad, urad float64
	}{
		{25 * Milliradian, 25, 25000},
		{402.853 * Microradian, 0.402853, 402.853},
		{Radian, 1000, 1e6},
		{-2 * Degree, -2 * math.Pi / 180 * 1e3, -2 * math.Pi / 180 * 1e6},
	} {
		if got := test.a.Milliradians(); !scalar.EqualWithinAbsOrRel(got, test.mrad, 0, 1e-15) {
			t.Errorf("Angle(%g).Milliradians() = %.17g, want %.17g", float64(test.a), got, test.mrad)
		}
		if got := test.a.Microradians(); !scalar.EqualWithinAbsOrRel(got, test.urad, 0, 1e-15) {
			t.Errorf("Angle(%g).Microradians() = %.17g, want %.17g", float64(test.a), got, test.urad)
		}
	}
}
