package cavity_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/cavity"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

func TestLinearErrors(t *testing.T) {
	// Messages follow internal/errtext: "cavity: subject: param = value
	// unit: reason"; the test checks the parts a user reads.
	path, _ := paraxial.NewBuilder().Space(100 * mm).Build()
	back, _ := paraxial.NewBuilder().Space(50 * mm).ThinLens(0.1).Label("return").Space(50 * mm).Build()
	clash, _ := paraxial.NewBuilder().Space(50 * mm).ThinLens(0.1).Label("M1").Space(50 * mm).Build()
	good := cavity.LinearSpec{M1: concave(1, 0.99), M2: concave(1, 0.99), Spacing: 0.5, Wavelength: heNe}
	for _, test := range []struct {
		name string
		edit func(s *cavity.LinearSpec)
		want []string
	}{
		{"negative radius", func(s *cavity.LinearSpec) { s.M1.Radius = -500 * mm },
			[]string{`cavity: mirror "M1": radius of curvature R = -500 mm: must be positive and finite`}},
		{"radius on a flat mirror", func(s *cavity.LinearSpec) { s.M2 = cavity.Mirror{Radius: 1} },
			[]string{`mirror "M2": radius of curvature R = 1 m: a flat mirror has no radius`}},
		{"NaN radius", func(s *cavity.LinearSpec) { s.M1.Radius = units.Length(math.NaN()) }, []string{"R = NaN m"}},
		{"unknown shape", func(s *cavity.LinearSpec) { s.M1.Shape = 7 }, []string{"shape = 7", "Flat, Concave or Convex"}},
		{"reflectivity above 1", func(s *cavity.LinearSpec) { s.M2.Reflectivity = 1.5 }, []string{`mirror "M2": reflectivity R = 1.5: must be in (0, 1]`}},
		{"one reflectivity", func(s *cavity.LinearSpec) { s.M2.Reflectivity = 0 }, []string{`mirror "M2"`, "both end mirrors or of neither"}},
		{"same labels", func(s *cavity.LinearSpec) { s.M1.Label, s.M2.Label = "X", "X" }, []string{`mirror "X": label = "X"`}},
		{"label with slash", func(s *cavity.LinearSpec) { s.M1.Label = "a/b" }, []string{`label = "a/b"`}},
		{"spacing and path", func(s *cavity.LinearSpec) { s.Path = path }, []string{"Spacing = 500 mm: give Spacing or Path (100 mm long), not both"}},
		{"no spacing", func(s *cavity.LinearSpec) { s.Spacing = 0 }, []string{"give Spacing"}},
		{"negative spacing", func(s *cavity.LinearSpec) { s.Spacing = -1 }, []string{"Spacing = -1 m: must be positive and finite"}},
		{"return label", func(s *cavity.LinearSpec) { s.Spacing, s.Path = 0, back }, []string{`label = "return"`}},
		{"path label clash", func(s *cavity.LinearSpec) { s.Spacing, s.Path = 0, clash }, []string{`mirror "M1": label = "M1": a part of Path carries the same label`}},
		{"loss", func(s *cavity.LinearSpec) { s.Loss = 1 }, []string{"round-trip loss = 1: must be in [0, 1)"}},
		{"no wavelength", func(s *cavity.LinearSpec) { s.Wavelength = 0 }, []string{"wavelength λ0 = 0 m"}},
	} {
		s := good
		test.edit(&s)
		_, err := cavity.Linear(s)
		var pe *cavity.ParamError
		if !errors.As(err, &pe) {
			t.Errorf("%s: Linear error = %v, want a *ParamError", test.name, err)
			continue
		}
		for _, w := range test.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: Linear error = %q, want it to contain %q", test.name, err, w)
			}
		}
	}
	// Flat with Radius = paraxial.Flat is canonicalised, not refused.
	s := good
	s.M2 = cavity.Mirror{Shape: cavity.Flat, Radius: paraxial.Flat, Reflectivity: 0.99}
	if _, err := cavity.Linear(s); err != nil {
		t.Errorf("flat mirror with Radius = paraxial.Flat: error %v, want none", err)
	}
}

func TestRingErrors(t *testing.T) {
	loop, _ := paraxial.NewBuilder().
		ConcaveMirror(0.2, 5*units.Degree).Label("C1").Space(0.2).
		ConcaveMirror(0.2, 5*units.Degree).Label("C2").Space(0.5).
		FlatMirror(5 * units.Degree).Space(0.3).Build()
	labelled, _ := paraxial.NewBuilder().
		ConcaveMirror(0.2, 5*units.Degree).Label("C1").Space(0.2).
		ConcaveMirror(0.2, 5*units.Degree).Label("C2").Space(0.8).Build()
	glassEnd, _ := paraxial.NewBuilder().Space(0.1).PlanarInterface(1.5).Space(0.1).Build()
	empty, _ := paraxial.NewBuilder().Build()
	for _, test := range []struct {
		name string
		spec cavity.RingSpec
		want []string
		is   error
	}{
		{"unbuilt loop", cavity.RingSpec{Wavelength: heNe}, []string{"cavity: ring: Loop"}, paraxial.ErrNotBuilt},
		{"empty loop", cavity.RingSpec{Loop: empty, Wavelength: heNe}, []string{"round-trip length = 0 m: must be positive"}, nil},
		{"ends in glass", cavity.RingSpec{Loop: glassEnd, Wavelength: heNe}, []string{"output index = 1.5: must equal the input index 1"}, nil},
		{"unknown key", cavity.RingSpec{Loop: labelled, Reflectivity: map[string]float64{"C1": 0.99, "C2": 0.99, "C3": 0.9}, Wavelength: heNe},
			[]string{`Reflectivity key = "C3": is not the label of a mirror of the loop; the mirrors are labelled "C1", "C2"`}, nil},
		{"unlabelled mirror", cavity.RingSpec{Loop: loop, Reflectivity: map[string]float64{"C1": 0.99, "C2": 0.99}, Wavelength: heNe},
			[]string{"FlatMirror (call 5): reflectivity R: not given"}, cavity.ErrNoReflectivity},
		{"bad value", cavity.RingSpec{Loop: labelled, Reflectivity: map[string]float64{"C1": 0.99, "C2": -0.1}, Wavelength: heNe},
			[]string{`mirror "C2": reflectivity R = -0.1`}, nil},
		{"loss", cavity.RingSpec{Loop: labelled, Loss: math.NaN(), Wavelength: heNe}, []string{"round-trip loss = NaN"}, nil},
	} {
		_, err := cavity.Ring(test.spec)
		if err == nil {
			t.Errorf("%s: Ring error = nil", test.name)
			continue
		}
		for _, w := range test.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: Ring error = %q, want it to contain %q", test.name, err, w)
			}
		}
		if test.is != nil && !errors.Is(err, test.is) {
			t.Errorf("%s: Ring error = %v, want errors.Is %v", test.name, err, test.is)
		}
	}
}

