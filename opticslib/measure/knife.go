package measure

// Knife-edge scans: the power that passes a straight edge moved across the
// beam, against the edge position, gives the 1/e² radius in the direction
// of the scan. Three methods, computed from the same scan and compared:
//
//  1. the nonlinear least-squares fit of the error-function model
//     (gonum/optimize BFGS, refined and checked by Gauss–Newton steps);
//  2. the direct inversion of J. M. Khosrofian & B. A. Garetz, Appl. Opt.
//     22, 3406–3410 (1983): erf⁻¹ of the normalised power is linear in x;
//  3. the 10–90 % clip rule with the TEM₀₀ factor of reference-checks R18.

import (
	"errors"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Sentinel errors of knife-edge scans, wrapped by [*ParamError].
var (
	// ErrNoCrossing: a knife-edge scan that does not cross the beam: the
	// power does not change along it by more than the noise, or the
	// fitted edge does not pass both 10 % and 90 % of the beam's power
	// inside the scanned range.
	ErrNoCrossing = errors.New("measure: scan does not cross the beam")
	// ErrNotConverged: an iterative fit that did not reach its minimum.
	ErrNotConverged = errors.New("measure: fit did not converge")
)

// knifeWhere is the ParamError.Where of every knife-edge error.
const knifeWhere = "knife-edge scan"

// KnifeMinPoints is the smallest number of points [KnifeEdgeFromScan]
// accepts: the fit has four parameters, and at least two further points
// are needed for a residual variance that means something.
const KnifeMinPoints = 6

// Normalised power levels of the methods: the inversion uses the points
// between knifeInvLow and knifeInvHigh of the power (this package's choice:
// at 5 % and 95 % erf⁻¹ already amplifies the noise 3.9 times as much as
// at the centre, exp(u²), and the factor grows fast beyond), the clip rule
// the crossings of 10 % and 90 %.
const (
	knifeInvLow   = 0.05
	knifeInvHigh  = 0.95
	knifeClipLow  = 0.10
	knifeClipHigh = 0.90
	// knifeMinInvPoints is the fewest points the inversion's straight
	// line needs inside the window (two parameters and one degree of
	// freedom).
	knifeMinInvPoints = 3
	// knifeMinSNR is how many times the noise at the scan's ends the
	// power change between them must be.
	knifeMinSNR = 10
	// knifeDisagree is the z-score above which the three radii are
	// reported as disagreeing.
	knifeDisagree = 3
	// knifeAgreeFloor is a relative floor on the combined uncertainty in
	// the agreement test: differences below 0.01 % of w, far below what a
	// knife-edge scan resolves, are never flagged (noise-free synthetic
	// scans would otherwise be judged on rounding).
	knifeAgreeFloor = 1e-4
	// knifePlateau: a scan whose ends stay further than 1 % of the power
	// from the fitted plateaus gets a warning, since the inversion and
	// the clip rule take their levels from the ends.
	knifePlateau = 0.01
	// The residual tests: the runs test needs at least 20 points for its
	// normal approximation, and flags z < −3 (one-sided probability
	// 0.13 % for noise); residuals below 10⁻⁹ of Pmax are rounding, not
	// noise; the χ² test flags probabilities below 10⁻³.
	knifeRunsMinPoints = 20
	knifeRunsZ         = 3
	knifeRoundingFloor = 1e-9
	knifeChi2P         = 1e-3
)

// knifeMaxIterations bounds the BFGS iterations of the fit; a variable so
// that a test can make the fit stop early.
var knifeMaxIterations = 1000

// knifeClip1090 is the 10 %→90 % clip distance of a TEM₀₀ beam in units of
// w, √2·erf⁻¹(0.8) = 1.281552 (reference-checks R18).
var knifeClip1090 = KnifeClipDistance(knifeClipLow, knifeClipHigh)

// KnifeClipDistance returns the distance, in units of the 1/e² radius w,
// between the edge positions at which a knife edge passes the fractions
// low and high of a TEM₀₀ beam's power. With the knife-edge curve
//
//	P(x)/Pmax = ½[1 + erf(√2 x/w)]
//
// it is
//
//	(erf⁻¹(2 high − 1) − erf⁻¹(2 low − 1)) / √2
//
// so 1.281552 for 10 %→90 %, 0.994458 for 16 %→84 % and 1.644854 for
// 5 %→95 % (reference-checks R18). The factor holds for TEM₀₀ only: for
// other beams, A. E. Siegman, M. W. Sasnett & T. F. Johnston, "Choice of
// clip levels for beam width measurements using knife-edge techniques",
// IEEE J. Quantum Electron. 27, 1098–1104 (1991), give clip levels that
// suit them.
//
// Special cases are:
//
//	KnifeClipDistance(low, high) = NaN unless 0 < low < high < 1
func KnifeClipDistance(low, high float64) float64 {
	if !(0 < low && low < high && high < 1) {
		return math.NaN()
	}
	return (math.Erfinv(2*high-1) - math.Erfinv(2*low-1)) / math.Sqrt2
}

// KnifeScan is a knife-edge scan as measured: the power that passes the
// edge at each edge position.
type KnifeScan struct {
	// Positions are the edge positions in metres, strictly increasing or
	// strictly decreasing (the order in which the stage moved).
	Positions []units.Length
	// Powers are the transmitted powers, one per position, in any one
	// unit (W, mW, a detector's volts or counts): P0 and Pmax of the
	// result come back in the same unit. They may rise with x (the edge
	// uncovers the beam) or fall (it covers it), and may be slightly
	// negative after a background subtraction.
	Powers []float64
	// PowerUnit names the unit of Powers ("mW", "V", "counts"), as a file
	// gave it (see [ReadKnifeScan]); it is shown, never converted, and
	// may be empty.
	PowerUnit string
	// PowerUncertainties are optional standard uncertainties of Powers,
	// in the same unit, all positive. They weight the points (the fit
	// minimises Σ((P − model)/σ)²); the reported uncertainties are scaled
	// by the residual variance in any case (as scipy.optimize.curve_fit
	// does with absolute_sigma=False), so only their ratios matter. Nil
	// means equal weights.
	PowerUncertainties []float64
}

// KnifeDirection says whether the transmitted power rises or falls with
// the edge position x.
type KnifeDirection int

const (
	// KnifeUncovering: the power rises with x; the edge uncovers the
	// beam as x increases.
	KnifeUncovering KnifeDirection = iota
	// KnifeCovering: the power falls with x; the edge covers the beam
	// as x increases.
	KnifeCovering
)

// String returns "uncovering" or "covering".
func (d KnifeDirection) String() string {
	switch d {
	case KnifeUncovering:
		return "uncovering"
	case KnifeCovering:
		return "covering"
	}
	return "KnifeDirection(" + strconv.Itoa(int(d)) + ")"
}

// KnifeEstimate is the 1/e² radius from one of the cross-check methods of
// a knife-edge scan.
type KnifeEstimate struct {
	// Radius is the 1/e² intensity radius w in metres, with its standard
	// uncertainty.
	Radius Uncertain[units.Length]
	// Center is the edge position at half power, x0, in metres (the
	// methods state no uncertainty for it).
	Center units.Length
	// Points is the number of scan points the method used: those
	// between 5 % and 95 % for the inversion; for the clip rule those from
	// the first point of the segment that crosses one level to the last
	// point of the segment that crosses the other.
	Points int
}

// KnifeEdge is the analysis of a knife-edge scan by [KnifeEdgeFromScan]:
// the fitted error-function edge and two cross-checks of its radius.
//
// The fitted model is
//
//	uncovering: P(x) = P0 + (Pmax/2)[1 + erf(√2 (x − x0)/w)]
//	covering:   P(x) = P0 + (Pmax/2)[1 − erf(√2 (x − x0)/w)]
//
// the power of a TEM₀₀ beam of 1/e² radius w passing an edge at x, with
// the background P0 and the beam's power Pmax in the unit of the scan's
// powers. All uncertainties are standard uncertainties (one σ).
//
// For a TEM₀₀ beam w is also the second-moment radius 2σ of ISO 11146-1;
// for other beams the fitted w is a 1/e² width of the erf that fits best,
// not the second-moment width, and the warnings usually say so.
type KnifeEdge struct {
	// Radius is the fitted 1/e² intensity radius w in metres, with its
	// standard uncertainty.
	Radius Uncertain[units.Length]
	// Center is the fitted edge position at half power, x0, in metres,
	// in the frame of the scan's positions, with its standard
	// uncertainty.
	Center Uncertain[units.Length]
	// Background is the fitted power P0 with the beam fully blocked,
	// and Power the fitted power Pmax of the beam (fully uncovered minus
	// blocked), each with its standard uncertainty, in the unit of the
	// scan's powers.
	Background, Power Uncertain[float64]
	// Direction says whether the power rises or falls with x.
	Direction KnifeDirection
	// Points is the number of scan points.
	Points int
	// PowerUnit is the scan's PowerUnit, the unit of Background, Power
	// and ResidualRMS ("" if the scan did not name it).
	PowerUnit string
	// ResidualRMS is the root mean square of the fit's residuals
	// P − model, unweighted, in the unit of the scan's powers.
	ResidualRMS float64

	// Inversion is the radius from the direct inversion of J. M.
	// Khosrofian & B. A. Garetz, Appl. Opt. 22, 3406–3410 (1983): the
	// powers are normalised with the levels at the scan's ends, and
	// erf⁻¹(2p − 1) = √2 (x − x0)/w of the points with 5 % < p < 95 % is
	// fitted with a straight line by weighted linear least squares.
	Inversion KnifeEstimate
	// Clip is the radius from the 10–90 % clip rule: the distance Δ
	// between the linearly interpolated crossings of 10 % and 90 % of the
	// power (levels from the scan's ends), w = Δ/1.281552. The factor is
	// exact only for a TEM₀₀ beam (reference-checks R18); A. E. Siegman,
	// M. W. Sasnett & T. F. Johnston, IEEE J. Quantum Electron. 27,
	// 1098–1104 (1991), give the clip levels that suit other beams.
	Clip KnifeEstimate

	// Discrepancy is the largest difference between two of the three
	// radii (fit, inversion, clip) divided by their combined standard
	// uncertainty √(σ₁² + σ₂² + (10⁻⁴ w)²). Above 3 a warning is added:
	// the beam is probably not TEM₀₀, or the scan is bad (drift, steps
	// too coarse, ends short of the plateaus). The three use the same
	// points, so their errors are correlated; the combination ignores
	// that and flags less often than a test with the correlation would.
	Discrepancy float64
	// Warnings are one-line warnings about the scan or the agreement of
	// the methods; nil when there is none.
	Warnings []string
}

// KnifeEdgeFromScan analyses a knife-edge scan with three methods and
// compares them.
//
// Method 1, the result's Radius, Center, Background and Power, is the
// weighted nonlinear least-squares fit of the error-function model (see
// [KnifeEdge]): gonum/optimize's BFGS minimises the sum of squares with
// its analytic gradient, starting from the inversion's estimate, and
// Gauss–Newton steps then refine the minimum; the fit has converged when
// the last Gauss–Newton step is below 10⁻³ of every parameter's
// uncertainty (or below rounding). The covariance is (JᵀWJ)⁻¹ scaled by
// the residual variance Σw r²/(n − 4), J the Jacobian of the model at the
// minimum.
//
// Methods 2 and 3 ([KnifeEdge.Inversion], [KnifeEdge.Clip]) normalise the
// powers with the levels at the two ends of the scan: the mean of the
// first and of the last n/10 points (at least one), so that they do not
// depend on the fit. Their uncertainties combine the noise of the points
// used (the spread about the inversion's line; the fit's residual
// standard deviation at the clip crossings), the uncertainty of those
// levels (their noise, and how far the fitted curve says the ends are from
// the plateaus) and, for the clip rule, the error of the linear
// interpolation, ½s(1 − s)h²|P″|/|P′| at the fraction s of a step h, with
// the slope P′ and curvature P″ of the fitted curve.
//
// # Warnings
//
// The result's Warnings report what the uncertainties alone do not show:
//
//   - the three radii differ by more than 3 combined standard
//     uncertainties ([KnifeEdge.Discrepancy]);
//   - the fit's residuals have fewer runs of one sign than noise would
//     give (Wald–Wolfowitz runs test, z < −3, from 20 points): the edge is
//     not an error function, as for a beam other than TEM₀₀, or the power
//     drifted; residuals that systematic also inflate every uncertainty
//     (they are scaled by the residual variance), which is why the radii
//     of a non-Gaussian beam may still agree within them;
//   - with PowerUncertainties, a χ² of the fit that noise of that size
//     reaches with probability below 10⁻³;
//   - the scan's ends lie more than 1 % of the power from the fitted
//     plateaus, which biases the levels of methods 2 and 3.
//
// The returned error is a [*ParamError] wrapping
//
//   - [ErrInput]: Powers or PowerUncertainties not of the length of
//     Positions, a position that is not finite, positions not strictly
//     monotonic;
//   - [ErrNotPhysical]: a power that is not finite, an uncertainty that is
//     not finite and positive;
//   - [ErrTooFewPoints]: fewer than [KnifeMinPoints] points, or fewer than
//     three between 5 % and 95 % of the power for the inversion;
//   - [ErrNoCrossing]: the power change between the scan's ends is not
//     ten times the noise there (judged when uncertainties are given or
//     the ends hold three points or more, n ≥ 30: the scatter about a
//     line through them), or the fitted edge does not pass both 10 % and
//     90 % inside the scan;
//   - [ErrNotConverged]: the fit stopped before its minimum.
func KnifeEdgeFromScan(scan KnifeScan) (KnifeEdge, error) {
	d, err := knifePrepare(scan)
	if err != nil {
		return KnifeEdge{}, err
	}
	f := d.normalised(d.low, d.high)

	// Method 3 first (it needs nothing but the normalised curve), then
	// method 2, whose line starts the fit.
	clip := knifeClipCrossings(d.x, f)
	inv, err := knifeInvert(d, f)
	if err != nil {
		return KnifeEdge{}, err
	}
	fit, err := knifeFitModel(d, inv)
	if err != nil {
		return KnifeEdge{}, err
	}
	k, err := knifeAssemble(d, fit, inv, clip)
	k.PowerUnit = scan.PowerUnit
	return k, err
}

// knifeData is a validated scan in ascending position order, in scaled
// coordinates ξ = (x − xm)/lx and powers y = P/py, which keep the fit's
// parameters of order one.
type knifeData struct {
	n          int
	xm, lx, py float64   // offset and scales
	x          []float64 // ξ, ascending
	y          []float64 // P/py
	sig        []float64 // σ/py, nil for equal weights
	m          int       // points per end level
	// low and high are the mean scaled powers of the first and last m
	// points (ascending x).
	low, high float64
	dir       KnifeDirection
}

// blocked and open return the end levels at the blocked and at the open
// end of the edge, whichever ends of the scan those are.
func (d *knifeData) blocked() float64 {
	if d.dir == KnifeUncovering {
		return d.low
	}
	return d.high
}

func (d *knifeData) open() float64 {
	if d.dir == KnifeUncovering {
		return d.high
	}
	return d.low
}

// normalised returns the uncovered fraction f = (y − blocked)/(open −
// blocked) of every point for the given end levels (ascending x).
func (d *knifeData) normalised(low, high float64) []float64 {
	b, o := low, high
	if d.dir == KnifeCovering {
		b, o = high, low
	}
	f := make([]float64, d.n)
	for i, y := range d.y {
		f[i] = (y - b) / (o - b)
	}
	return f
}

// weight returns the relative weight 1/σ² of point i (1 without
// uncertainties).
func (d *knifeData) weight(i int) float64 {
	if d.sig == nil {
		return 1
	}
	return 1 / (d.sig[i] * d.sig[i])
}

func knifeErr(param string, v any, reason string, sentinel error) error {
	return &ParamError{Where: knifeWhere, Param: param, Value: v, Reason: reason, Err: sentinel}
}

func knifeFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// knifeRound rounds v to three significant digits for a message.
func knifeRound(v float64) float64 {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 3, 64), 64)
	return r
}

