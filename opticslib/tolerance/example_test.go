package tolerance_test

import (
	"context"
	"fmt"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/tolerance"
	"github.com/beamnote/beamnote/opticslib/units"
)

// expander is an invented bench setup: a 633 nm laser's 0.4 mm waist,
// in L1's front focal plane, expanded 3× by a 50 mm and a 150 mm lens to
// 1.2 mm, then focused by a 100 mm lens L3 to a waist of about 17 µm.
func expander() (paraxial.System, beam.Gaussian) {
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(50 * mm).ThinLens(50 * mm).Label("L1").
		Space(200 * mm).Label("gap").ThinLens(150 * mm).Label("L2").
		Space(100 * mm).ThinLens(100 * mm).Label("L3").
		Space(150 * mm).Build()
	if err != nil {
		panic(err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.4 * mm, Wavelength: 633 * units.Nanometer})
	if err != nil {
		panic(err)
	}
	return sys, in
}

// The slope of the focus against each error and its linear spread.
func ExampleStudy_Sensitivity() {
	const mm = units.Millimeter
	sys, in := expander()
	st := tolerance.Study{
		System: sys,
		Perturbations: []tolerance.Perturbation{
			tolerance.Placement("L1", tolerance.Normal(0.2*mm)),
			tolerance.FocalError("L2", tolerance.Uniform(0.01)),
		},
		Goals: []design.Goal{
			design.Near("focus waist", design.WaistRadius(in), 16.8*units.Micrometer, 0.5*units.Micrometer),
			design.Near("focus position", design.WaistZ(in), 450*mm, 0.2*mm),
		},
	}
	s, err := st.Sensitivity()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(s.Table().Text())
	// Output:
	// Sensitivity of each goal to each error (central differences, step σ/10); linear spread σ = √Σ(slope·σ_error)²
	// goal            nominal     placement "L1" (σ 200 µm)  focal length "L2" (±1 %)  linear σ  mean shift (2nd order)
	// --------------  ----------  -------------------------  ------------------------  --------  ----------------------
	// focus waist     16.7871 µm  112 nm/mm                  0 nm/%                    22.5 nm   0.0295 nm
	// focus position  449.971 mm  446 µm/mm                  667 µm/%                  395 µm    -2.1 µm
}

// A Monte Carlo of 20 000 builds with the telescope's gap re-set on the
// bench to put the focus back in place: the yield, and how far the gap
// must travel.
func ExampleStudy_MonteCarlo() {
	const mm = units.Millimeter
	sys, in := expander()
	st := tolerance.Study{
		System: sys,
		Beam:   in,
		Perturbations: []tolerance.Perturbation{
			tolerance.Placement("L1", tolerance.Normal(0.2*mm)),
			tolerance.FocalError("L1", tolerance.Uniform(0.01)),
			tolerance.FocalError("L2", tolerance.Uniform(0.01)),
		},
		Goals: []design.Goal{
			design.Near("focus waist", design.WaistRadius(in), 16.8*units.Micrometer, 0.3*units.Micrometer),
			design.Near("focus position", design.WaistZ(in), 450*mm, 0.2*mm),
		},
		Fast:        map[string]tolerance.Fast{"focus waist": tolerance.WaistRadius(), "focus position": tolerance.WaistZ()},
		Compensator: &tolerance.Compensator{Variable: design.Spacing("gap", 198.5*mm, 201.5*mm), Goal: "focus position"},
	}
	r, err := st.MonteCarlo(context.Background(), tolerance.Options{Trials: 20000, Seed: 1})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("yield %.1f %% ± %.1f %%\n", 100*r.Yield.Fraction, 100*r.Yield.StdErr)
	for _, g := range r.Goals {
		fmt.Printf("%s: mean %v, σ %v, met in %.1f %%\n", g.Name, units.Length(g.Mean), units.Length(g.Std), 100*g.Yield.Fraction)
	}
	c := r.Compensator
	fmt.Printf("gap: mean %v, σ %v, %d builds at a limit\n", units.Length(c.Mean), units.Length(c.Std), c.AtLimit)
	// Output:
	// yield 91.8 % ± 0.2 %
	// focus waist: mean 16.7829 µm, σ 175.975 nm, met in 92.1 %
	// focus position: mean 449.999 mm, σ 33.4013 µm, met in 99.2 %
	// gap: mean 200.052 mm, σ 788.517 µm, 989 builds at a limit
}
