package measure

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distmv"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// ErrNotFitted is returned (wrapped in a [*ParamError]) by the methods of
// a [CausticFit] that did not come from [FitCaustic].
var ErrNotFitted = errors.New("measure: not a caustic fit (use FitCaustic)")

// causticM2Floor is how far below 1 (in standard uncertainties) a fitted
// M² may lie and still be taken as 1 by [CausticFit.Beam].
const causticM2Floor = 3

func (f CausticFit) fitted() error {
	if f.X.Planes == 0 || !f.Round && f.Y.Planes == 0 {
		return &ParamError{Where: "caustic fit", Err: ErrNotFitted}
	}
	return nil
}

// spec returns the waist spec of axis a for a beam given at z = at.
func (f CausticFit) spec(a AxisFit, at units.Length) (beam.WaistSpec, error) {
	m2 := a.M2.Value
	if m2 < 1 {
		if m2+causticM2Floor*a.M2.Sigma < 1 {
			return beam.WaistSpec{}, &ParamError{Where: f.Source + ", " + a.Axis + " axis", Param: "M²", Value: a.M2.String(),
				Reason: "is below 1 by more than " + strconv.Itoa(causticM2Floor) + " standard uncertainties, which no beam is: check the wavelength (" + f.Wavelength.String() + "), the width kind (" + f.Kind.String() + ") and the width calibration", Err: ErrNotPhysical}
		}
		m2 = 1
	}
	return beam.WaistSpec{Wavelength: f.Wavelength, WaistRadius: a.W0.Value, WaistZ: a.Z0.Value - at, M2: m2, Index: f.Index}, nil
}

// Beam returns the fitted beam at the plane z = at of the scan's axis
// (for example the rail position of a system's input plane): a
// [beam.Gaussian] for a round fit and a [beam.Astigmatic] one (x
// tangential, y sagittal) for an x/y fit, with the fitted waist radius,
// waist position (WaistZ = Z0 − at) and M², the wavelength and the index
// of the scan. It is an ordinary input of every function of package beam
// ([beam.Waists], [beam.Sample], [beam.AtXY]; type-assert, or use
// [CausticFit.Gaussian], for [beam.At]).
//
// The radius is that of the scan's width kind: for second-moment widths
// the beam's W is ISO 11146's second-moment radius, for 1/e² widths the
// 1/e² radius. A fitted M² below 1 that lies within three standard
// uncertainties of 1 is taken as 1 (keeping W0 and Z0); one further below
// is an error wrapping [ErrNotPhysical]. It also returns the errors of
// [beam.FromWaist] (a beam beyond [beam.MaxDivergence]), one for a
// non-finite at, and one wrapping [ErrNotFitted] for a CausticFit that
// [FitCaustic] did not return.
func (f CausticFit) Beam(at units.Length) (beam.Input, error) {
	if err := f.fitted(); err != nil {
		return nil, err
	}
	if !causticFinite(float64(at)) {
		return nil, &ParamError{Where: f.Source, Param: "reference plane at", Value: at, Reason: "must be finite", Err: ErrInput}
	}
	sx, err := f.spec(f.X, at)
	if err != nil {
		return nil, err
	}
	if f.Round {
		g, err := beam.FromWaist(sx)
		if err != nil {
			return nil, err
		}
		return g, nil
	}
	sy, err := f.spec(f.Y, at)
	if err != nil {
		return nil, err
	}
	a, err := beam.FromWaists(sx, sy)
	if err != nil {
		return nil, err
	}
	return a, nil
}

// Gaussian is [CausticFit.Beam] for a round fit, as a [beam.Gaussian].
// For an x/y fit it returns a [*ParamError] wrapping [ErrInput]; use Beam.
func (f CausticFit) Gaussian(at units.Length) (beam.Gaussian, error) {
	if err := f.fitted(); err != nil {
		return beam.Gaussian{}, err
	}
	if !f.Round {
		return beam.Gaussian{}, &ParamError{Where: f.Source, Param: "Gaussian", Reason: "the fit has x and y axes; use Beam, which returns a beam.Astigmatic", Err: ErrInput}
	}
	in, err := f.Beam(at)
	if err != nil {
		return beam.Gaussian{}, err
	}
	return in.(beam.Gaussian), nil
}

