package stock_test

import (
	"errors"
	"io/fs"
	"math"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/stock"
	"github.com/beamnote/beamnote/opticslib/units"
)

const drawer = "../../notebooks/data/lens-drawer.csv"

// The demo kit: 60 entries of every kind, counts 1 to 3, common
// catalogue focal lengths, 1 and ½ inch, all valid. The radii rows give
// the lensmaker's focal length (R/(n − 1) for a plano lens, whatever its
// thickness: Smith, Modern Optical Engineering, ch. 2 [from memory]).
func TestReadDrawer(t *testing.T) {
	st, err := stock.ReadFile(drawer)
	if err != nil {
		t.Fatal(err)
	}
	if st.Len() != 60 || st.Source != "lens-drawer.csv" {
		t.Errorf("drawer: %d entries from %q, want 60 from lens-drawer.csv", st.Len(), st.Source)
	}
	if err := st.Validate(); err != nil {
		t.Error(err)
	}
	kinds := map[stock.Kind]int{}
	for _, l := range st.Lenses {
		kinds[l.Kind]++
		if l.Count < 1 || l.Count > 3 {
			t.Errorf("%s: count %d, want 1 to 3", l.Label, l.Count)
		}
		if d := l.Diameter.Millimeters(); d != 25.4 && d != 12.7 {
			t.Errorf("%s: diameter %v, want 25.4 or 12.7 mm", l.Label, l.Diameter)
		}
		if !strings.HasPrefix(l.Where, "lens-drawer.csv line ") {
			t.Errorf("%s: Where = %q", l.Label, l.Where)
		}
	}
	for k := stock.PlanoConvex; k <= stock.Achromat; k++ {
		if kinds[k] == 0 {
			t.Errorf("drawer has no %v", k)
		}
	}
	l, ok := st.Lens("pcx-100-a")
	if !ok || !l.FromRadii || !scalar.EqualWithinRel(float64(l.Focal), 51.5e-3/0.5168, 1e-12) {
		t.Errorf("PCX-100-A: %+v, want f = 51.5 mm/0.5168 from its radius", l)
	}
	if tb := st.Table(); len(tb.Rows) != 60 || tb.Validate() != nil {
		t.Errorf("Table: %d rows, %v", len(tb.Rows), tb.Validate())
	}
}

// Units in the headers in every accepted form, semicolons, a byte order
// mark, quoted cells, comments and blank rows.
func TestReadMixedUnits(t *testing.T) {
	st, err := stock.ReadFile("../../testdata/stock/mixed-units.csv")
	if err != nil {
		t.Fatal(err)
	}
	if st.Len() != 4 {
		t.Fatalf("%d lenses, want 4", st.Len())
	}
	for _, test := range []struct {
		label     string
		f, d, ct  units.Length
		r2        units.Length
		count     int
		note      string
		fromRadii bool
	}{
		{"A1", 50 * mm, 25.4 * mm, 0, paraxial.Flat, 2, "one; with a semicolon", false},
		{"B1", stock.LensmakerFocal(102.4*mm, -102.4*mm, 3.6*mm, 1.5168), 12.7 * mm, 3.6 * mm, -102.4 * mm, 1, "", true},
		{"C1", -25.8 * mm / 0.5168, 25.4 * mm, 3 * mm, paraxial.Flat, 3, "", true},
		{"D1", -50 * mm, 12.7 * mm, 0, 0, 1, "negative achromat", false},
	} {
		l, ok := st.Lens(test.label)
		if !ok {
			t.Errorf("no lens %s", test.label)
			continue
		}
		if !scalar.EqualWithinRel(float64(l.Focal), float64(test.f), 1e-12) || !scalar.EqualWithinRel(float64(l.Diameter), float64(test.d), 1e-12) ||
			!scalar.EqualWithinRel(float64(l.Thickness), float64(test.ct), 1e-12) || l.R2 != test.r2 && !scalar.EqualWithinRel(float64(l.R2), float64(test.r2), 1e-12) ||
			l.Count != test.count || l.Note != test.note || l.FromRadii != test.fromRadii {
			t.Errorf("%s = %+v, want f %v, Ø %v, ct %v, R2 %v, count %d, note %q", test.label, l, test.f, test.d, test.ct, test.r2, test.count, test.note)
		}
	}
}

