package optplot_test

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/budget"
	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/polar"
	"github.com/beamnote/beamnote/opticslib/units"
)

// benchBudget is a bench path with an uncoated window, a fold mirror, an
// iris, a polarizing pair and a focusing lens into a fibre.
func benchBudget(t *testing.T) budget.Budget {
	t.Helper()
	const mm = units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(10*mm).Plate(2*mm, 1.5, 0).Label("window").
		Space(60*mm).FlatMirror(45*units.Degree).Label("M1").
		Space(50*mm).Diaphragm(paraxial.ClearDiameter(2.4*mm)).Label("iris").
		Space(20*mm).Plate(1*mm, 1.54, 0).Label("HWP").
		Space(15*mm).Plate(2*mm, 1.5, 0).Label("pol").
		Space(30 * mm).ThinLens(11 * mm).Label("coupler").
		Space(11 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.8 * mm, Wavelength: 780 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	hwp, err := polar.HalfWave(15 * units.Degree)
	if err != nil {
		t.Fatal(err)
	}
	pol, err := polar.Polarizer(0)
	if err != nil {
		t.Fatal(err)
	}
	b, err := budget.NewBuilder(sys, budget.Input{Power: 30e-3, Beam: g, Polarization: polar.Jones{X: 1}}).
		Mirror("M1", 0.97).AR("HWP", 0.003).Insert("HWP", "half-wave plate at 15°", hwp).
		Insert("pol", "polarizer at 0°", pol).AR("coupler", 0.004).Coupling("coupler", 0.6).Build()
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestBudgetFigures: both figures build, render to byte-identical SVG
// twice (the package's determinism rule), label the elements, and the
// irradiance figure carries the laser-safety caution in its key (SVG) and
// beam.SafetyNote in its caption, also with a caption of the user's own;
// the power figure shows no irradiance.
func TestBudgetFigures(t *testing.T) {
	b := benchBudget(t)
	for _, test := range []struct {
		name       string
		make       func(budget.Budget, ...optplot.Option) (optplot.Figure, error)
		opts       []optplot.Option
		irradiance bool
	}{
		{"PowerBudget", optplot.PowerBudget, nil, false},
		{"PowerBudget zoomed", optplot.PowerBudget, []optplot.Option{optplot.ZRange(100*units.Millimeter, 200*units.Millimeter)}, false},
		{"IrradianceBudget", optplot.IrradianceBudget, nil, true},
		{"IrradianceBudget own caption", optplot.IrradianceBudget, []optplot.Option{optplot.Caption("Bench irradiance"), optplot.Title("Bench")}, true},
	} {
		f, err := test.make(b, test.opts...)
		if err != nil {
			t.Errorf("%s: error %v", test.name, err)
			continue
		}
		s1, err1 := f.SVG()
		s2, err2 := f.SVG()
		if err1 != nil || err2 != nil {
			t.Errorf("%s: SVG errors %v, %v", test.name, err1, err2)
			continue
		}
		if !bytes.Equal(s1, s2) {
			t.Errorf("%s: two renders differ", test.name)
		}
		g, err := test.make(b, test.opts...)
		if err != nil {
			t.Errorf("%s: second build error %v", test.name, err)
			continue
		}
		if s3, err := g.SVG(); err != nil || !bytes.Equal(s1, s3) {
			t.Errorf("%s: a second figure of the same budget renders differently (%v)", test.name, err)
		}
		svg := string(s1)
		if !strings.Contains(svg, ">HWP<") || !strings.Contains(svg, ">coupler<") {
			t.Errorf("%s: SVG lacks the element labels", test.name)
		}
		if got := strings.Contains(svg, "Laser safety"); got != test.irradiance {
			t.Errorf("%s: SVG contains the safety caution = %v, want %v", test.name, got, test.irradiance)
		}
		if got := strings.Contains(f.Caption, beam.SafetyNote); got != test.irradiance {
			t.Errorf("%s: caption contains beam.SafetyNote = %v, want %v", test.name, got, test.irradiance)
		}
		if dir := os.Getenv("BEAMNOTE_FIGURES"); dir != "" {
			if err := f.Save(filepath.Join(dir, strings.ReplaceAll(test.name, " ", "_")+".png")); err != nil {
				t.Error(err)
			}
		}
	}
}

// TestBudgetFigureErrors: a budget not made by budget.Builder.Build and
// bad options are *ParamError values wrapping ErrBudget or ErrOption.
func TestBudgetFigureErrors(t *testing.T) {
	good := benchBudget(t)
	bad := good
	bad.Rows = append([]budget.Row(nil), good.Rows...)
	bad.Rows[2].Power = -1
	for _, test := range []struct {
		name string
		b    budget.Budget
		opts []optplot.Option
		want error
	}{
		{"zero budget", budget.Budget{}, nil, optplot.ErrBudget},
		{"negative power in a row", bad, nil, optplot.ErrBudget},
		{"bad range", good, []optplot.Option{optplot.ZRange(10*units.Millimeter, 5*units.Millimeter)}, optplot.ErrOption},
	} {
		for _, fn := range []func(budget.Budget, ...optplot.Option) (optplot.Figure, error){optplot.PowerBudget, optplot.IrradianceBudget} {
			_, err := fn(test.b, test.opts...)
			var pe *optplot.ParamError
			if !errors.As(err, &pe) || !errors.Is(err, test.want) {
				t.Errorf("%s: error %v, want a *ParamError wrapping %v", test.name, err, test.want)
			}
		}
	}
}