// Propagation selects how [CausticFit.PropagateWaist] carries the
// uncertainty of the fit through a system.
type Propagation int

const (
	// Linearised propagates the covariance of the fit coefficients to the
	// output waist with the Jacobian of the propagation (central finite
	// differences, gonum/diff/fd), σ² = J Σ Jᵀ (GUM, JCGM 100:2008,
	// clause 5). It is exact for small uncertainties.
	Linearised Propagation = iota
	// MonteCarlo draws the fit coefficients from the multivariate normal
	// distribution of their covariance (gonum/stat/distmv, seeded),
	// propagates every draw and reports the standard deviation of the
	// results (GUM Supplement 1, JCGM 101:2008). It also holds where the
	// propagation is far from linear (a waist that moves fast with the
	// input), and reports the sample means.
	MonteCarlo
)

// String returns the method in words.
func (p Propagation) String() string {
	switch p {
	case Linearised:
		return "linearised propagation of the fit covariance (numerical Jacobian)"
	case MonteCarlo:
		return "Monte-Carlo sampling of the fit coefficients"
	}
	return "Propagation(" + strconv.Itoa(int(p)) + ")"
}

// DefaultPropagationSamples is the number of Monte-Carlo draws when
// PropagationOptions.Samples is zero: the relative standard error of a
// standard deviation from N draws is about 1/√(2N), 1.1 % for 4000.
const DefaultPropagationSamples = 4000

// MaxPropagationSamples is the largest number of Monte-Carlo draws.
const MaxPropagationSamples = 1_000_000

// PropagationOptions are the settings of [CausticFit.PropagateWaist].
type PropagationOptions struct {
	// Method selects the propagation; the zero value is [Linearised].
	Method Propagation
	// Samples is the number of Monte-Carlo draws; 0 means
	// [DefaultPropagationSamples].
	Samples int
	// Seed seeds the Monte-Carlo draws (math/rand/v2 PCG): the same seed
	// gives the same result.
	Seed uint64
}

// WaistEstimate is the waist of one axis of the beam that leaves a
// system, with standard uncertainties.
type WaistEstimate struct {
	// Axis is "x" or "y".
	Axis string
	// Z is the waist position in metres from the system's input plane,
	// AfterSystem its distance from the output plane (negative for a
	// virtual waist before it), Radius the waist radius W0 and
	// RayleighRange zR in the output medium.
	Z, AfterSystem, Radius, RayleighRange Uncertain[units.Length]
	// MeanZ, MeanRadius and MeanRayleighRange are the Monte-Carlo sample
	// means (zero for Linearised); they differ from the values, which come
	// from the best fit, where the propagation is not linear.
	MeanZ, MeanRadius, MeanRayleighRange units.Length
}

// PropagatedWaist is the result of [CausticFit.PropagateWaist].
type PropagatedWaist struct {
	// X and Y are the output waists in the tangential and sagittal
	// planes (equal for a round fit through a rotationally symmetric
	// system).
	X, Y WaistEstimate
	// Round is true when the fit was round and the two waists agree.
	Round bool
	// Method is how the uncertainty was propagated; Samples and Rejected
	// are the Monte-Carlo draws and those that were not a beam (C ≤ 0 or
	// no real waist), which are left out.
	Method            Propagation
	Samples, Rejected int
	// Source names the fit; At is the reference plane on the scan's axis
	// where the fitted beam entered the system.
	Source string
	At     units.Length
}

// causticOutputs is the number of outputs of the propagation: Z, W0, zR
// per plane.
const causticOutputs = 6

