package paraxial

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
	"unsafe"

	"github.com/beamnote/beamnote/opticslib/internal/pyref"
	"github.com/beamnote/beamnote/opticslib/units"
)

// randomApertureSystem returns a seeded random system of n builder calls
// (spaces, lenses, interfaces, tilted mirrors, cylindrical lenses,
// diaphragms), most of them with a clear aperture, some offset, of a size
// that vignettes part of the rays of randomRays.
func randomApertureSystem(t *testing.T, rng *rand.Rand, n int) System {
	t.Helper()
	b := NewBuilder().Medium(1 + 0.5*rng.Float64())
	sign := func() float64 { return float64(1 - 2*rng.IntN(2)) }
	for range n {
		switch rng.IntN(7) {
		case 0, 1:
			b.Space(units.Length(0.2 * rng.Float64()))
		case 2:
			b.ThinLens(units.Length(sign() * (0.02 + 0.48*rng.Float64())))
		case 3:
			b.Interface(units.Length(sign()*(0.005+0.195*rng.Float64())), 1+rng.Float64())
		case 4:
			b.ConcaveMirror(units.Length(0.05+0.5*rng.Float64()), units.Angle(0.5*rng.Float64()))
		case 5:
			b.CylindricalLens(units.Length(sign()*(0.05+0.3*rng.Float64())), Plane(rng.IntN(2)))
		case 6:
			b.Diaphragm(ClearRadius(units.Length(1e-3 + 4e-3*rng.Float64())))
			continue
		}
		if rng.IntN(4) > 0 {
			o := ClearRadius(units.Length(1e-3 + 4e-3*rng.Float64()))
			if rng.IntN(3) == 0 {
				o = o.Offset(units.Length(1e-3*rng.NormFloat64()), units.Length(1e-3*rng.NormFloat64()))
			}
			b.Aperture(o)
		}
	}
	s, err := b.Build()
	if err != nil {
		t.Fatalf("Build() error: %v", err)
	}
	return s
}

// randomRays returns n seeded rays as structure-of-arrays: heights within
// ±3 mm, angles within ±20 mrad.
func randomRays(rng *rand.Rand, n int) (ys, thetas []float64) {
	ys, thetas = make([]float64, n), make([]float64, n)
	for k := range n {
		ys[k], thetas[k] = 3e-3*(2*rng.Float64()-1), 20e-3*(2*rng.Float64()-1)
	}
	return ys, thetas
}

// checkBulkAgainstTrace compares TraceBulk with the per-ray Trace over
// [0, Length()]. The two apply the same matrices with the same rounding
// (each product rounded, then summed: Matrix.Apply), so heights and
// angles must be equal, not merely close; == lets +0 equal −0, the one
// difference allowed (the bulk trace does not add the exact zero 0·y of a
// space's C entry to θ). The blocked flag of a ray is the OR of the
// Blocked flags of its steps.
func checkBulkAgainstTrace(t *testing.T, name string, s System, p Plane, ys, thetas []float64, procs int) int {
	t.Helper()
	n, m := len(ys), s.Len()
	heights, angles := make([]float64, m*n), make([]float64, m*n)
	mask := NewRayMask(n)
	for i := range mask {
		mask[i] = ^uint64(0) // TraceBulk must overwrite, not OR into, the mask
	}
	if err := s.TraceBulk(p, ys, thetas, heights, angles, mask, procs); err != nil {
		t.Errorf("%s: TraceBulk error: %v", name, err)
		return 0
	}
	steps := make([]Step, 0, m+2)
	mismatches := 0
	for k := range n {
		steps, err := s.Trace(Ray{Y: units.Length(ys[k]), Theta: units.Angle(thetas[k])}, 0, s.Length(), p, steps)
		if err != nil {
			t.Errorf("%s: Trace(ray %d) error: %v", name, k, err)
			return 0
		}
		// Trace gives one step per element the walk keeps, after the start
		// point (Element −1); the bulk rows are per element.
		var bl bool
		row := 0
		for _, st := range steps[1:] {
			bl = bl || st.Blocked
			for ; row <= st.Element && row < m; row++ {
				if row < st.Element {
					continue // left out by the walk: the row repeats the previous one
				}
				gy, gt := heights[row*n+k], angles[row*n+k]
				if gy != float64(st.Ray.Y) || gt != float64(st.Ray.Theta) {
					if mismatches < 5 {
						t.Errorf("%s: ray %d element %d: TraceBulk = (%.17g, %.17g), Trace = (%.17g, %.17g)", name, k, row, gy, gt, float64(st.Ray.Y), float64(st.Ray.Theta))
					}
					mismatches++
				}
			}
		}
		if got := mask.Has(k); got != bl {
			if mismatches < 5 {
				t.Errorf("%s: ray %d: TraceBulk blocked = %v, Trace's steps blocked = %v", name, k, got, bl)
			}
			mismatches++
		}
	}
	for k := n; k < 64*len(mask); k++ {
		if mask.Has(k) {
			t.Errorf("%s: mask bit %d beyond the %d rays is set", name, k, n)
			break
		}
	}
	return mask.Count()
}

