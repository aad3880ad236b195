#!/usr/bin/python3
"""Independent reference for beam.Transmission (openings on tilted parts,
offset circles, slits).

Usage: /usr/bin/python3 beam_opening.py in.json out.json

in.json:  {"cases": [{"shape": "circle" | "slit", "a": ..., "cx": ..., "cy": ...,
                      "across": "x" | "y", "tilt_deg": ..., "wx": ..., "wy": ...}, ...]}
          (metres; a is the circle radius or the slit half-width, (cx, cy) the
          centre of the opening on the part, wx and wy the 1/e^2 radii of the
          beam across its direction of travel, tilt_deg the angle of incidence
          in the x (tangential) plane)
out.json: {"reference": "...", "cases": [{"t": ..., "abserr": ...}, ...]}

The beam's footprint on a part met at angle theta is an ellipse with
semi-axes wx/cos(theta) and wy (the projection of the beam's cross-section
onto the tilted surface; analytic geometry), computed here with numpy. The
transmitted fraction is the normalised TEM00 irradiance
(2/(pi X Y)) exp(-2x^2/X^2 - 2y^2/Y^2) (Kogelnik & Li, Appl. Opt. 5, 1550
(1966)) integrated over the opening by scipy.integrate.dblquad (QUADPACK in
each direction): a different method from the Go code (Gauss-Legendre over a
chord parametrisation with erf in closed form, or closed forms for slits).
A slit is integrated over |y| <= 14 Y (the tail beyond is below 1e-170).
Lengths are scaled by the opening size a, which leaves T unchanged.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate

EPS = 1e-13


def transmission(c):
    a = float(c["a"])
    X = float(c["wx"]) / np.cos(np.radians(float(c["tilt_deg"]))) / a
    Y = float(c["wy"]) / a
    cx, cy = float(c["cx"]) / a, float(c["cy"]) / a
    pref = 2.0 / (np.pi * X * Y)

    def f(y, x):
        return pref * np.exp(-2.0 * x * x / (X * X) - 2.0 * y * y / (Y * Y))

    if c["shape"] == "slit":
        if c["across"] == "x":
            return integrate.dblquad(f, cx - 1.0, cx + 1.0, lambda x: -14 * Y, lambda x: 14 * Y,
                                     epsabs=EPS, epsrel=EPS)
        return integrate.dblquad(f, -14 * X, 14 * X, lambda x: cy - 1.0, lambda x: cy + 1.0,
                                 epsabs=EPS, epsrel=EPS)
    half = lambda x: np.sqrt(max(0.0, 1.0 - (x - cx) ** 2))
    return integrate.dblquad(f, cx - 1.0, cx + 1.0, lambda x: cy - half(x), lambda x: cy + half(x),
                             epsabs=EPS, epsrel=EPS)


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    out = []
    for c in cases:
        t, err = transmission(c)
        out.append({"t": t, "abserr": err})
    ref = "scipy.integrate.dblquad, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": out}, fh)


if __name__ == "__main__":
    main()
