package measure_test

// Examples of caustic fits. The scan is invented: widths generated from a
// known beam (1550 nm; x: w0 = 85 µm at 118 mm, M² = 1.15; y: w0 = 92 µm
// at 124 mm, M² = 1.25) with 0.6 % noise, rounded to 1 µm. Where the
// printed values come from:
//
//   - ExampleFitCaustic: the fitted values are regression values of this
//     library; they agree with the generating beam within two of their
//     printed uncertainties, and the fit itself is checked against ISO 11146-1's
//     formulas (TestFitCausticNoiseFreeR16) and against SciPy's curve_fit
//     (TestCrossCheckCaustic). The plane counts follow the R17 rule
//     (TestCheckPlanesR17).
//   - ExampleCausticFit_PropagateWaist: the output waist follows from
//     S. A. Self, Appl. Opt. 22, 658 (1983) for the fitted input beam
//     (s = 332.06 mm, f = 100 mm, zR = 12.65 mm give 142.96 mm after L2;
//     TestPropagateWaistReferences); its uncertainty is a regression
//     value, the method checked statistically in
//     TestPropagateWaistStatistics.
//   - ExampleProposePlanes: five planes at ±0.8, ±0.4 and 0 zR and five in
//     2.2 … 5 zR, rounded to 2 mm: this package's reading of ISO 11146-1's
//     rule (reference-checks R17).

import (
	"fmt"
	"strings"

	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// causticFocusScan is a camera scan through the focus of a 200 mm lens on a
// 250 mm rail (invented data, see above).
const causticFocusScan = `# Invented demonstration data: D4σ diameters from the camera's second-moment analysis
# z on the rail scale
z_mm,dx_um,dy_um
60,793,877
75,602,684
90,412,486
112,189,245
116,174,212
120,171,194
124,187,185
128,214,193
160,586,516
180,850,776
`

func ExampleFitCaustic() {
	scan, err := measure.ReadWidthScan(strings.NewReader(causticFocusScan), "focus-scan.csv", measure.SecondMomentWidths)
	if err != nil {
		fmt.Println(err)
		return
	}
	fit, err := measure.FitCaustic(scan, measure.CausticOptions{Wavelength: 1550 * units.Nanometer, RailMax: 250 * units.Millimeter})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, a := range fit.Axes() {
		fmt.Printf("%s: w0 = %v at %v, zR = %v, M² = %v, planes %d within zR / %d beyond 2zR\n",
			a.Axis, a.W0, a.Z0, a.RayleighRange, a.M2, a.Check.Inside, a.Check.Outside)
	}
	fmt.Println(fit.Weighting, "/ scaled by the residuals:", fit.Scaled)
	fmt.Println("warnings:", len(fit.Warnings))
	// Output:
	// x: w0 = 84.7 ± 1.3 µm at 117.937 ± 0.054 mm, zR = 12.65 ± 0.20 mm, M² = 1.151 ± 0.017, planes 5 within zR / 5 beyond 2zR
	// y: w0 = 91.7 ± 1.4 µm at 123.897 ± 0.064 mm, zR = 13.66 ± 0.22 mm, M² = 1.248 ± 0.018, planes 5 within zR / 5 beyond 2zR
	// unweighted least squares on d² (ISO 11146-1) / scaled by the residuals: true
	// warnings: 0
}

func ExampleCausticFit_PropagateWaist() {
	scan, err := measure.ReadWidthScan(strings.NewReader(causticFocusScan), "focus-scan.csv", measure.SecondMomentWidths)
	if err != nil {
		fmt.Println(err)
		return
	}
	fit, err := measure.FitCaustic(scan, measure.CausticOptions{Wavelength: 1550 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	// The design: the beam is picked up 300 mm along the rail, re-focused
	// by a 100 mm lens 150 mm further on, into a fibre coupler.
	mm := units.Millimeter
	sys, err := paraxial.NewBuilder().Space(150 * mm).ThinLens(100 * mm).Label("L2").Space(250 * mm).Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	w, err := fit.PropagateWaist(sys, 300*mm, measure.PropagationOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(w.Table())
	l2, err := sys.Part("L2")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("x waist after L2:", measure.Uncertain[units.Length]{Value: w.X.Z.Value - l2.End, Sigma: w.X.Z.Sigma})
	// The design starts from the measured beam: an ordinary beam.Input.
	in, err := fit.Beam(300 * mm)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%T\n", in)
	// Output:
	// Output waist from the caustic fit of focus-scan.csv entering at z = 300 mm on the scan's axis; uncertainty by linearised propagation of the fit covariance (numerical Jacobian)
	// axis  waist z from the input (mm)  after the system (mm)  w0 (µm)       zR (mm)
	// ----  ---------------------------  ---------------------  ------------  -------------
	// x     292.964 ± 0.011              -107.036 ± 0.011       36.46 ± 0.55  2.342 ± 0.037
	// y     294.067 ± 0.013              -105.933 ± 0.013       40.48 ± 0.61  2.662 ± 0.043
	// x waist after L2: 142.964 ± 0.011 mm
	// beam.Astigmatic
}

func ExampleProposePlanes() {
	// Where to measure next, for a waist near 152 mm with zR ≈ 20 mm, on a
	// rail from 0 to 300 mm.
	planes := measure.ProposePlanes(152*units.Millimeter, 20*units.Millimeter, 0, 300*units.Millimeter)
	fmt.Println(planes)
	c := measure.CheckPlanes(planes, 152*units.Millimeter, 20*units.Millimeter)
	fmt.Println(c.Inside, "within zR,", c.Outside, "beyond 2zR, rule met:", c.OK())
	// Output:
	// [62 mm 80 mm 98 mm 136 mm 144 mm 152 mm 160 mm 168 mm 210 mm 238 mm]
	// 5 within zR, 5 beyond 2zR, rule met: true
}
