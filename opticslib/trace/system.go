package trace

import (
	"errors"
	"math"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/units"
)

// System is an immutable sequential system of surfaces for the exact
// trace: the object medium, the surfaces in the order the light meets
// them, and the image plane (flat, at the last surface's Thickness). The
// zero value is not a system; make one with [New] or [FromParaxial].
type System struct {
	object Medium
	surfs  []Surface
	vertex []float64 // z of each vertex, then of the image plane, in metres
	built  bool
}

// New returns the system of the given surfaces, the light starting in the
// object medium towards +z, with vertex 0 at z = 0. It checks every
// surface: finite radius, conic, clear radius, focal length and
// thickness; a medium for each Refract surface; a Stop with a clear
// radius; an Ideal surface with a nonzero focal length and no curvature;
// and thicknesses whose signs follow the direction of travel. Errors are
// [*ParamError]s naming the surface by index and label.
func New(object Medium, surfaces ...Surface) (System, error) {
	if object == nil {
		return System{}, &ParamError{Subject: "object space", Param: "medium", Reason: "must be given (use trace.Index(1) for a vacuum-like medium)"}
	}
	s := System{object: object, surfs: append([]Surface(nil), surfaces...), built: true}
	s.vertex = make([]float64, len(surfaces)+1)
	dir := 1.0
	z := 0.0
	for i, f := range s.surfs {
		bad := func(param string, v any, reason string) error {
			return &ParamError{Subject: f.name(i), Param: param, Value: v, Reason: reason}
		}
		switch {
		case f.Kind > Ideal:
			return System{}, bad("kind", int(f.Kind), "is not a surface kind")
		case !finite(float64(f.Radius)):
			return System{}, bad("radius R", f.Radius, "must be finite (zero for flat)")
		case !finite(f.Conic):
			return System{}, bad("conic constant k", f.Conic, "must be finite")
		case !finite(float64(f.ClearRadius)) || f.ClearRadius < 0:
			return System{}, bad("clear radius", f.ClearRadius, "must be finite and ≥ 0 (zero: unlimited)")
		case !finite(float64(f.Thickness)):
			return System{}, bad("thickness", f.Thickness, "must be finite")
		case !finite(float64(f.Focal)):
			return System{}, bad("focal length f", f.Focal, "must be finite")
		}
		if f.Radius != 0 && math.Abs(1/float64(f.Radius)) > 1e12 {
			return System{}, bad("radius R", f.Radius, "is too small to trace (|1/R| > 1e12 /m)")
		}
		switch f.Kind {
		case Refract:
			if f.Medium == nil {
				return System{}, bad("medium", nil, "a refracting surface needs the medium after it")
			}
		case Stop:
			if f.ClearRadius == 0 {
				return System{}, bad("clear radius", f.ClearRadius, "a stop needs its opening's radius")
			}
		case Ideal:
			if f.Focal == 0 {
				return System{}, bad("focal length f", f.Focal, "an ideal lens needs a nonzero focal length")
			}
		}
		if (f.Kind == Stop || f.Kind == Ideal) && (f.Radius != 0 || f.Conic != 0) {
			return System{}, bad("radius R", f.Radius, "a "+f.Kind.String()+" surface is flat (R = 0, k = 0)")
		}
		if f.Kind != Ideal && f.Focal != 0 {
			return System{}, bad("focal length f", f.Focal, "only an ideal lens has a focal length (a "+f.Kind.String()+" surface has its power from R and the media)")
		}
		if f.Kind == Reflect {
			dir = -dir
		}
		if f.Thickness*units.Length(dir) < 0 {
			travel := "+z"
			if dir < 0 {
				travel = "−z (after an odd number of mirrors)"
			}
			return System{}, bad("thickness", f.Thickness, "has the wrong sign: the light travels towards "+travel+" here")
		}
		z += float64(f.Thickness)
		s.vertex[i+1] = z
	}
	return s, nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Validate returns [ErrNotBuilt] for the zero System and nil otherwise.
func (s System) Validate() error {
	if !s.built {
		return ErrNotBuilt
	}
	return nil
}

// Len returns the number of surfaces (the image plane not counted).
func (s System) Len() int { return len(s.surfs) }

// Surface returns surface i. It panics if i is out of range [0, Len()).
func (s System) Surface(i int) Surface {
	if i < 0 || i >= len(s.surfs) {
		panic("trace: surface index " + strconv.Itoa(i) + " out of range")
	}
	return s.surfs[i]
}

// Surfaces returns a copy of the surfaces, in order.
func (s System) Surfaces() []Surface { return append([]Surface(nil), s.surfs...) }

// Object returns the object-space medium.
func (s System) Object() Medium { return s.object }

// Vertex returns the z of surface i's vertex in metres (vertex 0 is at
// z = 0 for a system from [New], at the first surface's z for one from
// [FromParaxial]); Vertex(Len()) is the image plane. It panics if i is out of
// range [0, Len()].
func (s System) Vertex(i int) units.Length {
	if i < 0 || i > len(s.surfs) {
		panic("trace: vertex index " + strconv.Itoa(i) + " out of range")
	}
	return units.Length(s.vertex[i])
}

// MediumAfter returns the medium that follows surface i (the object
// medium for i = −1): the medium of the last Refract surface at or before
// i. It panics if i is out of range [−1, Len()).
func (s System) MediumAfter(i int) Medium {
	if i < -1 || i >= len(s.surfs) {
		panic("trace: surface index " + strconv.Itoa(i) + " out of range")
	}
	m := s.object
	for j := 0; j <= i; j++ {
		if s.surfs[j].Kind == Refract {
			m = s.surfs[j].Medium
		}
	}
	return m
}

// WithImageDistance returns a copy of s whose image plane lies d (signed
// along the direction of travel, metres) after the last surface's vertex.
func (s System) WithImageDistance(d units.Length) (System, error) {
	if err := s.Validate(); err != nil {
		return System{}, err
	}
	if len(s.surfs) == 0 {
		return System{}, &ParamError{Subject: "image plane", Param: "distance", Value: d, Reason: "the system has no surface to measure it from"}
	}
	surfs := s.Surfaces()
	surfs[len(surfs)-1].Thickness = d
	out, err := New(s.object, surfs...)
	if err != nil {
		return System{}, err
	}
	out.shift(s.vertex[0])
	return out, nil
}

// Indices returns the absolute refractive index of the object medium
// (index 0) and after each surface (index i+1) at the vacuum wavelength.
// Errors wrap [ErrIndex] and the medium's own error and name the medium.
func (s System) Indices(vacuum units.Length) ([]float64, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if !(vacuum > 0) || math.IsInf(float64(vacuum), 0) {
		return nil, &ParamError{Param: "vacuum wavelength λ0", Value: vacuum, Reason: "must be positive and finite"}
	}
	out := make([]float64, len(s.surfs)+1)
	index := func(m Medium, where string) (float64, error) {
		n, err := m.Index(vacuum)
		if err == nil && !(n >= 1e-3 && n < 1e3) {
			err = errors.New("index " + strconv.FormatFloat(n, 'g', -1, 64) + " is not in [0.001, 1000)")
		}
		if err != nil {
			return 0, &ParamError{Subject: where, Param: "medium " + m.Name() + " at λ0", Value: vacuum, Reason: "no refractive index", Err: errors.Join(ErrIndex, err)}
		}
		return n, nil
	}
	n, err := index(s.object, "object space")
	if err != nil {
		return nil, err
	}
	out[0] = n
	for i, f := range s.surfs {
		if f.Kind == Refract {
			if n, err = index(f.Medium, f.name(i)); err != nil {
				return nil, err
			}
		}
		out[i+1] = n
	}
	return out, nil
}

// Check returns nil when every medium's dispersion formula is valid at the
// vacuum wavelength, and otherwise the media's range warnings joined
// (errors.Join), each naming the medium and its range. The trace itself
// does not refuse such a wavelength: show the warning with the results.
func (s System) Check(vacuum units.Length) error {
	if err := s.Validate(); err != nil {
		return err
	}
	type ranged interface {
		CheckRange(vacuum units.Length) error
	}
	var errs []error
	seen := map[string]bool{}
	for i := -1; i < len(s.surfs); i++ {
		m := s.object
		if i >= 0 {
			if s.surfs[i].Kind != Refract {
				continue
			}
			m = s.surfs[i].Medium
		}
		if r, ok := m.(ranged); ok && !seen[m.Name()] {
			seen[m.Name()] = true
			if err := r.CheckRange(vacuum); err != nil {
				errs = append(errs, err)
			}
		}
	}
	return errors.Join(errs...)
}
