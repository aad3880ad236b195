package trace_test

import (
	"math"
	"testing"

	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// FuzzTrace builds a system from arbitrary surface numbers and traces
// arbitrary rays: New either refuses the surfaces with an error or the
// trace gives every ray a status with finite coordinates; nothing panics.
func FuzzTrace(f *testing.F) {
	f.Add(0.05, 0.0, 1.5, 0.01, 0.0, 0.002, 0.0, 0.0, uint8(0))
	f.Add(-0.02, -1.0, 1.0, 0.05, 0.01, 0.009, 0.1, -0.05, uint8(1))
	f.Add(0.001, 3.0, 2.2, 0.001, 0.0, 0.02, 0.5, 0.2, uint8(0))
	f.Add(0.0, 0.0, 1.0, 0.01, 0.0, 0.0, 0.0, 0.0, uint8(2))
	f.Fuzz(func(t *testing.T, r, k, n, thick, clear, y, tx, ty float64, kind uint8) {
		surf := trace.Surface{Kind: trace.Kind(kind % 4), Radius: units.Length(r), Conic: k, ClearRadius: units.Length(clear),
			Medium: trace.Index(n), Thickness: units.Length(thick)}
		if surf.Kind == trace.Reflect {
			surf.Thickness = -surf.Thickness
		}
		if surf.Kind == trace.Ideal {
			surf.Focal, surf.Radius, surf.Conic = units.Length(r), 0, 0
		}
		if surf.Kind == trace.Stop {
			surf.Radius, surf.Conic = 0, 0
		}
		s, err := trace.New(trace.Index(1), surf, trace.Surface{Kind: trace.Refract, Radius: units.Length(-r), Medium: trace.Index(1), Thickness: surf.Thickness})
		if err != nil {
			return
		}
		rays := trace.NewRays(3)
		for i := range 3 {
			rays.Set(i, trace.RayFromAngles(0, y*float64(i), -0.1, tx, ty))
		}
		if err := s.Trace(633*units.Nanometer, rays, 1); err != nil {
			return
		}
		for i := range 3 {
			if rays.Status[i] == trace.Invalid {
				continue
			}
			for _, v := range []float64{rays.X[i], rays.Y[i], rays.Z[i], rays.L[i], rays.M[i], rays.N[i], rays.OPL[i]} {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("ray %d (%v): coordinate %v", i, rays.Status[i], v)
				}
			}
		}
	})
}
