package measure_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/stat"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// causticBeam is a beam along one axis in ISO 11146-1's form
//
//	d(z)² = d0² + Θ²(z − z0)²,   Θ = 4M²λ0/(n π d0),   zR = d0/Θ
//
// (ISO 11146-1:2005, clause 9; reference-checks R16), with W0 = d0/2.
type causticBeam struct {
	w0, z0 units.Length
	m2     float64
}

func (b causticBeam) theta(lambda units.Length, n float64) float64 {
	return 4 * b.m2 * float64(lambda) / (n * math.Pi * 2 * float64(b.w0))
}

func (b causticBeam) zR(lambda units.Length, n float64) units.Length {
	return units.Length(2 * float64(b.w0) / b.theta(lambda, n))
}

// diameter returns d(z).
func (b causticBeam) diameter(z, lambda units.Length, n float64) units.Length {
	d0, th, dz := 2*float64(b.w0), b.theta(lambda, n), float64(z-b.z0)
	return units.Length(math.Sqrt(d0*d0 + th*th*dz*dz))
}

// causticR17Planes returns planes placed per reference-checks R17 around a waist
// at z0 with Rayleigh length zR: five within zR (at ±0.8, ±0.4, 0 zR) and
// five beyond 2zR, placed unevenly (−4, −3, 2.5, 3.5, 5 zR) so that a sign
// error in z0 cannot cancel.
func causticR17Planes(z0, zR units.Length) []units.Length {
	var z []units.Length
	for _, k := range []float64{-4, -3, -0.8, -0.4, 0, 0.4, 0.8, 2.5, 3.5, 5} {
		z = append(z, z0+units.Length(k)*zR)
	}
	return z
}

// causticWidths returns the widths of kind k of b at the planes z.
func causticWidths(b causticBeam, z []units.Length, k measure.WidthKind, lambda units.Length, n float64) []units.Length {
	out := make([]units.Length, len(z))
	for i, zz := range z {
		out[i] = b.diameter(zz, lambda, n)
		if k == measure.SecondMomentRadius || k == measure.OneOverE2Radius {
			out[i] /= 2
		}
	}
	return out
}

