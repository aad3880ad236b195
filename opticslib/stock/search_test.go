package stock_test

import (
	"errors"
	"math"
	"runtime"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/units"
)

func hene(t testing.TB, w0 units.Length) beam.Gaussian {
	t.Helper()
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w0, Wavelength: 633 * nm})
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// pcxStock returns plano-convex N-BK7 lenses of 1 inch with the given
// focal lengths (mm), labelled P<f>, count 1 each.
func pcxStock(t testing.TB, fs ...float64) stock.Stock {
	t.Helper()
	var st stock.Stock
	for _, f := range fs {
		l, err := stock.LensFromSpec(stock.Spec{Label: "P" + strings.TrimPrefix(units.Length(f*1e-3).String(), ""), Kind: stock.PlanoConvex,
			Focal: units.Length(f) * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 1})
		if f < 0 {
			l, err = stock.LensFromSpec(stock.Spec{Label: "N" + units.Length(-f*1e-3).String(), Kind: stock.PlanoConcave,
				Focal: units.Length(f) * mm, Diameter: 25.4 * mm, Material: "N-BK7", Count: 1})
		}
		if err != nil {
			t.Fatal(err)
		}
		l.Label = strings.ReplaceAll(l.Label, " mm", "")
		st.Lenses = append(st.Lenses, l)
	}
	return st
}

func candidate(t *testing.T, r stock.Result, labels string) stock.Candidate {
	t.Helper()
	for _, c := range r.Candidates {
		if c.Labels() == labels {
			return c
		}
	}
	t.Fatalf("no candidate %s in\n%s", labels, r)
	return stock.Candidate{}
}

// selfWaist returns the distance s″ of the waist after a thin lens f and
// its magnification m, for a waist of Rayleigh range zR at distance s
// before the lens: S. A. Self, "Focusing of spherical Gaussian beams",
// Appl. Opt. 22, 658–661 (1983):
//
//	s″ = f + (s − f) f² / ((s − f)² + zR²),   m = 1/√((1 − s/f)² + (zR/f)²)
func selfWaist(s, f, zR float64) (s2, m float64) {
	u := s - f
	return f + u*f*f/(u*u+zR*zR), 1 / math.Sqrt((1-s/f)*(1-s/f)+(zR/f)*(zR/f))
}

// The collimating gap of a two-lens telescope against Self's closed form
// d = s1″ + f2 (the intermediate waist in L2's front focal plane), the
// output waist m1·(f2/zR′)·w0, and the tolerance term against its
// closed form: at collimation ∂[(s″ − f2)/zR_out]/∂d = 1/zR′ (Self's
// s″ and m differentiated at s2 = f2), so Sensitivity = Placement/(zR′
// tol). The search solves with the q parameter, Self's formulas are in
// distances and Rayleigh ranges, and the judged values come from
// beam.Waists on the paraxial system: three derivations. Tolerance: 1e-9
// relative for the closed forms (rounding in differences of lengths a
// few 100 mm long at the mm scale), 1e-6 for the central difference
// (its truncation error, h²/6 times the third derivative, is below 1e-8
// here).
func TestPairSelf(t *testing.T) {
	const (
		w0 = 0.3 * mm
		s1 = 120 * mm
	)
	in := hene(t, w0)
	zR := float64(in.RayleighRange())
	for _, fs := range [][2]float64{{50, 150}, {150, 50}, {-50, 150}, {75, 75}} {
		st := pcxStock(t, fs[0], fs[1])
		if fs[0] == fs[1] {
			st.Lenses[0].Count = 2
			st.Lenses = st.Lenses[:1]
		}
		s := stock.Search{In: in, Before: s1, After: 100 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)}, MinGap: mm}
		r, err := s.Run(st)
		if err != nil {
			t.Fatalf("%v: %v", fs, err)
		}
		f1, f2 := fs[0]*1e-3, fs[1]*1e-3
		s1pp, m1 := selfWaist(float64(s1), f1, zR)
		zR1 := m1 * m1 * zR
		wantGap, wantW := s1pp+f2, float64(w0)*m1*f2/zR1
		c := candidate(t, r, st.Lenses[0].Label+"+"+st.Lenses[len(st.Lenses)-1].Label)
		if !scalar.EqualWithinRel(float64(c.Gaps[0]), wantGap, 1e-9) {
			t.Errorf("%v: gap = %v, want Self's %v", fs, c.Gaps[0], units.Length(wantGap))
		}
		w, err := design.WaistRadius(in)(c.Problem.System)
		if err != nil || !scalar.EqualWithinRel(float64(w), wantW, 1e-9) {
			t.Errorf("%v: output waist = %v (%v), want %v", fs, w, err, units.Length(wantW))
		}
		if !scalar.EqualWithinRel(c.Sensitivity, float64(stock.DefaultPlacement)/(zR1*0.1), 1e-6) {
			t.Errorf("%v: Sensitivity = %v, want Placement/(zR′ tol) = %v", fs, c.Sensitivity, float64(stock.DefaultPlacement)/(zR1*0.1))
		}
		if !c.Evaluation.Met() || c.Length != s1+c.Gaps[0]+100*mm {
			t.Errorf("%v: met %v, length %v", fs, c.Evaluation.Met(), c.Length)
		}
	}
}

