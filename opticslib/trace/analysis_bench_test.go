package trace_test

import (
	"strconv"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
)

// BenchmarkSpot measures a spot diagram of the plano-convex lens at 1°
// field for square pupil grids of n × n (about 0.785 n² rays).
func BenchmarkSpot(b *testing.B) {
	sys := planoConvex(b, true)
	src := trace.Source{Field: 0.0175, PupilRadius: 5 * mm}
	for _, n := range []int{21, 65, 201} {
		pupil := trace.PupilGrid(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := sys.Spot(lambda, src, pupil, sys.ImagePlane()); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkWavefront measures the wavefront error of the same beam.
func BenchmarkWavefront(b *testing.B) {
	sys := planoConvex(b, true)
	src := trace.Source{Field: 0.0175, PupilRadius: 5 * mm}
	for _, n := range []int{21, 65, 201} {
		pupil := trace.PupilGrid(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := sys.Wavefront(lambda, src, pupil, sys.ImagePlane()); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