// Bad files: each message names the file, the line, the column and the
// value with its unit.
func TestReadErrors(t *testing.T) {
	const head = "label,kind,f_mm,r1_mm,r2_mm,ct_mm,diameter_mm,material,count,note\n"
	for _, test := range []struct {
		name, in string
		want     []string
		err      error
	}{
		{"empty", "", []string{"drawer.csv", "no header line"}, stock.ErrEmpty},
		{"comments only", "# nothing\n#\n", []string{"no header line"}, stock.ErrEmpty},
		{"no rows", head, []string{"drawer.csv", "no lens rows"}, stock.ErrEmpty},
		{"no unit", "label,kind,f,diameter_mm,material,count\n", []string{"line 1", "column f", "has no unit"}, stock.ErrInput},
		{"angle unit", "label,kind,f_deg,diameter_mm,material,count\n", []string{"column f_deg", `"deg" is not a length unit`}, stock.ErrInput},
		{"unit on count", "label,kind,f_mm,diameter_mm,material,count_pcs\n", []string{"column count_pcs", "no unit"}, stock.ErrInput},
		{"unknown column", "label,kind,focal_mm,diameter_mm,material,count\n", []string{`column "focal_mm"`, "not a stock column"}, stock.ErrInput},
		{"repeated", "label,kind,f_mm,f_in,diameter_mm,count\n", []string{"column f_in", "repeats column f_mm"}, stock.ErrInput},
		{"missing count", "label,kind,f_mm,diameter_mm,material\n", []string{"column count", "missing"}, stock.ErrInput},
		{"no focal", "label,kind,diameter_mm,material,count\n", []string{"f_<unit> and r1_<unit>", "both missing"}, stock.ErrInput},
		{"not a number", head + "A,plano-convex,5O,,,,25.4,N-BK7,1,\n", []string{"drawer.csv line 2", "column f_mm", `"5O"`, "not a number"}, stock.ErrInput},
		{"decimal comma", "label;kind;f_mm;diameter_mm;material;count\nA;plano-convex;50;25,4;N-BK7;1\n", []string{"line 2", "column diameter_mm", `"25,4"`, "point"}, stock.ErrInput},
		{"negative diameter", head + "A,plano-convex,50,,,,-25.4,N-BK7,1,\n", []string{"line 2", "column diameter_mm = -25.4 mm", "positive"}, stock.ErrInput},
		{"inch diameter", "label,kind,f_mm,diameter_in,material,count\nA,plano-convex,50,-1,N-BK7,1\n", []string{"column diameter_in = -25.4 mm"}, stock.ErrInput},
		{"count", head + "# c\nA,plano-convex,50,,,,25.4,N-BK7,1.5,\n", []string{"line 3", "column count", `"1.5"`, "whole number"}, stock.ErrInput},
		{"zero count", head + "A,plano-convex,50,,,,25.4,N-BK7,0,\n", []string{"column count = 0"}, stock.ErrInput},
		{"kind", head + "A,plano convex-ish,50,,,,25.4,N-BK7,1,\n", []string{"column kind", `"plano convex-ish"`, "plano-convex, biconvex"}, stock.ErrInput},
		{"empty kind", head + "A,,50,,,,25.4,N-BK7,1,\n", []string{"column kind", "empty"}, stock.ErrInput},
		{"glass", head + "A,plano-convex,50,,,,25.4,crown,1,\n", []string{"column material = \"crown\"", "column index"}, stock.ErrInput},
		{"short row", head + "A,plano-convex,50\n", []string{"line 2", "row = 3", "header has 10"}, stock.ErrInput},
		{"quote", head + "A,plano-convex,50,,,,25.4,N-BK7,1,\"open\n", []string{"line 2", "CSV syntax"}, stock.ErrInput},
		{"duplicate", head + "A,plano-convex,50,,,,25.4,N-BK7,1,\na,plano-convex,75,,,,25.4,N-BK7,1,\n", []string{"line 3", `column label = "a"`, "first on line 2"}, stock.ErrInput},
		{"radius", head + "A,biconvex,,50,50,3,25.4,N-BK7,1,\n", []string{"line 2", "column kind = biconvex", "R2 = 50 mm"}, stock.ErrInput},
		{"small radius", head + "A,plano-convex,,5,inf,3,25.4,N-BK7,1,\n", []string{"column r1_mm = 5 mm", "half the diameter 12.7 mm"}, stock.ErrNotPhysical},
		{"disagree", head + "A,plano-convex,60,25.84,inf,3,25.4,N-BK7,1,\n", []string{"column f_mm = 60 mm", "lensmaker"}, stock.ErrInput},
		{"infinite", head + "A,plano-convex,inf,,,,25.4,N-BK7,1,\n", []string{"column f_mm", "finite"}, stock.ErrInput},
	} {
		_, err := stock.Read(strings.NewReader(test.in), "drawer.csv")
		if err == nil {
			t.Errorf("%s: Read = nil error", test.name)
			continue
		}
		for _, w := range test.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q does not contain %q", test.name, err, w)
			}
		}
		if !errors.Is(err, test.err) {
			t.Errorf("%s: error %q does not wrap %v", test.name, err, test.err)
		}
	}
	if _, err := stock.ReadFile("no-such-drawer.csv"); !errors.Is(err, fs.ErrNotExist) || !errors.Is(err, stock.ErrInput) {
		t.Errorf("ReadFile(missing) = %v, want fs.ErrNotExist and ErrInput", err)
	}
}

