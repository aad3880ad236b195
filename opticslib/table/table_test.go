package table

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// What is checked: alignment on runes (µ, ∞ and ′ are multi-byte), the
// rule, padding of short rows, no trailing spaces; the project's own format.
func TestText(t *testing.T) {
	tb := Table{
		Caption: "Waists",
		Header:  []string{"element", "w0 (µm)", "R (mm)"},
		Rows:    [][]string{{"L1", "12.5", "∞"}, {"after L2′", "3"}},
	}
	want := "Waists\n" +
		"element    w0 (µm)  R (mm)\n" +
		"---------  -------  ------\n" +
		"L1         12.5     ∞\n" +
		"after L2′  3\n"
	if got := tb.Text(); got != want {
		t.Errorf("Text() =\n%s\nwant\n%s", got, want)
	}
	if err := tb.Validate(); err != nil {
		t.Errorf("Validate() = %v, want nil", err)
	}
	tb.Rows = append(tb.Rows, []string{"a", "b", "c", "d"})
	if err := tb.Validate(); err == nil {
		t.Errorf("Validate() with a 4-cell row = nil, want an error")
	}
}

// Number formats of the tables: the project's own conventions (∞ for an
// infinite value, no "-0"), no outside reference.
func TestFixed(t *testing.T) {
	for _, test := range []struct {
		v    float64
		dec  int
		want string
	}{
		{math.Inf(1), 3, "∞"}, {math.Inf(-1), 3, "−∞"}, {-0.0001, 2, "0.00"}, {math.Copysign(0, -1), 1, "0.0"}, {12.345, 1, "12.3"},
	} {
		if got := Fixed(test.v, test.dec); got != test.want {
			t.Errorf("Fixed(%g, %d) = %q, want %q", test.v, test.dec, got, test.want)
		}
	}
}

// Each length in the unit that suits it: the project's own convention.
func TestQuantityAndUnits(t *testing.T) {
	for _, test := range []struct {
		l    units.Length
		want string
	}{{0.42e-3, "420 µm"}, {1.2411, "1.241 m"}, {632.8e-9, "632.8 nm"}, {15e-3, "15 mm"}, {units.Length(math.Inf(1)), "∞"}} {
		if got := Quantity(test.l); got != test.want {
			t.Errorf("Quantity(%g) = %q, want %q", float64(test.l), got, test.want)
		}
	}
	if _, s := LengthUnit(2e-6, 9e-4); s != "µm" {
		t.Errorf("LengthUnit(µm values) = %s", s)
	}
	if _, s := LengthUnit(0.5, units.Length(math.Inf(1))); s != "mm" {
		t.Errorf("LengthUnit(0.5 m, ∞) = %s, want mm", s)
	}
	if got := In(12.34567e-3, units.Millimeter, 2); got != "12.35" {
		t.Errorf("In = %q", got)
	}
}

// Significant digits without exponents in the everyday range: the
// project's own convention.
func TestSig(t *testing.T) {
	for _, test := range []struct {
		v    float64
		n    int
		want string
	}{{5320, 3, "5320"}, {5324.9, 3, "5320"}, {0.006562, 4, "0.006562"}, {2.1, 5, "2.1"}, {61.5263, 4, "61.53"}, {7.22e8, 3, "7.22e+08"}, {3e-5, 2, "3e-05"}, {999.96, 4, "1000"}, {-0.75573, 4, "-0.7557"}} {
		if got := Sig(test.v, test.n); got != test.want {
			t.Errorf("Sig(%g, %d) = %q, want %q", test.v, test.n, got, test.want)
		}
	}
}
