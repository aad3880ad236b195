package material_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/beamnote/beamnote/opticslib/material"
	"github.com/beamnote/beamnote/opticslib/units"
)

// allMaterials returns every catalogue material plus the other
// constructors' products.
func allMaterials(t testing.TB) []material.Material {
	var ms []material.Material
	for _, n := range material.Names() {
		m, err := material.ByName(n)
		if err != nil {
			t.Fatalf("ByName(%q): %v", n, err)
		}
		ms = append(ms, m)
	}
	for _, tc := range []float64{19, 20, 21.5, 24} {
		m, _ := material.WaterDaimonMasumura(tc)
		ms = append(ms, m)
	}
	mg, _ := material.ModelGlass(1.5168, 64.17)
	hot, _ := material.Water(90, 1e6)
	wet, _ := material.AirOf(material.Air{Temperature: 30, Pressure: 95e3, RelativeHumidity: 0.9, CO2: 600})
	k, _ := material.Constant("n = 1.5", 1.5)
	return append(ms, mg, hot, wet, k)
}

// ModelGlass reproduces nd and vd to rounding (rel 1e-13: a few
// operations on numbers of order 1), and its distance from N-BK7 (same
// nd, vd) is reported by the test: found +9.4e-5 at 0.4 µm, +1.3e-4 at
// 0.7 µm, +1.7e-3 at 1.064 µm (outside its range, where a Cauchy model
// has no infrared term). The bounds are those found, rounded up.
func TestModelGlass(t *testing.T) {
	m, err := material.ModelGlass(1.5168, 64.17)
	if err != nil {
		t.Fatal(err)
	}
	nd, _ := m.IndexInAir(material.LineD)
	vd, _ := m.Abbe()
	if !scalar.EqualWithinRel(nd, 1.5168, 1e-13) || !scalar.EqualWithinRel(vd, 64.17, 1e-13) {
		t.Errorf("ModelGlass(1.5168, 64.17): nd = %.15f, vd = %.13f", nd, vd)
	}
	bk7, _ := material.ByName("N-BK7")
	for _, test := range []struct {
		l   units.Length
		max float64
	}{{0.4 * um, 1e-4}, {0.7 * um, 1.5e-4}, {1.064 * um, 2e-3}} {
		a, _ := m.IndexInAir(test.l)
		b, _ := bk7.IndexInAir(test.l)
		if d := math.Abs(a - b); d > test.max {
			t.Errorf("ModelGlass − N-BK7 at %v = %.2e, want ≤ %.0e", test.l, a-b, test.max)
		}
	}
	var re *material.RangeError
	if err := m.CheckRange(1.064 * um); !errors.As(err, &re) {
		t.Errorf("ModelGlass CheckRange(1.064 µm) = %v, want RangeError", err)
	}
	if err := m.CheckRange(0.55 * um); err != nil {
		t.Errorf("ModelGlass CheckRange(550 nm) = %v, want nil", err)
	}
	for _, bad := range [][2]float64{{1, 64}, {math.NaN(), 64}, {1.5, 0}, {1.5, math.Inf(1)}} {
		if _, err := material.ModelGlass(bad[0], bad[1]); err == nil {
			t.Errorf("ModelGlass(%v, %v) error = nil", bad[0], bad[1])
		}
	}
}

// The analytic derivatives against central differences of Index (and of
// IndexInAir-based formulas through Index): h = 1e-4 µm, for which the
// truncation error of the difference is below about 1e-6 relative
// to dn/dλ and rounding about 2e-16·n/h² ≈ 3e-8 /µm² in d²n; tolerances rel
// 1e-5 (first) and 1e-3 (second) cover both with margin.
func TestDispersionDerivatives(t *testing.T) {
	const h = 1e-4 * um
	for _, m := range allMaterials(t) {
		lo, hi := m.Range()
		if math.IsInf(float64(hi), 1) {
			lo, hi = 0.4*um, 1.6*um
		}
		if m.Basis() == material.RelativeToAir {
			lo, hi = lo*1.001, hi*0.999 // a vacuum wavelength inside the air-wavelength range
		}
		for i := 1; i <= 5; i++ {
			l := lo + (hi-lo)*units.Length(i)/6
			d, err := m.Dispersion(l)
			if err != nil {
				t.Fatalf("%s.Dispersion(%v): %v", m.Name(), l, err)
			}
			n0, _ := m.Index(l)
			np, _ := m.Index(l + h)
			nm, _ := m.Index(l - h)
			d1 := (np - nm) / (2 * float64(h))
			d2 := (np - 2*n0 + nm) / (float64(h) * float64(h))
			if d.N != n0 {
				t.Errorf("%s at %v: Dispersion.N = %.17g, Index = %.17g", m.Name(), l, d.N, n0)
			}
			if !scalar.EqualWithinAbsOrRel(d.DN, d1, 1e-3, 1e-5) {
				t.Errorf("%s at %v: dn/dλ = %.8e, difference %.8e", m.Name(), l, d.DN, d1)
			}
			if !scalar.EqualWithinAbsOrRel(d.D2N, d2, 1e6, 1e-3) {
				t.Errorf("%s at %v: d²n/dλ² = %.8e, difference %.8e", m.Name(), l, d.D2N, d2)
			}
		}
	}
}

