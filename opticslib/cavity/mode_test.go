package cavity_test

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// randomCavity returns a seeded random stable cavity: a linear one with a
// lens, a tilted plate or a tilted curved fold mirror in its path, or a
// ring of four mirrors with tilted curved ones and sometimes a lens.
func randomCavity(t *testing.T, rng *rand.Rand) cavity.Cavity {
	t.Helper()
	for {
		var c cavity.Cavity
		var err error
		if rng.IntN(2) == 0 {
			b := paraxial.NewBuilder().Space(units.Length(0.02 + 0.2*rng.Float64()))
			switch rng.IntN(3) {
			case 0:
				b.ThinLens(units.Length(0.05 + 0.5*rng.Float64())).Label("lens")
			case 1:
				b.Plate(units.Length(0.002+0.01*rng.Float64()), 1.45+0.3*rng.Float64(), units.Angle(0.5*rng.Float64())).Label("plate")
			case 2:
				b.ConcaveMirror(units.Length(0.05+0.5*rng.Float64()), units.Angle(0.3*rng.Float64())).Label("fold")
			}
			path, err := b.Space(units.Length(0.02 + 0.3*rng.Float64())).Build()
			if err != nil {
				t.Fatal(err)
			}
			m1 := concave(units.Length(0.05+2*rng.Float64()), 0)
			if rng.IntN(3) == 0 {
				m1 = flat(0)
			}
			c, err = cavity.Linear(cavity.LinearSpec{M1: m1, M2: concave(units.Length(0.05+2*rng.Float64()), 0), Path: path, Wavelength: 1064 * nm})
		} else {
			th := units.Angle(0.02 + 0.25*rng.Float64())
			r := units.Length(0.05 + 0.3*rng.Float64())
			b := paraxial.NewBuilder().
				ConcaveMirror(r, th).Label("M1").Space(units.Length(0.03+0.4*rng.Float64())).
				ConcaveMirror(r, th).Label("M2").Space(units.Length(0.05 + 0.5*rng.Float64()))
			if rng.IntN(2) == 0 {
				b.ThinLens(units.Length(0.1 + rng.Float64())).Label("lens").Space(units.Length(0.05 + 0.2*rng.Float64()))
			}
			loop, err := b.FlatMirror(th).Label("M3").Space(units.Length(0.05 + 0.5*rng.Float64())).
				FlatMirror(th).Label("M4").Space(units.Length(0.05 + 0.3*rng.Float64())).Build()
			if err != nil {
				t.Fatal(err)
			}
			c, err = cavity.Ring(cavity.RingSpec{Loop: loop, Wavelength: 1064 * nm})
		}
		if err != nil {
			t.Fatal(err)
		}
		// Keep cavities comfortably inside the stable range in both planes,
		// where the mode is well conditioned.
		if s, _ := c.Stability(); s.Stable() && math.Abs(s.X.HalfTrace) < 0.95 && math.Abs(s.Y.HalfTrace) < 0.95 {
			return c
		}
	}
}