func TestFitCausticNoiseFreeR16(t *testing.T) {
	// Reference: ISO 11146-1:2005, clause 9 (reference-checks R16): widths
	// generated from d² = d0² + Θ²(z − z0)² at planes placed per R17 must
	// give back d0/2, z0, zR = d0/Θ, Θ and M², and the coefficients
	// A = d0² + Θ²z0², B = −2Θ²z0, C = Θ² of the expanded form.
	//
	// Tolerance: rel 1e-9 (R16). The widths carry one rounding (1e-16);
	// the fit, in a centred coordinate, has a condition number of a few
	// hundred, and W0² = α − β²/(4γ) loses no digits when the scan is
	// centred on the waist, so about 1e-13 is expected: 1e-9 leaves room
	// and still catches any wrong factor (2 in Θ, π in M²) or sign. A
	// position is compared to abs 1e-9 zR, as z0 may be 0.
	const tol = 1e-9
	for _, test := range []struct {
		name   string
		lambda units.Length
		n      float64
		kind   measure.WidthKind
		wt     measure.Weighting
		x, y   causticBeam // y.w0 == 0: a round beam
		sigma  bool
	}{
		{"round D4σ, 1064 nm", 1064 * units.Nanometer, 1, measure.SecondMomentDiameter, measure.Unweighted, causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}, causticBeam{}, false},
		{"round 1/e² radius, waist before the rail origin", 632.8 * units.Nanometer, 1, measure.OneOverE2Radius, measure.RelativeWeighted, causticBeam{0.5 * units.Millimeter, -0.3 * units.Meter, 1}, causticBeam{}, false},
		{"round, waist at z = 0", 532 * units.Nanometer, 1, measure.OneOverE2Diameter, measure.Unweighted, causticBeam{40 * units.Micrometer, 0, 1.02}, causticBeam{}, false},
		{"x/y second-moment radii, weighted", 1550 * units.Nanometer, 1, measure.SecondMomentRadius, measure.UncertaintyWeighted, causticBeam{30 * units.Micrometer, 20 * units.Millimeter, 1.05}, causticBeam{45 * units.Micrometer, 25 * units.Millimeter, 1.6}, true},
		{"round in water", 800 * units.Nanometer, 1.33, measure.SecondMomentDiameter, measure.Unweighted, causticBeam{50 * units.Micrometer, 10 * units.Millimeter, 2.2}, causticBeam{}, false},
	} {
		zR := test.x.zR(test.lambda, test.n)
		z := causticR17Planes(test.x.z0, zR)
		s := measure.WidthScan{Source: test.name, Z: z, Kind: test.kind}
		beams := []causticBeam{test.x}
		if test.y.w0 == 0 {
			s.Round = causticWidths(test.x, z, test.kind, test.lambda, test.n)
			if test.sigma {
				s.SigmaRound = causticScaled(s.Round, 0.01)
			}
		} else {
			s.X, s.Y = causticWidths(test.x, z, test.kind, test.lambda, test.n), causticWidths(test.y, z, test.kind, test.lambda, test.n)
			beams = append(beams, test.y)
			if test.sigma {
				s.SigmaX, s.SigmaY = causticScaled(s.X, 0.01), causticScaled(s.Y, 0.01)
			}
		}
		f, err := measure.FitCaustic(s, measure.CausticOptions{Wavelength: test.lambda, Index: test.n, Weighting: test.wt})
		if err != nil {
			t.Errorf("%s: FitCaustic error: %v", test.name, err)
			continue
		}
		if f.Weighting != test.wt || f.Scaled != (test.wt != measure.UncertaintyWeighted) {
			t.Errorf("%s: Weighting %v, Scaled %v; want %v, %v", test.name, f.Weighting, f.Scaled, test.wt, test.wt != measure.UncertaintyWeighted)
		}
		for i, a := range f.Axes() {
			b := beams[i]
			th, zr := b.theta(test.lambda, test.n), b.zR(test.lambda, test.n)
			d0 := 2 * float64(b.w0)
			for _, c := range []struct {
				what      string
				got, want float64
				abs       float64
			}{
				{"W0", float64(a.W0.Value), float64(b.w0), 0},
				{"Z0", float64(a.Z0.Value), float64(b.z0), tol * float64(zr)},
				{"zR", float64(a.RayleighRange.Value), float64(zr), 0},
				{"Θ", float64(a.Divergence.Value), th, 0},
				{"M²", a.M2.Value, b.m2, 0},
				{"A", a.A, d0*d0 + th*th*float64(b.z0*b.z0), 0},
				{"B", a.B, -2 * th * th * float64(b.z0), tol * th * th * float64(zr)},
				{"C", a.C, th * th, 0},
			} {
				if !scalar.EqualWithinAbsOrRel(c.got, c.want, c.abs, tol) {
					t.Errorf("%s, %s: %s = %.15g, want %.15g (ISO 11146-1 R16)", test.name, a.Axis, c.what, c.got, c.want)
				}
			}
			// Noise-free: the scaled uncertainties vanish (to the rounding
			// of the widths).
			if f.Scaled && (a.W0.Sigma > units.Length(tol)*a.W0.Value || a.M2.Sigma > tol*a.M2.Value) {
				t.Errorf("%s, %s: noise-free uncertainties σ(W0) = %v, σ(M²) = %g, want ≈ 0", test.name, a.Axis, a.W0.Sigma, a.M2.Sigma)
			}
		}
	}
}

func causticScaled(v []units.Length, k float64) []units.Length {
	out := make([]units.Length, len(v))
	for i := range v {
		out[i] = units.Length(k) * v[i]
	}
	return out
}

