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

func TestThinLensFocusesGaussian(t *testing.T) {
	// A collimated Gaussian (waist w at the lens) behind a thin lens of
	// focal length f follows the q-law 1/q → 1/q − 1/f (H. Kogelnik &
	// T. Li, "Laser beams and resonators", Appl. Opt. 5, 1550 (1966)
	// [from memory]): its new waist lies at d = f/(1 + (f/zR)²) with
	// radius w0' = (λf/(πw))/√(1 + (f/zR)²), which is the familiar
	// w0' = λf/(πw) at d = f when f ≪ zR = πw²/λ. This fixes the sign of
	// the lens phase: with exp(−ikx²/(2f)) instead of exp(+ikx²/(2f)) the
	// beam would diverge and the fields would differ at O(1).
	//
	// 1-D: N = 4096, λ = 1 µm, Dx = 5 µm, w = 128 Dx = 0.64 mm (window
	// 32 w), f = N·Dx²/λ = 102.4 mm (critical sampling, so the focus spans
	// w0' = 10.2 Dx), f/zR = 0.080. The lens multiplies by the exact phase
	// and the paraxial kernel propagates the band-limited samples exactly
	// (package doc, R15), so the field matches the q-law to rounding
	// (peak-normalised 1e-10; the q-law field itself is evaluated in
	// float64 with phases of up to k·x²/(2f) ≈ 3e3 rad at the window edge,
	// ~1e-12 rad) and the second-moment radius to rel 1e-9. The
	// thin-lens approximation λf/(πw) is checked within its own error,
	// (f/zR)²/2 = 3.2e-3, plus 1e-9.
	const n = 4096
	lambda := 1 * units.Micrometer
	dx := 5 * units.Micrometer
	f := units.Length(n) * dx * dx / lambda
	w := 128 * dx
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: lambda})
	if err != nil {
		t.Fatal(err)
	}
	in, err := wave.LineFromBeam(g, n, dx)
	if err != nil {
		t.Fatal(err)
	}
	for _, fl := range []units.Length{f, -f} {
		lensed, err := in.ThinLens(fl)
		if err != nil {
			t.Errorf("ThinLens(%v) error: %v", fl, err)
			continue
		}
		gl := g.Transform(paraxial.ThinLens(fl), 1)
		d := gl.WaistOffset() // distance from the lens to the new waist
		for _, z := range []units.Length{d, f / 2, f, 1.5 * f} {
			out, err := lensed.Propagate(z, wave.Paraxial)
			if err != nil {
				t.Errorf("f = %v: Propagate(%v) error: %v", fl, z, err)
				continue
			}
			q := gl.Transform(paraxial.Space(z), 1)
			want, err := wave.LineFromBeam(q, n, dx)
			if err != nil {
				t.Fatal(err)
			}
			// LineFromBeam is normalised to unit amplitude at the new
			// waist, with the phase relative to it; the FFT field keeps
			// the input's power and phase reference. Compare the shapes
			// (one complex factor), and the power separately.
			c := out.U[n/2] / want.U[n/2]
			for i := range want.U {
				want.U[i] *= c
			}
			if p0, p1 := in.Power(), out.Power(); !scalar.EqualWithinRel(p1, p0, 1e-12) {
				t.Errorf("f = %v, z = %v: power %.15g, want %.15g (conserved)", fl, z, p1, p0)
			}
			if dd, _ := out.MaxDiff(want); !(dd <= 1e-10) {
				t.Errorf("f = %v, z = %v: max |u − u_q|/peak = %.3g, want ≤ 1e-10 (q-law)", fl, z, dd)
			}
			if got, wq := out.SecondMomentRadius(), q.Radius(); !scalar.EqualWithinRel(float64(got), float64(wq), 1e-9) {
				t.Errorf("f = %v, z = %v: second-moment radius %v, q-law %v", fl, z, got, wq)
			}
		}
		if fl < 0 {
			if d > 0 {
				t.Errorf("f = %v: waist offset %v, want a virtual waist before the lens (d < 0)", fl, d)
			}
			continue
		}
		// Converging lens: the waist is near f, and its radius is λf/(πw).
		focus, _ := lensed.Propagate(d, wave.Paraxial)
		w0 := float64(focus.SecondMomentRadius())
		ff := float64(f / g.RayleighRange())
		if approx := float64(lambda*f) / (math.Pi * float64(w)); !scalar.EqualWithinRel(w0, approx, ff*ff/2+1e-9) {
			t.Errorf("focal waist %.6g µm, want λf/(πw) = %.6g µm within (f/zR)²/2 = %.2g", w0*1e6, approx*1e6, ff*ff/2)
		}
		if rel := math.Abs(float64(d-f)) / float64(f); rel > ff*ff {
			t.Errorf("waist at %v, want near f = %v (within (f/zR)² = %.2g)", d, f, ff*ff)
		}
		// The waist is a minimum of the FFT radius.
		for _, dz := range []units.Length{-f / 50, f / 50} {
			o, _ := lensed.Propagate(d+dz, wave.Paraxial)
			if !(float64(o.SecondMomentRadius()) > w0) {
				t.Errorf("radius at d%+v = %v, want > waist %v", dz, o.SecondMomentRadius(), units.Length(w0))
			}
		}
	}
}

