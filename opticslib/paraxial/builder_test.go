package paraxial

import (
	"errors"
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/units"
)

func TestBuilderErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, test := range []struct {
		name string
		b    *Builder
		want string
		is   error
	}{
		{"zero focal", NewBuilder().Space(0.1).Space(0.1).Space(0.1).ThinLens(0),
			"paraxial: element 3 (thin lens): focal length f = 0 m: must be nonzero and finite", nil},
		{"nan focal", NewBuilder().ThinLens(units.Length(nan)),
			"paraxial: element 0 (thin lens): focal length f = NaN m: must be nonzero and finite", nil},
		{"negative space", NewBuilder().ThinLens(0.1).Space(-5 * units.Millimeter),
			"paraxial: element 1 (space): length d = -5 mm: must be non-negative and finite", nil},
		{"inf space", NewBuilder().Space(units.Length(inf)),
			"paraxial: element 0 (space): length d = +Inf m: must be non-negative and finite", nil},
		{"zero radius", NewBuilder().Interface(0, 1.5),
			"paraxial: element 0 (spherical interface): radius R = 0 m: must be nonzero and finite (use PlanarInterface for a flat surface)", nil},
		{"bad n2", NewBuilder().Space(1).Interface(0.1, -1.5),
			"paraxial: element 1 (spherical interface): index n2 = -1.5: must be positive and finite", nil},
		{"planar zero n", NewBuilder().PlanarInterface(0),
			"paraxial: element 0 (planar interface): index n2 = 0: must be positive and finite", nil},
		{"medium nan", NewBuilder().Medium(nan),
			"paraxial: Medium at element 0: index n = NaN: must be positive and finite", nil},
		{"medium late", NewBuilder().Space(1).Medium(1.5),
			"paraxial: Medium at element 1: index n = 1.5: medium can only be set before the first element; use an interface to change index", ErrMediumAfterElements},
		{"label first", NewBuilder().Label("L1"),
			"paraxial: Label(\"L1\") at element 0: no element to modify", ErrNoElement},
		{"aperture first", NewBuilder().Aperture(1),
			"paraxial: Aperture at element 0: radius = 1 m: no element to modify", ErrNoElement},
		{"aperture negative", NewBuilder().ThinLens(0.1).Aperture(-1 * units.Millimeter),
			"paraxial: element 0 (thin lens): aperture radius = -1 mm: must be non-negative and finite", nil},
		{"sticky first error", NewBuilder().ThinLens(0).Space(-1).Interface(0, 0),
			"paraxial: element 0 (thin lens): focal length f = 0 m: must be nonzero and finite", nil},
		{"overflow", NewBuilder().Space(1e300).ThinLens(1e-300).Space(1e300),
			ErrOverflow.Error(), ErrOverflow},
	} {
		_, err := test.b.Build()
		if err == nil {
			t.Errorf("%s: Build() error = nil, want %q", test.name, test.want)
			continue
		}
		if err.Error() != test.want {
			t.Errorf("%s: Build() error = %q, want %q", test.name, err, test.want)
		}
		if test.is != ErrOverflow && test.b.Err() != err {
			t.Errorf("%s: Err() = %v, want the Build error", test.name, test.b.Err())
		}
		if test.is != nil && !errors.Is(err, test.is) {
			t.Errorf("%s: errors.Is(err, %v) = false", test.name, test.is)
		}
		var ee *ElementError
		if test.is != ErrOverflow && !errors.As(err, &ee) {
			t.Errorf("%s: error %T is not an *ElementError", test.name, err)
		}
	}
}

func TestBuilderValid(t *testing.T) {
	b := NewBuilder().Medium(1.33).Space(0).ThinLens(-0.1).Aperture(0).Label("").Aperture(5 * units.Millimeter)
	s, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	if s.Len() != 2 || s.IndexIn() != 1.33 || s.IndexOut() != 1.33 || s.Element(1).Aperture != 5*units.Millimeter {
		t.Errorf("Build() = %+v, want 2 elements in n = 1.33 with a 5 mm aperture on element 1", s)
	}
	// Systems are independent of later builder calls.
	b.Space(1)
	if s.Len() != 2 || s.Length() != 0 {
		t.Errorf("System changed after a later builder call: Len() = %d, Length() = %v", s.Len(), s.Length())
	}
	empty, err := NewBuilder().Build()
	if err != nil || empty.Len() != 0 || empty.Matrix() != Identity() || empty.IndexIn() != 1 {
		t.Errorf("empty Build() = %+v, %v; want identity system in n = 1", empty, err)
	}
}

