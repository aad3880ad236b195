package tolerance

import (
	"math"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Output is what the fast route computes for one build: the beam at the
// system's end plane in both planes, the system's tangential and sagittal
// matrices, and its length (metres, the position of the end plane).
type Output struct {
	Beam   beam.Astigmatic
	X, Y   paraxial.Matrix
	Length units.Length
}

// Fast is a goal's value computed from the [Output] of a build, in the
// goal's SI unit: the fast form of a design measure. It returns NaN when
// the value cannot be computed (the build then counts as failed). The
// measures below are the fast forms of the design package's measures of
// the same names; any function of this form can be one, and
// [Study.Validate] checks that it agrees with its goal's measure.
type Fast func(o *Output) float64

// WaistRadius is the fast form of [design.WaistRadius]: the waist radius
// w0 of the beam leaving the system (tangential plane).
func WaistRadius() Fast {
	return func(o *Output) float64 { return float64(o.Beam.X.WaistRadius()) }
}

// WaistZ is the fast form of [design.WaistZ]: the position of the output
// waist from the input plane, Length + WaistOffset (tangential plane).
func WaistZ() Fast {
	return func(o *Output) float64 { return float64(o.Length + o.Beam.X.WaistOffset()) }
}

// Divergence is the fast form of [design.Divergence]: the far-field
// half-angle of the output beam (tangential plane), radians.
func Divergence() Fast {
	return func(o *Output) float64 { return float64(o.Beam.X.HalfDivergence()) }
}

// RadiusAtEnd is the fast form of design.RadiusAt(in, ""): the beam
// radius at the end plane (tangential plane).
func RadiusAtEnd() Fast {
	return func(o *Output) float64 { return float64(o.Beam.X.Radius()) }
}

// TotalLength is the fast form of [design.TotalLength].
func TotalLength() Fast {
	return func(o *Output) float64 { return float64(o.Length) }
}

// Coupling is the fast form of [design.Coupling]: the aligned coupling
// efficiency of the output beam into the mode (given at the end plane),
// [couple.Overlap].
func Coupling(mode beam.Input) Fast {
	return func(o *Output) float64 {
		c, err := couple.Overlap(o.Beam, mode, couple.Misalignment{})
		if err != nil {
			return math.NaN()
		}
		return c.Efficiency
	}
}

// pelem is one element of the fast route's copy of the system.
type pelem struct {
	e      *paraxial.Element // the nominal element (read only)
	x, y   paraxial.Matrix
	length float64
	space  bool
	// eps and dt are a lens's or mirror's focal and tilt errors in this
	// trial, n its glass index; dirty marks them set.
	eps, dt, n float64
	dirty      bool
}

// fastEval is one worker's fast route: a copy of the system's elements
// that each trial perturbs in place, with no allocation.
type fastEval struct {
	p       *plan
	elems   []paraxial.Element // nominal, read only
	nominal []pelem
	work    []pelem
	dirty   []int
	saved   [2]pelem
	out     Output
	nOut    float64
	comp    func(float64) (float64, error)
}

func newFastEval(p *plan) *fastEval {
	f := &fastEval{p: p, elems: p.s.System.Elements(), nOut: p.s.System.IndexOut()}
	f.nominal = make([]pelem, len(f.elems))
	for i := range f.elems {
		e := &f.elems[i]
		f.nominal[i] = pelem{e: e, x: e.X, y: e.Y, length: float64(e.Length), space: e.Kind == paraxial.KindSpace}
	}
	f.work = make([]pelem, len(f.elems))
	f.dirty = make([]int, 0, len(p.s.Perturbations))
	f.comp = f.compensated
	return f
}

// trial perturbs the elements by x, solves the compensator and writes
// the goals' values into vals.
func (f *fastEval) trial(x []float64, vals []float64) (comp float64, atLimit bool, err error) {
	copy(f.work, f.nominal)
	f.dirty = f.dirty[:0]
	for j := range f.p.s.Perturbations {
		q := &f.p.s.Perturbations[j]
		st := f.p.sites[j]
		switch q.Kind {
		case KindPlacement:
			b, a := &f.work[st.before], &f.work[st.after]
			gb, ga := b.length+x[j], a.length-x[j]
			if gb < 0 || ga < 0 {
				return 0, false, f.fail(j, x[j], "leaves a negative gap (space before "+units.Length(gb).String()+", after "+units.Length(ga).String()+")")
			}
			b.length, a.length = gb, ga
		case KindSpacing:
			s := &f.work[st.first]
			d := s.length + x[j]
			if d < 0 {
				return 0, false, f.fail(j, x[j], "makes the space negative ("+units.Length(d).String()+")")
			}
			s.length = d
		case KindFocal, KindTilt:
			e := &f.work[st.first]
			if !e.dirty {
				e.dirty, e.n = true, DefaultIndex
				f.dirty = append(f.dirty, st.first)
			}
			if q.Kind == KindFocal {
				e.eps = x[j]
			} else {
				e.dt, e.n = x[j], q.index()
			}
		}
	}
	for _, i := range f.dirty {
		e := &f.work[i]
		c := change(e.e, e.eps, e.dt, e.n)
		if c.problem != "" {
			return 0, false, f.failAt(i, c.problem)
		}
		e.x, e.y = c.x, c.y
	}
	comp = math.NaN()
	if f.p.comp != nil {
		if st := f.p.compSite; f.p.comp.Kind == design.KindShift {
			f.saved[0], f.saved[1] = f.work[st.before], f.work[st.after]
		}
		if comp, atLimit, err = f.p.solve(f.comp); err != nil {
			return 0, false, err
		}
		if err := f.set(comp); err != nil {
			return 0, false, err
		}
	}
	if err := f.propagate(); err != nil {
		return 0, false, err
	}
	for i, m := range f.p.fast {
		v := m(&f.out)
		if !finite(v) {
			return 0, false, &ParamError{Subject: "goal " + errtext.Quote(f.p.s.Goals[i].Name), Param: "value", Value: v, Reason: "is not finite", Err: ErrTrial}
		}
		vals[i] = v
	}
	return comp, atLimit, nil
}

// set applies the compensator's value c to the work copy, from the
// perturbed state saved before the root search.
func (f *fastEval) set(c float64) error {
	v := f.p.comp
	st := f.p.compSite
	switch v.Kind {
	case design.KindSpacing:
		f.work[st.first].length = c
	case design.KindShift:
		b, a := f.saved[0], f.saved[1]
		gb, ga := b.length+c, a.length-c
		if gb < 0 || ga < 0 {
			return &ParamError{Subject: "compensator " + v.Name(), Param: "value", Value: units.Length(c), Reason: "leaves a negative gap", Err: ErrTrial}
		}
		b.length, a.length = gb, ga
		f.work[st.before], f.work[st.after] = b, a
	case design.KindFocal:
		m := paraxial.ThinLens(units.Length(c))
		f.work[st.first].x, f.work[st.first].y = m, m
	}
	return nil
}

// compensated is the compensated goal's distance from its wanted value
// with the compensator at c.
func (f *fastEval) compensated(c float64) (float64, error) {
	if err := f.set(c); err != nil {
		return 0, err
	}
	if err := f.propagate(); err != nil {
		return 0, err
	}
	return f.p.fast[f.p.compGoal](&f.out) - f.p.want, nil
}

// propagate composes the work copy's matrices and carries the beam to
// the end plane.
func (f *fastEval) propagate() error {
	mx, my := paraxial.Identity(), paraxial.Identity()
	var z float64
	for i := range f.work {
		e := &f.work[i]
		if e.space {
			m := paraxial.Space(units.Length(e.length))
			mx, my = mx.Then(m), my.Then(m)
			z += e.length
			continue
		}
		mx, my = mx.Then(e.x), my.Then(e.y)
	}
	f.out.X, f.out.Y, f.out.Length = mx, my, units.Length(z)
	f.out.Beam.X = f.p.in.X.Transform(mx, f.nOut)
	f.out.Beam.Y = f.p.in.Y.Transform(my, f.nOut)
	// A physical beam has a finite q with Im q > 0 ([beam.Gaussian.Validate]
	// checks the same and more, at a quarter of the cost of a build; a
	// measure that overflows past this returns a non-finite value,
	// which fails the build too).
	if qx, qy := f.out.Beam.X.Q, f.out.Beam.Y.Q; !(imag(qx) > 0 && imag(qy) > 0) || !finite(real(qx)) || !finite(imag(qx)) || !finite(real(qy)) || !finite(imag(qy)) || !finite(z) {
		return &ParamError{Param: "output beam", Reason: "is not a physical beam (q not finite or Im q ≤ 0)", Err: ErrTrial}
	}
	return nil
}

func (f *fastEval) fail(j int, x float64, reason string) error {
	q := f.p.s.Perturbations[j]
	return q.fail("error", q.Dist.value(x), reason, ErrTrial)
}

func (f *fastEval) failAt(i int, reason string) error {
	for j, q := range f.p.s.Perturbations {
		if f.p.sites[j].first == i && (q.Kind == KindFocal || q.Kind == KindTilt) {
			return q.fail("", nil, reason, ErrTrial)
		}
	}
	return &ParamError{Reason: reason, Err: ErrTrial}
}
