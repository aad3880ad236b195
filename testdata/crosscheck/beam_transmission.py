#!/usr/bin/python3
"""Independent reference for beam.CircularTransmission.

Usage: /usr/bin/python3 beam_transmission.py in.json out.json

in.json:  {"cases": [{"a": ..., "wx": ..., "wy": ...}, ...]}   (metres)
out.json: {"reference": "...", "cases": [{"t": ..., "abserr": ..., "closed": ... or null}, ...]}

For each case it evaluates, from first principles, the fraction of the power
of a centred elliptical Gaussian beam with 1/e^2 intensity radii wx, wy that
passes a circular aperture of radius a:

    T = integral over x^2 + y^2 < a^2 of (2/(pi wx wy)) exp(-2x^2/wx^2 - 2y^2/wy^2) dx dy

(the normalised TEM00 irradiance, Kogelnik & Li, Appl. Opt. 5, 1550 (1966)),
by direct two-dimensional adaptive quadrature over the disc with
scipy.integrate.dblquad (QUADPACK qags in each direction). This is a
different method from the Go code, which does the radial integral in closed
form and the angular one with the trapezoidal rule.

The integrand is even in x and y, so the disc is reduced to its first
quadrant (factor 4); lengths are scaled by the aperture radius a, which
leaves T unchanged and keeps the integrand of order one.

For a round beam (wx == wy == w) the closed form T = 1 - exp(-2a^2/w^2)
(Siegman, Lasers, 1986, sec. 17.1 [from memory]) is also returned, computed as
-expm1(-2a^2/w^2) so that it is accurate for small a/w.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate

EPSABS = 1e-13  # absolute accuracy requested from each quadrature level
EPSREL = 1e-13


def transmission(a, wx, wy):
    sx, sy = wx / a, wy / a  # radii in units of the aperture radius
    pref = 2.0 / (np.pi * sx * sy)

    def f(y, x):  # dblquad integrates f(y, x) with y inner
        return pref * np.exp(-2.0 * x * x / (sx * sx) - 2.0 * y * y / (sy * sy))

    val, err = integrate.dblquad(
        f, 0.0, 1.0, lambda x: 0.0, lambda x: np.sqrt(max(0.0, 1.0 - x * x)),
        epsabs=EPSABS, epsrel=EPSREL)
    return 4.0 * val, 4.0 * err


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    out = []
    for c in cases:
        a, wx, wy = float(c["a"]), float(c["wx"]), float(c["wy"])
        t, err = transmission(a, wx, wy)
        closed = None
        if wx == wy:
            closed = float(-np.expm1(-2.0 * a * a / (wx * wx)))
        out.append({"t": t, "abserr": err, "closed": closed})
    ref = "scipy.integrate.dblquad, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": out}, fh)


if __name__ == "__main__":
    main()
