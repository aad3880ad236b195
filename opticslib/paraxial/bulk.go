package paraxial

import (
	"math"
	"math/bits"
	"runtime"
	"strconv"
	"sync"
	"sync/atomic"
)

// RayMask is a set of ray indices, one bit per ray: ray k is in the set
// when bit k%64 of word k/64 is 1. [System.TraceBulk] reports the
// vignetted rays in one; 10⁶ rays take 125 kB.
type RayMask []uint64

// NewRayMask returns an empty mask for n ≥ 0 rays ((n+63)/64 words). It
// panics if n < 0.
func NewRayMask(n int) RayMask {
	if n < 0 {
		panic("paraxial: NewRayMask: negative ray count " + strconv.Itoa(n))
	}
	return make(RayMask, maskWords(n))
}

// Has reports whether ray k is in the set. It panics if k is negative or
// beyond the mask's 64·len(m) rays.
func (m RayMask) Has(k int) bool { return m[k>>6]&(1<<(uint(k)&63)) != 0 }

// Count returns the number of rays in the set.
func (m RayMask) Count() int {
	c := 0
	for _, w := range m {
		c += bits.OnesCount64(w)
	}
	return c
}

func maskWords(n int) int { return (n + 63) >> 6 }

// bulkTile is the number of rays traced together through all elements:
// their heights and angles stay in the first-level cache between
// elements. It is a multiple of 64, so that tiles own whole words of a
// [RayMask] and the goroutines of one trace never share one.
const bulkTile = 512

// BulkSplitRays is the smallest number of rays per goroutine at which
// [System.TraceBulk] splits a batch across cores (with procs ≤ 0);
// smaller batches are traced on the calling goroutine, where starting
// work elsewhere would cost more than it saves.
const BulkSplitRays = 1 << 16

// TraceBulk traces n = len(ys) rays from the input plane (z = 0) to the
// output plane (z = Length()) in plane p, all at once, and stores the
// height of every ray just after every element (and its angle, if
// wanted) and whether it is vignetted. It is the many-ray form of
// [System.Trace] over that range: same walk, same aperture rule, same
// arithmetic, so the heights equal Trace's step by step (a zero may
// differ in sign where Trace adds an exact zero).
//
// The inputs are structure-of-arrays: ys[k] is the height of ray k in
// metres and thetas[k] its angle in radians, at z = 0. The outputs go to
// buffers the caller owns (element-major, one row of n values per
// element, in element order):
//
//	heights[i*n + k]  height in metres of ray k just after element i
//	                  (at the end of a space; a surface at z = 0 included)
//	angles[i*n + k]   its angle in radians; angles may be nil (not wanted)
//	blocked           ray k is in the set if it lies outside the clear
//	                  aperture of any element (checked as in Trace: a
//	                  surface's against the arriving ray, a space's at
//	                  both ends); nil skips the aperture tests
//
// heights must have length Len()·n, angles (if not nil) the same, and
// blocked (if not nil) at least (n+63)/64 words ([NewRayMask](n)); its
// first (n+63)/64 words are overwritten. An element that the walk leaves
// out (a space too short to change the position in float64) repeats the
// row before it, as the ray passes it unchanged in Trace.
//
// procs chooses the cores: 1 traces on the calling goroutine (for
// measuring one core), procs > 1 splits the rays across up to procs
// goroutines, and procs ≤ 0 across runtime.GOMAXPROCS(0) goroutines once
// there are at least [BulkSplitRays] rays for each. TraceBulk does not
// allocate (the goroutines that share the work are started once and then
// reused), and it is safe to call concurrently on buffers that do not
// overlap.
//
// It returns [ErrNotBuilt] for the zero System, [ErrPlane] for an unknown
// plane, [ErrNonFinite] if an input ray is not finite, and [ErrOverflow]
// if a traced ray overflows; the buffers then hold what was traced. It
// panics if len(thetas) ≠ n or a buffer has the wrong length.
func (s System) TraceBulk(p Plane, ys, thetas, heights, angles []float64, blocked RayMask, procs int) error {
	n := len(ys)
	if len(thetas) != n {
		panic("paraxial: TraceBulk: len(thetas) = " + strconv.Itoa(len(thetas)) + ", len(ys) = " + strconv.Itoa(n))
	}
	if len(heights) != len(s.elems)*n {
		panic("paraxial: TraceBulk: len(heights) = " + strconv.Itoa(len(heights)) + ", want Len()·len(ys) = " + strconv.Itoa(len(s.elems)*n))
	}
	if angles != nil && len(angles) != len(heights) {
		panic("paraxial: TraceBulk: len(angles) = " + strconv.Itoa(len(angles)) + ", want Len()·len(ys) = " + strconv.Itoa(len(heights)))
	}
	if blocked != nil && len(blocked) < maskWords(n) {
		panic("paraxial: TraceBulk: len(blocked) = " + strconv.Itoa(len(blocked)) + " words, want (len(ys)+63)/64 = " + strconv.Itoa(maskWords(n)))
	}
	if err := s.check(p); err != nil {
		return err
	}
	if n == 0 {
		return nil
	}
	prog := bulkPrograms.Get().(*[]bulkOp)
	*prog = s.program(p, blocked != nil, *prog)
	defer bulkPrograms.Put(prog)
	args := bulkArgs{n: n, ys: ys, thetas: thetas, heights: heights, angles: angles, blocked: blocked, ops: *prog}
	args.stream = stream(heights, angles, n)
	workers := procs
	if procs <= 0 {
		workers = min(runtime.GOMAXPROCS(0), n/BulkSplitRays)
	}
	// Whole tiles per goroutine.
	tiles := (n + bulkTile - 1) / bulkTile
	workers = max(1, min(workers, tiles))
	var bad bool
	if workers == 1 {
		bad = args.trace(0, n)
	} else {
		bad = split(&args, workers, tiles)
	}
	if !bad {
		return nil
	}
	for k := range n {
		if !finite(ys[k]) || !finite(thetas[k]) {
			return ErrNonFinite
		}
	}
	return ErrOverflow
}

