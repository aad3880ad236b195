#!/usr/bin/python3
"""Speed comparison: paraxial rays and a Gaussian caustic in NumPy, to set
beside beamnote's Go benchmarks (make bench). Run with `make compare`.

The same work as
  BenchmarkApply/rays=1e6/elements=10   1e6 rays through a composed 10-element matrix
  BenchmarkTrace/rays=1e6/elements=10   1e6 rays element by element (heights kept per element)
  BenchmarkSample/elements=20/samples=10000   w(z) of a beam at 1e4 planes of a 20-element path
done the idiomatic NumPy way (vectorised over rays or planes). Prints the median of 7 runs.
"""
import statistics
import time

import numpy as np

rng = np.random.default_rng(1)


def timeit(f, n=7):
    ts = []
    for _ in range(n):
        t0 = time.perf_counter()
        f()
        ts.append(time.perf_counter() - t0)
    return statistics.median(ts)


# A 10-element path: thin lenses and spaces, in metres.
mats = []
for i in range(10):
    if i % 2 == 0:
        mats.append(np.array([[1.0, rng.uniform(0.01, 0.2)], [0.0, 1.0]]))
    else:
        mats.append(np.array([[1.0, 0.0], [-1.0 / rng.uniform(0.05, 0.3), 1.0]]))
M = np.linalg.multi_dot(mats[::-1])
rays = np.stack([1e-3 * rng.random(1_000_000), 1e-3 * rng.random(1_000_000)])


def apply():
    return M @ rays


def trace():
    r = rays
    heights = np.empty((len(mats), r.shape[1]))
    for i, m in enumerate(mats):
        r = m @ r
        heights[i] = r[0]
    return heights


# Caustic: 20 elements (10 lenses, 10 spaces), 1e4 planes, q law per plane.
lam, w0 = 1064e-9, 1e-3
zr = np.pi * w0**2 / lam
gaps = rng.uniform(0.02, 0.1, 10)
focals = rng.uniform(0.05, 0.5, 10) * rng.choice([-1, 1], 10)
zs = np.linspace(0, gaps.sum(), 10_000)


def caustic():
    # The same quantities beam.Sample stores per plane: w, 1/R and the
    # accumulated Gouy phase (arctan of Re q / Im q, relative per gap).
    q = 1j * zr
    z0 = 0.0
    gouy0 = 0.0
    w = np.empty_like(zs)
    invr = np.empty_like(zs)
    gouy = np.empty_like(zs)
    for g, f in zip(gaps, focals):
        sel = (zs >= z0) & (zs < z0 + g)
        qz = q + (zs[sel] - z0)
        inv = 1 / qz
        w[sel] = np.sqrt(-lam / (np.pi * np.imag(inv)))
        invr[sel] = np.real(inv)
        gouy[sel] = gouy0 + np.arctan(np.real(qz) / np.imag(qz)) - np.arctan(np.real(q) / np.imag(q))
        gouy0 += np.arctan((np.real(q) + g) / np.imag(q)) - np.arctan(np.real(q) / np.imag(q))
        q = q + g
        q = q / (-q / f + 1)
        z0 += g
    return w, invr, gouy


print("numpy %s" % np.__version__)
print("apply 1e6 rays, composed 10-element matrix: %.2f ms" % (1e3 * timeit(apply)))
print("trace 1e6 rays element by element (10):    %.2f ms" % (1e3 * timeit(trace)))
print("caustic, 20 elements, 1e4 planes:          %.3f ms" % (1e3 * timeit(caustic)))
