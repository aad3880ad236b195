// Command compare times the Go and the NumPy version of each speed case in
// one invocation and prints one line per case,
//
//	compare <case> go_ms=<x> numpy_ms=<y> ratio=<y/x>
//
// with the median of several runs each; ratio > 1 means Go is faster. Run
// it from the checkout with `make compare` (go run ./testdata/bench/compare).
//
// The cases are built here, seeded, and handed to testdata/bench/numpy_side.py
// as a JSON description plus the rays as raw little-endian float64 files,
// so that both sides do the same work on the same numbers; the script
// returns its timings and checksums of its results, and a case whose
// checksums disagree with Go's fails the run.
//
//   - apply: 10⁶ rays through the composed matrix of 10 elements,
//     heights and angles stored (NumPy: M @ rays, OpenBLAS with its
//     default threads; Go: TraceBulk of the one-matrix system, all cores).
//   - trace-1core, trace-2core: 10⁶ rays element by element through 10
//     elements with clear apertures, the height of every ray at every
//     element and its vignetting flag (NumPy: element-major array
//     operations; Go: TraceBulk with procs 1 and 2). NumPy runs on one
//     core in both; the two-core case is timed against the same NumPy run.
//   - caustic: an astigmatic beam through 20 elements at 10⁴ planes, w
//     and 1/R in x and y and the index per plane, on the grid that also
//     holds every surface and real waist, and the Gouy phase at the start
//     of every stretch (beam.Sample, which leaves the per-plane Gouy phase
//     to Caustic.GouyPhase; NumPy: the same closed forms per homogeneous
//     stretch, vectorised over planes).
//   - realtrace-1core, realtrace-2core: 10⁶ real rays (skew, seeded)
//     through an invented relay of ten spherical surfaces with clear
//     apertures, exact intersections and refraction (trace.System.Trace
//     with procs 1 and 2, the rays copied in from the start values each
//     run; NumPy: the same tangent-plane-then-sphere algorithm vectorised
//     over rays, surface by surface, one core). The checks compare the
//     sums of the image-plane coordinates, directions and optical paths of
//     the rays that arrive, and their count.
//
// It exits 0 with a message when the interpreter ($BEAMNOTE_PYTHON, else
// /usr/bin/python3) cannot import numpy.
package main

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"time"

	"github.com/beamnote/beamnote/opticslib/beam"
	"github.com/beamnote/beamnote/opticslib/paraxial"
	"github.com/beamnote/beamnote/opticslib/trace"
	"github.com/beamnote/beamnote/opticslib/units"
)

// runs is the number of timed runs per side and case (the median is
// printed); the first, untimed run warms caches and page tables.
const runs = 15

const nRays = 1_000_000

// element is an element as numpy_side.py reads it.
type element struct {
	Kind string     `json:"kind"` // "space" or "surface"
	Z    float64    `json:"z"`    // position in metres (the entrance of a space)
	D    float64    `json:"d,omitempty"`
	X    [4]float64 `json:"x"`
	Y    [4]float64 `json:"y"`
	Lim  []float64  `json:"lim,omitempty"` // [lo, hi] in the traced plane, if limited
	NOut float64    `json:"n_out"`
}

type input struct {
	Runs      int        `json:"runs"`
	RealRays  []string   `json:"real_files"` // x, y, z, L, M, N
	RealSurfs []realSurf `json:"real_surfaces"`
	YFile     string     `json:"y_file"`
	TFile     string     `json:"theta_file"`
	Apply     [4]float64 `json:"apply"`
	Trace     []element  `json:"trace"`
	Caustic   struct {
		Elements []element     `json:"elements"`
		Samples  int           `json:"samples"`
		Length   float64       `json:"length"`
		Q        [2][2]float64 `json:"q"` // x, y: Re q, Im q at z = 0
		Lambda0  float64       `json:"lambda0"`
		M2       [2]float64    `json:"m2"`
		IndexIn  float64       `json:"n_in"`
	} `json:"caustic"`
}

// realSurf is one op of the real-ray case as numpy_side.py reads it.
type realSurf struct {
	DZ    float64 `json:"dz"`
	C     float64 `json:"c"`
	A2    float64 `json:"a2"` // clear radius squared, -1 for unlimited
	Mu    float64 `json:"mu"`
	N     float64 `json:"n"`
	Image bool    `json:"image"`
}

