package beam

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestFromRadiusR08(t *testing.T) {
	// reference-checks R08 [X] (Kogelnik & Li 1966): the HeNe beam with
	// w0 = 0.5 mm has w = 0.9482416 mm and R = 2.770224 m at 2 m past the
	// waist. A beam entered from that measured radius and curvature must
	// have its waist (0.5 mm) 2 m behind the plane. The quoted inputs have
	// 7 significant digits; the waist radius depends on them with a
	// condition number of about 3, so rel 2e-6 against the quoted values.
	const quoted = 2e-6
	g, err := FromProfile(ProfileSpec{Radius: 0.9482416 * mm, WavefrontRadius: 2.770224, Wavelength: 632.8 * nm})
	if err != nil {
		t.Fatalf("FromRadius error: %v", err)
	}
	if got := float64(g.WaistRadius()); !scalar.EqualWithinAbsOrRel(got, 0.5e-3, 0, quoted) {
		t.Errorf("R08 FromRadius waist radius = %.9g m, want 0.5e-3 m", got)
	}
	if got := float64(g.WaistOffset()); !scalar.EqualWithinAbsOrRel(got, -2, 0, quoted) {
		t.Errorf("R08 FromRadius waist offset = %.9g m, want −2 m", got)
	}
	// Round trip against FromWaist at random planes and media (analytic
	// identity 1/q = 1/R − iλ/(πw²)): rel 1e-12, a few roundings.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 200 {
		n := 1 + rng.Float64()
		w0 := units.Length(1e-6 + 1e-3*rng.Float64())
		off := units.Length(2 * (rng.Float64() - 0.5))
		g0 := mustWaist(t, w0, off, 1064*nm, n)
		r := g0.WavefrontRadius()
		g1, err := FromProfile(ProfileSpec{Radius: g0.Radius(), WavefrontRadius: r, Wavelength: 1064 * nm, Index: n})
		if err != nil {
			t.Errorf("case %d: FromRadius(%v, %v) error: %v", i, g0.Radius(), r, err)
			continue
		}
		if !scalar.EqualWithinAbsOrRel(real(g1.Q), real(g0.Q), 1e-15, 1e-12) || !scalar.EqualWithinAbsOrRel(imag(g1.Q), imag(g0.Q), 0, 1e-12) {
			t.Errorf("case %d: FromRadius round trip q = %v, want %v", i, g1.Q, g0.Q)
		}
	}
	// A flat wavefront is a waist.
	flat, err := FromProfile(ProfileSpec{Radius: 1 * mm, WavefrontRadius: units.Length(math.Inf(1)), Wavelength: 633 * nm})
	if err != nil || real(flat.Q) != 0 || flat.WaistRadius() != 1*mm {
		t.Errorf("FromRadius(1 mm, +Inf) = %v, %v; want a 1 mm waist at the plane", flat, err)
	}
}

