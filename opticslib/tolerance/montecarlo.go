package tolerance

import (
	"context"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"strconv"
	"sync"
	"sync/atomic"
	"time"

	"gonum.org/v1/gonum/stat"

	"github.com/beamnote/beamnote/opticslib/internal/errtext"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/target"
)

// MaxTrials bounds [Options.Trials]: 10⁷ trials keep 80 MB of values per
// goal, the most a notebook should hold.
const MaxTrials = 10_000_000

// Options sets up a Monte Carlo run.
type Options struct {
	// Trials is the number of builds N (1 … MaxTrials).
	Trials int
	// Seed selects the random errors: the same seed gives the same
	// builds and bit-identical results whatever the number of workers.
	Seed uint64
	// Workers is the number of goroutines (0 means
	// runtime.GOMAXPROCS(0)).
	Workers int
	// Progress, when not nil, is called with the number of builds done
	// and the total: at the start, at most 20 times a second while the
	// run lasts, and once at the end, always from the goroutine that
	// called MonteCarlo. It must return quickly.
	Progress func(done, total int)
	// Generic makes the run rebuild each system with the edits of package
	// paraxial even when the study has fast measures (slow; for checks).
	Generic bool
}

// Yield is the share of builds that meet a goal or all goals, with its
// binomial standard error √(p(1 − p)/n) (the normal approximation).
// With no failure among n builds the error is 0; the share of bad builds
// is then below 3/n at 95 % confidence (the "rule of three", B. D.
// Jovanovic & P. S. Levy, Am. Stat. 51, 137 (1997) [from memory]).
type Yield struct {
	Met, Trials int
	Fraction    float64
	StdErr      float64
}

func yieldOf(met, n int) Yield {
	y := Yield{Met: met, Trials: n}
	if n > 0 {
		p := float64(met) / float64(n)
		y.Fraction, y.StdErr = p, math.Sqrt(p*(1-p)/float64(n))
	}
	return y
}

// String returns "93.1 % ± 0.3 %".
func (y Yield) String() string {
	return table.Sig(100*y.Fraction, 4) + " % ± " + table.Sig(100*y.StdErr, 2) + " %"
}

// GoalStats are the statistics of one goal's value over the builds that
// could be measured, in the goal's SI unit.
type GoalStats struct {
	// Name and Unit ("m", "rad" or "") are the goal's; Kind, Lo and Hi
	// its wanted range, Nominal its value in the nominal design.
	Name    string
	Unit    string
	Kind    target.Kind
	Lo, Hi  float64
	Nominal float64
	// N is the number of builds measured (the others failed).
	N int
	// Mean and Std are the sample mean and standard deviation (n − 1
	// in the denominator; gonum stat.MeanStdDev). StdErr is the standard
	// error of Std, Std/√(2(N − 1)), exact for normal values (the
	// sampling variance of s² is 2σ⁴/(N − 1)) and a fair estimate near
	// normal.
	Mean, Std, StdErr float64
	// Min, Max and the percentiles P05, P50 (the median) and P95:
	// gonum's stat.Quantile with LinInterp, the inverse of the
	// piecewise-linear empirical CDF (Hyndman & Fan's definition 4, R. J.
	// Hyndman & Y. Fan, Am. Stat. 50, 361 (1996); NumPy's
	// "interpolated_inverted_cdf").
	Min, Max      float64
	P05, P50, P95 float64
	// Yield is the share of all builds (failed ones count as not met)
	// meeting this goal.
	Yield Yield
}

// CompensatorStats describe the compensator over the builds: its value
// in the nominal design and its statistics, in metres.
type CompensatorStats struct {
	// Name is the variable's name, Goal the goal it restores.
	Name, Goal string
	// Nominal is its value in the unperturbed system (0 for a shift).
	Nominal float64
	// Mean, Std, Min and Max are over the builds solved.
	Mean, Std, Min, Max float64
	// AtLimit counts the builds in which no value within the bounds
	// restored the goal: the variable was left at the closer bound.
	AtLimit int
	// Values holds each build's value (NaN for a failed build).
	Values []float64
}

// Result is a finished (or cancelled) Monte Carlo run.
type Result struct {
	// Trials is the number of builds in the result: Requested, or the
	// builds finished before a cancellation (always the first ones, so a
	// cancelled run equals a shorter run with the same seed).
	Trials, Requested int
	// Seed is the seed of the run ([Options.Seed]).
	Seed uint64
	// Fast reports whether the run used the fast route.
	Fast bool
	// Goals holds each goal's statistics, in the study's order.
	Goals []GoalStats
	// Yield is the share of builds meeting every goal.
	Yield Yield
	// Failed counts the builds that could not be made or measured (they
	// meet no goal); FirstFailure is the error of the first of them.
	Failed       int
	FirstFailure string
	// Compensator is nil for a study without one.
	Compensator *CompensatorStats
	// Values holds each goal's value in each build, Values[goal][build],
	// NaN for a failed build.
	Values [][]float64
	// targets holds the goals' targets in the nominal design, which
	// judge the values and format them.
	targets []target.Target
}

