#!/usr/bin/python3
"""Independent reference for package cavity: eigenmodes, half-traces and
round-trip Gouy phases of linear and ring cavities, and the exact Airy
linewidth.

Usage: /usr/bin/python3 cavity_modes.py in.json out.json

in.json:
  {"cases": [{"type": "linear", "m1": k1, "m2": k2, "path": [el, ...],
              "lambda0": ..., "z": [...]},
             {"type": "ring", "loop": [el, ...], "lambda0": ..., "z": [...]}],
   "airy": [rho, ...]}
  with elements
    {"kind": "space", "d": d}                  gap of length d in air
    {"kind": "thin", "f": f}                   thin lens
    {"kind": "mirror", "k": k, "aoi": theta}   mirror of curvature k = 1/R
                                               (k > 0 concave, 0 flat) met at
                                               angle of incidence theta
  and k1, k2 the curvatures of the end mirrors of a linear cavity (normal
  incidence). z are planes along the unfolded round trip, metres from its
  start; a plane at the position of a surface lies just after it.
out.json:
  {"reference": "...",
   "cases": [{"half_trace": [mx, my],
              "w": [[wx, wy], ...], "inv_r": [[..], ...],   # per plane z
              "gouy": [psi_x, psi_y]}],
   "airy": [{"fwhm": ..., "finesse": ..., "peak": ...}]}

Method, written from the textbooks rather than from the Go code:

* Unfolding: a linear cavity M1 - path - M2 is the loop
  [M1, path..., M2, reversed(path)...] (light retraces the path); a ring
  is its own loop.
* Element matrices in air (A. Gerrard & J. M. Burch, Introduction to
  Matrix Methods in Optics, Wiley 1975, ch. II [from memory]); a curved
  mirror of focal length f = R/2 met at angle theta acts as a lens of focal
  length f cos(theta) in the tangential plane and f/cos(theta) in the
  sagittal plane (H. Kogelnik, E. P. Ippen, A. Dienes & C. V. Shank, IEEE
  J. Quantum Electron. QE-8, 373 (1972) [from memory]).
* Round trip at a plane z: the full loop matrix M (input plane to output
  plane) conjugated by the matrix T(z) from the input plane to z,
  M(z) = T(z) M T(z)^-1 (numpy.linalg.inv) -- a similarity transform, not
  the rotated product that the Go code composes.
* Eigenmode: the eigenvectors (q, 1) of M(z) from numpy.linalg.eig; the
  physical one has Im q > 0 (H. Kogelnik & T. Li, Appl. Opt. 5, 1550
  (1966)); w = sqrt(-lambda0 / (pi Im(1/q))), 1/R = Re(1/q).
* Round-trip Gouy phase: the on-axis amplitude after the partial loop T(s)
  is proportional to 1/(A(s) + B(s)/q0) (A. E. Siegman, Lasers, 1986,
  ch. 20 [from memory]), q0 the eigenmode at the input plane; psi is
  -arg(A + B/q0) sampled densely round the loop and unwrapped with
  numpy.unwrap, its value at the end of the loop.
* Airy FWHM: the circulating intensity of a cavity with round-trip
  amplitude factor rho is the geometric series |sum (rho e^{i delta})^n|^2
  = 1/|1 - rho e^{i delta}|^2 (M. Born & E. Wolf, Principles of Optics,
  7.6 [from memory]); the half-maximum point delta_h in (0, pi) is found
  by scipy.optimize.brentq on the complex expression itself, not on the
  arcsin closed form; FWHM = 2 delta_h, finesse = 2 pi / FWHM.
"""
import json
import sys

import numpy as np
import scipy
from scipy.optimize import brentq

SURFACE_SLACK = 1e-12  # relative: a surface at z (to rounding) lies before the plane z


def matrix(el, plane):
    k = el["kind"]
    if k == "space":
        return np.array([[1.0, el["d"]], [0.0, 1.0]])
    if k == "thin":
        return np.array([[1.0, 0.0], [-1.0 / el["f"], 1.0]])
    if k == "mirror":
        c = np.cos(el["aoi"])
        power = 2.0 * el["k"] / c if plane == 0 else 2.0 * el["k"] * c
        return np.array([[1.0, 0.0], [-power, 1.0]])
    raise ValueError("unknown element kind %r" % k)


