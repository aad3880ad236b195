//go:build !amd64 || purego

package paraxial

// useBulkVector is false: there is no vector kernel for this platform (or
// the purego build tag asks for none), and [System.TraceBulk] runs the
// portable kernels.
var useBulkVector = false

func stream(heights, angles []float64, n int) bool { return false }

func (j *bulkArgs) vector(lo, hi int) bool { panic("paraxial: no vector kernel") }
