#!/usr/bin/python3
"""Independent reference for measure.Frame.Profile (ISO 11146-1 second
moments of a beam profile frame, ISO/TR 11146-3 baseline correction).

Usage: /usr/bin/python3 measure_profile.py in.json out.json

in.json:  {"cases": [{"rows": R, "cols": C, "data": [R*C values, row by row],
                      "dark": [R*C values] or null,
                      "px": pitch x (m), "py": pitch y (m),
                      "border": border width (pixels),
                      "baseline": "border" | "none",
                      "whole": true | false,   # whole frame, no iteration
                      "tol": tolerance, "max_iter": n}, ...]}
out.json: {"reference": "...", "cases": [{
              "offset", "noise", "n_border",
              "whole": moments of the whole corrected frame,
              "iso": moments in the final ISO integration area, with
                     "iterations", "converged", "pixels", "width_noise"}]}
          moments: {"p", "x", "y", "sxx", "syy", "sxy", "phi", "suu", "svv"}

Coordinates: pixel (c, r) at x = c*px, y = r*py, data[r*C + c], as package
measure documents. Written from the definitions with numpy:

1. Baseline: the dark frame subtracted, then (baseline "border") the mean
   of the border region (rows or columns within `border` of an edge, built
   with numpy slicing) subtracted; the noise is the border's sample standard
   deviation (ddof = 1), computed either way.
2. Moments with numpy sums over a boolean mask:
   P = sum E, x = sum E x / P, sxx = sum E (x - x)^2 / P, etc.
3. Principal axes from numpy.linalg.eigh of the covariance matrix
   [[sxx, sxy], [sxy, syy]] (LAPACK syevd), not from the closed forms of
   ISO 11146-1 that the Go code uses: the eigenvector within 45 degrees of
   x gives the azimuth phi = arctan(v_y / v_x) and its eigenvalue suu, the
   other one svv.
4. The ISO integration area, iterated as package measure documents it:
   seeded by the pixels at or above min(max(peak e^-2, 4 noise), peak/2)
   (variances floored at max(px, py)^2), then rectangles centred on the
   centroid, sides along the principal axes, half-sides 6 sqrt(suu) and
   6 sqrt(svv) (three times the D4sigma widths), a pixel inside when its
   centre is (|u| <= a and |v| <= b), until the changes of both widths and
   of the centroid (relative to the smaller width) are within
   max(tol, width_noise), at most max_iter rectangles. width_noise is the
   first-order noise uncertainty of the widths (package measure's
   Profile.WidthNoise: pixel noise and the border offset's uncertainty
   noise/sqrt(n_border) propagated through the moment sums).
"""
import json
import sys

import numpy as np


def border_mask(rows, cols, b):
    m = np.zeros((rows, cols), dtype=bool)
    m[:b, :] = True
    m[rows - b:, :] = True
    m[:, :b] = True
    m[:, cols - b:] = True
    return m


def principal(sxx, syy, sxy):
    w, v = np.linalg.eigh(np.array([[sxx, sxy], [sxy, syy]]))
    i = 0 if abs(v[0, 0]) >= abs(v[1, 0]) else 1
    phi = float(np.arctan(v[1, i] / v[0, i]))
    return phi, float(w[i]), float(w[1 - i])


def moments(E, X, Y, mask):
    e = E[mask]
    x, y = X[mask], Y[mask]
    p = e.sum()
    if not p > 0:
        raise ValueError("no intensity in the area")
    mx, my = (e * x).sum() / p, (e * y).sum() / p
    dx, dy = x - mx, y - my
    sxx = (e * dx * dx).sum() / p
    syy = (e * dy * dy).sum() / p
    sxy = (e * dx * dy).sum() / p
    phi, suu, svv = principal(sxx, syy, sxy)
    return {"p": float(p), "x": float(mx), "y": float(my), "sxx": float(sxx),
            "syy": float(syy), "sxy": float(sxy), "phi": phi, "suu": suu,
            "svv": svv, "pixels": int(mask.sum()), "peak": float(e.max())}


def width_noise(m, E, X, Y, mask, noise, off_noise):
    c, s = np.cos(m["phi"]), np.sin(m["phi"])
    dx, dy = X[mask] - m["x"], Y[mask] - m["y"]
    u = dx * c + dy * s
    v = -dx * s + dy * c
    out = []
    for d, s2 in ((u, m["suu"]), (v, m["svv"])):
        t = d * d - s2
        pix = np.sqrt((t * t).sum())
        off = t.sum()
        out.append(np.hypot(noise * pix, off_noise * off) / (2 * m["p"] * s2))
    return float(max(out))


def rectangle(m, X, Y):
    a, b = 6 * np.sqrt(m["suu"]), 6 * np.sqrt(m["svv"])
    c, s = np.cos(m["phi"]), np.sin(m["phi"])
    dx, dy = X - m["x"], Y - m["y"]
    u = dx * c + dy * s
    v = -dx * s + dy * c
    return (np.abs(u) <= a) & (np.abs(v) <= b)


def converged(m, prev, tol):
    du, dv = np.sqrt(m["suu"]), np.sqrt(m["svv"])
    pu, pv = np.sqrt(prev["suu"]), np.sqrt(prev["svv"])
    s = min(du, dv)
    tol = max(tol, m["width_noise"])
    return (abs(du - pu) <= tol * du and abs(dv - pv) <= tol * dv
            and abs(m["x"] - prev["x"]) <= tol * s and abs(m["y"] - prev["y"]) <= tol * s)


def profile(c):
    R, C = c["rows"], c["cols"]
    E = np.asarray(c["data"], dtype=float).reshape(R, C)
    if c["dark"] is not None:
        E = E - np.asarray(c["dark"], dtype=float).reshape(R, C)
    bm = border_mask(R, C, c["border"])
    border = E[bm]
    mean, noise, n = float(border.mean()), float(border.std(ddof=1)), int(bm.sum())
    offset, off_noise = 0.0, 0.0
    if c["baseline"] == "border":
        offset, off_noise = mean, noise / np.sqrt(n)
        E = E - mean
    X, Y = np.meshgrid(np.arange(C) * c["px"], np.arange(R) * c["py"])
    everything = np.ones((R, C), dtype=bool)
    whole = moments(E, X, Y, everything)
    whole["width_noise"] = width_noise(whole, E, X, Y, everything, noise, off_noise)
    out = {"offset": offset, "noise": noise, "n_border": n, "whole": whole}
    if c["whole"]:
        return out
    peak = E.max()
    thr = min(max(peak * np.exp(-2), 4 * noise), peak / 2)
    m = moments(E, X, Y, E >= thr)
    floor = max(c["px"], c["py"]) ** 2
    m["suu"], m["svv"] = max(m["suu"], floor), max(m["svv"], floor)
    iterations, done = 0, False
    while not done and iterations < c["max_iter"]:
        mask = rectangle(m, X, Y)
        nm = moments(E, X, Y, mask)
        nm["width_noise"] = width_noise(nm, E, X, Y, mask, noise, off_noise)
        iterations += 1
        done = converged(nm, m, c["tol"])
        m = nm
    m["iterations"], m["converged"] = iterations, bool(done)
    out["iso"] = m
    return out


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    res = [profile(c) for c in cases]
    ref = "numpy %s moments, numpy.linalg.eigh principal axes" % np.__version__
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": res}, fh)


if __name__ == "__main__":
    main()
