#!/usr/bin/python3
"""Independent reference for measure.KnifeEdgeFromScan (knife-edge scans).

Usage: /usr/bin/python3 measure_knife.py in.json out.json

in.json:  {"cases": [{"x": [...], "p": [...], "sigma": [...] or null}, ...]}
          positions x in metres (ascending), powers p and optional standard
          uncertainties sigma in any one power unit
out.json: {"reference": "...", "cases": [{
              "fit": {"p0", "pmax", "x0", "w", "sd": [p0, pmax, x0, w], "nfev"},
              "inversion": {"w", "x0", "points"},
              "clip": {"w", "x0"}}, ...]}

The three methods, written from their definitions with numpy/scipy:

1. The error-function model of a TEM00 beam passing a straight edge,
   P(x) = P0 + (Pmax/2) [1 + s erf(sqrt(2)(x - x0)/w)], s = +1 when the
   power rises with x and -1 when it falls (J. M. Khosrofian & B. A. Garetz,
   Appl. Opt. 22, 3406 (1983)), fitted by scipy.optimize.curve_fit
   (MINPACK's Levenberg-Marquardt, lmdif with a forward-difference
   Jacobian) with scipy.special.erf, weights 1/sigma^2 when given and
   absolute_sigma=False (the covariance scaled by the residual variance).
   The Go code minimises with BFGS and an analytic gradient and refines by
   Gauss-Newton: a different algorithm for the same minimum.

2. The direct inversion of Khosrofian & Garetz: the powers normalised with
   the levels at the scan's ends (the mean of the first and of the last
   max(1, n // 10) points), u = erfinv(2f - 1) by scipy.special.erfinv for
   the points with 0.05 < f < 0.95, and the straight line u = a + b x by
   weighted linear least squares (numpy.linalg.lstsq on sqrt(W) X), the
   weights exp(-2 u^2)/sigma^2 with u from the previous pass's line (the
   first pass from the data), three passes; w = sqrt(2)/|b|, x0 = -a/b.
   These are the package's documented choices, recomputed here.

3. The 10-90 % clip rule: the crossings of 10 % and 90 % of the normalised
   power, linearly interpolated (the mean position if noise makes several),
   w = (x90 - x10)/(sqrt(2) erfinv(0.8)).
"""
import json
import sys

import numpy as np
import scipy
from scipy import optimize, special


def levels(p):
    m = max(1, len(p) // 10)
    return p[:m].mean(), p[-m:].mean()


def normalised(p):
    low, high = levels(p)
    rising = high > low
    blocked, open_ = (low, high) if rising else (high, low)
    return (p - blocked) / (open_ - blocked), rising, blocked, open_ - blocked


def inversion(x, p, sigma):
    f, _, _, _ = normalised(p)
    sel = (f > 0.05) & (f < 0.95)
    xs, u = x[sel], special.erfinv(2 * f[sel] - 1)
    base = np.ones_like(xs) if sigma is None else 1 / sigma[sel] ** 2
    a = b = None
    for k in range(3):
        uw = u if k == 0 else a + b * xs
        wt = base * np.exp(-2 * uw * uw)
        sw = np.sqrt(wt)
        X = np.column_stack([sw, sw * xs])
        (a, b), *_ = np.linalg.lstsq(X, sw * u, rcond=None)
    return {"w": float(np.sqrt(2) / abs(b)), "x0": float(-a / b), "points": int(sel.sum())}


def crossing(x, f, q):
    xs = []
    for i in range(len(f) - 1):
        a, b = f[i], f[i + 1]
        if (a < q <= b) or (a > q >= b):
            xs.append(x[i] + (q - a) / (b - a) * (x[i + 1] - x[i]))
    return float(np.mean(xs))


def clip(x, p):
    f, _, _, _ = normalised(p)
    x10, x90 = crossing(x, f, 0.1), crossing(x, f, 0.9)
    return {"w": abs(x90 - x10) / (np.sqrt(2) * special.erfinv(0.8)), "x0": (x10 + x90) / 2}


def fit(x, p, sigma, start):
    _, rising, blocked, span = normalised(p)
    s = 1.0 if rising else -1.0

    def model(x, p0, pmax, x0, w):
        return p0 + pmax / 2 * (1 + s * special.erf(np.sqrt(2) * (x - x0) / w))

    p_start = [blocked, span, start["x0"], start["w"]]
    popt, pcov, info, _, ier = optimize.curve_fit(
        model, x, p, p0=p_start, sigma=sigma, absolute_sigma=False,
        full_output=True, ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=100000)
    sd = np.sqrt(np.diag(pcov))
    return {"p0": popt[0], "pmax": popt[1], "x0": popt[2], "w": abs(popt[3]),
            "sd": [float(v) for v in sd], "nfev": int(info["nfev"]), "ier": int(ier)}


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    out = []
    for c in cases:
        x, p = np.array(c["x"], float), np.array(c["p"], float)
        sigma = None if c.get("sigma") is None else np.array(c["sigma"], float)
        inv = inversion(x, p, sigma)
        out.append({"fit": fit(x, p, sigma, inv), "inversion": inv, "clip": clip(x, p)})
    ref = "scipy.optimize.curve_fit, scipy.special.erf/erfinv, numpy.linalg.lstsq; numpy %s, scipy %s" % (
        np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": out}, fh, default=float)


if __name__ == "__main__":
    main()
