#!/usr/bin/python3
"""Independent reference for package tolerance: the statistics and the
histogram of the goal values of a Monte Carlo run, computed with numpy
from the same values.

Usage: /usr/bin/python3 tolerance_stats.py in.json out.json

in.json:
  {"goals": [{"values": [...], "edges": [...], "lo": lo, "hi": hi}]}
  the finite values of one goal over the builds (in build order), the
  histogram's bin edges, and the wanted range [lo, hi] (null for an open
  side).
out.json:
  {"reference": "...", "goals": [{"mean": m, "std": s, "min": a,
   "max": b, "p05": q, "p50": q, "p95": q, "counts": [...], "met": k}]}

Method, written from the numpy documentation rather than from the Go code:

* mean: numpy.mean (pairwise summation); std: numpy.std with ddof=1 (the
  sample standard deviation with n - 1 in the denominator).
* percentiles: numpy.percentile with method="interpolated_inverted_cdf"
  (Hyndman & Fan's definition 4, the inverse of the piecewise-linear
  empirical CDF; R. J. Hyndman & Y. Fan, Am. Stat. 50, 361 (1996)).
* histogram: numpy.histogram with the given edges (half-open bins, the
  last one closed; the Go edges put the largest value below the last
  edge, so both conventions count the same).
* met: the number of values with lo <= v <= hi.
"""
import json
import sys

import numpy as np


def main():
    with open(sys.argv[1]) as f:
        data = json.load(f)
    out = []
    for g in data["goals"]:
        v = np.asarray(g["values"], dtype=np.float64)
        lo = -np.inf if g["lo"] is None else g["lo"]
        hi = np.inf if g["hi"] is None else g["hi"]
        counts, _ = np.histogram(v, bins=np.asarray(g["edges"], dtype=np.float64))
        p = np.percentile(v, [5, 50, 95], method="interpolated_inverted_cdf")
        out.append({
            "mean": float(np.mean(v)),
            "std": float(np.std(v, ddof=1)),
            "min": float(np.min(v)),
            "max": float(np.max(v)),
            "p05": float(p[0]), "p50": float(p[1]), "p95": float(p[2]),
            "counts": [int(c) for c in counts],
            "met": int(np.count_nonzero((v >= lo) & (v <= hi))),
        })
    with open(sys.argv[2], "w") as f:
        json.dump({"reference": "numpy " + np.__version__, "goals": out}, f)


if __name__ == "__main__":
    main()