// knifePrepare validates a scan and brings it into ascending, scaled form.
func knifePrepare(scan KnifeScan) (*knifeData, error) {
	n := len(scan.Positions)
	if len(scan.Powers) != n {
		return nil, knifeErr("powers", len(scan.Powers), "has "+strconv.Itoa(len(scan.Powers))+" values for "+strconv.Itoa(n)+" positions", ErrInput)
	}
	if scan.PowerUncertainties != nil && len(scan.PowerUncertainties) != n {
		return nil, knifeErr("power uncertainties", len(scan.PowerUncertainties), "has "+strconv.Itoa(len(scan.PowerUncertainties))+" values for "+strconv.Itoa(n)+" positions", ErrInput)
	}
	if n < KnifeMinPoints {
		return nil, knifeErr("points", n, "a knife-edge scan needs at least "+strconv.Itoa(KnifeMinPoints), ErrTooFewPoints)
	}
	for i := range n {
		if !knifeFinite(float64(scan.Positions[i])) {
			return nil, knifeErr("position "+strconv.Itoa(i), scan.Positions[i], "must be finite", ErrInput)
		}
		if !knifeFinite(scan.Powers[i]) {
			return nil, knifeErr("power "+strconv.Itoa(i), scan.Powers[i], "must be finite", ErrNotPhysical)
		}
		if scan.PowerUncertainties != nil {
			if s := scan.PowerUncertainties[i]; !knifeFinite(s) || s <= 0 {
				return nil, knifeErr("power uncertainty "+strconv.Itoa(i), s, "must be finite and positive", ErrNotPhysical)
			}
		}
	}
	increasing := scan.Positions[1] > scan.Positions[0]
	for i := 1; i < n; i++ {
		a, b := scan.Positions[i-1], scan.Positions[i]
		if (increasing && b > a) || (!increasing && b < a) {
			continue
		}
		return nil, knifeErr("position "+strconv.Itoa(i), b,
			"positions must be strictly increasing or strictly decreasing (position "+strconv.Itoa(i-1)+" = "+a.String()+")", ErrInput)
	}

	d := &knifeData{n: n, x: make([]float64, n), y: make([]float64, n)}
	first, last := float64(scan.Positions[0]), float64(scan.Positions[n-1])
	d.xm, d.lx = (first+last)/2, math.Abs(last-first)/2
	if !knifeFinite(d.lx) || d.lx == 0 {
		// Only an overflowing span gets here (the positions are finite
		// and strictly monotonic).
		return nil, knifeErr("scan length", units.Length(last-first), "must be finite", ErrInput)
	}
	for _, p := range scan.Powers {
		d.py = math.Max(d.py, math.Abs(p))
	}
	if d.py == 0 {
		return nil, knifeErr("powers", 0.0, "are all zero", ErrNoCrossing)
	}
	if scan.PowerUncertainties != nil {
		d.sig = make([]float64, n)
	}
	for i := range n {
		j := i
		if !increasing {
			j = n - 1 - i
		}
		d.x[i] = (float64(scan.Positions[j]) - d.xm) / d.lx
		d.y[i] = scan.Powers[j] / d.py
		if d.sig != nil {
			d.sig[i] = scan.PowerUncertainties[j] / d.py
		}
	}

	// End levels and the direction.
	d.m = max(1, n/10)
	var noise float64 // the noise at the ends, scaled; 0 if unknown
	d.low, noise = d.endLevel(0)
	var noiseHigh float64
	d.high, noiseHigh = d.endLevel(n - d.m)
	noise = math.Sqrt((noise*noise + noiseHigh*noiseHigh) / 2)
	d.dir = KnifeUncovering
	if d.high < d.low {
		d.dir = KnifeCovering
	}
	span := math.Abs(d.high - d.low)
	if span == 0 || span < knifeMinSNR*noise {
		return nil, knifeErr("power change between the scan's ends", knifeRound(span*d.py),
			"must be at least "+strconv.Itoa(knifeMinSNR)+" times the noise there ("+strconv.FormatFloat(noise*d.py, 'g', 3, 64)+" per point)", ErrNoCrossing)
	}
	return d, nil
}