func TestM2Siegman(t *testing.T) {
	// Embedded-Gaussian beams (A. E. Siegman, Proc. SPIE 1224, 2 (1990)
	// [from memory]; ISO 11146-1 for M²): with the same waist W0, an M²
	// beam has zR = πW0²n/(M²λ0), divergence θ = M²λ0/(nπW0), radius
	// W(z) = W0√(1 + (z/zR)²), and W = M·w_embedded at every plane. The
	// beam parameter product n·W0·θ = M²λ0/π is invariant through any
	// lens system (ABCD law of the embedded beam). A few roundings per
	// quantity: rel 1e-12.
	const tol = 1e-12
	const m2 = 1.7
	lambda := 808 * nm
	g0 := mustWaist(t, 0.3*mm, 0, lambda, 1)
	g, err := g0.WithM2(m2)
	if err != nil {
		t.Fatalf("WithM2 error: %v", err)
	}
	zR := math.Pi * float64(0.3*mm*0.3*mm) / (m2 * float64(lambda))
	z := 0.25
	gz := g.Transform(paraxial.Space(units.Length(z)), 1)
	emb := Gaussian{Q: gz.Q, Wavelength: lambda, Index: 1} // the embedded TEM₀₀ beam
	sys := mustBuild(t, paraxial.NewBuilder().Space(0.1).ThinLens(0.05).Space(0.2).Interface(0.1, 1.5).Space(0.1))
	ws, err := Waists(sys, g)
	if err != nil {
		t.Fatalf("Waists error: %v", err)
	}
	last := ws[len(ws)-1]
	out, err := At(sys, g, sys.Length())
	if err != nil {
		t.Fatalf("At error: %v", err)
	}
	bpp := m2 * float64(lambda) / math.Pi
	for _, test := range []struct {
		name      string
		got, want float64
	}{
		{"waist kept", float64(g.WaistRadius()), 0.3e-3},
		{"zR", float64(g.RayleighRange()), zR},
		{"θ", float64(g.HalfDivergence()), m2 * float64(lambda) / (math.Pi * 0.3e-3)},
		{"W(z)", float64(gz.Radius()), 0.3e-3 * math.Sqrt(1+(z/zR)*(z/zR))},
		{"W = M·w_embedded", float64(gz.Radius()), math.Sqrt(m2) * float64(emb.Radius())},
		{"BPP at input", float64(g.WaistRadius()) * float64(g.HalfDivergence()), bpp},
		{"BPP after the system, n·W0·θ", out.Index * float64(last.Radius) * float64(out.HalfDivergence()), bpp},
		{"M² carried", out.BeamQuality(), m2},
	} {
		if !scalar.EqualWithinAbsOrRel(test.got, test.want, 0, tol) {
			t.Errorf("M² %s = %.15g, want %.15g", test.name, test.got, test.want)
		}
	}
	if (Gaussian{Q: 1i, Wavelength: lambda, Index: 1}).BeamQuality() != 1 {
		t.Errorf("zero M2 field should mean M² = 1")
	}
}

func TestBadInput(t *testing.T) {
	// Bad input (w ≤ 0, λ ≤ 0, M² < 1, NaN) gives errors that name
	// the parameter and its value.
	nan := math.NaN()
	good := mustWaist(t, 1*mm, 0, 633*nm, 1)
	_, e1 := FromWaist(WaistSpec{WaistRadius: 0, Wavelength: 633 * nm})
	_, e2 := FromWaist(WaistSpec{WaistRadius: units.Length(nan), Wavelength: 633 * nm})
	_, e3 := FromWaist(WaistSpec{WaistRadius: 1 * mm, Wavelength: -633 * nm})
	_, e4 := FromWaist(WaistSpec{WaistRadius: 1 * mm, Wavelength: units.Length(nan)})
	_, e5 := good.WithM2(0.9)
	_, e6 := good.WithM2(nan)
	_, e7 := FromProfile(ProfileSpec{Radius: -2 * mm, WavefrontRadius: 1, Wavelength: 633 * nm})
	_, e8 := FromProfile(ProfileSpec{Radius: 2 * mm, WavefrontRadius: 0, Wavelength: 633 * nm})
	_, e9 := FromProfile(ProfileSpec{Radius: 2 * mm, WavefrontRadius: units.Length(nan), Wavelength: 633 * nm})
	_, e10 := FromWaist(WaistSpec{WaistRadius: 1 * mm, Wavelength: 633 * nm, Index: nan})
	bad := good
	bad.M2 = 0.5
	e11 := bad.Validate()
	_, e12 := Sample(mustBuild(t, paraxial.NewBuilder().Space(1)), bad, 10)
	e13 := Astigmatic{X: good, Y: Gaussian{Q: 1i, Wavelength: 0, Index: 1}}.Validate()
	e14 := Astigmatic{X: good, Y: mustWaist(t, 1*mm, 0, 532*nm, 1)}.Validate()
	_, e15 := good.WithM2(1) // valid
	for _, test := range []struct {
		err  error
		want string
		is   error
	}{
		{e1, "beam: waist radius w0 = 0 m: must be positive and finite (or give the waist diameter 2w0)", nil},
		{e2, "beam: waist radius w0 = NaN m: must be positive and finite (or give the waist diameter 2w0)", nil},
		{e3, "beam: wavelength λ0 = -633 nm: must be positive and finite", nil},
		{e4, "beam: wavelength λ0 = NaN m: must be positive and finite", nil},
		{e5, "beam: M² = 0.9: must be at least 1 and finite", nil},
		{e6, "beam: M² = NaN: must be at least 1 and finite", nil},
		{e7, "beam: beam radius w = -2 mm: must be positive and finite (or give the beam diameter 2w)", nil},
		{e8, "beam: wavefront radius R = 0 m: must be nonzero (±Inf, paraxial.Flat, for a flat wavefront)", nil},
		{e9, "beam: wavefront radius R = NaN m: must be nonzero (±Inf, paraxial.Flat, for a flat wavefront)", nil},
		{e10, "beam: index n = NaN: must be positive and finite", nil},
		{e11, "beam: M² = 0.5: must be at least 1 and finite (0 means 1)", nil},
		{e12, "beam: M² = 0.5: must be at least 1 and finite (0 means 1)", nil},
		{e13, "beam: y wavelength λ0 = 0 m: must be positive and finite", nil},
		{e14, "beam: y wavelength λ0 = 532 nm: x wavelength is 633 nm: x and y parts of the beam must have the same wavelength and index", ErrMismatchedPlanes},
	} {
		if test.err == nil {
			t.Errorf("error = nil, want %q", test.want)
			continue
		}
		if test.err.Error() != test.want {
			t.Errorf("error = %q, want %q", test.err, test.want)
		}
		var pe *ParamError
		if !errors.As(test.err, &pe) {
			t.Errorf("error %q is %T, want *ParamError", test.err, test.err)
		}
		if test.is != nil && !errors.Is(test.err, test.is) {
			t.Errorf("errors.Is(%q, %v) = false", test.err, test.is)
		}
	}
	if e15 != nil {
		t.Errorf("WithM2(1) error: %v", e15)
	}
}

