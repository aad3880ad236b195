#!/usr/bin/python3
"""Independent reference for package polar: Jones matrices of its elements
composed with numpy, Stokes parameters, Mueller matrices, and the Fresnel
coefficients of a dielectric interface.

Usage: /usr/bin/python3 polar_jones.py in.json out.json

in.json:
  {"chains": [{"input": [[re, im], [re, im]],
               "elements": [{"kind": "polarizer", "theta": ...},
                            {"kind": "partial", "theta": ..., "er": ...},
                            {"kind": "retarder", "theta": ..., "gamma": ...},
                            {"kind": "rotator", "rho": ...},
                            {"kind": "faraday", "rho": ..., "dir": "forward" | "backward"},
                            {"kind": "mirror"},
                            {"kind": "pbs_t", "er": ...}, {"kind": "pbs_r", "er": ...}, ...]}],
   "fresnel": [{"n1": ..., "n2": ..., "theta": ...}]}
  (angles in radians; an extinction ratio "er" of null means ideal)
out.json:
  {"reference": "...",
   "chains": [{"out": [[re, im], [re, im]], "powers": [...], "stokes": [S0, S1, S2, S3],
               "mueller": [[...4], ...4], "mueller_imag": max |Im|}],
   "fresnel": [{"rs": [re, im], "rp": ..., "ts": ..., "tp": ..., "R": [s, p], "T": [s, p], "tir": bool}]}

Method, written from the textbooks rather than from the Go code:

* Conventions (stated in the package doc of opticslib/polar): field
  Re[(X, Y) exp(i w t)], angles from x towards y, a waveplate advances its
  fast component by Gamma/2 and delays the slow one by Gamma/2.
* An element at angle theta is R(-theta) @ D @ R(theta) with the coordinate
  rotation R(theta) = [[cos, sin], [-sin, cos]] and D its matrix in its own
  frame (E. Collett, Field Guide to Polarization, SPIE 2005 [from memory]):
  polarizer diag(1, 0), partial polarizer diag(1, 1/sqrt(er)), retarder
  diag(exp(i Gamma/2), exp(-i Gamma/2)). A rotator turns the state by rho:
  [[cos, -sin], [sin, cos]]; a Faraday rotator does so forward and by -rho
  backward (the return frame has x reversed); a normal-incidence mirror is
  diag(1, -1); the beam-splitter ports are diag(1, 1/sqrt(er)) and
  diag(1/sqrt(er), 1). The Go code builds the matrices from closed-form
  entries instead; here numpy does the products (last element leftmost).
* Stokes parameters from the coherency matrix rho = v v^H:
  S = (rho00 + rho11, rho00 - rho11, rho01 + rho10, i (rho01 - rho10)).
* Mueller matrix M = A (J kron J*) A^-1 with
  A = [[1,0,0,1], [1,0,0,-1], [0,1,1,0], [0,1j,-1j,0]] (R. M. A. Azzam &
  N. M. Bashara, Ellipsometry and Polarized Light, 1977 [from memory]), via
  numpy.kron and numpy.linalg.inv; the Go code uses tr(sigma_i J sigma_j J^H).
* Fresnel coefficients from Fresnel's sine and tangent forms (M. Born &
  E. Wolf, Principles of Optics, section 1.5.2 [from memory]):
      r_s = -sin(ti - tt)/sin(ti + tt),  r_p = tan(ti - tt)/tan(ti + tt),
      t_s = 2 sin(tt) cos(ti)/sin(ti + tt),
      t_p = 2 sin(tt) cos(ti)/(sin(ti + tt) cos(ti - tt)),
  their limits at normal incidence, and T = n2 cos(tt)/(n1 cos(ti)) |t|^2;
  the Go code uses the n cos(theta) forms. Beyond the critical angle:
  |r| = 1 with the phases of Born & Wolf section 1.5.4 [from memory]
  (signs for exp(i w t)), tan(phi_s/2) = sqrt(sin^2 ti - n^2)/cos ti,
  tan(phi_p/2) = sqrt(sin^2 ti - n^2)/(n^2 cos ti), n = n2/n1, and the
  transmitted amplitudes from the boundary conditions t_s = 1 + r_s
  (tangential E) and t_p = (n1/n2)(1 + r_p) (tangential H); T = 0.
"""
import json
import sys

import numpy as np


def rot(theta):
    c, s = np.cos(theta), np.sin(theta)
    return np.array([[c, s], [-s, c]], dtype=complex)


def turned(d, theta):
    return rot(-theta) @ d @ rot(theta)