// realSystem is the relay of the real-ray case: ten refracting spheres,
// invented, with clear apertures that block part of the rays.
func realSystem() trace.System {
	const mm = units.Millimeter
	g1, g2, air := trace.Index(1.5168), trace.Index(1.62), trace.Index(1)
	radii := []units.Length{60, -60, 40, -30, -120, -25, 80, 100, -45, -200}
	media := []trace.Medium{g1, air, g1, g2, air, g2, air, g1, air, g1}
	gaps := []units.Length{5, 30, 6, 2, 25, 3, 20, 5, 15, 4}
	var surfs []trace.Surface
	for i := range radii {
		surfs = append(surfs, trace.Surface{Kind: trace.Refract, Radius: radii[i] * mm, ClearRadius: 11 * mm, Medium: media[i], Thickness: gaps[i] * mm})
	}
	surfs[len(surfs)-1].Medium = air
	surfs[len(surfs)-1].Thickness = 40 * mm
	return must(trace.New(air, surfs...))
}

type output struct {
	Version string             `json:"numpy"`
	MS      map[string]float64 `json:"ms"`
	Sums    map[string]float64 `json:"sums"`
}

func main() {
	python := os.Getenv("BEAMNOTE_PYTHON")
	if python == "" {
		python = "/usr/bin/python3"
	}
	if out, err := exec.Command(python, "-c", "import numpy").CombinedOutput(); err != nil {
		fmt.Printf("compare: skipped: %s cannot import numpy (install Debian's python3-numpy, or set BEAMNOTE_PYTHON): %v %s\n", python, err, bytes.TrimSpace(out))
		return
	}
	if err := run(python); err != nil {
		fmt.Fprintln(os.Stderr, "compare:", err)
		os.Exit(1)
	}
}

func must[T any](v T, err error) T {
	if err != nil {
		panic(err)
	}
	return v
}

// median returns the median time of runs calls of f, in milliseconds,
// after one untimed call.
func median(f func()) float64 {
	f()
	ts := make([]float64, runs)
	for i := range ts {
		t0 := time.Now()
		f()
		ts[i] = float64(time.Since(t0).Nanoseconds()) / 1e6
	}
	slices.Sort(ts)
	return ts[runs/2]
}

// traceSystem is the 10-element system of the trace cases: seeded
// spaces, thin lenses and interfaces, the lenses with clear apertures that
// vignette part of the rays.
func traceSystem() paraxial.System {
	rng := rand.New(rand.NewPCG(4, 4))
	b := paraxial.NewBuilder()
	for i := range 10 {
		switch {
		case i%2 == 0:
			b.Space(units.Length(0.01 + 0.19*rng.Float64()))
		case i%4 == 1:
			b.ThinLens(units.Length(0.05 + 0.25*rng.Float64())).Aperture(paraxial.ClearRadius(units.Length(0.6e-3 + 0.6e-3*rng.Float64())))
		default:
			b.Interface(units.Length(0.02+0.2*rng.Float64()), 1+0.5*rng.Float64()).Aperture(paraxial.ClearRadius(units.Length(0.8e-3 + 0.6e-3*rng.Float64())))
		}
	}
	return must(b.Build())
}

// describe lists the elements of s for the script, with the walk's piece
// lengths for spaces and the aperture limits in plane p, found (as the
// trace defines them) from where Trace starts flagging a ray.
func describe(s paraxial.System, p paraxial.Plane) []element {
	var out []element
	for pc := range s.Walk(0, s.Length()) {
		e := s.Element(pc.Element)
		el := element{Kind: "surface", X: [4]float64{pc.X.A, pc.X.B, pc.X.C, pc.X.D}, Y: [4]float64{pc.Y.A, pc.Y.B, pc.Y.C, pc.Y.D}, NOut: pc.IndexOut, Z: float64(pc.From)}
		if pc.Kind == paraxial.KindSpace {
			el.Kind, el.D = "space", float64(pc.To-pc.From)
		}
		if lo, hi, ok := e.Aperture.Limits(p, e.Tilt); ok {
			// The trace's tie margin (a relative 1e-9 of the size).
			m := float64(e.Aperture.Radius) * 1e-9
			el.Lim = []float64{lo - m, hi + m}
		}
		out = append(out, el)
	}
	return out
}

func writeFloats(path string, v []float64) error {
	buf := make([]byte, 8*len(v))
	for i, x := range v {
		binary.LittleEndian.PutUint64(buf[8*i:], math.Float64bits(x))
	}
	return os.WriteFile(path, buf, 0o600)
}