// With the input waist in L1's front focal plane the collimating gap is
// exactly f1 + f2 and the waist ratio f2/f1 (the afocal telescope; Self
// 1983 with s1 = f1).
func TestPairAfocal(t *testing.T) {
	in := hene(t, 0.5*mm)
	st := pcxStock(t, 40, 200)
	r, err := stock.Search{In: in, Before: 40 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.01)}}.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	c := candidate(t, r, "P40+P200")
	w, _ := design.WaistRadius(in)(c.Problem.System)
	if !scalar.EqualWithinRel(float64(c.Gaps[0]), 0.24, 1e-12) || !scalar.EqualWithinRel(float64(w), 0.5e-3*5, 1e-12) {
		t.Errorf("gap %v, waist %v; want 240 mm, 2.5 mm", c.Gaps[0], w)
	}
}

// A focusing goal: the waist at z after L2. Self's waist distance has a
// maximum f + f²/(2zR′) at s = f + zR′, so below it there are two gaps,
// on either side of the one that puts the waist farthest out, and above
// it none. Each solution's waist, measured on the paraxial system
// (design.WaistAfter), is where it was asked for (1e-9 relative).
func TestPairWaistAt(t *testing.T) {
	in := hene(t, 0.5*mm)
	st := pcxStock(t, 500, 100)
	st.Lenses = st.Lenses[:2]
	zR := float64(in.RayleighRange())
	const before = 200 * mm
	s1pp, m1 := selfWaist(float64(before), 0.5, zR)
	zR1 := m1 * m1 * zR
	const f2 = 0.1
	zmax := f2 + f2*f2/(2*zR1)
	for _, test := range []struct {
		z    float64
		want int
	}{{0.99 * zmax, 2}, {1.01 * zmax, 0}} {
		s := stock.Search{In: in, Before: before, Lenses: 2, Solve: []stock.Condition{stock.WaistAt(units.Length(test.z), 0.1*mm)}, MinGap: mm, MaxGap: 5 * units.Meter}
		r, err := s.Run(st)
		var got []stock.Candidate
		for _, c := range r.Candidates {
			if c.Labels() == "P500+P100" {
				got = append(got, c)
			}
		}
		if len(got) != test.want {
			t.Errorf("z = %v: %d solutions (%v), want %d", units.Length(test.z), len(got), err, test.want)
			continue
		}
		for _, c := range got {
			z, err := design.WaistAfter(in, "L2")(c.Problem.System)
			if err != nil || !scalar.EqualWithinRel(float64(z), test.z, 1e-9) {
				t.Errorf("z = %v: waist after L2 at %v (%v)", units.Length(test.z), z, err)
			}
		}
		if test.want == 2 {
			// The two distances from the intermediate waist straddle f + zR′.
			sa, sb := float64(got[0].Gaps[0])-s1pp, float64(got[1].Gaps[0])-s1pp
			if (sa-f2-zR1)*(sb-f2-zR1) >= 0 {
				t.Errorf("s = %v, %v do not straddle f + zR′ = %v", sa, sb, f2+zR1)
			}
		}
	}
}

