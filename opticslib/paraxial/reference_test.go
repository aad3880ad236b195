package paraxial_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/internal/fixtures"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

func build(t testing.TB, b *paraxial.Builder) paraxial.System {
	t.Helper()
	s, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	return s
}

func cardinal(t testing.TB, s paraxial.System, p paraxial.Plane) paraxial.Cardinal {
	t.Helper()
	c, err := s.Cardinal(p)
	if err != nil {
		t.Fatalf("Cardinal(%v) error: %v", p, err)
	}
	return c
}

type check struct {
	name      string
	got, want float64
}

func checkAll(t *testing.T, prefix string, abs, rel float64, cs []check) {
	t.Helper()
	for _, c := range cs {
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, abs, rel) {
			t.Errorf("%s: %s = %.12g, want %.12g", prefix, c.name, c.got, c.want)
		}
	}
}

func TestCardinalSingleSurfaceR27(t *testing.T) {
	// reference-checks R27 [X]: n 1 → 1.5, R = 10 mm: det 2/3, f' = 30 mm,
	// f = −20 mm, principal points at the vertex, both nodal points at the
	// centre of curvature. Closed forms on O(0.01 m) values: abs 1e-15 m
	// covers rounding of a few operations.
	const abs, rel = 1e-15, 1e-13
	f := fixtures.Surface
	s := build(t, paraxial.NewBuilder().Space(20*mm).Interface(f.R, f.N2).Space(50*mm))
	c := cardinal(t, s, paraxial.Tangential)
	v := 20 * mm // vertex position
	checkAll(t, "R27", abs, rel, []check{
		{"det", s.Matrix(paraxial.Tangential).Det(), f.Det},
		{"RearFocalLength", float64(c.ImageFocalLength), float64(f.RearFocal)},
		{"FrontFocalLength", float64(c.ObjectFocalLength), float64(f.FrontFocal)},
		{"RearFocal", float64(c.RearFocalPoint), float64(v + f.RearFocal)},
		{"FrontFocal", float64(c.FrontFocalPoint), float64(v + f.FrontFocal)},
		{"FrontPrincipal", float64(c.FrontPrincipalPlane), float64(v)},
		{"RearPrincipal", float64(c.RearPrincipalPlane), float64(v)},
		{"FrontNodal", float64(c.FrontNodalPoint), float64(v + f.Nodal)},
		{"RearNodal", float64(c.RearNodalPoint), float64(v + f.Nodal)},
		// f'/n' = −f/n = 1/Φ (Gaussian optics in two media; M. Born & E. Wolf,
		// Principles of Optics, 7th ed., Cambridge 1999, ch. 4 [from memory]).
		{"EFL", float64(c.EFL), float64(f.RearFocal) / f.N2},
	})
	if c.Afocal {
		t.Errorf("R27: Afocal = true, want false")
	}
}

func TestCardinalThickLensR30(t *testing.T) {
	// reference-checks R30 [X] with the tolerance each fixture's quoted
	// digits support (each fixture names its source); against the closed
	// forms (thick-lens power and principal-plane positions, W. J. Smith,
	// Modern Optical Engineering, 4th ed., McGraw-Hill 2008, ch. 2 [from
	// memory]) the matrix method is exact up to rounding: rel 1e-12.
	for _, l := range fixtures.ThickLenses {
		s, err := l.Build()
		if err != nil {
			t.Errorf("%s: Build error: %v", l.Name, err)
			continue
		}
		c := cardinal(t, s, paraxial.Tangential)
		checkAll(t, "R30 "+l.Name, float64(l.Quoted), 0, []check{
			{"EFL", float64(c.EFL), float64(l.EFL)},
			{"BFL", float64(c.BFL), float64(l.BFL)},
			{"FFL (symmetric lens)", float64(c.FFL), float64(l.BFL)},
			{"H − first vertex", float64(c.FrontPrincipalPlane - c.FirstVertex), float64(l.Principal)},
			{"last vertex − H'", float64(c.LastVertex - c.RearPrincipalPlane), float64(l.Principal)},
		})
		n, r1, r2, d := l.N, float64(l.R1), float64(l.R2), float64(l.T)
		phi := (n - 1) * (1/r1 - 1/r2 + (n-1)*d/(n*r1*r2))
		efl := 1 / phi
		checkAll(t, "lensmaker "+l.Name, 0, 1e-12, []check{
			{"Power", c.Power, phi},
			// Smith, Modern Optical Engineering, ch. 2 [from memory]:
			// h1 = −f(n−1)d/(n R2), h2 = −f(n−1)d/(n R1),
			// each measured from its vertex, positive towards +z.
			{"h1", float64(c.FrontPrincipalPlane - c.FirstVertex), -efl * (n - 1) * d / (n * r2)},
			{"h2", float64(c.RearPrincipalPlane - c.LastVertex), -efl * (n - 1) * d / (n * r1)},
		})
		if det := s.Matrix(paraxial.Tangential).Det(); !scalar.EqualWithinAbsOrRel(det, 1, 0, 1e-12) {
			t.Errorf("R27 lens in air %s: det = %.17g, want 1", l.Name, det)
		}
	}
}