func TestTraceBulkMatchesTrace(t *testing.T) {
	// Reference: the per-ray System.Trace (itself checked against the
	// composed matrices in the trace tests), on seeded random systems with
	// apertures, in both planes, on one core and split across goroutines.
	rng := rand.New(rand.NewPCG(1, 1))
	vignetted, total := 0, 0
	for c := range 60 {
		s := randomApertureSystem(t, rng, 1+rng.IntN(15))
		// Ray counts around the tile size (512) and its word boundaries.
		n := []int{1, 63, 64, 65, 511, 512, 513, 1000, 1500}[c%9]
		ys, thetas := randomRays(rng, n)
		for _, p := range []Plane{Tangential, Sagittal} {
			for _, procs := range []int{1, 3} {
				vignetted += checkBulkAgainstTrace(t, "case "+strconv.Itoa(c)+" "+p.String()+" procs="+strconv.Itoa(procs), s, p, ys, thetas, procs)
				total += n
			}
		}
	}
	// The systems must exercise both outcomes of the aperture test.
	if vignetted == 0 || vignetted == total {
		t.Errorf("%d of %d rays vignetted: the cases do not test the aperture rule", vignetted, total)
	}
}

func TestTraceBulkSplitsLargeBatches(t *testing.T) {
	// Above BulkSplitRays per core the default (procs = 0) splits the
	// batch; each share must give what the one-core trace gives, bit for
	// bit (the same arithmetic per ray, independent of the split).
	rng := rand.New(rand.NewPCG(2, 2))
	s := randomApertureSystem(t, rng, 8)
	n := 2*BulkSplitRays + 777
	ys, thetas := randomRays(rng, n)
	m := s.Len()
	one, many := make([]float64, m*n), make([]float64, m*n)
	oneA, manyA := make([]float64, m*n), make([]float64, m*n)
	oneM, manyM := NewRayMask(n), NewRayMask(n)
	if err := s.TraceBulk(Tangential, ys, thetas, one, oneA, oneM, 1); err != nil {
		t.Fatalf("TraceBulk(procs=1) error: %v", err)
	}
	for _, procs := range []int{0, 2, 5} {
		if err := s.TraceBulk(Tangential, ys, thetas, many, manyA, manyM, procs); err != nil {
			t.Errorf("TraceBulk(procs=%d) error: %v", procs, err)
			continue
		}
		for i := range one {
			if math.Float64bits(one[i]) != math.Float64bits(many[i]) || math.Float64bits(oneA[i]) != math.Float64bits(manyA[i]) {
				t.Errorf("TraceBulk(procs=%d): value %d = (%g, %g), one core (%g, %g)", procs, i, many[i], manyA[i], one[i], oneA[i])
				break
			}
		}
		for i := range oneM {
			if oneM[i] != manyM[i] {
				t.Errorf("TraceBulk(procs=%d): mask word %d = %#x, one core %#x", procs, i, manyM[i], oneM[i])
				break
			}
		}
	}
	// A sample of the rays against the per-ray trace as well.
	checkBulkAgainstTrace(t, "split sample", s, Tangential, ys[:2000], thetas[:2000], 2)
}

