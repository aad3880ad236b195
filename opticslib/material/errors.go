package material

import (
	"errors"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Sentinel errors, wrapped by [*Error]; test for them with errors.Is.
var (
	// ErrZeroMaterial: the Material is the zero value, made by no
	// constructor of this package.
	ErrZeroMaterial = errors.New("material: zero Material (use a constructor such as ByName or Sellmeier)")
	// ErrUnknownName: [ByName] does not know the name.
	ErrUnknownName = errors.New("material: unknown material name")
	// ErrNoRealIndex: at this wavelength the formula gives n² ≤ 0 or a
	// non-finite value, as dispersion formulas do inside or next to the
	// absorption bands (the poles) that they model; there is no
	// transparent-medium index to return.
	ErrNoRealIndex = errors.New("material: the formula gives no real finite index here (absorption band of the model)")
	// ErrNoData: the formula has no coefficients for the requested state
	// (for example [WaterDaimonMasumura] at a temperature that was not
	// measured).
	ErrNoData = errors.New("material: no coefficients for this state")
	// ErrNotLiquid: the state asked of [Water] is not liquid water inside
	// IAPWS-IF97 region 1.
	ErrNotLiquid = errors.New("material: not liquid water in IAPWS-IF97 region 1")
	// ErrNoDispersion: the material's index does not change between the F
	// and C lines, so its Abbe number is infinite.
	ErrNoDispersion = errors.New("material: no dispersion (nF = nC)")
)

// Error reports invalid input or a value the formula cannot give. Its
// message has the one form of the optics packages,
//
//	material: subject: parameter = value unit: reason: cause
//
// for example
//
//	material: "N-BK7": vacuum wavelength λ0 = -500 nm: must be positive and finite
type Error struct {
	// Material is the name of the material concerned, or empty.
	Material string
	// Param names the parameter with its symbol.
	Param string
	// Value is the offending value: a units.Length for wavelengths, a
	// string carrying its unit ("150 °C", "-5 Pa") for other quantities,
	// or nil.
	Value any
	// Reason states the requirement that Value fails.
	Reason string
	// Err is a wrapped sentinel of this package, or nil.
	Err error
}

// Error implements the error interface.
func (e *Error) Error() string {
	subject := ""
	if e.Material != "" {
		subject = errtext.Quote(e.Material)
	}
	return errtext.Message("material", subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *Error) Unwrap() error { return e.Err }

// RangeError is the warning of [Material.CheckRange]: the wavelength (or,
// for air, the state of the air) lies outside the range over which the
// formula was fitted or validated. The index is still returned by
// [Material.Index]; it is an extrapolation.
type RangeError struct {
	// Material is the name of the material.
	Material string
	// Vacuum is the vacuum wavelength that was checked.
	Vacuum units.Length
	// Wavelength is the same wavelength in the formula's own convention:
	// the air wavelength for a [RelativeToAir] formula, else Vacuum.
	Wavelength units.Length
	// Lo and Hi are the formula's validity range, in the convention of
	// Basis.
	Lo, Hi units.Length
	// Basis is the formula's convention.
	Basis Basis
	// State, when not empty, says which state variable (temperature,
	// pressure, ...) lies outside the tested range; the wavelength may
	// then be inside its range.
	State string
}

// Error implements the error interface. The message names the material,
// the wavelength, whether it is a vacuum or an air wavelength, and the
// range, for example
//
//	material: "N-BK7": air wavelength 2.6 µm (vacuum 2.60071 µm) outside the formula's range 300 nm – 2.5 µm (air wavelengths): the index is extrapolated
func (e *RangeError) Error() string {
	var b []byte
	b = append(b, "material: "...)
	b = append(b, errtext.Quote(e.Material)...)
	b = append(b, ": "...)
	if e.State != "" {
		b = append(b, e.State...)
		b = append(b, ": the index is extrapolated"...)
		return string(b)
	}
	if e.Basis == RelativeToAir {
		b = append(b, "air wavelength "...)
		b = append(b, e.Wavelength.String()...)
		b = append(b, " (vacuum "...)
		b = append(b, e.Vacuum.String()...)
		b = append(b, ")"...)
	} else {
		b = append(b, "vacuum wavelength "...)
		b = append(b, e.Vacuum.String()...)
	}
	b = append(b, " outside the formula's range "...)
	b = append(b, e.Lo.String()...)
	b = append(b, " – "...)
	b = append(b, e.Hi.String()...)
	if e.Basis == RelativeToAir {
		b = append(b, " (air wavelengths)"...)
	} else {
		b = append(b, " (vacuum wavelengths)"...)
	}
	b = append(b, ": the index is extrapolated"...)
	return string(b)
}

// withUnit formats v and its unit for an [Error] Value.
func withUnit(v float64, unit string) string {
	return strconv.FormatFloat(v, 'g', -1, 64) + " " + unit
}
