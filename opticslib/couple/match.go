package couple

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/optimize"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Lens is a thin lens of a mode-matching [Problem]: its focal length,
// fixed or free within a range, and the range of its position.
type Lens struct {
	// Label names the lens in the System and the table ("L1", "L2", …
	// when empty).
	Label string
	// Focal is a fixed focal length in metres (positive converging).
	// Leave it zero and give FocalMin < FocalMax (same sign) for a free
	// focal length.
	Focal, FocalMin, FocalMax units.Length
	// ZMin and ZMax bound the lens position in metres from the input
	// plane; both zero means anywhere between the previous lens (or the
	// input plane) and the target plane. ZMin = ZMax fixes it.
	ZMin, ZMax units.Length
}

// Problem is a mode-matching problem: thin lenses, in the order the light
// meets them, that carry Input (given at the input plane z = 0) to Target
// (the mode to match, given at the target plane z = L), with
// MinLength ≤ L ≤ MaxLength (metres; equal values fix L). Target must be
// TEM₀₀ (M² = 1); the input may have M² > 1 (see the package
// documentation for the model), in which case the best efficiency is
// 2/(M² + 1) per direction. Both beams must be round and in the same
// medium, of the same wavelength.
type Problem struct {
	Input, Target        beam.Gaussian
	Lenses               []Lens
	MinLength, MaxLength units.Length
}

// PlacedLens is a lens of a solution: label, focal length and position
// from the input plane, in metres.
type PlacedLens struct {
	Label    string
	Focal, Z units.Length
}

// Match is a mode-matching solution.
type Match struct {
	// System runs from the input plane to the target plane: spaces
	// labelled "to L1", "L1 to L2", …, "to target", and the lenses
	// labelled as given; draw its caustic with optplot.
	System paraxial.System
	// Lenses are the lenses placed, in order.
	Lenses []PlacedLens
	// Length is the position L of the target plane, in metres.
	Length units.Length
	// Output is the input beam propagated to the target plane.
	Output beam.Gaussian
	// Coupling is the overlap of Output with the target.
	Coupling Coupling
	// Method says how the solution was found.
	Method string
}

// embedded returns the embedded Gaussian's waist position (from the
// plane) and Rayleigh range.
func embedded(g beam.Gaussian) (waistZ, zR float64) { return -real(g.Q), imag(g.Q) }

func checkPair(in, target beam.Gaussian) error {
	if err := in.Validate(); err != nil {
		return &ParamError{Subject: "input beam", Err: err}
	}
	if err := target.Validate(); err != nil {
		return &ParamError{Subject: "target", Err: err}
	}
	if target.BeamQuality() != 1 {
		return &ParamError{Subject: "target", Param: "M²", Value: target.BeamQuality(), Reason: "must be 1 (the target is a mode)"}
	}
	_, err := newPair(in, target)
	return err
}

func checkFocal(name string, f units.Length) error {
	if f == 0 || bad(float64(f)) {
		return &ParamError{Subject: name, Param: "focal length f", Value: f, Reason: "must be nonzero and finite"}
	}
	return nil
}

// kogelnik returns the lens-to-waist distances of a thin lens f that
// images the waist of Rayleigh range z1 onto the waist of Rayleigh range
// z2 (embedded beams, one medium), with sign s = ±1:
//
//	f0 = √(z1 z2) = π w1 w2/λ,  d1 = f + s√(z1/z2)·√(f² − f0²),  d2 = f + s√(z2/z1)·√(f² − f0²)
//
// (H. Kogelnik & T. Li 1966, section on mode matching [from memory]); ok
// is false for |f| < f0.
func kogelnik(f, z1, z2, s float64) (d1, d2 float64, ok bool) {
	r := f*f - z1*z2
	if r < 0 {
		return 0, 0, false
	}
	root := math.Sqrt(r)
	return f + s*math.Sqrt(z1/z2)*root, f + s*math.Sqrt(z2/z1)*root, true
}

