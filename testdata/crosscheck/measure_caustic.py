#!/usr/bin/python3
"""Independent reference for measure.FitCaustic (ISO 11146-1 hyperbolic fit).

Usage: /usr/bin/python3 measure_caustic.py in.json out.json

in.json:
  {"cases": [{"z": [...],            # plane positions, metres
              "d": [...],            # diameters, metres
              "sigma_d": [...] | null,  # standard uncertainties of d, metres
              "weighting": "unweighted" | "uncertainty" | "relative",
              "lambda0": ..., "n": ...}]}
out.json:
  {"reference": "...",
   "cases": [{"abc": [a, b, c], "cov": [[...], [...], [...]],
              "abc_polyfit": [a, b, c],
              "z0": ..., "d0": ..., "theta": ..., "zr": ..., "m2": ...,
              "sigma": {"z0": ..., "d0": ..., "theta": ..., "zr": ..., "m2": ...},
              "chi2": ...}]}

Method, written from ISO 11146-1 and the SciPy/NumPy documentation rather
than from the Go code:

* The hyperbola d^2(z) = a + b z + c z^2 is fitted in the raw coordinate z
  (the Go code fits in a centred, scaled coordinate) with
  scipy.optimize.curve_fit, which returns the coefficients and their
  covariance:
    - "uncertainty": sigma = sigma(d^2) = 2 d sigma_d, absolute_sigma=True
      (the covariance (J^T W J)^-1 as it is);
    - "unweighted": no sigma, absolute_sigma=False (covariance scaled by
      chi^2/(N - 3));
    - "relative": sigma = d^2, absolute_sigma=False;
  where d in sigma is the fitted diameter at the plane: the fit is repeated
  with the weights of the previous fit's curve (8 passes, from the measured
  widths), the estimator the Go documentation defines.
  The Jacobian (1, z, z^2) is passed to curve_fit, so that the covariance
  is not limited by finite differences.
  The coefficients are also computed with numpy.polyfit (weights 1/sigma)
  as a second, independent least-squares solver (LAPACK gelsd via lstsq).
* The beam parameters follow ISO 11146-1:2005, clause 9:
    z0 = -b/(2c), d0 = sqrt(4ac - b^2)/(2 sqrt(c)), Theta = sqrt(c),
    zR = sqrt(4ac - b^2)/(2c), M^2 = pi n/(8 lambda0) sqrt(4ac - b^2)
  (the index n of the medium multiplies M^2 as Theta is measured in it).
* Their standard uncertainties are g^T C g, with the gradient g taken by
  the complex-step derivative f'(x) = Im f(x + i h)/h (J. N. Lyness &
  C. B. Moler, SIAM J. Numer. Anal. 4, 202 (1967)), exact to rounding,
  instead of the analytic gradients in the centred coordinates that the Go
  code uses.
"""
import json
import sys

import numpy as np
import scipy
from scipy.optimize import curve_fit


def model(z, a, b, c):
    return a + b * z + c * z * z


def model_jac(z, a, b, c):
    return np.vstack([np.ones_like(z), z, z * z]).T


def iso(p, lam, n):
    a, b, c = p
    disc = 4 * a * c - b * b
    return {
        "z0": -b / (2 * c),
        "d0": np.sqrt(disc) / (2 * np.sqrt(c)),
        "theta": np.sqrt(c),
        "zr": np.sqrt(disc) / (2 * c),
        "m2": np.pi * n / (8 * lam) * np.sqrt(disc),
    }


def gradients(p, lam, n):
    """Complex-step gradients of the ISO parameters with respect to a, b, c."""
    out = {}
    for j in range(3):
        h = 1e-30 * max(abs(p[j]), 1e-300)
        q = np.array(p, dtype=complex)
        q[j] += 1j * h
        for k, v in iso(q, lam, n).items():
            out.setdefault(k, np.zeros(3))[j] = np.imag(v) / h
    return out


def fit(case):
    z = np.asarray(case["z"], float)
    d = np.asarray(case["d"], float)
    y = d * d
    w = case["weighting"]
    absolute = w == "uncertainty"

    def sigma_for(dfit):
        if w == "uncertainty":
            return 2 * dfit * np.asarray(case["sigma_d"], float)
        if w == "relative":
            return dfit * dfit
        return None

    # Weighted fits use the fitted diameter in sigma(d^2) (iteratively
    # reweighted, starting from the measured d), as the Go documentation
    # defines the estimator; an unweighted fit is one pass.
    dfit = d.copy()
    for _ in range(8 if w != "unweighted" else 1):
        sigma = sigma_for(dfit)
        pw = None if sigma is None else 1 / sigma
        poly = np.polyfit(z, y, 2, w=pw)[::-1]  # (a, b, c)
        # Start from the polyfit solution; the model is linear, so
        # curve_fit's Levenberg-Marquardt stays at the least-squares minimum.
        popt, pcov = curve_fit(model, z, y, p0=poly, sigma=sigma, absolute_sigma=absolute, jac=model_jac,
                               xtol=1e-15, ftol=1e-15, gtol=1e-15, maxfev=10000)
        fitted = model(z, *popt)
        if np.any(fitted <= 0):
            break
        dfit = np.sqrt(fitted)
    r = (y - model(z, *popt)) / (1 if sigma is None else sigma)
    lam, n = case["lambda0"], case["n"]
    par = iso(popt, lam, n)
    g = gradients(popt, lam, n)
    sig = {k: float(np.sqrt(g[k] @ pcov @ g[k])) for k in par}
    return {
        "abc": [float(v) for v in popt],
        "cov": [[float(v) for v in row] for row in pcov],
        "abc_polyfit": [float(v) for v in poly],
        **{k: float(v) for k, v in par.items()},
        "sigma": sig,
        "chi2": float(r @ r),
    }


def main():
    with open(sys.argv[1]) as f:
        cases = json.load(f)["cases"]
    out = {
        "reference": "numpy %s, scipy %s (curve_fit, polyfit)" % (np.__version__, scipy.__version__),
        "cases": [fit(c) for c in cases],
    }
    with open(sys.argv[2], "w") as f:
        json.dump(out, f)


if __name__ == "__main__":
    main()