// bulkArgs are the arguments of one call of [System.TraceBulk], with the
// element program it traces.
type bulkArgs struct {
	n                           int
	ys, thetas, heights, angles []float64
	blocked                     RayMask
	ops                         []bulkOp // one per row, then opEnd
	stream                      bool     // the vector kernel's non-temporal stores
}

// The kinds of [bulkOp].
const (
	opCopy    = iota // the walk left the element out: y and θ pass unchanged
	opSpace          // y + b·θ; θ unchanged; tested on arrival and on leaving
	opLens           // y unchanged; θ = c·y + d·θ; tested on arrival
	opSurface        // y = a·y + b·θ, θ = c·y + d·θ; tested on arrival
	opEnd            // after the last row
)

// bulkOp is what one element does to a ray in the bulk trace: the row
// program that both the portable kernels below and the vector kernel
// (bulk_amd64.s, which reads this layout by offset) run. Each coefficient
// is held four times, one per lane of a 256-bit register. An element
// without a test (no clear aperture, or no mask wanted) has lo = −∞ and
// hi = +∞, so that the vector kernel can test every element without a
// branch: no height lies outside, NaN neither.
type bulkOp struct {
	kind, test         uint64
	a, b, c, d, lo, hi [4]float64
}

// bulkOpBytes is the size of a bulkOp, the stride of the vector kernel's
// program.
const bulkOpBytes = 208

func quad(v float64) [4]float64 { return [4]float64{v, v, v, v} }

// bulkPrograms recycles the row programs, so that a trace allocates
// nothing once a program of its length has been made.
var bulkPrograms = sync.Pool{New: func() any { return new([]bulkOp) }}

// program writes to buf (reused if long enough) the row program of the
// full range [0, Length()] of the one walk (System.walker) in plane p:
// every element once, in order, spaces clipped by its boundary rule, the
// elements it leaves out as copies, then opEnd. tested chooses whether
// clear apertures are tested.
func (s *System) program(p Plane, tested bool, buf []bulkOp) []bulkOp {
	ops := buf[:0]
	inf := math.Inf(1)
	for w := s.walker(0, s.length); w.next(); {
		pc := &w.pc
		e := pc.e
		if e == nil {
			continue // no input or output medium inside [0, Length()]
		}
		for len(ops) < pc.i {
			ops = append(ops, bulkOp{kind: opCopy})
		}
		op := bulkOp{lo: quad(-inf), hi: quad(inf)}
		if l := e.lim[p&1]; l.ok && tested {
			op.test, op.lo, op.hi = 1, quad(l.lo), quad(l.hi)
		}
		switch mx := e.matrix(p); {
		case e.Kind == KindSpace:
			// Space(d).Apply: y + d·θ (the product 1·y is exact); θ is
			// unchanged.
			op.kind, op.b = opSpace, quad(float64(pc.to-pc.from))
		case mx.A == 1 && mx.B == 0:
			// A lens or an interface at normal incidence: y is unchanged
			// (1·y + 0·θ = y).
			op.kind, op.c, op.d = opLens, quad(mx.C), quad(mx.D)
		default:
			op.kind, op.a, op.b, op.c, op.d = opSurface, quad(mx.A), quad(mx.B), quad(mx.C), quad(mx.D)
		}
		ops = append(ops, op)
	}
	for len(ops) < len(s.elems) {
		ops = append(ops, bulkOp{kind: opCopy})
	}
	return append(ops, bulkOp{kind: opEnd})
}