// FuzzRead: no input makes Read panic; what it accepts is a valid stock
// whose lenses have finite, nonzero focal lengths and whose table has a
// row per entry. The seed corpus (the demo kit, the test files and bad
// rows) runs in every go test.
func FuzzRead(f *testing.F) {
	for _, p := range []string{drawer, "../../testdata/stock/expander.csv", "../../testdata/stock/mixed-units.csv"} {
		data, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(string(data))
	}
	const head = "label,kind,f_mm,r1_mm,r2_mm,ct_mm,diameter_mm,material,index,count,note\n"
	for _, row := range []string{
		"A,meniscus,,38.6,100,4,25.4,N-BK7,,1,\n", "A,biconcave,-50,,,2,12.7,,1.7,2,x\n", "A,plano-convex,,inf,-25.8,3,25.4,,1.5168,1,\n",
		"A,achromat,1e308,,,,1e-300,,,1,\n", "A,biconvex,1,,,1e9,1,N-SF11,,1,\n", "A,plano-concave,-0,,,,25.4,bk7,,1,\n",
		"\"A,\"\"B\",plano-convex,100,,,,25.4,uvfs,,9999,\"a\nb\"\n", "A,biconvex,,1e-320,-1e-320,1,1,N-BK7,,1,\n",
	} {
		f.Add(head + row)
	}
	f.Fuzz(func(t *testing.T, in string) {
		st, err := stock.Read(strings.NewReader(in), "fuzz.csv")
		if err != nil {
			var pe *stock.ParamError
			if !errors.As(err, &pe) {
				t.Fatalf("Read error %T %q is not a *ParamError", err, err)
			}
			return
		}
		if err := st.Validate(); err != nil {
			t.Fatalf("Read accepted a stock that does not validate: %v", err)
		}
		for _, l := range st.Lenses {
			if f := float64(l.Focal); f == 0 || math.IsNaN(f) || math.IsInf(f, 0) || !(l.Diameter > 0) {
				t.Fatalf("lens %+v: bad focal length or diameter", l)
			}
			if l.Kind != stock.Achromat && math.IsNaN(l.ShapeFactor()) {
				t.Fatalf("lens %+v: NaN shape factor", l)
			}
		}
		if tb := st.Table(); len(tb.Rows) != st.Len() || tb.Validate() != nil {
			t.Fatalf("Table: %d rows for %d lenses", len(tb.Rows), st.Len())
		}
	})
}

// FuzzLensFromSpec: no spec makes LensFromSpec panic, and an accepted
// lens has a finite, nonzero focal length, and for a lens given by radii
// the lensmaker's focal length.
func FuzzLensFromSpec(f *testing.F) {
	f.Add(int(stock.PlanoConvex), 0.05, 0.0, 0.0, 0.0, 0.0254, 1.5168)
	f.Add(int(stock.Biconvex), 0.0, 0.1024, -0.1024, 0.0036, 0.0254, 1.5168)
	f.Add(int(stock.Meniscus), 0.0, 0.0386, 0.1, 0.004, 0.0254, 1.5168)
	f.Add(int(stock.Achromat), -0.05, 0.0, 0.0, 0.0, 0.0127, 0.0)
	f.Add(int(stock.Biconcave), -0.05, 0.0, 0.0, 0.01, 0.0127, 4.0)
	f.Fuzz(func(t *testing.T, kind int, focal, r1, r2, ct, d, n float64) {
		l, err := stock.LensFromSpec(stock.Spec{Label: "F", Kind: stock.Kind(kind), Focal: units.Length(focal), R1: units.Length(r1), R2: units.Length(r2),
			Thickness: units.Length(ct), Diameter: units.Length(d), Index: n, Count: 1})
		if err != nil {
			return
		}
		if err := l.Validate(); err != nil {
			t.Fatalf("accepted lens does not validate: %v", err)
		}
		if l.FromRadii {
			if g := stock.LensmakerFocal(l.R1, l.R2, l.Thickness, l.Index); g != l.Focal {
				t.Fatalf("Focal %v, lensmaker %v", l.Focal, g)
			}
		}
	})
}
