#!/usr/bin/python3
"""Independent reference for wave.Line.Propagate (angular-spectrum method)
and wave.Line.SecondMomentRadius.

Usage: /usr/bin/python3 wave_fft.py in.json out.json

in.json:
  {"cases": [{"re": [...], "im": [...],      # input samples u(x_i)
              "dx": ..., "lambda0": ..., "n": ...,
              "q_in": [re, im],               # beam parameter of the input
              "z": ..., "kernel": "paraxial" | "exact"}, ...]}
out.json:
  {"reference": "...", "cases": [{"re": [...], "im": [...],   # numpy.fft result
                                  "analytic_re": [...], "analytic_im": [...],
                                  "w2": ..., "w2_analytic": ..., "w_q": ...}]}

Sampling: x_i = (i - N/2) dx, i = 0..N-1, the optical axis at sample N/2
(package wave's convention). Spatial frequencies are numpy.fft.fftfreq(N, dx)
(cycles/m) in numpy's FFT order, kappa = 2 pi f. The propagation multiplies
the spectrum by a function of |kappa| only, which commutes with the
circular shift of the origin to sample N/2, so no fftshift is needed.

Sign convention (the one package wave documents, Kogelnik & Li 1966):
fields are complex envelopes u of exp(-i k z) waves, k = 2 pi n / lambda0.
A plane-wave component exp(-i (kx x + kz z)) has kz = sqrt(k^2 - kappa^2),
so relative to exp(-i k z) it advances by
    exact:     H = exp(-i z (kz - k)),   kz - k = -kappa^2/(kz + k)
               (the second form avoids cancellation; same value)
               evanescent (kappa > k): exp(+i k z) exp(-|z| sqrt(kappa^2 - k^2))
    paraxial:  H = exp(+i z kappa^2 / (2k))   (kz - k ~ -kappa^2/(2k))
(J. W. Goodman, Introduction to Fourier Optics, ch. 3-4 [from memory]). This is the
convention in which the Gaussian beam of Kogelnik & Li,
    u(x, z) = sqrt(i zR / q) exp(-i k x^2 / (2 q)),  q = q_in + z
(1-D slice), solves the paraxial wave equation; the script returns that
closed form too, so the FFT result also checks the sign convention against
the analytic beam, independently of the Go code. (With the opposite sign the
beam would be propagated by -z and the comparison would fail at O(1).)

The FFT is numpy.fft (pocketfft), independent of gonum's dsp/fourier, with
the standard normalisation: ifft(fft(u)) = u.

Second-moment radius (ISO 11146-1): W = 2 sqrt(<x^2> - <x>^2) with weights
|u|^2, computed with numpy; for a Gaussian it equals the 1/e^2 radius
w = sqrt(-lambda0 / (n pi Im(1/q))), returned as w_q.
"""
import json
import sys

import numpy as np
import scipy


def propagate(u, dx, lambda0, n, z, kernel):
    N = u.size
    k = 2.0 * np.pi * n / lambda0
    kappa = 2.0 * np.pi * np.fft.fftfreq(N, d=dx)
    k2 = kappa * kappa
    if kernel == "paraxial":
        h = np.exp(1j * z * k2 / (2.0 * k))
    elif kernel == "exact":
        h = np.empty(N, dtype=complex)
        prop = k2 <= k * k
        kz = np.sqrt(k * k - k2[prop])
        h[prop] = np.exp(-1j * z * (-k2[prop] / (kz + k)))
        gamma = np.sqrt(k2[~prop] - k * k)
        h[~prop] = np.exp(1j * k * z) * np.exp(-abs(z) * gamma)
    else:
        raise ValueError("unknown kernel %r" % kernel)
    return np.fft.ifft(h * np.fft.fft(u))


def second_moment_radius(u, x):
    p = np.abs(u) ** 2
    s = p.sum()
    mean = (p * x).sum() / s
    var = (p * (x - mean) ** 2).sum() / s
    return 2.0 * np.sqrt(var)


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    res = []
    for c in cases:
        u = np.asarray(c["re"], dtype=float) + 1j * np.asarray(c["im"], dtype=float)
        N = u.size
        dx, lam, n, z = float(c["dx"]), float(c["lambda0"]), float(c["n"]), float(c["z"])
        x = (np.arange(N) - N // 2) * dx
        out = propagate(u, dx, lam, n, z, c["kernel"])
        k = 2.0 * np.pi * n / lam
        q = complex(c["q_in"][0], c["q_in"][1]) + z
        zr = q.imag
        ana = np.sqrt(1j * zr / q) * np.exp(-1j * k * x * x / (2.0 * q))
        w_q = np.sqrt(-lam / (n * np.pi * (1.0 / q).imag))
        res.append({
            "re": out.real.tolist(), "im": out.imag.tolist(),
            "analytic_re": ana.real.tolist(), "analytic_im": ana.imag.tolist(),
            "w2": float(second_moment_radius(out, x)),
            "w2_analytic": float(second_moment_radius(ana, x)),
            "w_q": float(w_q),
        })
    ref = "numpy.fft angular spectrum, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": res}, fh)


if __name__ == "__main__":
    main()