func TestFitCausticM2FormulaR16(t *testing.T) {
	// 1. A TEM₀₀ beam of package beam (the q-law of H. Kogelnik & T. Li,
	// Appl. Opt. 5, 1550 (1966), cross-checked in package beam), sampled
	// at R17 planes, has M² = 1; the embedded Gaussian with M² = 2.5
	// (Siegman 1990, beam.Gaussian.WithM2) has 2.5. For w0 = 100 µm at
	// 1064 nm the Rayleigh length is πw0²/λ = 29.526247 mm and the full
	// divergence 2λ/(πw0) = 6.773634 mrad (Kogelnik & Li). Tolerance rel
	// 1e-9 (R16), as in TestFitCausticNoiseFreeR16.
	//
	// 2. ISO 11146-1's own formulas, z0 = −B/(2C), d0 = √(4AC − B²)/(2√C),
	// Θ = √C, zR = √(4AC − B²)/(2C), M² = π/(8λ)·√(4AC − B²), applied to
	// the reported A, B, C, give the reported values (which the package
	// derives in a centred coordinate instead). Tolerance rel 1e-9: the
	// raw-z formulas lose about log10(1 + (z0/zR)²) ≈ 1.5 digits to
	// cancellation in 4AC − B² here.
	const tol = 1e-9
	lambda := 1064 * units.Nanometer
	g0, err := beam.FromWaist(beam.WaistSpec{Wavelength: lambda, WaistRadius: 100 * units.Micrometer})
	if err != nil {
		t.Fatalf("FromWaist error: %v", err)
	}
	for _, m2 := range []float64{1, 2.5} {
		g := g0
		if m2 != 1 {
			if g, err = g0.WithM2(m2); err != nil {
				t.Fatalf("WithM2 error: %v", err)
			}
		}
		z0 := 150 * units.Millimeter
		z := causticR17Planes(z0, g.RayleighRange())
		r := make([]units.Length, len(z))
		for i := range z {
			r[i] = g.Transform(paraxial.Space(z[i]-z0), 1).Radius()
		}
		f, err := measure.FitCaustic(measure.WidthScan{Z: z, Round: r, Kind: measure.OneOverE2Radius}, measure.CausticOptions{Wavelength: lambda})
		if err != nil {
			t.Fatalf("FitCaustic error: %v", err)
		}
		a := f.X
		if !scalar.EqualWithinRel(a.M2.Value, m2, tol) {
			t.Errorf("M² = %.15g, want %g (beam.Gaussian, Kogelnik & Li)", a.M2.Value, m2)
		}
		if m2 == 1 {
			if !scalar.EqualWithinRel(float64(a.RayleighRange.Value), 0.029526246744264968, tol) ||
				!scalar.EqualWithinRel(float64(a.Divergence.Value), 0.006773634377991066, tol) {
				t.Errorf("TEM₀₀: zR = %.10g m, Θ = %.10g rad; want 0.02952624674, 0.006773634378 (Kogelnik & Li)", float64(a.RayleighRange.Value), float64(a.Divergence.Value))
			}
		}
		disc := 4*a.A*a.C - a.B*a.B
		for _, c := range []struct {
			what      string
			got, want float64
		}{
			{"z0 = −B/(2C)", -a.B / (2 * a.C), float64(a.Z0.Value)},
			{"d0 = √(4AC − B²)/(2√C)", math.Sqrt(disc) / (2 * math.Sqrt(a.C)), 2 * float64(a.W0.Value)},
			{"Θ = √C", math.Sqrt(a.C), float64(a.Divergence.Value)},
			{"zR = √(4AC − B²)/(2C)", math.Sqrt(disc) / (2 * a.C), float64(a.RayleighRange.Value)},
			{"M² = π/(8λ)·√(4AC − B²)", math.Pi / (8 * float64(lambda)) * math.Sqrt(disc), a.M2.Value},
		} {
			if !scalar.EqualWithinRel(c.got, c.want, tol) {
				t.Errorf("M² = %g: ISO %s = %.15g, reported %.15g", m2, c.what, c.got, c.want)
			}
		}
	}
}

