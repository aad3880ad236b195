package wave_test

// Examples of clipped beams. The printed values are checked against
// outside references in the tests:
//
//   - ExampleGrid_Clip: the transmitted fraction against 1 − e^(−2a²/w²)
//     (analytic, Siegman, Lasers, §17.1 [from memory]) and the focal peak
//     against (1 − e^(−a²/w²))², from the Fourier–Bessel focal integral
//     (P. Belland & J. P. Crenn, Appl. Opt. 21, 522 (1982) [from
//     memory]); aperture_crosscheck_test.go compares the whole focal
//     profile, the first minimum and the encircled power with
//     scipy.integrate.quad. Here N = 256 (coarser than the cross-check,
//     to keep the example fast), which still agrees to the printed digits.
//   - ExampleGrid_Clip_pinholeFilter: the order position λf/p (Fourier
//     plane of the lens, Goodman, Introduction to Fourier Optics, ch. 5
//     [from memory]); the pinhole size (twice the focal 1/e² diameter)
//     is common practice, no single source; the throughput and contrast
//     are values of this library, tested in TestPinholeSpatialFilter.

import (
	"errors"
	"fmt"
	"math"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
	"github.com/beamnote/beamnote/opticslib/wave"
)

func ExampleGrid_Clip() {
	// A collimated 1064 nm beam, w = 0.5 mm, through an iris of 1 mm
	// diameter (a/w = 1), focused by f = 100 mm; beside it, the unclipped
	// Gaussian focus. Critical sampling N·Dx² = λf makes the focal plane's
	// spacing equal Dx.
	lambda, f, w := 1064*units.Nanometer, 100*units.Millimeter, 0.5*units.Millimeter
	const n = 256
	dx := units.Length(math.Sqrt(float64(lambda * f / n)))
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: lambda})
	if err != nil {
		fmt.Println(err)
		return
	}
	in, err := wave.GridFromBeam(beam.Astigmatic{X: g, Y: g}, n, dx)
	if err != nil {
		fmt.Println(err)
		return
	}
	clipped, T, err := in.Clip(paraxial.ClearDiameter(1 * units.Millimeter))
	if err != nil {
		fmt.Println(err)
		return
	}
	lensed, err := clipped.ThinLens(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	// A hard edge always reaches the Nyquist frequency, so Propagate
	// reports ErrUndersampled with its result; at this sampling the focus
	// is still good to ~1e-4 of its peak (aperture_crosscheck_test.go).
	focus, err := lensed.Propagate(f, wave.Paraxial)
	if err != nil && !errors.Is(err, wave.ErrUndersampled) {
		fmt.Println(err)
		return
	}
	// The unclipped focus: the q-law radius at f and its peak for the
	// same input power.
	wf := g.Transform(paraxial.ThinLens(f).Then(paraxial.Space(f)), 1).Radius()
	_, _, peak := focus.Peak()
	ring, err := focus.AlongX().FirstMinimum()
	if err != nil {
		fmt.Println(err)
		return
	}
	inside, err := focus.EncircledPower(ring)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("iris passes %.2f %% (1 − e^−2 = %.2f %%)\n", 100*T, -100*math.Expm1(-2))
	fmt.Printf("unclipped focus: w = %.1f µm\n", wf.Micrometers())
	fmt.Printf("clipped focus: peak %.4f of the unclipped one ((1 − e^−1)² = %.4f)\n",
		peak/beam.PeakIrradiance(in.Power(), wf, wf), math.Expm1(-1)*math.Expm1(-1))
	fmt.Printf("first dark ring at r = %.0f µm, %.1f %% of the passed power inside\n",
		ring.Micrometers(), 100*inside/(T*in.Power()))
	// Output:
	// iris passes 86.45 % (1 − e^−2 = 86.47 %)
	// unclipped focus: w = 67.7 µm
	// clipped focus: peak 0.3995 of the unclipped one ((1 − e^−1)² = 0.3996)
	// first dark ring at r = 152 µm, 95.5 % of the passed power inside
}