func TestTraceBulkVectorMatchesPortable(t *testing.T) {
	// The vector kernel (where the processor has one) against the portable
	// kernels on the same program: same products, same sums, so the same
	// bits, with ordinary and with non-temporal stores, for finite rays
	// and for the non-finite ones an overflowing trace leaves (NaN
	// propagation is the same in scalar and packed arithmetic).
	if !useBulkVector {
		t.Skip("no vector kernel on this platform")
	}
	defer func() { useBulkVector = true }()
	rng := rand.New(rand.NewPCG(5, 5))
	for c := range 20 {
		s := randomApertureSystem(t, rng, 1+rng.IntN(15))
		n := 64 * (1 + rng.IntN(40))
		ys, thetas := randomRays(rng, n)
		ys[rng.IntN(n)], thetas[rng.IntN(n)] = math.Inf(1), 1e300
		ys[rng.IntN(n)] = math.NaN()
		ys[rng.IntN(n)], thetas[rng.IntN(n)] = math.Copysign(0, -1), math.Copysign(0, -1)
		m := s.Len()
		run := func(vector, stream bool) ([]float64, []float64, RayMask, bool) {
			useBulkVector = vector
			h, a := aligned32(m*n), aligned32(m*n)
			mask := NewRayMask(n)
			args := bulkArgs{n: n, ys: ys, thetas: thetas, heights: h, angles: a, blocked: mask,
				ops: s.program(Sagittal, true, nil), stream: stream}
			return h, a, mask, args.trace(0, n)
		}
		wh, wa, wm, wbad := run(false, false)
		for _, stream := range []bool{false, true} {
			h, a, mask, bad := run(true, stream)
			name := "case " + strconv.Itoa(c) + " stream=" + strconv.FormatBool(stream)
			if bad != wbad {
				t.Errorf("%s: vector kernel reports non-finite = %v, portable %v", name, bad, wbad)
			}
			for i := range wh {
				if math.Float64bits(h[i]) != math.Float64bits(wh[i]) || math.Float64bits(a[i]) != math.Float64bits(wa[i]) {
					t.Errorf("%s: value %d = (%g, %g), portable (%g, %g)", name, i, h[i], a[i], wh[i], wa[i])
					break
				}
			}
			for i := range wm {
				if mask[i] != wm[i] {
					t.Errorf("%s: mask word %d = %#x, portable %#x", name, i, mask[i], wm[i])
					break
				}
			}
		}
	}
}

// aligned32 returns n float64s that start on a 32-byte boundary, as the
// non-temporal stores need (Go's small allocations are aligned to their
// size class only).
func aligned32(n int) []float64 {
	buf := make([]float64, n+3)
	off := int(uintptr(unsafe.Pointer(&buf[0]))%32) / 8
	return buf[(4-off)%4:][:n]
}

func TestTraceBulkOptionalOutputs(t *testing.T) {
	// nil angles and a nil mask leave the heights unchanged (identity of
	// the arithmetic with and without the optional outputs).
	rng := rand.New(rand.NewPCG(3, 3))
	s := randomApertureSystem(t, rng, 10)
	n := 700
	ys, thetas := randomRays(rng, n)
	want := make([]float64, s.Len()*n)
	if err := s.TraceBulk(Sagittal, ys, thetas, want, make([]float64, len(want)), NewRayMask(n), 1); err != nil {
		t.Fatalf("TraceBulk error: %v", err)
	}
	got := make([]float64, len(want))
	if err := s.TraceBulk(Sagittal, ys, thetas, got, nil, nil, 1); err != nil {
		t.Fatalf("TraceBulk(nil, nil) error: %v", err)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("TraceBulk(nil angles, nil mask) height %d = %g, want %g", i, got[i], want[i])
		}
	}
}

