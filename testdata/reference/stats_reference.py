#!/usr/bin/python3
"""Reference numbers for the statistics and sampling tests of package mc.

Writes stats_reference.json beside this script. Run with Debian's SciPy and NumPy
(apt-get install python3-scipy python3-numpy), not a pyenv interpreter:

    /usr/bin/python3 testdata/reference/stats_reference.py

Contents:
- clopper_pearson: two-sided exact binomial intervals at confidence 1-alpha,
  lower = beta.ppf(alpha/2, k, n-k+1) (0 when k = 0),
  upper = beta.ppf(1-alpha/2, k+1, n-k) (1 when k = n)
  (C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934)).
- zero_failure_upper: one-sided upper bound with no events in n trials,
  1 - (1-confidence)^(1/n), beside beta.ppf(confidence, 1, n), which is the same.
- quantiles: numpy.quantile(method='linear') (Hyndman and Fan type 7), with
  numpy.mean and numpy.std(ddof=1) of the same data.
- normal_quantile: scipy.stats.norm.ppf.
- sobol_unscrambled: scipy.stats.qmc.Sobol(d, scramble=False) points in SciPy's
  Gray-code order, from index start (via fast_forward).
- percentile_coverage_normal_mean: the large-B coverage of the bootstrap
  percentile interval for the mean of n normal values, which is close to
  mean +- z s sqrt((n-1)/n) / sqrt(n): P(|t_(n-1)| < z sqrt((n-1)/n)),
  z = norm.ppf((1+confidence)/2).
- ishigami: analytic Sobol' indices of f = sin x1 + a sin^2 x2 + b x3^4 sin x1,
  x_i uniform on [-pi, pi] (T. Ishigami and T. Homma, Proc. ISUMA 1990, 398;
  variances as in A. Saltelli et al., Global Sensitivity Analysis: The Primer,
  Wiley 2008, sec. 4.6 (from memory)).
"""
import json
import math
import os
import platform

import numpy as np
import scipy
from scipy import stats
from scipy.stats import qmc


def clopper_pearson(k, n, confidence):
    alpha = 1 - confidence
    lower = 0.0 if k == 0 else float(stats.beta.ppf(alpha / 2, k, n - k + 1))
    upper = 1.0 if k == n else float(stats.beta.ppf(1 - alpha / 2, k + 1, n - k))
    return {"k": k, "n": n, "confidence": confidence, "lower": lower, "upper": upper}


CP_CASES = [
    (0, 10, 0.95), (5, 10, 0.95), (1, 10, 0.95), (9, 10, 0.95), (10, 10, 0.95),
    (0, 1, 0.95), (1, 1, 0.95), (3, 50, 0.90), (47, 50, 0.99), (0, 100, 0.95),
    (1, 1000, 0.95), (999, 1000, 0.95), (500, 1000, 0.6827), (12, 37, 0.80),
    (0, 3000, 0.95), (2, 20000, 0.95),
]

QUANTILE_DATA = [
    [3.1, -0.4, 2.7, 2.7, 0.0, 5.9, 1.2, -2.3, 4.4, 0.8, 10.5],
    [0.93, 0.97, 0.88, 0.99, 0.95, 0.91],
    [2.5, -1.0],
    [7.25],
]
PROBS = [0.0, 0.01, 0.05, 0.1, 0.25, 1 / 3, 0.5, 0.75, 0.9, 0.95, 0.99, 1.0]

NORMAL_P = [1e-12, 1e-6, 0.001, 0.025, 0.1, 0.3, 0.5, 0.7, 0.8413447460685429,
            0.975, 0.999, 1 - 1e-6]


def sobol_points(d, start, count):
    s = qmc.Sobol(d, scramble=False)
    if start:
        s.fast_forward(start)
    return {"dim": d, "start": start, "points": s.random(count).tolist()}


def ishigami(a, b):
    pi = math.pi
    v1 = 0.5 * (1 + b * pi**4 / 5) ** 2
    v2 = a**2 / 8
    v13 = b**2 * pi**8 * (1 / 18 - 1 / 50)
    v = v1 + v2 + v13
    return {
        "a": a, "b": b, "variance": v,
        "first": [v1 / v, v2 / v, 0.0],
        "total": [(v1 + v13) / v, v2 / v, v13 / v],
    }


def main():
    out = {
        "generated_by": "testdata/reference/stats_reference.py",
        "versions": {
            "python": platform.python_version(),
            "numpy": np.__version__,
            "scipy": scipy.__version__,
        },
        "clopper_pearson": [clopper_pearson(*c) for c in CP_CASES],
        "zero_failure_upper": [
            {"n": n, "confidence": 0.95, "upper": 1 - 0.05 ** (1 / n),
             "beta_ppf": float(stats.beta.ppf(0.95, 1, n))}
            for n in (1, 3, 10, 30, 100, 300, 1000, 3000)
        ],
        "quantiles": [
            {"data": x, "p": PROBS,
             "linear": [float(q) for q in np.quantile(np.array(x), PROBS, method="linear")],
             "mean": float(np.mean(x)),
             "std_ddof1": float(np.std(x, ddof=1)) if len(x) > 1 else None}
            for x in QUANTILE_DATA
        ],
        "normal_quantile": [{"p": p, "x": float(stats.norm.ppf(p))} for p in NORMAL_P],
        "sobol_unscrambled": [
            sobol_points(32, 0, 64),
            sobol_points(256, 1048573, 8),
        ],
        "percentile_coverage_normal_mean": [
            {"n": n, "confidence": 0.95,
             "coverage": float(2 * stats.t.cdf(stats.norm.ppf(0.975) * math.sqrt((n - 1) / n), n - 1) - 1)}
            for n in (50, 100)
        ],
        "ishigami": ishigami(7.0, 0.1),
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "stats_reference.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
