package optplot

// Tests of the coupling figure: it builds, renders byte-identical SVG,
// marks the tolerances of package couple (which tests them against the
// closed forms of R40), and refuses couplings it cannot draw. The fibre
// and beam are invented.

import (
	"errors"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/couple"
	"github.com/beamnote/beamnote/opticslib/table"
	"github.com/beamnote/beamnote/opticslib/units"
)

// demoCoupling couples a slightly elliptical 780 nm beam, focused 20 µm
// in front of the face of a fibre of 5.3 µm mode-field diameter, with
// the fibre offset by 0.4 µm in x and tilted by 20 mrad in y.
func demoCoupling(t testing.TB, m couple.Misalignment) couple.Coupling {
	t.Helper()
	const um = units.Micrometer
	f, err := couple.FibreFromMFD(5.3*um, 780*units.Nanometer)
	if err != nil {
		t.Fatal(err)
	}
	in, err := beam.FromWaists(
		beam.WaistSpec{WaistRadius: 2.5 * um, Wavelength: 780 * units.Nanometer, WaistZ: -20 * um},
		beam.WaistSpec{WaistRadius: 2.9 * um, Wavelength: 780 * units.Nanometer, WaistZ: -20 * um})
	if err != nil {
		t.Fatal(err)
	}
	fc, err := f.Couple(in, m)
	if err != nil {
		t.Fatal(err)
	}
	return fc.Coupling
}

// TestCouplingFigure: the two panels carry the axes in µm and mrad, the
// tolerances of couple.Coupling.OffsetTolerance and TiltTolerance (as
// printed with three digits), the level names, and the given
// misalignment with its combined efficiency.
func TestCouplingFigure(t *testing.T) {
	given := couple.Misalignment{DX: 0.4 * units.Micrometer, TiltY: 0.02}
	c := demoCoupling(t, given)
	aligned := demoCoupling(t, couple.Misalignment{})
	dx, dy, err := c.OffsetTolerance(couple.OneDecibel)
	if err != nil {
		t.Fatal(err)
	}
	tx, ty, err := c.TiltTolerance(couple.OneDecibel)
	if err != nil {
		t.Fatal(err)
	}
	sig := func(v float64) string { return table.Sig(v, 3) }
	checkFigures(t, []figureCase{
		{name: "coupling", make: func() (Figure, error) { return CouplingMisalignment(c) },
			svg: []string{"lateral offset d (µm)", "tilt θ (mrad)", "coupling efficiency η (%)", ">1 dB<",
				"x: ±" + sig(dx.Micrometers()) + " µm", "y: ±" + sig(dy.Micrometers()) + " µm",
				"x: ±" + sig(tx.Milliradians()) + " mrad", "y: ±" + sig(ty.Milliradians()) + " mrad", "given misalignment, alone"},
			caption: []string{"Aligned η = 88.65 %", "x offset 400 nm, y tilt 20 mrad) together, η = " + table.Fixed(100*c.Efficiency, 2) + " %", "Offset and tilt interact"}},
		{name: "coupling levels", make: func() (Figure, error) {
			return CouplingMisalignment(aligned, Tolerances(couple.OneDecibel, 0.95), Title("Fibre launch"))
		},
			svg:     []string{"Fibre launch", ">1 dB<", ">95 %<"},
			caption: []string{"at 1 dB, ±", "at 95 %"}},
	})
	f, err := CouplingMisalignment(aligned)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(mustSVG(t, f)), "given misalignment") || strings.Contains(f.Caption, "together") {
		t.Errorf("an aligned coupling shows a given misalignment")
	}
}

// TestCouplingGoldenSVG: the misaligned launch against its golden file.
func TestCouplingGoldenSVG(t *testing.T) {
	checkGolden(t, "coupling_misalignment.svg", func(tb testing.TB) []byte {
		f, err := CouplingMisalignment(demoCoupling(tb, couple.Misalignment{DX: 0.4 * units.Micrometer, TiltY: 0.02}))
		if err != nil {
			tb.Fatal(err)
		}
		return mustSVG(tb, f)
	})
}

// TestCouplingErrors: the zero Coupling and bad tolerance levels are
// *ParamError values wrapping ErrCoupling or ErrOption.
func TestCouplingErrors(t *testing.T) {
	good := demoCoupling(t, couple.Misalignment{})
	noTilt := good
	noTilt.Y.Tilt = 0
	for _, test := range []struct {
		name string
		c    couple.Coupling
		opts []Option
		want error
		text string
	}{
		{"zero", couple.Coupling{}, nil, ErrCoupling, "aligned efficiency = 0: must lie in (0, 1]"},
		{"no tilt coefficient", noTilt, nil, ErrCoupling, "Y.Tilt coefficient = 0 1/rad²"},
		{"no levels", good, []Option{Tolerances()}, ErrOption, "Tolerances: fractions = 0"},
		{"level 1", good, []Option{Tolerances(0.9, 1)}, ErrOption, "Tolerances: fraction 2 = 1: must lie strictly between 0 and 1"},
	} {
		_, err := CouplingMisalignment(test.c, test.opts...)
		var pe *ParamError
		if !errors.As(err, &pe) || !errors.Is(err, test.want) || !strings.Contains(err.Error(), test.text) {
			t.Errorf("%s: error %v, want a *ParamError wrapping %v containing %q", test.name, err, test.want, test.text)
		}
	}
}

// TestAxisUnits: the unit of an axis follows the range shown.
func TestAxisUnits(t *testing.T) {
	for _, test := range []struct {
		v         float64
		angle     bool
		scale     float64
		unit      string
		whatRange string
	}{
		{5e-7, false, 1e-9, "nm", "0.5 µm"},
		{4e-6, false, 1e-6, "µm", "4 µm"},
		{2e-3, false, 1e-3, "mm", "2 mm"},
		{4e-4, true, 1e-6, "µrad", "0.4 mrad"},
		{0.13, true, 1e-3, "mrad", "130 mrad"},
		{1.2, true, 1, "rad", "1.2 rad"},
	} {
		scale, unit := lengthAxisUnit(test.v)
		if test.angle {
			scale, unit = angleAxisUnit(test.v)
		}
		if unit != test.unit || !scalar.EqualWithinRel(scale, test.scale, 1e-15) {
			t.Errorf("unit for a range of %s = %g %s, want %g %s", test.whatRange, scale, unit, test.scale, test.unit)
		}
	}
}