// bulkJob is a call of [System.TraceBulk] shared between goroutines.
// Jobs are recycled (bulkJobs), so that sharing allocates nothing.
type bulkJob struct {
	args bulkArgs
	wg   sync.WaitGroup
	bad  atomic.Bool
}

var bulkJobs = sync.Pool{New: func() any { return new(bulkJob) }}

// bulkTask is the share [lo, hi) of a job's rays that one worker traces.
type bulkTask struct {
	job    *bulkJob
	lo, hi int
}

// bulkPool holds the goroutines that share large traces. They are started
// when a trace first needs them and then wait for work: a trace hands
// them tasks without allocating.
var bulkPool struct {
	mu      sync.Mutex
	started int
	tasks   chan bulkTask
}

func bulkWorker(tasks <-chan bulkTask) {
	for t := range tasks {
		if t.job.args.trace(t.lo, t.hi) {
			t.job.bad.Store(true)
		}
		t.job.wg.Done()
	}
}

// split traces a in workers shares of whole tiles, one of them on the
// calling goroutine, and reports whether a ray was not finite.
func split(a *bulkArgs, workers, tiles int) bool {
	j := bulkJobs.Get().(*bulkJob)
	j.args = *a
	j.bad.Store(false)
	bulkPool.mu.Lock()
	if bulkPool.tasks == nil {
		bulkPool.tasks = make(chan bulkTask)
	}
	for ; bulkPool.started < workers-1; bulkPool.started++ {
		go bulkWorker(bulkPool.tasks)
	}
	tasks := bulkPool.tasks
	bulkPool.mu.Unlock()
	bound := func(w int) int { return min(a.n, (tiles*w/workers)*bulkTile) }
	j.wg.Add(workers - 1)
	for w := 1; w < workers; w++ {
		tasks <- bulkTask{job: j, lo: bound(w), hi: bound(w + 1)}
	}
	bad := a.trace(0, bound(1))
	j.wg.Wait()
	bad = bad || j.bad.Load()
	j.args = bulkArgs{} // do not keep the caller's buffers alive
	bulkJobs.Put(j)
	return bad
}

// trace traces rays [lo, hi) (lo a multiple of bulkTile) and reports
// whether a ray was not finite at the output plane (a non-finite height
// or angle stays non-finite through every later matrix). The vector
// kernel, where the processor has one, takes the whole words of 64 rays;
// the portable kernels take the rest, tile by tile.
func (j *bulkArgs) trace(lo, hi int) bool {
	bad := false
	if useBulkVector {
		k := (hi - lo) &^ 63
		bad = j.vector(lo, lo+k)
		lo += k
	}
	var th [bulkTile]float64
	var mask [bulkTile / 64]uint64
	var acc float64 // 0, or NaN once a ray is not finite
	for t0 := lo; t0 < hi; t0 += bulkTile {
		m := min(bulkTile, hi-t0)
		copy(th[:m], j.thetas[t0:t0+m])
		mask = [bulkTile / 64]uint64{}
		y := j.tile(t0, th[:m], &mask)
		t := th[:len(y)]
		for k, v := range y {
			acc += 0*v + 0*t[k]
		}
		if j.blocked != nil {
			copy(j.blocked[t0>>6:maskWords(t0+m)], mask[:])
		}
	}
	return bad || acc != acc
}

