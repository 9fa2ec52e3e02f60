"""Reference values for analysis/stats/robust_test.go.

Run with Debian's Python: /usr/bin/python3 analysis/stats/testdata/robustref.py
(statsmodels 0.13.5, numpy, scipy 1.10.1). Reads the NIST StRD files in place
from ../shared/reference/nist-strd (beside the checkout) and prints, for the
straight line y = b0 + b1 x fitted by statsmodels OLS:

  * HC3:  OLS(y, add_constant(x)).fit(cov_type="HC3")
  * HAC:  OLS(y, add_constant(x)).fit(cov_type="HAC",
              cov_kwds={"maxlags": L, "kernel": "bartlett", "use_correction": False})
          with L = floor(4 (n/100)^(2/9)) and rows in the given order;
          use_correction=False is stated explicitly (it is statsmodels'
          default for HAC: no n/(n-k) small-sample factor).
  * lag-1 autocorrelations: statsmodels.tsa.stattools.acf(v, nlags=1, fft=False)[1]

Each slope interval is statsmodels' conf_int(alpha=0.05) (normal quantiles,
as fit(cov_type=...) uses use_t=False by default).
"""
import math
import os
import sys

import numpy as np
import statsmodels
import statsmodels.api as sm
from statsmodels.tsa.stattools import acf

here = os.path.dirname(os.path.abspath(__file__))
ref = os.path.normpath(os.path.join(here, "..", "..", "..", "..", "..", "shared", "reference", "nist-strd"))
if len(sys.argv) > 1:
    ref = sys.argv[1]


def strd(name):
    rows = []
    with open(os.path.join(ref, name)) as f:
        data = False
        for line in f:
            if line.strip().startswith("Data:") and line.split()[1:2] == ["y"]:
                data = True  # the column header of the data block
                continue
            if data and line.strip():
                rows.append([float(v) for v in line.split()])
    return np.array(rows)


def report(label, x, y):
    n = len(x)
    L = int(math.floor(4 * (n / 100.0) ** (2.0 / 9.0)))
    X = sm.add_constant(x)
    hc3 = sm.OLS(y, X).fit(cov_type="HC3")
    hac = sm.OLS(y, X).fit(cov_type="HAC", cov_kwds={"maxlags": L, "kernel": "bartlett", "use_correction": False})
    hacc = sm.OLS(y, X).fit(cov_type="HAC", cov_kwds={"maxlags": L, "kernel": "bartlett", "use_correction": True})
    print(f"{label}: n = {n}, maxlags L = {L}")
    print(f"  HC3 slope SE {hc3.bse[1]!r}, 95% CI {tuple(hc3.conf_int(0.05)[1])!r}")
    print(f"  HAC slope SE {hac.bse[1]!r}, 95% CI {tuple(hac.conf_int(0.05)[1])!r}")
    print(f"  HAC with use_correction=True (n/(n-k) factor), slope SE {hacc.bse[1]!r}")
    print(f"  lag-1 acf x {acf(x, nlags=1, fft=False)[1]!r}, y {acf(y, nlags=1, fft=False)[1]!r}")


print(f"statsmodels {statsmodels.__version__}, numpy {np.__version__}")
lon = strd("Longley.dat")
order = np.argsort(lon[:, 6], kind="stable")  # by year (x6)
report("Longley: y = total employment, x = GNP (x2), in order of year (x6)", lon[order, 2], lon[order, 0])
nor = strd("Norris.dat")
report("Norris: y against x, in file order", nor[:, 1], nor[:, 0])
