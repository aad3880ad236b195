package design_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// Closed forms of S. A. Self, "Focusing of spherical Gaussian beams",
// Appl. Opt. 22, 658–661 (1983). A waist of Rayleigh range zR at distance
// s before a thin lens f is imaged to a waist at distance s″ after it,
// from Self's lens equation
//
//	1/(s + zR²/(s − f)) + 1/s″ = 1/f   ⇔   s″ = f + (s − f) f² / ((s − f)² + zR²),
//
// with the waist magnified by m = 1/√((1 − s/f)² + (zR/f)²) and the
// Rayleigh range by m².

// selfWaist returns s″ and m of Self's lens equation.
func selfWaist(s, f, zR float64) (s2, m float64) {
	u := s - f
	return f + u*f*f/(u*u+zR*zR), 1 / math.Sqrt((1-s/f)*(1-s/f)+(zR/f)*(zR/f))
}

// selfCollimating returns the collimating spacing of two thin lenses f1,
// f2 for an input waist of Rayleigh range zR at distance s1 before L1, and
// the output waist's magnification. Collimated means the output waist is
// the largest the spacing can give, so the divergence the smallest: by
// Self's m, the intermediate waist must lie in L2's front focal plane
// (s2 = f2, m2 = f2/zR′), where s″ = f2 too: the output waist sits in L2's
// back focal plane. The spacing is
//
//	d = s1″ + f2 = f1 + f2 + (s1 − f1) f1² / ((s1 − f1)² + zR²),
//
// which equals f1 + f2 only for s1 = f1 (the input waist in L1's front
// focal plane), and tends to it for zR ≫ f1.
func selfCollimating(s1, f1, f2, zR float64) (d, mag float64) {
	s1pp, m1 := selfWaist(s1, f1, zR)
	zR1 := m1 * m1 * zR
	return s1pp + f2, m1 * f2 / zR1
}

// telescope returns two thin lenses f1, f2 with the input waist s1 before
// L1, the spacing "gap" between them and 300 mm after L2.
func telescope(t testing.TB, s1, f1, gap, f2 units.Length) paraxial.System {
	t.Helper()
	sys, err := paraxial.NewBuilder().
		Space(s1).Label("to L1").ThinLens(f1).Label("L1").
		Space(gap).Label("gap").ThinLens(f2).Label("L2").
		Space(300 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	return sys
}

func hene(t testing.TB, w0 units.Length) beam.Gaussian {
	t.Helper()
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w0, Wavelength: 633 * nm})
	if err != nil {
		t.Fatal(err)
	}
	return in
}

// collimation is the one-variable problem: the gap that puts the output
// waist in L2's back focal plane (1 µm tolerance).
func collimation(t testing.TB, in beam.Gaussian, s1, f1, f2, lo, hi units.Length) design.Problem {
	return design.Problem{
		System:    telescope(t, s1, f1, (lo+hi)/2, f2),
		Variables: []design.Variable{design.Spacing("gap", lo, hi)},
		Goals:     []design.Goal{design.Near("collimation", design.WaistAfter(in, "L2"), f2, 1*um)},
	}
}

// rootTol is the tolerance on a spacing found by SolveOne: Brent's XTol
// is 1e-12 of the bound (4e-13 m here), and the q-parameter propagation
// rounds at the 1e-16 level; a spacing of 0.2 m is good to a few 1e-13 m
// by both, so 1e-11 m (10 pm) leaves a margin of 20 and is still far
// below anything a bench resolves.
const rootTol = 1e-11