// endLevel returns the mean of the m scaled powers from index i0 and an
// estimate of the noise of one point there: the rms of the given
// uncertainties, else, from three points on, the standard deviation about
// a straight line through them (a slope there is the edge, not noise), and
// 0 (unknown) for fewer.
func (d *knifeData) endLevel(i0 int) (mean, noise float64) {
	xs, ys := d.x[i0:i0+d.m], d.y[i0:i0+d.m]
	var xm float64
	for i := range ys {
		mean += ys[i]
		xm += xs[i]
	}
	mean /= float64(d.m)
	xm /= float64(d.m)
	switch {
	case d.sig != nil:
		for _, s := range d.sig[i0 : i0+d.m] {
			noise += s * s
		}
		noise = math.Sqrt(noise / float64(d.m))
	case d.m >= 3:
		var sxx, sxy float64
		for i := range ys {
			sxx += (xs[i] - xm) * (xs[i] - xm)
			sxy += (xs[i] - xm) * (ys[i] - mean)
		}
		slope := sxy / sxx
		for i := range ys {
			r := ys[i] - mean - slope*(xs[i]-xm)
			noise += r * r
		}
		noise = math.Sqrt(noise / float64(d.m-2))
	}
	return mean, noise
}

// knifeCrossing is where a normalised scan crosses one level.
type knifeCrossing struct {
	x float64 // mean position of the crossings, scaled
	// lo and hi are the indices of the first and the last point of the
	// segments that cross (hi = lo + 1 for a single crossing).
	lo, hi int
	// spread is the distance between the first and the last crossing.
	spread float64
	s      float64 // fraction of the first crossing segment
}

