"""95th percentiles of |X|, X ~ N(b, 1), the folded normal distribution,
for sim.AbsBiasP95 and sim.BiasStdForP95 (TestAbsBiasP95).

Run with Debian's python3-scipy 1.10.1 (numpy 1.24.2):
    /usr/bin/python3 testdata/reference/folded_normal.py > testdata/reference/folded_normal.json
"""
import json

import numpy
import scipy
from scipy.stats import foldnorm

rows = []
for b in [0.0, 0.5, 1.0, 2.0, 5.0]:
    # foldnorm(c) is |Y| for Y ~ N(c, 1).
    rows.append({"mean": b, "p95": float(foldnorm.ppf(0.95, b))})
print(json.dumps({"scipy": scipy.__version__, "numpy": numpy.__version__, "rows": rows}, indent=1))
