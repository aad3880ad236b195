package cavity

import (
	"errors"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
)

// Sentinel errors, wrapped by [*ParamError]; test for them with errors.Is.
var (
	// ErrUnstable: the round trip has no confined Gaussian mode in a
	// plane. Either |A + D|/2 > 1 (unstable: rays walk off exponentially)
	// or |A + D|/2 = 1 with a round-trip matrix other than ±I (on the
	// stability boundary: planar, concentric, hemispherical, where the
	// mode's radius is infinite or zero somewhere).
	ErrUnstable = errors.New("cavity: no confined Gaussian mode (unstable or on the stability boundary)")
	// ErrDegenerate: the round-trip matrix is −I or +I, so every q
	// reproduces itself after one round trip and the ABCD matrix does not
	// fix a mode (the quadratic C q² + (D − A) q − B = 0 reads 0 = 0).
	// The package chooses a mode only for the symmetric confocal
	// two-mirror cavity (see [Cavity.Eigenmode]).
	ErrDegenerate = errors.New("cavity: degenerate round trip (±I): every q reproduces itself")
	// ErrNoReflectivity: the loss analysis needs mirror reflectivities
	// and none were given.
	ErrNoReflectivity = errors.New("cavity: no mirror reflectivities given")
	// ErrLowFinesse: the round-trip amplitude factor ρ is below
	// 3 − 2√2 ≈ 0.172, so the Airy function never falls to half its peak
	// between resonances and has no full width at half maximum.
	ErrLowFinesse = errors.New("cavity: the Airy function does not fall to half its peak between resonances")
	// ErrNotBuilt: the zero Cavity value, which no constructor made.
	ErrNotBuilt = errors.New("cavity: not built (the zero Cavity value); use Linear or Ring and check the error")
)

// ParamError reports an invalid cavity parameter or an analysis that
// cannot be done. Its message names the mirror, part or plane, the
// parameter and the value with its unit:
//
//	cavity: mirror "M1": radius of curvature R = -500 mm: must be positive and finite (the number printed on the part; the Shape says concave or convex, Flat for a plane mirror)
//	cavity: tangential plane: half-trace (A + D)/2 = 3.5: |A + D|/2 > 1: unstable: no confined Gaussian mode (unstable or on the stability boundary)
type ParamError struct {
	// Subject names where the problem is: a mirror (`mirror "M1"`), a
	// part, a plane ("tangential plane") or a spec field; "" if none.
	Subject string
	// Param names the parameter with its symbol, for example
	// "reflectivity R".
	Param string
	// Value is the offending value in SI units (a units.Length, a
	// units.Angle, a float64, an int, a string) or nil.
	Value any
	// Reason states the requirement that Value fails, or what was found.
	Reason string
	// Err is a wrapped sentinel of this package or of package paraxial
	// or beam, or nil.
	Err error
}

// Error implements the error interface.
func (e *ParamError) Error() string {
	return errtext.Message("cavity", e.Subject, e.Param, e.Value, e.Reason, e.Err)
}

// Unwrap returns e.Err.
func (e *ParamError) Unwrap() error { return e.Err }
