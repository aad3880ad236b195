package trace_test

import (
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestRayFansAxial checks the fans of an axial beam through the
// plano-convex lens on the paraxial focal plane: they are odd in p and the
// tangential and sagittal fans agree (rotational symmetry), to 1e-18 m
// (rounding of µm-sized errors); the rim ray's error is its straight line
// from its axis crossing, ε = (z_p − z_c)·tan U′, with z_c from
// SphericalAberration (the same ray), to 1e-15 m.
func TestRayFansAxial(t *testing.T) {
	sys := planoConvex(t, true)
	src := trace.Source{PupilRadius: 5 * mm}
	zp, err := sys.ParaxialFocus(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	tan, sag, err := sys.RayFans(lambda, src, 21, zp)
	if err != nil {
		t.Fatal(err)
	}
	if len(tan.Pupil) != 21 || len(sag.Pupil) != 21 || tan.Pupil[0] != -1 || tan.Pupil[10] != 0 || tan.Pupil[20] != 1 {
		t.Fatalf("fan pupils %v, %v", tan.Pupil, sag.Pupil)
	}
	for i := range tan.Error {
		j := len(tan.Error) - 1 - i
		if !scalar.EqualWithinAbs(tan.Error[i], -tan.Error[j], 1e-18) || !scalar.EqualWithinAbs(tan.Error[i], sag.Error[i], 1e-18) {
			t.Errorf("p = %v: tangential %g, mirrored %g, sagittal %g", tan.Pupil[i], tan.Error[i], -tan.Error[j], sag.Error[i])
		}
	}
	la, err := sys.SphericalAberration(lambda, 5*mm, 2)
	if err != nil {
		t.Fatal(err)
	}
	r, st, _, err := sys.TraceRay(lambda, trace.RayFromAngles(0, 5e-3, -1e-3, 0, 0))
	if err != nil || st != trace.OK {
		t.Fatal(st, err)
	}
	want := -la.Shift[1] * r.Direction.Y / r.Direction.Z
	if !scalar.EqualWithinAbs(tan.Error[20], want, 1e-15) {
		t.Errorf("rim error %g m, want %g from the axis crossing", tan.Error[20], want)
	}
	if !strings.Contains(tan.Table().Text(), "Tangential") || tan.Table().Validate() != nil {
		t.Errorf("fan table:\n%s", tan.Table().Text())
	}
}

// cauchy is a test medium n(λ) = A + B/λ² (λ in µm).
type cauchy struct{ a, b float64 }

func (c cauchy) Name() string { return "Cauchy test glass" }
func (c cauchy) Index(vacuum units.Length) (float64, error) {
	l := float64(vacuum / units.Micrometer)
	return c.a + c.b/(l*l), nil
}

// TestChromaticFocalShift checks the paraxial focal shift of one spherical
// surface R = 50 mm into a Cauchy medium against the paraxial focus
// n R/(n − 1) of R33 at each wavelength, to 1e-15 m; the wavelengths come
// back sorted, the reference's shift is 0, and the rim ray crosses before
// the paraxial focus (undercorrected).
func TestChromaticFocalShift(t *testing.T) {
	glass := cauchy{1.5, 0.004}
	sys, err := trace.New(trace.Index(1), trace.Surface{Kind: trace.Refract, Radius: 50 * mm, Medium: glass, Thickness: 200 * mm})
	if err != nil {
		t.Fatal(err)
	}
	ref := 587.6 * units.Nanometer
	wl := []units.Length{656.3 * units.Nanometer, 486.1 * units.Nanometer, ref}
	fs, err := sys.ChromaticFocalShift(ref, wl, 5*mm)
	if err != nil {
		t.Fatal(err)
	}
	focus := func(l units.Length) float64 {
		n, _ := glass.Index(l)
		return n * 0.05 / (n - 1)
	}
	for i, l := range fs.Wavelengths {
		if i > 0 && !(l > fs.Wavelengths[i-1]) {
			t.Errorf("wavelengths %v not ascending", fs.Wavelengths)
		}
		if want := focus(l) - focus(ref); !scalar.EqualWithinAbs(fs.Shift[i], want, 1e-15) {
			t.Errorf("λ = %v: shift %g m, want %g", l, fs.Shift[i], want)
		}
		if fs.MarginalLost[i] || !(fs.Marginal[i] < fs.Shift[i]) {
			t.Errorf("λ = %v: rim crossing %g not before the paraxial focus %g", l, fs.Marginal[i], fs.Shift[i])
		}
	}
	if fs.Table().Validate() != nil || len(fs.Table().Rows) != 3 {
		t.Errorf("table:\n%s", fs.Table().Text())
	}
	if _, err := sys.ChromaticFocalShift(ref, nil, 5*mm); err == nil {
		t.Error("no wavelengths: no error")
	}
	if _, err := sys.ChromaticFocalShift(ref, wl, units.Length(math.NaN())); err == nil {
		t.Error("NaN pupil radius: no error")
	}
}

// TestTables checks that every result's table is well formed.
func TestTables(t *testing.T) {
	sys := planoConvex(t, true)
	src := trace.Source{Field: 1 * units.Degree, PupilRadius: 5 * mm}
	pupil := trace.PupilGrid(9)
	sp, err := sys.Spot(lambda, src, pupil, sys.ImagePlane())
	if err != nil {
		t.Fatal(err)
	}
	f, err := sys.BestFocus(lambda, src, pupil)
	if err != nil {
		t.Fatal(err)
	}
	la, err := sys.SphericalAberration(lambda, 5*mm, 5)
	if err != nil {
		t.Fatal(err)
	}
	sd, err := sys.Seidel(lambda, src)
	if err != nil {
		t.Fatal(err)
	}
	w, err := sys.Wavefront(lambda, src, pupil, f.Plane)
	if err != nil {
		t.Fatal(err)
	}
	g, err := sys.GaussianFocus(lambda, trace.Source{PupilRadius: 5 * mm, GaussianRadius: 2 * mm}, 16, nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, tb := range map[string]interface {
		Validate() error
		Text() string
	}{"spot": sp.Table(), "focus": f.Table(), "lsa": la.Table(), "seidel": sd.Table(), "wavefront": w.Table(), "strehl": w.Strehl().Table(), "gauss": g.Table()} {
		if err := tb.Validate(); err != nil || strings.Contains(tb.Text(), "NaN") {
			t.Errorf("%s table: %v\n%s", name, err, tb.Text())
		}
	}
}
