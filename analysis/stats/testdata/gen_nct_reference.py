#!/usr/bin/python3
"""Reference values of the noncentral t for nct_test.go.

Run from the repository root:

    /usr/bin/python3 analysis/stats/testdata/gen_nct_reference.py \
        > analysis/stats/testdata/nct_reference.csv

Debian's scipy 1.10.1: scipy.stats.nct.cdf(t, df, nc) and
scipy.stats.nct.ppf(p, df, nc) (Boost's noncentral t). One row further,
at df = 1e7, is from mpmath 1.2.1 (30 digits): quad over the chi-squared
density of Phi(t*sqrt(V/df) - nc), because scipy's value there is off by
5e-6 (0.8789802 against 0.8789849).
"""
import itertools

import mpmath as mp
import numpy as np
import scipy
from scipy import stats

print(f"# noncentral t reference, scipy {scipy.__version__} stats.nct.cdf / stats.nct.ppf; mpmath {mp.__version__} where ref = mpmath")
print("func,df,nc,arg,want,ref")
for df, nc in itertools.product([2, 3, 5, 10, 16, 30, 100, 1000, 10000], [0.0, 0.5, 2.77, 8.08, 20.0, 62.0, 196.0]):
    # arguments about the distribution's bulk: its quantiles at a spread of p
    for p in (0.001, 0.025, 0.3, 0.5, 0.8, 0.975, 0.999):
        x = stats.nct.ppf(p, df, nc)
        print(f"ppf,{df},{nc},{p!r},{x!r},scipy")
        xr = float(f"{x:.4g}")
        print(f"cdf,{df},{nc},{xr!r},{stats.nct.cdf(xr, df, nc)!r},scipy")

mp.mp.dps = 30
df, t, nc = mp.mpf(10) ** 7, 6200, 6198
ln_c = -(df / 2) * mp.log(2) - mp.loggamma(df / 2)
dens = lambda v: mp.exp(ln_c + (df / 2 - 1) * mp.log(v) - v / 2)
pts = mp.linspace(df - 20 * mp.sqrt(2 * df), df + 20 * mp.sqrt(2 * df), 41)
val = mp.quad(lambda v: dens(v) * mp.ncdf(t * mp.sqrt(v / df) - nc), pts) / mp.quad(dens, pts)
print(f"cdf,10000000,{nc},{t},{float(val)!r},mpmath")