func TestCylindricalLensSelf(t *testing.T) {
	// A cylindrical lens focuses only its own plane. In that plane the
	// waist obeys Self's thin-lens law (S. A. Self, Appl. Opt. 22, 658
	// (1983), R10 inputs: w0 = 0.2 mm at s = 200 mm before f = 100 mm);
	// the other plane propagates freely (Kogelnik & Li 1966). Rel 1e-9 as
	// in R10. At must refuse the astigmatic system; AtXY must match the
	// element-wise caustic (rel 1e-12, two code paths).
	const closed = 1e-9
	s, f := 0.200, 0.100
	for _, p := range []paraxial.Plane{paraxial.Tangential, paraxial.Sagittal} {
		in := mustWaist(t, 0.2*mm, 0, 632.8*nm, 1)
		sys := mustBuild(t, paraxial.NewBuilder().Space(units.Length(s)).CylindricalLens(units.Length(f), p).Space(0.3))
		ws, err := Waists(sys, in)
		if err != nil {
			t.Errorf("%v: Waists error: %v", p, err)
			continue
		}
		sSelf, mSelf := selfWaist(s, f, float64(in.RayleighRange()))
		focused, free := ws[1].Z, ws[1].ZY
		wf, wfree := ws[1].Radius, ws[1].RadiusY
		if p == paraxial.Sagittal {
			focused, free, wf, wfree = ws[1].ZY, ws[1].Z, ws[1].RadiusY, ws[1].Radius
		}
		if !scalar.EqualWithinAbsOrRel(float64(focused)-s, sSelf, 0, closed) || !scalar.EqualWithinAbsOrRel(float64(wf), mSelf*0.2e-3, 0, closed) {
			t.Errorf("%v: focused plane waist %v at s'' = %v, want %g m at %g m", p, wf, focused-units.Length(s), mSelf*0.2e-3, sSelf)
		}
		if free != 0 || wfree != 0.2*mm {
			t.Errorf("%v: free plane waist %v at %v, want 0.2 mm at 0", p, wfree, free)
		}
		if _, err := At(sys, in, 0.25); err != ErrAstigmaticSystem {
			t.Errorf("%v: At past the cylinder error = %v, want ErrAstigmaticSystem", p, err)
		}
		if _, err := At(sys, in, 0.1); err != nil {
			t.Errorf("%v: At before the cylinder error = %v, want nil", p, err)
		}
		c, err := Sample(sys, in, 41)
		if err != nil {
			t.Errorf("%v: Sample error: %v", p, err)
			continue
		}
		for i, z := range c.Z {
			a, err := AtXY(sys, in, units.Length(z))
			if err != nil {
				t.Errorf("%v: AtXY(%g) error: %v", p, z, err)
				continue
			}
			if !scalar.EqualWithinAbsOrRel(float64(c.W[i]), float64(a.X.Radius()), 0, 1e-12) || !scalar.EqualWithinAbsOrRel(float64(c.WY[i]), float64(a.Y.Radius()), 0, 1e-12) {
				t.Errorf("%v: z = %g: caustic (%g, %g), AtXY (%g, %g)", p, z, float64(c.W[i]), float64(c.WY[i]), float64(a.X.Radius()), float64(a.Y.Radius()))
			}
		}
		// The focused plane has the input waist and the new focus; the
		// free plane only the input waist.
		nx, ny := 2, 1
		if p == paraxial.Sagittal {
			nx, ny = 1, 2
		}
		if len(c.Foci) != nx || len(c.FociY) != ny {
			t.Errorf("%v: foci x %v, y %v; want %d and %d", p, c.Foci, c.FociY, nx, ny)
		}
	}
}

