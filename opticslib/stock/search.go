package stock

import (
	"cmp"
	"math"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/target"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Defaults and constants of [Search].
const (
	// DefaultMinGap is the smallest spacing between two lenses when
	// Search.MinGap is 0: 5 mm, about what two lens mounts on a rail
	// allow (common practice, no single source).
	DefaultMinGap = 5 * units.Millimeter
	// DefaultMaxGap is the largest spacing when Search.MaxGap is 0: 1 m.
	DefaultMaxGap = 1 * units.Meter
	// DefaultPlacement is the placement error of a spacing the tolerance
	// term assumes when Search.Placement is 0: 0.1 mm, a lens set on a
	// rail against a ruler or a stop (common practice, no single source).
	DefaultPlacement = 0.1 * units.Millimeter
	// DefaultKeep is the number of ranked candidates a result keeps when
	// Search.Keep is 0.
	DefaultKeep = 10
	// MarginalFactor sets the marginal ray height of the aberration
	// estimate: 1.5 times the 1/e² beam radius at each lens, the radius
	// inside which 1 − e^(−4.5) = 98.9 % of the power passes (common
	// practice, no single source; the 1/e² radius itself holds 86.5 %).
	MarginalFactor = 1.5
	// DifferenceStep is the step h of the central differences
	// (m(d + h) − m(d − h))/(2h) of the tolerance term: 10 µm, small
	// against every spacing (the truncation error is h²/6 times the third
	// derivative, below 1e-6 of the result for the mm-scale curvature of
	// the conditions) and large against rounding (ε·|m|/h ≈ 1e-11).
	DifferenceStep = 10 * units.Micrometer
	// OuterIntervals is the number of equal intervals in which a
	// three-lens search scans the first spacing for sign changes of the
	// second condition, each refined by Brent's method ([design.Root]).
	OuterIntervals = 48
	// MarechalRMS is the RMS wavefront error λ/14 of Maréchal's criterion
	// (Strehl ratio ≈ 0.8; Born & Wolf, Principles of Optics, §9.3 [from
	// memory]): the aberration term's unit.
	MarechalRMS = 1.0 / 14
)

// Weights weigh the terms of a candidate's score; every weight is ≥ 0 and
// finite. [DefaultWeights] are all 1.
type Weights struct {
	Length, Tolerance, Aperture, Aberration float64
}

// DefaultWeights returns the weights a nil Search.Weights means: 1 for
// every term, so that a 1 m longer path, a placement error that uses up
// the main condition's tolerance, a beam that fills the clear aperture
// and an aberration at Maréchal's limit weigh the same (a choice, common
// practice, no single source).
func DefaultWeights() Weights { return Weights{Length: 1, Tolerance: 1, Aperture: 1, Aberration: 1} }

// Search finds the combinations of stock lenses, in order along the beam,
// that meet conditions and goals, with the spacings solved. The system of
// a combination of N lenses (N = Lenses, 2 or 3) is
//
//	input plane ─ Before ─ L1 ─ d1 ─ L2 [─ d2 ─ L3] ─ After ─ end plane
//
// of thin lenses ([Lens.Thin]) labelled "L1", "L2", "L3", with spaces
// labelled "before", "d1", "d2" and "after", so that goals can name them
// (design.WaistAfter(in, "L2"), design.RadiusAt(in, "L1")). The spacings
// run between the lenses' principal planes; [Candidate] gives the
// glass-to-glass gaps too.
//
// # Solving
//
// The N − 1 spacings are solved for the N − 1 conditions of Solve. The
// last spacing decides the beam after the last lens and is solved in
// closed form: Solve[0] for the last gap by Self's thin-lens equation
// ([Collimate], [WaistAt], [WaistSize]; up to two solutions). A pair has
// nothing else to solve. A triple solves the first spacing d1 for
// Solve[1] with nested roots: for each d1 the last gap meets Solve[0] in
// closed form, and Solve[1]'s miss along that branch is scanned over the
// d1 bounds in [OuterIntervals] intervals and each sign change refined by
// Brent's method ([design.Root]) to 0.1 nm; sign changes across a pole
// are dropped. (Two roots of Solve[1] closer than one scan interval can
// be missed.)
// Every solution within the bounds is then built as a paraxial system and
// judged against the conditions and Goals with [design.Problem.Evaluate].
//
// # Score
//
// The solutions that meet every goal are ranked by the sum of four
// weighted terms, lower first ([Score]):
//
//	length      L / (1 m), L = Before + Σ gaps + After
//	tolerance   Placement · |∇d m₀| / tol₀: the main condition Solve[0]'s
//	            miss m₀ moved by a placement error of the spacings
//	            (central differences of step DifferenceStep, each spacing
//	            alone, added in quadrature), in units of its tolerance
//	aperture    max over the lenses of w / a: the 1/e² beam radius over
//	            the clear radius
//	aberration  σ / (λ0/14): the RMS wavefront error of third-order
//	            spherical aberration ([SphericalRMS] of Σ S_I), in units
//	            of Maréchal's limit
//
// The aberration estimate is thin-lens shape-factor theory
// ([SphericalSeidel]): each lens i is judged at the marginal ray height
// hᵢ = [MarginalFactor]·wᵢ with the conjugate factor of the beam's
// wavefront curvature there ([Conjugate]; rays normal to the Gaussian
// wavefront), and the Seidel sums add, which is consistent because the
// heights all sit at one point (r/w = 1.5) of the same Gaussian profile.
// Each plano, meniscus or unequal biconvex lens is turned the way round
// that makes |Σ S_I| smallest ([Candidate.Reversed]); achromats count as
// corrected.
//
// A candidate is rejected, and counted under its first failure
// ([Result.Rejections]), when no spacing meets the conditions, a spacing
// lies outside [MinGap, MaxGap], the length exceeds MaxLength, a lens's
// clear aperture passes less than MinTransmission of the beam
// ([beam.CircularTransmission]), a goal cannot be computed, or a goal is
// missed.
type Search struct {
	// In is the beam at the input plane (in air; the tangential plane of
	// an astigmatic beam is the one the conditions and the aberration
	// estimate use).
	In beam.Input
	// Before is the distance from the input plane to L1 and After from
	// the last lens to the end plane, metres (≥ 0).
	Before, After units.Length
	// Lenses is the number of lenses of a combination, 2 or 3.
	Lenses int
	// Solve holds Lenses − 1 conditions: Solve[0] is solved by the last
	// spacing, Solve[1] (triples) by the first.
	Solve []Condition
	// Goals are further design goals each candidate must meet, judged on
	// its system (an output radius, a total length, a coupling, …).
	Goals []design.Goal
	// MinGap and MaxGap bound every spacing, metres (defaults
	// [DefaultMinGap], [DefaultMaxGap]).
	MinGap, MaxGap units.Length
	// MaxLength bounds the total length Before + Σ gaps + After (metres;
	// 0 for none).
	MaxLength units.Length
	// MinTransmission is the least fraction of the power each lens's
	// clear aperture must pass (0 means [beam.DefaultMinTransmission],
	// 99 %).
	MinTransmission float64
	// Placement is the placement error of a spacing the tolerance term
	// assumes (0 means [DefaultPlacement]).
	Placement units.Length
	// Weights weigh the score's terms (nil means [DefaultWeights]).
	Weights *Weights
	// Keep is the number of ranked candidates kept (0 means
	// [DefaultKeep]).
	Keep int
	// Aberration is the aberration model of the score and of the lenses'
	// orientation: [ThirdOrder] (the zero value) or [RealRays], which
	// traces each candidate that meets the goals through its thick
	// lenses with real rays (see [RealRays]) and is
	// slower, some 10–100 µs per candidate and orientation.
	Aberration Aberration
}

// config is a validated search with its defaults filled in.
type config struct {
	Search
	gx, gy       beam.Gaussian // the tangential and sagittal parts of In
	lam          float64       // effective wavelength M²λ0/n of gx
	lmax         float64       // MaxLength, +Inf for none
	d1max        float64       // upper bound of the first spacing of a triple
	w            Weights
	lenses       []Lens
	goalNames    []string // conditions, then Goals, as the problem has them
	vars         []design.Variable
	goals        []design.Goal
	combinations string // "pair" or "triple"
}

func searchError(param string, v any, reason string, err error) error {
	return &ParamError{Where: "search", Param: param, Value: v, Reason: reason, Err: err}
}

func (s Search) config(st Stock) (config, error) {
	c := config{Search: s, lmax: math.Inf(1)}
	if s.Aberration != ThirdOrder && s.Aberration != RealRays {
		return config{}, searchError("Aberration", int(s.Aberration), "must be ThirdOrder or RealRays", ErrInput)
	}
	switch s.Lenses {
	case 2:
		c.combinations = "pair"
	case 3:
		c.combinations = "triple"
	default:
		return config{}, searchError("Lenses", s.Lenses, "must be 2 or 3", ErrInput)
	}
	switch in := s.In.(type) {
	case beam.Gaussian:
		if err := in.Validate(); err != nil {
			return config{}, searchError("In", nil, "", err)
		}
		c.gx, c.gy = in, in
	case beam.Astigmatic:
		if err := in.Validate(); err != nil {
			return config{}, searchError("In", nil, "", err)
		}
		c.gx, c.gy = in.X, in.Y
	default:
		return config{}, searchError("In", nil, "is nil: give the beam at the input plane", ErrInput)
	}
	if math.Abs(c.gx.Index-1) > 1e-12 {
		return config{}, searchError("In index n", c.gx.Index, "the search puts lenses in air: the beam's index must be 1", ErrInput)
	}
	c.lam = c.gx.BeamQuality() * float64(c.gx.Wavelength)
	if len(s.Solve) != s.Lenses-1 {
		return config{}, searchError("Solve", len(s.Solve), "conditions given; "+strconv.Itoa(s.Lenses)+" lenses have "+strconv.Itoa(s.Lenses-1)+
			" spacings, each solved for one condition (Collimate, WaistAt, WaistSize)", ErrInput)
	}
	for i, cond := range s.Solve {
		if err := cond.validate(i); err != nil {
			return config{}, err
		}
	}
	for _, l := range []struct {
		name string
		v    units.Length
	}{{"Before", s.Before}, {"After", s.After}} {
		if !finite(float64(l.v)) || l.v < 0 {
			return config{}, searchError(l.name, l.v, "must be ≥ 0 and finite", ErrBounds)
		}
	}
	if c.MinGap == 0 {
		c.MinGap = DefaultMinGap
	}
	if c.MaxGap == 0 {
		c.MaxGap = DefaultMaxGap
	}
	if !finite(float64(c.MinGap)) || !finite(float64(c.MaxGap)) || c.MinGap < 0 || c.MinGap >= c.MaxGap {
		return config{}, searchError("bounds MinGap", c.MinGap, "need 0 ≤ MinGap < MaxGap (= "+c.MaxGap.String()+"), both finite", ErrBounds)
	}
	if s.MaxLength != 0 {
		if !finite(float64(s.MaxLength)) || s.MaxLength < 0 {
			return config{}, searchError("bound MaxLength", s.MaxLength, "must be positive and finite (0 for none)", ErrBounds)
		}
		c.lmax = float64(s.MaxLength)
		least := s.Before + s.After + units.Length(s.Lenses-1)*c.MinGap
		if float64(least) > c.lmax {
			return config{}, searchError("bound MaxLength", s.MaxLength, "excludes every solution: Before "+s.Before.String()+" + After "+s.After.String()+" + "+
				strconv.Itoa(s.Lenses-1)+" × MinGap "+c.MinGap.String()+" = "+least.String()+" already exceed it", ErrBounds)
		}
	}
	c.d1max = math.Min(float64(c.MaxGap), c.lmax-float64(s.Before+s.After+c.MinGap))
	if c.MinTransmission == 0 {
		c.MinTransmission = beam.DefaultMinTransmission
	}
	if !(c.MinTransmission > 0 && c.MinTransmission <= 1) {
		return config{}, searchError("MinTransmission", s.MinTransmission, "must be in (0, 1], or 0 for 0.99", ErrInput)
	}
	if c.Placement == 0 {
		c.Placement = DefaultPlacement
	}
	if !finite(float64(c.Placement)) || c.Placement < 0 {
		return config{}, searchError("Placement", s.Placement, "must be positive and finite", ErrInput)
	}
	if c.Keep == 0 {
		c.Keep = DefaultKeep
	}
	if c.Keep < 0 {
		return config{}, searchError("Keep", s.Keep, "must be ≥ 0 (0 for 10)", ErrInput)
	}
	c.w = DefaultWeights()
	if s.Weights != nil {
		c.w = *s.Weights
		for _, w := range []struct {
			name string
			v    float64
		}{{"Length", c.w.Length}, {"Tolerance", c.w.Tolerance}, {"Aperture", c.w.Aperture}, {"Aberration", c.w.Aberration}} {
			if !(w.v >= 0) || math.IsInf(w.v, 0) {
				return config{}, searchError("Weights."+w.name, w.v, "must be ≥ 0 and finite", ErrInput)
			}
		}
	}
	if err := st.Validate(); err != nil {
		return config{}, err
	}
	if n := st.Count(); n < s.Lenses {
		return config{}, &ParamError{Where: st.where(), Param: "lenses", Value: n, Reason: "owned, but a " + c.combinations + " needs " + strconv.Itoa(s.Lenses), Err: ErrEmpty}
	}
	c.lenses = st.Lenses
	// Validate the goals once, on the system of the first combination.
	used, seq := make([]int, len(c.lenses)), []int(nil)
	for len(seq) < s.Lenses {
		for j, l := range c.lenses {
			if used[j] < l.Count {
				used[j]++
				seq = append(seq, j)
				break
			}
		}
	}
	gaps := make([]float64, s.Lenses-1)
	for i := range gaps {
		gaps[i] = float64(c.MinGap)
	}
	sys, err := c.system(seq, nil, gaps)
	if err != nil {
		return config{}, err
	}
	c.vars, c.goals = c.problemParts()
	p := c.problem(sys)
	if err := p.Validate(); err != nil {
		return config{}, err
	}
	for _, g := range p.Goals {
		c.goalNames = append(c.goalNames, g.Name)
	}
	return c, nil
}

// The labels of the lenses and spaces of a candidate system.
var (
	lensLabels = [3]string{"L1", "L2", "L3"}
	gapLabels  = [2]string{"d1", "d2"}
)

// label returns the position label of lens i, "L1".
func label(i int) string { return lensLabels[i] }

// system builds the thin-lens system of the lenses seq (stock indices;
// orientation rev) at gaps (metres).
func (c *config) system(seq []int, rev []bool, gaps []float64) (paraxial.System, error) {
	b := paraxial.NewBuilder()
	if c.Before > 0 {
		b.Space(c.Before).Label("before")
	}
	for i, k := range seq {
		l := c.lenses[k]
		if rev != nil && rev[i] {
			l = l.Reversed()
		}
		l.addThin(b, label(i))
		if i < len(gaps) {
			b.Space(units.Length(gaps[i])).Label(gapLabels[i])
		}
	}
	if c.After > 0 {
		b.Space(c.After).Label("after")
	}
	return b.Build()
}

// problem returns the design problem of a candidate system: the spacings
// as variables within the bounds, the conditions and the goals (slices
// shared by every candidate; nothing modifies them).
func (c *config) problem(sys paraxial.System) design.Problem {
	return design.Problem{System: sys, Variables: c.vars, Goals: c.goals}
}

func (c *config) problemParts() ([]design.Variable, []design.Goal) {
	var p design.Problem
	for i := 0; i < c.Lenses-1; i++ {
		hi := c.MaxGap
		if i == 0 && c.Lenses == 3 {
			hi = units.Length(c.d1max)
		} else if !math.IsInf(c.lmax, 0) {
			hi = min(hi, units.Length(c.lmax)-c.Before-c.After)
		}
		p.Variables = append(p.Variables, design.Spacing(gapLabels[i], c.MinGap, max(hi, c.MinGap)))
	}
	last := label(c.Lenses - 1)
	for _, cond := range c.Solve {
		p.Goals = append(p.Goals, cond.Goal(c.In, last))
	}
	p.Goals = append(p.Goals, c.Goals...)
	return p.Variables, p.Goals
}

// Fast model: thin lenses in air act on the q parameter by
// q → q + d (a gap) and 1/q → 1/q − 1/f (a lens) (H. Kogelnik & T. Li,
// "Laser beams and resonators", Appl. Opt. 5, 1550 (1966)); the search
// solves and scores with it and judges the solutions on paraxial systems.

// lensQ returns 1/(1/q − 1/f), in real arithmetic (the complex division
// of the runtime guards against overflow and costs several times more;
// q here is a beam, |q| between about 1 µm and 1 km).
func lensQ(q complex128, f float64) complex128 {
	a, b := real(q), imag(q)
	m := a*a + b*b
	r, s := a/m-1/f, -b/m
	n := r*r + s*s
	return complex(r/n, -s/n)
}

// radiusQ returns the 1/e² radius of the beam q with effective
// wavelength lam: w² = lam |q|² / (π Im q).
func radiusQ(q complex128, lam float64) float64 {
	a := real(q)*real(q) + imag(q)*imag(q)
	return math.Sqrt(lam * a / (math.Pi * imag(q)))
}

// chain is one combination in the fast model.
type chain struct {
	c   *config
	seq []int
	f   [3]float64
}

// trace sets q[i] to the beam (starting as q0 at the input plane) just
// before lens i, and q[n] to the beam just after the last lens, for the
// gaps d.
func (ch *chain) trace(q0 complex128, d []float64, q []complex128) {
	n := len(ch.seq)
	qq := q0 + complex(float64(ch.c.Before), 0)
	for i := 0; i < n; i++ {
		q[i] = qq
		qq = lensQ(qq, ch.f[i])
		if i < n-1 {
			qq += complex(d[i], 0)
		}
	}
	q[n] = qq
}

// mainMiss returns Solve[0]'s miss for gaps d.
func (ch *chain) mainMiss(d []float64) float64 {
	var q [4]complex128
	ch.trace(ch.c.gx.Q, d, q[:len(ch.seq)+1])
	n := len(ch.seq)
	return ch.c.Solve[0].miss(q[n], ch.f[n-1], ch.c.lam)
}

// afterSecond returns the tangential beam just after L2 of a triple for
// the first gap d1.
func (ch *chain) afterSecond(d1 float64) complex128 {
	q := ch.c.gx.Q + complex(float64(ch.c.Before), 0)
	q = lensQ(q, ch.f[0]) + complex(d1, 0)
	return lensQ(q, ch.f[1])
}

// outer returns Solve[1]'s miss for a triple at the first gap d1, with
// the last gap on branch k of Solve[0], and that gap.
func (ch *chain) outer(d1 float64, k int) (miss, d2 float64, ok bool) {
	q := ch.afterSecond(d1)
	d2, ok = ch.c.Solve[0].lastGap(q, ch.f[2], ch.c.lam, k)
	if !ok {
		return 0, 0, false
	}
	m := ch.c.Solve[1].miss(lensQ(q+complex(d2, 0), ch.f[2]), ch.f[2], ch.c.lam)
	return m, d2, finite(m)
}

// solutions returns the gap sets that meet the conditions (within or out
// of the bounds), each with its branch and root index.
func (ch *chain) solutions(dst []solution) []solution {
	c := ch.c
	if len(ch.seq) == 2 {
		q := lensQ(c.gx.Q+complex(float64(c.Before), 0), ch.f[0])
		for k := 0; k < c.Solve[0].branches(); k++ {
			if d, ok := c.Solve[0].lastGap(q, ch.f[1], c.lam, k); ok {
				dst = append(dst, solution{gaps: [2]float64{d}, branch: k})
			}
		}
		return dst
	}
	lo, hi := float64(c.MinGap), c.d1max
	if !(hi > lo) {
		return dst
	}
	const n = OuterIntervals
	for k := 0; k < c.Solve[0].branches(); k++ {
		var xs, ms [n + 1]float64
		var oks [n + 1]bool
		for i := 0; i <= n; i++ {
			x := lo + (hi-lo)*float64(i)/n
			if i == n {
				x = hi
			}
			xs[i] = x
			ms[i], _, oks[i] = ch.outer(x, k)
		}
		root := 0
		add := func(x float64) {
			if _, d2, ok := ch.outer(x, k); ok {
				dst = append(dst, solution{gaps: [2]float64{x, d2}, branch: k, root: root})
				root++
			}
		}
		f := func(x float64) (float64, error) {
			m, _, ok := ch.outer(x, k)
			if !ok {
				return 0, errUndefined
			}
			return m, nil
		}
		for i := 0; i <= n; i++ {
			if !oks[i] {
				continue
			}
			if ms[i] == 0 {
				add(xs[i])
				continue
			}
			if i == 0 || !oks[i-1] || ms[i-1] == 0 || (ms[i-1] > 0) == (ms[i] > 0) {
				continue
			}
			x, err := design.Root(f, xs[i-1], xs[i], outerXTol)
			if err != nil {
				continue
			}
			if m, _, ok := ch.outer(x, k); !ok || math.Abs(m) > math.Min(math.Abs(ms[i-1]), math.Abs(ms[i])) {
				continue // a pole, not a root
			}
			add(x)
		}
	}
	return dst
}

// outerXTol is the tolerance of the first spacing of a triple, 0.1 nm.
const outerXTol = 1e-10

var errUndefined = &ParamError{Where: "search", Reason: "the last gap has no solution here", Err: ErrNoCandidate}

// solution is one set of gaps of a combination.
type solution struct {
	gaps   [2]float64
	branch int
	root   int
}

// key orders solutions deterministically: by the stock indices, the
// branch and the root index.
type key struct {
	seq          [3]int
	branch, root int
}

func (a key) compare(b key) int {
	for i := range a.seq {
		if c := cmp.Compare(a.seq[i], b.seq[i]); c != 0 {
			return c
		}
	}
	if c := cmp.Compare(a.branch, b.branch); c != 0 {
		return c
	}
	return cmp.Compare(a.root, b.root)
}

// Reasons of rejection, in the order they are tested.
const (
	rejNoSolution = iota
	rejMinGap
	rejMaxGap
	rejLength
	rejClipped
	rejNotComputable
	rejGoal // + goal index
)

// best keeps the smallest value seen, ties broken by key.
type best struct {
	ok   bool
	v    float64
	k    key
	text string
}

func (b *best) offer(v float64, k key, text func() string) {
	if !b.ok || v < b.v || (v == b.v && k.compare(b.k) < 0) {
		*b = best{ok: true, v: v, k: k, text: text()}
	}
}

func (b *best) merge(o best) {
	if o.ok && (!b.ok || o.v < b.v || (o.v == b.v && o.k.compare(b.k) < 0)) {
		*b = o
	}
}

// tally is what one worker found.
type tally struct {
	combinations, solutions, evaluated, met int
	rejected                                []int
	goalBest                                []best // per goal: smallest |residual|
	goalMet                                 []bool
	costBest                                best // smallest cost among evaluated solutions that miss
	boundBest                               best // smallest bound violation (metres)
	clipBest                                best // largest transmission among clipped (v = −T)
	errText                                 best // first goal error by key
	top                                     []Candidate
	keys                                    []key
}

func newTally(c *config) *tally {
	return &tally{rejected: make([]int, rejGoal+len(c.goalNames)), goalBest: make([]best, len(c.goalNames)), goalMet: make([]bool, len(c.goalNames))}
}

// Run searches st: every ordered combination of Lenses lenses, each
// stock entry used at most its Count times (a pair of two identical
// lenses needs a count of 2; the two are not told apart, so each
// combination appears once), with the spacings solved (see [Search]). The
// work is spread over runtime.GOMAXPROCS goroutines by the first lens;
// the result does not depend on their number or timing.
//
// It returns a [*ParamError] for an invalid search or stock (wrapping
// [ErrInput], [ErrBounds] for bounds that leave no room, [ErrEmpty] for an
// empty stock or fewer lenses than a combination needs), and, when no
// combination meets every condition and goal, one wrapping
// [ErrNoCandidate] together with the Result, whose Rejections say why:
// the message names the goal no combination meets and the closest value
// ("no pair meets goal \"output radius\": closest was 2.31 mm (wanted 3 ±
// 0.1 mm) with PCX-025-A+PCX-075-A"), or the bound that excludes every
// solution.
func (s Search) Run(st Stock) (Result, error) {
	c, err := s.config(st)
	if err != nil {
		return Result{}, err
	}
	workers := min(runtime.GOMAXPROCS(0), len(c.lenses))
	tallies := make([]*tally, workers)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range workers {
		t := newTally(&c)
		tallies[w] = t
		wg.Add(1)
		go func() {
			defer wg.Done()
			used := make([]int, len(c.lenses))
			seq := make([]int, 0, 3)
			var sols []solution
			for {
				i := int(next.Add(1) - 1)
				if i >= len(c.lenses) {
					return
				}
				used[i]++
				seq = append(seq[:0], i)
				c.walk(t, used, seq, &sols)
				used[i]--
			}
		}()
	}
	wg.Wait()
	t := tallies[0]
	for _, o := range tallies[1:] {
		t.merge(o, c.Keep)
	}
	t.trim(c.Keep)
	r := Result{Lenses: c.Lenses, Combinations: t.combinations, Solutions: t.solutions, Met: t.met, Weights: c.w, Candidates: t.top}
	for i := range r.Candidates {
		r.Candidates[i].Rank = i + 1
	}
	for j, n := range t.rejected {
		if n > 0 {
			r.Rejections = append(r.Rejections, Rejection{Reason: c.reason(j), Count: n})
		}
	}
	if t.met == 0 {
		return r, c.noCandidate(t)
	}
	return r, nil
}

// walk extends seq by every lens still available and processes the full
// combinations.
func (c *config) walk(t *tally, used, seq []int, sols *[]solution) {
	if len(seq) == c.Lenses {
		c.process(t, seq, sols)
		return
	}
	for j := range c.lenses {
		if used[j] >= c.lenses[j].Count {
			continue
		}
		used[j]++
		c.walk(t, used, append(seq, j), sols)
		used[j]--
	}
}

// combo names a combination by its stock labels: "PCX-050-A+PCX-150-A".
func (c *config) combo(k key) string {
	s := ""
	for i := 0; i < c.Lenses; i++ {
		if i > 0 {
			s += "+"
		}
		s += c.lenses[k.seq[i]].Label
	}
	return s
}

// process solves and judges one combination.
func (c *config) process(t *tally, seq []int, sols *[]solution) {
	t.combinations++
	ch := chain{c: c, seq: seq}
	var k key
	for i, j := range seq {
		ch.f[i] = float64(c.lenses[j].Focal)
		k.seq[i] = j
	}
	*sols = ch.solutions((*sols)[:0])
	if len(*sols) == 0 {
		t.rejected[rejNoSolution]++
		return
	}
	n := len(seq)
	for _, sol := range *sols {
		k.branch, k.root = sol.branch, sol.root
		gaps := sol.gaps[:n-1]
		length := float64(c.Before + c.After)
		viol, reason := 0.0, -1
		for _, d := range gaps {
			length += d
			if v := float64(c.MinGap) - d; v > viol {
				viol, reason = v, rejMinGap
			}
			if v := d - float64(c.MaxGap); v > viol {
				viol, reason = v, rejMaxGap
			}
		}
		if reason < 0 && length > c.lmax {
			viol, reason = length-c.lmax, rejLength
		}
		if reason >= 0 {
			t.rejected[reason]++
			t.boundBest.offer(viol, k, func() string { return c.boundText(k, gaps, length, reason) })
			continue
		}
		t.solutions++
		// The beam at each lens in both planes, and the clipping.
		var qx, qy [4]complex128
		ch.trace(c.gx.Q, gaps, qx[:n+1])
		ch.trace(c.gy.Q, gaps, qy[:n+1])
		var cand Candidate
		var radii [3]units.Length
		var reversed [3]bool
		cand.Radii, cand.Reversed = radii[:n], reversed[:n]
		cand.Transmission = 1
		for i, j := range seq {
			wx, wy := radiusQ(qx[i], c.lam), radiusQ(qy[i], c.gy.BeamQuality()*float64(c.gy.Wavelength))
			a := float64(c.lenses[j].ClearRadius())
			cand.Radii[i] = units.Length(wx)
			cand.Fill = math.Max(cand.Fill, math.Max(wx, wy)/a)
			cand.Transmission = math.Min(cand.Transmission, beam.CircularTransmission(units.Length(a), units.Length(wx), units.Length(wy)))
		}
		if cand.Transmission < c.MinTransmission {
			t.rejected[rejClipped]++
			tr := cand.Transmission
			t.clipBest.offer(-tr, k, func() string { return c.combo(k) + " (" + percent(tr) + ")" })
			continue
		}
		// Orientation and aberration.
		c.orient(&cand, seq, qx[:n])
		sys, err := c.system(seq, cand.Reversed, gaps)
		if err != nil {
			t.rejected[rejNotComputable]++
			t.errText.offer(0, k, func() string { return c.combo(k) + ": " + oneLine(err) })
			continue
		}
		p := c.problem(sys)
		e, err := p.Evaluate(sys)
		if err != nil {
			t.rejected[rejNotComputable]++
			t.errText.offer(0, k, func() string { return c.combo(k) + ": " + oneLine(err) })
			continue
		}
		t.evaluated++
		missed := -1
		for g, tg := range e.Targets {
			if tg.Met() {
				t.goalMet[g] = true
			} else if missed < 0 {
				missed = g
			}
			t.goalBest[g].offer(math.Abs(e.Residuals[g]), k, func() string { return tg.ValueText() + " (wanted " + tg.Wanted() + ") with " + c.combo(k) })
		}
		if missed >= 0 {
			t.rejected[rejGoal+missed]++
			t.costBest.offer(e.Cost, k, func() string {
				return c.combo(k) + " (cost " + strconv.FormatFloat(e.Cost, 'g', 3, 64) + "), missing " + missedList(e.Targets)
			})
			continue
		}
		if c.Aberration == RealRays {
			if err := c.realOrient(&cand, seq, gaps, qx[0]); err != nil {
				t.rejected[rejNotComputable]++
				t.errText.offer(0, k, func() string { return c.combo(k) + ": real rays: " + oneLine(err) })
				continue
			}
		}
		t.met++
		c.finish(&cand, &ch, seq, gaps, length, p, e)
		t.top = append(t.top, cand)
		t.keys = append(t.keys, k)
		if len(t.top) >= 2*c.Keep+16 {
			t.trim(c.Keep)
		}
	}
}

// orient chooses each lens's orientation to make |Σ S_I| smallest (ties:
// as listed) and sets the aberration fields of cand; q holds the
// tangential beam just before each lens.
func (c *config) orient(cand *Candidate, seq []int, q []complex128) {
	n := len(seq)
	var s [3][2]float64
	var flip [3]bool
	for i, j := range seq {
		l := c.lenses[j]
		h := MarginalFactor * float64(cand.Radii[i])
		conj := Conjugate(l.Focal, real(1/q[i]))
		s[i][0] = float64(l.Seidel(units.Length(h), conj))
		s[i][1] = float64(l.Reversed().Seidel(units.Length(h), conj))
		flip[i] = l.Kind != Achromat && s[i][1] != s[i][0]
	}
	bestMask, bestSum := 0, math.Inf(1)
	for mask := 0; mask < 1<<n; mask++ {
		sum, ok := 0.0, true
		for i := 0; i < n; i++ {
			r := mask >> i & 1
			if r == 1 && !flip[i] {
				ok = false
				break
			}
			sum += s[i][r]
		}
		if ok && math.Abs(sum) < math.Abs(bestSum) {
			bestMask, bestSum = mask, sum
		}
	}
	for i := 0; i < n; i++ {
		cand.Reversed[i] = bestMask>>i&1 == 1
	}
	cand.Seidel = units.Length(bestSum)
	cand.RMS = float64(SphericalRMS(cand.Seidel)) / float64(c.gx.Wavelength)
}

// finish fills in the rest of a candidate that meets every goal.
func (c *config) finish(cand *Candidate, ch *chain, seq []int, gaps []float64, length float64, p design.Problem, e design.Evaluation) {
	n := len(seq)
	cand.Radii = append([]units.Length(nil), cand.Radii...)
	cand.Reversed = append([]bool(nil), cand.Reversed...)
	cand.Lenses = make([]Lens, n)
	for i, j := range seq {
		cand.Lenses[i] = c.lenses[j]
		if cand.Reversed[i] {
			cand.Lenses[i] = cand.Lenses[i].Reversed()
		}
	}
	cand.Gaps = make([]units.Length, n-1)
	cand.VertexGaps = make([]units.Length, n-1)
	for i, d := range gaps {
		cand.Gaps[i] = units.Length(d)
		_, back := cand.Lenses[i].PrincipalPlanes()
		front, _ := cand.Lenses[i+1].PrincipalPlanes()
		cand.VertexGaps[i] = units.Length(d) - front + back
	}
	cand.Length = units.Length(length)
	p.Variables, p.Goals = slices.Clone(p.Variables), slices.Clone(p.Goals)
	cand.Problem, cand.Evaluation = p, e
	// Tolerance: central differences of the main condition's miss.
	h := float64(DifferenceStep)
	grad := 0.0
	var d [2]float64
	for i := range gaps {
		copy(d[:], gaps)
		d[i] = gaps[i] + h
		mp := ch.mainMiss(d[:n-1])
		d[i] = gaps[i] - h
		mm := ch.mainMiss(d[:n-1])
		g := (mp - mm) / (2 * h)
		grad += g * g
	}
	grad = math.Sqrt(grad)
	tol := c.Solve[0].tol
	cand.GapTolerance = units.Length(tol / grad)
	cand.Sensitivity = float64(c.Placement) * grad / tol
	cand.Score = Score{
		Length:     c.w.Length * length,
		Tolerance:  c.w.Tolerance * cand.Sensitivity,
		Aperture:   c.w.Aperture * cand.Fill,
		Aberration: c.w.Aberration * cand.RMS / MarechalRMS,
	}
	cand.Score.Total = cand.Score.Length + cand.Score.Tolerance + cand.Score.Aperture + cand.Score.Aberration
}

// trim sorts the kept candidates (score, then key) and keeps the best n.
func (t *tally) trim(n int) {
	idx := make([]int, len(t.top))
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(a, b int) int {
		if c := cmp.Compare(t.top[a].Score.Total, t.top[b].Score.Total); c != 0 {
			return c
		}
		return t.keys[a].compare(t.keys[b])
	})
	if len(idx) > n {
		idx = idx[:n]
	}
	top, keys := make([]Candidate, len(idx)), make([]key, len(idx))
	for i, j := range idx {
		top[i], keys[i] = t.top[j], t.keys[j]
	}
	t.top, t.keys = top, keys
}