func TestCheckPlanesR17(t *testing.T) {
	// Reference-checks R17 (ISO 11146-1, clause 9, paraphrased): at least
	// 10 planes, about half within zR of the waist and about half beyond
	// 2zR. Counting is exact; no tolerance.
	z0, zR := 100*units.Millimeter, 10*units.Millimeter
	at := func(ks ...float64) []units.Length {
		var z []units.Length
		for _, k := range ks {
			z = append(z, z0+units.Length(k)*zR)
		}
		return z
	}
	for _, test := range []struct {
		name                    string
		z                       []units.Length
		ok                      bool
		inside, between, beyond int
		want                    string // in a problem
	}{
		{"5 in, 5 beyond 2zR", at(-0.8, -0.4, 0, 0.4, 0.8, -4, -3, 2.5, 3.5, 5), true, 5, 0, 5, ""},
		{"all 10 inside zR", at(-0.9, -0.7, -0.5, -0.3, -0.1, 0.1, 0.3, 0.5, 0.7, 0.9), false, 10, 0, 0, "0 of 10 planes lie beyond two Rayleigh lengths"},
		{"9 planes", at(-0.8, -0.4, 0, 0.4, 0.8, -4, -3, 2.5, 3.5), false, 5, 0, 4, "9 planes: ISO 11146-1 asks for at least 10; add 1"},
		{"outer planes between zR and 2zR", at(-0.8, -0.4, 0, 0.4, 0.8, -1.9, -1.5, 1.2, 1.5, 1.9), false, 5, 5, 0, "(5 lie between one and two Rayleigh lengths, where they add little)"},
		{"all far", at(-5, -4, -3, -2.5, -2.2, 2.2, 2.5, 3, 4, 5), false, 0, 0, 10, "0 of 10 planes lie within one Rayleigh length of the waist"},
		{"4 of 10 inside is about half", at(-0.8, -0.3, 0.3, 0.8, -1.5, -4, -3, 2.5, 3.5, 5), true, 4, 1, 5, ""},
	} {
		c := measure.CheckPlanes(test.z, z0, zR)
		if c.OK() != test.ok || c.Inside != test.inside || c.Between != test.between || c.Outside != test.beyond || c.Planes != len(test.z) {
			t.Errorf("%s: CheckPlanes = %+v, want ok %v, %d/%d/%d", test.name, c, test.ok, test.inside, test.between, test.beyond)
		}
		if test.want != "" && !strings.Contains(strings.Join(c.Problems, "\n"), test.want) {
			t.Errorf("%s: problems %q, want one containing %q", test.name, c.Problems, test.want)
		}
	}
}

func TestProposePlanes(t *testing.T) {
	// The proposal follows R17 by construction: check it with CheckPlanes
	// (exact counts) and the rounding to 1, 2 or 5 × 10ⁿ ≤ zR/10.
	z0, zR := 152*units.Millimeter, 20*units.Millimeter
	for _, test := range []struct {
		name     string
		lo, hi   units.Length
		n        int
		ok       bool
		step     units.Length
		inside   int
		farRight int
	}{
		{"no rail", 0, 0, 10, true, 2 * units.Millimeter, 5, 2},
		{"rail cuts the left far zone", z0 - 1.5*zR, 400 * units.Millimeter, 10, true, 2 * units.Millimeter, 5, 5},
		{"reversed rail", 400 * units.Millimeter, z0 - 1.5*zR, 10, true, 2 * units.Millimeter, 5, 5},
		{"rail too short for the far zones", z0 - zR/2, z0 + 1.5*zR, 5, false, 2 * units.Millimeter, 5, 0},
	} {
		p := measure.ProposePlanes(z0, zR, test.lo, test.hi)
		c := measure.CheckPlanes(p, z0, zR)
		right := 0
		for _, z := range p {
			if z-z0 >= 2*zR {
				right++
			}
			if k := float64(z / test.step); math.Abs(k-math.Round(k)) > 1e-9 {
				t.Errorf("%s: plane %v is not a multiple of %v", test.name, z, test.step)
			}
			if lo, hi := min(test.lo, test.hi), max(test.lo, test.hi); (lo != 0 || hi != 0) && (z < lo || z > hi) {
				t.Errorf("%s: plane %v outside the rail", test.name, z)
			}
			if math.Abs(float64(z-z0)) > 5*float64(zR)+1e-12 {
				t.Errorf("%s: plane %v beyond 5 zR", test.name, z)
			}
		}
		if len(p) != test.n || c.OK() != test.ok || c.Inside != test.inside || right != test.farRight {
			t.Errorf("%s: ProposePlanes = %v (%d planes, check %+v, %d far right), want %d planes, ok %v, %d inside, %d far right",
				test.name, p, len(p), c, right, test.n, test.ok, test.inside, test.farRight)
		}
	}
	if p := measure.ProposePlanes(0, 0, 0, 0); p != nil {
		t.Errorf("ProposePlanes(zR = 0) = %v, want nil", p)
	}
}