// knifeCross finds where f crosses the level q: every segment whose ends
// lie on opposite sides (one end may be on the level), linearly
// interpolated; the mean position when noise makes several. ok is false
// when f never crosses q.
func knifeCross(x, f []float64, q float64) (c knifeCrossing, ok bool) {
	var sum, first, last float64
	count := 0
	for i := 0; i+1 < len(f); i++ {
		a, b := f[i], f[i+1]
		if !((a < q && b >= q) || (a > q && b <= q)) {
			continue
		}
		s := (q - a) / (b - a)
		xc := x[i] + s*(x[i+1]-x[i])
		if count == 0 {
			c.lo, c.s, first = i, s, xc
		}
		c.hi, last = i+1, xc
		sum += xc
		count++
	}
	if count == 0 {
		return c, false
	}
	c.x, c.spread = sum/float64(count), last-first
	return c, true
}

// knifeClipResult is the 10–90 % clip rule on a normalised scan.
type knifeClipResult struct {
	lo, hi knifeCrossing
	ok     bool
}

func knifeClipCrossings(x, f []float64) knifeClipResult {
	lo, ok1 := knifeCross(x, f, knifeClipLow)
	hi, ok2 := knifeCross(x, f, knifeClipHigh)
	return knifeClipResult{lo: lo, hi: hi, ok: ok1 && ok2}
}

// knifeLine is the inversion's straight line u = a + b ξ through the
// points idx, u = erf⁻¹(2f − 1).
type knifeLine struct {
	a, b   float64
	varB   float64   // variance of b, scaled by the residual variance
	idx    []int     // points used
	weight []float64 // their final weights
}

// knifeInvert is method 2, the inversion of Khosrofian & Garetz, on the
// scan normalised with its end levels.
//
// The line is fitted to u on x, since the positions are exact and the
// noise is in the powers. A power error σ_f becomes σ_u = √π·exp(u²)·σ_f
// after the inversion, so the points are weighted by exp(−2u²)/σ_f² with
// u taken from the line of the previous pass (three passes: the first
// with u from the data); weights from the measured u itself would favour
// the points whose noise pulls them towards the centre.
func knifeInvert(d *knifeData, f []float64) (knifeLine, error) {
	var idx []int
	for i, v := range f {
		if v > knifeInvLow && v < knifeInvHigh {
			idx = append(idx, i)
		}
	}
	if len(idx) < knifeMinInvPoints {
		return knifeLine{}, knifeErr("points between 5 % and 95 % of the power", len(idx),
			"the inversion needs at least "+strconv.Itoa(knifeMinInvPoints)+"; scan more finely across the edge", ErrTooFewPoints)
	}
	u := make([]float64, len(idx))
	for k, i := range idx {
		u[k] = math.Erfinv(2*f[i] - 1)
	}
	w := make([]float64, len(idx))
	var line knifeLine
	for pass := range 3 {
		for k, i := range idx {
			uk := u[k]
			if pass > 0 {
				uk = line.a + line.b*d.x[i]
			}
			w[k] = d.weight(i) * math.Exp(-2*uk*uk)
		}
		var err error
		line, err = knifeLineFit(d.x, idx, u, w)
		if err != nil {
			return knifeLine{}, err
		}
	}
	return line, nil
}

// knifeLineFit fits u = a + b ξ by weighted linear least squares (QR of
// √W X with gonum/mat) and returns the variance of b from (XᵀWX)⁻¹ scaled
// by the residual variance.
func knifeLineFit(x []float64, idx []int, u, w []float64) (knifeLine, error) {
	n := len(idx)
	A := mat.NewDense(n, 2, nil)
	rhs := mat.NewVecDense(n, nil)
	for k, i := range idx {
		s := math.Sqrt(w[k])
		A.Set(k, 0, s)
		A.Set(k, 1, s*x[i])
		rhs.SetVec(k, s*u[k])
	}
	var sol mat.VecDense
	if err := sol.SolveVec(A, rhs); err != nil {
		return knifeLine{}, knifeErr("points between 5 % and 95 % of the power", n, "do not determine a line", ErrTooFewPoints)
	}
	a, b := sol.AtVec(0), sol.AtVec(1)
	var chi2 float64
	for k, i := range idx {
		r := u[k] - a - b*x[i]
		chi2 += w[k] * r * r
	}
	var ata mat.SymDense
	ata.SymOuterK(1, A.T())
	var chol mat.Cholesky
	if !chol.Factorize(&ata) {
		return knifeLine{}, knifeErr("points between 5 % and 95 % of the power", n, "do not determine a line", ErrTooFewPoints)
	}
	var cov mat.SymDense
	if err := chol.InverseTo(&cov); err != nil {
		return knifeLine{}, knifeErr("points between 5 % and 95 % of the power", n, "do not determine a line", ErrTooFewPoints)
	}
	return knifeLine{a: a, b: b, varB: cov.At(1, 1) * chi2 / float64(n-2), idx: idx, weight: append([]float64(nil), w...)}, nil
}

