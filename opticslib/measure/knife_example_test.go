package measure_test

// Examples of knife-edge scans. Where the printed values come from:
//
//   - ExampleKnifeClipDistance: the clip distances of reference-checks R18
//     (TestKnifeClipDistanceR18 checks them against R18 and the normal
//     quantile).
//   - ExampleKnifeEdgeFromScan: the readings are invented, drawn once from
//     the erf model with w = 850 µm, x0 = 12.43 mm, P0 = 0.8 mV, Pmax =
//     411.5 mV and 0.9 mV of noise, rounded to 0.1 mV. The printed
//     results are regression values of this library; the methods behind
//     them are checked against the definition of the TEM₀₀ beam and
//     against SciPy in knife_test.go and knife_crosscheck_test.go. The fit
//     and the inversion lie within one uncertainty of the w the readings
//     were drawn with, the clip rule within two (its linear interpolation
//     over steps of 0.12 w alone adds up to 0.7 %).

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleKnifeClipDistance() {
	// The 10–90 % distance of a TEM₀₀ beam, and the 1/e² radius and
	// diameter it gives for a measured distance of 1 mm.
	d := measure.KnifeClipDistance(0.1, 0.9)
	fmt.Printf("10–90 %%: %.6f w; w = %.6f mm, 2w = %.6f mm for 1 mm\n", d, 1/d, 2/d)
	fmt.Printf("16–84 %%: %.6f w, 5–95 %%: %.6f w\n", measure.KnifeClipDistance(0.16, 0.84), measure.KnifeClipDistance(0.05, 0.95))
	// Output:
	// 10–90 %: 1.281552 w; w = 0.780304 mm, 2w = 1.560608 mm for 1 mm
	// 16–84 %: 0.994458 w, 5–95 %: 1.644854 w
}

func ExampleKnifeEdgeFromScan() {
	// The alignment beam of the interferometer bench, 40 cm after its
	// expander: a razor blade on a micrometre stage moves into the beam
	// in 0.1 mm steps from 10.4 mm to 14.4 mm, and the photodiode behind
	// it reads mV. The blade covers the beam as x increases.
	readings := []float64{
		410.9, 410.6, 411.8, 413.9, 412.7, 412.4, 411.8, 411.7, 411.9, 410.9,
		408.8, 406.7, 402.2, 395.4, 385.5, 366.7, 348.0, 322.7, 292.2, 256.8,
		217.7, 180.6, 142.3, 108.3, 80.6, 54.8, 39.2, 23.2, 15.9, 8.9,
		6.0, 3.3, 1.2, 2.2, 0.7, 1.1, 2.3, 0.9, 0.0, -0.9, 1.2,
	}
	scan := measure.KnifeScan{Powers: readings}
	for i := range readings {
		scan.Positions = append(scan.Positions, 10.4*units.Millimeter+units.Length(i)*0.1*units.Millimeter)
	}
	k, err := measure.KnifeEdgeFromScan(scan)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("erf fit:    w = %v\n", k.Radius)
	fmt.Printf("inversion:  w = %v (%d points)\n", k.Inversion.Radius, k.Inversion.Points)
	fmt.Printf("10–90 %%:    w = %v\n", k.Clip.Radius)
	fmt.Printf("edge at %.3f mm, Pmax = %.1f mV over P0 = %.1f mV, residual RMS %.2f mV\n",
		k.Center.Value.Millimeters(), k.Power.Value, k.Background.Value, k.ResidualRMS)
	fmt.Printf("the edge is %v the beam; radii within %.1f σ; %d warnings\n", k.Direction, k.Discrepancy, len(k.Warnings))
	// Output:
	// erf fit:    w = 848.2 ± 3.0 µm
	// inversion:  w = 848.6 ± 3.8 µm (14 points)
	// 10–90 %:    w = 863.5 ± 6.8 µm
	// edge at 12.431 mm, Pmax = 411.4 mV over P0 = 0.8 mV, residual RMS 0.88 mV
	// the edge is covering the beam; radii within 2.1 σ; 0 warnings
}