func (t *tally) merge(o *tally, keep int) {
	t.combinations += o.combinations
	t.solutions += o.solutions
	t.evaluated += o.evaluated
	t.met += o.met
	for i := range t.rejected {
		t.rejected[i] += o.rejected[i]
	}
	for i := range t.goalBest {
		t.goalBest[i].merge(o.goalBest[i])
		t.goalMet[i] = t.goalMet[i] || o.goalMet[i]
	}
	t.costBest.merge(o.costBest)
	t.boundBest.merge(o.boundBest)
	t.clipBest.merge(o.clipBest)
	t.errText.merge(o.errText)
	t.top = append(t.top, o.top...)
	t.keys = append(t.keys, o.keys...)
	t.trim(keep)
}

// reason describes rejection reason j.
func (c *config) reason(j int) string {
	switch j {
	case rejNoSolution:
		return "no spacing meets the conditions (" + c.conditionList() + ")"
	case rejMinGap:
		return "a spacing below MinGap = " + c.MinGap.String()
	case rejMaxGap:
		return "a spacing above MaxGap = " + c.MaxGap.String()
	case rejLength:
		return "longer than MaxLength = " + units.Length(c.lmax).String()
	case rejClipped:
		return "clipped: a lens's clear aperture passes less than " + percent(c.MinTransmission)
	case rejNotComputable:
		return "a goal cannot be computed"
	}
	return "misses goal " + errtext.Quote(c.goalNames[j-rejGoal])
}

