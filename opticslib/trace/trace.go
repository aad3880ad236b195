package trace

import (
	"math"
	"runtime"
	"sync"

	"github.com/beamnote/beamnote/opticslib/units"
)

// tile is the number of rays a worker carries through every surface before
// it takes the next ones: 256 rays × 7 coordinates × 8 bytes = 14 KiB
// stay in the first-level cache across the surfaces.
const tile = 256

// program resolves s at one vacuum wavelength: one op per surface, then
// the image plane.
func (s System) program(vacuum units.Length) ([]op, error) {
	idx, err := s.Indices(vacuum)
	if err != nil {
		return nil, err
	}
	ops := make([]op, 0, len(s.surfs)+1)
	prev := 0.0
	for i, f := range s.surfs {
		o := op{
			dz:   s.vertex[i] - prev,
			c:    f.Curvature(),
			k:    f.Conic,
			k1:   1 + f.Conic,
			a2:   math.Inf(1),
			mu:   idx[i] / idx[i+1],
			n:    idx[i],
			f:    float64(f.Focal),
			surf: int64(i),
		}
		prev = s.vertex[i]
		if f.Conic != 0 {
			o.conic = 1
		}
		if f.ClearRadius > 0 {
			o.a2 = float64(f.ClearRadius) * float64(f.ClearRadius)
		}
		switch f.Kind {
		case Refract:
			o.kind = opRefract
		case Reflect:
			o.kind = opReflect
		case Stop:
			o.kind = opStop
		case Ideal:
			o.kind = opIdeal
		}
		ops = append(ops, o)
	}
	ops = append(ops, op{kind: opImage, dz: s.vertex[len(s.surfs)] - prev, k1: 1, a2: math.Inf(1), mu: 1,
		n: idx[len(s.surfs)], surf: int64(len(s.surfs))})
	return ops, nil
}

// Trace traces every ray of r through s at the vacuum wavelength, in place,
// on up to procs goroutines (procs ≤ 0: one per core, runtime.GOMAXPROCS).
//
// The rays start where r says, in the fixed frame, before the first
// surface (a ray that starts past it ends Backward). On return each ray
// that reached the image plane has status OK, its point on the image
// plane, its direction in image space and its optical path length added
// to the OPL it started with; every other ray has the status saying why it
// stopped, the index of that surface in Stop, and the position, direction
// and optical path it had on the last surface it passed. No coordinate is
// ever NaN for a ray that started finite.
//
// The result does not depend on procs, nor on whether the vector kernel
// runs: the kernels agree bit for bit. Trace allocates only per call (the
// program and the workers), never per ray.
//
// The error is a [*ParamError] for a wavelength at which a medium has no
// index (the rays are not touched) or [ErrNotBuilt]. It panics if the
// slices of r differ in length.
func (s System) Trace(vacuum units.Length, r *Rays, procs int) error {
	r.check()
	ops, err := s.program(vacuum)
	if err != nil {
		return err
	}
	n := r.Len()
	if procs <= 0 {
		procs = runtime.GOMAXPROCS(0)
	}
	tiles := (n + tile - 1) / tile
	if procs > tiles {
		procs = tiles
	}
	if procs <= 1 {
		s.run(ops, r, 0, n)
		return nil
	}
	// The first share runs on the calling goroutine, the others on their
	// own.
	var wg sync.WaitGroup
	per := (tiles + procs - 1) / procs
	for w := 1; w < procs; w++ {
		lo, hi := w*per*tile, min((w+1)*per*tile, n)
		if lo >= hi {
			break
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			s.run(ops, r, lo, hi)
		}()
	}
	s.run(ops, r, 0, min(per*tile, n))
	wg.Wait()
	return nil
}

// run traces rays [lo, hi) tile by tile.
func (s System) run(ops []op, r *Rays, lo, hi int) {
	for t0 := lo; t0 < hi; t0 += tile {
		t1 := min(t0+tile, hi)
		start(r, t0, t1)
		for i := range ops {
			step(&ops[i], r, t0, t1)
		}
		s.finish(r, t0, t1)
	}
}

// start sets the status of rays [lo, hi): Invalid when a coordinate is not
// finite or the direction is not a unit vector, OK otherwise.
func start(r *Rays, lo, hi int) {
	for i := lo; i < hi; i++ {
		d2 := float64(float64(r.L[i]*r.L[i])+float64(r.M[i]*r.M[i])) + float64(r.N[i]*r.N[i])
		sum := r.X[i] + r.Y[i] + r.Z[i] + r.OPL[i]
		r.Stop[i] = -1
		if !(math.Abs(d2-1) <= 1e-12) || !finite(sum) {
			r.Status[i], r.Stop[i] = Invalid, 0
			continue
		}
		r.Status[i] = OK
	}
}

// finish returns rays [lo, hi) to the fixed frame: each ray's z is held
// relative to the vertex before the surface where it stopped (the image
// plane for rays that reached it).
func (s System) finish(r *Rays, lo, hi int) {
	last := s.vertex[len(s.surfs)]
	for i := lo; i < hi; i++ {
		switch {
		case r.Status[i] == OK:
			r.Z[i] += last
		case r.Status[i] == Invalid:
		case r.Stop[i] > 0:
			r.Z[i] += s.vertex[r.Stop[i]-1]
		}
	}
}

// TraceRay traces one ray through s at the vacuum wavelength with the
// batch kernel and returns it at the image plane, or where it stopped,
// with its status and the index of the surface where it stopped (−1 when
// it reached the image plane).
func (s System) TraceRay(vacuum units.Length, ray Ray) (Ray, Status, int, error) {
	r := NewRays(1)
	r.Set(0, ray)
	if err := s.Trace(vacuum, r, 1); err != nil {
		return Ray{}, Invalid, 0, err
	}
	return r.Ray(0), r.Status[0], int(r.Stop[0]), nil
}

// Path traces one ray through s at the vacuum wavelength and returns its
// point on each surface it reached, in the fixed frame: the start, then
// one ray per surface passed (position on the surface, direction and
// optical path after it), then the image-plane ray if it got there; with
// its status and stop surface as [System.TraceRay] gives them. It runs the
// same kernel as [System.Trace], one surface at a time; layouts draw it.
func (s System) Path(vacuum units.Length, ray Ray) ([]Ray, Status, int, error) {
	ops, err := s.program(vacuum)
	if err != nil {
		return nil, Invalid, 0, err
	}
	r := NewRays(1)
	r.Set(0, ray)
	start(r, 0, 1)
	out := []Ray{ray}
	if r.Status[0] != OK {
		return out, r.Status[0], int(r.Stop[0]), nil
	}
	for i := range ops {
		stepGo(&ops[i], r, 0, 1)
		if r.Status[0] != OK {
			return out, r.Status[0], int(r.Stop[0]), nil
		}
		p := r.Ray(0)
		if i < len(s.surfs) {
			p.Position.Z += s.vertex[i]
		} else {
			p.Position.Z += s.vertex[len(s.surfs)]
		}
		out = append(out, p)
	}
	return out, OK, -1, nil
}
