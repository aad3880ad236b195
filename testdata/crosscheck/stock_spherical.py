#!/usr/bin/python3
"""Independent reference for package stock: the exact (real-ray)
longitudinal spherical aberration of a spherical singlet in air, for a
collimated input beam.

Usage: /usr/bin/python3 stock_spherical.py in.json out.json

in.json:
  {"cases": [{"c1": c1, "c2": c2, "t": t, "n": n, "heights": [y, ...]}]}
  c1, c2 are the curvatures 1/R of the front and back surfaces in 1/m
  (0 for a flat side; R positive when the centre of curvature lies after
  the vertex, light travelling towards +z), t the centre thickness in
  metres, n the index of the glass, heights the input ray heights in
  metres (rays parallel to the axis).
out.json:
  {"reference": "...",
   "cases": [{"efl": f, "bfl": b, "la": [dl, ...]}]}
  efl and bfl are the paraxial effective and back focal lengths (metres),
  la the longitudinal aberration of each ray: the distance from the
  paraxial focus to the point where the real ray crosses the axis
  (negative when the ray crosses before the paraxial focus, as for an
  undercorrected positive lens).

Method, written from the textbooks rather than from the Go code:

* Paraxial: the 2x2 ray-transfer matrices of a refracting surface
  [[1, 0], [-(n2-n1) c / n2, n1/n2]] and of a gap [[1, d], [0, 1]] in
  un-reduced angles (A. Gerrard & J. M. Burch, Introduction to Matrix
  Methods in Optics, Wiley 1975, ch. II [from memory]); EFL = -1/C, BFL =
  -A/C for the lens in air.
* Exact: each ray is intersected with the sphere of each surface (the
  root of |p + s d - centre|^2 = R^2 nearest the vertex; a plane for
  c = 0) and refracted with the vector form of Snell's law
  t = (n1/n2) d + ((n1/n2) cos i - cos r) N with N the unit normal facing
  the incoming ray (M. Born & E. Wolf, Principles of Optics, 7th ed.,
  section 3.2 [from memory]). After the back surface the ray is followed
  to its crossing with the axis, z = z0 - y0 (dz/dy).
"""
import json
import sys

import numpy as np


def refract(p, d, c, zv, n1, n2):
    """Intersect rays (p, d: arrays of shape (k, 2) as (z, y)) with the
    surface of curvature c whose vertex is at z = zv, refract them from n1
    into n2, and return the new points and directions."""
    if c == 0:
        s = (zv - p[:, 0]) / d[:, 0]
        q = p + s[:, None] * d
        normal = np.tile(np.array([-1.0, 0.0]), (len(p), 1))
    else:
        r = 1.0 / c
        centre = np.array([zv + r, 0.0])
        oc = p - centre
        b = np.sum(oc * d, axis=1)
        cc = np.sum(oc * oc, axis=1) - r * r
        disc = b * b - cc
        if np.any(disc < 0):
            raise ValueError("ray misses the surface")
        # The intersection nearest the vertex: for R > 0 the first one.
        s = -b - np.sign(r) * np.sqrt(disc)
        q = p + s[:, None] * d
        normal = (q - centre) / abs(r)  # unit normal, outwards from the centre
        # Turn it to face the incoming ray: dot(normal, d) < 0.
        flip = np.sum(normal * d, axis=1) > 0
        normal[flip] = -normal[flip]
    mu = n1 / n2
    cos_i = -np.sum(normal * d, axis=1)
    sin2_r = mu * mu * (1 - cos_i * cos_i)
    if np.any(sin2_r > 1):
        raise ValueError("total internal reflection")
    cos_r = np.sqrt(1 - sin2_r)
    t = mu * d + (mu * cos_i - cos_r)[:, None] * normal
    t /= np.linalg.norm(t, axis=1)[:, None]
    return q, t


def paraxial(c1, c2, t, n):
    def surf(c, n1, n2):
        return np.array([[1.0, 0.0], [-(n2 - n1) * c / n2, n1 / n2]])
    gap = np.array([[1.0, t], [0.0, 1.0]])
    m = surf(c2, n, 1.0) @ gap @ surf(c1, 1.0, n)
    A, C = m[0, 0], m[1, 0]
    return -1.0 / C, -A / C


def case(c):
    c1, c2, t, n = c["c1"], c["c2"], c["t"], c["n"]
    efl, bfl = paraxial(c1, c2, t, n)
    y = np.asarray(c["heights"], dtype=float)
    p = np.stack([np.full_like(y, -1.0), y], axis=1)
    d = np.tile(np.array([1.0, 0.0]), (len(y), 1))
    q1, d1 = refract(p, d, c1, 0.0, 1.0, n)
    q2, d2 = refract(q1, d1, c2, t, n, 1.0)
    z_cross = q2[:, 0] - q2[:, 1] * d2[:, 0] / d2[:, 1]
    la = (z_cross - t) - bfl
    return {"efl": efl, "bfl": bfl, "la": la.tolist()}


def main():
    with open(sys.argv[1]) as f:
        data = json.load(f)
    out = {
        "reference": "numpy " + np.__version__ + ": exact vector Snell trace through spheres",
        "cases": [case(c) for c in data["cases"]],
    }
    with open(sys.argv[2], "w") as f:
        json.dump(out, f)


if __name__ == "__main__":
    main()
