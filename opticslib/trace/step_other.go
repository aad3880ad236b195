//go:build !amd64 || purego

package trace

// useVector is false: there is no vector kernel for this platform (or the
// purego build tag asks for none), and the trace runs the portable kernel.
var useVector = false

// step traces rays [lo, hi) through one op with the portable kernel.
func step(o *op, r *Rays, lo, hi int) { stepGo(o, r, lo, hi) }