func TestAfocalR31(t *testing.T) {
	// reference-checks R31 [X]: Kepler telescope f1 = 0.1 m, f2 = 0.3 m:
	// C = 0, transverse magnification A = −f2/f1 = −3, angular
	// magnification D = −f1/f2. Sources: the angular magnification
	// −f_objective/f_eyepiece of the astronomical telescope, F. L. Pedrotti,
	// L. S. Pedrotti & L. M. Pedrotti, Introduction to Optics, 3rd ed.,
	// Pearson 2007, ch. 3 [from memory]; C = 0 as the afocal (telescopic)
	// condition of the system matrix, A. Gerrard & J. M. Burch, Introduction
	// to Matrix Methods in Optics, Wiley 1975, ch. II [from memory].
	// Entries O(1): rel 1e-14.
	s := build(t, fixtures.Kepler())
	c := cardinal(t, s, paraxial.Tangential)
	if !c.Afocal {
		t.Fatalf("R31 Kepler: Afocal = false (C = %g)", s.Matrix(paraxial.Tangential).C)
	}
	checkAll(t, "R31 Kepler", 1e-15, 1e-14, []check{
		{"A", s.Matrix(paraxial.Tangential).A, fixtures.KeplerMatrix.A},
		{"B", s.Matrix(paraxial.Tangential).B, fixtures.KeplerMatrix.B},
		{"AngularMagnification", c.AngularMagnification, fixtures.KeplerMatrix.D},
		{"TransverseMagnification", c.TransverseMagnification, fixtures.KeplerMatrix.A},
		{"EFL (zero when afocal)", float64(c.EFL), 0},
	})
	if _, err := s.ObjectFor(-1, paraxial.Tangential); err != paraxial.ErrAfocal {
		t.Errorf("ObjectFor on afocal system: error = %v, want ErrAfocal", err)
	}
	// A 1 µm defocus of the 400 mm separation is not afocal: C = −δ/(f1 f2).
	d := build(t, paraxial.NewBuilder().ThinLens(100*mm).Space(400*mm+units.Micrometer).ThinLens(300*mm))
	if cd := cardinal(t, d, paraxial.Tangential); cd.Afocal {
		t.Errorf("Kepler defocused by 1 µm: Afocal = true, want false")
	}
}

func TestMatricesR31(t *testing.T) {
	// reference-checks R31 [X]: the system matrices themselves. Kepler
	// (C = 0, A = −f2/f1, D = 1/A), 2f–2f (B = 0, A = −1) and s_o = 0.15 m
	// with f = 0.1 m (B = 0, A = −2, D = 1/A). Entries O(10): abs 1e-15
	// covers the cancellation in B (R31 quotes 2.8e-17), rel 1e-14 a few
	// ulps.
	const abs, rel = 1e-15, 1e-14
	for _, test := range []struct {
		name string
		b    *paraxial.Builder
		want paraxial.Matrix
	}{
		{"Kepler", fixtures.Kepler(), fixtures.KeplerMatrix},
		{"2f-2f", paraxial.NewBuilder().Space(200 * mm).ThinLens(100 * mm).Space(200 * mm), paraxial.Matrix{A: -1, B: 0, C: -10, D: -1}},
		{"s_o = 0.15 m", paraxial.NewBuilder().Space(150 * mm).ThinLens(100 * mm).Space(300 * mm), paraxial.Matrix{A: -2, B: 0, C: -10, D: -0.5}},
	} {
		s, err := test.b.Build()
		if err != nil {
			t.Errorf("R31 %s: Build error: %v", test.name, err)
			continue
		}
		m := s.Matrix(paraxial.Tangential)
		checkAll(t, "R31 "+test.name, abs, rel, []check{
			{"A", m.A, test.want.A}, {"B", m.B, test.want.B}, {"C", m.C, test.want.C}, {"D", m.D, test.want.D},
			// det = 1 in air with B = 0 or C = 0 gives D = 1/A.
			{"D·A", m.D * m.A, 1},
		})
	}
}

func TestImageR31(t *testing.T) {
	// reference-checks R31 [X]: 2f–2f imaging with f = 0.1 m gives the image
	// 0.2 m after the lens with A = −1; s_o = 0.15 m gives s_i = 0.3 m and
	// A = −2 (1/s_o + 1/s_i = 1/f). Sources: the Gaussian thin-lens
	// equation 1/s_o + 1/s_i = 1/f with m = −s_i/s_o, F. L. Pedrotti,
	// L. S. Pedrotti & L. M. Pedrotti, Introduction to Optics, 3rd ed.,
	// Pearson 2007, ch. 2 [from memory]; B = 0 as the imaging condition with
	// A the magnification, A. Gerrard & J. M. Burch, Introduction to Matrix
	// Methods in Optics, Wiley 1975, ch. II [from memory]. abs 1e-15 m,
	// rel 1e-13.
	s := build(t, paraxial.NewBuilder().Space(200*mm).ThinLens(100*mm).Space(50*mm))
	for _, test := range []struct {
		object, image units.Length
		mag           float64
	}{
		{0, 400 * mm, -1},
		{50 * mm, 500 * mm, -2},
		// s_o = 0.3 m: s_i = 0.15 m, m = −0.5.
		{-100 * mm, 350 * mm, -0.5},
	} {
		c, err := s.Image(test.object, paraxial.Tangential)
		if err != nil {
			t.Errorf("Image(%v) error: %v", test.object, err)
			continue
		}
		checkAll(t, "R31 Image("+test.object.String()+")", 1e-15, 1e-13, []check{
			{"Image", float64(c.Image), float64(test.image)},
			{"Magnification", c.Magnification, test.mag},
			{"m·angular = n/n'", c.Magnification * c.AngularMagnification, 1},
		})
		if !c.RealObject || !c.RealImage {
			t.Errorf("Image(%v): real object/image = %v/%v, want true/true", test.object, c.RealObject, c.RealImage)
		}
	}
	// Object in the front focal plane: image at infinity.
	if _, err := s.Image(100*mm, paraxial.Tangential); err != paraxial.ErrImageAtInfinity {
		t.Errorf("Image(front focal plane) error = %v, want ErrImageAtInfinity", err)
	}
	// Object inside the focal length: virtual, upright, magnified image.
	// s_o = 50 mm, f = 100 mm: s_i = −100 mm, m = +2.
	c, err := s.Image(150*mm, paraxial.Tangential)
	if err != nil {
		t.Fatalf("Image(150 mm) error: %v", err)
	}
	checkAll(t, "virtual image", 1e-15, 1e-13, []check{{"Image", float64(c.Image), 100e-3}, {"Magnification", c.Magnification, 2}})
	if c.RealImage {
		t.Errorf("virtual image reported real")
	}
}

