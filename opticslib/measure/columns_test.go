package measure_test

// Tests of the column reader and the width-scan reader. What is checked is
// this package's own file format and messages (no outside reference),
// except the unit conversions, which are the SI prefixes (BIPM SI
// Brochure, 9th ed., 2019, table 7) and the inch of 25.4 mm exactly (NIST
// SP 811, 2008, appendix B).

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/measure"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestReadColumnsUnits(t *testing.T) {
	// A division by an exact power of ten is correctly rounded, so "150"
	// mm is the float64 nearest 0.15 m: rel 1e-15 allows one rounding (the
	// inch is a multiplication by the inexact 0.0254).
	const tol = 1e-15
	for _, test := range []struct {
		name, text, q string
		want          units.Length
	}{
		{"underscore mm", "z_mm\n150\n", "z", 150 * units.Millimeter},
		{"parentheses", "z (mm)\n150\n", "z", 150 * units.Millimeter},
		{"brackets µm", "z [µm]\n150\n", "z", 150 * units.Micrometer},
		{"Greek mu", "z_μm\n150\n", "z", 150 * units.Micrometer},
		{"upper case", "Z_MM\n150\n", "z", 150 * units.Millimeter},
		{"um", "d_um\n2.5\n", "d", 2.5 * units.Micrometer},
		{"nm", "d_nm\n633\n", "d", 633 * units.Nanometer},
		{"cm", "z_cm\n12\n", "z", 12 * units.Centimeter},
		{"m", "z_m\n0.25\n", "z", 0.25 * units.Meter},
		{"inch", "z_in\n2\n", "z", 2 * units.Inch},
		{"quantity with underscores", "sigma_dx_um\n1.5\n", "sigma_dx", 1.5 * units.Micrometer},
		{"semicolon", "a_mm;z_mm\n1;150\n", "z", 150 * units.Millimeter},
		{"tab", "a_mm\tz_mm\n1\t150\n", "z", 150 * units.Millimeter},
		{"comments, blank lines, BOM, CRLF", "\uFEFF# note\r\n\r\nz_mm,d_um\r\n# between\r\n150, 3\r\n", "z", 150 * units.Millimeter},
		{"trailing separator", "z_mm,d_um,\n150,3,\n", "z", 150 * units.Millimeter},
		{"empty row skipped", "z_mm,d_um\n,\n150,3\n", "z", 150 * units.Millimeter},
	} {
		c, err := measure.ReadColumns(strings.NewReader(test.text), "t.csv")
		if err != nil {
			t.Errorf("%s: ReadColumns error: %v", test.name, err)
			continue
		}
		got, err := c.Lengths(test.q)
		if err != nil || len(got) != 1 {
			t.Errorf("%s: Lengths(%q) = %v, %v; want [%v]", test.name, test.q, got, err, test.want)
			continue
		}
		if !scalar.EqualWithinRel(float64(got[0]), float64(test.want), tol) {
			t.Errorf("%s: Lengths(%q) = %.17g, want %.17g", test.name, test.q, float64(got[0]), float64(test.want))
		}
	}
}

func TestReadColumnsAngles(t *testing.T) {
	// deg = π/180 rad (BIPM SI Brochure, table 8); one rounding.
	c, err := measure.ReadColumns(strings.NewReader("tilt_deg,a_mrad\n30,2\n"), "")
	if err != nil {
		t.Fatalf("ReadColumns error: %v", err)
	}
	if a, err := c.Angles("tilt"); err != nil || !scalar.EqualWithinRel(float64(a[0]), float64(30*units.Degree), 1e-15) {
		t.Errorf("Angles(tilt) = %v, %v; want 30°", a, err)
	}
	if a, err := c.Angles("a"); err != nil || !scalar.EqualWithinRel(float64(a[0]), 2e-3, 1e-15) {
		t.Errorf("Angles(a) = %v, %v; want 2 mrad", a, err)
	}
	if _, err := c.Lengths("tilt"); err == nil || !strings.Contains(err.Error(), "deg is an angle unit") {
		t.Errorf("Lengths(tilt_deg) error = %v, want an angle-unit error", err)
	}
	if _, err := c.Angles("nothing"); !errors.Is(err, measure.ErrInput) {
		t.Errorf("Angles(missing) error = %v, want ErrInput", err)
	}
}

