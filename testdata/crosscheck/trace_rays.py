#!/usr/bin/python3
"""Independent reference for trace.System.Trace: the exact trace of skew
rays through coaxial conics, planes, mirrors and stops, vectorised NumPy.

Usage: /usr/bin/python3 trace_rays.py in.json out.json

in.json:
  {"cases": [{"n_object": n,
              "surfaces": [{"kind": "refract" | "reflect" | "stop",
                            "radius": R, "conic": k, "clear_radius": a,
                            "n": n_after, "thickness": d}, ...],
              "rays": {"x": [...], "y": [...], "z": [...],
                       "L": [...], "M": [...], "N": [...], "opl": [...]}}]}
  Metres throughout, in one fixed frame: z is the axis, vertex 0 lies at
  z = 0 and vertex i+1 lies the signed thickness d after vertex i (the
  last surface's thickness places the flat image plane). R is the signed
  vertex radius (0: flat; positive when the centre of curvature lies at
  larger z), k the conic constant, a the clear radius (0: unlimited), n
  the absolute index after a refracting surface (ignored for the others,
  which keep the medium). (L, M, N) are direction cosines, opl the optical
  path the ray starts with.
out.json:
  {"reference": "...",
   "cases": [{"status": ["ok" | "missed" | "tir" | "blocked" | "backward"
                         | "invalid", ...],
              "stop": [surface index where the ray stopped, -1 for "ok"],
              "x": [...], "y": [...], "z": [...], "L": [...], "M": [...],
              "N": [...], "opl": [...],
              "margin": {"aperture": [...], "behind": [...],
                         "discriminant": [...], "root": [...],
                         "branch": [...], "refraction": [...]}}]}
  A ray that reaches the image plane has its point there, its direction
  and its optical path; a ray that stops keeps the point, direction and
  optical path it had on the last surface it passed (the start values
  when it stops at surface 0). The margins (smallest over the surfaces
  the ray met, 1e300 where a test never applied to it) say how far each
  ray was from changing status; see MARGINS below.

Method, per surface, for all rays at once (the rays that have stopped are
masked out):

1. The surface. The conic of revolution with vertex curvature c = 1/R and
   conic constant k, vertex at z_v,

       z = c r^2 / (1 + sqrt(1 - (1+k) c^2 r^2)),   r^2 = x^2 + y^2,

   (W. J. Smith, Modern Optical Engineering, 4th ed., McGraw-Hill 2008,
   the aspheric-surface sag formula [from memory]). Multiplying through
   by 1 - sqrt(...) gives the implicit form, in the surface's frame
   (Z = z - z_v),

       F(x, y, Z) = c (x^2 + y^2 + (1+k) Z^2) - 2 Z = 0,

   and, from z (1+k) c = 1 - sqrt(...), the branch through the vertex is
   the one where g = 1 - (1+k) c Z = +sqrt(1 - (1+k) c^2 r^2) >= 0.

2. The intersection. The ray P + t s (P its point in the surface's frame,
   s its unit direction, t the geometric distance) meets F = 0 where

       a t^2 + 2 b t + e = 0,
       a = c (L^2 + M^2 + (1+k) N^2),
       b = c (x L + y M + (1+k) Z N) - N,
       e = c (x^2 + y^2 + (1+k) Z^2) - 2 Z = F(P),

   solved here directly from the ray's point (not from the vertex's
   tangent plane, as Spencer & Murty and the Go kernel do), both roots by
   the cancellation-free pair q = -(b + sgn(b) sqrt(b^2 - a e)),
   t = q / a and t = e / q (W. H. Press et al., Numerical Recipes, 3rd
   ed., Cambridge 2007, sect. 5.6 [from memory]); a = 0 (a plane, or an
   axial ray on a paraboloid) leaves the single finite root e / q. Of the
   two, the one that lies nearer the point t0 = -Z / N where the ray
   crosses the vertex's tangent plane is the intersection: the root
   continuous with the plane's as c -> 0, the one that Spencer & Murty's
   transfer to the tangent plane followed by their closed-form root for
   the conic picks (G. H. Spencer and M. V. R. K. Murty, "General
   ray-tracing procedure", J. Opt. Soc. Am. 52, 672-678 (1962), the
   intersection step [from memory]), and the convention of
   opticslib/trace (kernel.go). No real root (b^2 < a e) or N = 0 is a
   miss.

3. The checks, in the order of opticslib/trace's convention (rays.go,
   kernel.go): no real intersection -> "missed"; t < 0 (the surface lies
   behind the ray) -> "backward"; g <= 0 (the intersection lies on the
   conic's far branch, beyond a sphere's equator) -> "missed"; x^2 + y^2
   above the clear radius squared -> "blocked"; then for a refracting
   surface total internal reflection -> "tir".

4. The normal, from the sag's slope dz/dr = c r / sqrt(1 - (1+k) c^2 r^2)
   (differentiating the formula of step 1):

       N^ = (-c x, -c y, w) / sqrt(c^2 r^2 + w^2),  w = sqrt(1 - (1+k) c^2 r^2),

   which points along +z on the vertex branch.

5. Refraction, Snell's law in vector form (Spencer & Murty 1962, their
   refraction step; M. Born & E. Wolf, Principles of Optics, 7th ed.,
   Cambridge 1999, sect. 3.2 [from memory]):

       n' s' = n s + (n' cos(theta') - n cos(theta)) N^,
       cos(theta) = s . N^,
       n' cos(theta') = sgn(cos theta) sqrt(n'^2 - n^2 (1 - cos^2 theta)),

   total internal reflection where n'^2 - n^2 (1 - cos^2 theta) < 0.
   Reflection: s' = s - 2 (s . N^) N^. A stop passes the direction
   unchanged.

6. The optical path: n times the geometric length |P_new - P| of each
   segment (signed by t, which can be negative only for the image plane,
   a virtual image before the last surface), summed onto the ray's start
   value. The image plane is the plane z = z_image, reached at
   t = (z_image - z) / N, with no checks but N != 0.

A starting ray that is not finite or whose |s|^2 is off 1 by more than
1e-12 is "invalid" at surface 0 (opticslib/trace's rays.go).

MARGINS (for the Go test, which leaves out rays that rounding could put
either side of a decision): "aperture" | sqrt(x^2 + y^2) - a | in metres
where an aperture was tested; "behind" | t | in metres; "discriminant"
| b^2 - a e | / (b^2 + | a e |), zero at a tangent ray; "root"
| |t1 - t0| - |t2 - t0| | / (|t1 - t0| + |t2 - t0|), zero where the two
roots are equally near the tangent plane; "branch" | g |; "refraction"
| n'^2 - n^2 (1 - cos^2 theta) | / n'^2, zero at the critical angle.
"""
import json
import sys

