package trace

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Media says which media [FromParaxial] gives the parts of a paraxial
// system, whose elements carry only numeric indices.
type Media struct {
	// Glass maps the label of a thick lens, a plate or a labelled
	// interface to the medium after its first surface: the glass of a
	// lens or plate, the medium behind an interface.
	Glass map[string]Medium
	// Air is the medium of every space of index 1 (nil: [Index](1)).
	// Give it when Glass holds absolute indices (the materials of
	// package material), or the index ratios at each surface are off by
	// the index of air, about 2.7e-4 (reference-checks conventions).
	Air Medium
}

// FromParaxial returns the paraxial system p as surfaces to trace with real
// rays, in the same frame: vertex 0 is p's first surface at its z, every
// vertex keeps its z along the unfolded axis until the first mirror, and
// the image plane is p's output plane (z = p.Length() along the unfolded
// path).
//
// Spherical and planar interfaces (and so thick lenses and untilted
// plates) become Refract surfaces, mirrors at normal incidence Reflect
// surfaces (after a mirror the light travels towards −z and the radii of
// later surfaces change sign, see [Surface]), thin lenses Ideal surfaces,
// diaphragms Stop surfaces, and a round clear aperture on a surface its
// ClearRadius; a round aperture on a space (a tube) becomes two stops, at
// its entrance and at its exit. Each medium is the one media names, or
// [Index] of the paraxial index.
//
// Elements with no real-ray model are refused with an error wrapping
// [ErrNotTraceable] that names the element by builder call and label:
// cylindrical lenses, user matrices, tilted mirrors and plates, slits and
// off-centre openings.
func FromParaxial(p paraxial.System, media Media) (System, error) {
	if err := p.Validate(); err != nil {
		return System{}, err
	}
	air := media.Air
	if air == nil {
		air = Index(1)
	}
	plain := func(n float64) Medium {
		if n == 1 {
			return air
		}
		return Index(n)
	}
	elems := p.Elements()
	// The medium after element i, from the component or label tables.
	glassAfter := map[int]Medium{}
	inPart := map[int]bool{}
	for _, c := range p.Components() {
		for i := c.First; i <= c.Last; i++ {
			inPart[i] = true
		}
		if m, ok := media.Glass[c.Label]; ok && c.Label != "" {
			glassAfter[c.First] = m
		}
	}
	for i, e := range elems {
		if inPart[i] || e.Label == "" {
			continue
		}
		if m, ok := media.Glass[e.Label]; ok && (e.Kind == paraxial.KindSphericalInterface || e.Kind == paraxial.KindPlanarInterface) {
			glassAfter[i] = m
		}
	}
	refuse := func(e paraxial.Element, what string) error {
		return &ParamError{Subject: e.Name(), Reason: what, Err: ErrNotTraceable}
	}
	var surfs []Surface
	dir := 1.0
	origin := 0.0 // z of vertex 0
	pending := 0.0
	add := func(s Surface) {
		if len(surfs) == 0 {
			origin = pending
		} else {
			surfs[len(surfs)-1].Thickness = units.Length(dir * pending)
		}
		pending = 0
		surfs = append(surfs, s)
	}
	clear := func(e paraxial.Element) (units.Length, error) {
		o := e.Aperture
		if o.Radius == 0 {
			return 0, nil
		}
		if o.Shape != paraxial.Circle || o.OffsetX != 0 || o.OffsetY != 0 {
			return 0, refuse(e, "a slit or an off-centre opening has no real-ray model here (round, centred clear apertures only)")
		}
		return o.Radius, nil
	}
	for i, e := range elems {
		a, err := clear(e)
		if err != nil {
			return System{}, err
		}
		if e.Tilt != 0 {
			return System{}, refuse(e, "a tilted surface has no real-ray model here (coaxial surfaces only)")
		}
		medium := func() Medium {
			if m, ok := glassAfter[i]; ok {
				return m
			}
			return plain(e.IndexOut)
		}
		radius := func() units.Length {
			if e.Radius == 0 || math.IsInf(float64(e.Radius), 0) {
				return 0
			}
			return units.Length(dir) * e.Radius
		}
		label := e.Label
		switch e.Kind {
		case paraxial.KindSpace:
			if a > 0 {
				add(Surface{Label: label + " entrance", Kind: Stop, ClearRadius: a})
			}
			pending += float64(e.Length)
			if a > 0 {
				add(Surface{Label: label + " exit", Kind: Stop, ClearRadius: a})
			}
		case paraxial.KindSphericalInterface, paraxial.KindPlanarInterface:
			add(Surface{Label: label, Kind: Refract, Radius: radius(), ClearRadius: a, Medium: medium()})
		case paraxial.KindMirror:
			add(Surface{Label: label, Kind: Reflect, Radius: radius(), ClearRadius: a})
			dir = -dir
		case paraxial.KindThinLens:
			add(Surface{Label: label, Kind: Ideal, Focal: e.Focal, ClearRadius: a})
		case paraxial.KindDiaphragm:
			add(Surface{Label: label, Kind: Stop, ClearRadius: a})
		case paraxial.KindCylindricalLens:
			return System{}, refuse(e, "a cylindrical lens has no real-ray model here")
		default:
			return System{}, refuse(e, "a "+e.Kind.String()+" has no real-ray model")
		}
	}
	if len(surfs) > 0 {
		surfs[len(surfs)-1].Thickness = units.Length(dir * pending)
	}
	s, err := New(plain(p.IndexIn()), surfs...)
	if err != nil {
		return System{}, err
	}
	s.shift(origin)
	return s, nil
}

// shift moves every vertex and the image plane by dz metres along z.
func (s *System) shift(dz float64) {
	for i := range s.vertex {
		s.vertex[i] += dz
	}
}
