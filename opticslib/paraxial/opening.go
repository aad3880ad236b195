package paraxial

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// Shape is the outline of an [Opening].
type Shape int

// The shapes of an opening.
const (
	// Circle is a round opening (a lens or mirror clear aperture, an iris,
	// a pinhole).
	Circle Shape = iota
	// Slit is a pair of straight parallel edges, unlimited along the
	// slit and limiting the beam across it.
	Slit
)

// String returns "circle" or "slit".
func (s Shape) String() string {
	if s == Slit {
		return "slit"
	}
	return "circle"
}

// Opening is the clear aperture of a part: the region of its surface that
// passes light. It is a shape on the part's own surface, so a round mirror
// met at an angle θ keeps its round clear aperture and the beam's footprint
// on it is stretched by 1/cos θ in the plane of incidence (the tangential
// plane); the analyses do that projection, the user never does.
//
// Build an Opening from what the catalogue prints, the diameter, with
// [ClearDiameter], or from a radius with [ClearRadius]; the argument types
// differ from a plain length, so a diameter cannot be passed where a radius
// is meant. The zero Opening is unlimited.
type Opening struct {
	// Shape is the outline.
	Shape Shape
	// Radius is the radius of a circle or the half-width of a slit, in
	// metres; zero means unlimited.
	Radius units.Length
	// Across is, for a slit, the plane whose transverse direction the slit
	// limits: Tangential for a slit that cuts in x (edges parallel to y).
	Across Plane
	// OffsetX and OffsetY place the centre of the opening relative to the
	// optical axis, in metres on the part's surface, along x (tangential)
	// and y (sagittal): a beam that is off-centre by (dx, dy) on a part is
	// an opening offset by (−dx, −dy).
	OffsetX, OffsetY units.Length
	// MinTransmission is this opening's own threshold for the beam clipping
	// check (beam.Clipping), a fraction in (0, 1]; zero means the path-wide
	// threshold. A pinhole or slit whose job is to clip sets its own.
	MinTransmission float64
}

// ClearRadius returns a round opening of radius r (metres).
func ClearRadius(r units.Length) Opening { return Opening{Shape: Circle, Radius: r} }

// ClearDiameter returns a round opening of diameter d (metres), as optics,
// irises and pinholes are sold: ClearDiameter(50*units.Micrometer) is a
// 50 µm pinhole.
func ClearDiameter(d units.Length) Opening { return Opening{Shape: Circle, Radius: d / 2} }

// SlitOfWidth returns a slit of full width w (metres) that limits the beam
// in plane across (its edges run along the other plane).
func SlitOfWidth(w units.Length, across Plane) Opening {
	return Opening{Shape: Slit, Radius: w / 2, Across: across}
}

// OneInchOptic and HalfInchOptic return the clear aperture usually assumed
// for a 25.4 mm (1 in) and a 12.7 mm (½ in) round optic: 90 % of the
// diameter (vendors state a clear aperture of at least 90 % of the diameter
// for most polished optics; common practice, no single source). Use
// [ClearDiameter] with the data-sheet value when it is known.
func OneInchOptic() Opening { return ClearDiameter(0.9 * units.Inch) }

// HalfInchOptic: see [OneInchOptic].
func HalfInchOptic() Opening { return ClearDiameter(0.45 * units.Inch) }

// Offset returns o with its centre at (dx, dy) metres from the axis.
func (o Opening) Offset(dx, dy units.Length) Opening {
	o.OffsetX, o.OffsetY = dx, dy
	return o
}

// WithMinTransmission returns o with its own clipping threshold t, a
// fraction in (0, 1] (for example 0.5 for a spatial-filter pinhole meant
// to cut the wings of the beam).
func (o Opening) WithMinTransmission(t float64) Opening {
	o.MinTransmission = t
	return o
}

// Limited reports whether o limits the beam at all (Radius > 0).
func (o Opening) Limited() bool { return o.Radius > 0 }

// Diameter returns the full width 2·Radius in metres.
func (o Opening) Diameter() units.Length { return 2 * o.Radius }

// Validate returns nil for a valid opening (the zero Opening is valid and
// unlimited) and an [*ElementError] naming the first bad field otherwise:
// a shape other than Circle or Slit, a negative or non-finite radius, a
// slit plane other than Tangential or Sagittal, a non-finite offset, or a
// threshold outside (0, 1]. The builder validates every opening it is
// given.
func (o Opening) Validate() error {
	if param, v, reason := o.validate(); param != "" {
		return &ElementError{Method: "Opening", Index: -1, Param: param, Value: v, Reason: reason}
	}
	return nil
}

// validate returns the name and requirement of the first bad field, or
// "" if o is valid.
func (o Opening) validate() (param string, v any, reason string) {
	switch {
	case o.Shape != Circle && o.Shape != Slit:
		return "opening shape", int(o.Shape), "must be Circle or Slit"
	case !finite(float64(o.Radius)) || o.Radius < 0:
		return "clear radius", o.Radius, "must be non-negative and finite (0 means unlimited)"
	case o.Shape == Slit && !o.Across.valid():
		return "slit plane", int(o.Across), "must be Tangential or Sagittal"
	case !finite(float64(o.OffsetX)):
		return "opening offset x", o.OffsetX, "must be finite"
	case !finite(float64(o.OffsetY)):
		return "opening offset y", o.OffsetY, "must be finite"
	case o.MinTransmission != 0 && !(o.MinTransmission > 0 && o.MinTransmission <= 1):
		return "minimum transmission", o.MinTransmission, "must be in (0, 1], or 0 for the path-wide threshold"
	}
	return "", nil, ""
}

// Limits returns the interval [lo, hi] of transverse positions in plane p
// (metres from the axis, in the beam's frame) that the opening passes on a
// part met at angle of incidence tilt in the tangential plane, and
// ok = false when the opening does not limit that plane. For a circle of radius a centred at
// (dx, dy) the interval along x is dx ± √(a² − dy²), empty (lo = hi) when
// |dy| ≥ a; positions on the surface project onto the beam's frame with a
// factor cos θ in the tangential plane.
//
// It returns ok = false, too, for an invalid opening or plane (see
// [Opening.Validate]).
func (o Opening) Limits(p Plane, tilt units.Angle) (lo, hi float64, ok bool) {
	if !o.Limited() || !p.valid() || o.Validate() != nil {
		return 0, 0, false
	}
	along, across := float64(o.OffsetX), float64(o.OffsetY)
	if p == Sagittal {
		along, across = across, along
	}
	a := float64(o.Radius)
	var h float64
	switch o.Shape {
	case Slit:
		if o.Across != p {
			return 0, 0, false
		}
		h = a
	default:
		h = math.Sqrt(math.Max(0, float64(a*a)-float64(across*across)))
	}
	lo, hi = along-h, along+h
	if p == Tangential && tilt != 0 {
		c := math.Cos(float64(tilt))
		lo, hi = lo*c, hi*c
	}
	return lo, hi, true
}

// halfOpening returns the distance from the axis to the nearer edge of
// the opening in plane p (metres, ≥ 0), the symmetric limit used by the
// stop analysis, and ok = false when the opening does not limit p.
func (o Opening) halfOpening(p Plane, tilt units.Angle) (float64, bool) {
	lo, hi, ok := o.Limits(p, tilt)
	if !ok {
		return 0, false
	}
	return math.Max(0, math.Min(-lo, hi)), true
}
