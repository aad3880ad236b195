package wave_test

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

// edgeTol bounds the error of the transmitted fraction of a circular
// mask of radius a, centred at (cx, cy), on a round Gaussian of 1/e²
// radius w sampled at Dx. Σ t|u|² is a midpoint rule for ∫|u|² over the
// opening; next to an edge that crosses a pixel at e·Dx from its sample
// (|e| ≤ ½) the partly covered pixel and the midpoint rule on the full
// ones leave, per unit length of edge,
//
//	Dx²·|∂I/∂n|·(1/12 − e²/2)
//
// (the covered part's first moment, (e² − ¼)/2, plus the midpoint rule's
// 1/24), at most Dx²/12, on average Dx²/24 over the edge positions a
// curved edge meets. So
//
//	|ΔT| ≤ (Dx²/12)·∮|∂I/∂n| dl / P
//
// which is (4/3)(a·Dx/w²)²·e^(−2a²/w²) for a centred circle; the factor
// 1.1 covers the O(Dx⁴) terms. A derived bound (no outside source): the
// measured errors of circles are about half of it, those of grid-aligned
// straight edges through a sample row all of it.
func edgeTol(a, cx, cy, dx, w units.Length) float64 {
	const steps = 720
	A, X, Y, W := float64(a), float64(cx), float64(cy), float64(w)
	s := 0.0
	for k := range steps {
		th := 2 * math.Pi * (float64(k) + 0.5) / steps
		x, y := X+A*math.Cos(th), Y+A*math.Sin(th)
		// I = exp(−2r²/w²)·I0, ∇I = −(4/w²)·(x, y)·I; n = (cos, sin).
		dn := 4 / (W * W) * math.Abs(x*math.Cos(th)+y*math.Sin(th)) * math.Exp(-2*(x*x+y*y)/(W*W))
		s += dn * A * 2 * math.Pi / steps
	}
	return 1.1 * float64(dx*dx) / 12 * s / (math.Pi * W * W / 2)
}