func (c *config) conditionList() string {
	s := ""
	for i, cond := range c.Solve {
		if i > 0 {
			s += "; "
		}
		s += cond.String()
	}
	return s
}

// boundText says which bound a solution violates.
func (c *config) boundText(k key, gaps []float64, length float64, reason int) string {
	g := ""
	for i, d := range gaps {
		if i > 0 {
			g += ", "
		}
		g += "d" + strconv.Itoa(i+1) + " = " + units.Length(d).String()
	}
	switch reason {
	case rejLength:
		return c.combo(k) + " at " + g + ", length " + units.Length(length).String() + " (" + units.Length(length-c.lmax).String() + " above MaxLength)"
	case rejMinGap:
		return c.combo(k) + " at " + g + " (below MinGap)"
	}
	return c.combo(k) + " at " + g + " (above MaxGap)"
}

// noCandidate explains why nothing met the goals.
func (c *config) noCandidate(t *tally) error {
	what := "no " + c.combinations
	switch {
	case t.solutions == 0 && t.boundBest.ok:
		param, v, verb := "bounds [MinGap, MaxGap]", any("["+c.MinGap.String()+", "+c.MaxGap.String()+"]"), "exclude"
		if t.rejected[rejLength] > 0 && t.rejected[rejLength] >= t.rejected[rejMinGap]+t.rejected[rejMaxGap] {
			param, v, verb = "bound MaxLength", units.Length(c.lmax), "excludes"
		}
		return &ParamError{Where: "search", Param: param, Value: v,
			Reason: verb + " every solution of the conditions (" + c.conditionList() + "): closest was " + t.boundBest.text, Err: errExcluded}
	case t.solutions == 0:
		return &ParamError{Where: "search", Reason: what + " meets the conditions (" + c.conditionList() + ") with any spacing", Err: ErrNoCandidate}
	case t.evaluated == 0 && t.clipBest.ok && t.rejected[rejClipped] >= t.rejected[rejNotComputable]:
		return &ParamError{Where: "search", Param: "MinTransmission", Value: c.MinTransmission,
			Reason: "every solution is clipped by a lens's clear aperture; the least clipped was " + t.clipBest.text, Err: ErrNoCandidate}
	case t.evaluated == 0:
		return &ParamError{Where: "search", Reason: "no goal could be computed for any solution; first: " + t.errText.text, Err: ErrNoCandidate}
	}
	for g, ok := range t.goalMet {
		if !ok {
			return &ParamError{Where: "search", Reason: what + " meets goal " + errtext.Quote(c.goalNames[g]) + ": closest was " + t.goalBest[g].text, Err: ErrNoCandidate}
		}
	}
	return &ParamError{Where: "search", Reason: what + " meets every goal at once: closest was " + t.costBest.text, Err: ErrNoCandidate}
}

// excluded is the cause of a search whose bounds exclude every solution:
// it wraps both ErrNoCandidate and ErrBounds.
type excluded struct{}

func (excluded) Error() string   { return "stock: no combination meets the goals within the bounds" }
func (excluded) Unwrap() []error { return []error{ErrNoCandidate, ErrBounds} }

var errExcluded error = excluded{}

// oneLine joins the lines of a multi-line error message with ": ".
func oneLine(err error) string { return strings.ReplaceAll(err.Error(), "\n", ": ") }

// missedList lists the missed targets with their values: "\"length\"
// (412 mm, wanted ≤ 400 mm)".
func missedList(ts []target.Target) string {
	s := ""
	for _, t := range ts {
		if !t.Met() {
			if s != "" {
				s += ", "
			}
			s += errtext.Quote(t.Name) + " (" + t.ValueText() + ", wanted " + t.Wanted() + ")"
		}
	}
	return s
}

// percent formats a fraction as a percentage with two decimals.
func percent(f float64) string { return strconv.FormatFloat(100*f, 'f', 2, 64) + " %" }
