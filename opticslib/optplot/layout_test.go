package optplot

// Layout rendering tests: determinism (byte-identical SVG) and what the
// drawing contains. The ray heights drawn come from paraxial.System.Fan,
// whose optics is tested in package paraxial against textbook references.

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"

	"github.com/beamnote/beamnote/opticslib/internal/fixtures"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/units"
)

// relayLayout renders the 4f relay fixture with a window, a tilted fold
// mirror and three fans, one of them partly vignetted.
func relayLayout(t testing.TB) []byte {
	t.Helper()
	relay, err := fixtures.Relay4f().Build()
	if err != nil {
		t.Fatalf("Relay4f: %v", err)
	}
	sys, err := paraxial.NewBuilder().
		Append(relay).
		Plate(1*mm, 1.5168, 0).Label("cover").
		Space(20 * mm).
		FlatMirror(45 * units.Degree).Label("fold").
		Space(10 * mm).
		Build()
	if err != nil {
		t.Fatalf("Build: %v", err)
	}
	a, err := sys.Stops(paraxial.ObjectAt(0), paraxial.Tangential)
	if err != nil {
		t.Fatalf("Apertures: %v", err)
	}
	var fans []paraxial.Fan
	for _, h := range []units.Length{0, 4 * mm, 8 * mm} {
		f, err := sys.Fan(a, paraxial.Field{Height: h}, 5, sys.Length())
		if err != nil {
			t.Fatalf("Fan: %v", err)
		}
		fans = append(fans, f)
	}
	f, err := Layout(sys, fans, LayoutStops(a), LayoutTitle("4f relay"), LayoutSize(16*vg.Centimeter, 8*vg.Centimeter))
	if err != nil {
		t.Fatalf("Layout: %v", err)
	}
	return mustSVG(t, f)
}

func TestLayoutContent(t *testing.T) {
	svg := string(relayLayout(t))
	for _, want := range []string{"<svg", LayoutXLabel, LayoutYLabel, "4f relay", "L1", "L2", "stop", "cover", "fold 45°", "on axis", "y = 8 mm", "y scale ×"} {
		if !strings.Contains(svg, want) {
			t.Errorf("layout SVG does not contain %q", want)
		}
	}
}

func TestFanLinesBlocked(t *testing.T) {
	// Rays stopped by a clear aperture end at the blocking plane.
	sys, err := fixtures.Relay4f().Build()
	if err != nil {
		t.Fatal(err)
	}
	a, _ := sys.Stops(paraxial.ObjectAt(0), 0)
	f, err := sys.Fan(a, paraxial.Field{Height: 8 * mm}, 3, sys.Length())
	if err != nil {
		t.Fatal(err)
	}
	r, err := NewFanLines([]paraxial.Fan{f})
	if err != nil {
		t.Fatal(err)
	}
	// Field 8 mm (telecentric relay): the chief ray is at +8 mm on L1 and
	// −8 mm on L2, the marginal offsets are ±5 mm on both. The ρ = −1 ray
	// (−13 mm at L2, clear radius 10 mm) is blocked at L2, z = 300 mm; the
	// ρ = +1 ray (+13 mm at L1, clear radius 12.5 mm) at L1, z = 100 mm;
	// the chief ray passes. Positions are sums of a few element lengths
	// in mm: abs 1e-9 mm.
	for i, want := range []struct {
		blocked bool
		z       float64
	}{{true, 300}, {false, 400}, {true, 100}} {
		if got := r.Fans[0].Blocked[i]; got != want.blocked {
			t.Errorf("ray %d: Blocked = %v, want %v", i, got, want.blocked)
			continue
		}
		if last := r.Fans[0].Paths[i][len(r.Fans[0].Paths[i])-1]; math.Abs(last.X-want.z) > 1e-9 {
			t.Errorf("ray %d ends at z = %g mm, want %g", i, last.X, want.z)
		}
	}
}

func TestLayoutErrors(t *testing.T) {
	sys, _ := fixtures.Relay4f().Build()
	empty, _ := paraxial.NewBuilder().Build()
	bad := paraxial.Fan{Rays: [][]paraxial.Step{{{Z: units.Length(math.NaN())}}}}
	for _, test := range []struct {
		name string
		sys  paraxial.System
		fans []paraxial.Fan
		opts []LayoutOption
		want error
	}{
		{"empty system", empty, nil, nil, ErrLayout},
		{"reversed range", sys, nil, []LayoutOption{LayoutRange(1, 0)}, ErrLayout},
		{"NaN half height", sys, nil, []LayoutOption{LayoutHalfHeight(units.Length(math.NaN()))}, ErrLayout},
		{"NaN ray", sys, []paraxial.Fan{bad}, nil, ErrFanLines},
	} {
		if _, err := Layout(test.sys, test.fans, test.opts...); !errors.Is(err, test.want) {
			t.Errorf("%s: Layout error = %v, want %v", test.name, err, test.want)
		}
	}
	if _, err := NewOutline(sys, 0); !errors.Is(err, ErrLayout) {
		t.Errorf("NewOutline(0) error = %v, want ErrLayout", err)
	}
}

func TestLayoutTicks(t *testing.T) {
	// 1–2–5 steps for about six labels: −15…386 mm gives a raw step of
	// 66.8 mm, rounded up to 100 mm.
	var labels []string
	for _, tk := range (niceTicks{target: 6}).Ticks(-15, 386) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if got := strings.Join(labels, " "); got != "0 100 200 300" {
		t.Errorf("labels = %q, want \"0 100 200 300\"", got)
	}
}

func TestLaySag(t *testing.T) {
	// Sphere sag s = R − √(R² − y²) (analytic); the stable form used must
	// agree to rel 1e-14, and a hemisphere (y = R) has sag R.
	for _, test := range []struct{ r, y float64 }{{50, 5}, {-50, 10}, {10, 10}, {1000, 12.7}} {
		want := test.r - math.Copysign(math.Sqrt(test.r*test.r-test.y*test.y), test.r)
		if got := laySag(test.r, test.y); math.Abs(got-want) > 1e-14*math.Abs(test.r) {
			t.Errorf("laySag(%g, %g) = %.17g, want %.17g", test.r, test.y, got, want)
		}
	}
	if got := laySag(math.Inf(1), 3); got != 0 {
		t.Errorf("laySag(Inf, 3) = %g, want 0", got)
	}
}

// TestMarksLabelAPartOnce: a plate or thick lens has two surfaces; its
// label is drawn once, over its first surface, while two separate parts
// keep their own labels, and unlabelled lenses keep their parameter.
func TestMarksLabelAPartOnce(t *testing.T) {
	mm := units.Millimeter
	sys, err := paraxial.NewBuilder().
		Space(10*mm).Plate(2*mm, 1.5, 0).Label("W").
		Space(10*mm).Plate(12*mm, 1.5, 0).Label("cube").
		Space(10 * mm).ThinLens(50 * mm).
		Space(10 * mm).ThinLens(50 * mm).
		Space(10 * mm).Build()
	if err != nil {
		t.Fatal(err)
	}
	m, err := NewMarks(sys, 1)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, mk := range m.Marks {
		got = append(got, mk.Label)
	}
	if len(got) != 6 || got[0] != "W" || got[1] != "" || got[2] != "cube" || got[3] != "" || got[4] == "" || got[4] != got[5] {
		t.Errorf("mark labels = %q, want [W, \"\", cube, \"\", f, f]", got)
	}
}