func TestThinLensGrid(t *testing.T) {
	// 2-D: an elliptical collimated beam (wx = 0.4 mm, wy = 0.25 mm,
	// λ = 633 nm) behind f = 150 mm, at f: the q-law radii of each plane
	// (Kogelnik & Li 1966). N = 256 at critical sampling N·Dx² = λf
	// (Dx = 19.2 µm, window 4.9 mm ≥ 12 wx); rel 1e-9 as in 1-D.
	const n = 256
	lambda := 633 * units.Nanometer
	f := 150 * units.Millimeter
	dx := units.Length(math.Sqrt(float64(lambda * f / n)))
	gx, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * units.Millimeter, Wavelength: lambda})
	gy, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.25 * units.Millimeter, Wavelength: lambda})
	in, err := wave.GridFromBeam(beam.Astigmatic{X: gx, Y: gy}, n, dx)
	if err != nil {
		t.Fatal(err)
	}
	lensed, err := in.ThinLens(f)
	if err != nil {
		t.Fatalf("ThinLens error: %v", err)
	}
	out, err := lensed.Propagate(f, wave.Paraxial)
	if err != nil {
		t.Fatalf("Propagate error: %v", err)
	}
	m := paraxial.ThinLens(f).Then(paraxial.Space(f))
	wx, wy := out.SecondMomentRadii()
	qx, qy := gx.Transform(m, 1).Radius(), gy.Transform(m, 1).Radius()
	if !scalar.EqualWithinRel(float64(wx), float64(qx), 1e-9) || !scalar.EqualWithinRel(float64(wy), float64(qy), 1e-9) {
		t.Errorf("focal radii (%v, %v), q-law (%v, %v)", wx, wy, qx, qy)
	}
	// The input is not modified.
	if d, _ := in.MaxDiff(func() wave.Grid { g, _ := wave.GridFromBeam(beam.Astigmatic{X: gx, Y: gy}, n, dx); return g }()); d != 0 {
		t.Errorf("ThinLens modified its input (max |Δu| = %g)", d)
	}
}

func TestThinLensSampling(t *testing.T) {
	// The lens phase k x²/(2f) has the local frequency x/(λf) (n = 1),
	// which aliases once it passes the Nyquist frequency 1/(2Dx) inside
	// the field (Goodman, Introduction to Fourier Optics, ch. 5 [from
	// memory]; the condition is the sampling theorem applied to the
	// lens's chirp). A Gaussian w = 100 µm sampled at Dx = 5 µm has
	// |u| > EdgeLimit = 1e-4 out to 60 Dx = 300 µm (e^(−9) = 1.2e-4,
	// e^(−9.3) < 1e-4), so the limit is λ|f|/(2·300 µm): 3.333 µm for
	// f = 2 mm (aliased) and 16.67 µm for f = 10 mm (fine). The error
	// names f, Dx and the limit, wraps ErrUndersampled and comes with
	// the result. f = ±Inf is no lens.
	g, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 100 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	in, err := wave.LineFromBeam(g, 512, 5*units.Micrometer)
	if err != nil {
		t.Fatal(err)
	}
	out, err := in.ThinLens(-2 * units.Millimeter)
	want := "wave: focal length f = -2 mm: lens phase aliases: Dx = 5 µm exceeds λ0|f|/(2n·x_max) = 3.33333 µm " +
		"(field extent x_max = 300 µm): field spectrum reaches the Nyquist frequency (aliasing); use a finer spacing Dx"
	if err == nil || err.Error() != want {
		t.Errorf("ThinLens(-2 mm) error = %v, want %q", err, want)
	}
	if !errors.Is(err, wave.ErrUndersampled) || len(out.U) != len(in.U) {
		t.Errorf("ThinLens(-2 mm): errors.Is(err, ErrUndersampled) = %v, len(result) = %d, want true, %d", errors.Is(err, wave.ErrUndersampled), len(out.U), len(in.U))
	}
	if _, err := in.ThinLens(10 * units.Millimeter); err != nil {
		t.Errorf("ThinLens(10 mm) error = %v, want nil", err)
	}
	for _, f := range []units.Length{units.Length(math.Inf(1)), units.Length(math.Inf(-1))} {
		out, err := in.ThinLens(f)
		if d, _ := out.MaxDiff(in); err != nil || d != 0 {
			t.Errorf("ThinLens(%v) = max |Δu| %g, error %v; want the input unchanged", f, d, err)
		}
	}
	gr, _ := wave.GridFromBeam(beam.Astigmatic{X: g, Y: g}, 128, 5*units.Micrometer)
	if _, err := gr.ThinLens(2 * units.Millimeter); !errors.Is(err, wave.ErrUndersampled) {
		t.Errorf("Grid.ThinLens(2 mm) error = %v, want ErrUndersampled", err)
	}
	for _, test := range []struct {
		f    units.Length
		want string
	}{
		{0, "wave: focal length f = 0 m: must be nonzero and not NaN (±Inf is no lens)"},
		{units.Length(math.NaN()), "wave: focal length f = NaN m: must be nonzero and not NaN (±Inf is no lens)"},
	} {
		_, e1 := in.ThinLens(test.f)
		_, e2 := gr.ThinLens(test.f)
		for _, err := range []error{e1, e2} {
			var we *wave.Error
			if err == nil || err.Error() != test.want || !errors.As(err, &we) || we.Err != nil {
				t.Errorf("ThinLens(%v) error = %v, want %q (no sentinel)", test.f, err, test.want)
			}
		}
	}
}