// A scan that breaks the rule warns, proposes planes, and a scan at the
// proposed planes of the same beam no longer warns.
func TestFitCausticProposalLoop(t *testing.T) {
	lambda := 1064 * units.Nanometer
	b := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3} // the beam of caustic_short.csv
	s := causticReadScan(t, "caustic_short.csv", measure.SecondMomentWidths)
	f, err := measure.FitCaustic(s, measure.CausticOptions{Wavelength: lambda, RailMin: 0, RailMax: 300 * units.Millimeter})
	if err != nil {
		t.Fatalf("FitCaustic error: %v", err)
	}
	w := strings.Join(f.Warnings, "\n")
	for _, want := range []string{"planes lie beyond two Rayleigh lengths", "0 of 8 planes lie beyond two Rayleigh lengths", "planes proposed from this fit"} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings %q, want one containing %q", f.Warnings, want)
		}
	}
	if len(f.Proposal) != 10 {
		t.Fatalf("Proposal = %v, want 10 planes", f.Proposal)
	}
	next := measure.WidthScan{Z: f.Proposal, Round: causticWidths(b, f.Proposal, measure.SecondMomentDiameter, lambda, 1), Kind: measure.SecondMomentDiameter}
	f2, err := measure.FitCaustic(next, measure.CausticOptions{Wavelength: lambda})
	if err != nil {
		t.Fatalf("FitCaustic(proposed planes) error: %v", err)
	}
	if len(f2.Warnings) != 0 || !f2.X.Check.OK() {
		t.Errorf("scan at the proposed planes warns: %q", f2.Warnings)
	}
}

func TestFitCausticNotPhysical(t *testing.T) {
	z := []units.Length{0.10, 0.12, 0.14, 0.16, 0.18, 0.20}
	down := make([]units.Length, len(z)) // d² = 1 mm² − (z − 0.15 m)²·1e-4: opens downwards
	flat := make([]units.Length, len(z)) // d² = 1e-4 z² − 1e-8 m²: 4AC − B² < 0
	for i, v := range z {
		dz := float64(v) - 0.15
		down[i] = units.Length(math.Sqrt(1e-6 - 1e-4*dz*dz))
		flat[i] = units.Length(math.Sqrt(1e-4*float64(v*v) - 1e-8))
	}
	for _, test := range []struct {
		name string
		d    []units.Length
		want string
	}{
		{"opens downwards", down, "measure: width scan, round axis: hyperbola coefficient C = -0.0001: d² = A + Bz + Cz² needs C > 0"},
		{"no real waist", flat, "measure: width scan, round axis: 4AC − B² (m²) = -4e-12: must be positive: the fitted curve has no real waist"},
	} {
		_, err := measure.FitCaustic(measure.WidthScan{Z: z, Round: test.d, Kind: measure.SecondMomentDiameter}, measure.CausticOptions{Wavelength: 1 * units.Micrometer})
		if !errors.Is(err, measure.ErrNotPhysical) || !strings.Contains(err.Error(), strings.SplitN(test.want, " = ", 2)[0]) {
			t.Errorf("%s: FitCaustic error = %v, want ErrNotPhysical like %q", test.name, err, test.want)
		}
	}
	// Option errors.
	s := measure.WidthScan{Z: z, Round: flat, Kind: measure.SecondMomentDiameter}
	for _, test := range []struct {
		name string
		opt  measure.CausticOptions
		want string
	}{
		{"no wavelength", measure.CausticOptions{}, "Wavelength λ0 = 0 m: must be positive and finite"},
		{"weighted without uncertainties", measure.CausticOptions{Wavelength: 1e-6, Weighting: measure.UncertaintyWeighted}, "the scan has no width uncertainties"},
		{"bad index", measure.CausticOptions{Wavelength: 1e-6, Index: -1}, "Index = -1: must be positive"},
		{"bad weighting", measure.CausticOptions{Wavelength: 1e-6, Weighting: 9}, "Weighting = 9: is not a Weighting"},
		{"bad rail", measure.CausticOptions{Wavelength: 1e-6, RailMax: units.Length(math.Inf(1))}, "must be finite"},
	} {
		if _, err := measure.FitCaustic(s, test.opt); !errors.Is(err, measure.ErrInput) || !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: FitCaustic error = %v, want ErrInput containing %q", test.name, err, test.want)
		}
	}
}

