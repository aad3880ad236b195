package unitcsv

import "testing"

// TestMetresExact: lengths convert with one rounding (150 mm is the
// double nearest 0.15 m, which a multiplication by 1e-3 misses), and the
// inch is 0.0254 m exactly (international yard and pound agreement,
// 1959).
func TestMetresExact(t *testing.T) {
	mm, _ := Metres("MM")
	if got := mm(150); got != 0.15 {
		t.Errorf("150 mm = %.17g m, want 0.15", got)
	}
	in, _ := Metres("in")
	if got := in(1); got != 0.0254 {
		t.Errorf("1 in = %.17g m, want 0.0254", got)
	}
	if _, ok := Metres("deg"); ok {
		t.Errorf("deg accepted as a length unit")
	}
	if k, ok := Radians("mrad"); !ok || k != 1e-3 {
		t.Errorf("mrad = %g rad (%v)", k, ok)
	}
}

func TestSplit(t *testing.T) {
	for _, c := range []struct {
		name, q, unit string
		ok            bool
	}{
		{"z_mm", "z", "mm", true}, {"Z (um)", "z", "um", true}, {"x [in]", "x", "in", true},
		{"z", "z", "", true}, {"zeta_mm", "z", "", false}, {"z_mm_2", "z", "mm_2", false},
	} {
		u, ok := Split(c.name, c.q)
		if u != c.unit || ok != c.ok {
			t.Errorf("Split(%q, %q) = %q, %v; want %q, %v", c.name, c.q, u, ok, c.unit, c.ok)
		}
	}
	if Separator([]byte("# c\n\na;b;c\n")) != ';' || Separator([]byte("a,b\tc\n")) != ',' {
		t.Errorf("Separator picks the wrong rune")
	}
}
