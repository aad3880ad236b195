// Package units provides typed physical quantities for the beamnote optics
// library: lengths and angles.
//
// # Conventions
//
// The internal length unit is the metre, for every length in the library,
// wavelengths included, so that formulas such as the Rayleigh range
//
//	zR = π w0² n / λ0
//
// need no conversion factors. A [Length] is a float64 number of metres; the
// constants [Nanometer] … [Meter] let callers write 150*units.Millimeter, in
// the way [time.Duration] lets callers write 150*time.Millisecond.
//
// An [Angle] is a float64 number of radians, with constants [Radian],
// [Milliradian], [Microradian] and [Degree].
//
// Both types follow IEEE-754 arithmetic: NaN and ±Inf pass through the
// accessors unchanged and print as "NaN m", "+Inf m" and so on.
//
// Nothing in this package panics or allocates, apart from the strings
// returned by the String methods.
package units
