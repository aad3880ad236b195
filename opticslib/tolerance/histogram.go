package tolerance

import (
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/stat"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/table"
)

// MaxBins bounds the number of bins of a [Histogram].
const MaxBins = 1000

// Histogram counts one goal's values over the builds of a Monte Carlo
// run in bins of equal width, with the goal's wanted range for the
// figure (optplot.ToleranceHistogram).
type Histogram struct {
	// Goal names the goal, Unit its SI unit ("m", "rad" or "").
	Goal, Unit string
	// Edges are the bin edges (SI units, increasing, one more than
	// Counts): bin k holds the values v with Edges[k] ≤ v < Edges[k+1].
	// They span the smallest to the largest value; the last edge lies
	// one rounding unit above the largest, so that it is counted.
	Edges  []float64
	Counts []int
	// Lo and Hi bound the wanted range (−Inf or +Inf on an open side),
	// Wanted states it as the goal's target does ("1 ± 0.05 mm").
	Lo, Hi float64
	Wanted string
	// Nominal is the value in the nominal design, Mean and Std the
	// sample mean and standard deviation.
	Nominal, Mean, Std float64
	// Failed counts the builds without a value; Yield is the share of
	// builds meeting this goal.
	Failed int
	Yield  Yield
}

// Histogram returns the histogram of the goal named goal in bins equal
// bins over the range of its values; bins = 0 chooses ⌈2 N^(1/3)⌉ bins
// for N values, kept within [8, 60] (the "Rice rule": common practice,
// no single source). It returns a *ParamError for an unknown goal, bins
// outside [0, MaxBins], or a goal that no build could measure.
func (r Result) Histogram(goal string, bins int) (Histogram, error) {
	gi := -1
	for i, g := range r.Goals {
		if g.Name == goal {
			gi = i
		}
	}
	if gi < 0 || gi >= len(r.Values) {
		_, err := r.Goal(goal)
		if err == nil {
			err = &ParamError{Subject: "histogram of goal " + errtext.Quote(goal), Reason: "the result holds no values (make it with Study.MonteCarlo)", Err: ErrOptions}
		}
		return Histogram{}, err
	}
	if bins < 0 || bins > MaxBins {
		return Histogram{}, &ParamError{Subject: "histogram of goal " + errtext.Quote(goal), Param: "bins", Value: bins, Reason: "must be in [0, " + strconv.Itoa(MaxBins) + "] (0 chooses)", Err: ErrOptions}
	}
	g := r.Goals[gi]
	xs := finiteValues(r.Values[gi])
	if len(xs) == 0 {
		return Histogram{}, &ParamError{Subject: "histogram of goal " + errtext.Quote(goal), Reason: "no build could be measured (" + strconv.Itoa(r.Failed) + " failed: " + r.FirstFailure + ")", Err: ErrTrial}
	}
	slices.Sort(xs)
	if bins == 0 {
		bins = min(60, max(8, int(math.Ceil(2*math.Cbrt(float64(len(xs)))))))
	}
	lo, hi := xs[0], xs[len(xs)-1]
	if lo == hi {
		d := math.Max(1e-6*math.Abs(lo), 1e-12)
		lo, hi = lo-d, hi+d
	}
	edges := floats.Span(make([]float64, bins+1), lo, hi)
	edges[bins] = math.Nextafter(hi, math.Inf(1))
	counts := stat.Histogram(nil, edges, xs, nil)
	h := Histogram{Goal: g.Name, Unit: g.Unit, Edges: edges, Counts: make([]int, bins), Lo: g.Lo, Hi: g.Hi,
		Nominal: g.Nominal, Mean: g.Mean, Std: g.Std, Failed: r.Trials - len(xs), Yield: g.Yield}
	for k, c := range counts {
		h.Counts[k] = int(c)
	}
	if gi < len(r.targets) {
		h.Wanted = r.targets[gi].Wanted()
	}
	return h, nil
}

// Table returns one row per bin: its edges in the goal's unit and the
// count.
func (h Histogram) Table() table.Table {
	t := table.Table{Caption: "Histogram of " + h.Goal + " (wanted " + h.Wanted + ", yield " + h.Yield.String() + ")", Header: []string{"from", "to", "builds"}}
	for k, c := range h.Counts {
		t.Rows = append(t.Rows, []string{quantity(h.Edges[k], h.Unit, 6), quantity(h.Edges[k+1], h.Unit, 6), strconv.Itoa(c)})
	}
	return t
}

// Table returns the Monte Carlo report: one row per goal with its
// nominal value, mean, standard deviation, 5 % / 50 % / 95 % points,
// wanted range and yield; the caption gives the number of builds, the
// seed, the yield of all goals together, the failed builds and the
// compensator.
func (r Result) Table() table.Table {
	route := "fast route"
	if !r.Fast {
		route = "systems rebuilt"
	}
	c := "Monte Carlo over " + strconv.Itoa(r.Trials) + " builds (seed " + strconv.FormatUint(r.Seed, 10) + ", " + route + "): all goals met in " + r.Yield.String()
	if r.Trials < r.Requested {
		c += "; cancelled after " + strconv.Itoa(r.Trials) + " of " + strconv.Itoa(r.Requested)
	}
	if r.Failed > 0 {
		c += "; " + strconv.Itoa(r.Failed) + " builds failed (" + r.FirstFailure + ")"
	}
	if cs := r.Compensator; cs != nil {
		c += "; " + cs.String()
	}
	t := table.Table{Caption: c, Header: []string{"goal", "nominal", "mean", "σ", "5 %", "median", "95 %", "wanted", "yield"}}
	for i, g := range r.Goals {
		// The goal's target formats the values in one unit with its
		// range; a Result not made by MonteCarlo has none.
		v := func(x float64) string { return quantity(x, g.Unit, 6) }
		wanted := ""
		if i < len(r.targets) {
			tg := r.targets[i]
			v = func(x float64) string { tg.Value = x; return tg.ValueText() }
			wanted = tg.Wanted()
		}
		t.Rows = append(t.Rows, []string{g.Name, v(g.Nominal), v(g.Mean), quantity(g.Std, g.Unit, 3), v(g.P05), v(g.P50), v(g.P95), wanted, g.Yield.String()})
	}
	return t
}

// String returns the table as text.
func (r Result) String() string { return r.Table().Text() }

// String returns "compensator spacing \"gap\" (restores \"w\"): 120 mm
// nominal, mean 120.01 mm, σ 42 µm, range 119.9 … 120.1 mm, 3 builds at a
// limit".
func (c CompensatorStats) String() string {
	s := "compensator " + c.Name + " (restores " + errtext.Quote(c.Goal) + "): " + quantity(c.Nominal, "m", 6) + " nominal"
	if !math.IsNaN(c.Mean) {
		s += ", mean " + quantity(c.Mean, "m", 6) + ", σ " + quantity(c.Std, "m", 3) + ", range " + quantity(c.Min, "m", 6) + " … " + quantity(c.Max, "m", 6)
	}
	return s + ", " + strconv.Itoa(c.AtLimit) + " builds at a limit"
}
