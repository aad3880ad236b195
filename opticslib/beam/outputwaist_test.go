package beam

import (
	"testing"

	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// TestOutputWaist: OutputWaist is the last entry of Waists, field for
// field (an identity: the same walk and the same arithmetic), for round
// and astigmatic beams and a system ending in a lens; the zero Waist for
// an empty system.
func TestOutputWaist(t *testing.T) {
	const mm = units.Millimeter
	lambda := 1064 * units.Nanometer
	round := mustWaist(t, 0.4*mm, 0, lambda, 1)
	astig := Astigmatic{X: round, Y: mustWaist(t, 0.3*mm, 0.02, lambda, 1)}
	for i, b := range []*paraxial.Builder{
		paraxial.NewBuilder().Space(0.1).ThinLens(0.05).Space(0.2).Interface(0.1, 1.5).Space(0.1),
		paraxial.NewBuilder().Space(0.05).CylindricalLens(0.1, paraxial.Tangential).Space(0.08).ThinLens(-0.03),
		paraxial.NewBuilder().Space(0.3),
	} {
		sys := mustBuild(t, b)
		for _, in := range []Input{round, astig} {
			ws, err := Waists(sys, in)
			if err != nil {
				t.Fatal(err)
			}
			got, err := OutputWaist(sys, in)
			if err != nil {
				t.Fatal(err)
			}
			if got != ws.Last() {
				t.Errorf("system %d: OutputWaist = %+v, want Waists().Last() = %+v", i, got, ws.Last())
			}
		}
	}
	empty := mustBuild(t, paraxial.NewBuilder())
	if got, err := OutputWaist(empty, round); err != nil || got != (Waist{}) {
		t.Errorf("empty system: OutputWaist = %+v, %v; want the zero Waist", got, err)
	}
}