// Property: no formula returns NaN or ±Inf with a nil error for any
// wavelength from 10 nm to 100 µm (seeded log-uniform draws, plus the
// exact poles of the Sellmeier terms nearby); inside each validity range
// the index is finite, ≥ 1 for these materials, with a nil error and a
// finite Dispersion.
func TestNoNaN(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for _, m := range allMaterials(t) {
		for range 2000 {
			l := units.Length(math.Exp(math.Log(10e-9) + rng.Float64()*math.Log(1e4)))
			checkFinite(t, m, l)
		}
		for _, l := range []units.Length{68.4043 * nm, 9.896161 * um, 34.649040 * um, 0.2292020 * 0.589 * um, 5.432937 * 0.589 * um} {
			checkFinite(t, m, l)
		}
		lo, hi := m.Range()
		if math.IsInf(float64(hi), 1) {
			hi = 10 * um
		}
		if lo == 0 {
			lo = 0.1 * um
		}
		for i := 0; i <= 50; i++ {
			l := (lo + (hi-lo)*units.Length(i)/50) * 1.0005 // vacuum, inside an air range too
			if l > hi {
				l = hi
			}
			n, err := m.Index(l)
			if err != nil || !(n >= 1) || math.IsInf(n, 0) {
				t.Errorf("%s.Index(%v) inside range = %v, %v", m.Name(), l, n, err)
			}
			if _, err := m.Dispersion(l); err != nil {
				t.Errorf("%s.Dispersion(%v) inside range: %v", m.Name(), l, err)
			}
		}
	}
}

func checkFinite(t testing.TB, m material.Material, l units.Length) {
	n, err := m.Index(l)
	if err == nil && (math.IsNaN(n) || math.IsInf(n, 0) || n <= 0) {
		t.Errorf("%s.Index(%v) = %v with nil error", m.Name(), l, n)
	}
	if err != nil && !errors.Is(err, material.ErrNoRealIndex) {
		t.Errorf("%s.Index(%v) error = %v, want nil or ErrNoRealIndex", m.Name(), l, err)
	}
	n, err = m.IndexInAir(l)
	if err == nil && (math.IsNaN(n) || math.IsInf(n, 0) || n <= 0) {
		t.Errorf("%s.IndexInAir(%v) = %v with nil error", m.Name(), l, n)
	}
	d, err := m.Dispersion(l)
	if err == nil && (math.IsNaN(d.DN+d.D2N+d.N) || math.IsInf(d.DN+d.D2N+d.N, 0)) {
		t.Errorf("%s.Dispersion(%v) = %+v with nil error", m.Name(), l, d)
	}
	if g, err := m.GroupIndex(l); err == nil && (math.IsNaN(g) || math.IsInf(g, 0)) {
		t.Errorf("%s.GroupIndex(%v) = %v with nil error", m.Name(), l, g)
	}
}

// FuzzIndex: any float64 wavelength gives a finite index or an error.
func FuzzIndex(f *testing.F) {
	for _, s := range []float64{633e-9, 0, -1, 1e-300, 1e300, 9.896161e-6, math.NaN(), math.Inf(1)} {
		f.Add(s)
	}
	ms := allMaterials(f)
	f.Fuzz(func(t *testing.T, l float64) {
		for _, m := range ms {
			n, err := m.Index(units.Length(l))
			if err == nil && (math.IsNaN(n) || math.IsInf(n, 0) || n <= 0) {
				t.Fatalf("%s.Index(%g) = %v with nil error", m.Name(), l, n)
			}
			_ = m.CheckRange(units.Length(l))
		}
	})
}

