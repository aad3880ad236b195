package optplot_test

// Examples of the cavity, polarization and coupling figures on invented
// parts; they print what was drawn (captions, titles), not optics. Where
// a printed number can be checked outside this library:
//
//   - The plano-concave cavity (flat mirror, R = 500 mm, d = 100 mm,
//     99.9 %): g1 = 1, g2 = 1 − d/R = 0.8; FSR = c/2d = 1.499 GHz; the
//     exact Airy finesse π/(2 arcsin((1 − R)/(2√R))) = 3140, linewidth
//     FSR/𝓕 = 477.4 kHz; TEM01 at arccos(√(g1g2))/π = 0.1476 FSR
//     (Kogelnik & Li, Appl. Opt. 5, 1550 (1966) [from memory for the
//     equation numbers]), 221.2 MHz; the off-resonance floor
//     ((1 − R)/(1 + R))² = 2.5e-7 (Born & Wolf §7.6 [from memory]),
//     −66.0 dB.
//   - The 1 dB offset tolerance of two equal waists w at a common plane
//     is w·√(ln 10^0.1) = 0.480 w (R40 of the project's reference
//     checks): 1.27 µm for w = 2.65 µm; the tilt tolerance is 0.480 θ0,
//     θ0 = λ/(πw) = 93.7 mrad at 780 nm, 45.0 mrad.

import (
	"fmt"
	"strings"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// referenceCavity is a 1064 nm plano-concave cavity: a flat and a
// 500 mm concave mirror, 100 mm apart, both 99.9 %.
func referenceCavity() (cavity.Cavity, error) {
	return cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Label: "flat", Reflectivity: 0.999},
		M2:         cavity.Mirror{Label: "curved", Shape: cavity.Concave, Radius: 500 * units.Millimeter, Reflectivity: 0.999},
		Spacing:    100 * units.Millimeter,
		Wavelength: 1064 * units.Nanometer,
	})
}

// The stability diagram of the reference cavity: the design sits near
// the planar corner of the stable region.
func ExampleStability() {
	c, err := referenceCavity()
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.Stability(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f.Caption[strings.Index(f.Caption, "Design"):])
	// Output:
	// Design: g1 = 1.000, g2 = 0.800 (g1·g2 = 0.800), stable.
}

// The transmission of the reference cavity over one free spectral range,
// in dB, with its transverse modes; and the error for a cavity that has
// no modes.
func ExampleCavityTransmission() {
	c, err := referenceCavity()
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.CavityTransmission(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range strings.SplitAfter(f.Caption, ". ")[1:3] {
		fmt.Println(strings.TrimSpace(s))
	}
	unstable, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Reflectivity: 0.999},
		M2:         cavity.Mirror{Shape: cavity.Concave, Radius: 50 * units.Millimeter, Reflectivity: 0.999},
		Spacing:    100 * units.Millimeter,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	_, err = optplot.CavityTransmission(unstable)
	fmt.Println(err)
	// Output:
	// FSR 1.499 GHz, linewidth 477.4 kHz FWHM (finesse 3140); off-resonance floor 1/(1 + F) = -66.0 dB.
	// Nearest transverse mode to TEM00: m+n=1 at 221.2 MHz (0.1476 FSR, 463 linewidths).
	// optplot: CavityTransmission: cavity: tangential plane: half-trace (A + D)/2 = -3: |A + D|/2 > 1: unstable: no confined Gaussian mode (unstable or on the stability boundary)
}

// The eigenmode of the reference cavity: its waist lies on the flat
// mirror.
func ExampleCavityCaustic() {
	c, err := referenceCavity()
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.CavityCaustic(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f)
	// Output:
	// Cavity eigenmode, one pass from flat to curved (100 mm; the return pass repeats it). Waists: w₀ 260 µm at z = 0.0 mm. Beam radius on flat 260 µm, on curved 291 µm.
}

// The polarization along a chain of plates, one small panel per state.
func ExamplePolarizationBudget() {
	in, err := polar.Linear(45*units.Degree, 0.01) // 10 mW at 45°, in W
	if err != nil {
		fmt.Println(err)
		return
	}
	qwp, err := polar.QuarterWave(0)
	if err != nil {
		fmt.Println(err)
		return
	}
	b, err := polar.Trace(in, polar.Element{Name: "QWP", Matrix: qwp})
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.PolarizationBudget(b)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(f.Caption[strings.Index(f.Caption, "input:"):])
	// Output:
	// input: ψ 45.0°, χ 0.0°, linear; after QWP (100.0 %): χ -45.0°, left circular.
}

// The alignment tolerances of a launch into a single-mode fibre whose
// mode the beam matches: 0.480 w and 0.480 λ/(πw) at 1 dB.
func ExampleCouplingMisalignment() {
	const um = units.Micrometer
	fibre, err := couple.FibreFromMFD(5.3*um, 780*units.Nanometer)
	if err != nil {
		fmt.Println(err)
		return
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 2.65 * um, Wavelength: 780 * units.Nanometer})
	if err != nil {
		fmt.Println(err)
		return
	}
	fc, err := fibre.Couple(in, couple.Misalignment{})
	if err != nil {
		fmt.Println(err)
		return
	}
	f, err := optplot.CouplingMisalignment(fc.Coupling)
	if err != nil {
		fmt.Println(err)
		return
	}
	i := strings.Index(f.Caption, "Tolerances")
	fmt.Println(f.Caption[i:])
	// Output:
	// Tolerances, relative to the aligned η: lateral offset x and y ±1.27 µm at 1 dB; tilt x and y ±45 mrad at 1 dB.
}