def active(rho):
    c, s = np.cos(rho), np.sin(rho)
    return np.array([[c, -s], [s, c]], dtype=complex)


def leak(er):
    return 0.0 if er is None else 1.0 / np.sqrt(er)


def element(el):
    k = el["kind"]
    if k == "polarizer":
        return turned(np.diag([1.0, 0.0]).astype(complex), el["theta"])
    if k == "partial":
        return turned(np.diag([1.0, leak(el["er"])]).astype(complex), el["theta"])
    if k == "retarder":
        g = el["gamma"]
        return turned(np.diag([np.exp(0.5j * g), np.exp(-0.5j * g)]), el["theta"])
    if k == "rotator":
        return active(el["rho"])
    if k == "faraday":
        return active(el["rho"] if el["dir"] == "forward" else -el["rho"])
    if k == "mirror":
        return np.diag([1.0, -1.0]).astype(complex)
    if k == "pbs_t":
        return np.diag([1.0, leak(el["er"])]).astype(complex)
    if k == "pbs_r":
        return np.diag([leak(el["er"]), 1.0]).astype(complex)
    raise ValueError("unknown element kind %r" % k)


A = np.array([[1, 0, 0, 1], [1, 0, 0, -1], [0, 1, 1, 0], [0, 1j, -1j, 0]], dtype=complex)
A_INV = np.linalg.inv(A)


def stokes(v):
    rho = np.outer(v, v.conj())
    return [float(np.real(rho[0, 0] + rho[1, 1])), float(np.real(rho[0, 0] - rho[1, 1])),
            float(np.real(rho[0, 1] + rho[1, 0])), float(np.real(1j * (rho[0, 1] - rho[1, 0])))]


def chain(case):
    v = np.array([complex(*case["input"][0]), complex(*case["input"][1])])
    m = np.eye(2, dtype=complex)
    powers = []
    for el in case["elements"]:
        j = element(el)
        m = j @ m
        powers.append(float(np.sum(np.abs(m @ v) ** 2)))
    out = m @ v
    mu = A @ np.kron(m, m.conj()) @ A_INV
    return {"out": [[out[0].real, out[0].imag], [out[1].real, out[1].imag]], "powers": powers,
            "stokes": stokes(out), "mueller": np.real(mu).tolist(),
            "mueller_imag": float(np.max(np.abs(np.imag(mu))))}


def cpair(z):
    z = complex(z)
    return [z.real, z.imag]


def fresnel(case):
    n1, n2, ti = case["n1"], case["n2"], case["theta"]
    st = n1 * np.sin(ti) / n2
    if st > 1:
        n = n2 / n1
        root = np.sqrt(np.sin(ti) ** 2 - n * n)
        rs = np.exp(2j * np.arctan(root / np.cos(ti)))
        rp = np.exp(2j * np.arctan(root / (n * n * np.cos(ti))))
        ts, tp = 1 + rs, (n1 / n2) * (1 + rp)
        return {"rs": cpair(rs), "rp": cpair(rp), "ts": cpair(ts), "tp": cpair(tp),
                "R": [abs(rs) ** 2, abs(rp) ** 2], "T": [0.0, 0.0], "tir": True}
    tt = np.arcsin(st)
    if ti == 0:
        rs = (n1 - n2) / (n1 + n2)
        rp = -rs
        ts = tp = 2 * n1 / (n1 + n2)
    elif n1 == n2:
        rs = rp = 0.0
        ts = tp = 1.0
    else:
        rs = -np.sin(ti - tt) / np.sin(ti + tt)
        rp = np.tan(ti - tt) / np.tan(ti + tt)
        ts = 2 * np.sin(tt) * np.cos(ti) / np.sin(ti + tt)
        tp = 2 * np.sin(tt) * np.cos(ti) / (np.sin(ti + tt) * np.cos(ti - tt))
    k = n2 * np.cos(tt) / (n1 * np.cos(ti))
    return {"rs": cpair(rs), "rp": cpair(rp), "ts": cpair(ts), "tp": cpair(tp),
            "R": [rs ** 2, rp ** 2], "T": [k * ts ** 2, k * tp ** 2], "tir": False}


def main():
    with open(sys.argv[1]) as f:
        data = json.load(f)
    out = {"reference": "numpy %s" % np.__version__,
           "chains": [chain(c) for c in data.get("chains", [])],
           "fresnel": [fresnel(c) for c in data.get("fresnel", [])]}
    with open(sys.argv[2], "w") as f:
        json.dump(out, f)


if __name__ == "__main__":
    main()
