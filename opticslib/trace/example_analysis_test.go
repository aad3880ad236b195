package trace_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// lens returns the plano-convex lens of reference-checks R36 (n = 1.5168,
// R = 51.68 mm, 4 mm thick), curved side first, image plane 100 mm on.
func lens() trace.System {
	const mm = units.Millimeter
	s, err := trace.New(trace.Index(1),
		trace.Surface{Label: "L1 front", Kind: trace.Refract, Radius: 51.68 * mm, Medium: trace.Index(1.5168), Thickness: 4 * mm},
		trace.Surface{Label: "L1 back", Kind: trace.Refract, Medium: trace.Index(1), Thickness: 100 * mm})
	if err != nil {
		panic(err)
	}
	return s
}

// The spot of a collimated 10 mm beam on the lens's paraxial focal plane,
// and the plane of least RMS radius, which lies before it.
func ExampleSystem_BestFocus() {
	const mm = units.Millimeter
	s := lens()
	lambda := 587.6 * units.Nanometer
	src := trace.Source{PupilRadius: 5 * mm}
	pupil := trace.PupilGrid(41)
	zp, err := s.ParaxialFocus(lambda, src)
	if err != nil {
		fmt.Println(err)
		return
	}
	sp, err := s.Spot(lambda, src, pupil, zp)
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := s.BestFocus(lambda, src, pupil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("paraxial focus z = %.4f mm: RMS %.2f µm, geometric %.2f µm, Airy %.2f µm\n",
		zp.Millimeters(), sp.RMS.Micrometers(), sp.Geometric.Micrometers(), sp.Airy.Micrometers())
	fmt.Printf("least RMS at z = %.4f mm: RMS %.2f µm\n", f.Plane.Millimeters(), f.RMS.Micrometers())
	// Output:
	// paraxial focus z = 101.3629 mm: RMS 6.85 µm, geometric 13.71 µm, Airy 7.14 µm
	// least RMS at z = 101.1808 mm: RMS 2.29 µm
}

// The longitudinal spherical aberration of the lens both ways round, and
// the third-order value from the Seidel sum (reference-checks R36: the
// curved side towards the collimated beam is about four times better).
func ExampleSystem_SphericalAberration() {
	const mm = units.Millimeter
	lambda := 587.6 * units.Nanometer
	flat, err := trace.New(trace.Index(1),
		trace.Surface{Kind: trace.Refract, Medium: trace.Index(1.5168), Thickness: 4 * mm},
		trace.Surface{Kind: trace.Refract, Radius: -51.68 * mm, Medium: trace.Index(1), Thickness: 100 * mm})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range []struct {
		name string
		s    trace.System
	}{{"curved side first", lens()}, {"flat side first", flat}} {
		la, err := c.s.SphericalAberration(lambda, 5*mm, 3)
		if err != nil {
			fmt.Println(err)
			return
		}
		sd, err := c.s.Seidel(lambda, trace.Source{PupilRadius: 5 * mm})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%s: at h = 2.5, 5 mm: %.5f, %.5f mm; third order at 5 mm %.5f mm\n", c.name,
			la.Shift[1]/1e-3, la.Shift[2]/1e-3, sd.LongitudinalSpherical().Millimeters())
	}
	// Output:
	// curved side first: at h = 2.5, 5 mm: -0.06810, -0.27298 mm; third order at 5 mm -0.27223 mm
	// flat side first: at h = 2.5, 5 mm: -0.26947, -1.08130 mm; third order at 5 mm -1.07677 mm
}

// The wavefront error of the lens at 2° field on its least-RMS plane
// for the axis, with the Strehl ratio by its three forms.
func ExampleWavefront_Strehl() {
	const mm = units.Millimeter
	s := lens()
	lambda := 587.6 * units.Nanometer
	src := trace.Source{Field: 2 * units.Degree, PupilRadius: 4 * mm}
	f, err := s.BestFocus(lambda, trace.Source{PupilRadius: 4 * mm}, trace.PupilGrid(41))
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := s.Wavefront(lambda, src, trace.PupilGrid(41), f.Plane)
	if err != nil {
		fmt.Println(err)
		return
	}
	st := w.Strehl()
	fmt.Printf("RMS %.4f λ, PV %.4f λ\n", float64(w.RMS/lambda), float64(w.PV/lambda))
	fmt.Printf("Strehl: pupil %.4f, Maréchal %.4f, exp %.4f\n", st.Pupil, st.Marechal, st.Mahajan)
	// Output:
	// RMS 0.0651 λ, PV 0.3181 λ
	// Strehl: pupil 0.8479, Maréchal 0.8328, exp 0.8461
}

// The Seidel sums of the lens at 2° field, surface by surface.
func ExampleSystem_Seidel() {
	const mm = units.Millimeter
	sd, err := lens().Seidel(587.6*units.Nanometer, trace.Source{Field: 2 * units.Degree, PupilRadius: 5 * mm})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(sd.Table().Text())
	// Output:
	// Seidel sums, λ0 = 587.6 nm
	// surface  S_I (µm)  S_II (µm)  S_III (µm)  S_IV (µm)  S_V (µm)
	// -------  --------  ---------  ----------  ---------  ---------
	// 0        1.0171    0.36713    0.13251     0.20099    0.12037
	// 1        0.34402   -0.24027   0.16781     0          -0.1172
	// sum      1.3612    0.12685    0.30032     0.20099    0.0031744
}