// evaluator is one route's trial: the goals' values for errors x.
type evaluator interface {
	trial(x []float64, vals []float64) (comp float64, atLimit bool, err error)
}

type genericEval struct{ p *plan }

func (g genericEval) trial(x []float64, vals []float64) (float64, bool, error) {
	sys, comp, atLimit, err := g.p.generic(x)
	if err == nil {
		err = g.p.measure(sys, vals, nil)
	}
	return comp, atLimit, err
}

// trialSeed returns the second PCG seed word of trial i: output i+1 of
// SplitMix64 started at seed (G. L. Steele, D. Lea & C. H. Flood, "Fast
// splittable pseudorandom number generators", OOPSLA 2014; constants of
// S. Vigna's splitmix64.c), so that neighbouring trials start from
// unrelated PCG states.
func trialSeed(seed uint64, i int) uint64 {
	z := seed + (uint64(i)+1)*0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// chunk is the number of trials a worker takes at a time.
const chunk = 256

// MonteCarlo builds the study Trials times with random errors and
// reports the statistics of every goal, the yield and the compensator.
//
// Build i draws its errors, one per perturbation in order, from a PCG
// generator (math/rand/v2) seeded with (Seed, SplitMix64(Seed, i)): a
// trial's errors depend on the seed and its index only, never on which
// worker runs it, and the statistics are reduced in trial order, so the
// result is bit-identical for any number of workers. Builds that cannot
// be made or measured (a part pushed through its neighbour) count as
// failed and meet no goal.
//
// The run stops early when ctx is cancelled: it then returns the result
// of the builds finished so far (the first ones) together with an error
// wrapping ctx.Err(). It returns a *ParamError for an invalid study
// ([Study.Validate]) or options (wrapping [ErrOptions]).
func (s Study) MonteCarlo(ctx context.Context, o Options) (Result, error) {
	if ctx == nil {
		ctx = context.Background()
	}
	if o.Trials < 1 || o.Trials > MaxTrials {
		return Result{}, &ParamError{Subject: "options", Param: "Trials", Value: o.Trials, Reason: "must be in [1, 10⁷]", Err: ErrOptions}
	}
	if o.Workers < 0 {
		return Result{}, &ParamError{Subject: "options", Param: "Workers", Value: o.Workers, Reason: "must be ≥ 0 (0: one per core)", Err: ErrOptions}
	}
	p, err := s.plan()
	if err != nil {
		return Result{}, err
	}
	fast := p.fast != nil && !o.Generic
	n, ng := o.Trials, len(s.Goals)
	values := make([][]float64, ng)
	for g := range values {
		values[g] = make([]float64, n)
	}
	var comps []float64
	var atLimit []bool
	if p.comp != nil {
		comps, atLimit = make([]float64, n), make([]bool, n)
	}
	failed := make([]bool, n)
	chunks := (n + chunk - 1) / chunk
	finished := make([]bool, chunks)
	workers := o.Workers
	if workers == 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, chunks)
	var next, done atomic.Int64
	type failure struct {
		i   int
		err error
	}
	firsts := make([]failure, workers)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var ev evaluator = genericEval{p}
			if fast {
				ev = newFastEval(p)
			}
			pcg := new(rand.PCG)
			x := make([]float64, len(s.Perturbations))
			vals := make([]float64, ng)
			first := failure{i: -1}
			for ctx.Err() == nil {
				c := int(next.Add(1) - 1)
				if c >= chunks {
					break
				}
				for i := c * chunk; i < min(n, (c+1)*chunk); i++ {
					pcg.Seed(o.Seed, trialSeed(o.Seed, i))
					for j := range s.Perturbations {
						x[j] = s.Perturbations[j].Dist.sample(pcg)
					}
					comp, lim, err := ev.trial(x, vals)
					if err != nil {
						failed[i] = true
						for g := range values {
							values[g][i] = math.NaN()
						}
						if comps != nil {
							comps[i] = math.NaN()
						}
						if first.i < 0 {
							first = failure{i, err}
						}
						continue
					}
					for g := range values {
						values[g][i] = vals[g]
					}
					if comps != nil {
						comps[i], atLimit[i] = comp, lim
					}
				}
				finished[c] = true
				done.Add(int64(min(n, (c+1)*chunk) - c*chunk))
			}
			firsts[w] = first
		}()
	}
	end := make(chan struct{})
	go func() { wg.Wait(); close(end) }()
	if o.Progress != nil {
		o.Progress(0, n)
		tick := time.NewTicker(50 * time.Millisecond)
	wait:
		for {
			select {
			case <-end:
				break wait
			case <-tick.C:
				o.Progress(int(done.Load()), n)
			}
		}
		tick.Stop()
	} else {
		<-end
	}
	// The builds done: the leading finished chunks.
	k := 0
	for k < chunks && finished[k] {
		k++
	}
	k = min(n, k*chunk)
	if o.Progress != nil {
		o.Progress(k, n)
	}
	r := Result{Trials: k, Requested: n, Seed: o.Seed, Fast: fast, targets: p.nominal}
	for g := range values {
		values[g] = values[g][:k:k]
	}
	r.Values = values
	first := failure{i: -1}
	for _, f := range firsts {
		if f.i >= 0 && f.i < k && (first.i < 0 || f.i < first.i) {
			first = f
		}
	}
	if first.i >= 0 {
		r.FirstFailure = "build " + strconv.Itoa(first.i) + ": " + first.err.Error()
	}
	r.reduce(p, failed[:k], comps, atLimit, workers)
	if err := ctx.Err(); err != nil {
		return r, &ParamError{Subject: "Monte Carlo", Param: "builds done", Value: k, Reason: "cancelled after " + strconv.Itoa(k) + " of " + strconv.Itoa(n), Err: err}
	}
	return r, nil
}

