package budget

import (
	"errors"
	"math"
	"math/cmplx"
	"strconv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Input is the light entering the system at its input plane (z = 0).
type Input struct {
	// Power is the input power P0 in watts: positive and finite.
	Power float64
	// Beam is the Gaussian beam at the input plane (a [beam.Gaussian] or a
	// [beam.Astigmatic]); it gives the clipping at apertures
	// ([beam.Clipping]) and the beam radii for the irradiance. Required.
	Beam beam.Input
	// Polarization is the Jones vector of a fully polarized input, in the
	// beam frame of package polar (x tangential, y sagittal); only its
	// state counts, its length is rescaled to Power. The zero vector means
	// unpolarized light (see the package documentation).
	Polarization polar.Jones
}

// Unpolarized reports whether in describes unpolarized light (the zero
// Polarization).
func (in Input) Unpolarized() bool { return in.Polarization == (polar.Jones{}) }

// Cause is what acted on the beam in one [Action].
type Cause int

// The causes of an [Action]. New causes are appended; the values are
// stable.
const (
	// Fresnel is the transmission of an uncoated refracting surface, from
	// the Fresnel formulas of [polar.Interface] for the beam's state.
	Fresnel Cause = iota + 1
	// AntiReflection is a stated residual reflectance R per surface
	// ([Builder.AR]): T = 1 − R, (1 − R)² for a thin lens.
	AntiReflection
	// Reflectance is a stated mirror reflectance R ([Builder.Mirror]):
	// T = R.
	Reflectance
	// Split is a stated beam-splitter fraction ([Builder.Split]) that
	// continues along the path.
	Split
	// Clipping is the fraction a clear aperture passes,
	// [beam.Clip.Transmission].
	Clipping
	// Polarizing is an inserted Jones matrix ([Builder.Insert]).
	Polarizing
	// Coupling is a stated coupling efficiency ([Builder.Coupling]).
	Coupling
	// NotModelled marks an element whose loss is neither modelled nor
	// stated (a mirror without a reflectance, a thin lens without an AR
	// statement, a user matrix): T = 1, and the row says so.
	NotModelled
)

// String returns the lower-case name of c, for example "Fresnel" or
// "clipping".
func (c Cause) String() string {
	switch c {
	case Fresnel:
		return "Fresnel"
	case AntiReflection:
		return "AR coating"
	case Reflectance:
		return "reflectance"
	case Split:
		return "split"
	case Clipping:
		return "clipping"
	case Polarizing:
		return "polarizing"
	case Coupling:
		return "coupling"
	case NotModelled:
		return "not modelled"
	}
	return "Cause(" + strconv.Itoa(int(c)) + ")"
}

// Action is one effect at one element.
type Action struct {
	// Cause is what acted.
	Cause Cause
	// Detail describes it in words with its numbers, for example
	// "uncoated n 1 → 1.5 at 0°: Ts = Tp = 0.96".
	Detail string
	// Transmission is the power after the action over the power before
	// it (dimensionless, in [0, 1]). For Fresnel surfaces and inserted
	// matrices it is the value for the actual state; it is 0 for them
	// when no light reached the element (power exactly 0). Scalar factors
	// (coatings, clipping, couplings) report their factor.
	Transmission float64
}

// Row is the beam after one element.
type Row struct {
	// Element is the index in [paraxial.System.Elements], Name how
	// messages name it ([paraxial.Element.Name]), Label its label and
	// Kind its kind.
	Element int
	Name    string
	Label   string
	Kind    paraxial.Kind
	// Z is the position in metres from the input plane: the surface's Z,
	// or the exit of a space.
	Z units.Length
	// Actions holds what acted, in order (see the package documentation).
	Actions []Action
	// Transmission is the element's transmission, the power after it over
	// the power before it (the product of the actions' transmissions); 0
	// when no light reached it.
	Transmission float64
	// Power is the power after the element, in watts.
	Power float64
	// Fraction is Power over the input power (dimensionless): the product
	// of the Transmission of this and every earlier row.
	Fraction float64
	// W and WY are the 1/e² beam radii in x and y at Z, in metres.
	W, WY units.Length
	// Irradiance is the on-axis peak irradiance after the element, in
	// W/m²: [beam.PeakIrradiance](Power, W, WY) = 2P/(π wx wy). Show
	// [beam.SafetyNote] with it.
	Irradiance float64
	// Stokes is the polarization state after the element, with S0 = Power
	// in watts.
	Stokes polar.Stokes
	// Jones is the Jones vector after the element, in √W (|Jones|² =
	// Power), for a polarized input; the zero vector for an unpolarized
	// one.
	Jones polar.Jones
}

// Budget is the power budget along a system, as [Builder.Build] returns
// it.
type Budget struct {
	// Input is the input as given.
	Input Input
	// Length is the system's length in metres, the position of its
	// output plane ([paraxial.System.Length]).
	Length units.Length
	// W and WY are the beam radii at the input plane, in metres, and
	// Irradiance the input's on-axis peak irradiance 2P0/(π wx wy) in W/m².
	W, WY      units.Length
	Irradiance float64
	// Rows holds the beam after each element where something acts, in
	// path order.
	Rows []Row
	// Note is [beam.SafetyNote]; show it wherever the irradiances are
	// shown.
	Note string
}

// Output returns the power after the last row in watts (the input power
// when no element acts).
func (b Budget) Output() float64 {
	if len(b.Rows) == 0 {
		return b.Input.Power
	}
	return b.Rows[len(b.Rows)-1].Power
}

// Fraction returns the output power over the input power (dimensionless),
// the product of the rows' transmissions.
func (b Budget) Fraction() float64 {
	if len(b.Rows) == 0 {
		return 1
	}
	return b.Rows[len(b.Rows)-1].Fraction
}

// statement is one builder call that acts at a label.
type statement struct {
	cause       Cause
	method      string
	call        int
	label       string
	first, last int     // the labelled part
	at          int     // the element it acts at (surface statements: first surface)
	value       float64 // R, split, coupling
	what        string  // description of an insert
	m           polar.JonesMatrix
}

func (s statement) subject() string {
	return s.method + " " + errtext.Quote(s.label) + " (call " + strconv.Itoa(s.call) + ")"
}

// Builder collects the statements of a power budget for one system and
// input. Create it with [NewBuilder], chain the statements, and call
// [Builder.Build]:
//
//	b, err := budget.NewBuilder(sys, in).
//		AR("L1", 0.005).Mirror("M1", 0.99).
//		Insert("HWP", "half-wave plate at 22.5°", hwp).
//		Coupling("fibre", 0.7).Build()
//
// The setters never panic on user data. The first invalid value (or an
// invalid system or input, found by NewBuilder) is kept and returned by
// Build; later calls are then ignored. Labels are resolved with
// [paraxial.System.Part] when the statement is made. A Builder is not safe
// for concurrent use.
type Builder struct {
	sys   paraxial.System
	in    Input
	elems []paraxial.Element
	calls int
	stmts []statement
	err   error
}

// NewBuilder returns a builder for the budget of sys with input in. It
// checks both at once: an unbuilt system, a power that is not positive
// and finite, a missing or invalid beam, or a Polarization with
// non-finite components becomes the builder's error.
func NewBuilder(sys paraxial.System, in Input) *Builder {
	b := &Builder{sys: sys, in: in}
	if err := sys.Validate(); err != nil {
		b.err = &ParamError{Subject: "system", Reason: "need a system made by paraxial.Builder.Build", Err: err}
		return b
	}
	b.elems = sys.Elements()
	if !finite(in.Power) || !(in.Power > 0) {
		b.err = &ParamError{Subject: "input", Param: "power P0", Value: watts(in.Power), Reason: "must be positive and finite"}
		return b
	}
	if in.Beam == nil {
		b.err = &ParamError{Subject: "input", Param: "beam", Reason: "is nil: the budget needs the input beam for clipping and irradiance"}
		return b
	}
	if _, err := beam.AtXY(sys, in.Beam, 0); err != nil {
		b.err = &ParamError{Subject: "input", Param: "beam", Err: err}
		return b
	}
	v := in.Polarization
	if cmplx.IsNaN(v.X) || cmplx.IsInf(v.X) || cmplx.IsNaN(v.Y) || cmplx.IsInf(v.Y) || !finite(v.Power()) {
		b.err = &ParamError{Subject: "input", Param: "polarization", Value: v.String(), Reason: "components must be finite (the zero vector for unpolarized light)"}
	}
	return b
}

// begin counts a call and reports whether the builder may go on.
func (b *Builder) begin() bool {
	b.calls++
	return b.err == nil
}

// part resolves the label of statement s (method and call set) into its
// element range; it records an error and returns false if that fails.
func (b *Builder) part(s *statement) bool {
	p, err := b.sys.Part(s.label)
	if err != nil {
		pe := &ParamError{Subject: s.subject(), Param: "label", Value: errtext.Quote(s.label), Err: err}
		var ee *paraxial.ElementError
		if errors.As(err, &ee) {
			pe.Reason, pe.Err = ee.Reason, ee.Err
		}
		b.err = pe
		return false
	}
	s.first, s.last, s.at = p.First, p.Last, p.Last
	return true
}

// fraction records an error unless v is a fraction in [0, 1].
func (b *Builder) fraction(s statement, param string, v float64) bool {
	if !(v >= 0 && v <= 1) { // NaN fails
		b.err = &ParamError{Subject: s.subject(), Param: param, Value: v, Reason: "must be in [0, 1]"}
		return false
	}
	return true
}

func refracting(e paraxial.Element) bool {
	return (e.Kind == paraxial.KindSphericalInterface || e.Kind == paraxial.KindPlanarInterface) && e.IndexIn != e.IndexOut
}

func lens(e paraxial.Element) bool {
	return e.Kind == paraxial.KindThinLens || e.Kind == paraxial.KindCylindricalLens
}

// surfaceStatement adds an AR, Mirror or Split statement.
func (b *Builder) surfaceStatement(c Cause, method, param, label string, v float64) *Builder {
	if !b.begin() {
		return b
	}
	s := statement{cause: c, method: method, call: b.calls, label: label, value: v}
	if !b.fraction(s, param, v) || !b.part(&s) {
		return b
	}
	for _, o := range b.stmts {
		if (o.cause == AntiReflection || o.cause == Reflectance || o.cause == Split) && o.first <= s.last && s.first <= o.last {
			b.err = &ParamError{Subject: s.subject(), Param: "label", Value: errtext.Quote(label), Reason: "call " + strconv.Itoa(o.call) + " (" + o.method + ") already states this part's surface", Err: ErrConflict}
			return b
		}
	}
	s.at = -1
	for i := s.first; i <= s.last; i++ {
		e := b.elems[i]
		if (c == AntiReflection && (refracting(e) || lens(e))) || (c != AntiReflection && e.IsSurface()) {
			s.at = i
			break
		}
	}
	if s.at < 0 {
		reason := "has no surface"
		if c == AntiReflection {
			reason = "has no refracting surface (index change) or lens to coat"
		}
		b.err = &ParamError{Subject: s.subject(), Param: "label", Value: errtext.Quote(label), Reason: reason, Err: ErrNoSurface}
		return b
	}
	b.stmts = append(b.stmts, s)
	return b
}

// AR states that every refracting surface of the part labelled label (each
// element where the index changes; a thin or cylindrical lens counts as
// two surfaces) carries an anti-reflection coating with the residual
// reflectance r per surface (dimensionless, in [0, 1]; 0.0025 for a 0.25 %
// V-coating). Each such surface transmits T = 1 − r (absorption and
// scatter left out) instead of its Fresnel value, for either
// polarization. Surfaces of other parts stay uncoated.
//
// It is an error if r is outside [0, 1] or NaN, the label is unknown
// (wrapping [paraxial.ErrNoLabel]), the part has no refracting surface or
// lens ([ErrNoSurface]), or another surface statement names the same part
// ([ErrConflict]).
func (b *Builder) AR(label string, r float64) *Builder {
	return b.surfaceStatement(AntiReflection, "AR", "residual reflectance R per surface", label, r)
}

// Mirror states the reflectance r (dimensionless, in [0, 1]; 0.99 for a
// protected metal mirror, 0.999 for a dielectric one) of the part labelled
// label, usually a [paraxial.Builder.FlatMirror] or curved mirror: its
// first surface passes T = r of the power along the unfolded path, for
// either polarization, instead of its Fresnel value. A mirror without a
// statement passes everything, and its row says "not modelled".
//
// Its errors are those of [Builder.AR], with [ErrNoSurface] for a part
// that is only a space.
func (b *Builder) Mirror(label string, r float64) *Builder {
	return b.surfaceStatement(Reflectance, "Mirror", "reflectance R", label, r)
}

// Split states that the part labelled label is a beam splitter of which
// the fraction f of the power (dimensionless, in [0, 1]; 0.5 for a 50:50
// splitter, the port's share for another ratio) continues along this path,
// at its first surface and for either polarization. For a polarizing beam
// splitter use [Builder.Insert] with a port of
// [polar.PolarizingBeamSplitter] instead, so that the split follows the
// state.
//
// Its errors are those of [Builder.Mirror].
func (b *Builder) Split(label string, f float64) *Builder {
	return b.surfaceStatement(Split, "Split", "fraction f along the path", label, f)
}

// Insert places the polarizing element m (a power-normalised
// [polar.JonesMatrix] in the beam frame: [polar.Polarizer],
// [polar.HalfWave], a port of [polar.PolarizingBeamSplitter], …) after the
// part labelled label; what describes it in the table ("polarizer at 90°").
// Several inserts at one label act in the order of the calls. The matrix
// acts on the Jones vector of a polarized input and, through its Mueller
// matrix, on the Stokes vector of an unpolarized one, so a polarizer acts
// on the actual state.
//
// It is an error if the label is unknown, an entry of m is not finite, or
// m would add power (its largest singular value σ, with σ² the largest
// eigenvalue of mᴴm, exceeds 1 by more than 1e-12; [ErrActive]).
func (b *Builder) Insert(label, what string, m polar.JonesMatrix) *Builder {
	if !b.begin() {
		return b
	}
	s := statement{cause: Polarizing, method: "Insert", call: b.calls, label: label, what: what, m: m}
	for _, z := range [4]complex128{m.XX, m.XY, m.YX, m.YY} {
		if cmplx.IsNaN(z) || cmplx.IsInf(z) {
			b.err = &ParamError{Subject: s.subject(), Param: "Jones matrix entry", Value: z, Reason: "must be finite"}
			return b
		}
	}
	if g := gain(m); g > 1+1e-12 {
		b.err = &ParamError{Subject: s.subject(), Param: "largest power gain σ²", Value: g, Err: ErrActive}
		return b
	}
	if !b.part(&s) {
		return b
	}
	b.stmts = append(b.stmts, s)
	return b
}

// gain returns the largest eigenvalue of mᴴm, the largest factor by which
// m multiplies the power of any state:
//
//	σ² = (p + r)/2 + √(((p − r)/2)² + |h|²),   mᴴm = [[p, h], [h*, r]]
//
// (the larger eigenvalue of the Hermitian 2×2 matrix mᴴm). This form adds
// squares and does not cancel: the trace–determinant form
// (a + √(a² − 4|det m|²))/2 loses half the digits for a unitary m, whose
// σ² = 1 it then misses by ~1e-8.
func gain(m polar.JonesMatrix) float64 {
	sq := func(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }
	p := sq(m.XX) + sq(m.YX)
	r := sq(m.XY) + sq(m.YY)
	h := cmplx.Conj(m.XX)*m.XY + cmplx.Conj(m.YX)*m.YY
	return (p+r)/2 + math.Hypot((p-r)/2, cmplx.Abs(h))
}

// Coupling states the coupling efficiency eta (dimensionless, in [0, 1])
// after the part labelled label, for example into a single-mode fibre
// whose mode-overlap efficiency was computed elsewhere. It acts after the
// part's inserts, for either polarization.
//
// It is an error if eta is outside [0, 1] or NaN, the label is unknown,
// or the label already has a coupling ([ErrConflict]).
func (b *Builder) Coupling(label string, eta float64) *Builder {
	if !b.begin() {
		return b
	}
	s := statement{cause: Coupling, method: "Coupling", call: b.calls, label: label, value: eta}
	if !b.fraction(s, "coupling efficiency η", eta) || !b.part(&s) {
		return b
	}
	for _, o := range b.stmts {
		if o.cause == Coupling && o.at == s.at {
			b.err = &ParamError{Subject: s.subject(), Param: "label", Value: errtext.Quote(label), Reason: "call " + strconv.Itoa(o.call) + " already states a coupling here", Err: ErrConflict}
			return b
		}
	}
	b.stmts = append(b.stmts, s)
	return b
}

// Err returns the first error met so far, or nil.
func (b *Builder) Err() error { return b.err }

// state is the light between two actions: a Jones vector for polarized
// input, a Stokes vector for unpolarized input.
type state struct {
	polarized bool
	v         polar.Jones
	s         polar.Stokes
}

func (st state) power() float64 {
	if st.polarized {
		return st.v.Power()
	}
	return st.s.S0
}

// scale multiplies the power by t.
func (st *state) scale(t float64) {
	a := complex(math.Sqrt(t), 0)
	st.v = polar.Jones{X: a * st.v.X, Y: a * st.v.Y}
	st.s = polar.Stokes{S0: t * st.s.S0, S1: t * st.s.S1, S2: t * st.s.S2, S3: t * st.s.S3}
}

// apply passes the light through the Jones matrix m.
func (st *state) apply(m polar.JonesMatrix) {
	if st.polarized {
		st.v = m.Apply(st.v)
		return
	}
	st.s = m.Mueller().Apply(st.s)
}

func (st state) stokes() polar.Stokes {
	if st.polarized {
		return st.v.Stokes()
	}
	return st.s
}

// Build computes the budget: it walks the system once
// ([paraxial.System.Walk]), and at every element applies what acts there
// in the order of the package documentation, with the beam radii from
// [beam.AtXY] and the clipping from [beam.Clipping].
//
// It returns the builder's first error, and a [*ParamError] naming the
// element if the beam cannot be propagated to it (wrapping the error of
// package beam) or a computed irradiance is not finite.
func (b *Builder) Build() (Budget, error) {
	if b.err != nil {
		return Budget{}, b.err
	}
	sys, in := b.sys, b.in
	clips, err := beam.Clipping(sys, in.Beam, 0)
	if err != nil {
		return Budget{}, &ParamError{Subject: "input", Param: "beam", Reason: "clipping", Err: err}
	}
	clipAt := make([]*beam.Clip, len(b.elems))
	for i := range clips {
		clipAt[clips[i].Element] = &clips[i]
	}
	// The input state, normalised to the input power.
	st := state{polarized: !in.Unpolarized()}
	if st.polarized {
		k := complex(math.Sqrt(in.Power/in.Polarization.Power()), 0)
		st.v = polar.Jones{X: k * in.Polarization.X, Y: k * in.Polarization.Y}
		if !finite(st.v.Power()) || !(st.v.Power() > 0) {
			return Budget{}, &ParamError{Subject: "input", Param: "polarization", Value: in.Polarization.String(), Reason: "cannot be normalised to the input power"}
		}
	} else {
		st.s = polar.Stokes{S0: in.Power}
	}
	a0, err := beam.AtXY(sys, in.Beam, 0)
	if err != nil {
		return Budget{}, &ParamError{Subject: "input", Param: "beam", Err: err}
	}
	out := Budget{Input: in, Length: sys.Length(), Note: beam.SafetyNote}
	out.W, out.WY = inputRadii(in.Beam, a0)
	out.Irradiance = beam.PeakIrradiance(in.Power, out.W, out.WY)

	for pc := range sys.Walk(0, sys.Length()) {
		i := pc.Element
		e := b.elems[i]
		var acts []Action
		before := st.power()
		scalar := func(c Cause, t float64, detail string) {
			st.scale(t)
			acts = append(acts, Action{Cause: c, Detail: detail, Transmission: t})
		}
		jones := func(c Cause, m polar.JonesMatrix, detail string) {
			p := st.power()
			st.apply(m)
			t := 0.0
			if p > 0 {
				t = math.Min(1, st.power()/p)
			}
			acts = append(acts, Action{Cause: c, Detail: detail, Transmission: t})
		}
		// 1. Clipping of the element's clear aperture.
		if c := clipAt[i]; c != nil {
			scalar(Clipping, c.Transmission, clipDetail(*c))
		}
		// 2. The surface.
		if e.IsSurface() {
			var stated *statement
			for k := range b.stmts {
				s := &b.stmts[k]
				if (s.cause == AntiReflection && i >= s.first && i <= s.last && (refracting(e) || lens(e))) ||
					((s.cause == Reflectance || s.cause == Split) && i == s.at) {
					stated = s
				}
			}
			switch {
			case stated != nil && stated.cause == AntiReflection && lens(e):
				t := (1 - stated.value) * (1 - stated.value)
				scalar(AntiReflection, t, "AR R = "+pct(stated.value)+" per surface, 2 surfaces")
			case stated != nil && stated.cause == AntiReflection:
				scalar(AntiReflection, 1-stated.value, "AR R = "+pct(stated.value)+" ("+indices(e)+")")
			case stated != nil && stated.cause == Reflectance:
				scalar(Reflectance, stated.value, "mirror R = "+pct(stated.value))
			case stated != nil:
				scalar(Split, stated.value, "splitter, "+pct(stated.value)+" along the path")
			case refracting(e):
				tilt := units.Angle(math.Abs(float64(e.Tilt)))
				f, err := polar.Interface(e.IndexIn, e.IndexOut, tilt)
				if err != nil {
					return Budget{}, &ParamError{Subject: e.Name(), Param: "Fresnel surface", Reason: "at z = " + e.Z.String(), Err: err}
				}
				ts, tp := f.Transmittance()
				d := "uncoated " + indices(e) + " at " + table1(tilt.Degrees()) + "°: "
				if sig(ts) == sig(tp) {
					d += "Ts = Tp = " + sig(ts)
				} else {
					d += "Ts = " + sig(ts) + ", Tp = " + sig(tp)
				}
				jones(Fresnel, f.Transmission(), d)
			case e.Kind == paraxial.KindMirror:
				scalar(NotModelled, 1, "mirror: reflectance not stated (taken as 1)")
			case lens(e):
				scalar(NotModelled, 1, e.Kind.String()+": surface losses not modelled (state AR)")
			case e.Kind == paraxial.KindMatrix:
				scalar(NotModelled, 1, "user matrix: no loss modelled")
			}
		}
		// 3. Inserts and 4. the coupling, after the part's last element.
		for _, s := range b.stmts {
			if s.cause == Polarizing && s.at == i {
				d := s.what
				if d == "" {
					d = "Jones matrix"
				}
				jones(Polarizing, s.m, d)
			}
		}
		for _, s := range b.stmts {
			if s.cause == Coupling && s.at == i {
				scalar(Coupling, s.value, "coupling η = "+pct(s.value))
			}
		}
		if len(acts) == 0 && !e.IsSurface() {
			continue // a space where nothing acts
		}
		z := pc.To
		a, err := beam.AtXY(sys, in.Beam, z)
		if err != nil {
			return Budget{}, &ParamError{Subject: e.Name(), Param: "beam at z", Value: z, Err: err}
		}
		p := st.power()
		r := Row{Element: i, Name: e.Name(), Label: e.Label, Kind: e.Kind, Z: z, Actions: acts, Power: p,
			Fraction: p / in.Power, W: a.X.Radius(), WY: a.Y.Radius(), Stokes: st.stokes()}
		if before > 0 {
			r.Transmission = math.Min(1, p/before)
		}
		if st.polarized {
			r.Jones = st.v
		}
		r.Irradiance = beam.PeakIrradiance(p, r.W, r.WY)
		if !finite(p) || !finite(r.Irradiance) {
			return Budget{}, &ParamError{Subject: e.Name(), Param: "peak irradiance I₀", Value: r.Irradiance, Reason: "is not finite (W/m²)"}
		}
		out.Rows = append(out.Rows, r)
	}
	return out, nil
}

// inputRadii returns the beam radii at the input plane, before any surface
// at z = 0 (a surface does not change the radius; a0 is the beam just after
// the surfaces there).
func inputRadii(in beam.Input, a0 beam.Astigmatic) (wx, wy units.Length) {
	switch g := in.(type) {
	case beam.Gaussian:
		return g.Radius(), g.Radius()
	case beam.Astigmatic:
		return g.X.Radius(), g.Y.Radius()
	}
	return a0.X.Radius(), a0.Y.Radius()
}

func clipDetail(c beam.Clip) string {
	d := "clear Ø " + c.Opening.Diameter().String()
	if c.Opening.Shape == paraxial.Slit {
		d = "slit " + c.Opening.Diameter().String()
	}
	if c.Kind == paraxial.KindSpace {
		d += " along the gap (worst at z = " + c.Z.String() + ")"
	}
	return d + ", w = " + c.W.String()
}

func indices(e paraxial.Element) string {
	return "n " + strconv.FormatFloat(e.IndexIn, 'g', 6, 64) + " → " + strconv.FormatFloat(e.IndexOut, 'g', 6, 64)
}

// pct formats a fraction as a percentage with up to four significant
// digits.
func pct(f float64) string { return strconv.FormatFloat(100*f, 'g', 4, 64) + " %" }

func sig(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

func table1(deg float64) string { return strconv.FormatFloat(deg, 'f', 2, 64) }
