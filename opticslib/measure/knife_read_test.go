package measure

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// ftoa formats v in the shortest form that reads back exactly.
func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func TestReadKnifeScan(t *testing.T) {
	// Synthetic TEM00 scan written as CSV: P(x) = ½[1 + erf(√2 x/w)]
	// (reference-checks R18), w = 0.5 mm, read back and fitted.
	var b strings.Builder
	b.WriteString("# invented demo scan\nx_mm,p_mW,sigma_p_mW\n")
	for i := range 31 {
		x := -1.5 + 0.1*float64(i)
		p := 2 * 0.5 * (1 + math.Erf(math.Sqrt2*x/0.5))
		b.WriteString(strings.Join([]string{ftoa(x), ftoa(p), "0.01"}, ",") + "\n")
	}
	s, err := ReadKnifeScan(strings.NewReader(b.String()), "scan.csv")
	if err != nil {
		t.Fatal(err)
	}
	if s.PowerUnit != "mW" || len(s.Positions) != 31 || len(s.PowerUncertainties) != 31 || math.Abs(float64(s.Positions[0])+1.5e-3) > 1e-15 {
		t.Fatalf("ReadKnifeScan = %+v", s)
	}
	k, err := KnifeEdgeFromScan(s)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(float64(k.Radius.Value)-0.5e-3) > 1e-9 {
		t.Errorf("fitted radius %v, want 0.5 mm", k.Radius)
	}
	for _, bad := range []struct{ csv, want string }{
		{"x_mm,p_mW,sigma_p_uW\n0,1,1\n", "must be in the unit of column p_mW"},
		{"x_deg,p_mW\n0,1\n", "x_deg"},
		{"x_mm,q_mW\n0,1\n", "column p: missing"},
	} {
		_, err := ReadKnifeScan(strings.NewReader(bad.csv), "bad.csv")
		if !errors.Is(err, ErrInput) || !strings.Contains(err.Error(), bad.want) {
			t.Errorf("ReadKnifeScan(%q) error = %v, want ErrInput containing %q", bad.csv, err, bad.want)
		}
	}
}
