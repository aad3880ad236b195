package optplot

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/design"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/tolerance"
	"github.com/beamnote/beamnote/opticslib/units"
)

// focusHistogram is the focus position of an invented 1064 nm
// expander-and-focus path over 4000 builds with placement and focal
// errors: a two-sided goal that part of the builds miss.
func focusHistogram(tb testing.TB) tolerance.Histogram {
	tb.Helper()
	sys, err := paraxial.NewBuilder().Space(40 * mm).ThinLens(-50 * mm).Label("L1").
		Space(50 * mm).ThinLens(100 * mm).Label("L2").
		Space(150 * mm).ThinLens(200 * mm).Label("L3").Space(200 * mm).Build()
	if err != nil {
		tb.Fatal(err)
	}
	in, err := beam.FromWaist(beam.WaistSpec{WaistRadius: 0.5 * mm, Wavelength: 1064 * units.Nanometer})
	if err != nil {
		tb.Fatal(err)
	}
	ws, err := beam.Waists(sys, in)
	if err != nil {
		tb.Fatal(err)
	}
	st := tolerance.Study{System: sys, Beam: in,
		Perturbations: []tolerance.Perturbation{
			tolerance.Placement("L1", tolerance.Normal(0.1*mm)),
			tolerance.FocalError("L2", tolerance.Uniform(0.01)),
			tolerance.FocalError("L3", tolerance.Uniform(0.01)),
		},
		Goals: []design.Goal{design.Near("focus position", design.WaistZ(in), ws.Last().Z, 1.5*mm)},
		Fast:  map[string]tolerance.Fast{"focus position": tolerance.WaistZ()},
	}
	r, err := st.MonteCarlo(context.Background(), tolerance.Options{Trials: 4000, Seed: 1})
	if err != nil {
		tb.Fatal(err)
	}
	h, err := r.Histogram("focus position", 0)
	if err != nil {
		tb.Fatal(err)
	}
	return h
}

// couplingHistogram is a hand-made histogram of a coupling efficiency
// (a plain number) with a one-sided goal ≥ 0.8 and failed builds.
func couplingHistogram() tolerance.Histogram {
	h := tolerance.Histogram{Goal: "fibre coupling", Unit: "", Lo: 0.8, Hi: math.Inf(1), Wanted: "≥ 0.8",
		Nominal: 0.93, Mean: 0.871, Std: 0.052, Failed: 12,
		Yield: tolerance.Yield{Met: 780, Trials: 1000, Fraction: 0.78, StdErr: math.Sqrt(0.78 * 0.22 / 1000)}}
	counts := []int{3, 9, 22, 41, 70, 95, 120, 146, 160, 151, 118, 53}
	for k := range counts {
		h.Edges = append(h.Edges, 0.70+0.02*float64(k))
	}
	h.Edges = append(h.Edges, 0.70+0.02*float64(len(counts)))
	h.Counts = counts
	return h
}

// TestToleranceGoldenSVG: the two histograms against their golden files.
func TestToleranceGoldenSVG(t *testing.T) {
	checkGolden(t, "tolerance_focus.svg", func(tb testing.TB) []byte {
		f, err := ToleranceHistogram(focusHistogram(tb))
		if err != nil {
			tb.Fatal(err)
		}
		return mustSVG(tb, f)
	})
	checkGolden(t, "tolerance_coupling.svg", func(tb testing.TB) []byte {
		f, err := ToleranceHistogram(couplingHistogram(), Title("Launch into the fibre"))
		if err != nil {
			tb.Fatal(err)
		}
		return mustSVG(tb, f)
	})
}

// TestToleranceHistogramContent: the key and caption state the wanted
// range, the yield and the failed builds; the axis is in the unit that
// suits the values.
func TestToleranceHistogramContent(t *testing.T) {
	h := focusHistogram(t)
	f, err := ToleranceHistogram(h)
	if err != nil {
		t.Fatal(err)
	}
	svg := string(mustSVG(t, f))
	for _, want := range []string{"focus position (mm)", ">builds<", "wanted " + h.Wanted, "builds within it", "builds outside it", "goal met in "} {
		if !strings.Contains(svg, want) {
			t.Errorf("focus histogram SVG lacks %q", want)
		}
	}
	if !strings.Contains(f.Caption, "4000 builds in 32 bins") || !strings.Contains(f.Caption, "met in "+h.Yield.String()) {
		t.Errorf("caption %q", f.Caption)
	}
	c, err := ToleranceHistogram(couplingHistogram())
	if err != nil {
		t.Fatal(err)
	}
	svg = string(mustSVG(t, c))
	for _, want := range []string{">fibre coupling<", "wanted ≥ 0.8", "12 builds failed (not shown)", "78 % ± 1.3 % of 1000 builds"} {
		if !strings.Contains(svg, want) {
			t.Errorf("coupling histogram SVG lacks %q", want)
		}
	}
}

// TestToleranceHistogramErrors: histograms not made by package tolerance
// are refused with a *ParamError wrapping ErrHistogram.
func TestToleranceHistogramErrors(t *testing.T) {
	good := couplingHistogram()
	for _, c := range []struct {
		name string
		edit func(h *tolerance.Histogram)
		text string
	}{
		{"zero", func(h *tolerance.Histogram) { *h = tolerance.Histogram{} }, "bins = 0: need at least one"},
		{"edges", func(h *tolerance.Histogram) { h.Edges = h.Edges[:5] }, "edges = 5: must be one more than the 12 counts"},
		{"order", func(h *tolerance.Histogram) { h.Edges[3] = h.Edges[2] }, "edge 3 = 0.74"},
		{"NaN edge", func(h *tolerance.Histogram) { h.Edges[0] = math.NaN() }, "edge 0 = NaN"},
		{"negative", func(h *tolerance.Histogram) { h.Counts[1] = -1 }, "count 1 = -1"},
		{"empty", func(h *tolerance.Histogram) { h.Counts = make([]int, 12) }, "no build counted"},
		{"range", func(h *tolerance.Histogram) { h.Lo, h.Hi = 1, 0 }, "wanted range = 1 … 0"},
	} {
		h := couplingHistogram()
		h.Edges = append([]float64(nil), good.Edges...)
		h.Counts = append([]int(nil), good.Counts...)
		c.edit(&h)
		_, err := ToleranceHistogram(h)
		var pe *ParamError
		if !errors.As(err, &pe) || !errors.Is(err, ErrHistogram) || !strings.Contains(err.Error(), c.text) {
			t.Errorf("%s: error %v, want a *ParamError wrapping ErrHistogram containing %q", c.name, err, c.text)
		}
	}
	if _, err := ToleranceHistogram(good, Size(-1, 1)); !errors.Is(err, ErrOption) {
		t.Errorf("bad size: %v, want ErrOption", err)
	}
}