// PropagateWaist returns the waist of the beam after sys (after its last
// element, as [beam.Waists]'s Last gives it) when the fitted beam enters
// sys at z = at on the scan's axis, with the standard uncertainty of its
// position and radius in each plane, propagated from the covariance of
// the fit as opt.Method says ([Linearised] or [MonteCarlo]). The x fit
// follows the tangential and the y fit the sagittal matrices; a round fit
// is one beam in both.
//
// The propagation is that of package beam ([beam.Waists] of the embedded
// Gaussian, whose radii are √M² times those of the TEM₀₀ beam with the
// same q, [beam.Gaussian]) for every set of fit coefficients, with the
// fitted M² as it is. When the fitted M² is below 1 (within the tolerance
// of [CausticFit.Beam]), the beam that Beam returns, which takes M² = 1,
// has a slightly different output waist than this one.
//
// It returns the errors of [CausticFit.Beam] and [beam.Waists] (for
// example an index of the scan that differs from sys.IndexIn()), a
// [*ParamError] wrapping [ErrInput] for a bad method or sample count, and
// one wrapping [ErrNotPhysical] when more than a tenth of the Monte-Carlo
// draws are not beams (the fit is too uncertain for this).
func (f CausticFit) PropagateWaist(sys paraxial.System, at units.Length, opt PropagationOptions) (PropagatedWaist, error) {
	if _, err := f.Beam(at); err != nil {
		return PropagatedWaist{}, err
	}
	if err := sys.Validate(); err != nil {
		return PropagatedWaist{}, err
	}
	if opt.Method != Linearised && opt.Method != MonteCarlo {
		return PropagatedWaist{}, &ParamError{Where: f.Source, Param: "Method", Value: int(opt.Method), Reason: "must be Linearised or MonteCarlo", Err: ErrInput}
	}
	nSamples := opt.Samples
	if nSamples == 0 {
		nSamples = DefaultPropagationSamples
	}
	if opt.Method == MonteCarlo && (nSamples < 2 || nSamples > MaxPropagationSamples) {
		return PropagatedWaist{}, &ParamError{Where: f.Source, Param: "Samples", Value: opt.Samples, Reason: "must be 0 (default " + strconv.Itoa(DefaultPropagationSamples) + ") or 2 … " + strconv.Itoa(MaxPropagationSamples), Err: ErrInput}
	}
	// The parameter vector: (α, β, γ) of each fitted axis, with a
	// block-diagonal covariance (the axes are fitted independently).
	axes := f.Axes()
	np := 3 * len(axes)
	p0 := make([]float64, np)
	cov := mat.NewSymDense(np, nil)
	for k, a := range axes {
		for i := range 3 {
			p0[3*k+i] = a.params.p[i]
			for j := i; j < 3; j++ {
				cov.SetSym(3*k+i, 3*k+j, a.params.cov[i][j])
			}
		}
	}
	end := sys.Length()
	prop := func(dst, p []float64) error {
		in, m, err := f.causticEffective(p, at)
		if err != nil {
			return err
		}
		ws, err := beam.Waists(sys, in)
		if err != nil {
			return err
		}
		w := ws.Last()
		if sys.Len() == 0 {
			// No element: the input beam is the output beam.
			w = beam.Waist{Z: in.X.WaistOffset(), Radius: in.X.WaistRadius(), RayleighRange: in.X.RayleighRange(),
				ZY: in.Y.WaistOffset(), RadiusY: in.Y.WaistRadius(), RayleighRangeY: in.Y.RayleighRange()}
		}
		copy(dst, []float64{float64(w.Z), m[0] * float64(w.Radius), float64(w.RayleighRange), float64(w.ZY), m[1] * float64(w.RadiusY), float64(w.RayleighRangeY)})
		return nil
	}
	nominal := make([]float64, causticOutputs)
	if err := prop(nominal, p0); err != nil {
		return PropagatedWaist{}, err
	}
	out := PropagatedWaist{Method: opt.Method, Source: f.Source, At: at}
	sigma := make([]float64, causticOutputs)
	mean := make([]float64, causticOutputs)
	zeroCov := true
	for i := range np {
		for j := range np {
			zeroCov = zeroCov && cov.At(i, j) == 0
		}
	}
	var chol mat.Cholesky
	if !zeroCov && !chol.Factorize(cov) {
		return PropagatedWaist{}, &ParamError{Where: f.Source, Param: "fit covariance", Reason: "is not positive definite", Err: ErrNotPhysical}
	}
	switch {
	case zeroCov:
		// A noise-free fit: no uncertainty to propagate.
	case opt.Method == Linearised:
		// Jacobian with respect to whitened coordinates u, p = p0 + L u, so
		// that the output covariance is (J L)(J L)ᵀ; a step of 1e-3
		// standard deviations is far inside the linear range and far above
		// rounding.
		var l mat.TriDense
		chol.LTo(&l)
		var failed error
		fu := func(y, u []float64) {
			p := make([]float64, np)
			for i := range np {
				p[i] = p0[i]
				for j := 0; j <= i; j++ {
					p[i] += l.At(i, j) * u[j]
				}
			}
			if err := prop(y, p); err != nil && failed == nil {
				failed = err
			}
		}
		jac := mat.NewDense(causticOutputs, np, nil)
		fd.Jacobian(jac, fu, make([]float64, np), &fd.JacobianSettings{Formula: fd.Central, Step: 1e-3, OriginValue: nominal})
		if failed != nil {
			return PropagatedWaist{}, &ParamError{Where: f.Source, Param: "fit coefficients", Reason: "a beam within 0.001 standard uncertainties of the fit is not physical (" + failed.Error() + ")", Err: ErrNotPhysical}
		}
		for i := range causticOutputs {
			var v float64
			for j := range np {
				v += jac.At(i, j) * jac.At(i, j)
			}
			sigma[i] = math.Sqrt(v)
		}
	default:
		dist := distmv.NewNormalChol(p0, &chol, rand.NewPCG(opt.Seed, 0x636175737469635f))
		p := make([]float64, np)
		cols := make([][]float64, causticOutputs)
		y := make([]float64, causticOutputs)
		for range nSamples {
			dist.Rand(p)
			if err := prop(y, p); err != nil {
				out.Rejected++
				continue
			}
			for i := range causticOutputs {
				cols[i] = append(cols[i], y[i])
			}
		}
		out.Samples = nSamples
		if out.Rejected*10 > nSamples || len(cols[0]) < 2 {
			return PropagatedWaist{}, &ParamError{Where: f.Source, Param: "Monte-Carlo draws", Value: out.Rejected,
				Reason: "of " + strconv.Itoa(nSamples) + " are not beams (the fit's coefficients allow no waist): the fit is too uncertain to propagate; measure more planes", Err: ErrNotPhysical}
		}
		for i := range causticOutputs {
			mean[i], sigma[i] = stat.MeanStdDev(cols[i], nil)
		}
	}
	est := func(axis string, k int) WaistEstimate {
		u := func(i int) Uncertain[units.Length] {
			return Uncertain[units.Length]{units.Length(nominal[k+i]), units.Length(sigma[k+i])}
		}
		e := WaistEstimate{Axis: axis, Z: u(0), Radius: u(1), RayleighRange: u(2)}
		e.AfterSystem = Uncertain[units.Length]{e.Z.Value - end, e.Z.Sigma}
		e.MeanZ, e.MeanRadius, e.MeanRayleighRange = units.Length(mean[k]), units.Length(mean[k+1]), units.Length(mean[k+2])
		return e
	}
	out.X, out.Y = est("x", 0), est("y", 3)
	same := func(a, b Uncertain[units.Length]) bool { return a == b }
	out.Round = f.Round && same(out.X.Z, out.Y.Z) && same(out.X.Radius, out.Y.Radius) && same(out.X.RayleighRange, out.Y.RayleighRange)
	return out, nil
}