func TestFitCausticWarnings(t *testing.T) {
	lambda := 1064 * units.Nanometer
	b := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}
	z := causticR17Planes(b.z0, b.zR(lambda, 1))
	rng := rand.New(rand.NewPCG(1, 1))
	noisy := func(k float64) []units.Length {
		d := causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1)
		for i := range d {
			d[i] *= units.Length(1 + k*rng.NormFloat64())
		}
		return d
	}
	for _, test := range []struct {
		name   string
		s      measure.WidthScan
		lambda units.Length
		want   string // "" for no warning
	}{
		{"ISO scan, right uncertainties", measure.WidthScan{Z: z, Round: noisy(0.01), SigmaRound: causticScaled(causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1), 0.01), Kind: measure.SecondMomentDiameter}, lambda, ""},
		{"uncertainties 10 times too small", measure.WidthScan{Z: z, Round: noisy(0.01), SigmaRound: causticScaled(causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1), 0.001), Kind: measure.SecondMomentDiameter}, lambda, "the residuals are larger than the stated uncertainties predict"},
		{"uncertainties 30 times too large", measure.WidthScan{Z: z, Round: noisy(0.001), SigmaRound: causticScaled(causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1), 0.03), Kind: measure.SecondMomentDiameter}, lambda, "the stated uncertainties look too large"},
		{"1/e² widths", measure.WidthScan{Z: z, Round: noisy(0), Kind: measure.OneOverE2Diameter}, lambda, "the widths are 1/e² widths: ISO 11146-1 defines"},
		{"wavelength twice too long", measure.WidthScan{Z: z, Round: noisy(0), Kind: measure.SecondMomentDiameter}, 2 * lambda, "is below 1, which no beam has"},
	} {
		f, err := measure.FitCaustic(test.s, measure.CausticOptions{Wavelength: test.lambda})
		if err != nil {
			t.Errorf("%s: FitCaustic error: %v", test.name, err)
			continue
		}
		w := strings.Join(f.Warnings, "\n")
		if test.want == "" && w != "" || !strings.Contains(w, test.want) {
			t.Errorf("%s: warnings %q, want %q", test.name, f.Warnings, test.want)
		}
	}
}

func TestFitCausticNoisyStatistics(t *testing.T) {
	// Reference: least-squares theory (the Gauss–Markov theorem; GUM,
	// JCGM 100:2008, clause 5, for the propagation to W0 and M²). Over
	// many seeded noisy scans of one beam, the estimates must scatter as
	// the reported standard uncertainties say and show no bias.
	//
	// Tolerances, for N draws: the mean within 4 standard errors of the
	// true value (plus a relative 1e-4 for the second-order bias of the
	// non-linear W0 and M², about (σ/W0)² ≈ 3e-5 here); the ratio of the
	// observed scatter to the RMS reported uncertainty within
	// 4/√(2N) + 0.02 of 1 (the first is the sampling error of a standard
	// deviation, the second the variation of the reported σ and the
	// linearisation); the fraction of draws within ±1 reported σ of the
	// truth within 4√(p(1 − p)/N) of p = 0.6827 (normal errors, absolute
	// uncertainties).
	const draws = 2000
	lambda := 1064 * units.Nanometer
	b := causticBeam{120 * units.Micrometer, 152 * units.Millimeter, 1.3}
	zR := b.zR(lambda, 1)
	z := causticR17Planes(b.z0, zR)
	d := causticWidths(b, z, measure.SecondMomentDiameter, lambda, 1)
	for _, test := range []struct {
		name string
		wt   measure.Weighting
		// noise returns a noisy scan of d.
		noise    func(rng *rand.Rand) ([]units.Length, []units.Length)
		coverage bool
	}{
		{"1 % width errors, weighted by them", measure.UncertaintyWeighted, func(rng *rand.Rand) ([]units.Length, []units.Length) {
			out := make([]units.Length, len(d))
			for i := range d {
				out[i] = d[i] * units.Length(1+0.01*rng.NormFloat64())
			}
			return out, causticScaled(d, 0.01)
		}, true},
		{"equal errors in d², unweighted (ISO), scaled", measure.Unweighted, func(rng *rand.Rand) ([]units.Length, []units.Length) {
			out := make([]units.Length, len(d))
			s := 0.01 * float64(d[0]*d[0]) // 1 % of the largest d²... at the first plane
			for i := range d {
				out[i] = units.Length(math.Sqrt(float64(d[i]*d[i]) + s*rng.NormFloat64()))
			}
			return out, nil
		}, false},
		{"2 % relative errors, relative weights, scaled", measure.RelativeWeighted, func(rng *rand.Rand) ([]units.Length, []units.Length) {
			out := make([]units.Length, len(d))
			for i := range d {
				out[i] = d[i] * units.Length(1+0.02*rng.NormFloat64())
			}
			return out, nil
		}, false},
	} {
		rng := rand.New(rand.NewPCG(1, 1))
		var w0, sw0, m2, sm2 []float64
		inW0, inM2 := 0, 0
		for range draws {
			dd, sd := test.noise(rng)
			f, err := measure.FitCaustic(measure.WidthScan{Z: z, Round: dd, SigmaRound: sd, Kind: measure.SecondMomentDiameter}, measure.CausticOptions{Wavelength: lambda, Weighting: test.wt})
			if err != nil {
				t.Fatalf("%s: FitCaustic error: %v", test.name, err)
			}
			a := f.X
			w0, sw0 = append(w0, float64(a.W0.Value)), append(sw0, float64(a.W0.Sigma))
			m2, sm2 = append(m2, a.M2.Value), append(sm2, a.M2.Sigma)
			if math.Abs(float64(a.W0.Value-b.w0)) <= float64(a.W0.Sigma) {
				inW0++
			}
			if math.Abs(a.M2.Value-b.m2) <= a.M2.Sigma {
				inM2++
			}
		}
		for _, c := range []struct {
			what             string
			est, sig         []float64
			truth            float64
			inside           int
			relBiasAllowance float64
		}{
			{"W0", w0, sw0, float64(b.w0), inW0, 1e-4},
			{"M²", m2, sm2, b.m2, inM2, 1e-4},
		} {
			mean, sd := stat.MeanStdDev(c.est, nil)
			var ms float64
			for _, s := range c.sig {
				ms += s * s
			}
			rms := math.Sqrt(ms / float64(len(c.sig)))
			se := sd / math.Sqrt(draws)
			if math.Abs(mean-c.truth) > 4*se+c.relBiasAllowance*c.truth {
				t.Errorf("%s: mean %s = %.8g, want %.8g within %.3g (4 standard errors)", test.name, c.what, mean, c.truth, 4*se)
			}
			ratio := sd / rms
			if lim := 4/math.Sqrt(2*draws) + 0.02; math.Abs(ratio-1) > lim {
				t.Errorf("%s: scatter of %s / reported σ = %.4f, want 1 ± %.3f", test.name, c.what, ratio, lim)
			}
			p := float64(c.inside) / draws
			if test.coverage && math.Abs(p-0.6827) > 4*math.Sqrt(0.6827*0.3173/draws) {
				t.Errorf("%s: %s within ±1σ in %.3f of the draws, want 0.683", test.name, c.what, p)
			}
			t.Logf("%s: %s bias %.2g (rel), scatter/σ = %.4f, within 1σ: %.3f", test.name, c.what, mean/c.truth-1, ratio, p)
		}
	}
}

