package paraxial

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/units"
)

// TestBuilderErrors checks that every invalid parameter is reported as an
// *ElementError naming the element index, kind, parameter and value, and
// that the first error is kept.
func TestBuilderErrors(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, test := range []struct {
		name string
		b    *Builder
		want string
		is   error
	}{
		{"zero focal", NewBuilder().Space(0.1).Space(0.1).Space(0.1).ThinLens(0),
			"paraxial: ThinLens (call 4): focal length f = 0 m: must be nonzero and finite", nil},
		{"nan focal", NewBuilder().ThinLens(units.Length(nan)),
			"paraxial: ThinLens (call 1): focal length f = NaN m: must be nonzero and finite", nil},
		{"negative space", NewBuilder().ThinLens(0.1).Space(-5 * units.Millimeter),
			"paraxial: Space (call 2): length d = -5 mm: must be non-negative and finite", nil},
		{"inf space", NewBuilder().Space(units.Length(inf)),
			"paraxial: Space (call 1): length d = +Inf m: must be non-negative and finite", nil},
		{"zero radius", NewBuilder().Interface(0, 1.5),
			"paraxial: Interface (call 1): radius R = 0 m: must be nonzero and finite (use PlanarInterface for a flat surface)", nil},
		{"bad n2", NewBuilder().Space(1).Interface(0.1, -1.5),
			"paraxial: Interface (call 2): index n2 = -1.5: must be finite and in [1e-3, 1e3]", nil},
		{"planar zero n", NewBuilder().PlanarInterface(0),
			"paraxial: PlanarInterface (call 1): index n2 = 0: must be finite and in [1e-3, 1e3]", nil},
		{"medium nan", NewBuilder().Medium(nan),
			"paraxial: Medium: index n = NaN: must be finite and in [1e-3, 1e3]", nil},
		{"medium late", NewBuilder().Space(1).Medium(1.5),
			"paraxial: Medium: index n = 1.5: medium can only be set before the first element; use an interface to change index", ErrMediumAfterElements},
		{"label first", NewBuilder().Label("L1"),
			"paraxial: Label: label = \"L1\": no element to modify", ErrNoElement},
		{"aperture first", NewBuilder().Aperture(ClearRadius(1)),
			"paraxial: Aperture: clear radius = 1 m: no element to modify", ErrNoElement},
		{"aperture negative", NewBuilder().ThinLens(0.1).Aperture(ClearRadius(-1 * units.Millimeter)),
			"paraxial: ThinLens.Aperture (call 1): clear radius = -1 mm: must be non-negative and finite (0 means unlimited)", nil},
		{"sticky first error", NewBuilder().ThinLens(0).Space(-1).Interface(0, 0),
			"paraxial: ThinLens (call 1): focal length f = 0 m: must be nonzero and finite", nil},
		{"overflow", NewBuilder().Space(1e300).ThinLens(1e-300).Space(1e300),
			"paraxial: ThinLens (call 2): Build: the running product overflows here: matrix entry overflowed (not finite)", ErrOverflow},
		{"thick lens zero radius", NewBuilder().Space(1).ThickLens(0, -0.05, 0.005, 1.5),
			"paraxial: ThickLens (call 2): front radius R1 = 0 m: must be nonzero and not NaN (use paraxial.Flat for a flat side)", nil},
		{"thick lens NaN R2", NewBuilder().ThickLens(0.05, units.Length(nan), 0.005, 1.5),
			"paraxial: ThickLens (call 1): back radius R2 = NaN m: must be nonzero and not NaN (use paraxial.Flat for a flat side)", nil},
		{"thick lens negative thickness", NewBuilder().ThickLens(0.05, -0.05, -2*mm, 1.5),
			"paraxial: ThickLens (call 1): centre thickness t = -2 mm: must be positive and finite", nil},
		{"thick lens bad index", NewBuilder().ThickLens(0.05, -0.05, 2*mm, 0),
			"paraxial: ThickLens (call 1): index n = 0: must be finite and in [1e-3, 1e3]", nil},
		{"plate inf thickness", NewBuilder().Plate(units.Length(inf), 1.5, 0),
			"paraxial: Plate (call 1): thickness t = +Inf m: must be positive and finite", nil},
		{"plate index NaN", NewBuilder().Plate(1*mm, nan, 0),
			"paraxial: Plate (call 1): index n = NaN: must be finite and in [1e-3, 1e3]", nil},
		{"plate 90°", NewBuilder().Plate(1*mm, 1.5, math.Pi/2),
			"paraxial: Plate (call 1): angle of incidence θ = 90° (1.5708 rad): must be finite with |θ| < 90°", nil},
		{"plate TIR", NewBuilder().Medium(1.5).Plate(1*mm, 1, 60*units.Degree),
			"paraxial: Plate (call 1): angle of incidence θ = 60° (1.0472 rad): is beyond the critical angle for n0 = 1.5 into n = 1", nil},
		{"mirror zero radius", NewBuilder().Space(1).ThinLens(1).ConcaveMirror(0, 0),
			"paraxial: ConcaveMirror (call 3): radius of curvature R = 0 m: must be positive and finite: give the number printed on the part and choose ConcaveMirror or ConvexMirror (FlatMirror for a flat one)", nil},
		{"mirror signed radius", NewBuilder().Space(1).ConvexMirror(-200*mm, 0).Label("M2"),
			"paraxial: ConvexMirror \"M2\" (call 2): radius of curvature R = -200 mm: must be positive and finite: give the number printed on the part and choose ConcaveMirror or ConvexMirror (FlatMirror for a flat one)", nil},
		{"mirror zero focal length", NewBuilder().MirrorOfFocalLength(0, 0),
			"paraxial: MirrorOfFocalLength (call 1): focal length f = 0 m: must be nonzero and finite (positive for a concave mirror)", nil},
		{"label names the failed call", NewBuilder().Space(1).ThickLens(0.05, -0.05, 2*mm, 1.5).Label("L1").Space(10 * mm).ThinLens(0).Label("L2"),
			"paraxial: ThinLens \"L2\" (call 4): focal length f = 0 m: must be nonzero and finite", nil},
		{"thick lens aperture beyond R", NewBuilder().ThickLens(10*mm, -10*mm, 8*mm, 1.5).Label("ball-ish").Aperture(ClearDiameter(25.4 * mm)),
			"paraxial: ThickLens.Aperture \"ball-ish\" (call 1): clear radius = 12.7 mm: reaches beyond the radius of curvature |R| = 10 mm of a spherical surface (the opening plus its offset must stay within |R|)", nil},
		{"interface aperture beyond R", NewBuilder().Interface(5*mm, 1.5).Aperture(ClearDiameter(12 * mm)),
			"paraxial: Interface.Aperture (call 1): clear radius = 6 mm: reaches beyond the radius of curvature |R| = 5 mm of a spherical surface (the opening plus its offset must stay within |R|)", nil},
		{"appended thick lens aperture", NewBuilder().Append(mustBuild(t, NewBuilder().ThickLens(20*mm, -20*mm, 2*mm, 1.5))).Label("doublet").Aperture(ClearDiameter(20 * mm)),
			"paraxial: Append.Aperture \"doublet\" (call 1): clear radius = 10 mm: leaves an edge thickness of -3.35898 mm (centre 2 mm): no such lens", nil},
		{"thick lens negative edge", NewBuilder().ThickLens(20*mm, -20*mm, 2*mm, 1.5).Label("L3").Aperture(ClearDiameter(20 * mm)),
			"paraxial: ThickLens.Aperture \"L3\" (call 1): clear radius = 10 mm: leaves an edge thickness of -3.35898 mm (centre 2 mm): no such lens", nil},
		{"slit bad plane", NewBuilder().Space(1).Diaphragm(SlitOfWidth(0.1*mm, Plane(3))),
			"paraxial: Diaphragm (call 2): slit plane = 3: must be Tangential or Sagittal", nil},
		{"opening threshold", NewBuilder().Space(1).Diaphragm(ClearDiameter(50 * units.Micrometer).WithMinTransmission(1.5)),
			"paraxial: Diaphragm (call 2): minimum transmission = 1.5: must be in (0, 1], or 0 for the path-wide threshold", nil},
		{"opening offset NaN", NewBuilder().ThinLens(0.1).Aperture(ClearDiameter(1).Offset(units.Length(nan), 0)),
			"paraxial: ThinLens.Aperture (call 1): opening offset x = NaN m: must be finite", nil},
		{"mirror NaN tilt", NewBuilder().ConcaveMirror(1, units.Angle(nan)),
			"paraxial: ConcaveMirror (call 1): angle of incidence θ = NaN° (NaN rad): must be finite with |θ| < 90°", nil},
		{"cylinder zero f", NewBuilder().CylindricalLens(0, Sagittal),
			"paraxial: CylindricalLens (call 1): focal length f = 0 m: must be nonzero and finite", nil},
		{"cylinder bad plane", NewBuilder().CylindricalLens(1, Plane(7)),
			"paraxial: CylindricalLens (call 1): plane = 7: plane must be Tangential or Sagittal", ErrPlane},
		{"matrix NaN", NewBuilder().Matrix(Matrix{A: 1, B: nan, D: 1}, Identity()),
			"paraxial: Matrix (call 1): X.B = NaN: must be finite", nil},
		{"matrix det", NewBuilder().Matrix(Identity(), Matrix{A: 2, D: 1}),
			"paraxial: Matrix (call 1): det Y = 2: must be 1 (the element keeps the medium)", nil},
		{"diaphragm zero", NewBuilder().Space(1).Diaphragm(ClearRadius(0)),
			"paraxial: Diaphragm (call 2): clear radius = 0 m: must be positive: a diaphragm has an opening", nil},
		{"aperture on thick lens", NewBuilder().Space(1).ThickLens(0.05, -0.05, 2*mm, 1.5).Aperture(ClearRadius(-1)),
			"paraxial: ThickLens.Aperture (call 2): clear radius = -1 m: must be non-negative and finite (0 means unlimited)", nil},
		{"append unbuilt", NewBuilder().Append(System{}),
			"paraxial: Append (call 1): sub-system: system not built (the zero System value); use Builder.Build and check its error", ErrNotBuilt},
		{"append index", NewBuilder().Append(mustBuild(t, NewBuilder().Medium(1.33).Space(1))),
			"paraxial: Append (call 1): sub-system input index = 1.33: must equal the current index 1", nil},
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
		if !errors.As(err, &ee) {
			t.Errorf("%s: error %T is not an *ElementError", test.name, err)
		}
	}
}