func TestObjectFor(t *testing.T) {
	// Thin lens (Gaussian lens formula, Pedrotti, Pedrotti & Pedrotti,
	// Introduction to Optics, 3rd ed., Pearson 2007, ch. 2 [from memory]):
	// m = −s_i/s_o with 1/s_o + 1/s_i = 1/f gives s_o = f(1 − 1/m).
	// A few operations on O(0.1 m): rel 1e-13.
	const f = 80 * mm
	s := build(t, paraxial.NewBuilder().ThinLens(f).Space(300*mm))
	for _, m := range []float64{-0.5, -1, -2, -4.3, 3} {
		c, err := s.ObjectFor(m, paraxial.Tangential)
		if err != nil {
			t.Errorf("ObjectFor(%g) error: %v", m, err)
			continue
		}
		so := float64(f) * (1 - 1/m)
		checkAll(t, "ObjectFor", 1e-15, 1e-13, []check{
			{"object distance", -float64(c.Object), so},
			{"Magnification", c.Magnification, m},
		})
	}
	for _, m := range []float64{0, math.NaN(), math.Inf(1)} {
		if _, err := s.ObjectFor(m, paraxial.Tangential); err != paraxial.ErrMagnification {
			t.Errorf("ObjectFor(%g) error = %v, want ErrMagnification", m, err)
		}
	}
}

// randomSystem returns a random imaging system: thin lenses, thick lenses
// and interfaces in media of index 1–1.8, with positive gaps.
func randomSystem(rng *rand.Rand) *paraxial.Builder {
	b := paraxial.NewBuilder().Medium(1 + 0.8*rng.Float64())
	sign := func() float64 { return float64(2*rng.IntN(2) - 1) }
	for range 1 + rng.IntN(5) {
		switch rng.IntN(3) {
		case 0:
			b.ThinLens(units.Length(sign() * (0.03 + 0.3*rng.Float64())))
		case 1:
			b.ThickLens(units.Length(sign()*(0.02+0.2*rng.Float64())), units.Length(sign()*(0.02+0.2*rng.Float64())), units.Length(0.001+0.01*rng.Float64()), 1.4+0.5*rng.Float64())
		case 2:
			b.Interface(units.Length(sign()*(0.02+0.2*rng.Float64())), 1+0.8*rng.Float64())
		}
		b.Space(units.Length(0.01 + 0.1*rng.Float64()))
	}
	return b
}

func TestNewtonProperty(t *testing.T) {
	// Newton's imaging equation x·x' = f·f' with x, x' the object and image
	// positions from F and F' (signed along +z); in air f = −f' and it reads
	// x·x' = −f'² (W. J. Smith, Modern Optical Engineering, 4th ed.,
	// McGraw-Hill 2008, ch. 2 [from memory]; in two media f·f' = −n n'/Φ²,
	// the same chapter [from memory]). Cancellation in x' near F' costs a
	// few digits: rel 1e-9.
	rng := rand.New(rand.NewPCG(1, 1))
	checked := 0
	defer func() {
		if checked < 200 {
			t.Errorf("only %d of 300 random systems were checked", checked)
		}
	}()
	for i := range 300 {
		s, err := randomSystem(rng).Build()
		if err != nil {
			t.Errorf("case %d: Build error: %v", i, err)
			continue
		}
		c := cardinal(t, s, paraxial.Tangential)
		if c.Afocal {
			continue
		}
		x := units.Length((rng.Float64() - 0.5) * 4 * math.Abs(float64(c.EFL)))
		im, err := s.Image(c.FrontFocalPoint+x, paraxial.Tangential)
		if err != nil {
			continue // x ≈ 0
		}
		checked++
		xp := im.Image - c.RearFocalPoint
		ff := float64(c.ObjectFocalLength) * float64(c.ImageFocalLength)
		if !scalar.EqualWithinAbsOrRel(float64(x)*float64(xp), ff, 1e-12*math.Abs(ff), 1e-9) {
			t.Errorf("case %d: x·x' = %.12g, want f·f' = %.12g", i, float64(x)*float64(xp), ff)
			continue
		}
		if want := -s.IndexIn() * s.IndexOut() / (c.Power * c.Power); !scalar.EqualWithinAbsOrRel(ff, want, 0, 1e-12) {
			t.Errorf("case %d: f·f' = %.12g, want −n n'/Φ² = %.12g", i, ff, want)
		}
		// Transverse magnification from Newton: m = −f/x (Smith, Modern
		// Optical Engineering, ch. 2 [from memory]).
		if want := -float64(c.ObjectFocalLength) / float64(x); !scalar.EqualWithinAbsOrRel(im.Magnification, want, 1e-12, 1e-9) {
			t.Errorf("case %d: m = %.12g, want −f/x = %.12g", i, im.Magnification, want)
		}
	}
}