// TestSolveOneAfocal: with the input waist in L1's front focal plane the
// collimating spacing is f1 + f2 exactly and the waist grows by f2/f1 (an
// afocal telescope images the front focal plane of L1 onto the back focal
// plane of L2 with magnification −f2/f1; S. A. Self 1983 with s = f at
// each lens). The beam's Rayleigh range (49.6 mm) is close to f1 = 50 mm,
// so the equality is not the zR ≫ f1 limit.
func TestSolveOneAfocal(t *testing.T) {
	in := hene(t, 0.1*mm)
	r, err := design.SolveOne(collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm), nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Values) != 1 {
		t.Fatalf("SolveOne found %d roots %v, want 1", len(r.Values), r.Values)
	}
	if !scalar.EqualWithinAbs(float64(r.Values[0]), 0.2, rootTol) {
		t.Errorf("collimating gap = %.15g m, want f1 + f2 = 0.2 m", float64(r.Values[0]))
	}
	w, err := design.WaistRadius(in)(r.Systems[0])
	if err != nil {
		t.Fatal(err)
	}
	// Waist ratio f2/f1 = 3: relative 1e-9 from the root's 1e-11 m at a
	// slope dw/dgap ≈ 0 (w0″ is stationary at the collimating gap).
	if !scalar.EqualWithinRel(float64(w), 0.3e-3, 1e-9) {
		t.Errorf("output waist = %v, want 3 × 0.1 mm = 0.3 mm", w)
	}
	if !r.Evaluations[0].Met() {
		t.Errorf("the goal is not met at the root:\n%v", r.Evaluations[0])
	}
}

// TestSolveOneSelfCollimating: an input waist away from L1's front focal
// plane moves the collimating spacing away from f1 + f2 by
// (s1 − f1) f1²/((s1 − f1)² + zR²) (Self 1983, see selfCollimating): by
// 20.06 mm for zR ≈ f1, and for zR ≫ f1 by about its leading term
// (s1 − f1) f1²/zR², 10 µm for zR ≈ 100 f1, where the spacing approaches
// f1 + f2. The output waist is m1·f2/zR′ times the input's.
func TestSolveOneSelfCollimating(t *testing.T) {
	for _, c := range []struct {
		name       string
		w0         units.Length
		s1, f1, f2 units.Length
		// check tests d − (f1 + f2) against the closed forms.
		check func(off, s1, f1, zR float64) bool
	}{
		{"zR ≈ f1, waist 100 mm behind the focal plane", 0.1 * mm, 150 * mm, 50 * mm, 150 * mm,
			func(off, _, _, _ float64) bool { return math.Abs(off-0.02006) < 1e-5 }}, // 20.06 mm, by hand from Self's form
		{"zR ≈ 100 f1", 1 * mm, 150 * mm, 50 * mm, 150 * mm,
			// The leading term, within the relative size (s1 − f1)²/zR²
			// = 4e-4 of the next one.
			func(off, s1, f1, zR float64) bool {
				lead := (s1 - f1) * f1 * f1 / (zR * zR)
				return math.Abs(off-lead) <= 1e-3*lead && off < 1e-4
			}},
		{"diverging first lens", 0.3 * mm, 80 * mm, -40 * mm, 120 * mm, func(float64, float64, float64, float64) bool { return true }},
	} {
		in := hene(t, c.w0)
		zR := float64(in.RayleighRange())
		want, mag := selfCollimating(float64(c.s1), float64(c.f1), float64(c.f2), zR)
		r, err := design.SolveOne(collimation(t, in, c.s1, c.f1, c.f2, 10*mm, 500*mm), nil)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(r.Values) != 1 || !scalar.EqualWithinAbs(float64(r.Values[0]), want, rootTol) {
			t.Errorf("%s: roots %v, want one at Self's %.15g m", c.name, r.Values, want)
			continue
		}
		if off := float64(r.Values[0] - c.f1 - c.f2); !c.check(off, float64(c.s1), float64(c.f1), zR) {
			t.Errorf("%s: d − (f1 + f2) = %.6g m", c.name, off)
		}
		w, _ := design.WaistRadius(in)(r.Systems[0])
		if !scalar.EqualWithinRel(float64(w), mag*float64(c.w0), 1e-9) {
			t.Errorf("%s: output waist %v, want Self's %g m", c.name, w, mag*float64(c.w0))
		}
	}
}