func TestBuilderValid(t *testing.T) {
	b := NewBuilder().Medium(1.33).Space(0).ThinLens(-0.1).Aperture(ClearRadius(0)).Label("").Aperture(ClearRadius(5 * units.Millimeter))
	s, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	if s.Len() != 2 || s.IndexIn() != 1.33 || s.IndexOut() != 1.33 || s.Element(1).Aperture != ClearRadius(5*units.Millimeter) {
		t.Errorf("Build() = %+v, want 2 elements in n = 1.33 with a 5 mm aperture on element 1", s)
	}
	// Systems are independent of later builder calls.
	b.Space(1)
	if s.Len() != 2 || s.Length() != 0 {
		t.Errorf("System changed after a later builder call: Len() = %d, Length() = %v", s.Len(), s.Length())
	}
	empty, err := NewBuilder().Build()
	if err != nil || empty.Len() != 0 || empty.Matrix(Tangential) != Identity() || empty.IndexIn() != 1 {
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
			switch ops[i] % 17 {
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
				b.Aperture(ClearRadius(units.Length(v)))
			case 7:
				b.ThickLens(units.Length(v), units.Length(-y), units.Length(math.Abs(v)), y)
			case 8:
				b.Plate(units.Length(v), y, units.Angle(x))
			case 9:
				switch ops[i+1] % 4 {
				case 0:
					b.ConcaveMirror(units.Length(v), units.Angle(y))
				case 1:
					b.ConvexMirror(units.Length(v), units.Angle(y))
				case 2:
					b.MirrorOfFocalLength(units.Length(v), units.Angle(y))
				default:
					b.FlatMirror(units.Angle(v))
				}
			case 10:
				b.CylindricalLens(units.Length(v), Plane(ops[i+1]%3))
			case 11:
				b.Matrix(Matrix{A: 1, B: v, D: 1}, Matrix{A: 1, C: y, D: 1})
			case 12:
				b.Diaphragm(ClearRadius(units.Length(v)))
			case 13:
				if sub, err := NewBuilder().ThinLens(units.Length(v)).Space(units.Length(math.Abs(y))).Build(); err == nil {
					b.Append(sub)
				}
			case 14:
				b.Space(units.Length(math.Abs(v))).Aperture(ClearRadius(units.Length(math.Abs(y))))
			case 15:
				b.Aperture(ClearDiameter(units.Length(v)).Offset(units.Length(y), units.Length(v/3)).WithMinTransmission(y))
			case 16:
				b.Diaphragm(SlitOfWidth(units.Length(v), Plane(ops[i+1]%3)).Offset(units.Length(y), 0))
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
			m := s.Matrix(p)
			if !m.finite() {
				t.Fatalf("Build() succeeded with a non-finite %v matrix %+v", p, m)
			}
			// det = n_in/n_out (R27). Each user matrix may be off by 1e-9
			// and up to 32 elements are composed; rounding in the product
			// is bounded by N·ε times the product of the entrywise
			// magnitudes (Higham 2002, §3.5 [from memory]), which with
			// extreme lengths (1e300 m) can dwarf the entries themselves.
			// Allow 1e-7 of that bound's Ā·D̄ + B̄·C̄.
			_, bound := s.product(0, s.Len(), p)
			if scale := bound.A*bound.D + bound.B*bound.C; finite(scale) {
				if want := s.IndexIn() / s.IndexOut(); !scalar.EqualWithinAbsOrRel(m.Det(), want, 1e-7*scale, 1e-7) {
					t.Fatalf("%v det = %.17g, want n_in/n_out = %.17g (matrix %+v)", p, m.Det(), want, m)
				}
			}
			if _, err := s.MatrixBetween(s.Length()/4, s.Length()/2, p); err != nil && err != ErrOverflow {
				t.Fatalf("MatrixBetween error: %v", err)
			}
			if c, err := s.Cardinal(p); err == nil {
				for _, v := range []units.Length{c.EFL, c.FrontFocalPoint, c.RearFocalPoint, c.FrontPrincipalPlane, c.RearNodalPoint} {
					if !finite(float64(v)) {
						t.Fatalf("Cardinal returned non-finite %v: %+v", v, c)
					}
				}
			}
			if im, err := s.Image(-0.1, p); err == nil && (!finite(float64(im.Image)) || !finite(im.Magnification)) {
				t.Fatalf("Image returned non-finite %+v", im)
			}
			if a, err := s.Stops(ObjectAt(-0.1), p); err == nil {
				if !finite(a.ImageNA) || !finite(float64(a.Entrance.Z)) || !finite(float64(a.HalfField.Height)) {
					t.Fatalf("Stops returned non-finite %+v", a)
				}
			}
		}
		if _, err := s.MatrixTo(s.Length()/2, Tangential); err != nil && err != ErrOverflow {
			t.Fatalf("MatrixTo(L/2) error: %v", err)
		}
		_ = s.Table().Text()
		// Label edits never panic; they succeed or say why.
		for _, e := range []func() (System, error){
			func() (System, error) { return s.Move("x", units.Length(y)) },
			func() (System, error) { return s.WithSpace("x", units.Length(math.Abs(x))) },
			func() (System, error) { return s.Replace("x", System{}) },
		} {
			if r, err := e(); err == nil && r.Validate() != nil {
				t.Fatalf("edit returned an unbuilt system without an error")
			} else if err != nil && err.Error() == "" {
				t.Fatalf("edit: empty error message")
			}
		}
		for pc := range s.Walk(-units.Length(math.Abs(x)), s.Length()+units.Length(math.Abs(y))) {
			if !finite(float64(pc.From)) && finite(x) && finite(y) {
				t.Fatalf("Walk piece at non-finite position %+v", pc)
			}
		}
	})
}