// MatchOneLens returns the placements of one thin lens of focal length f
// (metres) that match in (given at z = 0) to target (given at the target
// plane): Kogelnik's closed form (see kogelnik above; f0 = π w1 w2/λ with
// the embedded waists) puts the lens d1 after the input waist and the
// target waist d2 after the lens,
//
//	d1 = f ± (w1/w2)√(f² − f0²),  d2 = f ± (w2/w1)√(f² − f0²)
//
// (H. Kogelnik & T. Li, Appl. Opt. 5, 1550 (1966) [from memory for the
// section]). Each solution with the lens at z ≥ 0 and the target plane
// after it is returned, shortest first, with efficiency 1 (2/(M² + 1)² for
// an input with M² > 1). It returns a *ParamError for invalid beams or f,
// and one wrapping [ErrNoSolution] if |f| < f0 or no solution lies on the
// path.
func MatchOneLens(in, target beam.Gaussian, f units.Length) ([]Match, error) {
	if err := checkPair(in, target); err != nil {
		return nil, err
	}
	if err := checkFocal("lens", f); err != nil {
		return nil, err
	}
	zw1, zr1 := embedded(in)
	zw2, zr2 := embedded(target)
	var out []Match
	for _, s := range []float64{-1, 1} {
		d1, d2, ok := kogelnik(float64(f), zr1, zr2, s)
		if !ok {
			return nil, &ParamError{Subject: "lens", Param: "focal length f", Value: f,
				Reason: "is shorter than f0 = π w1 w2/λ = " + units.Length(math.Sqrt(zr1*zr2)).String(), Err: ErrNoSolution}
		}
		z := zw1 + d1
		length := z + d2 - zw2
		if z < 0 || length < z {
			continue
		}
		m, err := buildMatch(in, target, []PlacedLens{{"L1", f, units.Length(z)}}, units.Length(length), "closed form, one lens (Kogelnik)")
		if err != nil {
			return nil, err
		}
		if len(out) == 0 || math.Abs(float64(out[0].Length-m.Length)) > 1e-12*float64(m.Length) {
			out = append(out, m)
		}
	}
	if len(out) == 0 {
		return nil, &ParamError{Subject: "lens", Param: "focal length f", Value: f, Reason: "both solutions put the lens before the input plane or after the target plane", Err: ErrNoSolution}
	}
	slices.SortFunc(out, func(a, b Match) int { return cmp.Compare(a.Length, b.Length) })
	return out, nil
}

// twoLensScan is the number of intervals MatchTwoLenses scans for sign
// changes of its residual; solutions closer together than length/2000
// may merge.
const twoLensScan = 2000

// MatchTwoLenses returns the placements of two thin lenses of focal
// lengths f1 and f2 (metres) that match in (given at z = 0) to target
// (given at the target plane z = length, metres). For a first lens at z1
// the intermediate beam is fixed, and Kogelnik's one-lens formula places
// the second lens and gives the target-plane position L(z1) on each of
// its two branches; the solutions are the roots of L(z1) = length, found
// by 1-D root search (a scan of 2000 intervals over 0 ≤ z1 ≤ length, then
// bisection to machine precision), with 0 ≤ z1 ≤ z2 ≤ length. They are
// returned by first-lens position. The problem has no closed form in
// general; this is a root search, not a minimisation. It returns a
// *ParamError for invalid input, and one wrapping [ErrNoSolution] if no
// placement exists.
func MatchTwoLenses(in, target beam.Gaussian, f1, f2, length units.Length) ([]Match, error) {
	if err := checkPair(in, target); err != nil {
		return nil, err
	}
	if err := checkFocal(`lens "L1"`, f1); err != nil {
		return nil, err
	}
	if err := checkFocal(`lens "L2"`, f2); err != nil {
		return nil, err
	}
	if !(length > 0) || bad(float64(length)) {
		return nil, &ParamError{Param: "length L", Value: length, Reason: "must be positive and finite"}
	}
	q0 := complex128(in.Q)
	zw2, zr2 := embedded(target)
	L := float64(length)
	// place returns z2 and the residual L(z1) − length on branch s.
	place := func(z1, s float64) (z2, r float64, ok bool) {
		q := q0 + complex(z1, 0)
		q = 1 / (1/q - complex(1/float64(f1), 0))
		zw := z1 - real(q)
		d1, d2, ok := kogelnik(float64(f2), imag(q), zr2, s)
		if !ok {
			return 0, 0, false
		}
		z2 = zw + d1
		return z2, z2 + d2 - zw2 - L, !bad(z2, d2)
	}
	var out []Match
	for _, s := range []float64{-1, 1} {
		prevZ, prevR, prevOK := 0.0, 0.0, false
		for i := 0; i <= twoLensScan; i++ {
			z := L * float64(i) / twoLensScan
			_, r, ok := place(z, s)
			if ok && prevOK && (r == 0 || (r > 0) != (prevR > 0)) {
				lo, hi, rlo := prevZ, z, prevR
				for range 200 {
					mid := (lo + hi) / 2
					_, rm, okm := place(mid, s)
					if !okm || mid == lo || mid == hi {
						break
					}
					if (rm > 0) == (rlo > 0) {
						lo, rlo = mid, rm
					} else {
						hi = mid
					}
				}
				z1 := (lo + hi) / 2
				z2, rr, okr := place(z1, s)
				if okr && z2 >= z1 && z2 <= L && math.Abs(rr) <= 1e-9*L {
					m, err := buildMatch(in, target, []PlacedLens{{"L1", f1, units.Length(z1)}, {"L2", f2, units.Length(z2)}},
						length, "closed form, two lenses (Kogelnik for L2, 1-D root search over z1)")
					if err != nil {
						return nil, err
					}
					out = append(out, m)
				}
			}
			prevZ, prevR, prevOK = z, r, ok
		}
	}
	if len(out) == 0 {
		return nil, &ParamError{Param: "length L", Value: length, Reason: "no placement of f1 = " + f1.String() + " and f2 = " + f2.String() + " matches the target", Err: ErrNoSolution}
	}
	slices.SortFunc(out, func(a, b Match) int { return cmp.Compare(a.Lenses[0].Z, b.Lenses[0].Z) })
	return out, nil
}