func TestTraceBulkErrors(t *testing.T) {
	s := mustBuild(t, NewBuilder().Space(0.1).ThinLens(0.05).Space(0.1))
	h := make([]float64, 3*128)
	for _, test := range []struct {
		name      string
		sys       System
		p         Plane
		ys, thets []float64
		want      error
	}{
		{"zero System", System{}, Tangential, []float64{0}, []float64{0}, ErrNotBuilt},
		{"bad plane", s, Plane(7), []float64{0, 0}, []float64{0, 0}, ErrPlane},
		{"NaN height", s, Tangential, []float64{math.NaN(), 0}, []float64{0, 0}, ErrNonFinite},
		{"infinite angle", s, Tangential, []float64{0, 0}, []float64{0, math.Inf(-1)}, ErrNonFinite},
		{"overflow", s, Tangential, []float64{1e308, 0}, []float64{1e308, 0}, ErrOverflow},
		// 128 rays: whole words, traced by the vector kernel where there is one.
		{"overflow, 128 rays", s, Tangential, append(make([]float64, 127), 1e308), append(make([]float64, 127), 1e308), ErrOverflow},
	} {
		hh := h[:test.sys.Len()*len(test.ys)]
		if err := test.sys.TraceBulk(test.p, test.ys, test.thets, hh, nil, nil, 1); !errors.Is(err, test.want) {
			t.Errorf("%s: TraceBulk error = %v, want %v", test.name, err, test.want)
		}
	}
	// An empty system has no rows; its inputs are still checked.
	empty := mustBuild(t, NewBuilder())
	if err := empty.TraceBulk(Tangential, []float64{math.Inf(1)}, []float64{0}, nil, nil, nil, 1); !errors.Is(err, ErrNonFinite) {
		t.Errorf("empty system, infinite height: TraceBulk error = %v, want ErrNonFinite", err)
	}
	if err := s.TraceBulk(Tangential, nil, nil, nil, nil, nil, 0); err != nil {
		t.Errorf("no rays: TraceBulk error = %v, want nil", err)
	}
	for _, test := range []struct {
		name                      string
		ys, thetas, heights, angs []float64
		mask                      RayMask
	}{
		{"len(thetas)", []float64{0, 0}, []float64{0}, make([]float64, 6), nil, nil},
		{"len(heights)", []float64{0, 0}, []float64{0, 0}, make([]float64, 5), nil, nil},
		{"len(angles)", []float64{0, 0}, []float64{0, 0}, make([]float64, 6), make([]float64, 2), nil},
		{"len(blocked)", []float64{0, 0}, []float64{0, 0}, make([]float64, 6), nil, RayMask{}},
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: TraceBulk with a wrong length did not panic", test.name)
				}
			}()
			_ = s.TraceBulk(Tangential, test.ys, test.thetas, test.heights, test.angs, test.mask, 1)
		}()
	}
}

