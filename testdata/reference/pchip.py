#!/usr/bin/python3
"""PCHIP reference values for the tabulated-ramp tests (sim/tabulated_test.go).

Writes pchip.json beside this script: for a few small ramp tables (t in s,
omega in rad/s), scipy.interpolate.PchipInterpolator's value and its
antiderivative (zero at t = 0) at points inside every interval and at the
rows. The tables exercise the branches of the Fritsch-Carlson slopes: a
flat stretch and a local maximum (zero slopes), the one-sided end formula,
its sign guard and its 3 * secant clamp, and the two-row (linear) case.

Run with Debian's SciPy:  /usr/bin/python3 testdata/reference/pchip.py
"""
import json
import os
import platform

import numpy as np
import scipy
from scipy.interpolate import PchipInterpolator

TABLES = [
    # overshooting ramp with a flat stretch; start slope hits the sign guard
    ([0, 1e-5, 2.5e-5, 3e-5, 5e-5, 6e-5, 8e-5, 1e-4],
     [0, 40, 300, 300, 700, 1100, 1050, 1000]),
    # start slope hits the 3 * secant clamp; speed reverses inside
    ([0, 1e-5, 2e-5, 3e-5],
     [0, 100, -900, 500]),
    # three rows, unequal spacing
    ([0, 2e-5, 1.5e-4], [0, 200, 250]),
    # two rows: linear
    ([0, 4e-5], [0, 300]),
]


def main():
    out = {
        "versions": {"python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__},
        "tables": [],
    }
    for t, w in TABLES:
        t = np.array(t, dtype=float)
        w = np.array(w, dtype=float)
        p = PchipInterpolator(t, w)
        anti = p.antiderivative()
        pts = sorted(set(list(t) + [a + f * (b - a) for a, b in zip(t[:-1], t[1:]) for f in (0.1, 0.37, 0.5, 0.81)]))
        pts = np.array(pts)
        out["tables"].append({
            "t": t.tolist(),
            "omega": w.tolist(),
            "points": pts.tolist(),
            "speed": p(pts).tolist(),
            "angle": (anti(pts) - anti(t[0])).tolist(),
        })
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "pchip.json")
    with open(path, "w") as fh:
        json.dump(out, fh, indent=1)
        fh.write("\n")


if __name__ == "__main__":
    main()