func gaussGrid(t *testing.T, wx, wy units.Length, n int, dx units.Length) wave.Grid {
	t.Helper()
	lambda := 1 * units.Micrometer
	bx, err := beam.FromWaist(beam.WaistSpec{WaistRadius: wx, Wavelength: lambda})
	if err != nil {
		t.Fatal(err)
	}
	by, err := beam.FromWaist(beam.WaistSpec{WaistRadius: wy, Wavelength: lambda})
	if err != nil {
		t.Fatal(err)
	}
	g, err := wave.GridFromBeam(beam.Astigmatic{X: bx, Y: by}, n, dx)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func TestClipTransmission(t *testing.T) {
	// The power a centred circular aperture of radius a passes from a
	// Gaussian of 1/e² radius w is 1 − exp(−2a²/w²); a centred opaque disc
	// of radius b passes exp(−2b²/w²) (analytic; Siegman, Lasers, §17.1
	// [from memory]); a decentred circle is the chord integral of
	// beam.Transmission (Gauss–Legendre in package beam, an independent
	// implementation); a slit of half-width a at offset c passes
	// ½[erf(√2(a − c)/w) + erf(√2(a + c)/w)] (analytic). Tolerances: the
	// midpoint-rule bounds edgeTol and slitTol (the edges of these slits
	// fall on sample rows, the worst case). N = 256, w = 40 Dx.
	const n = 256
	dx := 5 * units.Micrometer
	w := 40 * dx
	in := gaussGrid(t, w, w, n, dx)
	before := append([]complex128(nil), in.U...)
	for _, r := range []float64{0.5, 1, 1.5, 2} {
		a := units.Length(r) * w
		clip, T, err := in.Clip(paraxial.ClearDiameter(2 * a))
		if err != nil {
			t.Errorf("Clip(a = %g w) error: %v", r, err)
			continue
		}
		if want := -math.Expm1(-2 * r * r); !scalar.EqualWithinAbs(T, want, edgeTol(a, 0, 0, dx, w)) {
			t.Errorf("Clip(a = %g w): T = %.9f, want 1 − exp(−2a²/w²) = %.9f within %.2g", r, T, want, edgeTol(a, 0, 0, dx, w))
		}
		obs, To, err := in.Obscure(paraxial.ClearDiameter(2 * a))
		if err != nil {
			t.Errorf("Obscure(b = %g w) error: %v", r, err)
			continue
		}
		if want := math.Exp(-2 * r * r); !scalar.EqualWithinAbs(To, want, edgeTol(a, 0, 0, dx, w)) {
			t.Errorf("Obscure(b = %g w): T = %.9f, want exp(−2b²/w²) = %.9f", r, To, want)
		}
		// Complementary masks: the fractions add to 1 and the fields to
		// the input (to rounding: sums of 65536 terms, 1e-13).
		if !scalar.EqualWithinAbs(T+To, 1, 1e-13) {
			t.Errorf("a = %g w: Clip + Obscure fractions = %.17g, want 1", r, T+To)
		}
		sum := wave.Grid{U: make([]complex128, n*n), N: n, Dx: dx, Wavelength: in.Wavelength, Index: 1}
		for i := range sum.U {
			sum.U[i] = clip.U[i] + obs.U[i]
		}
		if d, _ := sum.MaxDiff(in); !(d <= 1e-15) {
			t.Errorf("a = %g w: Clip + Obscure fields differ from the input by %.3g", r, d)
		}
	}
	for _, off := range [][2]units.Length{{0.3 * w, -0.2 * w}, {-w, 0}, {0, 0.5 * w}} {
		o := paraxial.ClearDiameter(2*w).Offset(off[0], off[1])
		_, T, err := in.Clip(o)
		if err != nil {
			t.Errorf("Clip(offset %v, %v) error: %v", off[0], off[1], err)
			continue
		}
		tol := edgeTol(w, off[0], off[1], dx, w)
		if want := beam.Transmission(o, 0, w, w); !scalar.EqualWithinAbs(T, want, tol) {
			t.Errorf("Clip(offset %v, %v): T = %.9f, want %.9f (beam.Transmission) within %.2g", off[0], off[1], T, want, tol)
		}
	}
	// Slits on an elliptical beam, across x and across y.
	el := gaussGrid(t, w, w/2, n, dx)
	for _, test := range []struct {
		across paraxial.Plane
		wb     units.Length
	}{
		{paraxial.Tangential, w}, {paraxial.Sagittal, w / 2},
	} {
		half, c := 0.8*test.wb, 0.25*test.wb
		o := paraxial.SlitOfWidth(2*half, test.across)
		if test.across == paraxial.Tangential {
			o = o.Offset(c, 0)
		} else {
			o = o.Offset(0, c)
		}
		_, T, err := el.Clip(o)
		if err != nil {
			t.Errorf("Clip(slit across %v) error: %v", test.across, err)
			continue
		}
		k := math.Sqrt2 / float64(test.wb)
		want := 0.5 * (math.Erf(k*float64(half-c)) + math.Erf(k*float64(half+c)))
		tol := slitTol(half-c, dx, test.wb) + slitTol(half+c, dx, test.wb)
		if !scalar.EqualWithinAbs(T, want, tol) {
			t.Errorf("Clip(slit across %v): T = %.9f, want %.9f within %.2g", test.across, T, want, tol)
		}
	}
	for i := range before {
		if in.U[i] != before[i] {
			t.Fatalf("Clip/Obscure modified the input at sample %d", i)
		}
	}
}

// slitTol is edgeTol for a straight edge at distance e from the centre
// of a Gaussian of radius w, across which the normalised profile is
// √(2/π)/w·exp(−2x²/w²): 1.1·(Dx²/12)·|∂p/∂x|.
func slitTol(e, dx, w units.Length) float64 {
	x := float64(e) / float64(w)
	return 1.1 * float64(dx*dx) / 12 * 4 * math.Abs(x) / float64(w*w) * math.Sqrt(2/math.Pi) * math.Exp(-2*x*x)
}

func TestLineClip(t *testing.T) {
	// A slit on a 1-D Gaussian: ½[erf(√2(a − c)/w) + erf(√2(a + c)/w)]
	// (analytic), within slitTol; the input is not modified, and the
	// returned field carries Σt²|u|² ≤ T.
	g, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 100 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	dx := 2 * units.Micrometer
	l, err := wave.LineFromBeam(g, 1024, dx)
	if err != nil {
		t.Fatal(err)
	}
	before := append([]complex128(nil), l.U...)
	w := g.Radius()
	for _, test := range []struct{ half, c units.Length }{{w, 0}, {0.5 * w, 0.3 * w}, {1.3 * w, -0.7 * w}} {
		out, T, err := l.Clip(paraxial.SlitOfWidth(2*test.half, paraxial.Tangential).Offset(test.c, 0))
		if err != nil {
			t.Errorf("Clip(half %v, offset %v) error: %v", test.half, test.c, err)
			continue
		}
		k := math.Sqrt2 / float64(w)
		want := 0.5 * (math.Erf(k*float64(test.half-test.c)) + math.Erf(k*float64(test.half+test.c)))
		tol := slitTol(test.half-test.c, dx, w) + slitTol(test.half+test.c, dx, w)
		if !scalar.EqualWithinAbs(T, want, tol) {
			t.Errorf("Clip(half %v, offset %v): T = %.9f, want %.9f within %.2g", test.half, test.c, T, want, tol)
		}
		if p := out.Power() / l.Power(); !(p <= T) {
			t.Errorf("Clip(half %v): field power fraction %.9f exceeds T = %.9f (it carries Σt²|u|² ≤ Σt|u|²)", test.half, p, T)
		}
	}
	for i := range before {
		if l.U[i] != before[i] {
			t.Fatalf("Line.Clip modified the input at sample %d", i)
		}
	}
}

func TestMaskErrors(t *testing.T) {
	g := gaussGrid(t, 100*units.Micrometer, 100*units.Micrometer, 64, 10*units.Micrometer)
	b, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 100 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	l, _ := wave.LineFromBeam(b, 64, 10*units.Micrometer)
	nan := units.Length(math.NaN())
	// Invalid openings: no result, no sentinel.
	for _, test := range []struct {
		name string
		err  func() error
		want string
	}{
		{"zero diameter", func() error { _, _, e := g.Clip(paraxial.ClearDiameter(0)); return e },
			"wave: aperture diameter = 0 m: must be positive and finite (the zero paraxial.Opening is unlimited, which is no mask)"},
		{"negative diameter", func() error { _, _, e := g.Clip(paraxial.ClearDiameter(-50 * units.Micrometer)); return e },
			"wave: aperture diameter = -50 µm: must be positive and finite (the zero paraxial.Opening is unlimited, which is no mask)"},
		{"NaN obscuration", func() error { _, _, e := g.Obscure(paraxial.ClearDiameter(nan)); return e },
			"wave: obscuration diameter = NaN m: must be positive and finite (the zero paraxial.Opening is unlimited, which is no mask)"},
		{"NaN slit", func() error { _, _, e := l.Clip(paraxial.SlitOfWidth(nan, paraxial.Tangential)); return e },
			"wave: slit width = NaN m: must be positive and finite (the zero paraxial.Opening is unlimited, which is no mask)"},
		{"NaN offset", func() error { _, _, e := g.Clip(paraxial.ClearDiameter(1*units.Millimeter).Offset(0, nan)); return e },
			"wave: opening offset y = NaN m: must be finite"},
		{"bad shape", func() error { _, _, e := g.Clip(paraxial.Opening{Shape: 5, Radius: 1e-3}); return e },
			"wave: opening shape = 5: must be paraxial.Circle or paraxial.Slit"},
		{"bad slit plane", func() error { _, _, e := g.Clip(paraxial.SlitOfWidth(1e-3, 3)); return e },
			"wave: slit plane = 3: must be paraxial.Tangential (cuts in x) or paraxial.Sagittal (cuts in y)"},
		{"circle on a Line", func() error { _, _, e := l.Clip(paraxial.ClearDiameter(1e-3)); return e },
			"wave: opening = circle: a Line (1-D field along x) takes a slit across x, paraxial.SlitOfWidth(w, paraxial.Tangential)"},
		{"y slit on a Line", func() error { _, _, e := l.Clip(paraxial.SlitOfWidth(1e-3, paraxial.Sagittal)); return e },
			"wave: opening = slit across sagittal: a Line (1-D field along x) takes a slit across x, paraxial.SlitOfWidth(w, paraxial.Tangential)"},
		{"zero field", func() error {
			_, _, e := (wave.Grid{U: make([]complex128, 4), N: 2, Dx: 1e-6, Wavelength: 1e-6, Index: 1}).Clip(paraxial.ClearDiameter(1e-3))
			return e
		}, "wave: field = zero everywhere: has no power to transmit"},
	} {
		err := test.err()
		var we *wave.Error
		if err == nil || err.Error() != test.want || !errors.As(err, &we) || we.Err != nil {
			t.Errorf("%s: error = %v, want %q (an invalid-parameter *wave.Error)", test.name, err, test.want)
		}
	}
	// Sampling problems: the result comes with the error.
	for _, test := range []struct {
		name     string
		run      func() (int, error)
		sentinel error
		want     string
	}{
		{"pinhole of 5 samples", func() (int, error) {
			o, _, e := g.Clip(paraxial.ClearDiameter(50 * units.Micrometer))
			return len(o.U), e
		},
			wave.ErrUnresolved, "wave: aperture diameter = 50 µm: spans 5 samples of Dx = 10 µm, fewer than 8: mask under-resolved; use a finer spacing Dx"},
		{"slit of 3 samples", func() (int, error) {
			o, _, e := l.Clip(paraxial.SlitOfWidth(30*units.Micrometer, paraxial.Tangential))
			return len(o.U), e
		}, wave.ErrUnresolved, "wave: slit width = 30 µm: spans 3 samples of Dx = 10 µm, fewer than 8: mask under-resolved; use a finer spacing Dx"},
		{"iris wider than the window", func() (int, error) {
			o, _, e := g.Clip(paraxial.ClearDiameter(1 * units.Millimeter))
			return len(o.U), e
		},
			wave.ErrOutsideWindow, "wave: aperture diameter = 1 mm: reaches 500 µm from the axis, beyond the window half-width N·Dx/2 = 320 µm: mask extends beyond the window; enlarge the window"},
		{"decentred obscuration", func() (int, error) {
			o, _, e := g.Obscure(paraxial.ClearDiameter(200*units.Micrometer).Offset(0, 250*units.Micrometer))
			return len(o.U), e
		}, wave.ErrOutsideWindow, "wave: obscuration diameter = 200 µm: reaches 350 µm from the axis, beyond the window half-width N·Dx/2 = 320 µm: mask extends beyond the window; enlarge the window"},
	} {
		n, err := test.run()
		if err == nil || err.Error() != test.want || !errors.Is(err, test.sentinel) || n == 0 {
			t.Errorf("%s: error = %v (result of %d samples), want %q wrapping %v, with the result", test.name, err, n, test.want, test.sentinel)
		}
	}
	// A slit along y is not limited in y, so its length is no error.
	if _, _, err := g.Clip(paraxial.SlitOfWidth(200*units.Micrometer, paraxial.Tangential)); err != nil {
		t.Errorf("slit across x, 200 µm wide: error %v, want nil", err)
	}
}

func TestPinholeSpatialFilter(t *testing.T) {
	// A pinhole spatial filter: a collimated Gaussian (λ = 632.8 nm,
	// w = 20 Dx = 222 µm) with a weak amplitude ripple 1 + m·cos(2πx/p),
	// m = 0.1 (intensity contrast ≈ 2m = 21 %), is focused by f = 50 mm,
	// clipped by a pinhole and recollimated by a second f = 50 mm lens
	// (a 4f relay). N = 256 at critical sampling N·Dx² = λf.
	//
	//   - The ripple's ±1 orders are at x = ±λf/p in the focal plane: the
	//     back focal plane is the Fourier plane (Goodman, Introduction to
	//     Fourier Optics, ch. 5 [from memory]; the grating equation
	//     sin θ = λ/p, paraxially). Each order's focal spot is a Gaussian,
	//     so a three-point log-parabola gives its centre exactly: rel 1e-9.
	//   - The pinhole has twice the focal 1/e² diameter, D = 4w0' with
	//     w0' = λf/(πw) = 45 µm (1.5–2× is the usual choice: common
	//     practice, no single source). It passes the zeroth order,
	//     (1 − e^(−8))/(1 + m²/2) = 99.47 % of the power (analytic; the
	//     orders carry m²/2 of it), within edgeTol of its edge.
	//   - Ripple contrast, max |I/I_ref − 1| within |x| < w on y = 0, with
	//     I_ref the same beam without ripple sent through the same filter
	//     (so the pinhole's own edge diffraction cancels): for p = w/3
	//     the orders lie at 9.4 w0', far outside the pinhole, and the
	//     measured contrast falls from 0.21 to ~1e-14 (we require a factor
	//     of at least 1e6 and a throughput above 95 %). For p = 2w the
	//     orders lie at (π/2) w0', inside the pinhole radius 2w0', and pass:
	//     the contrast stays above half its input value. A pinhole of
	//     radius a removes ripple of period p < λf/a.
	const n = 256
	lambda := 632.8 * units.Nanometer
	f := 50 * units.Millimeter
	dx := units.Length(math.Sqrt(float64(lambda * f / n)))
	w := 20 * dx
	const m = 0.1
	b, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: lambda})
	w0 := units.Length(float64(lambda*f) / (math.Pi * float64(w)))
	pinhole := paraxial.ClearDiameter(4 * w0)

	input := func(p units.Length, depth float64) wave.Grid {
		g, err := wave.GridFromBeam(beam.Astigmatic{X: b, Y: b}, n, dx)
		if err != nil {
			t.Fatal(err)
		}
		for j := range n {
			for i := range n {
				x := float64(i-n/2) * float64(dx)
				g.U[j*n+i] *= complex(1+depth*math.Cos(2*math.Pi*x/float64(p)), 0)
			}
		}
		return g
	}
	step := func(g wave.Grid, err error) wave.Grid {
		t.Helper()
		if err != nil && !errors.Is(err, wave.ErrUndersampled) {
			t.Fatalf("error: %v", err)
		}
		return g
	}
	// filter returns the focal field, the pinhole's transmitted fraction
	// and the recollimated field.
	filter := func(in wave.Grid) (wave.Grid, float64, wave.Grid) {
		foc := step(step(in.ThinLens(f)).Propagate(f, wave.Paraxial))
		clipped, T, err := foc.Clip(pinhole)
		if err != nil {
			t.Fatalf("Clip error: %v", err)
		}
		out := step(step(clipped.Propagate(f, wave.Paraxial)).ThinLens(f))
		return foc, T, out
	}
	contrast := func(g, ref wave.Grid) float64 {
		a, r := g.AlongX().Irradiance(), ref.AlongX().Irradiance()
		c := 0.0
		for i := range a {
			if x := math.Abs(float64(i-n/2) * float64(dx)); x < float64(w) {
				c = math.Max(c, math.Abs(a[i]/r[i]-1))
			}
		}
		return c
	}
	smooth := input(w, 0)
	_, _, refOut := filter(smooth)
	for _, test := range []struct {
		p       units.Length
		removed bool
	}{
		{w / 3, true}, {2 * w, false},
	} {
		in := input(test.p, m)
		foc, T, out := filter(in)
		cIn, cOut := contrast(in, smooth), contrast(out, refOut)
		throughput := out.Power() / in.Power()
		t.Logf("p = %v: orders at ±%v (λf/p), pinhole T = %.5f, throughput %.5f, ripple contrast %.3g → %.3g",
			test.p, lambda*f/test.p, T, throughput, cIn, cOut)
		if !test.removed {
			if !(cOut > 0.4*cIn) {
				t.Errorf("p = %v (orders inside the pinhole): contrast %.3g → %.3g, want more than 0.4 of it to stay", test.p, cIn, cOut)
			}
			continue
		}
		// Order position in the focal plane.
		irr := foc.AlongX().Irradiance()
		x1 := float64(lambda * f / test.p)
		k := n/2 + int(math.Round(x1/float64(dx)))
		la, lb, lc := math.Log(irr[k-1]), math.Log(irr[k]), math.Log(irr[k+1])
		got := (float64(k-n/2) + 0.5*(la-lc)/(la-2*lb+lc)) * float64(dx)
		if !scalar.EqualWithinRel(got, x1, 1e-9) {
			t.Errorf("p = %v: first order at %v, want λf/p = %v", test.p, units.Length(got), units.Length(x1))
		}
		want := -math.Expm1(-8) / (1 + m*m/2)
		if tol := edgeTol(2*w0, 0, 0, dx, w0); !scalar.EqualWithinAbs(T, want, tol) {
			t.Errorf("p = %v: pinhole T = %.6f, want (1 − e^(−8))/(1 + m²/2) = %.6f within %.2g", test.p, T, want, tol)
		}
		if !(throughput > 0.95) || !(cOut < 1e-6*cIn) {
			t.Errorf("p = %v: throughput %.4f, contrast %.3g → %.3g; want > 0.95 and a drop by at least 1e6", test.p, throughput, cIn, cOut)
		}
	}
}