func TestCausticFitTable(t *testing.T) {
	// The table layout is this package's own; the numbers are those of
	// the fit (checked above).
	f, err := measure.FitCaustic(causticReadScan(t, "caustic_xy.csv", measure.SecondMomentWidths), measure.CausticOptions{Wavelength: 1064 * units.Nanometer})
	if err != nil {
		t.Fatalf("FitCaustic error: %v", err)
	}
	tb := f.Table()
	wantHeader := []string{"axis", "w0 (µm)", "z0 (mm)", "zR (mm)", "Θ (mrad)", "M²", "rms residual (µm)", "planes ≤ zR / ≥ 2zR / all"}
	if strings.Join(tb.Header, "|") != strings.Join(wantHeader, "|") {
		t.Errorf("Header = %q, want %q", tb.Header, wantHeader)
	}
	if err := tb.Validate(); err != nil || len(tb.Rows) != 2 || tb.Cell(0, 0) != "x" || tb.Cell(1, 0) != "y" {
		t.Fatalf("Table rows = %q (%v), want an x and a y row", tb.Rows, err)
	}
	for j := 1; j <= 5; j++ {
		if !strings.Contains(tb.Cell(0, j), " ± ") {
			t.Errorf("cell (0, %d) = %q, want value ± uncertainty", j, tb.Cell(0, j))
		}
	}
	if tb.Cell(0, 7) != "5 / 5 / 10" {
		t.Errorf("plane counts = %q, want 5 / 5 / 10 (the file follows R17)", tb.Cell(0, 7))
	}
	if !strings.Contains(tb.Caption, "weighted by the stated width uncertainties") || !strings.Contains(tb.Caption, "taken as absolute") {
		t.Errorf("Caption = %q, want the weighting and the origin of the uncertainties", tb.Caption)
	}
	s := f.String()
	for _, want := range []string{"Caustic fit of caustic_xy.csv (ISO 11146-1 hyperbola, 10 planes): second-moment diameters (D4σ), λ0 = 1.064 µm", "\nx: w0 = ", "\ny: w0 = ", "χ²/ν = ", "\nweighting: weighted by the stated width uncertainties"} {
		if !strings.Contains(s, want) {
			t.Errorf("String() =\n%s\nwant it to contain %q", s, want)
		}
	}
	// Without uncertainties: the scaling is said.
	f, err = measure.FitCaustic(causticReadScan(t, "caustic_round.csv", measure.OneOverE2Widths), measure.CausticOptions{Wavelength: 780 * units.Nanometer})
	if err != nil {
		t.Fatalf("FitCaustic error: %v", err)
	}
	if s := f.String(); !strings.Contains(s, "unweighted least squares on d² (ISO 11146-1); standard uncertainties from the covariance scaled by the residual variance") || !strings.Contains(s, "warning: the widths are 1/e² widths") {
		t.Errorf("String() =\n%s\nwant the unweighted, scaled note and the 1/e² warning", s)
	}
	if tb := f.Table(); len(tb.Rows) != 1 || tb.Cell(0, 0) != "round" || !strings.Contains(tb.Caption, "Warning: the widths are 1/e² widths") {
		t.Errorf("round Table = %q / %q", tb.Caption, tb.Rows)
	}
}

