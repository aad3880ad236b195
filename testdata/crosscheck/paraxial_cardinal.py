#!/usr/bin/python3
"""Independent reference for paraxial.System.Cardinal.

Usage: /usr/bin/python3 paraxial_cardinal.py in.json out.json

in.json:
  {"cases": [{"n_in": 1.0,
              "elements": [{"kind": "space", "d": ...},
                           {"kind": "thick", "c1": ..., "c2": ..., "t": ..., "n": ...},
                           {"kind": "thin", "f": ...},
                           {"kind": "sphere", "c": ..., "n2": ...}, ...]}]}
  Curvatures c = 1/R in 1/m (0 for a flat surface, which JSON cannot write
  as R = inf); a thick lens sits in the current medium on both sides.
out.json:
  {"reference": "...", "cases": [{"power", "efl", "ffl", "bfl", "front_focal",
    "rear_focal", "front_principal", "rear_principal", "front_nodal",
    "rear_nodal", "z1", "z2", "n_out", "thick_lens_closed_form": {...} or null}]}
  All positions in metres from the input plane.

Method 1 (every case): reduced ray-transfer matrices acting on (y, n u),
det = 1 (A. Gerrard & J. M. Burch, Introduction to Matrix Methods in
Optics, Wiley 1975, ch. II [from memory]):
    refraction at a sphere of curvature c, n -> n2:  [[1, 0], [-(n2 - n) c, 1]]
    thin lens f in index n:                          [[1, 0], [-n/f, 1]]
    transfer over d in index n:                      [[1, d/n], [0, 1]]
composed with numpy from the first to the last optical surface (z1, z2).
The power is Phi = -C of the reduced matrix. The cardinal points are then
found by tracing their DEFINING rays with that matrix (numpy.linalg.solve
for the rays that must emerge in a given way), not from closed formulas:
  F', H':  a ray entering parallel to the axis at height 1 crosses the
           axis at F' after the last vertex; its backward extension reaches
           height 1 at the rear principal plane H'.
  F, H:    the ray that leaves parallel to the axis at height 1 came from
           the axis at F; its forward extension reaches height 1 at H.
  N, N':   the ray that leaves with the same (un-reduced) angle as it came
           in crosses the axis at N in object space and at N' in image space.
  EFL = 1/Phi, FFL = z1 - F, BFL = F' - z2.
Method 2 (single thick lens in air only): the thick-lens closed forms of
W. J. Smith, Modern Optical Engineering, 4th ed., McGraw-Hill 2008, ch. 2
[from memory]:
    1/f = (nl - 1)[1/R1 - 1/R2 + (nl - 1) d/(nl R1 R2)]
    h1 = -f (nl - 1) d/(R2 nl),  h2 = -f (nl - 1) d/(R1 nl)
with h1 measured from the front vertex to H and h2 from the back vertex to
H' (positive to the right), written with curvatures c = 1/R; BFL = f + h2,
FFL = f - h1.
"""
import json
import sys

import numpy as np
import scipy


def expand(elements):
    """Expand thick lenses into sphere / space / sphere."""
    out = []
    for el in elements:
        if el["kind"] == "thick":
            out.append({"kind": "sphere", "c": el["c1"], "n2": el["n"], "_thick": True})
            out.append({"kind": "space", "d": el["t"]})
            out.append({"kind": "sphere", "c": el["c2"], "n2": None, "_back": True})
        else:
            out.append(el)
    return out


def lens_matrix(n_in, elements):
    els = expand(elements)
    # positions of optical surfaces
    pos, n, nb = 0.0, n_in, None
    seq = []  # ("space", d, n) or ("surf", reduced matrix, z)
    for el in els:
        if el["kind"] == "space":
            seq.append(("space", el["d"], n))
            pos += el["d"]
            continue
        if el["kind"] == "sphere":
            if el.get("_thick"):
                nb = n
            n2 = el["n2"] if not el.get("_back") else nb
            seq.append(("surf", np.array([[1.0, 0.0], [-(n2 - n) * el["c"], 1.0]]), pos))
            n = n2
        else:
            seq.append(("surf", np.array([[1.0, 0.0], [-n / el["f"], 1.0]]), pos))
    surf_idx = [i for i, s in enumerate(seq) if s[0] == "surf"]
    first, last = surf_idx[0], surf_idx[-1]
    m = np.eye(2)
    for s in seq[first:last + 1]:
        if s[0] == "space":
            m = np.array([[1.0, s[1] / s[2]], [0.0, 1.0]]) @ m
        else:
            m = s[1] @ m
    return m, seq[first][2], seq[last][2], n