func TestEigenmodeReproducesItself(t *testing.T) {
	// Identity: the eigenmode at z maps onto itself through the round-trip
	// matrix at z, q = (Aq + B)/(Cq + D) (the definition of the mode,
	// Kogelnik & Li 1966), and the mode at z equals the mode at the input
	// plane carried to z by package beam's ABCD law (the round trips at
	// two planes are similar matrices). Rel 1e-10 on q: the solve and one
	// Möbius map, with |m| < 0.95 keeping √(1 − m²) ≥ 0.3 and the
	// conditioning modest; the carried beam goes through ≤ 12 elements.
	rng := rand.New(rand.NewPCG(1, 1))
	for k := range 40 {
		c := randomCavity(t, rng)
		l := c.Length()
		in, err := c.Eigenmode(l) // the beam arriving at the input plane
		if err != nil {
			t.Fatalf("case %d: Eigenmode(L) error: %v", k, err)
		}
		for _, f := range []float64{0, 0.13, 0.37, 0.5, 0.81, 1} {
			z := units.Length(f) * l
			m, err := c.Eigenmode(z)
			if err != nil {
				t.Errorf("case %d: Eigenmode(%v) error: %v", k, z, err)
				continue
			}
			n := m.Beam.X.Index
			for _, pl := range []struct {
				name string
				g    beam.Gaussian
				rt   paraxial.Matrix
			}{{"x", m.Beam.X, m.RoundTripX}, {"y", m.Beam.Y, m.RoundTripY}} {
				back := pl.g.Transform(pl.rt, n)
				if cmplx.Abs(back.Q-pl.g.Q) > 1e-10*cmplx.Abs(pl.g.Q) {
					t.Errorf("case %d, z = %v, %s: q = %v, after the round trip %v", k, z, pl.name, pl.g.Q, back.Q)
				}
			}
			carried, err := beam.AtXY(c.Loop(), in.Beam, z)
			if err != nil {
				t.Errorf("case %d: AtXY(%v) error: %v", k, z, err)
				continue
			}
			if cmplx.Abs(carried.X.Q-m.Beam.X.Q) > 1e-10*cmplx.Abs(m.Beam.X.Q) || cmplx.Abs(carried.Y.Q-m.Beam.Y.Q) > 1e-10*cmplx.Abs(m.Beam.Y.Q) {
				t.Errorf("case %d, z = %v: Eigenmode q = (%v, %v), carried from the input plane (%v, %v)", k, z, m.Beam.X.Q, m.Beam.Y.Q, carried.X.Q, carried.Y.Q)
			}
		}
		// The accumulated round-trip Gouy phase equals the phase of the
		// round trip's A + B/q (the eigenvalue C q + D = e^{−iψ}) modulo
		// 2π, abs 1e-10 rad.
		sp, err := c.ModeSpacing()
		if err != nil {
			t.Fatalf("case %d: ModeSpacing error: %v", k, err)
		}
		for _, pl := range []struct {
			psi units.Angle
			g   beam.Gaussian
			rt  paraxial.Matrix
		}{{sp.X.Phase, in.Beam.X, in.RoundTripX}, {sp.Y.Phase, in.Beam.Y, in.RoundTripY}} {
			direct := -cmplx.Phase(complex(pl.rt.A, 0) + complex(pl.rt.B, 0)/pl.g.Q)
			d := math.Remainder(float64(pl.psi)-direct, 2*math.Pi)
			if math.Abs(d) > 1e-10 || pl.psi <= 0 {
				t.Errorf("case %d: accumulated ψ = %.15g, −arg(A + B/q) = %.15g (differ by %.3g mod 2π)", k, pl.psi, direct, d)
			}
		}
	}
}

