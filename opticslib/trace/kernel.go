package trace

import "math"

// Op kinds of a traced program (one op per surface, then the image plane).
const (
	opRefract int64 = iota
	opReflect
	opStop
	opIdeal
	opImage
)

// op is one surface of a program resolved at one wavelength: what the
// kernels read. The layout is fixed (kernel_amd64.s reads it by offset):
// every field is 8 bytes.
type op struct {
	kind  int64   // opRefract … opImage
	conic int64   // 1 when k ≠ 0: the normal must be normalised
	dz    float64 // vertex z minus the previous vertex z, metres
	c     float64 // vertex curvature, 1/m
	k     float64 // conic constant
	k1    float64 // 1 + k
	a2    float64 // clear radius squared, m² (+Inf: unlimited)
	mu    float64 // n/n′ (refraction)
	n     float64 // absolute index before the surface (optical path)
	f     float64 // ideal-lens focal length, metres
	surf  int64   // surface index, for Rays.Stop
}

// stepGo traces rays [lo, hi) of r, those whose status is still OK,
// through the surface o. It is the portable kernel, and the definition the
// vector kernel reproduces bit for bit: every product is rounded before it
// is added (the float64 conversions forbid fused multiply–adds, which
// some architectures would use), and the operations are in the same
// order.
//
// The ray is in the frame of the previous vertex; it moves to the frame
// of this one (z − dz), travels t₀ = −z/N to the vertex's tangent plane
// (point x₀, y₀, 0), and from there t₁ to the conic
//
//	c(x² + y²) + c(1+k) z² − 2z = 0,
//
// the root t₁ = C/q of A t² + 2B t + C = 0 nearest the tangent plane, with
//
//	A = c(1 + k N²),  B = c(x₀L + y₀M) − N,  C = c(x₀² + y₀²),
//	q = −(B + sgn(B)√(B² − AC)),
//
// the form that stays accurate for c → 0 (a plane: t₁ = 0 exactly) and
// for grazing rays (Numerical Recipes' stable quadratic root; the conic
// intersection as in G. H. Spencer and M. V. R. K. Murty, "General
// ray-tracing procedure", J. Opt. Soc. Am. 52, 672–678 (1962)). The
// normal ∇ = (−cx, −cy, 1 − c(1+k)z) must point along +z (1 − c(1+k)z > 0)
// on the branch through the vertex, and the ray travels t = t₀ + t₁,
// which must not be negative. Refraction is Snell's law in vector form
// (Spencer & Murty):
//
//	d′ = μ d + (sgn(cos I)·√(1 − μ²(1 − cos² I)) − μ cos I) n̂,  μ = n/n′,
//
// and reflection d′ = d − 2 cos I n̂.
func stepGo(o *op, r *Rays, lo, hi int) {
	x, y, z := r.X[lo:hi], r.Y[lo:hi], r.Z[lo:hi]
	L, M, N := r.L[lo:hi], r.M[lo:hi], r.N[lo:hi]
	opl, st, stop := r.OPL[lo:hi], r.Status[lo:hi], r.Stop[lo:hi]
	n := len(x)
	if n == 0 {
		return
	}
	_, _, _, _, _, _, _, _ = y[n-1], z[n-1], L[n-1], M[n-1], N[n-1], opl[n-1], st[n-1], stop[n-1]
	c, k, k1, a2, mu, ni := o.c, o.k, o.k1, o.a2, o.mu, o.n
	for i := range n {
		if st[i] != OK {
			continue
		}
		xi, yi, zi := x[i], y[i], z[i]-o.dz
		li, mi, nn := L[i], M[i], N[i]
		// To the vertex's tangent plane, then to the conic from there.
		t0 := -zi / nn
		x0 := xi + float64(t0*li)
		y0 := yi + float64(t0*mi)
		b := float64(c*(float64(x0*li)+float64(y0*mi))) - nn
		cc := c * (float64(x0*x0) + float64(y0*y0))
		a := c * (1 + float64(float64(k*nn)*nn))
		d := float64(b*b) - float64(a*cc)
		q := -(b + math.Copysign(math.Sqrt(d), b))
		t1 := cc / q
		t := t0 + t1
		fail := OK
		switch {
		case !(d >= 0) || !(q != 0) || !finite(t0):
			fail = Missed
		case t < 0 && o.kind != opImage:
			fail = Backward
		}
		if fail != OK {
			st[i], stop[i] = fail, int32(o.surf)
			continue
		}
		xn := x0 + float64(t1*li)
		yn := y0 + float64(t1*mi)
		zn := float64(t1 * nn)
		if o.kind == opImage {
			x[i], y[i], z[i] = xn, yn, zn
			opl[i] += float64(ni * t)
			continue
		}
		g3 := 1 - float64(float64(c*k1)*zn)
		switch {
		case !(g3 > 0):
			fail = Missed
		case float64(xn*xn)+float64(yn*yn) > a2:
			fail = Blocked
		}
		if fail != OK {
			st[i], stop[i] = fail, int32(o.surf)
			continue
		}
		switch o.kind {
		case opRefract, opReflect:
			nx, ny, nz := -float64(c*xn), -float64(c*yn), g3
			if o.conic != 0 {
				inv := 1 / math.Sqrt(float64(float64(nx*nx)+float64(ny*ny))+float64(nz*nz))
				nx, ny, nz = nx*inv, ny*inv, nz*inv
			}
			cosI := float64(float64(li*nx)+float64(mi*ny)) + float64(nn*nz)
			var g float64
			if o.kind == opReflect {
				g = -2 * cosI
			} else {
				c2 := 1 - float64(float64(mu*mu)*float64(1-float64(cosI*cosI)))
				if !(c2 >= 0) {
					st[i], stop[i] = TotalReflection, int32(o.surf)
					continue
				}
				g = math.Copysign(math.Sqrt(c2), cosI) - float64(mu*cosI)
				li, mi, nn = float64(mu*li), float64(mu*mi), float64(mu*nn)
			}
			L[i] = li + float64(g*nx)
			M[i] = mi + float64(g*ny)
			N[i] = nn + float64(g*nz)
			opl[i] += float64(ni * t)
		case opStop:
			opl[i] += float64(ni * t)
		case opIdeal:
			// Ideal thin lens: direction tangents u′ = u − x/f, v′ = v − y/f,
			// and the path −n(√(r² + f²) − |f|)·sgn f that makes a collimated
			// axial beam meet at the focus in phase.
			f := o.f
			u := li/nn - xn/f
			v := mi/nn - yn/f
			inv := math.Copysign(1/math.Sqrt(1+float64(u*u)+float64(v*v)), nn)
			L[i], M[i], N[i] = u*inv, v*inv, inv
			r2 := float64(xn*xn) + float64(yn*yn)
			opl[i] += float64(ni*t) - math.Copysign(float64(ni*(math.Sqrt(r2+float64(f*f))-math.Abs(f))), f)
		}
		x[i], y[i], z[i] = xn, yn, zn
	}
}