func TestGullstrandProperty(t *testing.T) {
	// Gullstrand's equation for two systems of powers Φ1, Φ2 separated by
	// a gap d of index n between the rear principal plane of the first and
	// the front principal plane of the second:
	//	Φ = Φ1 + Φ2 − (d/n)·Φ1·Φ2
	// (A. Gullstrand; W. J. Smith, Modern Optical Engineering, 4th ed.,
	// §2.6 [from memory]; reduces to the two-thin-lens formula). Rounding
	// of a few dozen operations: rel 1e-10.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 200 {
		n := 1 + 0.7*rng.Float64()
		r := func() units.Length { return units.Length(float64(2*rng.IntN(2)-1) * (0.03 + 0.3*rng.Float64())) }
		r1, r2, r3, r4 := r(), r(), r(), r()
		t1, t2 := units.Length(0.002+0.01*rng.Float64()), units.Length(0.002+0.01*rng.Float64())
		g1, g2 := 1.45+0.4*rng.Float64(), 1.45+0.4*rng.Float64()
		gap := units.Length(0.02 + 0.2*rng.Float64())
		a := build(t, paraxial.NewBuilder().Medium(n).ThickLens(r1, r2, t1, g1))
		b := build(t, paraxial.NewBuilder().Medium(n).ThickLens(r3, r4, t2, g2))
		both := build(t, paraxial.NewBuilder().Medium(n).Append(a).Space(gap).Append(b))
		ca, cb, c := cardinal(t, a, 0), cardinal(t, b, 0), cardinal(t, both, 0)
		if ca.Afocal || cb.Afocal || c.Afocal {
			continue
		}
		// Principal-plane separation: H2 of b (relative to its vertex, shifted
		// by the gap) minus H1' of a.
		d := float64((a.Length() + gap + cb.FrontPrincipalPlane) - ca.RearPrincipalPlane)
		want := ca.Power + cb.Power - d/n*ca.Power*cb.Power
		scale := math.Abs(ca.Power) + math.Abs(cb.Power) + math.Abs(d/n*ca.Power*cb.Power)
		if !scalar.EqualWithinAbsOrRel(c.Power, want, 1e-12*scale, 1e-10) {
			t.Errorf("case %d: Φ = %.12g, Gullstrand %.12g", i, c.Power, want)
		}
	}
	// Two thin lenses in air: Φ = 1/f1 + 1/f2 − d/(f1 f2).
	s := build(t, paraxial.NewBuilder().ThinLens(100*mm).Space(30*mm).ThinLens(-50*mm))
	c := cardinal(t, s, 0)
	want := 1/0.1 + 1/-0.05 - 0.03/(0.1*-0.05)
	if !scalar.EqualWithinAbsOrRel(c.Power, want, 0, 1e-13) {
		t.Errorf("two thin lenses: Φ = %.15g, want %.15g", c.Power, want)
	}
}

func TestReverseProperty(t *testing.T) {
	// Reversal (Gerrard & Burch, Introduction to Matrix Methods in Optics,
	// 1975, §II.7 [from memory]; analytic identity from the reduced-matrix
	// rule [[A,B],[C,D]] → [[D,B],[C,A]]): the reversed system's matrix is
	// M.Reverse(), EFL is unchanged, FFL and BFL swap, reversing twice is
	// the identity operation. Rounding over ≤ 20 products: rel 1e-10 with a
	// small abs floor for entries that cancel to ~0.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 200 {
		s, err := randomSystem(rng).Build()
		if err != nil {
			t.Errorf("case %d: %v", i, err)
			continue
		}
		r, err := s.Reverse()
		if err != nil {
			t.Errorf("case %d: Reverse error: %v", i, err)
			continue
		}
		got, want := r.Matrix(paraxial.Tangential), s.Matrix(paraxial.Tangential).Reverse()
		scale := math.Abs(want.A) + math.Abs(want.B) + math.Abs(want.C) + math.Abs(want.D)
		for _, c := range []check{{"A", got.A, want.A}, {"B", got.B, want.B}, {"C", got.C, want.C}, {"D", got.D, want.D}} {
			if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-13*scale, 1e-10) {
				t.Errorf("case %d: Reverse().Matrix(paraxial.Tangential).%s = %.15g, want %.15g", i, c.name, c.got, c.want)
			}
		}
		if r.IndexIn() != s.IndexOut() || r.IndexOut() != s.IndexIn() {
			t.Errorf("case %d: reversed indices %g→%g, want %g→%g", i, r.IndexIn(), r.IndexOut(), s.IndexOut(), s.IndexIn())
		}
		cs, cr := cardinal(t, s, 0), cardinal(t, r, 0)
		if !cs.Afocal {
			checkAll(t, "reversed cardinal", 1e-12, 1e-9, []check{
				{"EFL", float64(cr.EFL), float64(cs.EFL)},
				{"BFL ↔ FFL", float64(cr.BFL), float64(cs.FFL)},
				{"FFL ↔ BFL", float64(cr.FFL), float64(cs.BFL)},
			})
		}
		rr, _ := r.Reverse()
		if m, w := rr.Matrix(paraxial.Tangential), s.Matrix(paraxial.Tangential); !scalar.EqualWithinAbsOrRel(m.B, w.B, 1e-13*scale, 1e-10) || !scalar.EqualWithinAbsOrRel(m.C, w.C, 1e-13*scale, 1e-10) {
			t.Errorf("case %d: Reverse twice = %+v, want %+v", i, m, w)
		}
	}
	// A physical check: an asymmetric lens turned round is the lens with
	// radii (−R2, −R1) (same glass surfaces seen from the other side).
	s := build(t, paraxial.NewBuilder().ThickLens(40*mm, paraxial.Flat, 6*mm, 1.6))
	r, _ := s.Reverse()
	turned := build(t, paraxial.NewBuilder().ThickLens(paraxial.Flat, -40*mm, 6*mm, 1.6))
	if g, w := r.Matrix(paraxial.Tangential), turned.Matrix(paraxial.Tangential); !scalar.EqualWithinAbsOrRel(g.A, w.A, 1e-15, 1e-13) || !scalar.EqualWithinAbsOrRel(g.C, w.C, 1e-15, 1e-13) || !scalar.EqualWithinAbsOrRel(g.D, w.D, 1e-15, 1e-13) {
		t.Errorf("reversed plano-convex = %+v, want %+v", g, w)
	}
}