// The sample files come from known beams (README.txt of testdata/measure):
// the fits must find them within their reported uncertainties (4σ, a
// statistical check with one draw per parameter).
func TestFitCausticSampleFiles(t *testing.T) {
	for _, test := range []struct {
		file   string
		def    measure.WidthDefinition
		lambda units.Length
		beams  []causticBeam
	}{
		{"caustic_xy.csv", measure.SecondMomentWidths, 1064 * units.Nanometer, []causticBeam{{120 * units.Micrometer, 152 * units.Millimeter, 1.30}, {135 * units.Micrometer, 158 * units.Millimeter, 1.45}}},
		{"caustic_round.csv", measure.OneOverE2Widths, 780 * units.Nanometer, []causticBeam{{60 * units.Micrometer, 212 * units.Millimeter, 1.10}}},
	} {
		f, err := measure.FitCaustic(causticReadScan(t, test.file, test.def), measure.CausticOptions{Wavelength: test.lambda})
		if err != nil {
			t.Fatalf("%s: FitCaustic error: %v", test.file, err)
		}
		for i, a := range f.Axes() {
			b := test.beams[i]
			if math.Abs(float64(a.W0.Value-b.w0)) > 4*float64(a.W0.Sigma) || math.Abs(float64(a.Z0.Value-b.z0)) > 4*float64(a.Z0.Sigma) || math.Abs(a.M2.Value-b.m2) > 4*a.M2.Sigma {
				t.Errorf("%s %s: W0 = %v, z0 = %v, M² = %v; generated from %v, %v, %g", test.file, a.Axis, a.W0, a.Z0, a.M2, b.w0, b.z0, b.m2)
			}
		}
	}
}

func TestUncertainString(t *testing.T) {
	// This package's format: two significant digits of the uncertainty
	// (GUM, JCGM 100:2008, 7.2.6), the value to the same decimal.
	for _, test := range []struct {
		got, want string
	}{
		{measure.Uncertain[units.Length]{253.1234e-6, 1.234e-6}.String(), "253.1 ± 1.2 µm"},
		{measure.Uncertain[units.Length]{0.15204, 0.00031}.String(), "152.04 ± 0.31 mm"},
		{measure.Uncertain[units.Length]{1.2345, 0.0123}.String(), "1.234 ± 0.012 m"},
		{measure.Uncertain[units.Angle]{10.0031e-3, 0.0152e-3}.String(), "10.003 ± 0.015 mrad"},
		{measure.Uncertain[units.Angle]{402.85e-6, 3.1e-6}.String(), "402.9 ± 3.1 µrad"},
		{measure.Uncertain[float64]{1.30412, 0.0213}.String(), "1.304 ± 0.021"},
		{measure.Uncertain[float64]{12345, 234}.String(), "12350 ± 230"},
		{measure.Uncertain[float64]{1.3, 0}.String(), "1.3 ± 0"},
		{measure.Uncertain[float64]{1.3, 1e-14}.String(), "1.3 ± 1e-14"},
	} {
		if test.got != test.want {
			t.Errorf("String() = %q, want %q", test.got, test.want)
		}
	}
}