// The ranking against a hand-checked stock (testdata/stock/expander.csv):
// for a 3× collimated expander of a 0.5 mm HeNe waist (zR = 1.241 m) 50
// mm before L1, only P25+P75 and P50+P150 have the ratio. By hand, with
// Self's closed forms (selfWaist) rather than the search's q parameter:
//
//	            gap (mm)  length  tolerance  fill    aberration  score
//	P50+P150    200       0.250   0.4963     0.1312  0.0046      0.8821
//	P25+P75     100.01    0.150   1.9860     0.1313  0.0367      2.3040
//
// (the gap is exactly f1 + f2 for P50+P150, whose front focal plane holds
// the waist; tolerance = 0.1 mm/(zR′ · 0.1) with zR′ = m1² zR the
// intermediate Rayleigh range; fill = w(L2)/(0.9 × 12.7 mm); aberration
// from SphericalSeidel at 1.5 w with q = +1 on L1 and −1 on L2), so
// P50+P150 is best although longer: the shorter telescope's intermediate
// focus is four times tighter and its collimation four times as sensitive
// to the gap. Both are mounted with their curved sides towards the
// collimated beams, the classic rule (Smith, Modern Optical Engineering,
// ch. 6 [from memory]). Tolerance: 1e-6 relative on each term (the
// central difference's truncation error is below 1e-8; the rest is
// rounding).
func TestRankingHandChecked(t *testing.T) {
	st, err := stock.ReadFile("../../testdata/stock/expander.csv")
	if err != nil {
		t.Fatal(err)
	}
	in := hene(t, 0.5*mm)
	s := stock.Search{In: in, Before: 50 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)},
		Goals: []design.Goal{design.Near("output radius", design.WaistRadius(in), 1.5*mm, 0.05*mm)}}
	r, err := s.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	if r.Met != 2 || len(r.Candidates) != 2 || r.Combinations != 30 {
		t.Fatalf("met %d of %d combinations, want 2 of 30:\n%s", r.Met, r.Combinations, r)
	}
	best, second := r.Candidates[0], r.Candidates[1]
	if best.Labels() != "P50+P150" || second.Labels() != "P25+P75" || best.Rank != 1 || second.Rank != 2 {
		t.Fatalf("ranking:\n%s\nwant P50+P150, then P25+P75", r)
	}
	if !scalar.EqualWithinRel(float64(best.Gaps[0]), 0.2, 1e-12) {
		t.Errorf("best gap = %v, want f1 + f2 = 200 mm", best.Gaps[0])
	}
	const n, lam, w0, z = 1.5168, 633e-9, 0.5e-3, 0.05
	zR := math.Pi * w0 * w0 / lam
	bracket := func(q, c float64) float64 {
		return ((n+2)/(n-1)*q*q + 4*(n+1)*q*c + (3*n+2)*(n-1)*c*c + n*n*n/(n-1)) / (n * (n - 1))
	}
	for _, test := range []struct {
		c      stock.Candidate
		f1, f2 float64
	}{{best, 0.05, 0.15}, {second, 0.025, 0.075}} {
		s1pp, m1 := selfWaist(z, test.f1, zR)
		zR1 := m1 * m1 * zR
		w1 := w0 * math.Sqrt(1+(z/zR)*(z/zR))
		wm := math.Sqrt(lam * zR1 / math.Pi)
		w2 := wm * math.Sqrt(1+(test.f2/zR1)*(test.f2/zR1))
		s1 := math.Pow(1.5*w1, 4) / (4 * math.Pow(test.f1, 3)) * bracket(1, 2*test.f1*z/(z*z+zR*zR)-1)
		s2 := math.Pow(1.5*w2, 4) / (4 * math.Pow(test.f2, 3)) * bracket(-1, 2*test.f2*test.f2/(test.f2*test.f2+zR1*zR1)-1)
		want := stock.Score{
			Length:     z + s1pp + test.f2,
			Tolerance:  1e-4 / (zR1 * 0.1),
			Aperture:   w2 / (0.9 * 12.7e-3),
			Aberration: (s1 + s2) / 8 / (6 * math.Sqrt(5)) / lam * 14,
		}
		want.Total = want.Length + want.Tolerance + want.Aperture + want.Aberration
		got := test.c.Score
		for _, term := range []struct {
			name      string
			got, want float64
		}{{"length", got.Length, want.Length}, {"tolerance", got.Tolerance, want.Tolerance}, {"aperture", got.Aperture, want.Aperture},
			{"aberration", got.Aberration, want.Aberration}, {"total", got.Total, want.Total}} {
			if !scalar.EqualWithinRel(term.got, term.want, 1e-6) {
				t.Errorf("%s: %s term = %.7g, want %.7g by hand", test.c.Labels(), term.name, term.got, term.want)
			}
		}
		if got := test.c.Mount(); got != "curved first, flat first" {
			t.Errorf("%s: mount %q, want curved first, flat first", test.c.Labels(), got)
		}
	}
	tb := r.Table()
	if len(tb.Rows) != 2 || tb.Validate() != nil || tb.Rows[0][1] != "P50+P150" {
		t.Errorf("Table:\n%s", tb.Text())
	}
	if ct := best.Table(); len(ct.Rows) != 2 || ct.Validate() != nil {
		t.Errorf("Candidate.Table:\n%s", ct.Text())
	}
	// Every rejected solution is counted once: Solutions = rejected
	// after the bounds + Met.
	cnt := 0
	for _, j := range r.Rejections {
		if strings.HasPrefix(j.Reason, "misses goal") || strings.HasPrefix(j.Reason, "clipped") || strings.HasPrefix(j.Reason, "a goal cannot") {
			cnt += j.Count
		}
	}
	if cnt+r.Met != r.Solutions {
		t.Errorf("rejections after the bounds %d + met %d ≠ solutions %d:\n%s", cnt, r.Met, r.Solutions, r.RejectionTable().Text())
	}
}