// buildMatch builds the system of a solution and evaluates it.
func buildMatch(in, target beam.Gaussian, lenses []PlacedLens, length units.Length, method string) (Match, error) {
	b := paraxial.NewBuilder()
	if in.Index != 1 {
		b.Medium(in.Index)
	}
	prev, from := units.Length(0), "to "
	for _, l := range lenses {
		b.Space(l.Z - prev).Label(from + l.Label).ThinLens(l.Focal).Label(l.Label)
		prev, from = l.Z, l.Label+" to "
	}
	b.Space(length - prev).Label("to target")
	sys, err := b.Build()
	if err != nil {
		return Match{}, &ParamError{Subject: "mode-matching system", Err: err}
	}
	outBeam, err := beam.At(sys, in, length)
	if err != nil {
		return Match{}, &ParamError{Subject: "mode-matching system", Err: err}
	}
	c, err := Overlap(outBeam, target, Misalignment{})
	if err != nil {
		return Match{}, err
	}
	return Match{System: sys, Lenses: slices.Clone(lenses), Length: length, Output: outBeam, Coupling: c, Method: method}, nil
}

// interval is a closed range of a parameter.
type interval struct{ lo, hi float64 }

func (iv interval) fixed() bool { return iv.lo == iv.hi }

// at maps the unconstrained x to the interval: lo + (hi − lo)(1 − cos x)/2.
func (iv interval) at(x float64) float64 { return iv.lo + (iv.hi-iv.lo)*(1-math.Cos(x))/2 }

