#!/usr/bin/python3
"""Independent reference for beam.At (ABCD law) and the accumulated Gouy
phase of beam.Sample.

Usage: /usr/bin/python3 beam_abcd.py in.json out.json

in.json:
  {"cases": [{"n_in": 1.0, "lambda0": ..., "q_in": [re, im],
              "elements": [{"kind": "space", "d": ...},
                           {"kind": "thin", "f": ...},
                           {"kind": "sphere", "r": ..., "n2": ...},
                           {"kind": "planar", "n2": ...}, ...],
              "z": [...],          # planes for w and R (metres from the input)
              "gouy_z": [...]}]}   # planes for the Gouy phase (may be empty)
out.json:
  {"reference": "...", "cases": [{"w": [...], "r": [...], "inv_r": [...],
                                  "q": [[re, im], ...], "n": [...],
                                  "gouy": [...]}]}

Method, written from the textbooks rather than from the Go code:

* Every element is written as a REDUCED ray-transfer matrix acting on
  (y, n*theta), det = 1 (A. Gerrard & J. M. Burch, Introduction to Matrix
  Methods in Optics, Wiley 1975, ch. II [from memory]):
      gap d in index n:          [[1, d/n], [0, 1]]
      thin lens f in index n:    [[1, 0], [-n/f, 1]]
      spherical surface n -> n2: [[1, 0], [-(n2 - n)/r, 1]]
      planar surface:            identity
  and the matrices are composed with numpy (@), last element leftmost.
* The beam obeys the ABCD law for the reduced parameter q^ = q/n
  (Kogelnik & Li, Appl. Opt. 5, 1550 (1966); A. E. Siegman, Lasers, 1986,
  ch. 20 [from memory]): q^2 = (A q^1 + B)/(C q^1 + D), and
      1/q^ = n/R - i lambda0/(pi w^2)
  so w = sqrt(-lambda0/(pi Im(1/q^))) and 1/R = Re(1/q^)/n.
  The Go package uses the un-reduced matrices with q itself; the two agree
  only if its documented index handling (q/n invariant) is right.
* Gouy phase: the on-axis amplitude of the round beam after a system M is
  proportional to 1/(A + B/q1) (Siegman, Lasers, ch. 20 [from memory]), so the Gouy phase
  accumulated from the input plane is psi(z) = -arg(A(z) + B^(z)/q^1), with
  M(z) the cumulative reduced matrix from the input plane to z. Instead of
  summing per-element increments (as the Go code does) the script samples
  psi(z) densely along the whole path (steps far below the local Rayleigh
  range, so consecutive samples differ by much less than pi) and removes the
  2*pi jumps of arg with numpy.unwrap; values are reported relative to
  gouy_z[0].
A plane at the position of a surface lies just after that surface (surfaces
at z are included), the convention of paraxial.System.MatrixTo.
"""
import json
import sys

import numpy as np
import scipy

SURFACE_SLACK = 1e-12  # relative: a surface at z (up to rounding) counts as before z


def element_matrix(el, n):
    """Reduced matrix of el in current index n, and the index after it."""
    k = el["kind"]
    if k == "space":
        return np.array([[1.0, el["d"] / n], [0.0, 1.0]]), n
    if k == "thin":
        return np.array([[1.0, 0.0], [-n / el["f"], 1.0]]), n
    if k == "sphere":
        n2 = el["n2"]
        return np.array([[1.0, 0.0], [-(n2 - n) / el["r"], 1.0]]), n2
    if k == "planar":
        return np.eye(2), el["n2"]
    raise ValueError("unknown element kind %r" % k)


