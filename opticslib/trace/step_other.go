package trace

// step traces rays [lo, hi) through one op. The vector kernel replaces it
// on amd64 (kernel_amd64.go); elsewhere it is the portable kernel.
func step(o *op, r *Rays, lo, hi int) { stepGo(o, r, lo, hi) }
