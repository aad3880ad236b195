package errtext

import (
	"errors"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

// What is checked: every value prints with its unit, angles in the unit a
// user may have typed (degrees) and in radians, and empty parts are left
// out. No outside reference: this is the project's own message format.
func TestMessage(t *testing.T) {
	for _, test := range []struct {
		pkg, subject, param string
		v                   any
		reason              string
		cause               error
		want                string
	}{
		{"paraxial", "ThickLens \"L2\" (call 3)", "front radius R1", units.Length(0), "must be nonzero", nil,
			"paraxial: ThickLens \"L2\" (call 3): front radius R1 = 0 m: must be nonzero"},
		{"paraxial", "FlatMirror (call 2)", "angle of incidence θ", 95 * units.Degree, "must be below 90°", nil,
			"paraxial: FlatMirror (call 2): angle of incidence θ = 95° (1.65806 rad): must be below 90°"},
		{"beam", "", "M²", 0.5, "must be at least 1", nil, "beam: M² = 0.5: must be at least 1"},
		{"beam", "", "input beam", nil, "is nil", nil, "beam: input beam: is nil"},
		{"beam", "", "Im q", units.Length(-1e-3), "", errors.New("beam: not physical"), "beam: Im q = -1 mm: not physical"},
		{"wave", "", "sample count n", 70000, "must be at most 65536", nil, "wave: sample count n = 70000: must be at most 65536"},
	} {
		if got := Message(test.pkg, test.subject, test.param, test.v, test.reason, test.cause); got != test.want {
			t.Errorf("Message = %q, want %q", got, test.want)
		}
	}
}

// Quote cuts on rune boundaries: a label of 40 two-byte characters keeps
// 32 whole characters.
func TestQuoteRunes(t *testing.T) {
	s := ""
	for range 40 {
		s += "é"
	}
	got := Quote(s)
	want := "\"" + s[:64] + "…\""
	if got != want {
		t.Errorf("Quote(40 × é) = %q, want %q", got, want)
	}
}
