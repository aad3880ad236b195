#!/usr/bin/python3
"""Independent reference for package couple: the power coupling of two
Gaussian beams by direct numerical quadrature of the overlap integral on a
grid.

Usage: /usr/bin/python3 couple_overlap.py in.json out.json

in.json:
  {"cases": [{"lambda0": l, "n": n,
              "a": {"x": [w0, zw, m2], "y": [w0, zw, m2]},
              "b": {"x": [...], "y": [...]},
              "dx": dx, "dy": dy, "tx": tx, "ty": ty}]}
  per beam and axis the waist radius w0 (the real beam's, 1/e²), the waist
  position zw relative to the common plane (positive: after it) and M²;
  beam b's axis is offset by (dx, dy) and tilted by (tx, ty) (radians, in
  the medium) relative to beam a's.
out.json:
  {"reference": "...", "cases": [{"eta": ..., "err": ...}]}

Method, written from the textbooks rather than from the Go code:

* Beam at the plane (H. Kogelnik & T. Li, Appl. Opt. 5, 1550 (1966)):
  zR = pi w0^2 n / (M^2 lambda0), z = -zw, W = w0 sqrt(1 + (z/zR)^2),
  R = z (1 + (zR/z)^2); field exp(-x^2/W^2 - i k x^2 / (2R)), k = 2 pi n /
  lambda0, for exp(-ikz) propagation; the tilted beam carries exp(-i k t x)
  and its centre is shifted by d.
* TEM00 pair: eta = |sum u_a* u_b|^2 / (sum |u_a|^2 sum |u_b|^2) on a full
  2-D (x, y) grid (numpy), without using separability.
* M^2 > 1 in an axis: Gaussian Schell-model cross-spectral density
  W(x1, x2) = u(x1) u*(x2) exp(-(x1 - x2)^2 / (2 s^2)), s = W/sqrt(M^4 - 1)
  (A. Starikov & E. Wolf, J. Opt. Soc. Am. 72, 923 (1982) [from memory]),
  coupled into the other (TEM00) beam t as sum t* W t / (sum W(x,x) sum
  |t|^2) on a 2-D (x1, x2) grid for that axis, times the TEM00 1-D overlap
  of the other axis on a 1-D grid.
* Sums are trapezoid-free plain Riemann sums over a window of +-9 W_max
  around the midpoint of the centres, which converge spectrally for
  Gaussians; err is the change between 401 and 301 points per side (201 points
  already differ by ~1e-8 in some cases, so a window or sampling that is
  too coarse shows in err).
"""
import json
import sys

import numpy as np


def axis_field(spec, lam0, n):
    w0, zw, m2 = spec
    zr = np.pi * w0 ** 2 * n / (m2 * lam0)
    z = -zw
    w = w0 * np.sqrt(1 + (z / zr) ** 2)
    curv = 0.0 if z == 0 else 1.0 / (z * (1 + (zr / z) ** 2))  # 1/R
    return w, curv, m2


def field(x, w, curv, k, d=0.0, t=0.0):
    xs = x - d
    return np.exp(-xs ** 2 / w ** 2 - 1j * k * xs ** 2 * curv / 2 - 1j * k * t * x)


def window(wa, wb, d, npts):
    half = 9 * max(wa, wb) + abs(d) / 2
    return np.linspace(d / 2 - half, d / 2 + half, npts)


def coherent_2d(c, npts):
    lam0, n = c["lambda0"], c["n"]
    k = 2 * np.pi * n / lam0
    ax, ay = axis_field(c["a"]["x"], lam0, n), axis_field(c["a"]["y"], lam0, n)
    bx, by = axis_field(c["b"]["x"], lam0, n), axis_field(c["b"]["y"], lam0, n)
    x = window(ax[0], bx[0], c["dx"], npts)
    y = window(ay[0], by[0], c["dy"], npts)
    X, Y = np.meshgrid(x, y, indexing="ij")
    ua = field(X, ax[0], ax[1], k) * field(Y, ay[0], ay[1], k)
    ub = field(X, bx[0], bx[1], k, c["dx"], c["tx"]) * field(Y, by[0], by[1], k, c["dy"], c["ty"])
    num = abs(np.sum(np.conj(ua) * ub)) ** 2
    return num / (np.sum(abs(ua) ** 2) * np.sum(abs(ub) ** 2))


def axis_eta(a, b, k, d, t, npts):
    """One axis: a at the origin, b offset by d and tilted by t; the
    partially coherent one (M^2 > 1) is the source."""
    if a[2] == 1 and b[2] == 1:
        x = window(a[0], b[0], d, npts)
        ua, ub = field(x, a[0], a[1], k), field(x, b[0], b[1], k, d, t)
        return abs(np.sum(np.conj(ua) * ub)) ** 2 / (np.sum(abs(ua) ** 2) * np.sum(abs(ub) ** 2))
    if a[2] > 1:
        src, sd, st, dst = a, 0.0, 0.0, (b, d, t)
    else:
        src, sd, st, dst = b, d, t, (a, 0.0, 0.0)
    tb, td, tt = dst
    x = window(src[0], tb[0], d, npts)
    u = field(x, src[0], src[1], k, sd, st)
    s = src[0] / np.sqrt(src[2] ** 2 - 1)  # src[2] is M^2, so this is sqrt(M^4 - 1)
    X1, X2 = np.meshgrid(x, x, indexing="ij")
    W = np.outer(u, np.conj(u)) * np.exp(-(X1 - X2) ** 2 / (2 * s ** 2))
    tf = field(x, tb[0], tb[1], k, td, tt)
    num = np.real(np.conj(tf) @ W @ tf)
    return num / (np.real(np.trace(W)) * np.sum(abs(tf) ** 2))


def eta(c, npts):
    lam0, n = c["lambda0"], c["n"]
    k = 2 * np.pi * n / lam0
    if all(c[b][a][2] == 1 for b in "ab" for a in "xy"):
        return coherent_2d(c, npts)
    ex = axis_eta(axis_field(c["a"]["x"], lam0, n), axis_field(c["b"]["x"], lam0, n), k, c["dx"], c["tx"], npts)
    ey = axis_eta(axis_field(c["a"]["y"], lam0, n), axis_field(c["b"]["y"], lam0, n), k, c["dy"], c["ty"], npts)
    return ex * ey


def main():
    with open(sys.argv[1]) as f:
        data = json.load(f)
    out = []
    for c in data["cases"]:
        fine, coarse = eta(c, 401), eta(c, 301)
        out.append({"eta": float(fine), "err": float(abs(fine - coarse))})
    with open(sys.argv[2], "w") as f:
        json.dump({"reference": "numpy %s grid quadrature of the overlap integral" % np.__version__, "cases": out}, f)


if __name__ == "__main__":
    main()
