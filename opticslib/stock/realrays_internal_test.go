package stock

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// TestRealRMSPlanoConvex checks the real-ray wavefront estimate against
// third-order theory on reference-checks R36's lens: plano-convex,
// n = 1.5168, R = 51.68 mm, t = 4 mm, a collimated beam at h = 5 mm
// (h/f = 0.05), where the exact longitudinal aberration agrees with the
// third-order value to 0.4 % (curved side first) and 0.4 % (flat side
// first). The RMS after the best defocus is |W040|/(6√5) with
// W040 = S_I/8 (Born & Wolf, Principles of Optics, §9.2 [from memory]),
// S_I from Coddington's thin-lens form (Welford 1986, §7.3 [from
// memory]); the 3 % tolerance covers the thickness (t/f = 4 %) that the
// thin form ignores and the fifth-order part at h/f = 0.05. The ratio of
// the two orientations must be near R36's 3.96.
func TestRealRMSPlanoConvex(t *testing.T) {
	const mm = units.Millimeter
	lens := Lens{Label: "PCX", Kind: PlanoConvex, R1: 51.68 * mm, R2: paraxial.Flat, Thickness: 4 * mm, Diameter: 25.4 * mm, Index: 1.5168, Count: 1}
	lens.Focal = LensmakerFocal(lens.R1, lens.R2, lens.Thickness, lens.Index)
	g, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 1 * mm, Wavelength: 633 * units.Nanometer})
	if err != nil {
		t.Fatal(err)
	}
	c := config{lenses: []Lens{lens}, gx: g}
	h := 5e-3
	var rms [2]float64
	for i, rev := range []bool{false, true} {
		r, err := c.realRMS([]int{0}, []bool{rev}, nil, h/MarginalFactor, 0)
		if err != nil {
			t.Fatal(err)
		}
		l := lens
		if rev {
			l = l.Reversed()
		}
		want := float64(SphericalRMS(SphericalSeidel(units.Length(h), l.Focal, l.Index, l.ShapeFactor(), -1))) / 633e-9
		if math.Abs(r/want-1) > 0.03 {
			t.Errorf("reversed %v: real-ray RMS %.5f waves, third order %.5f (ratio %.4f)", rev, r, want, r/want)
		}
		t.Logf("reversed %v: real-ray RMS %.5f waves, third order %.5f", rev, r, want)
		rms[i] = r
	}
	if ratio := rms[1] / rms[0]; math.Abs(ratio-3.96) > 0.12 {
		t.Errorf("flat-first / curved-first RMS = %.4f, R36 about 3.96", ratio)
	}
}
