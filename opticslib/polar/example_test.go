package polar_test

// Examples of Jones calculus. Where each printed value can be checked
// against an outside reference, and which values are this library's own:
//
//   - ExampleHalfWaveForSplit: the plate angle θ = (ψ + ½ acos(2f − 1))/2
//     is the closed form of the half-wave rule (Goldstein, Polarized
//     Light, 3rd ed. [from memory]) with Malus's law: for f = 0.25 from light at 90°,
//     ψ' = ½ acos(−0.5) = 60° and θ = (90° + 60°)/2 = 75° ≡ −15° (mod 90°).
//     The port powers follow from cos²60° = 0.25 and sin²60° = 0.75 with
//     the leaks 1/ER of the splitter's extinction ratios: 400 mW ×
//     (0.25 + 0.75/1000) = 100.3 mW and 400 mW × (0.75 + 0.25/100) =
//     301.0 mW; the leaked s light turns the probe's azimuth to
//     atan(tan 60°/√1000) = 3.14°. The bench, its names and the table
//     layout are invented for the example.
//   - ExampleInterface: R39 of reference-checks (Born & Wolf §1.5.2 [from
//     memory]): Brewster's angle 56.31° for n = 1.5 with Rp = 0, and the
//     transmittance of the s component.
//   - ExampleQuarterWaveForCircular: R39 (a quarter-wave plate at 45° to
//     linear light gives |S3/S0| = 1), with the package's handedness.

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

func ExampleHalfWaveForSplit() {
	// Bench "Larkspur": a 400 mW source polarized vertically (along y)
	// feeds plate H1 and splitter S1; the probe arm takes S1's transmitted
	// (p) port and should get 25 % of the light, the heater arm the rest.
	// The Jones vector is normalised so that |Ex|² + |Ey|² is the power
	// in W.
	source, err := polar.Linear(90*units.Degree, 0.400)
	if err != nil {
		fmt.Println(err)
		return
	}
	theta, err := polar.HalfWaveForSplit(source, 0.25)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("H1 fast axis at %.2f°\n", theta.Degrees())

	h1, err := polar.HalfWave(theta)
	if err != nil {
		fmt.Println(err)
		return
	}
	s1, err := polar.PolarizingBeamSplitter(1000, 100) // Tp:Ts 1000:1, Rs:Rp 100:1
	if err != nil {
		fmt.Println(err)
		return
	}
	probe, err := polar.Trace(source,
		polar.Element{Name: "H1", Matrix: h1},
		polar.Element{Name: "S1 to probe", Matrix: s1.Transmitted})
	if err != nil {
		fmt.Println(err)
		return
	}
	heater, err := polar.Trace(source,
		polar.Element{Name: "H1", Matrix: h1},
		polar.Element{Name: "S1 to heater", Matrix: s1.Reflected})
	if err != nil {
		fmt.Println(err)
		return
	}
	probe.PowerUnit = "W"
	fmt.Print(probe.Table())
	fmt.Printf("probe %.1f mW, heater %.1f mW\n", 1e3*probe.Output().Power(), 1e3*heater.Output().Power())
	// Output:
	// H1 fast axis at -15.00°
	// Power and polarization after each element
	// after        power (W)  of input (%)  transmission (%)  azimuth ψ (°)  ellipticity χ (°)  state
	// -----------  ---------  ------------  ----------------  -------------  -----------------  ------
	// input        0.4        100.000                         90.00          0.00               linear
	// H1           0.4        100.000       100.000           60.00          0.00               linear
	// S1 to probe  0.1003     25.075        25.075            3.14           0.00               linear
	// probe 100.3 mW, heater 301.0 mW
}

func ExampleInterface() {
	// An uncoated window of index 1.5 tilted to Brewster's angle.
	b, err := polar.Brewster(1, 1.5)
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := polar.Interface(1, 1.5, b)
	if err != nil {
		fmt.Println(err)
		return
	}
	rs, rp := f.Reflectance()
	fmt.Printf("Brewster %.4f°: Rs = %.4f, Rp = %.1g\n", b.Degrees(), rs, rp)
	fmt.Print(f.Table())
	// Output:
	// Brewster 56.3099°: Rs = 0.1479, Rp = 0
	// Fresnel coefficients, n1 = 1 → n2 = 1.5 at θi = 56.310°
	// component  |r|       arg r (°)  R         |t|       T
	// ---------  --------  ---------  --------  --------  --------
	// s          0.384615  180.000    0.147929  0.615385  0.852071
	// p          0.000000  0.000      0.000000  0.666667  1.000000
}

func ExampleQuarterWaveForCircular() {
	x, err := polar.Linear(0, 1)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, h := range []polar.Handedness{polar.Right, polar.Left} {
		theta, err := polar.QuarterWaveForCircular(x, h)
		if err != nil {
			fmt.Println(err)
			return
		}
		q, err := polar.QuarterWave(theta)
		if err != nil {
			fmt.Println(err)
			return
		}
		s := q.Apply(x).Stokes()
		fmt.Printf("%s: fast axis %.0f°, S3/S0 = %+.3f\n", h, theta.Degrees(), s.S3/s.S0)
	}
	// Output:
	// right: fast axis 45°, S3/S0 = +1.000
	// left: fast axis -45°, S3/S0 = -1.000
}
