package design_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A 3× Keplerian expander (f1 = 50 mm, f2 = 150 mm) for a 532 nm laser
// whose 0.12 mm waist sits 120 mm before L1, not in its front focal
// plane: the gap that collimates (output waist in L2's back focal plane)
// is Self's f1 + f2 + (s1 − f1) f1²/((s1 − f1)² + zR²), here 214.43 mm,
// not 200 mm, and the output waist is m1·f2/zR′ = 0.4663 mm rather than
// 3 × 0.12 mm (S. A. Self, Appl. Opt. 22, 658 (1983)).
func ExampleSolveOne() {
	const mm = units.Millimeter
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.12 * mm, Wavelength: 532 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().
		Space(120 * mm).ThinLens(50 * mm).Label("L1").
		Space(200 * mm).Label("gap").ThinLens(150 * mm).Label("L2").
		Space(250 * mm).Build()
	p := design.Problem{
		System:    sys,
		Variables: []design.Variable{design.Spacing("gap", 150*mm, 300*mm)},
		Goals: []design.Goal{
			design.Near("waist after L2", design.WaistAfter(laser, "L2"), 150*mm, 0.01*mm),
			design.AtMost("length", design.TotalLength(), 600*mm),
		},
	}
	r, err := design.SolveOne(p, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(r.Table().Text())
	w, _ := design.WaistRadius(laser)(r.Systems[0])
	fmt.Printf("output waist %.4f mm\n", w.Millimeters())
	// Output:
	// Roots of goal "waist after L2" (aim: wanted 150 ± 0.01 mm) for spacing "gap" in [150 mm, 300 mm]
	// root  spacing "gap" (mm)  waist after L2  every goal met
	// ----  ------------------  --------------  --------------
	// 1     214.4258            150 mm          yes
	// output waist 0.4663 mm
}

// A two-lens expander on a 400 mm rail for an invented 1064 nm laser
// (0.5 mm waist at its output coupler, 80 mm before the first lens
// mount): which L1 focal length and gap give a 2 mm waist in L2's back
// focal plane, with the whole path within budget? The laser's Rayleigh
// range (738 mm) is long against the lenses' focal lengths, so the answer
// is nearly the afocal one: f1 ≈ −f2/4 for the 4× waist, gap ≈ f1 + f2.
func ExampleMinimize() {
	const mm = units.Millimeter
	laser, _ := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	sys, _ := paraxial.NewBuilder().
		Space(80 * mm).ThinLens(-40 * mm).Label("L1").
		Space(100 * mm).Label("gap").ThinLens(200 * mm).Label("L2").
		Space(200 * mm).Build()
	p := design.Problem{
		System: sys,
		Variables: []design.Variable{
			design.FocalLength("L1", -80*mm, -25*mm),
			design.Spacing("gap", 50*mm, 250*mm),
		},
		Goals: []design.Goal{
			design.Near("output waist", design.WaistRadius(laser), 2*mm, 0.02*mm),
			design.Near("waist after L2", design.WaistAfter(laser, "L2"), 200*mm, 1*mm),
			design.AtMost("path length", design.TotalLength(), 500*mm),
		},
	}
	s, err := design.Minimize(p, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(s.Met(), s.Stopped(), s.Centred)
	t := s.Table()
	t.Caption = "" // it also counts the runs and evaluations
	fmt.Print(t.Text())
	// Output:
	// true every goal met (cost 0) true
	//           name               value         wanted or bounds  note
	// --------  -----------------  ------------  ----------------  ----
	// variable  focal length "L1"  -50.77866 mm  -80 … -25 mm
	// variable  spacing "gap"      149.8214 mm   50 … 250 mm
	// goal      output waist       2 mm          2 ± 0.02 mm       met
	// goal      waist after L2     200 mm        200 ± 1 mm        met
	// goal      path length        429.821 mm    ≤ 500 mm          met
}