// The aberration term: with a large beam (w = 2 mm) on short lenses the
// orientation matters; the chosen one has the smaller |Σ S_I| of the four,
// and turning a plano-convex lens the wrong way multiplies its share by
// about 4 (TestPlanoConvexRatio).
func TestOrientation(t *testing.T) {
	in := hene(t, 2*mm)
	st := pcxStock(t, 100, 200)
	r, err := stock.Search{In: in, Before: 100 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)}, MinTransmission: 0.9}.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	c := candidate(t, r, "P100+P200")
	if c.Mount() != "curved first, flat first" || c.Reversed[0] || !c.Reversed[1] {
		t.Errorf("mount %q (reversed %v), want curved first, flat first", c.Mount(), c.Reversed)
	}
	if c.RMS <= 0 || c.Score.Aberration <= 0 {
		t.Errorf("RMS %v, aberration term %v: want positive", c.RMS, c.Score.Aberration)
	}
	// S_I of the chosen mount by hand: each lens at 1.5 w with the
	// conjugate factor of the beam's wavefront there.
	sum := 0.0
	for i, l := range c.Lenses {
		// The beam arriving at the lens (a plane at a surface is just after
		// it): 1 nm before, which moves the wavefront curvature by about
		// 1e-8 of itself (dκ/dz ≈ −κ² for R = 0.2 m), hence the 1e-7
		// tolerance.
		g, err := beam.At(c.Problem.System, in, c.Problem.System.Element(2*i+1).Z-nm)
		if err != nil {
			t.Fatal(err)
		}
		sum += float64(l.Seidel(stock.MarginalFactor*g.Radius(), stock.Conjugate(l.Focal, g.WavefrontCurvature())))
	}
	if !scalar.EqualWithinRel(float64(c.Seidel), sum, 1e-7) {
		t.Errorf("Seidel = %v, want Σ by hand %v (relative %g)", c.Seidel, sum, float64(c.Seidel)/sum-1)
	}
}

