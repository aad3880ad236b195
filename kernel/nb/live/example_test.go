package live_test

import (
	"fmt"

	"github.com/beamnote/beamnote/kernel/nb"
	"github.com/beamnote/beamnote/kernel/nb/live"
	"github.com/beamnote/beamnote/opticslib/units"
)

const mm = units.Millimeter

// spacingFigure stands in for a caustic drawn at a lens spacing
// (optplot.Caustic of the design built with it).
type spacingFigure struct{ gap units.Length }

func (f spacingFigure) SVG() ([]byte, error) {
	return []byte(fmt.Sprintf(`<svg xmlns="http://www.w3.org/2000/svg"><text>%v</text></svg>`, f.gap)), nil
}
func (spacingFigure) String() string { return "caustic" }

func causticAt(gap units.Length) (spacingFigure, error) { return spacingFigure{gap}, nil }

// Outside a notebook, and in a headless run, a slider shows the figures at
// its ends and at its start and returns; in a browser the same call shows
// the slider and redraws the figure as it moves.
func ExampleSlider() {
	nb.Check(live.Slider(live.Range{Name: "L1–L2 gap", Min: 110 * mm, Max: 130 * mm, Step: 0.5 * mm, Start: 120 * mm}, causticAt))
	// Output:
	// *Live what-if (L1–L2 gap from 110.0 mm to 130.0 mm), shown as fixed figures in a run outside a notebook:*
	// **L1–L2 gap = 110.0 mm** (minimum)
	// [figure: caustic · L1–L2 gap = 110.0 mm (65 bytes of SVG)]
	// **L1–L2 gap = 120.0 mm** (start)
	// [figure: caustic · L1–L2 gap = 120.0 mm (65 bytes of SVG)]
	// **L1–L2 gap = 130.0 mm** (maximum)
	// [figure: caustic · L1–L2 gap = 130.0 mm (65 bytes of SVG)]
}