// refit fits the same points with the same weights to a scan normalised
// with other levels (for the sensitivity of the radius to the levels).
func (l knifeLine) refit(x, f []float64) (knifeLine, bool) {
	u := make([]float64, len(l.idx))
	for k, i := range l.idx {
		v := 2*f[i] - 1
		if !(v > -1 && v < 1) {
			return knifeLine{}, false
		}
		u[k] = math.Erfinv(v)
	}
	r, err := knifeLineFit(x, l.idx, u, l.weight)
	return r, err == nil
}

// knifeModel is the scaled model y = a + (b/2)(1 + erf(k(ξ − c))) with
// θ = (a, b, c, k): a = P0/py, b = Pmax/py, c = (x0 − xm)/lx and
// k = ±√2·lx/w (positive when uncovering).
func knifeModel(th []float64, x float64) float64 {
	return th[0] + th[1]/2*(1+math.Erf(th[3]*(x-th[2])))
}

// knifeJacobianRow writes ∂y/∂θ at x into row.
func knifeJacobianRow(th []float64, x float64, row []float64) {
	t := th[3] * (x - th[2])
	g := math.Exp(-t*t) / math.SqrtPi
	row[0] = 1
	row[1] = (1 + math.Erf(t)) / 2
	row[2] = -th[1] * th[3] * g
	row[3] = th[1] * (x - th[2]) * g
}

// knifeFit is method 1's result in scaled parameters.
type knifeFit struct {
	th   []float64
	cov  *mat.SymDense // covariance of θ
	s2   float64       // residual variance Σw r²/(n − 4), weights of mean 1
	wts  []float64     // those weights
	rms  float64       // unweighted residual RMS, scaled
	iter int
}

// knifeFitModel is method 1: BFGS on the weighted sum of squares, then
// Gauss–Newton steps that refine the minimum and decide convergence.
func knifeFitModel(d *knifeData, start knifeLine) (knifeFit, error) {
	// Start from the inversion's line u = a + bξ = k(ξ − c) and the end
	// levels. The uncovered fraction f = ½(1 + erf(k(ξ − c))) is the same
	// function for both directions (k < 0 when covering), and
	// span = open − blocked > 0.
	span := d.open() - d.blocked()
	th0 := []float64{d.blocked(), span, -start.a / start.b, start.b}

	// Normalised weights (mean 1) keep F of order n·noise².
	wts := make([]float64, d.n)
	var wsum float64
	for i := range wts {
		wts[i] = d.weight(i)
		wsum += wts[i]
	}
	for i := range wts {
		wts[i] *= float64(d.n) / wsum
	}
	sumsq := func(th []float64) float64 {
		var s float64
		for i, x := range d.x {
			r := knifeModel(th, x) - d.y[i]
			s += wts[i] * r * r
		}
		return s / 2
	}
	row := make([]float64, 4)
	problem := optimize.Problem{
		Func: sumsq,
		Grad: func(grad, th []float64) {
			for j := range grad {
				grad[j] = 0
			}
			for i, x := range d.x {
				r := knifeModel(th, x) - d.y[i]
				knifeJacobianRow(th, x, row)
				for j := range grad {
					grad[j] += wts[i] * r * row[j]
				}
			}
		},
	}
	settings := &optimize.Settings{
		GradientThreshold: 1e-14,
		Converger:         &optimize.FunctionConverge{Relative: 1e-15, Iterations: 20},
		MajorIterations:   knifeMaxIterations,
	}
	// Minimize's error is not final: a line search that cannot improve
	// at rounding level ends it with one; the Gauss–Newton check below
	// decides whether the minimum was reached.
	th := append([]float64(nil), th0...)
	res, _ := optimize.Minimize(problem, th0, settings, &optimize.BFGS{})
	iter := 0
	if res != nil {
		iter = res.Stats.MajorIterations
		if knifeAllFinite(res.X) && res.F <= sumsq(th0) {
			th = res.X
		}
	}
	if res != nil && res.Status == optimize.IterationLimit {
		return knifeFit{}, knifeErr("BFGS iterations", iter, "reached the limit before the minimum", ErrNotConverged)
	}

	// Gauss–Newton refinement: solve min ‖√W (J δ + r)‖ by QR. Converged
	// when |δ_j| is below 10⁻³ of θ_j's uncertainty or near rounding.
	J := mat.NewDense(d.n, 4, nil)
	rhs := mat.NewVecDense(d.n, nil)
	var fit knifeFit
	for step := 0; ; step++ {
		for i, x := range d.x {
			s := math.Sqrt(wts[i])
			knifeJacobianRow(th, x, row)
			for j := range row {
				J.Set(i, j, s*row[j])
			}
			rhs.SetVec(i, -s*(knifeModel(th, x)-d.y[i]))
		}
		var delta mat.VecDense
		if err := delta.SolveVec(J, rhs); err != nil {
			return knifeFit{}, knifeErr("fit", nil, "the Jacobian is singular: the scan does not determine w, x0, P0 and Pmax", ErrNotConverged)
		}
		fit = knifeFitCovariance(d, th, J, wts)
		if fit.cov == nil {
			return knifeFit{}, knifeErr("fit", nil, "the Jacobian is singular: the scan does not determine w, x0, P0 and Pmax", ErrNotConverged)
		}
		small := true
		for j := range 4 {
			dj := math.Abs(delta.AtVec(j))
			sj := math.Sqrt(math.Max(fit.cov.At(j, j), 0))
			if dj > 1e-3*sj && dj > 1e-12*math.Max(1, math.Abs(th[j])) {
				small = false
			}
		}
		if small {
			break
		}
		if step == 20 {
			return knifeFit{}, knifeErr("Gauss–Newton steps", step, "did not settle the minimum", ErrNotConverged)
		}
		// Take the step, halved until it does not raise the sum of
		// squares (beyond rounding).
		next := make([]float64, 4)
		f0 := sumsq(th)
		accepted := false
		for scale := 1.0; scale > 1e-3; scale /= 2 {
			for j := range next {
				next[j] = th[j] + scale*delta.AtVec(j)
			}
			if knifeAllFinite(next) && sumsq(next) <= f0*(1+1e-12) {
				accepted = true
				break
			}
		}
		if !accepted {
			return knifeFit{}, knifeErr("fit", nil, "no Gauss–Newton step from the BFGS result lowers the sum of squares", ErrNotConverged)
		}
		th = next
	}
	fit.wts = wts
	return fit, nil
}

