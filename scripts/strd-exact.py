#!/usr/bin/python3
"""Exact reference values for the push-down tests on NIST StRD data.

Reads Norris.dat and Longley.dat from the reference folder (argument 1)
and prints, computed in exact rational arithmetic (Python's fractions),
with square roots in decimal at 40 digits:
  Norris:  y on x: slope, intercept, r, residual SD, and the quadratic's
           coefficients
  Longley: y on x6 (year): slope, intercept, r, the quadratic's
           coefficients, and the partial r of y and x6 given x5
These serve as the expected values of analysis/pushdown_pg_test.go
(TestPushdownStRD), beside NIST's certified values where NIST has them.
"""
import re
import sys
from decimal import Decimal, getcontext
from fractions import Fraction as F

getcontext().prec = 40


def data(path):
    lines = open(path).read().splitlines()
    for l in lines:
        m = re.search(r"Data\s+\(lines (\d+) to (\d+)\)", l)
        if m:
            a, b = int(m.group(1)), int(m.group(2))
            break
    return [[F(v) for v in l.split()] for l in lines[a - 1:b]]


def sqrt(f):
    return (Decimal(f.numerator) / Decimal(f.denominator)).sqrt()


def dec(f):
    return Decimal(f.numerator) / Decimal(f.denominator)


def moments(x, y):
    n = len(x)
    mx, my = sum(x) / n, sum(y) / n
    sxx = sum((a - mx) ** 2 for a in x)
    syy = sum((b - my) ** 2 for b in y)
    sxy = sum((a - mx) * (b - my) for a, b in zip(x, y))
    return n, mx, my, sxx, syy, sxy


def line(x, y):
    n, mx, my, sxx, syy, sxy = moments(x, y)
    b = sxy / sxx
    a = my - b * mx
    rss = sum((yy - a - b * xx) ** 2 for xx, yy in zip(x, y))
    return b, a, dec(sxy) / (sqrt(sxx) * sqrt(syy)), sqrt(rss / (n - 2))


def solve(m, v):
    k = len(v)
    a = [row[:] + [v[i]] for i, row in enumerate(m)]
    for c in range(k):
        p = next(r for r in range(c, k) if a[r][c] != 0)
        a[c], a[p] = a[p], a[c]
        for r in range(k):
            if r != c:
                f = a[r][c] / a[c][c]
                a[r] = [u - f * w for u, w in zip(a[r], a[c])]
    return [a[i][k] / a[i][i] for i in range(k)]


def quadratic(x, y):
    cols = [[F(1)] * len(x), x, [a * a for a in x]]
    m = [[sum(p * q for p, q in zip(ci, cj)) for cj in cols] for ci in cols]
    v = [sum(p * q for p, q in zip(ci, y)) for ci in cols]
    return solve(m, v)


def partial(x, y, z):
    def resid(v):
        b, a, _, _ = line(z, v)
        return [vv - a - b * zz for vv, zz in zip(v, z)]
    ex, ey = resid(x), resid(y)
    return dec(sum(p * q for p, q in zip(ex, ey))) / (sqrt(sum(p * p for p in ex)) * sqrt(sum(q * q for q in ey)))


ref = sys.argv[1] if len(sys.argv) > 1 else "/work/shared/reference"
nor = data(ref + "/nist-strd/Norris.dat")
y, x = [r[0] for r in nor], [r[1] for r in nor]
b, a, r, s = line(x, y)
print("Norris slope", dec(b), "intercept", dec(a), "r", r, "residual_sd", s)
print("Norris quadratic", *[dec(c) for c in quadratic(x, y)])
lon = data(ref + "/nist-strd/Longley.dat")
y, x5, x6 = [r[0] for r in lon], [r[5] for r in lon], [r[6] for r in lon]
b, a, r, s = line(x6, y)
print("Longley slope", dec(b), "intercept", dec(a), "r", r, "residual_sd", s)
print("Longley quadratic", *[dec(c) for c in quadratic(x6, y)])
print("Longley partial_r_given_x5", partial(x6, y, x5))
