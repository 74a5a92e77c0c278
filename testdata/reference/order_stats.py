#!/usr/bin/python3
"""Reference ranks of the exact order-statistic bounds of package stats.

Writes order_stats.json beside this script. Run with Debian's SciPy
(apt-get install python3-scipy), not a pyenv interpreter:

    /usr/bin/python3 testdata/reference/order_stats.py

For n observations, quantile level p and confidence c:
- lower: the largest r with binom.cdf(r-1, n, p) <= 1-c, the rank of the
  one-sided lower bound X(r) on the p-quantile (0 when none exists);
  binom.ppf(1-c, n, p) is given beside it (r = ppf unless the cdf hits 1-c
  exactly, when r = ppf + 1).
- upper: the smallest s with binom.cdf(s-1, n, p) >= c, that is
  s = binom.ppf(c, n, p) + 1 (0 when s would exceed n).
- min_n_lower: the smallest n with binom.cdf(r-1, n, p) <= 1-c for rank r
  (Wilks, Ann. Math. Stat. 12, 91 (1941)).
- coverage_lower: binom.sf(r-1, n, p), the exact coverage of X(r) for a
  continuous distribution.
(G. J. Hahn, W. Q. Meeker and L. A. Escobar, Statistical Intervals, 2nd ed.,
2017, ch. 5; H. A. David and H. N. Nagaraja, Order Statistics, 2003, sec. 7.1.)
"""
import json
import os
import sys

import scipy
from scipy.stats import binom


def lower(n, p, c):
    r = 0
    for k in range(1, n + 1):
        if binom.cdf(k - 1, n, p) <= 1 - c:
            r = k
        else:
            break
    return r


def upper(n, p, c):
    s = int(binom.ppf(c, n, p)) + 1
    return s if s <= n else 0


def min_n_lower(r, p, c):
    n = r
    while binom.cdf(r - 1, n, p) > 1 - c:
        n += 1
    return n


cases = []
for n in (1, 10, 20, 58, 59, 60, 92, 93, 100, 298, 299, 300, 1000, 5000):
    for p in (0.01, 0.05, 0.5, 0.95, 0.99):
        for c in (0.9, 0.95, 0.975, 0.99):
            r = lower(n, p, c)
            cases.append({
                "n": n, "p": p, "confidence": c,
                "lower": r,
                "lower_ppf": float(binom.ppf(1 - c, n, p)),
                "upper": upper(n, p, c),
                "coverage_lower": float(binom.sf(r - 1, n, p)) if r else None,
            })
min_n = []
for r in (1, 2, 3):
    for p in (0.01, 0.05, 0.1, 0.5):
        for c in (0.9, 0.95, 0.99):
            min_n.append({"rank": r, "p": p, "confidence": c, "n": min_n_lower(r, p, c)})

out = {
    "versions": {"python": sys.version.split()[0], "scipy": scipy.__version__},
    "bounds": cases,
    "min_n_lower": min_n,
}
path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "order_stats.json")
with open(path, "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
