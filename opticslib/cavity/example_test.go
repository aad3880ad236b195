package cavity_test

// Examples on the Tern bench, an invented set-up: a 1064 nm laser locked
// to a plano-concave reference cavity, and a bow-tie ring that cleans the
// laser's spatial mode. Where each printed value can be checked outside
// this library:
//
//   - FSR = c/(2d) = 1.498962 GHz (reference-checks R19, c exact).
//   - Finesse π/(2 arcsin((1 − ρ)/(2√ρ))) with ρ = R = 0.99997: 104718
//     (R20's exact Airy form), linewidth FSR/𝓕 = 14.31 kHz.
//   - The waist of a plano-concave cavity lies on the flat mirror:
//     w0² = (λ/π)√(d(R − d)) = (260.3 µm)², and w2 = w0/√g2 = 291.0 µm on
//     the curved one (g1 = 1, g2 = 0.8; the two-mirror g-parameter forms
//     of H. Kogelnik & T. Li, Appl. Opt. 5, 1550 (1966) [from memory for
//     the equation numbers]).
//   - TEM01 lies arccos(√(g1g2))/π = 0.147584 FSR = 221.2 MHz above TEM00
//     (R25); the nearest low-order fraction, 1/7, puts the order-7 modes
//     7·0.147584 − 1 = 0.033 FSR from TEM00, outside the 1 % window, so
//     there is no warning. The spectrum's overlaps are the modes of one
//     order, which coincide in a round cavity.
//   - The ring's per-plane waists follow the lens-guide closed form of
//     TestRingAstigmatismKogelnik1972 with f cos θ and f/cos θ
//     (H. Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank, IEEE J.
//     Quantum Electron. QE-8, 373 (1972) [from memory]).
//   - The table layout and the wording are this library's own.

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func Example() {
	// The reference cavity of the Tern bench: a flat and a 500 mm concave
	// mirror, 100 mm apart, both coated to 99.997 % at 1064 nm.
	cav, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Label: "flat", Shape: cavity.Flat, Reflectivity: 0.99997},
		M2:         cavity.Mirror{Label: "curved", Shape: cavity.Concave, Radius: 500 * units.Millimeter, Reflectivity: 0.99997},
		Spacing:    100 * units.Millimeter,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := cav.Airy()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("FSR %.6f GHz, finesse %.0f, linewidth %.2f kHz\n", a.FSR/1e9, a.Finesse, a.Linewidth/1e3)
	for _, label := range []string{"flat", "curved"} {
		m, err := cav.EigenmodeAtPart(label)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("beam radius on the %s mirror %.1f µm\n", label, m.Beam.X.Radius().Micrometers())
	}
	sp, err := cav.ModeSpacing()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("TEM01 %.2f MHz above TEM00 (%.6f FSR)\n", sp.Offset(0, 1)/1e6, sp.Offset(0, 1)/sp.FSR)
	fmt.Println("warnings:", len(cav.Warnings()))
	// Output:
	// FSR 1.498962 GHz, finesse 104718, linewidth 14.31 kHz
	// beam radius on the flat mirror 260.3 µm
	// beam radius on the curved mirror 291.0 µm
	// TEM01 221.22 MHz above TEM00 (0.147584 FSR)
	// warnings: 0
}

func ExampleCavity_Spectrum() {
	// Which transverse modes of the Tern reference cavity fall near TEM00
	// within one FSR, up to order 3.
	cav, err := cavity.Linear(cavity.LinearSpec{
		M1:         cavity.Mirror{Label: "flat", Reflectivity: 0.99997},
		M2:         cavity.Mirror{Label: "curved", Shape: cavity.Concave, Radius: 500 * units.Millimeter, Reflectivity: 0.99997},
		Spacing:    100 * units.Millimeter,
		Wavelength: 1064 * units.Nanometer,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := cav.Spectrum(3)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(s)
	// Output:
	// Transverse modes within one FSR (1.498962 GHz), m + n ≤ 3; overlap: closer than the linewidth 14.31 kHz
	// mode   m + n  offset from TEM₀₀ (MHz)  within FSR (MHz)  fraction of FSR  overlaps
	// -----  -----  -----------------------  ----------------  ---------------  -------------------
	// TEM00  0      0.0000                   0.0000            0.000000
	// TEM10  1      221.2223                 221.2223          0.147584         TEM01
	// TEM01  1      221.2223                 221.2223          0.147584         TEM10
	// TEM20  2      442.4446                 442.4446          0.295167         TEM11, TEM02
	// TEM11  2      442.4446                 442.4446          0.295167         TEM20, TEM02
	// TEM02  2      442.4446                 442.4446          0.295167         TEM20, TEM11
	// TEM30  3      663.6668                 663.6668          0.442751         TEM21, TEM12, TEM03
	// TEM21  3      663.6668                 663.6668          0.442751         TEM30, TEM12, TEM03
	// TEM12  3      663.6668                 663.6668          0.442751         TEM30, TEM21, TEM03
	// TEM03  3      663.6668                 663.6668          0.442751         TEM30, TEM21, TEM12
}

func ExampleRing() {
	// The Tern bench's mode cleaner: a bow-tie ring of two 100 mm concave
	// mirrors 105 mm apart, met at 8°, and two flat mirrors closing a
	// 1.2 m long arm. The tilted curved mirrors make the mode astigmatic.
	th := 8 * units.Degree
	loop, err := paraxial.NewBuilder().
		ConcaveMirror(100*units.Millimeter, th).Label("C1").Space(105*units.Millimeter).
		ConcaveMirror(100*units.Millimeter, th).Label("C2").Space(300 * units.Millimeter).
		FlatMirror(th).Label("F1").Space(600 * units.Millimeter).
		FlatMirror(th).Label("F2").Space(300 * units.Millimeter).
		Build()
	if err != nil {
		fmt.Println(err)
		return
	}
	ring, err := cavity.Ring(cavity.RingSpec{
		Loop:         loop,
		Reflectivity: map[string]float64{"C1": 0.9995, "C2": 0.9995, "F1": 0.9995, "F2": 0.992},
		Wavelength:   1064 * units.Nanometer,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	waist, err := ring.Eigenmode(52.5 * units.Millimeter) // the middle of the short arm
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("waist between C1 and C2: wx = %.2f µm, wy = %.2f µm\n", waist.Beam.X.Radius().Micrometers(), waist.Beam.Y.Radius().Micrometers())
	sp, err := ring.ModeSpacing()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("FSR %.3f MHz; TEM10 at %.3f MHz, TEM01 at %.3f MHz\n", sp.FSR/1e6, sp.Offset(1, 0)/1e6, sp.Offset(0, 1)/1e6)
	a, err := ring.Airy()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("finesse %.1f, linewidth %.1f kHz\n", a.Finesse, a.Linewidth/1e3)
	// Output:
	// waist between C1 and C2: wx = 26.62 µm, wy = 27.90 µm
	// FSR 229.726 MHz; TEM10 at 185.027 MHz, TEM01 at 167.377 MHz
	// finesse 659.1, linewidth 348.5 kHz
}
