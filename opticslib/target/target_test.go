package target

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

func TestTargets(t *testing.T) {
	// The rules are definitions (inclusive ranges); the texts are the
	// documented forms.
	for _, test := range []struct {
		t       Target
		met     bool
		miss    float64
		problem string
		line    string
	}{
		{Near("output radius", 2.031*mm, 2*mm, 0.1*mm), true, 0, "",
			"target output radius: 2.031 mm (wanted 2 ± 0.1 mm): met"},
		{Near("output radius", 2.21*mm, 2*mm, 0.1*mm), false, 0.11e-3, "is 0.11 mm above the range",
			"target output radius: 2.21 mm (wanted 2 ± 0.1 mm): MISSED: is 0.11 mm above the range"},
		{Near("edge", 2.1*mm, 2*mm, 0.1*mm), true, 0, "", ""}, // inclusive, although 2 mm + 0.1 mm rounds below 2.1 mm
		{Between("working distance", 18*mm, 20*mm, 30*mm), false, -2e-3, "is 2 mm below the range",
			"target working distance: 18 mm (wanted 20 … 30 mm): MISSED: is 2 mm below the range"},
		{AtLeast("transmission", 0.9364, 0.99), false, 0.9364 - 0.99, "is 0.0536 (5.4 %) below the limit",
			"target transmission: 0.9364 (wanted ≥ 0.99): MISSED: is 0.0536 (5.4 %) below the limit"},
		{AtMost("spot", 40*units.Micrometer, 50*units.Micrometer), true, 0, "",
			"target spot: 40 µm (wanted ≤ 50 µm): met"},
		{AtMost("tilt", 2*units.Milliradian, 1*units.Milliradian), false, 1e-3, "is 1 mrad above the limit", ""},
		{Near("bad", 1*mm, 1*mm, -0.1*mm), false, math.NaN(), "invalid target: tolerance -0.1 mm must be finite and ≥ 0", ""},
		{Between("bad", 1.0, 3, 2), false, math.NaN(), "invalid target: range 3 … 2 must be finite with lo ≤ hi", ""},
		{AtLeast("nan", math.NaN(), 1.0), false, math.NaN(), "value NaN is not a finite number", ""},
	} {
		tt := test.t
		if got := tt.Met(); got != test.met {
			t.Errorf("%s: Met() = %v, want %v", tt.Name, got, test.met)
		}
		if got := tt.Miss(); !(got == test.miss || math.Abs(got-test.miss) < 1e-12 || (math.IsNaN(got) && math.IsNaN(test.miss))) {
			t.Errorf("%s: Miss() = %g, want %g", tt.Name, got, test.miss)
		}
		if got := tt.Problem(); got != test.problem {
			t.Errorf("%s: Problem() = %q, want %q", tt.Name, got, test.problem)
		}
		if test.line != "" && tt.String() != test.line {
			t.Errorf("String() = %q, want %q", tt.String(), test.line)
		}
		err := tt.Err()
		if (err == nil) != test.met {
			t.Errorf("%s: Err() = %v with Met() = %v", tt.Name, err, test.met)
		}
		if err != nil {
			want := ErrMissed
			if strings.HasPrefix(test.problem, "invalid") || strings.HasPrefix(test.problem, "value") {
				want = ErrInvalid
				if strings.HasPrefix(test.problem, "value") {
					want = ErrMissed
				}
			}
			if !errors.Is(err, want) {
				t.Errorf("%s: Err() = %v, want errors.Is %v", tt.Name, err, want)
			}
		}
	}
}

func sample() Record {
	return Record{Source: "relay.ipynb", Producer: "beamnote abc1234, go1.26.8, 2026-12-02T06:00:00Z", Targets: []Target{
		Near("magnification", -2.00031, -2, 0.01),
		Between("working distance", 24.3102*mm, 20*mm, 30*mm),
		AtLeast("fold transmission", 0.9364, 0.99),
		AtMost("spot radius", 12.5*units.Micrometer, 15*units.Micrometer),
		Near("tilt", 0.4*units.Milliradian, 0, 1*units.Milliradian),
	}}
}

