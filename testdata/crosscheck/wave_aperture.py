#!/usr/bin/python3
"""Independent reference for the focus of a clipped beam in package wave
(Grid.Clip, Grid.ThinLens, Grid.Propagate, Grid.EncircledPower,
Line.FirstMinimum).

Usage: /usr/bin/python3 wave_aperture.py in.json out.json

in.json:
  {"cases": [{"a": ...,            # aperture radius (m)
              "w": ... | null,     # 1/e^2 radius of the Gaussian at the
                                   # aperture (m); null = uniform illumination
              "lambda0": ..., "n": ..., "f": ...,  # vacuum wavelength, index,
                                                   # focal length (m)
              "x": [...],          # focal-plane radii at which to return I
              "ee_r": [...]}, ...]}  # radii for the encircled power
out.json:
  {"reference": "...",
   "airy": {"first_zero": j11/pi, "ee_first_zero": ...},
   "cases": [{"irradiance": [...],   # I(x)/P_t, 1/m^2
              "peak": ...,           # I(0)/P_t
              "first_min": ...,      # radius of the first zero of E(r), m
              "ee": [...],           # encircled fraction of P_t at ee_r
              "transmission": ...}]} # P_t / P_in (Gaussian only; 1 uniform)

Physics (Fraunhofer diffraction in the back focal plane of a thin lens,
circularly symmetric pupil; the Fourier-Bessel (Hankel) form of the
Fresnel integral): an input field u(rho), unit amplitude on axis, clipped
at rho = a, gives the focal field of modulus

    |E(r)| = (k/f) |int_0^a u(rho) J0(k rho r / f) rho d rho|,  k = 2 pi n / lambda0

normalised so that int |E|^2 2 pi r dr = int_0^a |u|^2 2 pi rho d rho = P_t
(Parseval for the Hankel transform). For u = exp(-rho^2/w^2) this is the
truncated-Gaussian focus of P. Belland & J. P. Crenn, "Changes in the
characteristics of a Gaussian beam weakly diffracted by a circular
aperture", Appl. Opt. 21, 522-527 (1982) [from memory]; for u = 1 it is the
Airy pattern, E = (k a^2/f) J1(v)/v with v = k a r/f, first zero at
v = j_{1,1} = 3.8317 (r = 1.21967 lambda f/D) and encircled energy
1 - J0(v)^2 - J1(v)^2 (Lord Rayleigh's formula; M. Born & E. Wolf,
Principles of Optics, sec. 8.5.2 [from memory]), 83.8 % at the first zero.

Everything here is computed with scipy.integrate.quad and scipy.special
(j0, j1, jn_zeros) and scipy.optimize.brentq, independent of the Go FFT
code. The uniform case is also done by quad, and the script checks it
against the closed forms before returning.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate, optimize, special


def field(r, a, w, k, f):
    """(k/f) int_0^a u(rho) J0(k rho r/f) rho d rho, by quad."""
    if w is None:
        g = lambda rho: special.j0(k * rho * r / f) * rho
    else:
        g = lambda rho: np.exp(-(rho / w) ** 2) * special.j0(k * rho * r / f) * rho
    # Absolute tolerance relative to the on-axis value of the uniform
    # integral, a^2/2: near a zero of E no relative tolerance can be met.
    val, _ = integrate.quad(g, 0.0, a, epsabs=1e-14 * a * a, epsrel=1e-12, limit=400)
    return k / f * val


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    j11 = special.jn_zeros(1, 1)[0]
    airy = {"first_zero": float(j11 / np.pi),
            "ee_first_zero": float(1.0 - special.j0(j11) ** 2 - special.j1(j11) ** 2)}
    res = []
    for c in cases:
        a, w, lam, n, f = c["a"], c["w"], c["lambda0"], c["n"], c["f"]
        k = 2.0 * np.pi * n / lam
        if w is None:
            pt = np.pi * a * a
            trans = 1.0
        else:
            pt = 0.5 * np.pi * w * w * -np.expm1(-2.0 * a * a / (w * w))
            trans = float(-np.expm1(-2.0 * a * a / (w * w)))
        E = lambda r: field(r, a, w, k, f)
        irr = [E(x) ** 2 / pt for x in c["x"]]
        # First zero of E(r): scan outward in steps of 0.05 lambda f/a and
        # refine the first sign change with brentq.
        step = 0.05 * lam / n * f / a
        r0, e0 = 0.0, E(0.0)
        first = None
        for i in range(1, 2000):
            r1 = i * step
            e1 = E(r1)
            if e0 * e1 < 0:
                first = optimize.brentq(E, r0, r1, xtol=1e-15 * f, rtol=1e-14)
                break
            r0, e0 = r1, e1
        ee = [integrate.quad(lambda r: E(r) ** 2 * 2 * np.pi * r, 0.0, R,
                             epsabs=0.0, epsrel=1e-10, limit=200)[0] / pt for R in c["ee_r"]]
        if w is None:
            # The quad results must match the closed forms of the Airy pattern.
            v = lambda r: k * a * r / f
            for x, got in zip(c["x"], irr):
                vv = v(x)
                want = (k * a * a / f * (0.5 if vv == 0 else special.j1(vv) / vv)) ** 2 / pt
                assert abs(got - want) <= 1e-9 * (k * a * a / f * 0.5) ** 2 / pt, (x, got, want)
            assert abs(v(first) - j11) < 1e-9, (v(first), j11)
            for R, got in zip(c["ee_r"], ee):
                want = 1.0 - special.j0(v(R)) ** 2 - special.j1(v(R)) ** 2
                assert abs(got - want) < 1e-8, (R, got, want)
        res.append({"irradiance": [float(v) for v in irr], "peak": float(E(0.0) ** 2 / pt),
                    "first_min": None if first is None else float(first),
                    "ee": [float(v) for v in ee], "transmission": trans})
    ref = "scipy.integrate.quad Fourier-Bessel focus, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "airy": airy, "cases": res}, fh)


if __name__ == "__main__":
    main()