// Solve finds focal lengths, lens positions and the target-plane position
// within the bounds of p that maximise the overlap of the propagated
// input with the target (the TEM₀₀ overlap of [Overlap], or its Gaussian
// Schell-model estimate for an input with M² > 1). The free parameters
// are mapped onto their bounds by p = lo + (hi − lo)(1 − cos x)/2, each
// lens position between the previous lens and the target plane, and
// 1 − η is minimised over x with gonum/optimize's Nelder–Mead method
// from a grid of starts (3 per free parameter up to four parameters, 81
// seeded random starts beyond), then once more from the best point. The
// result is a local optimum of the best start, not a proof of the global
// one; a bound that is active or an efficiency below 1 shows in the
// table. It returns a *ParamError for invalid beams, lenses or bounds.
func Solve(p Problem) (Match, error) {
	if err := checkPair(p.Input, p.Target); err != nil {
		return Match{}, err
	}
	if !(p.MinLength > 0 && p.MaxLength >= p.MinLength) || bad(float64(p.MinLength), float64(p.MaxLength)) {
		return Match{}, &ParamError{Param: "length bounds MinLength", Value: p.MinLength,
			Reason: "need 0 < MinLength ≤ MaxLength (= " + p.MaxLength.String() + "), both finite"}
	}
	if len(p.Lenses) == 0 || len(p.Lenses) > 8 {
		return Match{}, &ParamError{Param: "number of lenses", Value: len(p.Lenses), Reason: "must be 1 to 8"}
	}
	lengthIV := interval{float64(p.MinLength), float64(p.MaxLength)}
	type lensIV struct {
		label string
		f, z  interval
		zfree bool
	}
	lenses := make([]lensIV, len(p.Lenses))
	for i, l := range p.Lenses {
		label := l.Label
		if label == "" {
			label = "L" + strconv.Itoa(i+1)
		}
		name := "lens " + strconv.Quote(label)
		var f interval
		switch {
		case l.Focal != 0 && l.FocalMin == 0 && l.FocalMax == 0:
			if err := checkFocal(name, l.Focal); err != nil {
				return Match{}, err
			}
			f = interval{float64(l.Focal), float64(l.Focal)}
		case l.Focal == 0 && l.FocalMin < l.FocalMax && float64(l.FocalMin)*float64(l.FocalMax) > 0 && !bad(float64(l.FocalMin), float64(l.FocalMax)):
			f = interval{float64(l.FocalMin), float64(l.FocalMax)}
		default:
			return Match{}, &ParamError{Subject: name, Param: "focal length f", Value: l.Focal,
				Reason: "give a fixed nonzero Focal, or Focal = 0 and finite FocalMin < FocalMax of one sign (FocalMin = " + l.FocalMin.String() + ", FocalMax = " + l.FocalMax.String() + ")"}
		}
		z := interval{float64(l.ZMin), float64(l.ZMax)}
		zfree := l.ZMin == 0 && l.ZMax == 0
		if !zfree && (!(l.ZMin >= 0 && l.ZMax >= l.ZMin) || bad(z.lo, z.hi)) {
			return Match{}, &ParamError{Subject: name, Param: "position bound ZMin", Value: l.ZMin,
				Reason: "need 0 ≤ ZMin ≤ ZMax (= " + l.ZMax.String() + "), both finite"}
		}
		lenses[i] = lensIV{label, f, z, zfree}
	}
	// The free parameters, in order: L, then per lens f and z.
	type slot struct{ kind, lens int }
	var slots []slot
	if !lengthIV.fixed() {
		slots = append(slots, slot{0, -1})
	}
	for i, l := range lenses {
		if !l.f.fixed() {
			slots = append(slots, slot{1, i})
		}
		if l.zfree || !l.z.fixed() {
			slots = append(slots, slot{2, i})
		}
	}
	k := 2 * math.Pi * p.Input.Index / float64(p.Input.Wavelength)
	dst := axisOf(p.Target, k)
	scale := float64(p.MaxLength)
	// evaluate maps x to the placement and returns 1 − η plus a penalty
	// for an empty position range.
	evaluate := func(x []float64) (float64, []PlacedLens, float64) {
		xi := 0
		next := func() float64 { v := x[xi]; xi++; return v }
		L := lengthIV.lo
		if !lengthIV.fixed() {
			L = lengthIV.at(next())
		}
		placed := make([]PlacedLens, len(lenses))
		var penalty float64
		prev := 0.0
		for i, l := range lenses {
			f := l.f.lo
			if !l.f.fixed() {
				f = l.f.at(next())
			}
			iv := interval{prev, L}
			if !l.zfree {
				iv = interval{math.Max(prev, l.z.lo), math.Min(L, l.z.hi)}
			}
			if iv.hi < iv.lo {
				penalty += (iv.lo - iv.hi) / scale
				iv.hi = iv.lo
			}
			z := iv.lo
			if l.zfree || !l.z.fixed() {
				z = iv.at(next())
			}
			placed[i] = PlacedLens{l.label, units.Length(f), units.Length(z)}
			prev = z
		}
		q := p.Input.Q
		prev = 0
		for _, pl := range placed {
			q += complex(float64(pl.Z)-prev, 0)
			q = 1 / (1/q - complex(1/float64(pl.Focal), 0))
			prev = float64(pl.Z)
		}
		q += complex(L-prev, 0)
		out := p.Input
		out.Q = q
		src := axisOf(out, k)
		ax := axisCoupling(src, dst, k, 0, 0)
		loss := 1 - ax.Aligned*ax.Aligned
		if bad(loss) || imag(q) <= 0 {
			loss = 2
		}
		return loss + penalty, placed, L
	}
	n := len(slots)
	var starts [][]float64
	if n <= 4 {
		grid := []float64{0.15, 0.5, 0.85}
		total := 1
		for range n {
			total *= len(grid)
		}
		for c := range total {
			x := make([]float64, n)
			for j := range n {
				x[j] = math.Acos(1 - 2*grid[c%len(grid)])
				c /= len(grid)
			}
			starts = append(starts, x)
		}
	} else {
		rng := rand.New(rand.NewPCG(1, 1))
		for range 81 {
			x := make([]float64, n)
			for j := range x {
				x[j] = math.Acos(1 - 2*rng.Float64())
			}
			starts = append(starts, x)
		}
	}
	bestX := starts[0]
	bestF, _, _ := evaluate(bestX)
	if n > 0 {
		prob := optimize.Problem{Func: func(x []float64) float64 { v, _, _ := evaluate(x); return v }}
		settings := &optimize.Settings{FuncEvaluations: 4000, Converger: &optimize.FunctionConverge{Absolute: 1e-15, Iterations: 60}}
		run := func(x0 []float64) {
			res, err := optimize.Minimize(prob, x0, settings, &optimize.NelderMead{})
			if err != nil || res == nil {
				return
			}
			if res.F < bestF {
				bestF, bestX = res.F, slices.Clone(res.X)
			}
		}
		for _, x0 := range starts {
			run(x0)
		}
		run(slices.Clone(bestX))
	}
	_, placed, L := evaluate(bestX)
	method := "numerical: Nelder–Mead (gonum/optimize) over " + strconv.Itoa(n) + " free parameters from " + strconv.Itoa(len(starts)) + " starts"
	if n == 0 {
		method = "evaluated (no free parameters)"
	}
	return buildMatch(p.Input, p.Target, placed, units.Length(L), method)
}
