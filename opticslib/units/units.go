package units

import (
	"math"
	"strconv"
)

// Length is a distance in metres.
//
// Lengths are written as a number times a unit constant:
//
//	d := 150 * units.Millimeter // 0.15 m
type Length float64

// Length units, exact by the SI definitions of the prefixes
// (BIPM, The International System of Units, 9th ed., 2019, table 7).
const (
	Nanometer  Length = 1e-9
	Micrometer Length = 1e-6
	Millimeter Length = 1e-3
	Centimeter Length = 1e-2
	Meter      Length = 1
	// Inch is 25.4 mm exactly (international yard and pound agreement,
	// 1959; NIST SP 811, 2008, appendix B), the size in which many optics
	// are sold.
	Inch Length = 25.4e-3
)

// Meters returns l as a float64 number of metres.
func (l Length) Meters() float64 { return float64(l) }

// Millimeters returns l as a float64 number of millimetres, l/1e-3 m.
func (l Length) Millimeters() float64 { return float64(l / Millimeter) }

// Micrometers returns l as a float64 number of micrometres, l/1e-6 m.
func (l Length) Micrometers() float64 { return float64(l / Micrometer) }

// Nanometers returns l as a float64 number of nanometres, l/1e-9 m.
func (l Length) Nanometers() float64 { return float64(l / Nanometer) }

// String formats l with six significant digits in the largest of the units
// m, mm, µm and nm in which its magnitude is at least 1, for example
// "150 mm", "632.8 nm", "1.2 m" and "35 µm". Lengths of 1 m or more are
// printed in metres, lengths below 1 nm in nanometres.
//
// Special cases are:
//
//	Length(0).String() = "0 m"
//	NaN and ±Inf print as "NaN m", "+Inf m" and "-Inf m"
//
// The output depends only on the value, so it is deterministic.
func (l Length) String() string {
	v := float64(l)
	a := math.Abs(v)
	switch {
	case v == 0 || math.IsNaN(v) || math.IsInf(v, 0) || a >= 1:
		return format(v, "m")
	case a >= 1e-3:
		return format(v/1e-3, "mm")
	case a >= 1e-6:
		return format(v/1e-6, "µm")
	default:
		return format(v/1e-9, "nm")
	}
}

// format prints v with six significant digits, trailing zeros removed, and
// the unit symbol after a space.
func format(v float64, unit string) string {
	if v == 0 {
		v = 0 // print -0 as 0
	}
	return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit
}

// Angle is a plane angle in radians.
//
//	a := 2 * units.Milliradian
type Angle float64

// Angle units. Degree is π/180 rad (BIPM SI Brochure, 9th ed., table 8).
const (
	Radian      Angle = 1
	Milliradian Angle = 1e-3
	Microradian Angle = 1e-6
	Degree      Angle = math.Pi / 180
)

// Radians returns a as a float64 number of radians.
func (a Angle) Radians() float64 { return float64(a) }

// Degrees returns a as a float64 number of degrees, a·180/π.
func (a Angle) Degrees() float64 { return float64(a / Degree) }

// Milliradians returns a as a float64 number of milliradians, a/1e-3 rad.
func (a Angle) Milliradians() float64 { return float64(a / Milliradian) }

// Microradians returns a as a float64 number of microradians, a/1e-6 rad.
func (a Angle) Microradians() float64 { return float64(a / Microradian) }

// String formats a with six significant digits in rad when |a| ≥ 1 rad, in
// mrad when |a| ≥ 1 mrad, and in µrad otherwise, for example "1.5708 rad",
// "25 mrad" and "402.853 µrad". Zero prints as "0 rad", and
// NaN and ±Inf as "NaN rad", "+Inf rad" and "-Inf rad".
func (a Angle) String() string {
	v := float64(a)
	m := math.Abs(v)
	switch {
	case v == 0 || math.IsNaN(v) || math.IsInf(v, 0) || m >= 1:
		return format(v, "rad")
	case m >= 1e-3:
		return format(v/1e-3, "mrad")
	default:
		return format(v/1e-6, "µrad")
	}
}
