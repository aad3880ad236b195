package optplot_test

import (
	"fmt"

	"github.com/beamnote/beamnote/opticslib/optplot"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// A plano-convex lens (n = 1.5168, R = 25 mm, 4 mm thick), curved side to
// a collimated 8 mm beam: its ray-aberration curves on axis at the
// paraxial focus, and a side view with seven rays.
func ExampleRayAberration() {
	const mm = units.Millimeter
	sys, err := trace.New(trace.Index(1),
		trace.Surface{Kind: trace.Refract, Radius: 25 * mm, ClearRadius: 6 * mm, Medium: trace.Index(1.5168), Thickness: 4 * mm},
		trace.Surface{Kind: trace.Refract, Medium: trace.Index(1), Thickness: 45.7 * mm})
	if err != nil {
		fmt.Println(err)
		return
	}
	lambda := 633 * units.Nanometer
	src := trace.Source{PupilRadius: 4 * mm}
	tan, sag, err := sys.RayFans(lambda, src, 21, sys.Vertex(sys.Len()))
	if err != nil {
		fmt.Println(err)
		return
	}
	fig, err := optplot.RayAberration([]trace.Fan{tan, sag}, optplot.Names("curved side first"))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(fig.Caption)

	var paths [][]trace.Ray
	for k := -3; k <= 3; k++ {
		path, _, _, err := sys.Path(lambda, trace.RayFromAngles(0, float64(k)*1.2e-3, -5e-3, 0, 0))
		if err != nil {
			fmt.Println(err)
			return
		}
		paths = append(paths, path)
	}
	side, err := optplot.RealRayLayout(sys, lambda, []optplot.RayPaths{{Label: "on axis", Paths: paths}})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(side.Caption)
	// Output:
	// Transverse ray aberration; curved side first, tangential (633 nm at z = 49.7 mm): largest 27 µm; curved side first, sagittal (633 nm at z = 49.7 mm): largest 27 µm (largest ray error 27 µm).
	// Real rays: 2 surfaces from z = 0 mm, image plane at z = 49.7 mm, 7 rays; on axis: 7.
}