func TestMirrorAstigmatism(t *testing.T) {
	// A concave mirror of radius 200 mm (R = −200 mm in the package sign
	// convention) has f = 100 mm (Kogelnik & Li 1966, table I [from
	// memory]); at 30° incidence f_t = f·cos θ = 86.6025 mm and
	// f_s = f/cos θ = 115.4701 mm
	// (Kogelnik, Ippen, Dienes & Shank, IEEE JQE QE-8, 373 (1972)
	// [from memory]). Closed forms: rel 1e-14.
	s := build(t, paraxial.NewBuilder().ConcaveMirror(200*mm, 30*units.Degree).Space(10*mm))
	ct, cs := cardinal(t, s, paraxial.Tangential), cardinal(t, s, paraxial.Sagittal)
	cos := math.Cos(math.Pi / 6)
	checkAll(t, "tilted mirror", 0, 1e-14, []check{
		{"f_t", float64(ct.EFL), 0.1 * cos},
		{"f_s", float64(cs.EFL), 0.1 / cos},
		{"Focal field", float64(s.Element(0).Focal), 0.1},
		{"det X", s.Matrix(paraxial.Tangential).Det(), 1},
		{"det Y", s.Matrix(paraxial.Sagittal).Det(), 1},
	})
	// Convex mirror, normal incidence: f = −R/2 = −50 mm.
	c := cardinal(t, build(t, paraxial.NewBuilder().ConvexMirror(100*mm, 0)), 0)
	checkAll(t, "convex mirror", 0, 1e-14, []check{{"EFL", float64(c.EFL), -0.05}})
	// A flat mirror has no power in either plane.
	f := build(t, paraxial.NewBuilder().FlatMirror(45*units.Degree))
	if m := f.Matrix(paraxial.Tangential); m != paraxial.Identity() || f.Matrix(paraxial.Sagittal) != paraxial.Identity() {
		t.Errorf("flat mirror matrices = %+v, %+v, want identity", m, f.Matrix(paraxial.Sagittal))
	}
}

func TestCylindricalLens(t *testing.T) {
	// A cylindrical lens has power in one plane only; two crossed
	// cylinders of equal f make a spherical thin lens (analytic: the
	// product of the per-plane matrices).
	s := build(t, paraxial.NewBuilder().CylindricalLens(50*mm, paraxial.Sagittal).CylindricalLens(50*mm, paraxial.Tangential))
	want := paraxial.ThinLens(50 * mm)
	if s.Matrix(paraxial.Tangential) != want || s.Matrix(paraxial.Sagittal) != want {
		t.Errorf("crossed cylinders = %+v / %+v, want %+v", s.Matrix(paraxial.Tangential), s.Matrix(paraxial.Sagittal), want)
	}
	one := build(t, paraxial.NewBuilder().CylindricalLens(50*mm, paraxial.Sagittal))
	if one.Matrix(paraxial.Tangential) != paraxial.Identity() || one.Matrix(paraxial.Sagittal) != want {
		t.Errorf("sagittal cylinder = %+v / %+v", one.Matrix(paraxial.Tangential), one.Matrix(paraxial.Sagittal))
	}
}

