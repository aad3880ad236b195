package couple

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"

	"github.com/beamnote/beamnote/opticslib/internal/boxmin"
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
//
// MinEfficiency (a power fraction in [0, 1]; 0 means none) is the
// efficiency the solution must reach: [Solve] returns an error wrapping
// [ErrNoSolution] when the best placement inside the bounds couples less,
// or when MinEfficiency exceeds the model's bound (2/(M² + 1))² for an
// input with M² > 1.
type Problem struct {
	Input, Target        beam.Gaussian
	Lenses               []Lens
	MinLength, MaxLength units.Length
	MinEfficiency        float64
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
// and one wrapping [ErrNoSolution] if |f| < f0 (the message gives f and
// f0) or no solution lies on the path (the message gives where the two
// solutions put the lens and the target plane).
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
	var off []string // the solutions off the path, for the error
	for _, s := range []float64{-1, 1} {
		d1, d2, ok := kogelnik(float64(f), zr1, zr2, s)
		if !ok {
			return nil, &ParamError{Subject: "lens", Param: "focal length f", Value: f,
				Reason: "|f| is below f0 = √(zR1·zR2) = π w1 w2/λ = " + units.Length(math.Sqrt(zr1*zr2)).String() +
					" (embedded beams: input zR1 = " + units.Length(zr1).String() + ", target zR2 = " + units.Length(zr2).String() + ")",
				Err: ErrNoSolution}
		}
		z := zw1 + d1
		length := z + d2 - zw2
		if z < 0 || length < z {
			off = append(off, "lens at z = "+units.Length(z).String()+", target plane at "+units.Length(length).String())
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
		return nil, &ParamError{Subject: "lens", Param: "focal length f", Value: f,
			Reason: "both solutions put the lens before the input plane (z < 0) or the target plane before the lens (" + strings.Join(off, "; ") + ")",
			Err:    ErrNoSolution}
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
// placement exists; its message says why: |f2| below the f0 of the beam
// after L1 for every z1 (with the smallest f0), no placement with L2
// between L1 and the target plane, or the span of target-plane positions
// that the placements reach.
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
	// place returns z2 and the residual L(z1) − length on branch s, and
	// f0 = √(zR·zR2) of the beam after L1 (ok is false for |f2| < f0).
	place := func(z1, s float64) (z2, r, f0 float64, ok bool) {
		q := q0 + complex(z1, 0)
		q = 1 / (1/q - complex(1/float64(f1), 0))
		zw := z1 - real(q)
		f0 = math.Sqrt(imag(q) * zr2)
		d1, d2, ok := kogelnik(float64(f2), imag(q), zr2, s)
		if !ok {
			return 0, 0, f0, false
		}
		z2 = zw + d1
		return z2, z2 + d2 - zw2 - L, f0, !bad(z2, d2)
	}
	// For the error: the smallest f0 met, and the span of the target-plane
	// positions of the ordered placements (0 ≤ z1 ≤ z2 ≤ target plane).
	minF0, spanLo, spanHi := math.Inf(1), math.Inf(1), math.Inf(-1)
	feasible := false
	var near [3]float64 // z1, z2 and target plane of the ordered placement nearest L
	nearGap := math.Inf(1)
	var out []Match
	for _, s := range []float64{-1, 1} {
		prevZ, prevR, prevOK := 0.0, 0.0, false
		for i := 0; i <= twoLensScan; i++ {
			z := L * float64(i) / twoLensScan
			z2, r, f0, ok := place(z, s)
			minF0 = math.Min(minF0, f0)
			if ok {
				feasible = true
				if zt := r + L; z2 >= z && z2 <= zt {
					spanLo, spanHi = math.Min(spanLo, zt), math.Max(spanHi, zt)
					if math.Abs(r) < nearGap {
						nearGap, near = math.Abs(r), [3]float64{z, z2, zt}
					}
				}
			}
			if ok && prevOK && (r == 0 || (r > 0) != (prevR > 0)) {
				lo, hi, rlo := prevZ, z, prevR
				for range 200 {
					mid := (lo + hi) / 2
					_, rm, _, okm := place(mid, s)
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
				z2, rr, _, okr := place(z1, s)
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
		e := &ParamError{Param: "length L", Value: length, Err: ErrNoSolution}
		switch {
		case !feasible:
			e.Subject, e.Param, e.Value = `lens "L2"`, "focal length f2", f2
			e.Reason = "|f2| is below f0 = √(zR·zR2) of the beam after L1 (f1 = " + f1.String() + ") for every z1 from 0 to " +
				length.String() + " (smallest f0 = " + units.Length(minF0).String() + ")"
		case spanLo > spanHi:
			e.Reason = "every placement of f1 = " + f1.String() + " and f2 = " + f2.String() + " puts L2 before L1 or after the target plane"
		default:
			e.Reason = "the placements of f1 = " + f1.String() + " and f2 = " + f2.String() + " with 0 ≤ z1 ≤ z2 put the target plane between " +
				units.Length(spanLo).String() + " and " + units.Length(spanHi).String()
			if L < spanLo || L > spanHi {
				e.Reason += ", never at L"
			} else {
				e.Reason += ", but none at L (it lies across a jump between neighbouring z1)"
			}
			e.Reason += " (nearest: z1 = " + units.Length(near[0]).String() + ", z2 = " + units.Length(near[1]).String() +
				", target plane at " + units.Length(near[2]).String() + ")"
		}
		return nil, e
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

// at maps the unconstrained x to the interval: lo + (hi − lo)(1 − cos x)/2
// (boxmin.Range).
func (iv interval) at(x float64) float64 { return boxmin.Range{Lo: iv.lo, Hi: iv.hi}.At(x) }

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
// table. It returns a *ParamError for invalid beams, lenses or bounds
// (also a MinEfficiency outside [0, 1] or NaN). With p.MinEfficiency > 0
// it returns a *ParamError wrapping [ErrNoSolution] when the best
// efficiency found is below it, together with that best Match; the
// message gives the efficiency reached and the bounds active at the best
// point, for example
//
//	couple: minimum efficiency MinEfficiency = 0.95: the best efficiency inside the bounds is 0.928549;
//	active bounds: lens "launch lens" focal length at its lower bound FocalMin 8 mm;
//	lens "launch lens" position at its upper bound ZMax 60 mm: no mode-matching solution
//
// (printed on one line; see [ExampleSolve])
//
// and, before any search, one wrapping [ErrNoSolution] when MinEfficiency
// exceeds the bound (2/(M² + 1))² of an input with M² > 1 (see
// [Coupling.Bound]).
func Solve(p Problem) (Match, error) {
	if err := checkPair(p.Input, p.Target); err != nil {
		return Match{}, err
	}
	if !(p.MinLength > 0 && p.MaxLength >= p.MinLength) || bad(float64(p.MinLength), float64(p.MaxLength)) {
		return Match{}, &ParamError{Param: "length bounds MinLength", Value: p.MinLength,
			Reason: "need 0 < MinLength ≤ MaxLength (= " + p.MaxLength.String() + "), both finite"}
	}
	if !(p.MinEfficiency >= 0 && p.MinEfficiency <= 1) {
		return Match{}, &ParamError{Param: "minimum efficiency MinEfficiency", Value: p.MinEfficiency, Reason: "must lie between 0 and 1 (0 means none)"}
	}
	if m2 := p.Input.BeamQuality(); m2 > 1 {
		if b := math.Pow(2/(m2+1), 2); p.MinEfficiency > b {
			return Match{}, &ParamError{Param: "minimum efficiency MinEfficiency", Value: p.MinEfficiency,
				Reason: "exceeds the bound (2/(M² + 1))² = " + strconv.FormatFloat(b, 'g', 6, 64) + " for the input's M² = " + formatG(m2) +
					": no placement of lenses couples more into a TEM00 target (Gaussian Schell model)",
				Err: ErrNoSolution}
		}
	}
	if len(p.Lenses) == 0 || len(p.Lenses) > 8 {
		return Match{}, &ParamError{Param: "number of lenses", Value: len(p.Lenses), Reason: "must be 1 to 8"}
	}
	lengthIV := interval{float64(p.MinLength), float64(p.MaxLength)}
	type lensIV struct {
		label, name string // name is `lens "label"`, for messages
		f, z        interval
		zfree       bool
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
		lenses[i] = lensIV{label, name, f, z, zfree}
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
	// for an empty position range. If active is not nil, it appends the
	// bounds that the placement sits on (within atBound of the range).
	evaluate := func(x []float64, active *[]string) (float64, []PlacedLens, float64) {
		xi := 0
		// next returns the next free parameter in iv and, if active is
		// not nil, on which bound it sits: −1 lower, +1 upper, 0 none.
		next := func(iv interval) (float64, int) {
			v, side := iv.at(x[xi]), 0
			if frac := boxmin.Fraction(x[xi]); active != nil && frac <= atBound {
				side = -1
			} else if active != nil && frac >= 1-atBound {
				side = 1
			}
			xi++
			return v, side
		}
		note := func(s string) { *active = append(*active, s) }
		L := lengthIV.lo
		if !lengthIV.fixed() {
			var side int
			L, side = next(lengthIV)
			switch side {
			case -1:
				note("total length at MinLength " + p.MinLength.String())
			case 1:
				note("total length at MaxLength " + p.MaxLength.String())
			}
		}
		placed := make([]PlacedLens, len(lenses))
		var penalty float64
		prev := 0.0
		for i, l := range lenses {
			f := l.f.lo
			if !l.f.fixed() {
				var side int
				f, side = next(l.f)
				switch side {
				case -1:
					note(l.name + " focal length at its lower bound FocalMin " + units.Length(l.f.lo).String())
				case 1:
					note(l.name + " focal length at its upper bound FocalMax " + units.Length(l.f.hi).String())
				}
			}
			iv := interval{prev, L}
			if !l.zfree {
				iv = interval{math.Max(prev, l.z.lo), math.Min(L, l.z.hi)}
			}
			if iv.hi < iv.lo {
				penalty += (iv.lo - iv.hi) / scale
				if active != nil {
					note(l.name + " position range " + units.Length(l.z.lo).String() + " to " + units.Length(l.z.hi).String() +
						" lies outside the room between the previous lens and the target plane")
				}
				iv.hi = iv.lo
			}
			z := iv.lo
			if l.zfree || !l.z.fixed() {
				var side int
				z, side = next(iv)
				switch {
				case side == -1 && !l.zfree && l.z.lo >= prev:
					note(l.name + " position at its lower bound ZMin " + units.Length(l.z.lo).String())
				case side == -1 && i == 0:
					note(l.name + " position at the input plane")
				case side == -1:
					note(l.name + " position against lens " + strconv.Quote(placed[i-1].Label))
				case side == 1 && !l.zfree && l.z.hi <= L:
					note(l.name + " position at its upper bound ZMax " + units.Length(l.z.hi).String())
				case side == 1:
					note(l.name + " position at the target plane " + units.Length(L).String())
				}
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
				x[j] = boxmin.U(grid[c%len(grid)])
				c /= len(grid)
			}
			starts = append(starts, x)
		}
	} else {
		rng := rand.New(rand.NewPCG(1, 1))
		for range 81 {
			x := make([]float64, n)
			for j := range x {
				x[j] = boxmin.U(rng.Float64())
			}
			starts = append(starts, x)
		}
	}
	bestX := starts[0]
	if n > 0 {
		cost := func(x []float64) float64 { v, _, _ := evaluate(x, nil); return v }
		if best, ok := boxmin.Search(cost, starts, boxmin.Settings{
			Evaluations: 4000,
			Converger:   func() optimize.Converger { return &optimize.FunctionConverge{Absolute: 1e-15, Iterations: 60} },
			Polish:      true,
		}); ok {
			bestX = best.U
		}
	}
	var active []string
	_, placed, L := evaluate(bestX, &active)
	method := "numerical: Nelder–Mead (gonum/optimize) over " + strconv.Itoa(n) + " free parameters from " + strconv.Itoa(len(starts)) + " starts"
	if n == 0 {
		method = "evaluated (no free parameters)"
	}
	m, err := buildMatch(p.Input, p.Target, placed, units.Length(L), method)
	if err != nil || m.Coupling.Efficiency >= p.MinEfficiency {
		return m, err
	}
	where := "no bound is active there (a local optimum inside the bounds, or all parameters fixed)"
	if len(active) > 0 {
		where = "active bounds: " + strings.Join(active, "; ")
	}
	return m, &ParamError{Param: "minimum efficiency MinEfficiency", Value: p.MinEfficiency,
		Reason: "the best efficiency inside the bounds is " + strconv.FormatFloat(m.Coupling.Efficiency, 'g', 6, 64) + "; " + where,
		Err:    ErrNoSolution}
}

// atBound is the fraction of a parameter's range within which [Solve]
// reports the parameter as sitting on a bound. The map lo + (hi −
// lo)(1 − cos x)/2 has zero slope at the bounds, so an optimum that the
// bound cuts off converges to within (Δx)²/4 of it: Δx ≈ 1e-3 in x gives
// 2.5e-7.
const atBound = 1e-5