func knifeAllFinite(v []float64) bool {
	for _, x := range v {
		if !knifeFinite(x) {
			return false
		}
	}
	return true
}

// knifeFitCovariance returns the fit at θ with its covariance (JᵀWJ)⁻¹·s²,
// J already weighted by √w; fit.cov is nil if JᵀWJ is singular.
func knifeFitCovariance(d *knifeData, th []float64, J *mat.Dense, wts []float64) knifeFit {
	fit := knifeFit{th: append([]float64(nil), th...)}
	var chi2, ss float64
	for i, x := range d.x {
		r := knifeModel(th, x) - d.y[i]
		chi2 += wts[i] * r * r
		ss += r * r
	}
	fit.s2 = chi2 / float64(d.n-4)
	fit.rms = math.Sqrt(ss / float64(d.n))
	var jtj mat.SymDense
	jtj.SymOuterK(1, J.T())
	var chol mat.Cholesky
	if !chol.Factorize(&jtj) {
		return fit
	}
	var cov mat.SymDense
	if err := chol.InverseTo(&cov); err != nil {
		return fit
	}
	cov.ScaleSym(fit.s2, &cov)
	fit.cov = &cov
	return fit
}

// knifeAssemble turns the three methods into the result: physical units,
// uncertainties of the cross-checks, agreement and warnings.
func knifeAssemble(d *knifeData, fit knifeFit, inv knifeLine, clip knifeClipResult) (KnifeEdge, error) {
	th := fit.th
	// Canonical form: b > 0, so that P0 is the blocked level.
	if th[1] < 0 {
		th[0], th[1], th[3] = th[0]+th[1], -th[1], -th[3]
	}
	sd := func(j int) float64 { return math.Sqrt(math.Max(fit.cov.At(j, j), 0)) }
	dir := KnifeUncovering
	if th[3] < 0 {
		dir = KnifeCovering
	}
	if dir != d.dir {
		return KnifeEdge{}, knifeErr("fitted direction", dir.String(), "runs against the scan's ends ("+d.dir.String()+")", ErrNotConverged)
	}
	w := math.Sqrt2 * d.lx / math.Abs(th[3])
	k := KnifeEdge{
		Radius:      Uncertain[units.Length]{units.Length(w), units.Length(w * sd(3) / math.Abs(th[3]))},
		Center:      Uncertain[units.Length]{units.Length(d.xm + d.lx*th[2]), units.Length(d.lx * sd(2))},
		Background:  Uncertain[float64]{th[0] * d.py, sd(0) * d.py},
		Power:       Uncertain[float64]{th[1] * d.py, sd(1) * d.py},
		Direction:   dir,
		Points:      d.n,
		ResidualRMS: fit.rms * d.py,
	}
	if !knifeFinite(w) || w <= 0 || !(th[1] > 0) {
		return KnifeEdge{}, knifeErr("fitted radius w", units.Length(w), "is not a beam", ErrNotConverged)
	}

	// The scanned range in fractions of the fitted edge.
	g := func(xs float64) float64 { return (1 + math.Erf(th[3]*(xs-th[2]))) / 2 }
	gFirst, gLast := g(d.x[0]), g(d.x[d.n-1])
	gMin, gMax := math.Min(gFirst, gLast), math.Max(gFirst, gLast)
	covered := table.Fixed(100*gMin, 2) + " %–" + table.Fixed(100*gMax, 2) + " %"
	if gMin > knifeClipLow || gMax < knifeClipHigh {
		return KnifeEdge{}, knifeErr("scanned range", covered+" of the fitted edge", "must pass both 10 % and 90 % of the beam's power", ErrNoCrossing)
	}
	if !clip.ok {
		return KnifeEdge{}, knifeErr("scan", nil, "has no 10 % or no 90 % crossing of the power between its end levels", ErrNoCrossing)
	}

	// Noise of one point (scaled): the fit's residual standard deviation,
	// or the given uncertainties scaled by it.
	noise := func(i int) float64 { return math.Sqrt(fit.s2 / fit.wts[i]) }
	// Uncertainty of the end levels: their noise and their distance from
	// the plateaus by the fitted curve.
	levelSD := func(i0 int) float64 {
		var v, bias float64
		for i := i0; i < i0+d.m; i++ {
			v += noise(i) * noise(i)
			bias += knifeModel(th, d.x[i])
		}
		bias /= float64(d.m)
		plateau := th[0]
		if (i0 == 0) != (dir == KnifeUncovering) {
			plateau = th[0] + th[1]
		}
		bias -= plateau
		return math.Sqrt(v/float64(d.m*d.m) + bias*bias)
	}
	sdLow, sdHigh := levelSD(0), levelSD(d.n-d.m)

	// Method 2: regression variance and the sensitivity to the levels.
	w2 := math.Sqrt2 * d.lx / math.Abs(inv.b)
	var2 := w2 * w2 * inv.varB / (inv.b * inv.b)
	for _, lv := range []struct{ which, sd float64 }{{0, sdLow}, {1, sdHigh}} {
		h := math.Max(lv.sd, 1e-6*math.Abs(d.high-d.low))
		low, high := d.low, d.high
		if lv.which == 0 {
			low += h
		} else {
			high += h
		}
		if l2, ok := inv.refit(d.x, d.normalised(low, high)); ok {
			dw := (math.Sqrt2*d.lx/math.Abs(l2.b) - w2) / h
			var2 += dw * dw * lv.sd * lv.sd
		}
	}
	k.Inversion = KnifeEstimate{
		Radius: Uncertain[units.Length]{units.Length(w2), units.Length(math.Sqrt(var2))},
		Center: units.Length(d.xm - d.lx*inv.a/inv.b),
		Points: len(inv.idx),
	}

	// Method 3: Δ = |x90 − x10|, its uncertainty from the noise at the
	// crossings, the linear interpolation and the levels. The slope and
	// curvature at the crossings come from the fitted curve (the data's
	// own differences are too noisy to divide by).
	var3, interp := 0.0, 0.0
	var slope [2]float64
	sign := 1.0
	if clip.hi.x < clip.lo.x {
		sign = -1
	}
	for c, cr := range []knifeCrossing{clip.lo, clip.hi} {
		t := th[3] * (cr.x - th[2])
		sl := th[1] * th[3] * math.Exp(-t*t) / math.SqrtPi // dy/dξ
		curv := -2 * t * th[3] * sl                        // d²y/dξ²
		slope[c] = sl
		// The interpolated value mixes two points; several crossings
		// (noise) add their spread.
		s, i := cr.s, cr.lo
		nv := (1-s)*(1-s)*noise(i)*noise(i) + s*s*noise(i+1)*noise(i+1)
		var3 += nv/(sl*sl) + cr.spread*cr.spread/12
		// Linear interpolation misses the curve by ½ s(1 − s) h² |y″|;
		// for an erf edge both crossings move outwards, so the two add.
		h := d.x[i+1] - d.x[i]
		interp += s * (1 - s) * h * h * math.Abs(curv) / 2 / math.Abs(sl)
	}
	var3 += interp * interp
	// x_q moves by ∂L_q/∂level / slope with the level L_q = blocked +
	// q·span; Δ = sign·(x90 − x10).
	dBlocked := sign * ((1-knifeClipHigh)/slope[1] - (1-knifeClipLow)/slope[0])
	dOpen := sign * (knifeClipHigh/slope[1] - knifeClipLow/slope[0])
	sdBlocked, sdOpen := sdLow, sdHigh
	if dir == KnifeCovering {
		sdBlocked, sdOpen = sdHigh, sdLow
	}
	var3 += dBlocked*dBlocked*sdBlocked*sdBlocked + dOpen*dOpen*sdOpen*sdOpen
	delta := math.Abs(clip.hi.x - clip.lo.x)
	k.Clip = KnifeEstimate{
		Radius: Uncertain[units.Length]{units.Length(d.lx * delta / knifeClip1090), units.Length(d.lx * math.Sqrt(var3) / knifeClip1090)},
		Center: units.Length(d.xm + d.lx*(clip.lo.x+clip.hi.x)/2),
		Points: clip.hi.hi - clip.lo.lo + 1,
	}
	if clip.lo.x > clip.hi.x {
		k.Clip.Points = clip.lo.hi - clip.hi.lo + 1
	}

	// Agreement and warnings.
	est := []struct {
		name string
		w    Uncertain[units.Length]
	}{
		{"erf fit", k.Radius},
		{"inversion", k.Inversion.Radius},
		{"10–90 % clip", k.Clip.Radius},
	}
	worst := ""
	lu, lsym := k.lengthUnit()
	ref := float64(k.Radius.Value / lu)
	for a := range est {
		for b := a + 1; b < len(est); b++ {
			wa, wb := est[a].w, est[b].w
			floor := knifeAgreeFloor * float64(k.Radius.Value)
			comb := math.Sqrt(float64(wa.Sigma*wa.Sigma+wb.Sigma*wb.Sigma) + floor*floor)
			z := math.Abs(float64(wa.Value-wb.Value)) / comb
			if z > k.Discrepancy {
				k.Discrepancy = z
				worst = est[a].name + " " + knifeLengthPM(wa, lu, ref) + " " + lsym + " against " + est[b].name + " " + knifeLengthPM(wb, lu, ref) + " " + lsym
			}
		}
	}
	if k.Discrepancy > knifeDisagree {
		k.Warnings = append(k.Warnings, "the three radii disagree by "+table.Sig(k.Discrepancy, 2)+" σ ("+worst+
			"): the beam is probably not TEM₀₀ (the 10–90 % factor and the erf model hold only for it), or the scan is bad (drift, steps too coarse, ends short of the plateaus)")
	}
	k.Warnings = append(k.Warnings, knifeResidualWarnings(d, th)...)
	if gMin > knifePlateau || gMax < 1-knifePlateau {
		k.Warnings = append(k.Warnings, "the scan covers only "+covered+
			" of the fitted edge: the inversion and the clip rule take their levels from the scan's ends and are biased; scan beyond 1 % and 99 %")
	}
	return k, nil
}

