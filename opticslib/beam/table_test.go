package beam

import (
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/paraxial"
)

// The tables carry units in their headers and "∞" for a flat wavefront,
// never a huge number (the project's display conventions).
func TestTables(t *testing.T) {
	g, err := FromWaist(WaistSpec{WaistRadius: 0.42 * mm, Wavelength: 488 * nm})
	if err != nil {
		t.Fatal(err)
	}
	txt := g.Table().Text()
	for _, want := range []string{"wavefront radius R  ∞", "waist radius w0     420 µm", "Rayleigh range zR   1.136 m", "full divergence Θ (ISO 11146)  739.7 µrad"} {
		if !strings.Contains(strings.Join(strings.Fields(txt), " "), strings.Join(strings.Fields(want), " ")) {
			t.Errorf("Gaussian table lacks %q:\n%s", want, txt)
		}
	}
	sys := mustBuild(t, paraxial.NewBuilder().Space(40*mm).ThinLens(100*mm).Label("L1").Aperture(paraxial.ClearDiameter(1*mm)).Space(200*mm))
	ws, err := Waists(sys, g)
	if err != nil {
		t.Fatal(err)
	}
	wt := ws.Surfaces(sys).Table()
	if len(wt.Rows) != 1 || wt.Rows[0][0] != `ThinLens "L1" (call 2)` || wt.Header[3] != "w0" || !strings.HasSuffix(wt.Rows[0][3], " µm") {
		t.Errorf("waist table = %+v", wt)
	}
	cs, err := Clipping(sys, g, 0)
	if err != nil {
		t.Fatal(err)
	}
	ct := cs.Table()
	if len(cs.Low()) != 1 || ct.Rows[0][0] != "L1" || ct.Rows[0][8] != "clips" || ct.Rows[0][2] != "1.00" {
		t.Errorf("clip table = %+v", ct)
	}
}

// At the output waist of a 4f relay the rounding of q leaves Re q ≈ 1e-17 m:
// the table shows a flat wavefront (∞) and the waist here, not R = 4e14 m.
func TestTableAtWaist(t *testing.T) {
	g, _ := FromWaist(WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 633 * nm})
	sys := mustBuild(t, paraxial.NewBuilder().Space(25*mm).ThinLens(25*mm).Space(125*mm).ThinLens(100*mm).Space(100*mm))
	out, err := At(sys, g, sys.Length())
	if err != nil {
		t.Fatal(err)
	}
	txt := out.Table().Text()
	if !strings.Contains(txt, "wavefront radius R             ∞") || !strings.Contains(txt, "0 (at the waist)") {
		t.Errorf("table at the output waist:\n%s", txt)
	}
}