def matrix_to(elements, n_in, z):
    """Cumulative reduced matrix from the input plane to z >= 0, and the index there."""
    m = np.eye(2)
    n = n_in
    pos = 0.0
    for el in elements:
        if el["kind"] == "space":
            d = el["d"]
            if pos + d <= z:
                e, n = element_matrix(el, n)
                m = e @ m
                pos += d
                continue
            part = max(0.0, z - pos)
            m = np.array([[1.0, part / n], [0.0, 1.0]]) @ m
            return m, n
        if pos <= z + SURFACE_SLACK * max(1.0, abs(z)):
            e, n = element_matrix(el, n)
            m = e @ m
    # beyond the last element: continue in the output medium
    m = np.array([[1.0, max(0.0, z - pos) / n], [0.0, 1.0]]) @ m
    return m, n


def beam_at(elements, n_in, lambda0, q_in, z):
    m, n = matrix_to(elements, n_in, z)
    qh1 = q_in / n_in
    qh2 = (m[0, 0] * qh1 + m[0, 1]) / (m[1, 0] * qh1 + m[1, 1])
    inv = 1.0 / qh2
    w = np.sqrt(-lambda0 / (np.pi * inv.imag))
    inv_r = inv.real / n
    r = np.inf if inv_r == 0 else 1.0 / inv_r
    return w, r, inv_r, qh2 * n, n


def gouy(elements, n_in, q_in, zs):
    """psi(z) = -unwrap(arg(A + B^/q^1)) on a dense grid, at the planes zs."""
    zs = np.asarray(zs, dtype=float)
    if zs.size == 0:
        return []
    qh1 = q_in / n_in
    # Dense grid: 20000 steps per metre of path plus the requested planes.
    # The focused beams of the tests have zR >= ~1 mm and the grid step is
    # <= 0.05 mm, so arg changes by << pi between neighbours (checked below).
    length = zs.max() - zs.min()
    dense = np.linspace(zs.min(), zs.max(), max(2000, int(20000 * length) + 1))
    grid = np.union1d(dense, zs)
    vals = np.empty(grid.size, dtype=complex)
    done = np.zeros(grid.size, dtype=bool)
    m = np.eye(2)
    n = n_in
    pos = 0.0

    def fill(mask, m, n, pos):
        s = (grid[mask] - pos) / n  # reduced distance into the gap
        a = m[0, 0] + s * m[1, 0]   # (Space(s) @ m)[0, 0]
        b = m[0, 1] + s * m[1, 1]   # (Space(s) @ m)[0, 1]
        vals[mask] = a + b / qh1

    for el in elements:
        if el["kind"] == "space":
            d = el["d"]
            mask = (grid >= pos) & (grid < pos + d) & ~done
            fill(mask, m, n, pos)
            done |= mask
        e, n = element_matrix(el, n)
        m = e @ m
        if el["kind"] == "space":
            pos += el["d"]
    fill(~done, m, n, pos)  # the output plane and beyond, in the output medium
    psi = -np.unwrap(np.angle(vals))
    steps = np.abs(np.diff(psi))
    if steps.size and steps.max() > 0.5:
        raise RuntimeError("Gouy sampling too coarse: step %g rad" % steps.max())
    idx = np.searchsorted(grid, zs)
    out = psi[idx]
    return list(out - out[0])


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    res = []
    for c in cases:
        q_in = complex(c["q_in"][0], c["q_in"][1])
        r = {"w": [], "r": [], "inv_r": [], "q": [], "n": []}
        for z in c["z"]:
            w, rr, inv_r, q, n = beam_at(c["elements"], c["n_in"], c["lambda0"], q_in, z)
            r["w"].append(float(w))
            r["r"].append(None if np.isinf(rr) else float(rr))
            r["inv_r"].append(float(inv_r))
            r["q"].append([float(q.real), float(q.imag)])
            r["n"].append(float(n))
        r["gouy"] = [float(v) for v in gouy(c["elements"], c["n_in"], q_in, c.get("gouy_z", []))]
        res.append(r)
    ref = "reduced ABCD matrices and numpy.unwrap, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": res}, fh)


if __name__ == "__main__":
    main()