func TestTraceBulkDoesNotAllocate(t *testing.T) {
	// The documented promise: caller-owned buffers, no allocation, also
	// when the batch is split across goroutines (workers are reused).
	rng := rand.New(rand.NewPCG(4, 4))
	s := randomApertureSystem(t, rng, 10)
	for _, test := range []struct {
		n, procs int
	}{{1000, 1}, {2*BulkSplitRays + 1, 2}} {
		ys, thetas := randomRays(rng, test.n)
		h, a := make([]float64, s.Len()*test.n), make([]float64, s.Len()*test.n)
		mask := NewRayMask(test.n)
		allocs := testing.AllocsPerRun(20, func() {
			if err := s.TraceBulk(Tangential, ys, thetas, h, a, mask, test.procs); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("TraceBulk(%d rays, procs=%d) allocates %v times per call, want 0", test.n, test.procs, allocs)
		}
	}
}

func TestRayMask(t *testing.T) {
	m := NewRayMask(130)
	if len(m) != 3 {
		t.Fatalf("NewRayMask(130) has %d words, want 3", len(m))
	}
	m[0], m[2] = 1<<5, 1<<1
	for _, test := range []struct {
		k    int
		want bool
	}{{5, true}, {4, false}, {129, true}, {128, false}} {
		if got := m.Has(test.k); got != test.want {
			t.Errorf("Has(%d) = %v, want %v", test.k, got, test.want)
		}
	}
	if got := m.Count(); got != 2 {
		t.Errorf("Count() = %d, want 2", got)
	}
}

func TestTraceBulkCrossCheck(t *testing.T) {
	// Reference: testdata/crosscheck/paraxial_bulk.py, NumPy applying each
	// element's ABCD matrix to all rays at once, with the aperture rule of
	// Trace. Same IEEE products and sums, so the values agree to rounding
	// (abs 1e-15 m or rad, rel 1e-12: a space the walk leaves out as too
	// short still adds its d·θ in NumPy); a ray vignetted on one side only
	// would lie on an aperture edge within that rounding, which random
	// rays do not.
	type elem struct {
		Kind string    `json:"kind"`
		D    float64   `json:"d,omitempty"`
		M    []float64 `json:"m,omitempty"`
		Lim  []float64 `json:"lim"`
	}
	type xcCase struct {
		Ys       []float64 `json:"ys"`
		Thetas   []float64 `json:"thetas"`
		Elements []elem    `json:"elements"`
	}
	rng := rand.New(rand.NewPCG(6, 6))
	var cases []xcCase
	var systems []System
	var planes []Plane
	for c := range 12 {
		s := randomApertureSystem(t, rng, 2+rng.IntN(12))
		p := Plane(c % 2)
		ys, thetas := randomRays(rng, 64*(1+rng.IntN(8))+rng.IntN(64))
		var els []elem
		for i := range s.elems {
			e := &s.elems[i]
			el := elem{Kind: "matrix"}
			if e.Kind == KindSpace {
				el = elem{Kind: "space", D: float64(e.Length)}
			} else {
				m := e.matrix(p)
				el.M = []float64{m.A, m.B, m.C, m.D}
			}
			if l := e.lim[p&1]; l.ok {
				el.Lim = []float64{l.lo, l.hi}
			}
			els = append(els, el)
		}
		cases = append(cases, xcCase{Ys: ys, Thetas: thetas, Elements: els})
		systems, planes = append(systems, s), append(planes, p)
	}
	var ref struct {
		Reference string `json:"reference"`
		Cases     []struct {
			Heights [][]float64 `json:"heights"`
			Angles  [][]float64 `json:"angles"`
			Blocked []int       `json:"blocked"`
		} `json:"cases"`
	}
	pyref.Run(t, "paraxial_bulk.py", map[string]any{"cases": cases}, &ref)
	if len(ref.Cases) != len(cases) {
		t.Fatalf("reference returned %d cases, want %d", len(ref.Cases), len(cases))
	}
	close := func(a, b float64) bool { return math.Abs(a-b) <= 1e-15+1e-12*math.Abs(b) }
	vignetted := 0
	for c, s := range systems {
		n, m := len(cases[c].Ys), s.Len()
		h, a := make([]float64, m*n), make([]float64, m*n)
		mask := NewRayMask(n)
		if err := s.TraceBulk(planes[c], cases[c].Ys, cases[c].Thetas, h, a, mask, 1); err != nil {
			t.Fatalf("case %d: TraceBulk error: %v", c, err)
		}
		r := ref.Cases[c]
		bad := 0
		for i := range m {
			for k := range n {
				if !close(h[i*n+k], r.Heights[i][k]) || !close(a[i*n+k], r.Angles[i][k]) {
					if bad < 3 {
						t.Errorf("case %d element %d ray %d: TraceBulk (%.17g, %.17g), NumPy (%.17g, %.17g)", c, i, k, h[i*n+k], a[i*n+k], r.Heights[i][k], r.Angles[i][k])
					}
					bad++
				}
			}
		}
		for k := range n {
			if mask.Has(k) != (r.Blocked[k] == 1) {
				t.Errorf("case %d ray %d: TraceBulk blocked %v, NumPy %d", c, k, mask.Has(k), r.Blocked[k])
			}
		}
		vignetted += mask.Count()
	}
	if vignetted == 0 {
		t.Error("no ray vignetted: the cases do not test the aperture rule")
	}
	t.Logf("%s: %d cases agree", ref.Reference, len(cases))
}