import numpy as np

BIG = 1e300  # margin of a test that never applied to the ray


def trace(case):
    r = case["rays"]
    x, y, z, L, M, N, opl = (np.array(r[k], dtype=float) for k in ("x", "y", "z", "L", "M", "N", "opl"))
    count = x.size
    status = np.full(count, "ok", dtype=object)
    stop = np.full(count, -1, dtype=np.int64)
    margin = {k: np.full(count, BIG) for k in ("aperture", "behind", "discriminant", "root", "branch", "refraction")}

    def note(name, mask, value):
        margin[name] = np.where(mask, np.fmin(margin[name], value), margin[name])

    def fail(mask, what, surface):
        status[mask] = what
        stop[mask] = surface

    finite = np.isfinite(x) & np.isfinite(y) & np.isfinite(z) & np.isfinite(L) & np.isfinite(M) & np.isfinite(N) & np.isfinite(opl)
    live = finite & (np.abs(L * L + M * M + N * N - 1) <= 1e-12)
    fail(~live, "invalid", 0)

    n = float(case["n_object"])
    zv = 0.0
    surfaces = case["surfaces"]
    with np.errstate(invalid="ignore", divide="ignore", over="ignore"):
        for j, s in enumerate(surfaces):
            R, k, a_clear = float(s["radius"]), float(s["conic"]), float(s["clear_radius"])
            c = 0.0 if R == 0 else 1.0 / R
            # Step 2: the quadratic from the ray's point, in the surface's frame.
            Z = z - zv
            qa = c * (L * L + M * M + (1 + k) * N * N)
            qb = c * (x * L + y * M + (1 + k) * Z * N) - N
            qe = c * (x * x + y * y + (1 + k) * Z * Z) - 2 * Z
            disc = qb * qb - qa * qe
            sq = np.sqrt(np.maximum(disc, 0.0))
            q = -(qb + np.where(qb >= 0, sq, -sq))
            t1 = np.where(qa != 0, q / qa, np.inf)
            t2 = qe / q
            t1 = np.where(np.isfinite(t1), t1, np.inf)
            t2 = np.where(np.isfinite(t2), t2, np.inf)
            t0 = -Z / N
            d1, d2 = np.abs(t1 - t0), np.abs(t2 - t0)
            t = np.where(d2 <= d1, t2, t1)
            none = ~(disc >= 0) | ~np.isfinite(t) | (N == 0)
            note("discriminant", live, np.abs(disc) / (qb * qb + np.abs(qa * qe)))
            both = live & ~none & np.isfinite(d1) & np.isfinite(d2)
            note("root", both, np.abs(d1 - d2) / (d1 + d2))
            fail(live & none, "missed", j)
            live = live & ~none
            # Step 3: the checks in order.
            note("behind", live, np.abs(t))
            back = live & (t < 0)
            fail(back, "backward", j)
            live = live & ~back
            X, Y, Zs = x + t * L, y + t * M, Z + t * N
            g = 1 - (1 + k) * c * Zs
            note("branch", live, np.abs(g))
            far = live & ~(g > 0)
            fail(far, "missed", j)
            live = live & ~far
            r2 = X * X + Y * Y
            if a_clear > 0:
                note("aperture", live, np.abs(np.sqrt(r2) - a_clear))
                out = live & (r2 > a_clear * a_clear)
                fail(out, "blocked", j)
                live = live & ~out
            # Steps 4 and 5: the normal and the new direction.
            L2, M2, N2, n2 = L, M, N, n
            if s["kind"] in ("refract", "reflect"):
                w = np.sqrt(np.maximum(1 - (1 + k) * c * c * r2, 0.0))
                norm = np.sqrt(c * c * r2 + w * w)
                nx, ny, nz = -c * X / norm, -c * Y / norm, w / norm
                cos_i = L * nx + M * ny + N * nz
                if s["kind"] == "reflect":
                    L2, M2, N2 = L - 2 * cos_i * nx, M - 2 * cos_i * ny, N - 2 * cos_i * nz
                else:
                    n2 = float(s["n"])
                    rad = n2 * n2 - n * n * (1 - cos_i * cos_i)
                    note("refraction", live, np.abs(rad) / (n2 * n2))
                    tir = live & (rad < 0)
                    fail(tir, "tir", j)
                    live = live & ~tir
                    gamma = np.where(cos_i >= 0, 1.0, -1.0) * np.sqrt(np.maximum(rad, 0.0)) - n * cos_i
                    L2 = (n * L + gamma * nx) / n2
                    M2 = (n * M + gamma * ny) / n2
                    N2 = (n * N + gamma * nz) / n2
            elif s["kind"] != "stop":
                raise ValueError("surface %d: unknown kind %r" % (j, s["kind"]))
            # Step 6: the optical path of the segment, in the medium before.
            znew = Zs + zv
            seg = np.sqrt((X - x) ** 2 + (Y - y) ** 2 + (znew - z) ** 2)
            oplnew = opl + n * np.where(t < 0, -seg, seg)
            x, y, z = np.where(live, X, x), np.where(live, Y, y), np.where(live, znew, z)
            L, M, N = np.where(live, L2, L), np.where(live, M2, M), np.where(live, N2, N)
            opl = np.where(live, oplnew, opl)
            n = n2
            zv = zv + float(s["thickness"])
        # The image plane.
        t = (zv - z) / N
        none = live & ((N == 0) | ~np.isfinite(t))
        fail(none, "missed", len(surfaces))
        live = live & ~none
        X, Y = x + t * L, y + t * M
        seg = np.sqrt((X - x) ** 2 + (Y - y) ** 2 + (zv - z) ** 2)
        oplnew = opl + n * np.where(t < 0, -seg, seg)
        x, y, z = np.where(live, X, x), np.where(live, Y, y), np.where(live, zv, z)
        opl = np.where(live, oplnew, opl)
    return {"status": status.tolist(), "stop": stop.tolist(),
            "x": x.tolist(), "y": y.tolist(), "z": z.tolist(),
            "L": L.tolist(), "M": M.tolist(), "N": N.tolist(), "opl": opl.tolist(),
            "margin": {k: np.nan_to_num(v, nan=0.0, posinf=BIG).tolist() for k, v in margin.items()}}


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    out = {"reference": "numpy " + np.__version__ + ", conic intersection from the ray's point, vector Snell's law, all rays per surface",
           "cases": [trace(c) for c in cases]}
    with open(sys.argv[2], "w") as fh:
        json.dump(out, fh, allow_nan=False)


main()
