package budget_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/budget"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

// Polarization states of the tests: x is p at tilted surfaces, y is s.
var (
	xPol = polar.Jones{X: 1}
	yPol = polar.Jones{Y: 1}
)

func mustBeam(t *testing.T, w0 units.Length) beam.Gaussian {
	t.Helper()
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w0, Wavelength: 633 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func mustSystem(t *testing.T, b *paraxial.Builder) paraxial.System {
	t.Helper()
	s, err := b.Build()
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestUncoatedWindow: an uncoated window of n = 1.5 at normal incidence
// transmits (1 − R)² with R = ((n − 1)/(n + 1))² = 0.04 per surface, 0.9216
// for two surfaces without multiple reflections (R39 of the reference
// checks; Fresnel equations, Born & Wolf, Principles of Optics, §1.5.2
// [from memory]). At normal incidence Ts = Tp, so the value is the same
// for every polarization and for unpolarized light. Tolerance: 1e-12
// relative; the Fresnel coefficients are a few float64 operations
// (rounding ~1e-16 each).
func TestUncoatedWindow(t *testing.T) {
	sys := mustSystem(t, paraxial.NewBuilder().Space(20*mm).Plate(5*mm, 1.5, 0).Label("window").Space(20*mm))
	g := mustBeam(t, 0.5*mm)
	for _, test := range []struct {
		name string
		pol  polar.Jones
	}{
		{"x polarized", xPol},
		{"y polarized", yPol},
		{"circular", polar.Jones{X: complex(math.Sqrt(0.5), 0), Y: complex(0, math.Sqrt(0.5))}},
		{"unpolarized", polar.Jones{}},
	} {
		b, err := budget.NewBuilder(sys, budget.Input{Power: 10e-3, Beam: g, Polarization: test.pol}).Build()
		if err != nil {
			t.Errorf("%s: Build() error %v", test.name, err)
			continue
		}
		if got, want := b.Fraction(), 0.9216; !scalar.EqualWithinRel(got, want, 1e-12) {
			t.Errorf("%s: Fraction() = %.15g, want %v", test.name, got, want)
		}
		if got, want := b.Output(), 0.9216*10e-3; !scalar.EqualWithinRel(got, want, 1e-12) {
			t.Errorf("%s: Output() = %.15g W, want %v W", test.name, got, want)
		}
		n := 0
		for _, r := range b.Rows {
			for _, a := range r.Actions {
				if a.Cause != budget.Fresnel {
					continue
				}
				n++
				if !scalar.EqualWithinRel(a.Transmission, 0.96, 1e-12) {
					t.Errorf("%s: %s Fresnel T = %.15g, want 0.96 (1 − R, R = 0.04)", test.name, r.Name, a.Transmission)
				}
			}
		}
		if n != 2 {
			t.Errorf("%s: %d Fresnel surfaces, want 2", test.name, n)
		}
	}
}

// TestBrewsterPlate: a plate at Brewster's angle θB = atan(n) passes p
// light fully at both faces (the inner angle is Brewster's angle for
// n → 1 as well; R39: Rp = 0 to 1e-15 at atan(1.5) = 56.30993°). s light
// loses Rs = ((n² − 1)/(n² + 1))² per face, the closed form of
// r_s = −sin(θi − θt)/sin(θi + θt) with θi + θt = 90° (Born & Wolf,
// Principles of Optics, §1.5.2 [from memory]): for n = 1.5, Rs = 0.147929 and the plate
// passes (1 − Rs)². Unpolarized light is the incoherent sum of half s and
// half p (Stokes; Born & Wolf §10.8.3 [from memory]): (1 + (1 − Rs)²)/2,
// not the square of the s/p average. Tolerance 1e-12 relative (rounding
// of the trigonometric functions; Rp itself is ~1e-32).
func TestBrewsterPlate(t *testing.T) {
	const n = 1.5
	thetaB, err := polar.Brewster(1, n)
	if err != nil {
		t.Fatal(err)
	}
	if got := thetaB.Degrees(); !scalar.EqualWithinAbs(got, 56.30993, 1e-5) {
		t.Errorf("Brewster(1, 1.5) = %.6f°, want 56.30993° (R39)", got)
	}
	sys := mustSystem(t, paraxial.NewBuilder().Space(10*mm).Plate(3*mm, n, thetaB).Label("plate").Space(10*mm))
	g := mustBeam(t, 0.5*mm)
	rs := math.Pow((n*n-1)/(n*n+1), 2)
	ts2 := (1 - rs) * (1 - rs)
	for _, test := range []struct {
		name string
		pol  polar.Jones
		want float64
	}{
		{"p (x)", xPol, 1},
		{"s (y)", yPol, ts2},
		{"unpolarized", polar.Jones{}, (1 + ts2) / 2},
	} {
		b, err := budget.NewBuilder(sys, budget.Input{Power: 1, Beam: g, Polarization: test.pol}).Build()
		if err != nil {
			t.Errorf("%s: Build() error %v", test.name, err)
			continue
		}
		if got := b.Fraction(); !scalar.EqualWithinRel(got, test.want, 1e-12) {
			t.Errorf("%s: Fraction() = %.15g, want %.15g", test.name, got, test.want)
		}
	}
}

// polarizerPath is a path with three labelled zero-length parts (user
// identity matrices) for inserted Jones matrices.
func polarizerPath(t *testing.T) paraxial.System {
	id := paraxial.Identity()
	return mustSystem(t, paraxial.NewBuilder().Space(10*mm).Matrix(id, id).Label("P1").
		Space(10*mm).Matrix(id, id).Label("HWP").Space(10*mm).Matrix(id, id).Label("P2").Space(10*mm))
}

// TestPolarizers: crossed ideal polarizers block; a half-wave plate at
// 22.5° between them turns the light by 45° and the second polarizer
// passes cos²45° = 1/2 (Malus's law, R39; Azzam & Bashara, Ellipsometry
// and Polarized Light, 1977 [from memory]). Unpolarized light loses half
// at the first polarizer (an ideal polarizer passes the S0/2 of its
// axis), so 1/4 in all. Tolerances: "blocks" is below 1e-30 of the input
// (cos 90° is 6.1e-17 in float64, so the leak is ~4e-33); the halves are
// exact to 1e-12 relative.
func TestPolarizers(t *testing.T) {
	sys := polarizerPath(t)
	g := mustBeam(t, 0.5*mm)
	p0, err := polar.Polarizer(0)
	if err != nil {
		t.Fatal(err)
	}
	p90, err := polar.Polarizer(90 * units.Degree)
	if err != nil {
		t.Fatal(err)
	}
	hwp, err := polar.HalfWave(22.5 * units.Degree)
	if err != nil {
		t.Fatal(err)
	}
	for _, test := range []struct {
		name      string
		pol       polar.Jones
		withPlate bool
		want      float64
		abs       bool
	}{
		{"crossed", xPol, false, 0, true},
		{"crossed, unpolarized", polar.Jones{}, false, 0, true},
		{"half-wave at 22.5°", xPol, true, 0.5, false},
		{"half-wave at 22.5°, 45° input", polar.Jones{X: 1, Y: 1}, true, 0.25, false}, // cos²45° at P1, then 1/2
		{"half-wave at 22.5°, unpolarized", polar.Jones{}, true, 0.25, false},
	} {
		bl := budget.NewBuilder(sys, budget.Input{Power: 5e-3, Beam: g, Polarization: test.pol}).
			Insert("P1", "polarizer at 0°", p0)
		if test.withPlate {
			bl.Insert("HWP", "half-wave plate at 22.5°", hwp)
		}
		b, err := bl.Insert("P2", "polarizer at 90°", p90).Build()
		if err != nil {
			t.Errorf("%s: Build() error %v", test.name, err)
			continue
		}
		got := b.Fraction()
		if test.abs {
			if got > 1e-30 {
				t.Errorf("%s: Fraction() = %g, want < 1e-30", test.name, got)
			}
			continue
		}
		if !scalar.EqualWithinRel(got, test.want, 1e-12) {
			t.Errorf("%s: Fraction() = %.15g, want %v", test.name, got, test.want)
		}
	}
}

// TestClipping: the clipping action at an iris equals beam.Clipping's
// transmission for the same beam and opening (the same computation:
// relative 1e-15), and the closed form 1 − exp(−2a²/w²) of a centred round
// beam (Siegman, Lasers, §17.1 [from memory]) with w from beam.At at the
// iris (1e-12 relative: exp and the ABCD law, a few roundings).
func TestClipping(t *testing.T) {
	sys := mustSystem(t, paraxial.NewBuilder().Space(300*mm).Diaphragm(paraxial.ClearDiameter(1.2*mm)).Label("iris").Space(50*mm))
	g := mustBeam(t, 0.4*mm)
	b, err := budget.NewBuilder(sys, budget.Input{Power: 1e-3, Beam: g, Polarization: xPol}).Build()
	if err != nil {
		t.Fatal(err)
	}
	clips, err := beam.Clipping(sys, g, 0)
	if err != nil || len(clips) != 1 {
		t.Fatalf("beam.Clipping = %v, %v; want one clip", clips, err)
	}
	at, err := beam.At(sys, g, 300*mm)
	if err != nil {
		t.Fatal(err)
	}
	a, w := 0.6e-3, at.Radius().Meters()
	closed := -math.Expm1(-2 * a * a / (w * w))
	var found bool
	for _, r := range b.Rows {
		for _, act := range r.Actions {
			if act.Cause != budget.Clipping {
				continue
			}
			found = true
			if !scalar.EqualWithinRel(act.Transmission, clips[0].Transmission, 1e-15) {
				t.Errorf("clip T = %.17g, beam.Clipping %.17g", act.Transmission, clips[0].Transmission)
			}
			if !scalar.EqualWithinRel(act.Transmission, closed, 1e-12) {
				t.Errorf("clip T = %.15g, 1 − exp(−2a²/w²) = %.15g", act.Transmission, closed)
			}
		}
	}
	if !found {
		t.Errorf("no clipping action in %v", b)
	}
	if !scalar.EqualWithinRel(b.Fraction(), closed, 1e-12) {
		t.Errorf("Fraction() = %.15g, want %.15g", b.Fraction(), closed)
	}
}

// labPath is a path with every kind of statement: an uncoated window,
// an AR-coated lens, a fold mirror, a tilted plate, an iris, a
// splitter, inserted plates and a coupling.
func labPath(t *testing.T) (paraxial.System, *budget.Builder) {
	sys := mustSystem(t, paraxial.NewBuilder().
		Space(30*mm).Plate(3*mm, 1.5168, 0).Label("window").
		Space(40*mm).ThinLens(200*mm).Label("L1").
		Space(60*mm).FlatMirror(45*units.Degree).Label("M1").
		Space(40*mm).Plate(1*mm, 1.46, 30*units.Degree).Label("pickoff").
		Space(30*mm).Diaphragm(paraxial.ClearDiameter(1.5*mm)).Label("iris").
		Space(20*mm).FlatMirror(22.5*units.Degree).Label("BS").
		Space(20*mm).ThickLens(20*mm, paraxial.Flat, 3*mm, 1.5168).Label("L2").
		Space(20*mm))
	g := mustBeam(t, 0.6*mm)
	qwp, err := polar.QuarterWave(30 * units.Degree)
	if err != nil {
		t.Fatal(err)
	}
	pol, err := polar.PartialPolarizer(10*units.Degree, 1000)
	if err != nil {
		t.Fatal(err)
	}
	return sys, budget.NewBuilder(sys, budget.Input{Power: 0.02, Beam: g, Polarization: polar.Jones{X: 0.8, Y: 0.6i}}).
		AR("L1", 0.005).Mirror("M1", 0.98).Split("BS", 0.3).AR("L2", 0.0025).
		Insert("pickoff", "quarter-wave plate at 30°", qwp).Insert("iris", "polarizer at 10°, 1000:1", pol).
		Coupling("L2", 0.7)
}

// TestBookkeeping: the output fraction is the product of the rows'
// transmissions, and each row's transmission the product of its actions'
// (energy bookkeeping: the power after each step is the power before it
// times its transmission, an identity). Tolerance 1e-12 relative: about
// twenty factors, each rounded once.
func TestBookkeeping(t *testing.T) {
	_, bl := labPath(t)
	b, err := bl.Build()
	if err != nil {
		t.Fatal(err)
	}
	prod := 1.0
	for _, r := range b.Rows {
		prod *= r.Transmission
		acts := 1.0
		for _, a := range r.Actions {
			acts *= a.Transmission
		}
		if !scalar.EqualWithinRel(acts, r.Transmission, 1e-12) {
			t.Errorf("%s: product of actions %.15g, row transmission %.15g", r.Name, acts, r.Transmission)
		}
		if !scalar.EqualWithinRel(prod, r.Fraction, 1e-12) {
			t.Errorf("%s: product of transmissions %.15g, Fraction %.15g", r.Name, prod, r.Fraction)
		}
		if p := r.Stokes.S0; !scalar.EqualWithinRel(p, r.Power, 1e-12) {
			t.Errorf("%s: Stokes S0 = %.15g W, Power %.15g W", r.Name, p, r.Power)
		}
	}
	if !scalar.EqualWithinRel(prod, b.Fraction(), 1e-12) || !scalar.EqualWithinRel(b.Output(), b.Fraction()*0.02, 1e-12) {
		t.Errorf("product %.15g, Fraction() %.15g, Output() %.15g W", prod, b.Fraction(), b.Output())
	}
	// The stated factors appear as stated.
	want := map[budget.Cause]float64{budget.Reflectance: 0.98, budget.Split: 0.3, budget.Coupling: 0.7}
	for _, r := range b.Rows {
		for _, a := range r.Actions {
			if w, ok := want[a.Cause]; ok && a.Transmission != w {
				t.Errorf("%s: %v T = %v, want %v", r.Name, a.Cause, a.Transmission, w)
			}
			if a.Cause == budget.AntiReflection && r.Label == "L1" && !scalar.EqualWithinRel(a.Transmission, 0.995*0.995, 1e-15) {
				t.Errorf("L1: AR on a thin lens T = %v, want (1 − 0.005)²", a.Transmission)
			}
		}
	}
}

// TestIrradiance: each row's irradiance is beam.PeakIrradiance of its
// power at the beam radii beam.AtXY gives there (the same formula:
// 1e-15 relative), and for P = 1 mW at w = 1 mm it is 636.6198 W/m²
// (R09, Kogelnik & Li 1966; 1e-6 relative, the digits quoted).
func TestIrradiance(t *testing.T) {
	sys, bl := labPath(t)
	b, err := bl.Build()
	if err != nil {
		t.Fatal(err)
	}
	g := mustBeam(t, 0.6*mm)
	for _, r := range b.Rows {
		a, err := beam.AtXY(sys, g, r.Z)
		if err != nil {
			t.Fatal(err)
		}
		want := beam.PeakIrradiance(r.Power, a.X.Radius(), a.Y.Radius())
		if !scalar.EqualWithinRel(r.Irradiance, want, 1e-15) {
			t.Errorf("%s: Irradiance = %.17g W/m², want %.17g", r.Name, r.Irradiance, want)
		}
	}
	one := mustSystem(t, paraxial.NewBuilder().ThinLens(1*units.Meter).Label("L").Space(10*mm))
	b, err = budget.NewBuilder(one, budget.Input{Power: 1e-3, Beam: mustBeam(t, 1*mm), Polarization: xPol}).Build()
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinRel(b.Irradiance, 636.6198, 1e-6) {
		t.Errorf("input irradiance = %.7g W/m², want 636.6198 (R09)", b.Irradiance)
	}
	if len(b.Rows) != 1 || !scalar.EqualWithinRel(b.Rows[0].Irradiance, 636.6198, 1e-6) {
		t.Errorf("rows %v, want one at 636.6198 W/m²", b.Rows)
	}
}

// TestSafetyNote: the table caption and String carry the laser-safety
// caution wherever they show irradiance, and say how Fresnel losses were
// taken.
func TestSafetyNote(t *testing.T) {
	_, bl := labPath(t)
	b, err := bl.Build()
	if err != nil {
		t.Fatal(err)
	}
	tb := b.Table()
	if err := tb.Validate(); err != nil {
		t.Error(err)
	}
	for name, s := range map[string]string{"Table().Caption": tb.Caption, "String()": b.String(), "Note": b.Note} {
		if !strings.Contains(s, beam.SafetyNote) {
			t.Errorf("%s lacks beam.SafetyNote", name)
		}
	}
	if !strings.Contains(tb.Caption, "Jones vector") {
		t.Errorf("caption %q does not say how Fresnel losses are taken", tb.Caption)
	}
	sys := polarizerPath(t)
	u, err := budget.NewBuilder(sys, budget.Input{Power: 1, Beam: mustBeam(t, 1*mm)}).Build()
	if err != nil {
		t.Fatal(err)
	}
	if c := u.Caption(); !strings.Contains(c, "unpolarized") || !strings.Contains(c, "s/p average") {
		t.Errorf("unpolarized caption %q", c)
	}
}

// TestErrors: bad statements and inputs are *ParamError values naming the
// call or input and the value with its unit; nothing panics.
func TestErrors(t *testing.T) {
	sys, _ := labPath(t)
	g := mustBeam(t, 0.6*mm)
	in := budget.Input{Power: 0.02, Beam: g, Polarization: xPol}
	amp := polar.JonesMatrix{XX: 1.1, YY: 1}
	for _, test := range []struct {
		name     string
		b        *budget.Builder
		sentinel error
		contains []string
	}{
		{"unknown label", budget.NewBuilder(sys, in).Mirror("M9", 0.99), paraxial.ErrNoLabel, []string{`Mirror "M9" (call 1)`, `label = "M9"`}},
		{"reflectance above 1", budget.NewBuilder(sys, in).Mirror("M1", 1.2), nil, []string{`Mirror "M1" (call 1)`, "reflectance R = 1.2", "[0, 1]"}},
		{"negative AR", budget.NewBuilder(sys, in).AR("L1", -0.01), nil, []string{"R per surface = -0.01"}},
		{"NaN coupling", budget.NewBuilder(sys, in).AR("L1", 0.01).Coupling("L2", math.NaN()), nil, []string{`Coupling "L2" (call 2)`, "η = NaN"}},
		{"negative power", budget.NewBuilder(sys, budget.Input{Power: -0.01, Beam: g}), nil, []string{"input", "P0 = -0.01 W"}},
		{"infinite power", budget.NewBuilder(sys, budget.Input{Power: math.Inf(1), Beam: g}), nil, []string{"P0 = +Inf W"}},
		{"nil beam", budget.NewBuilder(sys, budget.Input{Power: 1}), nil, []string{"beam", "nil"}},
		{"NaN polarization", budget.NewBuilder(sys, budget.Input{Power: 1, Beam: g, Polarization: polar.Jones{X: complex(math.NaN(), 0)}}), nil, []string{"polarization"}},
		{"amplifying insert", budget.NewBuilder(sys, in).Insert("iris", "gain", amp), budget.ErrActive, []string{"σ² = 1.2"}},
		{"AR on a mirror", budget.NewBuilder(sys, in).AR("M1", 0.01), budget.ErrNoSurface, []string{`AR "M1"`}},
		{"conflict", budget.NewBuilder(sys, in).Mirror("M1", 0.9).Split("M1", 0.5), budget.ErrConflict, []string{"call 1 (Mirror)"}},
		{"two couplings", budget.NewBuilder(sys, in).Coupling("L2", 0.5).Coupling("L2", 0.6), budget.ErrConflict, nil},
		{"zero system", budget.NewBuilder(paraxial.System{}, in), paraxial.ErrNotBuilt, nil},
		{"first error kept", budget.NewBuilder(sys, in).Mirror("M1", 2).Mirror("nope", 0.5), nil, []string{"R = 2"}},
	} {
		b, err := test.b.Build()
		var pe *budget.ParamError
		if !errors.As(err, &pe) {
			t.Errorf("%s: Build() error %v (%T), want *budget.ParamError", test.name, err, err)
			continue
		}
		if b.Rows != nil {
			t.Errorf("%s: rows %v beside an error", test.name, b.Rows)
		}
		if test.sentinel != nil && !errors.Is(err, test.sentinel) {
			t.Errorf("%s: error %v does not wrap %v", test.name, err, test.sentinel)
		}
		msg := err.Error()
		if !strings.HasPrefix(msg, "budget: ") {
			t.Errorf("%s: message %q lacks the package prefix", test.name, msg)
		}
		for _, c := range test.contains {
			if !strings.Contains(msg, c) {
				t.Errorf("%s: message %q lacks %q", test.name, msg, c)
			}
		}
	}
}

// TestNotModelled: a mirror without a stated reflectance and a thin lens
// without AR pass everything and say so.
func TestNotModelled(t *testing.T) {
	sys := mustSystem(t, paraxial.NewBuilder().Space(10*mm).ThinLens(100*mm).Label("L").Space(10*mm).FlatMirror(45*units.Degree).Label("M").Space(10*mm))
	b, err := budget.NewBuilder(sys, budget.Input{Power: 1, Beam: mustBeam(t, 1*mm), Polarization: yPol}).Build()
	if err != nil {
		t.Fatal(err)
	}
	if len(b.Rows) != 2 || b.Fraction() != 1 {
		t.Fatalf("rows %v, fraction %v; want 2 rows passing all", b.Rows, b.Fraction())
	}
	for _, r := range b.Rows {
		if len(r.Actions) != 1 || r.Actions[0].Cause != budget.NotModelled {
			t.Errorf("%s: actions %v, want one NotModelled", r.Name, r.Actions)
		}
	}
}

// TestLosslessInsertsAccepted: waveplates and rotators are unitary, so
// their power gain is 1 to rounding (analytic identity, |det| = 1 and
// mᴴm = I), and no angle may trip the ErrActive check. The trace–
// determinant form of the gain missed 1 by ~1.5e-8 for a half-wave plate
// at 4°.
func TestLosslessInsertsAccepted(t *testing.T) {
	sys, err := paraxial.NewBuilder().Space(0.1).Plate(0.002, 1.53, 0).Label("plate").Space(0.1).Build()
	if err != nil {
		t.Fatal(err)
	}
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5e-3, Wavelength: 1550e-9})
	if err != nil {
		t.Fatal(err)
	}
	in := budget.Input{Power: 1, Beam: g, Polarization: polar.Jones{X: 1}}
	for deg := -90.0; deg <= 90; deg += 0.5 {
		a := units.Angle(deg) * units.Degree
		hwp, _ := polar.HalfWave(a)
		qwp, _ := polar.QuarterWave(a)
		ret, _ := polar.Retarder(a, units.Angle(deg/3)*units.Degree)
		rot, _ := polar.Rotator(a)
		for _, m := range []polar.JonesMatrix{hwp, qwp, ret, rot, hwp.Then(qwp).Then(rot)} {
			if _, err := budget.NewBuilder(sys, in).Insert("plate", "lossless", m).Build(); err != nil {
				t.Fatalf("angle %g°: %v", deg, err)
			}
		}
	}
}