func TestAstigmaticGouy(t *testing.T) {
	// An elliptical beam with different waists in x and y in free space:
	// each plane follows its own Kogelnik–Li Gouy phase arctan(z/zR)
	// (rel 1e-12, abs 1e-15 near z = 0: one step of the free-space
	// arctan difference, a few roundings), and a round beam through a
	// symmetric system has identical x and y caustics (bit-identical:
	// same arithmetic).
	gx := mustWaist(t, 50*um, 0, 1*um, 1)
	gy := mustWaist(t, 150*um, 0, 1*um, 1)
	sys := mustBuild(t, paraxial.NewBuilder().Space(0.2))
	c, err := Sample(sys, Astigmatic{X: gx, Y: gy}, 11)
	if err != nil {
		t.Fatalf("Sample error: %v", err)
	}
	cgx, cgy := c.GouyPhase()
	for i, z := range c.Z {
		wantX := math.Atan(float64(z / gx.RayleighRange()))
		wantY := math.Atan(float64(z / gy.RayleighRange()))
		if !scalar.EqualWithinAbsOrRel(float64(cgx[i]), wantX, 1e-15, 1e-12) || !scalar.EqualWithinAbsOrRel(float64(cgy[i]), wantY, 1e-15, 1e-12) {
			t.Errorf("z = %g: Gouy (%g, %g), want (%g, %g)", z, float64(cgx[i]), float64(cgy[i]), wantX, wantY)
		}
	}
	round, err := Sample(mustBuild(t, paraxial.NewBuilder().Space(0.1).ThinLens(0.05).Space(0.1)), gx, 21)
	if err != nil {
		t.Fatalf("Sample error: %v", err)
	}
	rgx, rgy := round.GouyPhase()
	for i := range round.Z {
		if round.W[i] != round.WY[i] || rgx[i] != rgy[i] {
			t.Errorf("round beam: x and y differ at z = %g", round.Z[i])
		}
	}
}

// randomSystem returns a random system of thin lenses, spherical
// interfaces, cylindrical lenses and spaces (20–200 mm), with n surfaces.
func randomSystem(t testing.TB, rng *rand.Rand, n int) paraxial.System {
	t.Helper()
	b := paraxial.NewBuilder().Space(units.Length(0.02 + 0.18*rng.Float64()))
	nCur := 1.0
	for range n {
		sign := 1.0
		if rng.IntN(2) == 0 {
			sign = -1
		}
		switch rng.IntN(3) {
		case 0:
			b.ThinLens(units.Length(sign * (0.03 + 0.3*rng.Float64())))
		case 1:
			nCur = 1 + rng.Float64()
			if rng.IntN(3) == 0 {
				nCur = 1
			}
			b.Interface(units.Length(sign*(0.02+0.2*rng.Float64())), nCur)
		case 2:
			p := paraxial.Tangential
			if rng.IntN(2) == 0 {
				p = paraxial.Sagittal
			}
			b.CylindricalLens(units.Length(sign*(0.05+0.3*rng.Float64())), p)
		}
		b.Space(units.Length(0.02 + 0.18*rng.Float64()))
	}
	return mustBuild(t, b)
}