// knifeResidualWarnings tests the fit's residuals for structure that noise
// would not give: too few runs of one sign (the Wald–Wolfowitz runs test,
// normal approximation, with at least knifeRunsMinPoints points and
// residuals above rounding), and, when uncertainties are given, a χ² that
// noise of those uncertainties reaches with probability below 10⁻³.
func knifeResidualWarnings(d *knifeData, th []float64) []string {
	var out []string
	r := make([]float64, d.n)
	var ss, chi2 float64
	for i, x := range d.x {
		r[i] = d.y[i] - knifeModel(th, x)
		ss += r[i] * r[i]
		if d.sig != nil {
			chi2 += r[i] * r[i] / (d.sig[i] * d.sig[i])
		}
	}
	rms := math.Sqrt(ss / float64(d.n))
	if d.n >= knifeRunsMinPoints && rms > knifeRoundingFloor*th[1] {
		runs, mean, sd := knifeRuns(r)
		if sd > 0 && (float64(runs)-mean)/sd < -knifeRunsZ {
			out = append(out, "the fit's residuals form only "+strconv.Itoa(runs)+" runs of one sign where noise would give "+
				table.Sig(mean, 3)+" ± "+table.Sig(sd, 2)+": the edge is not an error function; the beam is probably not TEM₀₀, or the power drifted during the scan")
		}
	}
	if d.sig != nil {
		dof := float64(d.n - 4)
		if p := (distuv.ChiSquared{K: dof}).Survival(chi2); p < knifeChi2P {
			out = append(out, "the fit's residuals are "+table.Sig(math.Sqrt(chi2/dof), 3)+
				" times the given power uncertainties (χ²/ν = "+table.Sig(chi2/dof, 3)+", ν = "+strconv.Itoa(d.n-4)+
				"): the uncertainties are too small, or the edge is not an error function (a beam other than TEM₀₀, drift)")
		}
	}
	return out
}

// knifeRuns returns the number of runs of equal sign in r (zeros join the
// run before them) and its mean and standard deviation for random signs
// with the same counts (A. Wald & J. Wolfowitz, Ann. Math. Statist. 11,
// 147–162 (1940)):
//
//	μ = 2 n₊ n₋ / n + 1,  σ² = 2 n₊ n₋ (2 n₊ n₋ − n) / (n² (n − 1))
func knifeRuns(r []float64) (runs int, mean, sd float64) {
	var np, nm float64
	prev := 0.0
	for _, v := range r {
		sgn := math.Copysign(1, v)
		if v == 0 {
			sgn = prev
		}
		if sgn == 0 {
			continue
		}
		if sgn > 0 {
			np++
		} else {
			nm++
		}
		if sgn != prev {
			runs++
		}
		prev = sgn
	}
	n := np + nm
	if np == 0 || nm == 0 {
		return runs, 1, 0
	}
	mean = 2*np*nm/n + 1
	sd = math.Sqrt(2 * np * nm * (2*np*nm - n) / (n * n * (n - 1)))
	return runs, mean, sd
}

