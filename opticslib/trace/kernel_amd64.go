//go:build amd64 && !purego

package trace

import "golang.org/x/sys/cpu"

// useVector reports whether the trace runs the AVX2 kernel
// (kernel_amd64.s) for refracting and reflecting surfaces, stops and the
// image plane: the processor and the operating system support AVX2.
// Tests clear it to check the kernel against the portable one.
var useVector = cpu.X86.HasAVX2

// step traces rays [lo, hi) through one op: whole groups of four rays
// with the AVX2 kernel, the remaining rays and ideal lenses with stepGo.
// The two give the same bits (see stepAVX2).
func step(o *op, r *Rays, lo, hi int) {
	if !useVector || o.kind == opIdeal {
		stepGo(o, r, lo, hi)
		return
	}
	n4 := (hi - lo) &^ 3
	if n4 > 0 {
		stepAVX2(o, &r.X[lo], &r.Y[lo], &r.Z[lo], &r.L[lo], &r.M[lo], &r.N[lo], &r.OPL[lo], &r.Status[lo], &r.Stop[lo], n4)
	}
	stepGo(o, r, lo+n4, hi)
}

// stepAVX2 traces count rays (a multiple of 4), four at a time, through
// the op o (not opIdeal): x … opl are the first ray's coordinates, st and
// stop its status and stop surface. It is stepGo's loop in packed
// arithmetic: the same operations in the same order, each rounded
// (VMULPD, VADDPD, VSUBPD, VDIVPD, VSQRTPD, no fused multiply–add), the
// sign operations as and/or/xor of the sign bit, and the comparisons with
// the same treatment of NaN. A ray whose status is not OK is not touched;
// a ray that fails gets its status and stop surface and keeps its old
// coordinates (a blend), so it gives stepGo's results bit for bit.
//
//go:noescape
func stepAVX2(o *op, x, y, z, l, m, n, opl *float64, st *Status, stop *int32, count int)
