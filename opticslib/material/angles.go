package material

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// CriticalAngle returns the angle of incidence, inside the denser medium
// of index n1, beyond which light is totally reflected at the interface
// with the medium of index n2 < n1 (Snell's law with the refracted ray at
// grazing exit):
//
//	θc = asin(n2/n1)
//
// It returns a [*Error] when the indices are not positive and finite, or
// when n2 ≥ n1 (no total internal reflection).
func CriticalAngle(n1, n2 float64) (units.Angle, error) {
	if !(n1 > 0) || math.IsInf(n1, 1) {
		return 0, &Error{Param: "index n1", Value: n1, Reason: "must be positive and finite"}
	}
	if !(n2 > 0) || math.IsInf(n2, 1) {
		return 0, &Error{Param: "index n2", Value: n2, Reason: "must be positive and finite"}
	}
	if n2 >= n1 {
		return 0, &Error{Param: "index n2", Value: n2, Reason: "must be less than n1 for total internal reflection"}
	}
	return units.Angle(math.Asin(n2 / n1)), nil
}

// BrewsterAngle returns the angle of incidence from the medium of index
// n1 onto the medium of index n2 at which p-polarised light is not
// reflected (Born & Wolf, Principles of Optics, §1.5.3 [from memory for
// the section]):
//
//	θB = atan(n2/n1)
//
// It returns a [*Error] when an index is not positive and finite.
func BrewsterAngle(n1, n2 float64) (units.Angle, error) {
	if !(n1 > 0) || math.IsInf(n1, 1) {
		return 0, &Error{Param: "index n1", Value: n1, Reason: "must be positive and finite"}
	}
	if !(n2 > 0) || math.IsInf(n2, 1) {
		return 0, &Error{Param: "index n2", Value: n2, Reason: "must be positive and finite"}
	}
	return units.Angle(math.Atan2(n2, n1)), nil
}