func TestPlateR32(t *testing.T) {
	// reference-checks R32 [X]: t = 10 mm, n = 1.5: focus shift
	// t(1 − 1/n) = 3.3333 mm (quoted to 1e-4 mm: abs 1e-7 m), lateral
	// displacement at 30° = 1.938138 mm (quoted to 1e-6 mm: abs 1e-9 m).
	// Sources: the longitudinal shift and the lateral displacement of a
	// plane-parallel plate, W. J. Smith, Modern Optical Engineering, 4th
	// ed., McGraw-Hill 2008, ch. 4 [from memory]; the air-equivalent
	// ("reduced") thickness t/n, A. Gerrard & J. M. Burch, Introduction to
	// Matrix Methods in Optics, Wiley 1975, ch. II [from memory]; the
	// displacement is also checked below against Snell's law directly.
	p := fixtures.Plate
	if got := paraxial.PlateShift(p.T, p.N, 1); !scalar.EqualWithinAbsOrRel(float64(got), float64(p.Shift), 1e-7, 0) {
		t.Errorf("PlateShift = %v, want %v", got, p.Shift)
	}
	if got := paraxial.PlateDisplacement(p.T, p.N, 1, 30*units.Degree); !scalar.EqualWithinAbsOrRel(float64(got), float64(p.Displacement), 1e-9, 0) {
		t.Errorf("PlateDisplacement(30°) = %v, want %v", got, p.Displacement)
	}
	// The displacement against direct Snell geometry: inside the plate the
	// ray runs at θ' = asin(sin θ/n) over t/cos θ'; the perpendicular offset
	// of the exit ray is that path times sin(θ − θ'). rel 1e-13.
	for _, deg := range []float64{5, 30, 60, 80} {
		th := deg * math.Pi / 180
		tp := math.Asin(math.Sin(th) / p.N)
		want := float64(p.T) / math.Cos(tp) * math.Sin(th-tp)
		if got := paraxial.PlateDisplacement(p.T, p.N, 1, units.Angle(th)); !scalar.EqualWithinAbsOrRel(float64(got), want, 1e-18, 1e-13) {
			t.Errorf("PlateDisplacement(%g°) = %.15g, Snell geometry %.15g", deg, float64(got), want)
		}
	}
	// Paraxially the plate is the air gap t/n (R32 [X]): B = t/n, and the
	// exit ray is parallel to the incident one (A = D = 1, C = 0; Snell
	// invariance across parallel planar layers). One division: abs
	// 1e-15, rel 1e-14.
	plate := build(t, paraxial.NewBuilder().Plate(p.T, p.N, 0))
	m := plate.Matrix(paraxial.Tangential)
	checkAll(t, "R32 plate matrix", 1e-15, 1e-14, []check{
		{"A", m.A, 1}, {"B = t/n", m.B, float64(p.T) / p.N}, {"C", m.C, 0}, {"D", m.D, 1},
		{"t − B = shift", float64(p.T) - m.B, float64(paraxial.PlateShift(p.T, p.N, 1))},
	})
	// The paraxial lateral offset of a ray at small θ, (t − B)θ, is the
	// small-angle limit of the exact displacement; the relative difference
	// is O(θ²) ≈ 1e-6 at θ = 1 mrad, so tol 1e-5.
	const th = 1e-3
	out := m.Apply(paraxial.Ray{Theta: th})
	if got, want := th*float64(p.T)-float64(out.Y), float64(paraxial.PlateDisplacement(p.T, p.N, 1, th)); !scalar.EqualWithinAbsOrRel(got, want, 0, 1e-5) {
		t.Errorf("paraxial displacement at 1 mrad = %.9g m, exact %.9g m", got, want)
	}
	// A plate inserted in a converging beam moves the image by the shift.
	// Lens f = 100 mm with the object at −200 mm: image at 200 mm; with the
	// plate in the 200 mm gap, at 200 mm + Δ.
	without := build(t, paraxial.NewBuilder().ThinLens(100*mm).Space(200*mm))
	with := build(t, paraxial.NewBuilder().ThinLens(100*mm).Space(50*mm).Plate(p.T, p.N, 0).Space(140*mm))
	a, _ := without.Image(-200*mm, 0)
	b, _ := with.Image(-200*mm, 0)
	if d := b.Image - a.Image; !scalar.EqualWithinAbsOrRel(float64(d), float64(p.T)*(1-1/p.N), 0, 1e-12) {
		t.Errorf("image shift by plate = %v, want t(1−1/n) = %v", d, p.T*(1-1/1.5))
	}
}

func TestTiltedPlateBrewster(t *testing.T) {
	// A plate at Brewster's angle (tan θ = n) acts as air-equivalent gaps
	// t√(n²+1)/n² (sagittal) and t√(n²+1)/n⁴ (tangential) (H. Kogelnik,
	// E. P. Ippen, A. Dienes & C. V. Shank, "Astigmatically compensated
	// cavities for CW dye lasers", IEEE J. Quantum Electron. QE-8, 373
	// (1972) [from memory]). Trig and a square root: rel 1e-13.
	const n, tk = 1.5, 10 * mm
	th := units.Angle(math.Atan(n))
	s := build(t, paraxial.NewBuilder().Plate(tk, n, th))
	root := math.Sqrt(n*n + 1)
	checkAll(t, "Brewster plate", 0, 1e-13, []check{
		{"B sagittal", s.Matrix(paraxial.Sagittal).B, float64(tk) * root / (n * n)},
		{"B tangential", s.Matrix(paraxial.Tangential).B, float64(tk) * root / (n * n * n * n)},
		{"A tangential", s.Matrix(paraxial.Tangential).A, 1},
		{"D tangential", s.Matrix(paraxial.Tangential).D, 1},
		{"det X", s.Matrix(paraxial.Tangential).Det(), 1},
	})
	cs := s.Components()
	if len(cs) != 1 || cs[0].Kind != paraxial.KindPlate || !scalar.EqualWithinAbsOrRel(float64(cs[0].Thickness), float64(tk), 0, 1e-14) {
		t.Errorf("Components() = %+v, want one plate of thickness 10 mm", cs)
	}
}