func ExampleGrid_Clip_pinholeFilter() {
	// A HeNe beam (w = 0.22 mm) with a 10 % amplitude ripple of period
	// p = w/3 is focused by f = 50 mm onto a pinhole of twice the focal
	// 1/e² diameter and recollimated by a second 50 mm lens.
	lambda, f := 632.8*units.Nanometer, 50*units.Millimeter
	const n = 256
	dx := units.Length(math.Sqrt(float64(lambda * f / n)))
	w := 20 * dx
	p := w / 3
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: w, Wavelength: lambda})
	if err != nil {
		fmt.Println(err)
		return
	}
	smooth, err := wave.GridFromBeam(beam.Astigmatic{X: g, Y: g}, n, dx)
	if err != nil {
		fmt.Println(err)
		return
	}
	rippled := wave.Grid{U: make([]complex128, n*n), N: n, Dx: dx, Wavelength: lambda, Index: 1}
	for j := range n {
		for i := range n {
			x := float64(i-n/2) * float64(dx)
			rippled.U[j*n+i] = smooth.U[j*n+i] * complex(1+0.1*math.Cos(2*math.Pi*x/float64(p)), 0)
		}
	}
	w0 := units.Length(float64(lambda*f) / (math.Pi * float64(w))) // focal 1/e² radius
	pinhole := paraxial.ClearDiameter(4 * w0)
	// filter returns the focal field, the pinhole's transmission and the
	// recollimated field. ErrUndersampled from the pinhole's hard edge
	// comes with a usable result (see ExampleGrid_Clip).
	filter := func(in wave.Grid) (focus wave.Grid, T float64, out wave.Grid, err error) {
		ok := func(e error) bool { return e == nil || errors.Is(e, wave.ErrUndersampled) }
		l, err := in.ThinLens(f)
		if !ok(err) {
			return
		}
		if focus, err = l.Propagate(f, wave.Paraxial); !ok(err) {
			return
		}
		c, T, err := focus.Clip(pinhole)
		if err != nil {
			return
		}
		if out, err = c.Propagate(f, wave.Paraxial); !ok(err) {
			return
		}
		out, err = out.ThinLens(f)
		if !ok(err) {
			return
		}
		return focus, T, out, nil
	}
	// contrast is the largest |I/I_ref − 1| on the x axis within |x| < w.
	contrast := func(a, ref wave.Grid) float64 {
		ia, ir := a.AlongX().Irradiance(), ref.AlongX().Irradiance()
		c := 0.0
		for i := range ia {
			if math.Abs(float64(i-n/2)*float64(dx)) < float64(w) {
				c = math.Max(c, math.Abs(ia[i]/ir[i]-1))
			}
		}
		return c
	}
	focus, T, out, err := filter(rippled)
	if err != nil {
		fmt.Println(err)
		return
	}
	_, _, ref, err := filter(smooth)
	if err != nil {
		fmt.Println(err)
		return
	}
	// The first diffraction order: the brightest sample beyond the
	// pinhole, refined by a parabola through the logarithms of it and its
	// neighbours (exact for the order's Gaussian spot).
	cut := focus.AlongX()
	irr := cut.Irradiance()
	k := 0
	for i, v := range irr {
		if cut.X(i) > 2*w0 && v > irr[k] {
			k = i
		}
	}
	a, b, c := math.Log(irr[k-1]), math.Log(irr[k]), math.Log(irr[k+1])
	order := cut.X(k) + units.Length(0.5*(a-c)/(a-2*b+c))*dx
	fmt.Printf("first order at %.0f µm (λf/p = %.0f µm), pinhole %.0f µm\n",
		order.Micrometers(), (lambda * f / p).Micrometers(), pinhole.Diameter().Micrometers())
	fmt.Printf("pinhole passes %.2f %%, relay throughput %.2f %%\n", 100*T, 100*out.Power()/rippled.Power())
	fmt.Printf("ripple contrast %.1f %% before, %.4f %% after\n", 100*contrast(rippled, smooth), 100*contrast(out, ref))
	// Output:
	// first order at 427 µm (λf/p = 427 µm), pinhole 181 µm
	// pinhole passes 99.46 %, relay throughput 99.45 %
	// ripple contrast 21.0 % before, 0.0000 % after
}
