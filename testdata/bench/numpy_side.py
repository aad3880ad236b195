#!/usr/bin/python3
"""The NumPy side of `make compare` (testdata/bench/compare/main.go).

Reads the cases the Go side wrote (JSON and raw float64 ray files), times
the same work done the idiomatic NumPy way (vectorised over rays or
planes, preallocated outputs), and writes the median times in ms and
checksums of the results as JSON:

  python3 numpy_side.py in.json out.json
"""
import json
import statistics
import sys
import time

import numpy as np


def median_ms(f, runs):
    f()
    ts = []
    for _ in range(runs):
        t0 = time.perf_counter()
        f()
        ts.append(time.perf_counter() - t0)
    return 1e3 * statistics.median(ts)


def main():
    with open(sys.argv[1]) as fh:
        cfg = json.load(fh)
    runs = cfg["runs"]
    ys = np.fromfile(cfg["y_file"], dtype="<f8")
    thetas = np.fromfile(cfg["theta_file"], dtype="<f8")
    n = ys.size
    ms, sums = {}, {}

    # apply: the composed matrix on 10^6 rays, heights and angles stored.
    a, b, c, d = cfg["apply"]
    M = np.array([[a, b], [c, d]])
    rays = np.stack([ys, thetas])
    res = np.empty_like(rays)
    ms["apply"] = median_ms(lambda: np.matmul(M, rays, out=res), runs)
    sums["apply"] = float(res.sum())

    # trace: element by element, the height of every ray at every element
    # (one row per element) and the vignetting flag per ray, tested as
    # paraxial.System.Trace does: a space's opening at both ends, a
    # surface's against the arriving ray.
    elems = cfg["trace"]
    H = np.empty((len(elems), n))
    t = np.empty(n)
    tmp = np.empty(n)
    blocked = np.empty(n, dtype=bool)
    btmp = np.empty(n, dtype=bool)

    def test(v, lim):
        np.less(v, lim[0], out=btmp)
        np.logical_or(blocked, btmp, out=blocked)
        np.greater(v, lim[1], out=btmp)
        np.logical_or(blocked, btmp, out=blocked)

    def trace():
        t[:] = thetas
        blocked[:] = False
        prev = ys
        for i, e in enumerate(elems):
            out = H[i]
            lim = e.get("lim")
            if lim:
                test(prev, lim)
            if e["kind"] == "space":
                np.multiply(t, e["d"], out=tmp)
                np.add(prev, tmp, out=out)
                if lim:
                    test(out, lim)
            else:
                A, B, C, D = e["x"]
                if A == 1 and B == 0:  # y unchanged
                    out[:] = prev
                else:
                    np.multiply(prev, A, out=out)
                    np.multiply(t, B, out=tmp)
                    np.add(out, tmp, out=out)
                np.multiply(prev, C, out=tmp)
                np.multiply(t, D, out=t)
                np.add(t, tmp, out=t)
            prev = out

    ms["trace"] = median_ms(trace, runs)
    sums["trace"] = float(H.sum())
    sums["trace_blocked"] = float(blocked.sum())
    del H

    # caustic: per homogeneous stretch the closed forms of beam.Sample in
    # both planes, q(z) = q0 + d, w = sqrt(lambda/(pi zR)) |q|,
    # 1/R = Re q/|q|^2; a surface transforms q; samples on linspace(0, L, n)
    # merged with the surface positions and the real waists. Like
    # beam.Sample, it leaves the Gouy phase per sample to be computed on
    # demand (Caustic.GouyPhase), keeping the phase at each stretch's start.
    cc = cfg["caustic"]
    L = cc["length"]
    lam0, m2 = cc["lambda0"], cc["m2"]
    q_in = [complex(*cc["q"][0]), complex(*cc["q"][1])]

    def caustic():
        q = list(q_in)
        nidx = cc["n_in"]
        gouy = [0.0, 0.0]
        segs = []
        extra = []
        for e in cc["elements"]:
            z = e["z"]
            if e["kind"] == "space":
                dz = e["d"]
                segs.append((z, z + dz, list(q), list(gouy), nidx))
                for p in range(2):
                    zw = z - q[p].real
                    if max(z, 0.0) <= zw <= min(z + dz, L) and 0 < zw < L:
                        extra.append(zw)
                    gouy[p] += np.arctan((q[p].real + dz) / q[p].imag) - np.arctan(q[p].real / q[p].imag)
                    q[p] += dz
            else:
                if 0 < z < L:
                    extra.append(z)
                for p, key in enumerate(("x", "y")):
                    A, B, C, D = e[key]
                    gouy[p] += -np.angle(A + B / q[p])
                    q[p] = (A * q[p] + B) / (C * q[p] + D)
                nidx = e["n_out"]
        # The plane at L lies after any surface there.
        segs.append((L, L, list(q), list(gouy), nidx))
        zs = np.unique(np.concatenate([np.linspace(0.0, L, cc["samples"]), extra]))
        zs[-1] = L
        m = zs.size
        W = np.empty((2, m))
        K = np.empty((2, m))
        idx = np.empty(m)
        for si, (s, e, qs, gs, nn) in enumerate(segs):
            lo = np.searchsorted(zs, s, "left")
            hi = m if si == len(segs) - 1 else np.searchsorted(zs, e, "left")
            if hi <= lo:
                continue
            dd = zs[lo:hi] - s
            for p in range(2):
                z0, zr = qs[p].real, qs[p].imag
                k = np.sqrt(m2[p] * lam0 / nn / (np.pi * zr))
                zz = z0 + dd
                r2 = zz * zz + zr * zr
                W[p, lo:hi] = k * np.sqrt(r2)
                K[p, lo:hi] = zz / r2
            idx[lo:hi] = nn
        return zs, W, K, idx

    ms["caustic"] = median_ms(caustic, runs)
    zs, W, K, idx = caustic()
    sums["caustic_n"] = float(zs.size)
    sums["caustic"] = float(W.sum() + K.sum() + idx.sum())

    # realtrace: 10^6 skew rays through ten refracting spheres, exactly:
    # to each vertex's tangent plane, then to the sphere (the stable
    # quadratic root), the clear aperture, Snell's law in vector form;
    # vectorised over rays, surface by surface, the failed rays masked out.
    R0 = [np.fromfile(f, dtype="<f8") for f in cfg["real_files"]]

    def realtrace():
        x, y, z, L, M, N = (v.copy() for v in R0)
        opl = np.zeros_like(x)
        ok = np.ones(x.size, dtype=bool)
        with np.errstate(invalid="ignore", divide="ignore"):
            for s in cfg["real_surfaces"]:
                c, n = s["c"], s["n"]
                zi = z - s["dz"]
                t0 = -zi / N
                x0 = x + t0 * L
                y0 = y + t0 * M
                b = c * (x0 * L + y0 * M) - N
                cc = c * (x0 * x0 + y0 * y0)
                a = c
                d = b * b - a * cc
                q = -(b + np.copysign(np.sqrt(d), b))
                t1 = cc / q
                t = t0 + t1
                ok &= (d >= 0) & (q != 0)
                x = x0 + t1 * L
                y = y0 + t1 * M
                z = t1 * N
                opl += n * t
                if s["image"]:
                    continue
                ok &= t >= 0
                g3 = 1 - c * z
                ok &= g3 > 0
                if s["a2"] >= 0:
                    ok &= x * x + y * y <= s["a2"]
                nx, ny = -c * x, -c * y
                cosI = L * nx + M * ny + N * g3
                mu = s["mu"]
                c2 = 1 - mu * mu * (1 - cosI * cosI)
                ok &= c2 >= 0
                g = np.copysign(np.sqrt(c2), cosI) - mu * cosI
                L = mu * L + g * nx
                M = mu * M + g * ny
                N = mu * N + g * g3
        return x, y, L, M, N, opl, ok

    ms["realtrace"] = median_ms(realtrace, runs)
    x, y, L, M, N, opl, ok = realtrace()
    sums["realtrace"] = float((x[ok] + y[ok] + L[ok] + M[ok] + N[ok] + opl[ok]).sum())
    sums["realtrace_n"] = float(ok.sum())

    with open(sys.argv[2], "w") as fh:
        json.dump({"numpy": np.__version__, "ms": ms, "sums": sums}, fh)


main()
