#!/usr/bin/python3
"""Independent reference for package couple: the Gaussian that fits the
exact LP01 mode of a weakly guiding step-index fibre best, against which
Marcuse's fit w/a = 0.65 + 1.619 V^-3/2 + 2.879 V^-6 is checked.

Usage: /usr/bin/python3 couple_lp01.py in.json out.json

in.json:
  {"v": [V, ...]}          V-numbers 2 pi a NA / lambda0, 0 < V < ~10
out.json:
  {"reference": "...",
   "cases": [{"v": V, "u": u, "w": w, "residual": r,
              "ratio": w_opt/a, "eta": eta_max, "quad_err": e,
              "power_err": p}]}

Method, written from the literature rather than from the Go code (the Go
code has no exact mode at all, only Marcuse's fit):

* LP01 eigenvalue equation of the weakly guiding step-index fibre (D.
  Gloge, "Weakly guiding fibers", Appl. Opt. 10, 2252-2258 (1971) [from
  memory]): u J1(u)/J0(u) = w K1(w)/K0(w), u^2 + w^2 = V^2, solved for u in
  (0, min(V, j01)) with scipy.optimize.brentq (j01 = 2.404826 the first
  zero of J0, where the left side has its pole); scipy.special.jv / kv.
  residual is the equation's |left - right| at the root.
* Field (radius in units of the core radius a = 1): psi(r) = J0(u r)/J0(u)
  in the core, K0(w r)/K0(w) in the cladding (continuous at r = 1; the
  eigenvalue equation makes the derivative continuous too).
* Overlap with the Gaussian g(r) = exp(-r^2/s^2) of 1/e^2 intensity radius
  s, both real and round:
      eta(s) = (int psi g r dr)^2 / (int psi^2 r dr * int g^2 r dr),
  int g^2 r dr = s^2/4, the other two integrals with scipy.integrate.quad
  split at r = 1 (core [0, 1], cladding [1, inf)). quad_err is the sum of
  the relative error estimates quad reports. power_err is the relative
  difference of the quadrature of int psi^2 r dr from its closed form by
  the Lommel integrals int x J0(x)^2 dx = x^2 (J0^2 + J1^2)/2 and
  int x K0(x)^2 dx = x^2 (K0^2 - K1^2)/2 (G. N. Watson, A Treatise on the
  Theory of Bessel Functions, 1944, section 5.11 [from memory]):
      int psi^2 r dr = (J0(u)^2 + J1(u)^2)/(2 J0(u)^2) + (K1(w)^2 - K0(w)^2)/(2 K0(w)^2)
* The optimum s maximises eta: scipy.optimize.minimize_scalar (bounded,
  s in [0.3, 20], xatol 1e-10) on -eta. ratio = s_opt (= w_opt/a), eta =
  eta(s_opt). Marcuse (Bell Syst. Tech. J. 56, 703-718 (1977) [from
  memory]) fitted his formula to this optimum-Gaussian radius.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate, optimize, special

J01 = special.jn_zeros(0, 1)[0]


def eigen(v):
    """u, w of the LP01 mode at V = v."""

    def f(u):
        w = np.sqrt(v * v - u * u)
        return u * special.jv(1, u) / special.jv(0, u) - w * special.kv(1, w) / special.kv(0, w)

    hi = min(v, J01) * (1 - 1e-12)
    # f(0+) = -V K1(V)/K0(V) < 0; f -> +inf at the pole j01 (V > j01) or
    # f(V-) = V J1(V)/J0(V) - 0 > 0 with w K1/K0 -> 1/ln(...) -> 0 (V < j01).
    u = optimize.brentq(f, 1e-9 * v, hi, xtol=1e-15, rtol=1e-15, maxiter=500)
    return u, float(np.sqrt(v * v - u * u)), abs(f(u))


def power_closed(u, w):
    j0, j1, k0, k1 = special.jv(0, u), special.jv(1, u), special.kv(0, w), special.kv(1, w)
    return (j0 * j0 + j1 * j1) / (2 * j0 * j0) + (k1 * k1 - k0 * k0) / (2 * k0 * k0)


def power(u, w):
    """int psi^2 r dr by quad, and the sum of quad's relative error estimates."""
    opts = dict(epsabs=0, epsrel=1e-12, limit=200)
    p1, e1 = integrate.quad(lambda r: (special.jv(0, u * r) / special.jv(0, u)) ** 2 * r, 0, 1, **opts)
    p2, e2 = integrate.quad(lambda r: (special.kv(0, w * r) / special.kv(0, w)) ** 2 * r, 1, np.inf, **opts)
    return p1 + p2, (e1 + e2) / (p1 + p2)


def overlap(u, w, s, pw, errs=None):
    """eta(s) for the mode (u, w) of power pw."""
    g = lambda r: np.exp(-r * r / (s * s))
    opts = dict(epsabs=0, epsrel=1e-12, limit=200)
    n1, e1 = integrate.quad(lambda r: special.jv(0, u * r) / special.jv(0, u) * g(r) * r, 0, 1, **opts)
    n2, e2 = integrate.quad(lambda r: special.kv(0, w * r) / special.kv(0, w) * g(r) * r, 1, np.inf, **opts)
    num = n1 + n2
    if errs is not None:
        errs.append((e1 + e2) / abs(num))
    return num * num / (pw * s * s / 4)


def main():
    with open(sys.argv[1]) as f:
        data = json.load(f)
    out = []
    for v in data["v"]:
        u, w, res = eigen(v)
        pw, perr = power(u, w)
        r = optimize.minimize_scalar(lambda s: -overlap(u, w, s, pw), bounds=(0.3, 20.0), method="bounded",
                                     options={"xatol": 1e-10})
        errs = []
        eta = overlap(u, w, r.x, pw, errs)
        out.append({"v": v, "u": u, "w": w, "residual": float(res), "ratio": float(r.x), "eta": float(eta),
                    "quad_err": float(errs[0] + perr), "power_err": float(abs(pw / power_closed(u, w) - 1))})
    with open(sys.argv[2], "w") as f:
        json.dump({"reference": "scipy %s brentq (LP01 eigenvalue), quad and minimize_scalar (optimum Gaussian)"
                   % scipy.__version__, "cases": out}, f)


if __name__ == "__main__":
    main()