func TestEquivalentGParameters(t *testing.T) {
	// With intracavity elements the equivalent g-parameters g1 = a − b/R1,
	// g2 = (n2/n1)(d − b/R2) of the one-way path (H. Kogelnik, Bell Syst.
	// Tech. J. 44, 455 (1965) [from memory]) must satisfy
	// (A + D)/2 = 2 g1 g2 − 1 for the round-trip matrix, in each plane
	// (an algebraic identity of the reduced matrices). Cases: a lens, a
	// tilted plate (astigmatic), a tilted curved fold mirror, and M1 coated
	// on the end face of a crystal (the path starts in n = 1.5 and ends in
	// air). Abs 1e-12: a dozen products of O(1–10) numbers.
	crystal, err := paraxial.NewBuilder().Medium(1.5).Space(8 * mm).PlanarInterface(1).Space(90 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	lens, _ := paraxial.NewBuilder().Space(60 * mm).ThinLens(80 * mm).Space(70 * mm).Build()
	plate, _ := paraxial.NewBuilder().Space(40*mm).Plate(5*mm, 1.76, 60*units.Degree).Space(50 * mm).Build()
	fold, _ := paraxial.NewBuilder().Space(50*mm).ConcaveMirror(100*mm, 12*units.Degree).Label("fold").Space(400 * mm).Build()
	for _, test := range []struct {
		name   string
		path   paraxial.System
		m1, m2 cavity.Mirror
	}{
		{"lens", lens, concave(200*mm, 0), concave(300*mm, 0)},
		{"Brewster plate", plate, concave(100*mm, 0), concave(100*mm, 0)},
		{"fold mirror", fold, flat(0), concave(500*mm, 0)},
		{"crystal end face", crystal, flat(0), concave(250*mm, 0)},
	} {
		c, err := cavity.Linear(cavity.LinearSpec{M1: test.m1, M2: test.m2, Path: test.path, Wavelength: 1064 * nm})
		if err != nil {
			t.Errorf("%s: Linear error: %v", test.name, err)
			continue
		}
		s, _ := c.Stability()
		for _, p := range []cavity.PlaneStability{s.X, s.Y} {
			if want := 2*p.G1*p.G2 - 1; !scalar.EqualWithinAbs(p.HalfTrace, want, 1e-12) {
				t.Errorf("%s, %v: (A + D)/2 = %.15g, want 2 g1 g2 − 1 = %.15g", test.name, p.Plane, p.HalfTrace, want)
			}
			if d := p.RoundTrip.Det(); !scalar.EqualWithinAbs(d, 1, 1e-12) {
				t.Errorf("%s, %v: det(round trip) = %.15g, want 1", test.name, p.Plane, d)
			}
		}
		if strings.Contains(test.name, "crystal") {
			// The optical length counts the crystal at n = 1.5.
			if want := units.Length(2 * (1.5*8e-3 + 90e-3)); !scalar.EqualWithinRel(float64(c.OpticalLength()), float64(want), 1e-15) {
				t.Errorf("crystal: OpticalLength() = %v, want %v", c.OpticalLength(), want)
			}
		}
	}
}

// bowTie returns a ring of two concave mirrors of radius r at angle th
// separated by d1, and a long arm of total length d2 via two flat mirrors.
func bowTie(t *testing.T, r units.Length, th units.Angle, d1, d2 units.Length) cavity.Cavity {
	t.Helper()
	loop, err := paraxial.NewBuilder().
		ConcaveMirror(r, th).Label("M1").Space(d1).
		ConcaveMirror(r, th).Label("M2").Space(d2 / 4).
		FlatMirror(th).Label("M3").Space(d2 / 2).
		FlatMirror(th).Label("M4").Space(d2 / 4).
		Build()
	if err != nil {
		t.Fatal(err)
	}
	c, err := cavity.Ring(cavity.RingSpec{Loop: loop, Reflectivity: map[string]float64{"M1": 0.999, "M2": 0.999, "M3": 0.999, "M4": 0.97}, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func TestRingAstigmatismKogelnik1972(t *testing.T) {
	// A curved mirror of focal length f = R/2 met at angle θ focuses with
	// f·cos θ in the tangential plane and f/cos θ in the sagittal one
	// (H. Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank, IEEE J. Quantum
	// Electron. QE-8, 373 (1972) [from memory]). The bow-tie ring is then,
	// per plane, the periodic lens guide ... f, d1, f, d2 ... with p = 1/f_plane,
	// whose closed forms (derived by hand from the thin-lens and space
	// matrices; analytic) are
	//
	//	m = (A + D)/2 = 1 − p(d1 + d2) + p² d1 d2/2
	//	stable for 2f ≤ d1 ≤ 2f d2/(d2 − 2f)
	//	waist at the centre of d1:  w0² = (λ/π)|B_c|/√(1 − m²),
	//	B_c = d1 + d2 − p d1 d2 − p d1²/2 + p² d2 d1²/4
	//
	// R = 100 mm, θ = 10°, d2 = 1.2 m: the tangential range is
	// 98.48–107.29 mm, the sagittal 101.54–110.93 mm. d1 = 104 mm is
	// stable in both (waist checked per plane, rel 1e-10: a handful of
	// roundings in each form), d1 = 110 mm only in the sagittal plane.
	const lam = 1064e-9
	r, th, d2 := units.Length(0.1), 10*units.Degree, units.Length(1.2)
	cos := math.Cos(th.Radians())
	for _, pl := range []struct {
		name string
		f    float64
	}{{"tangential", 0.05 * cos}, {"sagittal", 0.05 / cos}} {
		lo, hi := 2*pl.f, 2*pl.f*float64(d2)/(float64(d2)-2*pl.f)
		t.Logf("%s: stable for %.2f mm ≤ d1 ≤ %.2f mm", pl.name, lo*1e3, hi*1e3)
	}
	d1 := 104 * mm
	c := bowTie(t, r, th, d1, d2)
	s, _ := c.Stability()
	m, err := c.Eigenmode(d1 / 2)
	if err != nil {
		t.Fatalf("d1 = 104 mm: Eigenmode(d1/2) error: %v", err)
	}
	for _, pl := range []struct {
		name string
		f    float64
		st   cavity.PlaneStability
		g    beam.Gaussian
	}{{"tangential", 0.05 * cos, s.X, m.Beam.X}, {"sagittal", 0.05 / cos, s.Y, m.Beam.Y}} {
		p, a, b := 1/pl.f, float64(d1), float64(d2)
		wantM := 1 - p*(a+b) + p*p*a*b/2
		if !scalar.EqualWithinAbs(pl.st.HalfTrace, wantM, 1e-12) {
			t.Errorf("%s: (A + D)/2 = %.15g, want the lens-guide form %.15g", pl.name, pl.st.HalfTrace, wantM)
		}
		bc := a + b - p*a*b - p*a*a/2 + p*p*b*a*a/4
		w0 := math.Sqrt(lam / math.Pi * math.Abs(bc) / math.Sqrt(1-wantM*wantM))
		if got := float64(pl.g.Radius()); !scalar.EqualWithinRel(got, w0, 1e-10) {
			t.Errorf("%s: waist at the centre of d1 = %.12g m, want %.12g m (closed form)", pl.name, got, w0)
		}
		if off := float64(pl.g.WaistOffset()); math.Abs(off) > 1e-12 {
			t.Errorf("%s: waist offset at the centre of d1 = %g m, want 0 (symmetry)", pl.name, off)
		}
	}
	if wx, wy := m.Beam.X.Radius(), m.Beam.Y.Radius(); wx == wy {
		t.Errorf("tilted curved mirrors: wx = wy = %v, want an astigmatic mode", wx)
	}

	// d1 = 110 mm: unstable in the tangential plane only; the error names it.
	c = bowTie(t, r, th, 110*mm, d2)
	s, _ = c.Stability()
	if s.X.Class != cavity.Unstable || s.Y.Class != cavity.Stable {
		t.Errorf("d1 = 110 mm: classes (%v, %v), want (unstable, stable)", s.X.Class, s.Y.Class)
	}
	if _, err := c.Eigenmode(0); err == nil || !strings.Contains(err.Error(), "tangential plane") {
		t.Errorf("d1 = 110 mm: Eigenmode error = %v, want one naming the tangential plane", err)
	}
	if w := strings.Join(c.Warnings(), "\n"); !strings.Contains(w, "tangential plane: unstable") {
		t.Errorf("d1 = 110 mm: Warnings() = %q, want the tangential plane flagged", w)
	}

	// d1 = 2 f_t exactly: the tangential inner edge, m = −1 (not −I).
	c = bowTie(t, r, th, units.Length(0.1*cos), d2)
	s, _ = c.Stability()
	if s.X.Class != cavity.Marginal || s.X.Boundary != cavity.EdgeMinus {
		t.Errorf("d1 = 2 f cos θ: tangential %v %v (m = %.17g), want marginal, (A + D)/2 = −1", s.X.Class, s.X.Boundary, s.X.HalfTrace)
	}
}

func TestRingImageInversion(t *testing.T) {
	// An odd number of reflections mirrors the beam across the plane of
	// incidence: after a round trip the tangential coordinate is inverted,
	// and HG_m of odd m picks up π (H_m(−x) = (−1)^m H_m(x); analytic), so
	// odd-m modes are shifted by FSR/2. An even number (bow-tie, linear
	// cavities) does not. Rel 1e-15 on the offsets.
	loop, err := paraxial.NewBuilder().
		FlatMirror(22.5*units.Degree).Label("A").Space(150*mm).
		FlatMirror(22.5*units.Degree).Label("B").Space(150*mm).
		ConcaveMirror(1, 45*units.Degree).Label("C").Space(150 * mm).
		Build()
	if err != nil {
		t.Fatal(err)
	}
	tri, err := cavity.Ring(cavity.RingSpec{Loop: loop, Wavelength: 1064 * nm})
	if err != nil {
		t.Fatal(err)
	}
	sp, err := tri.ModeSpacing()
	if err != nil {
		t.Fatal(err)
	}
	if !sp.Inversion {
		t.Errorf("three-mirror ring: Inversion = false, want true")
	}
	fx, fy := sp.X.Spacing, sp.Y.Spacing
	for _, test := range []struct {
		m, n int
		want float64
	}{
		{1, 0, fx + sp.FSR/2}, {0, 1, fy}, {2, 0, 2 * fx}, {1, 1, fx + fy + sp.FSR/2}, {3, 2, 3*fx + 2*fy + sp.FSR/2},
	} {
		if got := sp.Offset(test.m, test.n); !scalar.EqualWithinRel(got, test.want, 1e-15) {
			t.Errorf("three-mirror ring: Offset(%d, %d) = %.15g, want %.15g", test.m, test.n, got, test.want)
		}
	}
	bt, _ := bowTie(t, 0.1, 10*units.Degree, 104*mm, 1.2).ModeSpacing()
	if bt.Inversion {
		t.Errorf("bow-tie (4 mirrors): Inversion = true, want false")
	}
	lin, _ := twoMirror(t, concave(1, 0), concave(1, 0), 0.5).ModeSpacing()
	if lin.Inversion {
		t.Errorf("linear cavity: Inversion = true, want false")
	}
}

func TestSpectrum(t *testing.T) {
	// Confocal (ψ = π): even orders fall on TEM₀₀, odd ones half an FSR
	// away (R23; Kogelnik & Li's resonance formula). Without reflectivities
	// the overlap is coincidence to 1e-9 FSR.
	c := twoMirror(t, concave(1, 0), concave(1, 0), 1)
	s, err := c.Spectrum(2)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Lines) != 6 {
		t.Fatalf("Spectrum(2) has %d lines, want 6", len(s.Lines))
	}
	for i, l := range s.Lines {
		even := (l.M+l.N)%2 == 0
		want := 0.0
		if !even {
			want = s.FSR / 2
		}
		if !scalar.EqualWithinAbs(l.Within, want, 1e-9*s.FSR) {
			t.Errorf("line %d TEM%d%d: Within = %g, want %g", i, l.M, l.N, l.Within, want)
		}
		wantOverlaps := 3 // TEM00 with the three of order 2
		if !even {
			wantOverlaps = 1 // TEM10 with TEM01
		}
		if len(l.Overlaps) != wantOverlaps {
			t.Errorf("line %d TEM%d%d: %d overlaps, want %d", i, l.M, l.N, len(l.Overlaps), wantOverlaps)
		}
	}
	if s.Lines[0].M != 0 || s.Lines[0].N != 0 {
		t.Errorf("first line TEM%d%d, want TEM00", s.Lines[0].M, s.Lines[0].N)
	}

	// With reflectivities the window is the linewidth; an astigmatic ring
	// splits TEM10 from TEM01 by far more than it.
	ring := bowTie(t, 0.1, 10*units.Degree, 104*mm, 1.2)
	s, err = ring.Spectrum(1)
	if err != nil {
		t.Fatal(err)
	}
	a, _ := ring.Airy()
	if s.Window != a.Linewidth || s.Linewidth != a.Linewidth {
		t.Errorf("ring spectrum window %g, linewidth %g, want the Airy linewidth %g", s.Window, s.Linewidth, a.Linewidth)
	}
	for _, l := range s.Lines {
		if len(l.Overlaps) != 0 {
			t.Errorf("astigmatic ring: TEM%d%d overlaps %v, want none", l.M, l.N, l.Overlaps)
		}
	}
	if got := len(strings.Split(strings.TrimSpace(s.String()), "\n")); got != 3+3 {
		t.Errorf("Spectrum(1).String() has %d lines, want caption, header, rule and 3 rows:\n%s", got, s)
	}
	if _, err := ring.Spectrum(-1); err == nil {
		t.Errorf("Spectrum(-1) error = nil")
	}
	if _, err := ring.Spectrum(cavity.MaxSpectrumOrder + 1); err == nil {
		t.Errorf("Spectrum(%d) error = nil", cavity.MaxSpectrumOrder+1)
	}
}

func TestSpectrumNearest(t *testing.T) {
	// Confocal: every even order falls on TEM₀₀ (R23), so the nearest
	// transverse mode is of order 2 at distance 0; the odd orders sit half
	// an FSR away.
	s, err := twoMirror(t, concave(1, 0), concave(1, 0), 1).Spectrum(3)
	if err != nil {
		t.Fatal(err)
	}
	l, d, ok := s.Nearest()
	if !ok || l.M+l.N != 2 || d > 1e-9*s.FSR {
		t.Errorf("confocal Nearest = TEM%d%d at %g Hz (ok %v), want order 2 at 0", l.M, l.N, d, ok)
	}
	s1, err := twoMirror(t, concave(1, 0), concave(1, 0), 1).Spectrum(1)
	if err != nil {
		t.Fatal(err)
	}
	if _, d, _ := s1.Nearest(); !scalar.EqualWithinRel(d, s1.FSR/2, 1e-12) {
		t.Errorf("confocal order ≤ 1: nearest distance %g, want FSR/2 = %g", d, s1.FSR/2)
	}
	s0, err := twoMirror(t, concave(1, 0), concave(1, 0), 1).Spectrum(0)
	if err != nil {
		t.Fatal(err)
	}
	if _, _, ok := s0.Nearest(); ok {
		t.Errorf("order 0: Nearest ok = true, want false")
	}
}