// TestSolveOneTwoRoots: the spacing that puts the output waist 300 mm
// behind L2 (on the far wall) has two roots, on either side of the
// spacing that puts it farthest out. With the intermediate waist at
// L1's back focal plane (Rayleigh range zR′ = f1²/zR), Self's lens
// equation at L2 with s2″ = D and u = s2 − f2 is the quadratic
//
//	(D − f2) u² − f2² u + (D − f2) zR′² = 0,
//
// whose two roots give the two spacings d = f1 + f2 + u.
func TestSolveOneTwoRoots(t *testing.T) {
	in := hene(t, 0.1*mm)
	zR := float64(in.RayleighRange())
	f1, f2, D := 0.05, 0.15, 0.3
	zR1 := f1 * f1 / zR
	a, b, c := D-f2, -f2*f2, (D-f2)*zR1*zR1
	disc := math.Sqrt(b*b - 4*a*c)
	want := []float64{f1 + f2 + (-b-disc)/(2*a), f1 + f2 + (-b+disc)/(2*a)}
	p := collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm)
	p.Goals = []design.Goal{design.Near("waist on the wall", design.WaistAfter(in, "L2"), 300*mm, 1*um)}
	r, err := design.SolveOne(p, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Values) != 2 {
		t.Fatalf("SolveOne found %d roots %v, want 2 (%.6g, %.6g m)", len(r.Values), r.Values, want[0], want[1])
	}
	for i := range want {
		// The slope of s2″ against the gap is 2.4 and 0.6 at the two
		// roots: the 1e-11 m of rootTol holds for both.
		if !scalar.EqualWithinAbs(float64(r.Values[i]), want[i], rootTol) {
			t.Errorf("root %d = %.15g m, want %.15g m", i+1, float64(r.Values[i]), want[i])
		}
	}
	tb := r.Table()
	if len(tb.Rows) != 2 || tb.Rows[0][1] != "219.4338" || tb.Rows[1][1] != "330.5662" || tb.Rows[0][3] != "yes" {
		t.Errorf("table = %v", tb)
	}
}

// TestSolveOneSelfProperty: for seeded random telescopes (f1 of either
// sign, waist anywhere from 0 to 3 f1 before L1, zR from f1/10 to 10 f1),
// SolveOne's collimating spacing is Self's closed form whenever that lies
// inside the bounds, and its only root.
func TestSolveOneSelfProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 1))
	checked := 0
	for i := range 40 {
		f1 := units.Length(20+80*rng.Float64()) * mm
		if rng.IntN(3) == 0 {
			f1 = -f1
		}
		f2 := units.Length(50+150*rng.Float64()) * mm
		s1 := units.Length(3*rng.Float64()) * abs(f1)
		zR := math.Abs(float64(f1)) * math.Pow(10, 2*rng.Float64()-1)
		w0 := units.Length(math.Sqrt(zR * 633e-9 / math.Pi))
		in := hene(t, w0)
		want, _ := selfCollimating(float64(s1), float64(f1), float64(f2), float64(in.RayleighRange()))
		if want < 0.011 || want > 0.999 {
			continue
		}
		checked++
		r, err := design.SolveOne(collimation(t, in, s1, f1, f2, 10*mm, 1000*mm), nil)
		if err != nil {
			t.Errorf("case %d (f1 %v, f2 %v, s1 %v, w0 %v): %v", i, f1, f2, s1, w0, err)
			continue
		}
		// 1e-10 m: the root tolerance of 1e-12 of 1 m, with margin for
		// the flatter miss of the long-zR cases.
		if len(r.Values) != 1 || !scalar.EqualWithinAbs(float64(r.Values[0]), want, 1e-10) {
			t.Errorf("case %d (f1 %v, f2 %v, s1 %v, w0 %v): roots %v, want one at %.12g m", i, f1, f2, s1, w0, r.Values, want)
		}
	}
	if checked < 20 {
		t.Errorf("only %d of 40 random cases had a spacing within the bounds", checked)
	}
}