// Counts: a lens owned once is used once; two identical lenses need a
// count of 2, and the pair is then one combination, not two. A 1× relay
// of two 100 mm lenses is the only pair that keeps the waist.
func TestCounts(t *testing.T) {
	in := hene(t, 0.5*mm)
	st := pcxStock(t, 100, 50)
	s := stock.Search{In: in, Before: 100 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)},
		Goals: []design.Goal{design.Near("output waist", design.WaistRadius(in), 0.5*mm, 0.02*mm)}}
	r, err := s.Run(st)
	if r.Combinations != 2 || !errors.Is(err, stock.ErrNoCandidate) {
		t.Fatalf("count 1: %d combinations, error %v; want 2 and ErrNoCandidate", r.Combinations, err)
	}
	for _, w := range []string{`no pair meets goal "output waist": closest was`, "(wanted 500 ± 20 µm) with P"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error %q does not contain %q", err, w)
		}
	}
	if len(r.Rejections) == 0 {
		t.Errorf("no rejections with the error")
	}
	st.Lenses[0].Count = 2
	r, err = s.Run(st)
	if err != nil || r.Combinations != 3 || r.Met != 1 || r.Candidates[0].Labels() != "P100+P100" {
		t.Errorf("count 2: %v\n%s", err, r)
	}
	// Triples from a count of 2 and 1: AAB, ABA, BAA.
	s.Lenses, s.Solve, s.Goals = 3, []stock.Condition{stock.Collimate(0.1), stock.WaistSize(0.5*mm, 0.01*mm)}, nil
	st.Lenses = st.Lenses[:1]
	st.Lenses = append(st.Lenses, pcxStock(t, 150).Lenses...)
	r, _ = s.Run(st)
	if r.Combinations != 3 {
		t.Errorf("triples of counts 2 and 1: %d combinations, want 3", r.Combinations)
	}
}

// A three-lens expander of exactly the wanted size: two spacings for
// collimation and the output waist, solved by nested roots; every
// candidate meets both on its paraxial system (design measures through
// beam.Waists, tolerance 1e-9 relative to the waist: the outer Brent
// search stops at 1e-10 m in d1).
func TestTriples(t *testing.T) {
	st, err := stock.ReadFile("../../testdata/stock/expander.csv")
	if err != nil {
		t.Fatal(err)
	}
	in := hene(t, 0.5*mm)
	s := stock.Search{In: in, Before: 50 * mm, Lenses: 3, Solve: []stock.Condition{stock.Collimate(0.1), stock.WaistSize(2.2*mm, 0.01*mm)},
		MaxLength: 600 * mm, Keep: 50}
	r, err := s.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	if r.Combinations != 120 || r.Met == 0 {
		t.Fatalf("%d combinations, %d met\n%s", r.Combinations, r.Met, r.RejectionTable().Text())
	}
	for _, c := range r.Candidates {
		sys := c.Problem.System
		w, err1 := design.WaistRadius(in)(sys)
		off, err2 := stock.CollimationOffset(in, "L3")(sys)
		if err1 != nil || err2 != nil || !scalar.EqualWithinRel(float64(w), 2.2e-3, 1e-9) || math.Abs(off) > 1e-9 {
			t.Errorf("%s at %v: waist %v, collimation offset %v (%v, %v)", c.Labels(), c.Gaps, w, off, err1, err2)
		}
		if len(c.Gaps) != 2 || c.Length > 600*mm || c.Gaps[0] < stock.DefaultMinGap || c.Gaps[1] < stock.DefaultMinGap {
			t.Errorf("%s: gaps %v, length %v outside the bounds", c.Labels(), c.Gaps, c.Length)
		}
	}
}

// The result does not depend on the number of goroutines: the demo
// drawer's pairs, and triples of a part of it, with 1, 2 and 3 of them
// give the same tables, digit for digit.
func TestDeterministic(t *testing.T) {
	full, err := stock.ReadFile(drawer)
	if err != nil {
		t.Fatal(err)
	}
	part := stock.Stock{Lenses: full.Lenses[:18]}
	in := hene(t, 0.5*mm)
	pairs := stock.Search{In: in, Before: 100 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)},
		Goals: []design.Goal{design.Near("output radius", design.WaistRadius(in), 1.5*mm, 0.05*mm)}, MaxLength: 400 * mm, Keep: 30}
	triples := pairs
	triples.Lenses, triples.Solve = 3, []stock.Condition{stock.Collimate(0.1), stock.WaistSize(1.5*mm, 0.01*mm)}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	for _, test := range []struct {
		name string
		s    stock.Search
		st   stock.Stock
	}{{"pairs", pairs, full}, {"triples", triples, part}} {
		var want string
		for _, procs := range []int{1, 2, 3} {
			runtime.GOMAXPROCS(procs)
			r, err := test.s.Run(test.st)
			if err != nil {
				t.Fatalf("%s: %v", test.name, err)
			}
			got := r.Table().Text() + r.RejectionTable().Text()
			for _, c := range r.Candidates {
				got += c.Table().Text()
			}
			if procs == 1 {
				want = got
			} else if got != want {
				t.Errorf("%s with GOMAXPROCS %d differs from 1:\n%s\nwant\n%s", test.name, procs, got, want)
			}
		}
	}
}

