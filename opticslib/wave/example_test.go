package wave_test

// Examples of the FFT propagators. Where each printed value can be checked
// against an outside reference, and which are regression values of this
// library:
//
//   - The q-law radii are w0·√(1 + (z/zR)²) of H. Kogelnik & T. Li,
//     "Laser beams and resonators", Appl. Opt. 5, 1550 (1966); at z = 3zR
//     this is √10 · 50 µm = 158.1139 µm.
//   - ExampleGrid_Propagate, FFT radii: the paraxial kernel is the exact
//     propagator of the paraxial wave equation (J. W. Goodman,
//     Introduction to Fourier Optics, ch. 3–4 [from memory];
//     reference-checks R15), so for a well-sampled Gaussian it must give
//     the q-law radii, as it does to the printed digits.
//   - ExampleLine_Propagate, FFT radius 158.1160 µm (exact kernel): a
//     regression value of this library. Its excess over the q-law, 1.3e-5,
//     has the size θ0²/3 = 1.35e-5 (θ0 = λ/(πw0)) that reference-checks
//     R15 gives for the non-paraxial spread; that is an estimate from a
//     reference computation, not a published value.
//
// The propagators themselves are cross-checked against numpy.fft in
// crosscheck_test.go.

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

func ExampleLine_Propagate() {
	// Check the q-law against an FFT propagation over 3 Rayleigh ranges.
	// The exact kernel is 1.3e-5 wider: non-paraxial physics, θ0²/3.
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 50 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	in, err := wave.LineFromBeam(g, 2048, 4*units.Millimeter/2048)
	if err != nil {
		fmt.Println(err)
		return
	}
	z := 3 * g.RayleighRange()
	out, err := in.Propagate(z, wave.Exact)
	if err != nil {
		fmt.Println(err)
		return
	}
	q := g.Transform(paraxial.Space(z), 1)
	fmt.Printf("FFT second-moment radius %.4f µm, q-law %.4f µm\n",
		out.SecondMomentRadius().Micrometers(), q.Radius().Micrometers())
	// Output:
	// FFT second-moment radius 158.1160 µm, q-law 158.1139 µm
}

func ExampleGrid_Propagate() {
	// An elliptical beam (w0x = 40 µm, w0y = 80 µm, λ = 1 µm) over 20 mm:
	// the FFT second-moment radii against the q-law of each plane.
	gx, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 40 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	gy, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 80 * units.Micrometer, Wavelength: 1 * units.Micrometer})
	in, err := wave.GridFromBeam(beam.Astigmatic{X: gx, Y: gy}, 256, 8*units.Micrometer)
	if err != nil {
		fmt.Println(err)
		return
	}
	z := 20 * units.Millimeter
	out, err := in.Propagate(z, wave.Paraxial)
	if err != nil {
		fmt.Println(err)
		return
	}
	wx, wy := out.SecondMomentRadii()
	qx, qy := gx.Transform(paraxial.Space(z), 1), gy.Transform(paraxial.Space(z), 1)
	fmt.Printf("FFT %.3f × %.3f µm, q-law %.3f × %.3f µm\n",
		wx.Micrometers(), wy.Micrometers(), qx.Radius().Micrometers(), qy.Radius().Micrometers())
	// Output:
	// FFT 164.105 × 112.839 µm, q-law 164.105 × 112.839 µm
}
