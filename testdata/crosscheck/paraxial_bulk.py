#!/usr/bin/python3
"""Independent reference for paraxial.System.TraceBulk, vectorised NumPy.

Usage: /usr/bin/python3 paraxial_bulk.py in.json out.json

in.json:
  {"cases": [{"ys": [...], "thetas": [...],
              "elements": [{"kind": "space", "d": ..., "lim": [lo, hi] or null},
                           {"kind": "matrix", "m": [A, B, C, D], "lim": [lo, hi] or null}]}]}
  Heights in metres, angles in radians; lim is the element's clear
  aperture in the traced plane (heights outside [lo, hi] are vignetted).
out.json:
  {"reference": "...", "cases": [{"heights": [[row of element 0], ...],
                                  "angles": [[...], ...], "blocked": [0/1 per ray]}]}

Method: the ray-transfer (ABCD) matrix of each element applied to all rays
at once, element by element: a space of length d maps (y, theta) to
(y + d theta, theta), any other element to (A y + B theta, C y + D theta)
(A. Gerrard & J. M. Burch, Introduction to Matrix Methods in Optics, Wiley
1975, ch. II [from memory]). A ray is vignetted when its height lies
outside an element's clear aperture: for a space at both of its ends, for
any other element where the ray arrives (the convention of
paraxial.System.Trace, which the Go test also checks).
"""
import json
import sys

import numpy as np


def trace(case):
    y = np.array(case["ys"], dtype=float)
    t = np.array(case["thetas"], dtype=float)
    blocked = np.zeros(y.size, dtype=bool)
    heights, angles = [], []

    def test(v, lim):
        if lim is not None:
            np.logical_or(blocked, (v < lim[0]) | (v > lim[1]), out=blocked)

    for e in case["elements"]:
        lim = e.get("lim")
        test(y, lim)
        if e["kind"] == "space":
            y = y + e["d"] * t
            test(y, lim)
        else:
            a, b, c, d = e["m"]
            y, t = a * y + b * t, c * y + d * t
        heights.append(y.tolist())
        angles.append(t.tolist())
    return {"heights": heights, "angles": angles, "blocked": blocked.astype(int).tolist()}


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    out = {"reference": "numpy " + np.__version__ + ", element-by-element ABCD over all rays",
           "cases": [trace(c) for c in cases]}
    with open(sys.argv[2], "w") as fh:
        json.dump(out, fh)


main()
