package tolerance

import (
	"math"
	"strings"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// changed is a thin lens or curved mirror after its focal-length error
// eps (relative) and tilt dt (radians): the matrices, and what the
// generic route builds.
type changed struct {
	x, y    paraxial.Matrix
	f       units.Length // focal length after the error
	aoi     units.Angle  // a mirror's angle of incidence after the tilt
	ft, fs  units.Length // a tilted lens's astigmatic focal lengths
	tilted  bool         // a lens with a nonzero tilt
	mirror  bool
	problem string // why the element cannot be built, "" if it can
}

// change applies a relative focal error eps and a tilt dt to a thin lens
// or curved mirror e (index n of a lens's glass). Both routes use it, so
// they compute the same matrices.
func change(e *paraxial.Element, eps, dt, n float64) changed {
	c := changed{f: units.Length(float64(e.Focal) * (1 + eps))}
	if !(1+eps > 0) {
		c.problem = "the focal length changes sign"
		return c
	}
	if e.Kind == paraxial.KindMirror {
		c.mirror = true
		c.aoi = e.Tilt + units.Angle(dt)
		if !(math.Abs(float64(c.aoi)) < math.Pi/2) {
			c.problem = "the angle of incidence reaches 90°"
			return c
		}
		// As Builder.MirrorOfFocalLength: radius −2f in the package's
		// sign convention.
		c.x, c.y = paraxial.Mirror(-2*c.f, c.aoi)
		return c
	}
	if dt == 0 {
		m := paraxial.ThinLens(c.f)
		c.x, c.y = m, m
		return c
	}
	c.tilted = true
	c.ft, c.fs = TiltedLens(c.f, units.Angle(dt), n)
	c.x, c.y = paraxial.ThinLens(c.ft), paraxial.ThinLens(c.fs)
	return c
}

// perturbSystem returns sys with the errors x (one per perturbation, in
// the perturbations' units) applied by the edits of package paraxial: the
// changed lenses and mirrors replaced ([paraxial.System.Replace]; a
// tilted lens becomes a matrix element with its two focal lengths), then
// the placements ([paraxial.System.Move]) and spacing errors
// ([paraxial.System.WithSpace], added to the current length) in the
// order given, so that length errors add.
func perturbSystem(sys paraxial.System, ps []Perturbation, x []float64) (paraxial.System, error) {
	// Element changes, gathered per part in the order first named.
	type edit struct {
		label   string
		eps, dt float64
		n       float64
		who     int // the perturbation named first, for messages
	}
	var edits []edit
	for j, p := range ps {
		if p.Kind != KindFocal && p.Kind != KindTilt {
			continue
		}
		k := -1
		for i := range edits {
			if edits[i].label == p.Label {
				k = i
			}
		}
		if k < 0 {
			edits = append(edits, edit{label: p.Label, n: DefaultIndex, who: j})
			k = len(edits) - 1
		}
		if p.Kind == KindFocal {
			edits[k].eps = x[j]
		} else {
			edits[k].dt, edits[k].n = x[j], p.index()
		}
	}
	for _, ed := range edits {
		p := ps[ed.who]
		pt, err := sys.Part(ed.label)
		if err != nil {
			return paraxial.System{}, p.fail("", nil, "", because(ErrTrial, err))
		}
		e := sys.Element(pt.First)
		c := change(&e, ed.eps, ed.dt, ed.n)
		if c.problem != "" {
			return paraxial.System{}, p.fail("error", p.Dist.value(x[ed.who]), c.problem, ErrTrial)
		}
		b := paraxial.NewBuilder()
		if e.IndexIn != 1 {
			b.Medium(e.IndexIn)
		}
		switch {
		case c.mirror:
			b.MirrorOfFocalLength(c.f, c.aoi)
		case c.tilted:
			b.Matrix(c.x, c.y)
		default:
			b.ThinLens(c.f)
		}
		parts := strings.Split(ed.label, "/")
		b.Label(parts[len(parts)-1])
		if e.Aperture.Limited() {
			b.Aperture(e.Aperture)
		}
		sub, err := b.Build()
		// An appended assembly's part "tele/L1": wrap the new element
		// as Append does, so that its label stays "tele/L1".
		for k := len(parts) - 2; k >= 0 && err == nil; k-- {
			sub, err = paraxial.NewBuilder().Medium(e.IndexIn).Append(sub).Label(parts[k]).Build()
		}
		if err == nil {
			sys, err = sys.Replace(ed.label, sub)
		}
		if err != nil {
			return paraxial.System{}, p.fail("error", p.Dist.value(x[ed.who]), "", because(ErrTrial, err))
		}
	}
	for j, p := range ps {
		var err error
		switch p.Kind {
		case KindPlacement:
			sys, err = sys.Move(p.Label, units.Length(x[j]))
		case KindSpacing:
			var pt paraxial.Part
			if pt, err = sys.Part(p.Label); err == nil {
				sys, err = sys.WithSpace(p.Label, sys.Element(pt.First).Length+units.Length(x[j]))
			}
		}
		if err != nil {
			return paraxial.System{}, p.fail("error", p.Dist.value(x[j]), "", because(ErrTrial, err))
		}
	}
	return sys, nil
}