// tile traces the rays of the tile starting at ray t0, with angles th,
// through the row program, row by row: each row's heights are computed
// from the row before it (the input heights for the first) and written to
// its row, th is updated in place, and the mask bits of the vignetted
// rays are set. It returns the heights at the output plane.
func (j *bulkArgs) tile(t0 int, th []float64, mask *[bulkTile / 64]uint64) []float64 {
	n, m := j.n, len(th)
	prev := j.ys[t0 : t0+m]
	for row, op := range j.ops[:len(j.ops)-1] {
		out := j.heights[row*n+t0:][:m]
		test := op.test != 0
		switch op.kind {
		case opCopy:
			copy(out, prev)
		case opSpace:
			if test {
				bulkSpaceTested(prev, th, out, op.b[0], op.lo[0], op.hi[0], mask)
			} else {
				bulkSpace(prev, th, out, op.b[0])
			}
		case opLens:
			if test {
				bulkLensTested(prev, th, out, op.c[0], op.d[0], op.lo[0], op.hi[0], mask)
			} else {
				bulkLens(prev, th, out, op.c[0], op.d[0])
			}
		default:
			mx := Matrix{A: op.a[0], B: op.b[0], C: op.c[0], D: op.d[0]}
			if test {
				bulkSurfaceTested(prev, th, out, mx, op.lo[0], op.hi[0], mask)
			} else {
				bulkSurface(prev, th, out, mx)
			}
		}
		if j.angles != nil {
			copy(j.angles[row*n+t0:][:m], th)
		}
		prev = out
	}
	return prev
}

// The kernels below read the heights y of a tile, update its angles th
// in place and write the new heights to out. Each product is rounded
// before the sum, as in Matrix.Apply (no fused multiply-add). The Tested
// forms also set, in mask, the bit of every ray whose height lies outside
// [lo, hi]: before and after a space, before a surface.

func bulkSpace(y, th, out []float64, d float64) {
	th, out = th[:len(y)], out[:len(y)]
	for k, v := range y {
		out[k] = v + float64(d*th[k])
	}
}

func bulkSpaceTested(y, th, out []float64, d, lo, hi float64, mask *[bulkTile / 64]uint64) {
	for c := 0; c < len(y); c += 64 {
		yc := y[c:min(c+64, len(y))]
		tc, oc := th[c:][:len(yc)], out[c:][:len(yc)]
		var w uint64 // the word's bits, in a register: no store-load chain
		for k, v := range yc {
			u := v + float64(d*tc[k])
			oc[k] = u
			w |= (outside(v, lo, hi) | outside(u, lo, hi)) << (uint(k) & 63)
		}
		mask[(c>>6)&(bulkTile/64-1)] |= w
	}
}

func bulkLens(y, th, out []float64, c, d float64) {
	th, out = th[:len(y)], out[:len(y)]
	copy(out, y)
	for k, v := range y {
		th[k] = float64(c*v) + float64(d*th[k])
	}
}

func bulkLensTested(y, th, out []float64, c, d, lo, hi float64, mask *[bulkTile / 64]uint64) {
	bulkLens(y, th, out, c, d)
	bulkTest(y, lo, hi, mask)
}

func bulkSurface(y, th, out []float64, mx Matrix) {
	th, out = th[:len(y)], out[:len(y)]
	a, b, c, d := mx.A, mx.B, mx.C, mx.D
	for k, v := range y {
		t := th[k]
		out[k], th[k] = float64(a*v)+float64(b*t), float64(c*v)+float64(d*t)
	}
}

func bulkSurfaceTested(y, th, out []float64, mx Matrix, lo, hi float64, mask *[bulkTile / 64]uint64) {
	bulkTest(y, lo, hi, mask)
	bulkSurface(y, th, out, mx)
}

// bulkTest sets the mask bits of the rays whose heights y lie outside
// [lo, hi].
func bulkTest(y []float64, lo, hi float64, mask *[bulkTile / 64]uint64) {
	for c := 0; c < len(y); c += 64 {
		var w uint64
		for k, v := range y[c:min(c+64, len(y))] {
			w |= outside(v, lo, hi) << (uint(k) & 63)
		}
		mask[(c>>6)&(bulkTile/64-1)] |= w
	}
}

// outside returns 1 if v lies outside [lo, hi] and 0 otherwise (also for
// NaN, as blocked does), without a branch.
func outside(v, lo, hi float64) uint64 { return b2u(v < lo) | b2u(v > hi) }

func b2u(b bool) uint64 {
	var u uint64
	if b {
		u = 1
	}
	return u
}
