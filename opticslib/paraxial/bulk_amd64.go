//go:build amd64 && !purego

package paraxial

import (
	"unsafe"

	"golang.org/x/sys/cpu"
)

// useBulkVector reports whether [System.TraceBulk] runs the AVX2 kernel
// (bulk_amd64.s): the processor and the operating system support AVX2.
// Tests clear it to check the kernel against the portable one.
var useBulkVector = cpu.X86.HasAVX2

// bulkStreamBytes is the output size above which the vector kernel writes
// with non-temporal stores. They bypass the caches and save the read for
// ownership of every line written; below it the rows fit in a core's
// second-level cache (2 MB on the development machine), where the caller
// will read them back, and ordinary stores are better.
// BenchmarkTraceBulkStores compares the two (numbers in DEVELOPERS.md).
const bulkStreamBytes = 8 << 20

// stream reports whether the vector kernel should write heights and
// angles (nil: not wanted), the rows of n rays, with non-temporal stores:
// together they are larger than bulkStreamBytes, and every row starts on
// a 32-byte boundary (the buffers do, as Go's large allocations do, and n
// is a multiple of 4).
func stream(heights, angles []float64, n int) bool {
	aligned := func(buf []float64) bool {
		return buf == nil || uintptr(unsafe.Pointer(unsafe.SliceData(buf)))%32 == 0
	}
	return 8*(len(heights)+len(angles)) > bulkStreamBytes && n%4 == 0 && aligned(heights) && aligned(angles)
}

// vector traces rays [lo, hi) (hi − lo a multiple of 64, lo of bulkTile)
// with the AVX2 kernel and reports whether a ray was not finite at the
// output plane.
func (j *bulkArgs) vector(lo, hi int) bool {
	if hi <= lo {
		return false
	}
	var angles *float64
	if j.angles != nil {
		angles = &j.angles[lo]
	}
	var mask *byte
	if j.blocked != nil {
		// Little-endian words: byte b of the mask holds rays 8b … 8b+7.
		mask = (*byte)(unsafe.Pointer(&j.blocked[lo>>6]))
	}
	return bulkTraceAVX2(&j.ops[0], &j.ys[lo], &j.thetas[lo], &j.heights[lo], angles, 8*uintptr(j.n), mask, hi-lo, j.stream)
}

// bulkTraceAVX2 traces count rays (a multiple of 8), eight at a time held
// in registers, through the row program ops (ending with opEnd): ys and
// ts are their heights and angles, heights and angles (nil: not wanted)
// the first ray's place in row 0, stride the bytes from a row to the
// next, and mask (nil: not wanted) the byte of the first ray's mask bits,
// one byte per eight rays, overwritten. Each product is rounded before
// the sum, as in the portable kernels, so the results are the same bits.
// nt chooses non-temporal stores (rows 32-byte aligned). It reports
// whether a ray was not finite at the output plane.
//
//go:noescape
func bulkTraceAVX2(ops *bulkOp, ys, ts, heights, angles *float64, stride uintptr, mask *byte, count int, nt bool) (bad bool)
