package tolerance

import (
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Shape is the form of a [Distribution].
type Shape int

// The shapes of a tolerance.
const (
	// ShapeNormal is a normal (Gaussian) error of mean 0 and standard
	// deviation Width: what a process with many small causes gives, and
	// what a datasheet's "±x (1σ)" means.
	ShapeNormal Shape = iota
	// ShapeUniform is an error spread evenly over [−Width, +Width]: a
	// part placed anywhere within a mechanical tolerance ("±x, no
	// better"). Its standard deviation is Width/√3.
	ShapeUniform
)

// String returns "normal" or "uniform".
func (s Shape) String() string {
	switch s {
	case ShapeNormal:
		return "normal"
	case ShapeUniform:
		return "uniform"
	}
	return "Shape(" + errtext.Value(int(s)) + ")"
}

// Distribution is the error of one perturbed value: its shape, its width
// (the standard deviation σ of a normal error, the half-width t of a
// uniform one) in SI units, and the unit ("m", "rad", or "" for a plain
// number such as a relative focal-length error). Make one with [Normal]
// or [Uniform], which take the unit from the Go type of the width.
type Distribution struct {
	Shape Shape
	Width float64
	Unit  string
}

func unitOf[Q target.Quantity]() string {
	var q Q
	switch any(q).(type) {
	case units.Length:
		return "m"
	case units.Angle:
		return "rad"
	}
	return ""
}

// Normal returns a normal error of mean 0 and standard deviation sigma:
// Normal(20*units.Micrometer) for a placement, Normal(0.005) for a 0.5 %
// focal-length error, Normal(units.Milliradian) for a tilt.
func Normal[Q target.Quantity](sigma Q) Distribution {
	return Distribution{Shape: ShapeNormal, Width: float64(sigma), Unit: unitOf[Q]()}
}

// Uniform returns an error spread evenly over [−t, +t].
func Uniform[Q target.Quantity](t Q) Distribution {
	return Distribution{Shape: ShapeUniform, Width: float64(t), Unit: unitOf[Q]()}
}

// Sigma returns the standard deviation: Width for a normal error,
// Width/√3 for a uniform one (the variance of the uniform law on [−t, t]
// is t²/3; M. Abramowitz & I. A. Stegun, Handbook of Mathematical
// Functions, 1964, 26.1 [from memory]). It is NaN for an unknown shape.
func (d Distribution) Sigma() float64 {
	switch d.Shape {
	case ShapeNormal:
		return d.Width
	case ShapeUniform:
		return d.Width / math.Sqrt(3)
	}
	return math.NaN()
}

// validate returns the reason why d is unusable, or "".
func (d Distribution) validate() string {
	if d.Shape != ShapeNormal && d.Shape != ShapeUniform {
		return "unknown shape " + d.Shape.String() + " (use Normal or Uniform)"
	}
	if !(d.Width > 0) || math.IsInf(d.Width, 0) {
		return "the width must be positive and finite"
	}
	return ""
}

// value returns v in the distribution's unit, for messages.
func (d Distribution) value(v float64) any {
	switch d.Unit {
	case "m":
		return units.Length(v)
	case "rad":
		return units.Angle(v)
	}
	return v
}

// String returns the tolerance as a table shows it: "σ 20 µm" for a
// normal error, "±0.5 mrad" for a uniform one; a plain number (a relative
// error) in per cent, "σ 0.5 %".
func (d Distribution) String() string {
	prefix := "σ "
	if d.Shape == ShapeUniform {
		prefix = "±"
	}
	switch d.Unit {
	case "m":
		return prefix + table.LengthSig(units.Length(d.Width), 3)
	case "rad":
		return prefix + table.AngleSig(units.Angle(d.Width), 3)
	}
	return prefix + table.Sig(100*d.Width, 3) + " %"
}

// sample draws one error from src. It allocates nothing (distuv's values
// wrap the caller's source).
func (d Distribution) sample(src rand.Source) float64 {
	if d.Shape == ShapeUniform {
		return distuv.Uniform{Min: -d.Width, Max: d.Width, Src: src}.Rand()
	}
	return distuv.Normal{Mu: 0, Sigma: d.Width, Src: src}.Rand()
}