// Bad searches: messages name the parameter, the bound or the goal.
func TestSearchErrors(t *testing.T) {
	in := hene(t, 0.5*mm)
	st, err := stock.ReadFile("../../testdata/stock/expander.csv")
	if err != nil {
		t.Fatal(err)
	}
	ok := stock.Search{In: in, Before: 50 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)},
		Goals: []design.Goal{design.Near("output radius", design.WaistRadius(in), 1.5*mm, 0.05*mm)}}
	if _, err := ok.Run(st); err != nil {
		t.Fatal(err)
	}
	one := stock.Stock{Lenses: st.Lenses[:1]}
	for _, test := range []struct {
		name string
		edit func(s *stock.Search)
		st   *stock.Stock
		want []string
		err  error
	}{
		{"empty stock", nil, &stock.Stock{}, []string{"stock", "has no lenses"}, stock.ErrEmpty},
		{"one lens", nil, &one, []string{"lenses = 1", "a pair needs 2"}, stock.ErrEmpty},
		{"lenses", func(s *stock.Search) { s.Lenses = 4 }, nil, []string{"Lenses = 4", "2 or 3"}, stock.ErrInput},
		{"conditions", func(s *stock.Search) { s.Lenses = 3 }, nil, []string{"Solve = 1", "3 lenses have 2 spacings"}, stock.ErrInput},
		{"zero condition", func(s *stock.Search) { s.Solve = []stock.Condition{{}} }, nil, []string{"Solve[0]", "zero Condition"}, stock.ErrInput},
		{"tolerance", func(s *stock.Search) { s.Solve = []stock.Condition{stock.Collimate(0)} }, nil, []string{`"collimation"`, "tolerance = 0"}, stock.ErrInput},
		{"waist", func(s *stock.Search) { s.Solve = []stock.Condition{stock.WaistAt(-1*mm, mm)} }, nil, []string{`"waist after L"`, "value = -1 mm"}, stock.ErrInput},
		{"beam", func(s *stock.Search) { s.In = nil }, nil, []string{"In", "nil"}, stock.ErrInput},
		{"gaps", func(s *stock.Search) { s.MinGap, s.MaxGap = 300*mm, 200*mm }, nil, []string{"MinGap = 300 mm", "MaxGap (= 200 mm)"}, stock.ErrBounds},
		{"budget", func(s *stock.Search) { s.Before, s.After, s.MaxLength = 100*mm, 250*mm, 300*mm }, nil,
			[]string{"bound MaxLength = 300 mm", "= 355 mm already exceed it"}, stock.ErrBounds},
		{"max gap", func(s *stock.Search) { s.MaxGap = 60 * mm }, nil, []string{"bounds [MinGap, MaxGap] = [5 mm, 60 mm]", "exclude every solution", "closest was P50+P25 at d1 = 75 mm (above MaxGap)"}, stock.ErrBounds},
		{"max length", func(s *stock.Search) { s.MaxLength = 100 * mm }, nil, []string{"bound MaxLength = 100 mm", "excludes every solution", "25 mm above MaxLength"}, stock.ErrNoCandidate},
		{"goal", func(s *stock.Search) {
			s.Goals = []design.Goal{design.Near("output radius", design.WaistRadius(in), 3.3*mm, 0.1*mm)}
		}, nil, []string{`no pair meets goal "output radius": closest was 3`, "(wanted 3.3 ± 0.1 mm) with P25+P150"}, stock.ErrNoCandidate},
		{"far waist", func(s *stock.Search) { s.Solve = []stock.Condition{stock.WaistAt(1000*units.Meter, mm)} }, nil,
			[]string{"no pair meets the conditions (waist 1000 m ± 1 mm after the last lens) with any spacing"}, stock.ErrNoCandidate},
		{"together", func(s *stock.Search) {
			s.Goals = append(s.Goals, design.AtMost("length", design.TotalLength(), 140*mm))
		}, nil, []string{"no pair meets every goal at once: closest was P", `missing "`}, stock.ErrNoCandidate},
		{"clipped", func(s *stock.Search) { s.In = hene(t, 8*mm); s.Goals = nil }, nil, []string{"MinTransmission = 0.99", "every solution is clipped", "least clipped was P"}, stock.ErrNoCandidate},
		{"not computable", func(s *stock.Search) {
			s.Goals = []design.Goal{design.Near("radius at L3", design.RadiusAt(in, "L3"), 1*mm, 1*mm)}
		}, nil, []string{"no goal could be computed", "L3"}, stock.ErrNoCandidate},
		{"weights", func(s *stock.Search) { s.Weights = &stock.Weights{Length: -1} }, nil, []string{"Weights.Length = -1"}, stock.ErrInput},
		{"weight of a goal", func(s *stock.Search) { s.Goals = []design.Goal{s.Goals[0].WithWeight(math.NaN())} }, nil, []string{`goal "output radius"`, "weight"}, nil},
	} {
		s := ok
		if test.edit != nil {
			test.edit(&s)
		}
		sst := st
		if test.st != nil {
			sst = *test.st
		}
		r, err := s.Run(sst)
		if err == nil {
			t.Errorf("%s: Run = nil error", test.name)
			continue
		}
		for _, w := range test.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q does not contain %q", test.name, err, w)
			}
		}
		if test.err != nil && !errors.Is(err, test.err) {
			t.Errorf("%s: error %q does not wrap %v", test.name, err, test.err)
		}
		if errors.Is(err, stock.ErrNoCandidate) && len(r.Rejections) == 0 {
			t.Errorf("%s: no rejections returned with the error", test.name)
		}
	}
}