func abs(l units.Length) units.Length { return units.Length(math.Abs(float64(l))) }

// TestSolveOneErrors: no root within the bounds names the goal, the
// variable and its bounds and gives the values at both bounds; a pole is
// not a root; the number of variables and empty bounds are checked.
func TestSolveOneErrors(t *testing.T) {
	in := hene(t, 0.1*mm)
	// The collimating gap is 200 mm; the bounds stop at 150 mm.
	_, err := design.SolveOne(collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 150*mm), nil)
	if !errors.Is(err, design.ErrInfeasible) {
		t.Fatalf("bounds short of the root: error %v, want ErrInfeasible", err)
	}
	for _, w := range []string{`design: goal "collimation"`, `no root for spacing "gap" within its bounds [100 mm, 150 mm]`, "at Min", "at Max", "over the scan", "wanted 150 ± 0.001 mm", "widen the bounds"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error %q lacks %q", err, w)
		}
	}
	// A thin lens f = 100 mm images an object at distance d to
	// d + d f/(d − f) from it (thin-lens equation): −50 mm at d = 50 mm,
	// 450 mm at d = 150 mm, never 200 mm (d² − 200 d + 20000 has no real
	// root), so the sign change of the miss is the pole at d = f.
	sys, err := paraxial.NewBuilder().Space(120 * mm).Label("to L").ThinLens(100 * mm).Label("L").Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	p := design.Problem{System: sys, Variables: []design.Variable{design.Spacing("to L", 50*mm, 151*mm)},
		Goals: []design.Goal{design.Near("image", design.ImageZ(0), 200*mm, 1*mm)}}
	_, err = design.SolveOne(p, nil)
	if !errors.Is(err, design.ErrInfeasible) || !strings.Contains(err.Error(), "pole, not a root") || !strings.Contains(err.Error(), `spacing "to L" = 100 mm`) {
		t.Errorf("image through infinity: error %v, want ErrInfeasible naming the pole at 100 mm", err)
	}
	p.Variables = append(p.Variables, design.FocalLength("L", 50*mm, 150*mm))
	if _, err := design.SolveOne(p, nil); err == nil || !strings.Contains(err.Error(), "number of variables = 2") {
		t.Errorf("two variables: error %v", err)
	}
	p.Variables = []design.Variable{design.Spacing("to L", 50*mm, 50*mm)}
	if _, err := design.SolveOne(p, nil); !errors.Is(err, design.ErrBounds) || !strings.Contains(err.Error(), "nothing to solve") {
		t.Errorf("one-value bounds: error %v", err)
	}
	if _, err := design.SolveOne(collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm), &design.ScanSettings{Intervals: -1}); err == nil || !strings.Contains(err.Error(), "Intervals = -1") {
		t.Errorf("negative intervals: error %v", err)
	}
}

// FuzzSolveOneBounds: any bounds give roots inside them or an error,
// never a panic, a NaN or a root outside.
func FuzzSolveOneBounds(f *testing.F) {
	f.Add(0.1, 0.4)
	f.Add(0.15, 0.15)
	f.Add(0.3, 0.1)
	f.Add(-1.0, 0.2)
	f.Add(math.NaN(), 0.2)
	f.Add(0.0, 1e9)
	in := hene(f, 0.1*mm)
	f.Fuzz(func(t *testing.T, lo, hi float64) {
		p := collimation(t, in, 50*mm, 50*mm, 150*mm, 100*mm, 400*mm)
		p.Variables[0].Min, p.Variables[0].Max = units.Length(lo), units.Length(hi)
		r, err := design.SolveOne(p, &design.ScanSettings{Intervals: 16})
		if err != nil {
			return
		}
		for _, x := range r.Values {
			if !(float64(x) >= lo && float64(x) <= hi) {
				t.Errorf("bounds [%g, %g]: root %g outside", lo, hi, float64(x))
			}
		}
	})
}