// knifeDecimals returns the number of decimals that shows a value of
// magnitude mag with its standard uncertainty sigma to two significant
// digits of the uncertainty (GUM, JCGM 100:2008, 7.2.6), at most six
// significant digits of mag, never negative.
func knifeDecimals(sigma, mag float64) int {
	most := 6
	if mag = math.Abs(mag); mag > 0 && knifeFinite(mag) {
		most = 5 - int(math.Floor(math.Log10(mag)))
	}
	d := most
	if sigma > 0 && knifeFinite(sigma) {
		d = min(most, 1-int(math.Floor(math.Log10(sigma))))
	}
	return max(0, d)
}

// knifePM formats "v ± sigma" with the decimals of [knifeDecimals], the
// magnitude that bounds them being ref.
func knifePM(v, sigma, ref float64) string {
	d := knifeDecimals(sigma, ref)
	return table.Fixed(v, d) + " ± " + table.Fixed(sigma, d)
}

// knifeLengthPM formats the length u as [knifePM] does, in the unit lu
// (without its symbol), ref being in that unit. Unlike [Uncertain.String]
// it keeps every length of a result in one unit and bounds the decimals
// by the radius.
func knifeLengthPM(u Uncertain[units.Length], lu units.Length, ref float64) string {
	return knifePM(float64(u.Value/lu), float64(u.Sigma/lu), ref)
}

// lengthUnit returns the unit in which the result's lengths print: the one
// [table.LengthUnit] picks for the fitted radius rounded to five digits.
func (k KnifeEdge) lengthUnit() (units.Length, string) {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(float64(k.Radius.Value), 'g', 5, 64), 64)
	return table.LengthUnit(units.Length(r))
}

// Table returns the analysis as a table: the radius by each method, the
// edge position, background and beam power with their standard
// uncertainties, the residual RMS, the scan, the largest difference of the
// radii and any warnings. Lengths are in one unit (µm for a radius below
// 1 mm, else mm), powers in the unit of the scan; each value has the
// decimals that show its uncertainty to two digits.
func (k KnifeEdge) Table() table.Table {
	pu := k.PowerUnit
	if pu == "" {
		pu = "power unit of the scan"
	}
	u, sym := k.lengthUnit()
	t := table.Table{Caption: "Knife-edge scan", Header: []string{"quantity", "value", "standard uncertainty"}}
	add := func(q string, v, sigma, ref float64) {
		d := knifeDecimals(sigma, ref)
		t.Rows = append(t.Rows, []string{q, table.Fixed(v, d), table.Fixed(sigma, d)})
	}
	addLength := func(q string, l Uncertain[units.Length], ref float64) {
		add(q, float64(l.Value/u), float64(l.Sigma/u), ref)
	}
	w := float64(k.Radius.Value / u)
	for _, e := range k.estimates() {
		addLength("1/e² radius w ("+sym+"), "+e.label, e.Radius, w)
	}
	addLength("edge position x0 at half power ("+sym+"), erf fit", k.Center, w)
	add("background P0 ("+pu+"), erf fit", k.Background.Value, k.Background.Sigma, k.Power.Value)
	add("beam power Pmax ("+pu+"), erf fit", k.Power.Value, k.Power.Sigma, k.Power.Value)
	t.Rows = append(t.Rows,
		[]string{"residual RMS of the erf fit (" + pu + ")", table.Sig(k.ResidualRMS, 3), ""},
		[]string{"scan", strconv.Itoa(k.Points) + " points, the edge " + k.Direction.String() + " the beam as x increases", ""},
		[]string{"largest difference of the three radii", table.Sig(k.Discrepancy, 2) + " σ", ""})
	for _, msg := range k.Warnings {
		t.Rows = append(t.Rows, []string{"warning", msg, ""})
	}
	return t
}

// knifeLabelled is an estimate with the label the table and String give
// it.
type knifeLabelled struct {
	KnifeEstimate
	label, short string
}

// estimates returns the three radii in the order fit, inversion, clip.
func (k KnifeEdge) estimates() []knifeLabelled {
	return []knifeLabelled{
		{KnifeEstimate{Radius: k.Radius, Center: k.Center.Value, Points: k.Points}, "erf fit", "erf fit"},
		{k.Inversion, "inversion (Khosrofian–Garetz, " + strconv.Itoa(k.Inversion.Points) + " points in 5–95 %)", "inversion"},
		{k.Clip, "10–90 % distance / 1.281552 (TEM₀₀ only)", "10–90 % clip, TEM₀₀ factor"},
	}
}

// String returns a one-line summary, for example
//
//	knife-edge scan, 41 points, edge uncovering: w = 1.0005 ± 0.0018 mm (erf fit), 1.0002 ± 0.0025 mm (inversion), 1.0064 ± 0.0069 mm (10–90 % clip, TEM₀₀ factor); x0 = 0.0993 ± 0.0007 mm; P0 = 0.022 ± 0.002, Pmax = 4.998 ± 0.003, residual RMS 0.0052 (power unit of the scan); radii within 1.0 σ
//
// with one further line per warning.
func (k KnifeEdge) String() string {
	u, sym := k.lengthUnit()
	w := float64(k.Radius.Value / u)
	var b strings.Builder
	b.WriteString("knife-edge scan, " + strconv.Itoa(k.Points) + " points, edge " + k.Direction.String() + ": w = ")
	for i, e := range k.estimates() {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(knifeLengthPM(e.Radius, u, w) + " " + sym + " (" + e.short + ")")
	}
	b.WriteString("; x0 = " + knifeLengthPM(k.Center, u, w) + " " + sym +
		"; P0 = " + knifePM(k.Background.Value, k.Background.Sigma, k.Power.Value) +
		", Pmax = " + knifePM(k.Power.Value, k.Power.Sigma, k.Power.Value) +
		", residual RMS " + table.Sig(k.ResidualRMS, 2) + " (power unit of the scan); radii within " + table.Sig(k.Discrepancy, 2) + " σ")
	for _, msg := range k.Warnings {
		b.WriteString("\nwarning: " + msg)
	}
	return b.String()
}