// Errors: bad wavelengths, the zero Material and unknown names.
func TestErrors(t *testing.T) {
	bk7, _ := material.ByName("n-bk7 ")
	if bk7.Name() != "N-BK7" {
		t.Errorf(`ByName("n-bk7 ").Name() = %q`, bk7.Name())
	}
	for _, l := range []units.Length{0, -500 * nm, units.Length(math.NaN()), units.Length(math.Inf(1))} {
		_, err := bk7.Index(l)
		var e *material.Error
		if !errors.As(err, &e) || !strings.Contains(err.Error(), `"N-BK7"`) || !strings.Contains(err.Error(), "vacuum wavelength λ0 = ") {
			t.Errorf("Index(%v) error = %v, want *Error naming material and value", l, err)
		}
	}
	if got := func() string { _, err := bk7.Index(-500 * nm); return err.Error() }(); got != `material: "N-BK7": vacuum wavelength λ0 = -500 nm: must be positive and finite` {
		t.Errorf("error text = %q", got)
	}
	var zero material.Material
	if _, err := zero.Index(633 * nm); !errors.Is(err, material.ErrZeroMaterial) {
		t.Errorf("zero Material Index error = %v, want ErrZeroMaterial", err)
	}
	if err := zero.CheckRange(633 * nm); !errors.Is(err, material.ErrZeroMaterial) {
		t.Errorf("zero Material CheckRange = %v, want ErrZeroMaterial", err)
	}
	_, err := material.ByName("unobtainium")
	if !errors.Is(err, material.ErrUnknownName) || !strings.Contains(err.Error(), "N-BK7") || !strings.Contains(err.Error(), "fused silica") {
		t.Errorf("ByName(unknown) error = %v, want ErrUnknownName listing names", err)
	}
	for _, test := range []struct {
		B, C []float64
		lo   units.Length
	}{
		{[]float64{1}, []float64{0.01, 0.02}, 0.3 * um},
		{nil, nil, 0.3 * um},
		{[]float64{1}, []float64{-0.01}, 0.3 * um},
		{[]float64{math.NaN()}, []float64{0.01}, 0.3 * um},
		{[]float64{1}, []float64{0.01}, 3 * um},
	} {
		if _, err := material.Sellmeier("user", test.B, test.C, test.lo, 2.5*um, material.RelativeToAir, ""); err == nil {
			t.Errorf("Sellmeier(%v, %v, %v) error = nil", test.B, test.C, test.lo)
		}
	}
	if _, err := material.Constant("bad", 0); err == nil {
		t.Errorf("Constant(0) error = nil")
	}
	k, _ := material.Constant("k", 1.5)
	if v, err := k.Abbe(); !math.IsInf(v, 1) || !errors.Is(err, material.ErrNoDispersion) {
		t.Errorf("Constant.Abbe() = %v, %v, want +Inf, ErrNoDispersion", v, err)
	}
}

// CheckRange: the warning names the material, both wavelengths and the
// range in the formula's convention.
func TestCheckRange(t *testing.T) {
	bk7, _ := material.ByName("N-BK7")
	err := bk7.CheckRange(2.6 * um)
	var re *material.RangeError
	if !errors.As(err, &re) {
		t.Fatalf("CheckRange(2.6 µm) = %v, want *RangeError", err)
	}
	for _, s := range []string{`"N-BK7"`, "air wavelength 2.5993 µm", "vacuum 2.6 µm", "300 nm – 2.5 µm", "air wavelengths"} {
		if !strings.Contains(err.Error(), s) {
			t.Errorf("CheckRange message %q lacks %q", err, s)
		}
	}
	if err := bk7.CheckRange(1.064 * um); err != nil {
		t.Errorf("CheckRange(1.064 µm) = %v, want nil", err)
	}
	// The edge: 300 nm in air is 300.08 nm in vacuum.
	if err := bk7.CheckRange(300 * nm); err == nil {
		t.Errorf("CheckRange(300 nm vacuum) = nil, want warning (air wavelength 299.92 nm)")
	}
}