def unfold(case):
    if case["type"] == "ring":
        return case["loop"]
    path = case["path"]
    return ([{"kind": "mirror", "k": case["m1"], "aoi": 0.0}] + path +
            [{"kind": "mirror", "k": case["m2"], "aoi": 0.0}] + list(reversed(path)))


def length(loop):
    return sum(el["d"] for el in loop if el["kind"] == "space")


def matrix_to(loop, plane, z):
    """Matrix from the input plane to z, surfaces at z included."""
    m = np.eye(2)
    pos = 0.0
    for el in loop:
        if el["kind"] == "space":
            d = el["d"]
            if pos + d <= z:
                m = matrix(el, plane) @ m
                pos += d
                continue
            return np.array([[1.0, max(0.0, z - pos)], [0.0, 1.0]]) @ m
        if pos <= z + SURFACE_SLACK * max(1.0, abs(z)):
            m = matrix(el, plane) @ m
    return m


def full(loop, plane):
    m = np.eye(2)
    for el in loop:
        m = matrix(el, plane) @ m
    return m


def eigen_q(m):
    vals, vecs = np.linalg.eig(m)
    qs = [vecs[0, i] / vecs[1, i] for i in range(2)]
    good = [q for q in qs if q.imag > 0]
    if len(good) != 1:
        raise RuntimeError("no unique physical eigenvector: %r (eigenvalues %r)" % (qs, vals))
    return good[0]


def gouy(loop, plane, q0):
    total = length(loop)
    grid = np.linspace(0.0, total, max(4000, int(20000 * total) + 1))
    vals = np.empty(grid.size, dtype=complex)
    done = np.zeros(grid.size, dtype=bool)
    m = np.eye(2)
    pos = 0.0
    for el in loop:
        if el["kind"] == "space":
            d = el["d"]
            mask = (grid >= pos) & (grid < pos + d) & ~done
            s = grid[mask] - pos
            vals[mask] = (m[0, 0] + s * m[1, 0]) + (m[0, 1] + s * m[1, 1]) / q0
            done |= mask
            pos += d
        m = matrix(el, plane) @ m
    vals[~done] = m[0, 0] + m[0, 1] / q0
    psi = -np.unwrap(np.angle(vals))
    steps = np.abs(np.diff(psi))
    if steps.size and steps.max() > 0.5:
        raise RuntimeError("Gouy sampling too coarse: step %g rad" % steps.max())
    return float(psi[-1] - psi[0])


def airy(rho):
    def intensity(delta):
        return 1.0 / abs(1.0 - rho * np.exp(1j * delta)) ** 2

    peak = intensity(0.0)
    dh = brentq(lambda d: intensity(d) - peak / 2.0, 0.0, np.pi, xtol=1e-300, rtol=4 * np.finfo(float).eps, maxiter=500)
    fwhm = 2.0 * dh
    return {"fwhm": fwhm, "finesse": 2.0 * np.pi / fwhm, "peak": peak}


def main():
    with open(sys.argv[1]) as fh:
        data = json.load(fh)
    out = []
    for case in data["cases"]:
        loop = unfold(case)
        lam = case["lambda0"]
        r = {"half_trace": [], "w": [], "inv_r": [], "gouy": []}
        for plane in (0, 1):
            m = full(loop, plane)
            r["half_trace"].append(float((m[0, 0] + m[1, 1]) / 2))
            r["gouy"].append(gouy(loop, plane, eigen_q(m)))
        for z in case["z"]:
            ws, invs = [], []
            for plane in (0, 1):
                t = matrix_to(loop, plane, z)
                mz = t @ full(loop, plane) @ np.linalg.inv(t)
                inv = 1.0 / eigen_q(mz)
                ws.append(float(np.sqrt(-lam / (np.pi * inv.imag))))
                invs.append(float(inv.real))
            r["w"].append(ws)
            r["inv_r"].append(invs)
        out.append(r)
    ref = "numpy.linalg.eig of similarity-transformed round trips, numpy.unwrap, scipy.optimize.brentq; numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": out, "airy": [airy(rho) for rho in data.get("airy", [])]}, fh)


if __name__ == "__main__":
    main()