func TestRecordRoundTrip(t *testing.T) {
	r := sample()
	text := r.String()
	want := "# beamnote design record: relay.ipynb\n" +
		"# produced by: beamnote abc1234, go1.26.8, 2026-12-02T06:00:00Z\n" +
		"# target\tvalue\twanted\tresult\n" +
		"magnification\t-2.00031\t-2 ± 0.01\tmet\n" +
		"working distance\t24.3102 mm\t20 … 30 mm\tmet\n" +
		"fold transmission\t0.9364\t≥ 0.99\tMISSED: is 0.0536 (5.4 %) below the limit\n" +
		"spot radius\t12.5 µm\t≤ 15 µm\tmet\n" +
		"tilt\t0.4 mrad\t0 ± 1 mrad\tmet\n"
	if text != want {
		t.Errorf("record =\n%s\nwant\n%s", text, want)
	}
	back, err := ReadRecord(strings.NewReader(text))
	if err != nil {
		t.Fatalf("ReadRecord error: %v", err)
	}
	if back.String() != text {
		t.Errorf("record after a round trip =\n%s\nwant\n%s", back.String(), text)
	}
	if ch := Compare(r, back); len(ch) != 0 {
		t.Errorf("Compare(record, its round trip) = %v, want no change", ch)
	}
}

func TestReadRecordErrors(t *testing.T) {
	for _, test := range []struct{ line, want string }{
		{"a\t1 mm\t1 ± 0.1 rad\tmet", "is in an angle unit, the value in a length unit"},
		{"a\t1 parsec\t1 ± 0.1\tmet", `unit "parsec"`},
		{"a\t1 mm\tabout 1 mm\tmet", "is not \"a ± tol\""},
		{"a\t1 mm", "has 2 tab-separated fields"},
		{"\t1 mm\t≥ 1 mm\tmet", "has no target name"},
		{"a\tx mm\t≥ 1 mm\tmet", "is not a number"},
	} {
		_, err := ReadRecord(strings.NewReader("# comment\n\n" + test.line + "\n"))
		var le *LineError
		if !errors.As(err, &le) || le.Line != 3 || !strings.Contains(err.Error(), test.want) {
			t.Errorf("ReadRecord(%q) error = %v, want a line 3 error containing %q", test.line, err, test.want)
		}
	}
}

func TestCompare(t *testing.T) {
	old := sample()
	nw := sample()
	nw.Targets = append([]Target(nil), nw.Targets...)
	nw.Targets[0] = Near("magnification", -2.02, -2, 0.01)              // moved beyond 0.01, now missed
	nw.Targets[1] = Between("working distance", 24.31*mm, 20*mm, 30*mm) // moved 0.2 µm: within 5 mm
	nw.Targets[2] = AtLeast("fold transmission", 0.9371, 0.99)          // one-sided: digits changed
	nw.Targets = append(nw.Targets[:4], Near("new one", 1.0, 1, 0.1))   // tilt dropped, one added
	got := Compare(old, nw)
	var lines []string
	for _, c := range got {
		lines = append(lines, c.String())
	}
	want := []string{
		"magnification: now missed: is 0.01 (0.5 %) below the range (-2.00031 → -2.02)",
		"fold transmission: moved by +0.0007 (one-sided target: no tolerance) (0.9364 → 0.9371)",
		"new one: new target (1)",
		"tilt: no longer stated (was 0.4 mrad)",
	}
	if strings.Join(lines, "\n") != strings.Join(want, "\n") {
		t.Errorf("Compare =\n%s\nwant\n%s", strings.Join(lines, "\n"), strings.Join(want, "\n"))
	}
}

func FuzzReadRecord(f *testing.F) {
	// Any input: no panic; what parses writes back to a text that parses
	// to the same record.
	f.Add(sample().String())
	f.Add("a\t1 µm\t≤ 2 µm\tmet\n")
	f.Add("a\tNaN mm\t1 … 2 mm\tMISSED\n")
	f.Fuzz(func(t *testing.T, s string) {
		r, err := ReadRecord(strings.NewReader(s))
		if err != nil {
			return
		}
		text := r.String()
		r2, err := ReadRecord(strings.NewReader(text))
		if err != nil {
			t.Fatalf("record written from %q does not parse: %v\n%s", s, err, text)
		}
		if r2.String() != text {
			t.Fatalf("round trip changed the record:\n%s\n→\n%s", text, r2.String())
		}
	})
}