func TestExtremesProperty(t *testing.T) {
	// Property (analytic: w(z) is convex in each gap, Kogelnik & Li 1966):
	// the exact extremes bound a dense sampling of the caustic, and the
	// sampled extremes approach them. The sampler includes every real waist
	// and every element position, so the sampled minimum and maximum equal
	// the exact ones up to rounding: rel 1e-12.
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 100 {
		sys := randomSystem(t, rng, 1+rng.IntN(8))
		in := Astigmatic{
			X: mustWaist(t, units.Length(0.1e-3+1e-3*rng.Float64()), units.Length(0.1*rng.Float64()), 1064*nm, 1),
			Y: mustWaist(t, units.Length(0.1e-3+1e-3*rng.Float64()), units.Length(-0.1*rng.Float64()), 1064*nm, 1),
		}
		ex, err := Extremes(sys, in)
		if err != nil {
			t.Errorf("case %d: Extremes error: %v", i, err)
			continue
		}
		c, err := Sample(sys, in, 200)
		if err != nil {
			t.Errorf("case %d: Sample error: %v", i, err)
			continue
		}
		minX, maxX, minY, maxY := math.Inf(1), 0.0, math.Inf(1), 0.0
		for j := range c.Z {
			minX, maxX = math.Min(minX, float64(c.W[j])), math.Max(maxX, float64(c.W[j]))
			minY, maxY = math.Min(minY, float64(c.WY[j])), math.Max(maxY, float64(c.WY[j]))
		}
		for _, test := range []struct {
			name      string
			got, want float64
		}{
			{"min x", float64(ex.Min.Radius), minX},
			{"max x", float64(ex.Max.Radius), maxX},
			{"min y", float64(ex.MinY.Radius), minY},
			{"max y", float64(ex.MaxY.Radius), maxY},
		} {
			if !scalar.EqualWithinAbsOrRel(test.got, test.want, 0, 1e-12) {
				t.Errorf("case %d: exact %s = %.15g, sampled %.15g", i, test.name, test.got, test.want)
			}
		}
		// The reported positions carry the reported radii (rel 1e-9: the
		// matrix path of AtXY at a waist position found by the tracer;
		// w is stationary there, so position rounding hardly matters).
		a, err := AtXY(sys, in, ex.Min.Z)
		if err == nil && !scalar.EqualWithinAbsOrRel(float64(a.X.Radius()), float64(ex.Min.Radius), 0, 1e-9) {
			t.Errorf("case %d: w(%v) = %v, Extremes says %v", i, ex.Min.Z, a.X.Radius(), ex.Min.Radius)
		}
	}
}

func TestSampleAstigmaticProperty(t *testing.T) {
	// Property: the element-wise tracer of Sample and the matrices of
	// MatrixTo/MatrixToY in AtXY agree on random astigmatic systems
	// (rel 1e-10: up to 20 cascaded elements, each a few roundings, with
	// condition numbers up to about 100 near tight foci).
	rng := rand.New(rand.NewPCG(1, 1))
	for i := range 50 {
		sys := randomSystem(t, rng, 1+rng.IntN(10))
		in := mustWaist(t, units.Length(0.2e-3+1e-3*rng.Float64()), 0, 633*nm, 1)
		c, err := Sample(sys, in, 30)
		if err != nil {
			t.Errorf("case %d: Sample error: %v", i, err)
			continue
		}
		for j, z := range c.Z {
			a, err := AtXY(sys, in, units.Length(z))
			if err != nil {
				t.Errorf("case %d: AtXY error: %v", i, err)
				break
			}
			if !scalar.EqualWithinAbsOrRel(float64(c.W[j]), float64(a.X.Radius()), 0, 1e-10) || !scalar.EqualWithinAbsOrRel(float64(c.WY[j]), float64(a.Y.Radius()), 0, 1e-10) || c.Index[j] != a.X.Index {
				t.Errorf("case %d z = %g: caustic (%g, %g, n %g), AtXY (%g, %g, n %g)", i, z, float64(c.W[j]), float64(c.WY[j]), c.Index[j], float64(a.X.Radius()), float64(a.Y.Radius()), a.X.Index)
				break
			}
		}
	}
}

func TestErrorMessagesMentionPlane(t *testing.T) {
	err := Astigmatic{X: mustWaist(t, 1*mm, 0, 633*nm, 1), Y: Gaussian{Q: -1i, Wavelength: 633 * nm, Index: 1}}.Validate()
	if err == nil || !strings.HasPrefix(err.Error(), "beam: y Im q") {
		t.Errorf("Validate() = %v, want an error about y Im q", err)
	}
}