def trace_cardinal(n_in, elements):
    m, z1, z2, n_out = lens_matrix(n_in, elements)
    n, n2 = n_in, n_out
    phi = -m[1, 0]
    # rear: parallel ray at height 1 (reduced angle 0)
    y2, nu2 = m @ np.array([1.0, 0.0])
    u2 = nu2 / n2
    rear_focal = z2 - y2 / u2
    rear_principal = z2 + (1.0 - y2) / u2
    # front: ray that emerges parallel at height 1
    y1, nu1 = np.linalg.solve(m, np.array([1.0, 0.0]))
    u1 = nu1 / n
    front_focal = z1 - y1 / u1
    front_principal = z1 + (1.0 - y1) / u1
    # nodal: un-reduced angle 1 in and out; unknown y1:
    #   m @ [y1, n*1] = [y2, n2*1]  ->  m[1,0] y1 + m[1,1] n = n2
    yn = (n2 - m[1, 1] * n) / m[1, 0]
    yn2 = m[0, 0] * yn + m[0, 1] * n
    front_nodal = z1 - yn / 1.0
    rear_nodal = z2 - yn2 / 1.0
    return {
        "power": phi, "efl": 1.0 / phi,
        "ffl": z1 - front_focal, "bfl": rear_focal - z2,
        "front_focal": front_focal, "rear_focal": rear_focal,
        "front_principal": front_principal, "rear_principal": rear_principal,
        "front_nodal": front_nodal, "rear_nodal": rear_nodal,
        "z1": z1, "z2": z2, "n_out": n2, "det_check": float(np.linalg.det(m)),
    }


def thick_lens_closed_form(n_in, elements):
    """Thick-lens closed forms (Smith, Modern Optical Engineering, ch. 2
    [from memory]) for a single thick lens in air."""
    lenses = [e for e in elements if e["kind"] == "thick"]
    others = [e for e in elements if e["kind"] not in ("thick", "space")]
    if n_in != 1.0 or len(lenses) != 1 or others:
        return None
    L = lenses[0]
    nl, d, c1, c2 = L["n"], L["t"], L["c1"], L["c2"]
    inv_f = (nl - 1.0) * (c1 - c2 + (nl - 1.0) * d * c1 * c2 / nl)
    f = 1.0 / inv_f
    h1 = -f * (nl - 1.0) * d * c2 / nl
    h2 = -f * (nl - 1.0) * d * c1 / nl
    z1 = 0.0
    for e in elements:
        if e["kind"] == "thick":
            break
        z1 += e["d"]
    z2 = z1 + d
    return {"efl": f, "front_principal": z1 + h1, "rear_principal": z2 + h2,
            "bfl": f + h2, "ffl": f - h1}


def main():
    with open(sys.argv[1]) as fh:
        cases = json.load(fh)["cases"]
    res = []
    for c in cases:
        r = trace_cardinal(c["n_in"], c["elements"])
        r = {k: float(v) for k, v in r.items()}
        h = thick_lens_closed_form(c["n_in"], c["elements"])
        r["thick_lens_closed_form"] = None if h is None else {k: float(v) for k, v in h.items()}
        res.append(r)
    ref = "reduced ABCD matrices and defining-ray traces, numpy %s, scipy %s" % (np.__version__, scipy.__version__)
    with open(sys.argv[2], "w") as fh:
        json.dump({"reference": ref, "cases": res}, fh)


if __name__ == "__main__":
    main()
