package optplot

import (
	"errors"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/spatial/r3"
)

// realLens is an invented bench test piece: an N-BK7 plano-convex lens
// (R = 30 mm, 5 mm thick, clear radius 11 mm), a 2 mm fused-silica window
// 40 mm on, a 6 mm stop in front, and the image plane near the focus.
func realLens(tb testing.TB) trace.System {
	tb.Helper()
	const mm = units.Millimeter
	bk7, err := material.ByName("N-BK7")
	if err != nil {
		tb.Fatal(err)
	}
	silica, err := material.ByName("fused silica")
	if err != nil {
		tb.Fatal(err)
	}
	air := trace.Index(1)
	s, err := trace.New(air,
		trace.Surface{Label: "iris", Kind: trace.Stop, ClearRadius: 6 * mm, Thickness: 5 * mm},
		trace.Surface{Label: "L1 front", Kind: trace.Refract, Radius: 30 * mm, ClearRadius: 11 * mm, Medium: bk7, Thickness: 5 * mm},
		trace.Surface{Label: "L1 back", Kind: trace.Refract, ClearRadius: 11 * mm, Medium: air, Thickness: 40 * mm},
		trace.Surface{Label: "window front", Kind: trace.Refract, ClearRadius: 10 * mm, Medium: silica, Thickness: 2 * mm},
		trace.Surface{Label: "window back", Kind: trace.Refract, ClearRadius: 10 * mm, Medium: air, Thickness: 13.5 * mm})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

const lambda = 633 * units.Nanometer

func svgOf(tb testing.TB, f Figure, err error) []byte {
	tb.Helper()
	if err != nil {
		tb.Fatal(err)
	}
	b, err := f.SVG()
	if err != nil {
		tb.Fatal(err)
	}
	return b
}

// TestRealRayFigures renders each real-ray figure of the test piece twice
// to the same bytes and against its golden file.
func TestRealRayFigures(t *testing.T) {
	sys := realLens(t)
	const mm = units.Millimeter
	plane := sys.Vertex(sys.Len())
	checkGolden(t, "ray_aberration.svg", func(tb testing.TB) []byte {
		var fans []trace.Fan
		for _, field := range []units.Angle{0, 0.03} {
			tan, sag, err := sys.RayFans(lambda, trace.Source{Field: field, PupilRadius: 5 * mm}, 41, plane)
			if err != nil {
				tb.Fatal(err)
			}
			fans = append(fans, tan, sag)
		}
		f, err := RayAberration(fans)
		return svgOf(tb, f, err)
	})
	checkGolden(t, "spherical_aberration.svg", func(tb testing.TB) []byte {
		var las []trace.LongitudinalAberration
		for _, w := range []units.Length{486.1 * units.Nanometer, 656.3 * units.Nanometer} {
			la, err := sys.SphericalAberration(w, 5*mm, 25)
			if err != nil {
				tb.Fatal(err)
			}
			las = append(las, la)
		}
		f, err := SphericalAberrationCurve(las)
		return svgOf(tb, f, err)
	})
	checkGolden(t, "focal_shift.svg", func(tb testing.TB) []byte {
		var ws []units.Length
		for nm := 450.0; nm <= 1000; nm += 25 {
			ws = append(ws, units.Length(nm)*units.Nanometer)
		}
		fs, err := sys.ChromaticFocalShift(lambda, ws, 5*mm)
		if err != nil {
			tb.Fatal(err)
		}
		f, err := FocalShiftCurve([]trace.FocalShift{fs})
		return svgOf(tb, f, err)
	})
	checkGolden(t, "real_layout.svg", func(tb testing.TB) []byte {
		var groups []RayPaths
		for g, field := range []float64{0, 0.05} {
			rp := RayPaths{Label: []string{"on axis", "0.05 rad field"}[g]}
			for k := -4; k <= 4; k++ {
				y := float64(k) * 1.4e-3
				path, _, _, err := sys.Path(lambda, trace.RayFromAngles(0, y, -10e-3, 0, field))
				if err != nil {
					tb.Fatal(err)
				}
				if len(path) >= 2 {
					rp.Paths = append(rp.Paths, path)
				}
			}
			groups = append(groups, rp)
		}
		f, err := RealRayLayout(sys, lambda, groups)
		return svgOf(tb, f, err)
	})
}

// TestRealRayFigureErrors: empty, mismatched and non-finite input gives a
// ParamError wrapping ErrAberration that names the parameter.
func TestRealRayFigureErrors(t *testing.T) {
	nan := func() float64 { var z float64; return z / z }()
	for _, test := range []struct {
		name string
		err  error
		want string
	}{
		{"no fans", second(RayAberration(nil)), "fans = 0"},
		{"fan lengths", second(RayAberration([]trace.Fan{{Pupil: []float64{0, 1}, Error: []float64{0}}})), "Error points"},
		{"fan NaN", second(RayAberration([]trace.Fan{{Pupil: []float64{0, 1}, Error: []float64{0, nan}}})), "Error[1]"},
		{"fan pupil", second(RayAberration([]trace.Fan{{Pupil: []float64{0, 2}, Error: []float64{0, 0}}})), "Pupil[1]"},
		{"no LSA", second(SphericalAberrationCurve(nil)), "curves = 0"},
		{"LSA lengths", second(SphericalAberrationCurve([]trace.LongitudinalAberration{{Height: []float64{0, 1}, Shift: []float64{0}}})), "Shift points"},
		{"LSA NaN", second(SphericalAberrationCurve([]trace.LongitudinalAberration{{Height: []float64{0, 1e-3}, Shift: []float64{nan, 0}}})), "Shift[0] = NaN"},
		{"focal shift NaN", second(FocalShiftCurve([]trace.FocalShift{{Reference: lambda, Wavelengths: []units.Length{500e-9, 600e-9}, Shift: []float64{0, nan}, Marginal: []float64{0, 0}, MarginalLost: []bool{false, false}}})), "Shift[1]"},
		{"layout NaN", second(RealRayLayout(realLens(t), lambda, []RayPaths{{Paths: [][]trace.Ray{{{}, {Position: r3.Vec{Z: nan}}}}}})), "point 1"},
		{"focal shift marginal", second(FocalShiftCurve([]trace.FocalShift{{Reference: lambda, Wavelengths: []units.Length{500e-9, 600e-9}, Shift: []float64{0, 1e-6}}})), "Marginal points"},
		{"layout not built", second(RealRayLayout(trace.System{}, lambda, nil)), "not built"},
		{"layout short path", second(RealRayLayout(realLens(t), lambda, []RayPaths{{Paths: [][]trace.Ray{{{}}}}})), "points = 1"},
	} {
		var pe *ParamError
		if !errors.As(test.err, &pe) || !errors.Is(test.err, ErrAberration) {
			t.Errorf("%s: error %v, want a ParamError wrapping ErrAberration", test.name, test.err)
			continue
		}
		if !strings.Contains(test.err.Error(), test.want) {
			t.Errorf("%s: error %q does not name %q", test.name, test.err, test.want)
		}
	}
}

func second(_ Figure, err error) error { return err }