func TestRelayApertures(t *testing.T) {
	// The telecentric 4f relay of fixtures.Relay4f (closed forms stated
	// there): stop = diaphragm, both pupils at infinity, object NA 0.05,
	// working f-number 1/(2·0.05) = 10, field stop L2, half field 10 mm,
	// unvignetted 5 mm. Few operations: abs 1e-15, rel 1e-12.
	s := build(t, fixtures.Relay4f())
	a, err := s.Stops(paraxial.ObjectAt(0), paraxial.Tangential)
	if err != nil {
		t.Fatalf("Stops error: %v", err)
	}
	if a.Stop != 3 || a.FieldStop != 5 || !a.Entrance.AtInfinity || !a.Exit.AtInfinity {
		t.Errorf("Apertures: stop %d, field stop %d, pupils at infinity %v/%v; want 3, 5, true/true", a.Stop, a.FieldStop, a.Entrance.AtInfinity, a.Exit.AtInfinity)
	}
	checkAll(t, "4f relay", 1e-15, 1e-12, []check{
		{"ObjectNA", a.ObjectNA, 0.05},
		{"ImageNA", a.ImageNA, 0.05},
		{"WorkingFNumber", a.WorkingFNumber, 10},
		{"HalfField", float64(a.HalfField.Height), 10e-3},
		{"UnvignettedField", float64(a.UnvignettedField.Height), 5e-3},
		{"chief slope (telecentric)", float64(a.Chief(paraxial.Field{Height: 1 * mm}).Theta), 0},
	})
	// Vignetting: the marginal ray from the field edge of the unvignetted
	// field just passes, one from beyond it is blocked at L2 only.
	steps, err := s.Trace(a.Ray(paraxial.Field{Height: 5 * mm}, 1), 0, s.Length(), 0, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, st := range steps {
		if st.Blocked {
			t.Errorf("ray at the unvignetted field edge blocked at element %d", st.Element)
		}
	}
	steps, _ = s.Trace(a.Ray(paraxial.Field{Height: 6 * mm}, -1), 0, s.Length(), 0, nil)
	var blockedAt []int
	for _, st := range steps {
		if st.Blocked {
			blockedAt = append(blockedAt, st.Element)
		}
	}
	if len(blockedAt) != 1 || blockedAt[0] != 5 {
		t.Errorf("ray at 6 mm, ρ = −1: blocked at %v, want [5] (L2: |y| = 11 mm > 10 mm)", blockedAt)
	}
}

func TestSingleLensPupils(t *testing.T) {
	// Object at infinity, thin lens f = 100 mm with clear radius 10 mm as
	// the stop: entrance pupil at the lens, radius 10 mm, f-number
	// f/D = 5 (definition, Smith ch. 6 [from memory]); working f-number
	// for an infinite object equals it.
	s := build(t, paraxial.NewBuilder().Space(20*mm).ThinLens(100*mm).Aperture(paraxial.ClearRadius(10*mm)).Space(100*mm))
	a, err := s.Stops(paraxial.ObjectAtInfinity(), 0)
	if err != nil {
		t.Fatalf("Stops error: %v", err)
	}
	checkAll(t, "single lens", 1e-15, 1e-13, []check{
		{"Entrance.Z", float64(a.Entrance.Z), 0.02},
		{"Entrance.Radius", float64(a.Entrance.Radius), 0.01},
		{"FNumber", a.FNumber, 5},
		{"WorkingFNumber", a.WorkingFNumber, 5},
		{"Exit.Z", float64(a.Exit.Z), 0.02},
	})
	if a.FieldStop != -1 {
		t.Errorf("FieldStop = %d, want -1 (no other aperture)", a.FieldStop)
	}
	// Stop 30 mm before a thin lens f = 100 mm: the exit pupil is the
	// virtual image of the stop, s_o = 30 mm, 1/s_i = 1/f − 1/s_o gives
	// s_i = −42.857 mm (before the lens) with magnification −s_i/s_o =
	// 1.428571 (Gaussian lens formula, Pedrotti, Pedrotti & Pedrotti,
	// Introduction to Optics, 3rd ed., Pearson 2007, ch. 2 [from memory]).
	s = build(t, paraxial.NewBuilder().Space(50*mm).Diaphragm(paraxial.ClearRadius(4*mm)).Space(30*mm).ThinLens(100*mm).Aperture(paraxial.ClearRadius(15*mm)).Space(120*mm))
	a, err = s.Stops(paraxial.ObjectAtInfinity(), 0)
	if err != nil {
		t.Fatalf("Stops error: %v", err)
	}
	si := 1 / (1/0.1 - 1/0.03)
	checkAll(t, "stop before lens", 1e-15, 1e-12, []check{
		{"Entrance.Z (stop itself)", float64(a.Entrance.Z), 0.05},
		{"Exit.Z", float64(a.Exit.Z), 0.08 + si},
		{"Exit.Radius", float64(a.Exit.Radius), 0.004 * -si / 0.03},
	})
	if a.Stop != 1 || a.FieldStop != 3 {
		t.Errorf("stop %d, field stop %d; want 1, 3", a.Stop, a.FieldStop)
	}
}

func TestTelecentricPupilsRounding(t *testing.T) {
	// A 4f relay of f = 170 mm with the stop in the common focal plane is
	// telecentric on both sides (closed form, as fixtures.Relay4f): both
	// pupils at infinity. 0.17 is not a binary fraction, so A from the
	// object to the stop is 8e-18 rather than 0; a pupil must still be
	// reported at infinity, not at ~1e15 m.
	for _, f := range []units.Length{100 * mm, 170 * mm, 123 * mm, 70 * mm} {
		s := build(t, paraxial.NewBuilder().Space(f).ThinLens(f).Aperture(paraxial.ClearRadius(20*mm)).Space(f).
			Diaphragm(paraxial.ClearRadius(2*mm)).Space(f).ThinLens(f).Aperture(paraxial.ClearRadius(20*mm)).Space(f))
		a, err := s.Stops(paraxial.ObjectAt(0), paraxial.Tangential)
		if err != nil {
			t.Errorf("f = %v: Stops error: %v", f, err)
			continue
		}
		if a.Stop != 3 || !a.Entrance.AtInfinity || !a.Exit.AtInfinity {
			t.Errorf("f = %v: stop %d, pupils %+v / %+v; want stop 3, both at infinity", f, a.Stop, a.Entrance, a.Exit)
		}
	}
}

func TestStopTie(t *testing.T) {
	// Two identical lenses of a 4f relay (f = 110 mm, clear radius 20 mm)
	// with the object at infinity: the axial pencil fills both equally
	// (heights +h and −h; closed form), so the tie goes to the first lens.
	// Without a tie margin the choice followed rounding (L2 for 110 mm).
	// The entrance pupil is then L1 itself: z = 50 mm, radius 20 mm.
	for _, f := range []units.Length{110 * mm, 170 * mm, 30 * mm} {
		s := build(t, paraxial.NewBuilder().Space(50*mm).ThinLens(f).Aperture(paraxial.ClearRadius(20*mm)).Space(2*f).ThinLens(f).Aperture(paraxial.ClearRadius(20*mm)).Space(f))
		a, err := s.Stops(paraxial.ObjectAtInfinity(), paraxial.Tangential)
		if err != nil {
			t.Errorf("f = %v: Stops error: %v", f, err)
			continue
		}
		if a.Stop != 1 {
			t.Errorf("f = %v: Stop = %d, want 1 (the first of two equal apertures)", f, a.Stop)
		}
		checkAll(t, "tie f = "+f.String(), 1e-15, 1e-12, []check{
			{"Entrance.Z", float64(a.Entrance.Z), 0.05},
			{"Entrance.Radius", float64(a.Entrance.Radius), 0.02},
		})
	}
}

func TestDiaphragmsAreNotVertices(t *testing.T) {
	// A camera: iris 10 mm before a thin lens f = 50 mm, sensor mask in
	// the focal plane. The back focal distance is measured from the last
	// optical surface, the lens (W. J. Smith, Modern Optical Engineering,
	// ch. 2 [from memory]: BFL is the distance from the last lens surface
	// to F'), so BFL = FFL = f = 50 mm; a diaphragm, whose matrix is the
	// identity, is not a vertex. An object between the iris and the lens
	// is real: s_o = 5 mm gives the virtual image s_i = −5.556 mm (Gaussian
	// lens formula, Pedrotti, Pedrotti & Pedrotti, Introduction to Optics,
	// 3rd ed., Pearson 2007, ch. 2 [from memory]). abs 1e-15 m, rel 1e-13.
	s := build(t, paraxial.NewBuilder().Space(10*mm).Diaphragm(paraxial.ClearRadius(4*mm)).Space(10*mm).ThinLens(50*mm).Aperture(paraxial.ClearRadius(12*mm)).Space(50*mm).Diaphragm(paraxial.ClearRadius(4*mm)))
	c := cardinal(t, s, paraxial.Tangential)
	checkAll(t, "camera", 1e-15, 1e-13, []check{
		{"BFL", float64(c.BFL), 0.05},
		{"FFL", float64(c.FFL), 0.05},
		{"FirstVertex", float64(c.FirstVertex), 0.02},
		{"LastVertex", float64(c.LastVertex), 0.02},
		{"RearFocal", float64(c.RearFocalPoint), 0.07},
	})
	im, err := s.Image(15*mm, paraxial.Tangential)
	if err != nil {
		t.Fatalf("Image(15 mm) error: %v", err)
	}
	checkAll(t, "object behind the iris", 1e-15, 1e-13, []check{{"Image", float64(im.Image), 0.02 + 1/(1/0.05-1/0.005)}})
	if !im.RealObject || im.RealImage {
		t.Errorf("object behind the iris: real object/image = %v/%v, want true/false", im.RealObject, im.RealImage)
	}
	// The object of an aperture analysis must still precede the iris,
	// since the iris limits the pencil.
	if _, err := s.Stops(paraxial.ObjectAt(15*mm), paraxial.Tangential); err == nil {
		t.Errorf("Stops with the object after the iris: error = nil, want an *ElementError")
	}
}

func TestApertureInImagePlane(t *testing.T) {
	// An aperture in an image of the object (the focal plane of a lens for
	// an object at infinity, the 2f plane for an object at 2f) has the
	// axial marginal height 0 (closed form, Gaussian optics), so it limits
	// no axial pencil and cannot be the stop; with no other aperture there
	// is no stop. In floating point the height is ~1e-17 rather than 0 for
	// f = 170 mm, which made the mask a stop with a 1e14 m marginal ray.
	for _, f := range []units.Length{100 * mm, 170 * mm, 123 * mm} {
		s := build(t, paraxial.NewBuilder().Space(10*mm).ThinLens(f).Space(f).Diaphragm(paraxial.ClearRadius(1*mm)).Space(10*mm))
		if _, err := s.Stops(paraxial.ObjectAtInfinity(), paraxial.Tangential); err != paraxial.ErrNoStop {
			t.Errorf("f = %v, mask in the focal plane: error = %v, want ErrNoStop", f, err)
		}
		s = build(t, paraxial.NewBuilder().Space(2*f).ThinLens(f).Space(2*f).Diaphragm(paraxial.ClearRadius(1*mm)))
		if _, err := s.Stops(paraxial.ObjectAt(0), paraxial.Tangential); err != paraxial.ErrNoStop {
			t.Errorf("f = %v, mask in the image plane: error = %v, want ErrNoStop", f, err)
		}
	}
}