// reduce computes the statistics of the first r.Trials builds, each
// goal on its own goroutine (at most workers at a time); every statistic
// is computed in build order whatever runs it, so the result does not
// depend on the number of workers.
func (r *Result) reduce(p *plan, failed []bool, comps []float64, atLimit []bool, workers int) {
	k := r.Trials
	for i := range k {
		if failed[i] {
			r.Failed++
		}
	}
	ng := len(p.s.Goals)
	r.Goals = make([]GoalStats, ng)
	met := make([][]bool, ng)
	var wg sync.WaitGroup
	sem := make(chan struct{}, max(1, workers))
	for g, t := range p.nominal {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer func() { <-sem; wg.Done() }()
			m := make([]bool, k)
			n := 0
			for i, v := range r.Values[g] {
				if failed[i] {
					continue
				}
				t.Value = v
				if m[i] = t.Met(); m[i] {
					n++
				}
			}
			met[g] = m
			st := GoalStats{Name: t.Name, Unit: t.Unit, Kind: t.Kind, Lo: t.Lo, Hi: t.Hi, Nominal: p.nominal[g].Value, Yield: yieldOf(n, k)}
			st.fill(r.Values[g])
			r.Goals[g] = st
		}()
	}
	wg.Wait()
	all := 0
	for i := range k {
		ok := !failed[i]
		for g := 0; g < ng && ok; g++ {
			ok = met[g][i]
		}
		if ok {
			all++
		}
	}
	r.Yield = yieldOf(all, k)
	if p.comp != nil {
		c := &CompensatorStats{Name: p.comp.Name(), Goal: p.s.Goals[p.compGoal].Name, Nominal: p.compNominal, Values: comps[:k:k]}
		var xs []float64
		for i, v := range c.Values {
			if failed[i] {
				continue
			}
			xs = append(xs, v)
			if atLimit[i] {
				c.AtLimit++
			}
		}
		c.Mean, c.Std, c.Min, c.Max = math.NaN(), math.NaN(), math.NaN(), math.NaN()
		if len(xs) > 0 {
			c.Mean, c.Std = stat.MeanStdDev(xs, nil)
			c.Min, c.Max = slices.Min(xs), slices.Max(xs)
		}
		r.Compensator = c
	}
}

// finiteValues returns the finite values of vs, in order.
func finiteValues(vs []float64) []float64 {
	out := make([]float64, 0, len(vs))
	for _, v := range vs {
		if finite(v) {
			out = append(out, v)
		}
	}
	return out
}

// fill sets the sample statistics from vs (NaN for failed builds).
func (st *GoalStats) fill(vs []float64) {
	xs := finiteValues(vs)
	st.N = len(xs)
	nan := math.NaN()
	st.Mean, st.Std, st.StdErr, st.Min, st.Max, st.P05, st.P50, st.P95 = nan, nan, nan, nan, nan, nan, nan, nan
	if st.N == 0 {
		return
	}
	st.Mean, st.Std = stat.MeanStdDev(xs, nil)
	if st.N > 1 {
		st.StdErr = st.Std / math.Sqrt(2*float64(st.N-1))
	}
	slices.Sort(xs)
	st.Min, st.Max = xs[0], xs[len(xs)-1]
	st.P05 = stat.Quantile(0.05, stat.LinInterp, xs, nil)
	st.P50 = stat.Quantile(0.5, stat.LinInterp, xs, nil)
	st.P95 = stat.Quantile(0.95, stat.LinInterp, xs, nil)
}

// Goal returns the statistics of the goal named name, or a *ParamError
// listing the goals.
func (r Result) Goal(name string) (GoalStats, error) {
	for _, g := range r.Goals {
		if g.Name == name {
			return g, nil
		}
	}
	return GoalStats{}, &ParamError{Subject: "goal " + errtext.Quote(name), Reason: "is not a goal of the study (goals: " + r.goalNames() + ")"}
}

func (r Result) goalNames() string {
	s := ""
	for i, g := range r.Goals {
		if i > 0 {
			s += ", "
		}
		s += errtext.Quote(g.Name)
	}
	return s
}