func run(python string) error {
	dir, err := os.MkdirTemp("", "beamnote-compare")
	if err != nil {
		return err
	}
	defer os.RemoveAll(dir)

	// Rays, seeded: heights within ±1 mm, angles within ±10 mrad.
	rng := rand.New(rand.NewPCG(1, 1))
	ys, thetas := make([]float64, nRays), make([]float64, nRays)
	for k := range nRays {
		ys[k], thetas[k] = 1e-3*(2*rng.Float64()-1), 1e-2*(2*rng.Float64()-1)
	}
	var in input
	in.Runs = runs
	in.YFile, in.TFile = filepath.Join(dir, "y.f64"), filepath.Join(dir, "theta.f64")
	if err := writeFloats(in.YFile, ys); err != nil {
		return err
	}
	if err := writeFloats(in.TFile, thetas); err != nil {
		return err
	}

	sys := traceSystem()
	// apply: the composed matrix of 5 spaces and 5 thin lenses (det 1, as
	// Builder.Matrix requires), as a one-element system.
	arng := rand.New(rand.NewPCG(2, 2))
	ab := paraxial.NewBuilder()
	for range 5 {
		ab.Space(units.Length(0.01 + 0.19*arng.Float64())).ThinLens(units.Length(0.05 + 0.25*arng.Float64()))
	}
	m := must(ab.Build()).Matrix(paraxial.Tangential)
	in.Apply = [4]float64{m.A, m.B, m.C, m.D}
	one := must(paraxial.NewBuilder().Matrix(m, m).Build())
	in.Trace = describe(sys, paraxial.Tangential)

	// Caustic: 10 spaces and 10 lenses, two of them cylindrical, and an
	// elliptical beam, so that x and y differ and both are computed.
	crng := rand.New(rand.NewPCG(1, 1))
	cb := paraxial.NewBuilder()
	for i := range 10 {
		cb.Space(units.Length(0.05 + 0.1*crng.Float64()))
		f := units.Length(0.05 + 0.2*crng.Float64())
		if i%5 == 2 {
			cb.CylindricalLens(f, paraxial.Plane(i%2))
		} else {
			cb.ThinLens(f)
		}
	}
	csys := must(cb.Build())
	const lambda0 = 1064 * units.Nanometer
	cin := must(beam.FromWaists(beam.WaistSpec{WaistRadius: 0.5 * units.Millimeter, Wavelength: lambda0},
		beam.WaistSpec{WaistRadius: 0.3 * units.Millimeter, WaistZ: 20 * units.Millimeter, Wavelength: lambda0, M2: 1.3}))
	const samples = 10_000
	cs := &in.Caustic
	cs.Elements, cs.Samples, cs.Length = describe(csys, paraxial.Tangential), samples, float64(csys.Length())
	cs.Q = [2][2]float64{{real(cin.X.Q), imag(cin.X.Q)}, {real(cin.Y.Q), imag(cin.Y.Q)}}
	cs.Lambda0, cs.M2, cs.IndexIn = float64(lambda0), [2]float64{cin.X.BeamQuality(), cin.Y.BeamQuality()}, csys.IndexIn()

	// The Go side.
	goMS := map[string]float64{}
	goSums := map[string]float64{}
	h1, a1 := make([]float64, nRays), make([]float64, nRays)
	goMS["apply"] = median(func() { must(0, one.TraceBulk(paraxial.Tangential, ys, thetas, h1, a1, nil, 0)) })
	goSums["apply"] = sum(h1) + sum(a1)
	heights, mask := make([]float64, sys.Len()*nRays), paraxial.NewRayMask(nRays)
	for _, c := range []struct {
		name  string
		procs int
	}{{"trace-1core", 1}, {"trace-2core", 2}} {
		goMS[c.name] = median(func() { must(0, sys.TraceBulk(paraxial.Tangential, ys, thetas, heights, nil, mask, c.procs)) })
	}
	goSums["trace"], goSums["trace_blocked"] = sum(heights), float64(mask.Count())
	var caustic beam.Caustic
	goMS["caustic"] = median(func() { caustic = must(beam.Sample(csys, cin, samples)) })
	goSums["caustic_n"] = float64(len(caustic.Z))
	goSums["caustic"] = sumL(caustic.W) + sumL(caustic.WY) + sum(caustic.Curvature) + sum(caustic.CurvatureY) +
		sum(caustic.Index)

	// Real rays: 10⁶ skew rays within ±8 mm and ±0.02 rad, from z = −2 mm.
	rsys := realSystem()
	rrng := rand.New(rand.NewPCG(7, 7))
	start := trace.NewRays(nRays)
	for k := range nRays {
		start.Set(k, trace.RayFromAngles(8e-3*(2*rrng.Float64()-1), 8e-3*(2*rrng.Float64()-1), -2e-3, 0.02*(2*rrng.Float64()-1), 0.02*(2*rrng.Float64()-1)))
	}
	for i, v := range [][]float64{start.X, start.Y, start.Z, start.L, start.M, start.N} {
		f := filepath.Join(dir, "real"+strconv.Itoa(i)+".f64")
		if err := writeFloats(f, v); err != nil {
			return err
		}
		in.RealRays = append(in.RealRays, f)
	}
	prev := 0.0
	for i := range rsys.Len() + 1 {
		sf := realSurf{DZ: float64(rsys.Vertex(i)) - prev, A2: -1, Mu: 1, Image: i == rsys.Len()}
		prev = float64(rsys.Vertex(i))
		nb := must(rsys.MediumAfter(i - 1).Index(633e-9))
		sf.N = nb
		if i < rsys.Len() {
			f := rsys.Surface(i)
			sf.C = f.Curvature()
			sf.A2 = float64(f.ClearRadius) * float64(f.ClearRadius)
			sf.Mu = nb / must(rsys.MediumAfter(i).Index(633e-9))
		}
		in.RealSurfs = append(in.RealSurfs, sf)
	}
	rays := trace.NewRays(nRays)
	for _, c := range []struct {
		name  string
		procs int
	}{{"realtrace-1core", 1}, {"realtrace-2core", 2}} {
		goMS[c.name] = median(func() {
			copy(rays.X, start.X)
			copy(rays.Y, start.Y)
			copy(rays.Z, start.Z)
			copy(rays.L, start.L)
			copy(rays.M, start.M)
			copy(rays.N, start.N)
			clear(rays.OPL)
			must(0, rsys.Trace(633e-9, rays, c.procs))
		})
	}
	var rsum, rcount float64
	for k := range nRays {
		if rays.Status[k] == trace.OK {
			rsum += rays.X[k] + rays.Y[k] + rays.L[k] + rays.M[k] + rays.N[k] + rays.OPL[k]
			rcount++
		}
	}
	goSums["realtrace"], goSums["realtrace_n"] = rsum, rcount

	// The NumPy side, in the same invocation.
	inPath, outPath := filepath.Join(dir, "in.json"), filepath.Join(dir, "out.json")
	data, err := json.Marshal(in)
	if err != nil {
		return err
	}
	if err := os.WriteFile(inPath, data, 0o600); err != nil {
		return err
	}
	cmd := exec.Command(python, filepath.Join("testdata", "bench", "numpy_side.py"), inPath, outPath)
	cmd.Stderr = os.Stderr
	if err := cmd.Run(); err != nil {
		return fmt.Errorf("numpy_side.py: %v", err)
	}
	var out output
	if data, err = os.ReadFile(outPath); err != nil {
		return err
	}
	if err := json.Unmarshal(data, &out); err != nil {
		return err
	}

	// Same work: the results must agree (sums of ~10⁷ values of either
	// sign in float64 differ by summation order only, ≲ 1e-9 relative to
	// the sum of magnitudes; counts and grid sizes exactly).
	for _, k := range []string{"apply", "trace", "trace_blocked", "caustic_n", "caustic", "realtrace", "realtrace_n"} {
		g, p := goSums[k], out.Sums[k]
		if math.Abs(g-p) > 1e-9*math.Max(1, math.Abs(g)) {
			return fmt.Errorf("check %s: Go %.15g, NumPy %.15g: the two sides do not do the same work", k, g, p)
		}
	}
	for _, c := range []struct{ name, numpy string }{
		{"apply", "apply"}, {"trace-1core", "trace"}, {"trace-2core", "trace"}, {"caustic", "caustic"},
		{"realtrace-1core", "realtrace"}, {"realtrace-2core", "realtrace"},
	} {
		g, p := goMS[c.name], out.MS[c.numpy]
		fmt.Printf("compare %s go_ms=%.3f numpy_ms=%.3f ratio=%.2f\n", c.name, g, p, p/g)
	}
	return nil
}

func sum(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x
	}
	return s
}

func sumL(v []units.Length) float64 {
	var s float64
	for _, x := range v {
		s += float64(x)
	}
	return s
}