// An astigmatic beam: the conditions hold in the tangential plane, and
// the fill takes the larger radius.
func TestAstigmatic(t *testing.T) {
	x, y := beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 633 * nm}, beam.WaistSpec{WaistRadius: 0.8 * mm, Wavelength: 633 * nm}
	in, err := beam.FromWaists(x, y)
	if err != nil {
		t.Fatal(err)
	}
	st := pcxStock(t, 50, 150)
	r, err := stock.Search{In: in, Before: 50 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)}}.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	c := candidate(t, r, "P50+P150")
	if !scalar.EqualWithinRel(float64(c.Gaps[0]), 0.2, 1e-12) || c.Fill <= float64(c.Radii[1])/float64(c.Lenses[1].ClearRadius()) {
		t.Errorf("gap %v, fill %v (x radius %v)", c.Gaps[0], c.Fill, c.Radii[1])
	}
}

// The real-ray model on TestOrientation's case: it chooses the same mount
// as third-order theory (both lenses plano-convex, curved side towards the
// collimated beam on each, R36's rule, common practice) and an RMS within
// 10 % of the third-order one: the thin-lens, third-order estimate leaves
// out the thickness and the higher orders, which at w = 2 mm on f = 100 mm
// (h/f = 0.03 at 1.5 w) are of order (h/f)²·10 ≈ 1 % each, and the beam's
// curvature at L2 is approximated by one sphere for every ray.
func TestOrientationRealRays(t *testing.T) {
	in := hene(t, 2*mm)
	st := pcxStock(t, 100, 200)
	s := stock.Search{In: in, Before: 100 * mm, Lenses: 2, Solve: []stock.Condition{stock.Collimate(0.1)}, MinTransmission: 0.9}
	third, err := s.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	s.Aberration = stock.RealRays
	real, err := s.Run(st)
	if err != nil {
		t.Fatal(err)
	}
	a, b := candidate(t, third, "P100+P200"), candidate(t, real, "P100+P200")
	if a.Mount() != b.Mount() {
		t.Errorf("real rays mount %q, third order %q", b.Mount(), a.Mount())
	}
	if r := b.RMS / a.RMS; !(r > 0.9 && r < 1.1) {
		t.Errorf("real-ray RMS %.5f waves, third order %.5f (ratio %.3f)", b.RMS, a.RMS, r)
	}
	t.Logf("P100+P200: RMS %.5f waves (real rays), %.5f (third order)", b.RMS, a.RMS)
}
