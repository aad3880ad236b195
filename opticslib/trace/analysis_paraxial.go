package trace

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/units"
)

// paraxRay is a paraxial ray traced through a system in the fixed frame:
// the height h[i] on surface i (on its vertex plane), the slope u[i] =
// dy/dz before surface i and u[i+1] after it, and the signed index nu[i]
// of the space before surface i (nu[Len()] of image space): the absolute
// index, negative after an odd number of mirrors (Welford's convention
// n′ = −n at a mirror), so that one refraction equation serves both:
//
//	ν′u′ = νu − h c (ν′ − ν)        (refraction and reflection)
//	u′ = u − h/f                    (ideal lens, as the kernel's tangents)
//	h_{i+1} = h_i + u_{i+1}·(z_{i+1} − z_i)
//
// (W. T. Welford, Aberrations of Optical Systems, Adam Hilger 1986, §2.6
// and ch. 8 [from memory]). hImg is the height on the image plane.
type paraxRay struct {
	h, u, nu []float64
	hImg     float64
}

// signedIndices returns the signed indices ν of the object space and after
// each surface.
func (s System) signedIndices(idx []float64) []float64 {
	nu := make([]float64, len(idx))
	nu[0] = idx[0]
	sign := 1.0
	for i, f := range s.surfs {
		if f.Kind == Reflect {
			sign = -sign
		}
		nu[i+1] = sign * idx[i+1]
	}
	return nu
}

// paraxial traces the paraxial ray of height y0 and slope u0 at z0
// through s with the signed indices nu.
func (s System) paraxial(nu []float64, z0, y0, u0 float64) paraxRay {
	n := len(s.surfs)
	p := paraxRay{h: make([]float64, n), u: make([]float64, n+1), nu: nu}
	y, u, z := y0, u0, z0
	for i, f := range s.surfs {
		y += u * (s.vertex[i] - z)
		z = s.vertex[i]
		p.h[i], p.u[i] = y, u
		switch f.Kind {
		case Refract, Reflect:
			u = (nu[i]*u - y*f.Curvature()*(nu[i+1]-nu[i])) / nu[i+1]
		case Ideal:
			u -= y / float64(f.Focal)
		}
	}
	p.u[n] = u
	p.hImg = y + u*(s.vertex[n]-z)
	return p
}

// marginal returns the paraxial marginal ray of the source: from the axial
// object point (or parallel to the axis for an object at infinity) through
// the rim of the entrance pupil, height PupilRadius at PupilZ.
func (s System) marginal(nu []float64, src Source) paraxRay {
	a, pz := float64(src.PupilRadius), float64(src.PupilZ)
	u := 0.0
	if !src.collimated() {
		u = a / (pz - s.objectZ(src))
	}
	return s.paraxial(nu, pz, a, u)
}

// chief returns the paraxial chief ray of the source: through the centre
// of the entrance pupil from the field point, slope tan θ for an object at
// infinity or −ObjectHeight/(PupilZ − z_object) for a finite one.
func (s System) chief(nu []float64, src Source) paraxRay {
	pz := float64(src.PupilZ)
	u := math.Tan(float64(src.Field))
	if !src.collimated() {
		u = -float64(src.ObjectHeight) / (pz - s.objectZ(src))
	}
	return s.paraxial(nu, pz, 0, u)
}

// axisCrossing returns the z where the paraxial ray crosses the axis in
// image space, and false when it leaves parallel to it.
func (s System) axisCrossing(p paraxRay) (float64, bool) {
	u := p.u[len(p.u)-1]
	if u == 0 {
		return 0, false
	}
	z := s.vertex[len(s.surfs)] - p.hImg/u
	return z, finite(z)
}

// ParaxialFocus returns the z in metres of the paraxial image of the
// source's axial object point at the vacuum wavelength: where the
// paraxial marginal ray crosses the axis in image space (real or, before
// the last surface, virtual). The error wraps [ErrAfocal] when the light
// leaves collimated, or is a [*ParamError] for an invalid source or a
// wavelength without indices.
func (s System) ParaxialFocus(vacuum units.Length, src Source) (units.Length, error) {
	if err := s.Validate(); err != nil {
		return 0, err
	}
	if err := src.Validate(); err != nil {
		return 0, err
	}
	idx, err := s.Indices(vacuum)
	if err != nil {
		return 0, err
	}
	return s.paraxialFocus(s.signedIndices(idx), src)
}

func (s System) paraxialFocus(nu []float64, src Source) (units.Length, error) {
	z, ok := s.axisCrossing(s.marginal(nu, src))
	if !ok {
		return 0, &ParamError{Subject: "paraxial marginal ray", Reason: "leaves the system parallel to the axis", Err: ErrAfocal}
	}
	return units.Length(z), nil
}

// exitPupil returns the z of the paraxial exit pupil (the image of the
// entrance pupil in image space), false when it is at infinity.
func (s System) exitPupil(nu []float64, src Source) (float64, bool) {
	p := s.paraxial(nu, float64(src.PupilZ), 0, 1e-3)
	return s.axisCrossing(p)
}