func TestAnalysisErrors(t *testing.T) {
	var zero cavity.Cavity
	if _, err := zero.Stability(); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity Stability error = %v, want ErrNotBuilt", err)
	}
	if _, err := zero.Eigenmode(0); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity Eigenmode error = %v, want ErrNotBuilt", err)
	}
	if _, err := zero.EigenmodeAtPart("M1"); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity EigenmodeAtPart error = %v, want ErrNotBuilt", err)
	}
	if _, err := zero.ModeSpacing(); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity ModeSpacing error = %v, want ErrNotBuilt", err)
	}
	if _, err := zero.Airy(); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity Airy error = %v, want ErrNotBuilt", err)
	}
	if _, err := zero.Spectrum(2); !errors.Is(err, cavity.ErrNotBuilt) {
		t.Errorf("zero Cavity Spectrum error = %v, want ErrNotBuilt", err)
	}
	if zero.FSR() != 0 || zero.Warnings() != nil || !strings.Contains(zero.String(), "not built") {
		t.Errorf("zero Cavity: FSR %g, Warnings %q, String %q", zero.FSR(), zero.Warnings(), zero.String())
	}

	c := twoMirror(t, concave(1, 0), concave(1, 0), 0.5)
	for _, z := range []units.Length{-1e-3, 1.001, units.Length(math.NaN()), units.Length(math.Inf(1))} {
		if _, err := c.Eigenmode(z); err == nil || !strings.Contains(err.Error(), "position z") {
			t.Errorf("Eigenmode(%v) error = %v, want a position error", z, err)
		}
	}
	if _, err := c.EigenmodeAtPart("nope"); !errors.Is(err, paraxial.ErrNoLabel) {
		t.Errorf("EigenmodeAtPart(nope) error = %v, want paraxial.ErrNoLabel", err)
	}
	u := twoMirror(t, concave(1, 0), concave(1, 0), 2.5)
	_, err := u.Eigenmode(0)
	if !errors.Is(err, cavity.ErrUnstable) || !strings.Contains(err.Error(), "cavity: tangential plane: half-trace (A + D)/2 = 3.5: |A + D|/2 > 1: unstable") {
		t.Errorf("unstable Eigenmode error = %q", err)
	}
	if _, err := u.ModeSpacing(); !errors.Is(err, cavity.ErrUnstable) {
		t.Errorf("unstable ModeSpacing error = %v, want ErrUnstable", err)
	}
	if _, err := u.Spectrum(2); !errors.Is(err, cavity.ErrUnstable) {
		t.Errorf("unstable Spectrum error = %v, want ErrUnstable", err)
	}
	func() {
		defer func() {
			if recover() == nil {
				t.Errorf("Offset(-1, 0) did not panic")
			}
		}()
		sp, _ := c.ModeSpacing()
		sp.Offset(-1, 0)
	}()
}

func TestTablesHaveNoNaN(t *testing.T) {
	// Every rendered result of a stable, a confocal, an unstable and an
	// astigmatic cavity is finite text with the header's column count.
	cases := []cavity.Cavity{
		twoMirror(t, concave(1, 0.99), concave(1, 0.99), 0.5),
		twoMirror(t, concave(1, 0), concave(1, 0), 1),
		twoMirror(t, concave(1, 0.9), concave(1, 0.9), 2.5),
		bowTie(t, 0.1, 10*units.Degree, 104*mm, 1.2),
	}
	for i, c := range cases {
		var tables []interface {
			String() string
		}
		tables = append(tables, c)
		if s, err := c.Stability(); err == nil {
			tables = append(tables, s)
		}
		if m, err := c.Eigenmode(0); err == nil {
			tables = append(tables, m)
		}
		if a, err := c.Airy(); err == nil {
			tables = append(tables, a)
		}
		if sp, err := c.ModeSpacing(); err == nil {
			tables = append(tables, sp)
		}
		if sp, err := c.Spectrum(3); err == nil {
			tables = append(tables, sp)
			if err := sp.Table().Validate(); err != nil {
				t.Errorf("case %d: Spectrum table: %v", i, err)
			}
		}
		if err := c.Table().Validate(); err != nil {
			t.Errorf("case %d: Cavity table: %v", i, err)
		}
		for _, tb := range tables {
			if s := tb.String(); strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
				t.Errorf("case %d: %T.String() contains NaN or Inf:\n%s", i, tb, s)
			}
		}
	}
}