// FuzzBuilder drives the builder with arbitrary operations and values; it
// must never panic, and a successful Build must give finite matrices in
// both planes whose determinants are n_in/n_out, and analyses that either
// fail with an error or return finite numbers. The seeds below run in
// every ordinary `go test`; `go test -fuzz FuzzBuilder` explores further.
func FuzzBuilder(f *testing.F) {
	f.Add([]byte{0, 1, 1, 2, 2, 3}, 0.1, 1.5)
	f.Add([]byte{1, 0, 0, 4, 5, 6, 3, 3}, -0.05, 0.0)
	f.Add([]byte{6, 2, 2, 7, 1}, math.NaN(), math.Inf(1))
	f.Add([]byte{}, 0.0, 0.0)
	f.Add([]byte{0, 9, 1, 10, 0, 9}, 1e300, 1e-300)
	f.Add([]byte{7, 5, 0, 5, 8, 3, 9, 4, 10, 5, 11, 1, 12, 6, 13, 0}, 0.05, 1.5)
	f.Add([]byte{14, 4, 0, 5, 1, 5, 6, 4, 0, 5}, 0.2, 0.01)
	special := []float64{0, -1, math.NaN(), math.Inf(1), 1e-3, 0.1, 1.5, -0.05, 1e300, 1e-300, math.Inf(-1), 5e-324}
	f.Fuzz(func(t *testing.T, ops []byte, x, y float64) {
		b := NewBuilder()
		for i := 0; i+1 < len(ops) && i < 64; i += 2 {
			v := x
			if k := int(ops[i+1]); k < len(special) {
				v = special[k]
			} else if k%2 == 0 {
				v = y
			}
			switch ops[i] % 15 {
			case 0:
				b.Space(units.Length(v))
			case 1:
				b.ThinLens(units.Length(v))
			case 2:
				b.Interface(units.Length(v), y)
			case 3:
				b.PlanarInterface(v)
			case 4:
				b.Medium(v)
			case 5:
				b.Label("x")
			case 6:
				b.Aperture(units.Length(v))
			case 7:
				b.ThickLens(units.Length(v), units.Length(-y), units.Length(math.Abs(v)), y)
			case 8:
				b.Plate(units.Length(v), y, units.Angle(x))
			case 9:
				b.Mirror(units.Length(v), units.Angle(y))
			case 10:
				b.CylindricalLens(units.Length(v), Plane(ops[i+1]%3))
			case 11:
				b.Matrix(Matrix{A: 1, B: v, D: 1}, Matrix{A: 1, C: y, D: 1})
			case 12:
				b.Diaphragm(units.Length(v))
			case 13:
				if sub, err := NewBuilder().ThinLens(units.Length(v)).Space(units.Length(math.Abs(y))).Build(); err == nil {
					b.Append(sub)
				}
			case 14:
				b.Space(units.Length(math.Abs(v))).Aperture(units.Length(math.Abs(y)))
			}
		}
		s, err := b.Build()
		if err != nil {
			if err.Error() == "" {
				t.Fatalf("empty error message")
			}
			return
		}
		for _, p := range []Plane{Tangential, Sagittal} {
			m := s.PlaneMatrix(p)
			if !m.finite() {
				t.Fatalf("Build() succeeded with a non-finite %v matrix %+v", p, m)
			}
			if _, err := s.MatrixBetween(s.Length()/4, s.Length()/2, p); err != nil && err != ErrOverflow {
				t.Fatalf("MatrixBetween error: %v", err)
			}
			if c, err := s.Cardinal(p); err == nil {
				for _, v := range []units.Length{c.EFL, c.FrontFocal, c.RearFocal, c.FrontPrincipal, c.RearNodal} {
					if !finite(float64(v)) {
						t.Fatalf("Cardinal returned non-finite %v: %+v", v, c)
					}
				}
			}
			if im, err := s.Image(-0.1, p); err == nil && (!finite(float64(im.Image)) || !finite(im.Magnification)) {
				t.Fatalf("Image returned non-finite %+v", im)
			}
			if a, err := s.Apertures(ObjectAt(-0.1), p); err == nil {
				if !finite(a.ImageNA) || !finite(float64(a.Entrance.Z)) || !finite(float64(a.HalfField.Height)) {
					t.Fatalf("Apertures returned non-finite %+v", a)
				}
			}
		}
		if _, err := s.MatrixTo(s.Length() / 2); err != nil && err != ErrOverflow {
			t.Fatalf("MatrixTo(L/2) error: %v", err)
		}
		_ = s.Prescription().Text()
	})
}