// causticEffective returns the beam of fit coefficients p (three per
// axis) at z = at as a TEM₀₀ beam.Astigmatic with each axis's q, and the
// factors √M² by which the real beam is wider than it at every plane (the
// embedded Gaussian of beam.Gaussian). Propagating the TEM₀₀ beam and
// scaling its radii propagates the fitted beam for any M² > 0, so that
// draws with M² < 1 propagate too.
func (f CausticFit) causticEffective(p []float64, at units.Length) (beam.Astigmatic, [2]float64, error) {
	var g [2]beam.Gaussian
	var m [2]float64
	for k, a := range f.Axes() {
		v, _, ok := a.params.derive([3]float64(p[3*k : 3*k+3]))
		if !ok {
			return beam.Astigmatic{}, m, &ParamError{Where: f.Source, Param: a.Axis + " fit coefficients", Reason: "give no waist", Err: ErrNotPhysical}
		}
		g[k] = beam.Gaussian{Q: complex(float64(at)-v[causticZ0], v[causticZR]), Wavelength: f.Wavelength, Index: f.Index}
		m[k] = math.Sqrt(v[causticM2])
	}
	if f.Round {
		g[1], m[1] = g[0], m[0]
	}
	return beam.Astigmatic{X: g[0], Y: g[1]}, m, nil
}