// The messages name the file, the line, the column and the value with its
// unit (DEVELOPERS.md, Messages); the text is this package's own.
func TestReadWidthScanErrors(t *testing.T) {
	for _, test := range []struct {
		name, text string
		def        measure.WidthDefinition
		sentinel   error
		want       string
	}{
		{"no header", "# only a comment\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: header: no header line"},
		{"missing z", "x_mm,d_um\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column z: missing; the columns are x_mm, d_um"},
		{"missing widths", "z_mm,p_mW\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: width columns: missing: name them d"},
		{"z in degrees", "z_deg,d_um\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column z_deg: deg is an angle unit, but z is a length (nm, um (µm), mm, cm, m or in)"},
		{"width in rad", "z_mm,dx_rad,dy_um\n1,2,3\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column dx_rad: rad is an angle unit, but dx is a length"},
		{"unknown unit", "z_furlong,d_um\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column z_furlong: unit \"furlong\" is not understood"},
		{"no unit", "z,d_um\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column z: has no unit; z is a length: name the column z_<unit>"},
		{"short row", "z_mm,d_um\n1,2\n3\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 3: row = 1: cells, but the header has 2 (z_mm, d_um)"},
		{"long row", "z_mm,d_um\n1,2,3\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 2: row = 3: cells, but the header has 2"},
		{"not a number", "z_mm,d_um\n1,2\n2,abc\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 3: column d_um = \"abc\": is not a number: bad input"},
		{"decimal comma", "z_mm;d_um\n1;2,5\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 2: column d_um = \"2,5\": is not a number (write decimals with a point, 1.5 not 1,5)"},
		{"empty cell", "z_mm,d_um\n1,\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 2: column d_um: empty cell"},
		{"NaN", "z_mm,d_um\n1,NaN\n", measure.SecondMomentWidths, measure.ErrNotPhysical, "measure: s.csv line 2: column d_um = \"NaN\": must be a finite number"},
		{"overflow", "z_mm,d_um\n1e400,2\n", measure.SecondMomentWidths, measure.ErrNotPhysical, "measure: s.csv line 2: column z_mm = \"1e400\": must be a finite number"},
		{"negative width", "z_mm,d_um\n1,10\n2,11\n3,-12\n4,13\n", measure.SecondMomentWidths, measure.ErrNotPhysical, "measure: s.csv line 4: column d_um = -12 µm: a width must be positive and finite: not physical"},
		{"zero width", "z_mm,d_um\n1,0\n2,11\n3,12\n4,13\n", measure.SecondMomentWidths, measure.ErrNotPhysical, "measure: s.csv line 2: column d_um = 0 m: a width must be positive"},
		{"zero uncertainty", "z_mm,d_um,sigma_d_um\n1,10,1\n2,11,0\n3,12,1\n4,13,1\n", measure.SecondMomentWidths, measure.ErrNotPhysical, "measure: s.csv line 3: column sigma_d_um = 0 m: an uncertainty must be positive"},
		{"too few", "z_mm,d_um\n1,10\n2,11\n3,12\n", measure.SecondMomentWidths, measure.ErrTooFewPoints, "measure: s.csv: planes = 3: the hyperbolic fit needs at least 4 (ISO 11146-1 asks for 10): too few points"},
		{"duplicate z", "z_mm,d_um\n1,10\n2,11\n1,12\n4,13\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 4: column z_mm = 1 mm: repeats the position of s.csv line 2"},
		{"radii and diameters", "z_mm,d_um,w_um\n1,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: width columns: mix diameters (d, dx, dy) and radii (w, wx, wy)"},
		{"round and axes", "z_mm,d_um,dx_um,dy_um\n1,2,2,2\n", measure.SecondMomentWidths, measure.ErrInput, "give d (a round beam) or dx and dy, not both"},
		{"x without y", "z_mm,dx_um\n1,2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: column dy: missing: give both dx and dy, or d for a round beam"},
		{"radius uncertainty with diameters", "z_mm,d_um,sigma_w_um\n1,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "column sigma_w_um: is the uncertainty of a radius, but the widths are diameters: name it sigma_d"},
		{"one axis uncertain", "z_mm,dx_um,dy_um,sigma_dx_um\n1,2,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "give sigma_dx and sigma_dy, or neither"},
		{"axis uncertainty for a round beam", "z_mm,d_um,sigma_dx_um\n1,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "for a round beam name it sigma_d"},
		{"repeated column", "z_mm,d_um,Z_MM\n1,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 1: column Z_MM: appears twice in the header"},
		{"z twice in two units", "z_mm,d_um,z_um\n1,2,1000\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv: columns z_mm and z_um: both give z; keep one"},
		{"unnamed column", "z_mm,,d_um\n1,2,1\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 1: column 2: has no name"},
		{"stray quote", "z_mm,d_um\n1,\"2\n", measure.SecondMomentWidths, measure.ErrInput, "measure: s.csv line 2: CSV syntax"},
		{"no definition", "z_mm,d_um\n1,2\n", 0, measure.ErrInput, "measure: s.csv: width definition = 0: must be SecondMomentWidths (D4σ, ISO 11146-1) or OneOverE2Widths"},
	} {
		_, err := measure.ReadWidthScan(strings.NewReader(test.text), "s.csv", test.def)
		if err == nil {
			t.Errorf("%s: ReadWidthScan = nil error, want %q", test.name, test.want)
			continue
		}
		var pe *measure.ParamError
		if !errors.As(err, &pe) || !errors.Is(err, test.sentinel) {
			t.Errorf("%s: ReadWidthScan error %q (%T) does not wrap %v in a *ParamError", test.name, err, err, test.sentinel)
		}
		if !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: ReadWidthScan error = %q, want it to contain %q", test.name, err, test.want)
		}
	}
}

// WidthScan.Validate on Go slices names the field and index.
func TestWidthScanValidate(t *testing.T) {
	z := []units.Length{1e-3, 2e-3, 3e-3, 4e-3}
	d := []units.Length{1e-4, 1e-4, 1e-4, 1e-4}
	for _, test := range []struct {
		name     string
		s        measure.WidthScan
		sentinel error
		want     string
	}{
		{"no kind", measure.WidthScan{Z: z, Round: d}, measure.ErrInput, "measure: width scan: Kind = 0: state what the widths are"},
		{"both", measure.WidthScan{Z: z, Round: d, X: d, Kind: measure.SecondMomentDiameter}, measure.ErrInput, "give Round (a round beam) or X and Y, not both"},
		{"none", measure.WidthScan{Z: z, Kind: measure.SecondMomentDiameter}, measure.ErrInput, "none given"},
		{"x only", measure.WidthScan{Z: z, X: d, Kind: measure.SecondMomentDiameter}, measure.ErrInput, "give both axes"},
		{"lengths", measure.WidthScan{Z: z, Round: d[:3], Kind: measure.SecondMomentDiameter}, measure.ErrInput, "measure: width scan: Round = 3: values, but Z has 4"},
		{"sigma lengths", measure.WidthScan{Z: z, Round: d, SigmaRound: d[:2], Kind: measure.SecondMomentDiameter}, measure.ErrInput, "SigmaRound = 2: values, but Z has 4"},
		{"sigma for the wrong axes", measure.WidthScan{Z: z, Round: d, SigmaX: d, Kind: measure.SecondMomentDiameter}, measure.ErrInput, "SigmaRound goes with Round"},
		{"negative", measure.WidthScan{Source: "bench", Z: z, X: d, Y: []units.Length{1e-4, -2e-6, 1e-4, 1e-4}, Kind: measure.OneOverE2Radius}, measure.ErrNotPhysical, "measure: bench: Y[1] = -2 µm: a width must be positive and finite"},
		{"duplicate", measure.WidthScan{Z: []units.Length{1e-3, 2e-3, 1e-3, 4e-3}, Round: d, Kind: measure.SecondMomentDiameter}, measure.ErrInput, "measure: width scan: Z[2] = 1 mm: repeats the position of Z[0]"},
	} {
		err := test.s.Validate()
		if !errors.Is(err, test.sentinel) || err == nil || !strings.Contains(err.Error(), test.want) {
			t.Errorf("%s: Validate() = %v, want %v containing %q", test.name, err, test.sentinel, test.want)
		}
	}
}

func TestReadWidthScanFiles(t *testing.T) {
	// The sample files of testdata/measure (invented data, see its
	// README.txt): each reads into the kind its columns say.
	for _, test := range []struct {
		file   string
		def    measure.WidthDefinition
		kind   measure.WidthKind
		round  bool
		sigma  bool
		planes int
		z0     units.Length // first plane
	}{
		{"caustic_xy.csv", measure.SecondMomentWidths, measure.SecondMomentDiameter, false, true, 10, 20 * units.Millimeter},
		{"caustic_round.csv", measure.OneOverE2Widths, measure.OneOverE2Radius, true, false, 10, 150 * units.Millimeter},
		{"caustic_short.csv", measure.SecondMomentWidths, measure.SecondMomentDiameter, true, false, 8, 130 * units.Millimeter},
	} {
		s := causticReadScan(t, test.file, test.def)
		if s.Kind != test.kind || (len(s.Round) > 0) != test.round || (s.SigmaX != nil || s.SigmaRound != nil) != test.sigma || len(s.Z) != test.planes {
			t.Errorf("%s: Kind %v, round %v, sigma %v, %d planes; want %v, %v, %v, %d", test.file, s.Kind, len(s.Round) > 0, s.SigmaX != nil || s.SigmaRound != nil, len(s.Z), test.kind, test.round, test.sigma, test.planes)
		}
		if !scalar.EqualWithinRel(float64(s.Z[0]), float64(test.z0), 1e-15) {
			t.Errorf("%s: Z[0] = %v, want %v", test.file, s.Z[0], test.z0)
		}
	}
}

// causticReadScan reads a sample scan of testdata/measure.
func causticReadScan(t testing.TB, file string, def measure.WidthDefinition) measure.WidthScan {
	t.Helper()
	path := filepath.Join("..", "..", "testdata", "measure", file)
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("open sample: %v", err)
	}
	defer f.Close()
	s, err := measure.ReadWidthScan(f, file, def)
	if err != nil {
		t.Fatalf("ReadWidthScan(%s) error: %v", file, err)
	}
	return s
}

func FuzzReadColumns(f *testing.F) {
	// Any input: no panic; every failure is a *ParamError wrapping
	// ErrInput, ErrNotPhysical or ErrTooFewPoints; a scan that reads
	// validates, and its fit returns a result or such an error.
	for _, file := range []string{"caustic_xy.csv", "caustic_round.csv", "caustic_short.csv"} {
		data, err := os.ReadFile(filepath.Join("..", "..", "testdata", "measure", file))
		if err != nil {
			f.Fatalf("read seed: %v", err)
		}
		f.Add(string(data))
	}
	f.Add("z_mm,d_um\n1,2\n2,3\n3,4\n4,5\n")
	f.Add("z (mm);dx [µm];dy_um\n1;2;3\n")
	f.Add("\uFEFFz_m\tw_mm\n0.1\t1e400\n")
	f.Add("z_mm,d_um\n\"1,2\n")
	f.Add("z_mm,d_um,sigma_d_um\n1,2,0\n2,2,1\n3,2,1\n4,2,1\n")
	f.Fuzz(func(t *testing.T, s string) {
		check := func(what string, err error) {
			if err == nil {
				return
			}
			var pe *measure.ParamError
			if !errors.As(err, &pe) {
				t.Fatalf("%s(%q) error %v is %T, want *measure.ParamError", what, s, err, err)
			}
			if !errors.Is(err, measure.ErrInput) && !errors.Is(err, measure.ErrNotPhysical) && !errors.Is(err, measure.ErrTooFewPoints) {
				t.Fatalf("%s(%q) error %v wraps no sentinel", what, s, err)
			}
		}
		c, err := measure.ReadColumns(strings.NewReader(s), "fuzz.csv")
		check("ReadColumns", err)
		if err == nil {
			for _, n := range c.Names {
				_, err := c.Lengths(n)
				check("Lengths", err)
				_, _, err = c.Numbers(n)
				check("Numbers", err)
			}
		}
		for _, def := range []measure.WidthDefinition{measure.SecondMomentWidths, measure.OneOverE2Widths} {
			scan, err := measure.ReadWidthScan(strings.NewReader(s), "fuzz.csv", def)
			check("ReadWidthScan", err)
			if err != nil {
				continue
			}
			if err := scan.Validate(); err != nil {
				t.Fatalf("scan read from %q does not validate: %v", s, err)
			}
			fit, err := measure.FitCaustic(scan, measure.CausticOptions{Wavelength: 1 * units.Micrometer})
			check("FitCaustic", err)
			if err != nil {
				continue
			}
			_ = fit.Table()
			_ = fit.String()
			// No NaN or Inf in a result without an error (DEVELOPERS.md).
			for _, a := range fit.Axes() {
				for _, v := range []float64{float64(a.W0.Value), float64(a.W0.Sigma), float64(a.Z0.Value), float64(a.Z0.Sigma),
					float64(a.RayleighRange.Value), float64(a.RayleighRange.Sigma), float64(a.Divergence.Value), float64(a.Divergence.Sigma),
					a.M2.Value, a.M2.Sigma, float64(a.Residual)} {
					if math.IsNaN(v) || math.IsInf(v, 0) {
						t.Fatalf("fit of %q has a non-finite value: %+v", s, a)
					}
				}
			}
		}
	})
}
