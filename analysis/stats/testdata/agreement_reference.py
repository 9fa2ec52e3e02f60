#!/usr/bin/python3
"""Reference values for agreement_test.go, from general-purpose libraries.

Run from the repository root:

    /usr/bin/python3 analysis/stats/testdata/agreement_reference.py \
        ../shared/reference/bland-altman-1986-pefr.csv \
        > analysis/stats/testdata/agreement-reference.json

Versions used: Debian's Python 3, numpy 1.24.2, scipy 1.10.1.
Data: Bland & Altman (1986), Lancet 327:307-310, Table 1 (peak expiratory
flow, l/min), read from the shared reference folder (not copied here).

- Bland-Altman: numpy mean/std(ddof=1), scipy.stats.t.ppf, scipy.stats.linregress;
  the limits' exact intervals from scipy.stats.nct.ppf(q, n-1, k*sqrt(n)) (Carkeet 2015).
- Repeatability: numpy within-subject sums of squares, scipy.stats.chi2.ppf.
- Deming: scipy.odr.ODR with RealData(x, y, sx=1, sy=sqrt(delta)) (weights
  1 on x and 1/delta on y), fit_type=0 (explicit ODR), analytic derivatives
  (deriv=3), sstol = partol = 1e-15;
  jackknife by refitting scipy.odr without each row in turn.
- Error correction: the corrected slope's interval by Fuller (1987),
  Theorem 1.2.1, in numpy with scipy.stats.t.ppf; scipy.stats.pearsonr, numpy arctanh/tanh with
  scipy.stats.norm.ppf (Fisher z), scipy.stats.linregress with
  scipy.stats.t.ppf; reliabilities 1 - s_err^2/var(ddof=1) with the
  within-subject SDs above as the declared error SDs.
- Lin's CCC: closed form with numpy (divisor n); the interval by Lin (1989)
  eq. for var(atanh rho_c) as corrected in Lin (2000), scipy.stats.norm.ppf.
"""
import csv
import json
import sys

import numpy as np
import scipy
from scipy import odr, stats


def read(path):
    with open(path) as f:
        rows = list(csv.DictReader(f))
    cols = {k: np.array([float(r[k]) for r in rows]) for k in ("wright_1", "wright_2", "mini_1", "mini_2")}
    return cols


def bland_altman(a, b, k, conf):
    d = a - b
    m = (a + b) / 2
    n = len(d)
    bias = d.mean()
    sd = d.std(ddof=1)
    t = stats.t.ppf(0.5 + conf / 2, n - 1)
    lr = stats.linregress(m, d)
    return dict(bias=bias, sd=sd, bias_lo=bias - t * sd / np.sqrt(n), bias_hi=bias + t * sd / np.sqrt(n),
                lower=bias - k * sd, upper=bias + k * sd, **exact_limits(bias, sd, n, k, conf),
                trend_slope=lr.slope, trend_intercept=lr.intercept, trend_se=lr.stderr, trend_p=lr.pvalue)


def exact_limits(bias, sd, n, k, conf):
    # Carkeet (2015): the exact interval of mu + k*sigma, from the quantiles
    # of the noncentral t with n-1 df and noncentrality k*sqrt(n).
    tl = stats.nct.ppf(0.5 - conf / 2, n - 1, k * np.sqrt(n))
    th = stats.nct.ppf(0.5 + conf / 2, n - 1, k * np.sqrt(n))
    r = np.sqrt(n)
    return dict(upper_lo=bias + sd * tl / r, upper_hi=bias + sd * th / r,
                lower_lo=bias - sd * th / r, lower_hi=bias - sd * tl / r)


def within_sd(reps):
    X = np.column_stack(reps)
    n, m = X.shape
    ss = ((X - X.mean(axis=1, keepdims=True)) ** 2).sum()
    df = n * (m - 1)
    return np.sqrt(ss / df), df


def repeatability(reps, conf):
    sw, df = within_sd(reps)
    lo = sw * np.sqrt(df / stats.chi2.ppf(0.5 + conf / 2, df))
    hi = sw * np.sqrt(df / stats.chi2.ppf(0.5 - conf / 2, df))
    return dict(sw=sw, sw_lo=lo, sw_hi=hi, df=df)


def odr_line(x, y, delta):
    b0 = np.polyfit(x, y, 1)
    model = odr.Model(lambda beta, x: beta[0] + beta[1] * x,
                      fjacb=lambda beta, x: np.vstack([np.ones_like(x), x]),
                      fjacd=lambda beta, x: np.full_like(x, beta[1]))
    data = odr.RealData(x, y, sx=np.ones_like(x), sy=np.full_like(y, np.sqrt(delta)))
    o = odr.ODR(data, model, beta0=[b0[1], b0[0]], sstol=1e-15, partol=1e-15, maxit=1000)
    o.set_job(fit_type=0, deriv=3)  # analytic derivatives, checked
    out = o.run()
    return out.beta[0], out.beta[1]


def deming(x, y, delta, conf):
    a, b = odr_line(x, y, delta)
    n = len(x)
    jb, ja = [], []
    for i in range(n):
        keep = np.arange(n) != i
        ai, bi = odr_line(x[keep], y[keep], delta)
        ja.append(ai)
        jb.append(bi)
    ja, jb = np.array(ja), np.array(jb)
    se_b = np.sqrt((n - 1) / n * ((jb - jb.mean()) ** 2).sum())
    se_a = np.sqrt((n - 1) / n * ((ja - ja.mean()) ** 2).sum())
    t = stats.t.ppf(0.5 + conf / 2, n - 2)
    return dict(delta=delta, intercept=a, slope=b, intercept_se=se_a, slope_se=se_b,
                slope_lo=b - t * se_b, slope_hi=b + t * se_b,
                intercept_lo=a - t * se_a, intercept_hi=a + t * se_a)


def lin_ccc(x, y, conf):
    n = len(x)
    mx, my = x.mean(), y.mean()
    sxx = ((x - mx) ** 2).mean()
    syy = ((y - my) ** 2).mean()
    sxy = ((x - mx) * (y - my)).mean()
    p = 2 * sxy / (sxx + syy + (mx - my) ** 2)
    r = sxy / np.sqrt(sxx * syy)
    u = (mx - my) / np.sqrt(np.sqrt(sxx) * np.sqrt(syy))
    q = 1 - p * p
    v = ((1 - r * r) * p * p / (q * r * r) + 2 * p ** 3 * (1 - p) * u * u / (r * q * q)
         - p ** 4 * u ** 4 / (2 * r * r * q * q)) / (n - 2)
    z = np.arctanh(p)
    h = stats.norm.ppf(0.5 + conf / 2) * np.sqrt(v)
    return dict(ccc=p, lo=np.tanh(z - h), hi=np.tanh(z + h), zse=np.sqrt(v), r=r, cb=p / r, u=u)


def error_correction(x, y, ex, ey, conf):
    n = len(x)
    r = stats.pearsonr(x, y).statistic
    h = stats.norm.ppf(0.5 + conf / 2) / np.sqrt(n - 3)
    rlo, rhi = np.tanh(np.arctanh(r) - h), np.tanh(np.arctanh(r) + h)
    lr = stats.linregress(x, y)
    t = stats.t.ppf(0.5 + conf / 2, n - 2)
    relx = 1 - ex ** 2 / x.var(ddof=1)
    rely = 1 - ey ** 2 / y.var(ddof=1)
    f = np.sqrt(relx * rely)
    # Fuller (1987), Measurement Error Models, Theorem 1.2.1: the variance
    # of the slope corrected for the known error variance suu of x.
    b = lr.slope / relx
    suu = ex ** 2
    mxx = x.var(ddof=1)
    svv = ((y - y.mean() - b * (x - x.mean())) ** 2).sum() / (n - 2)
    se_b = np.sqrt((mxx * svv + b ** 2 * suu ** 2) / ((n - 1) * (mxx - suu) ** 2))
    return dict(slope_corrected_lo=b - t * se_b, slope_corrected_hi=b + t * se_b, slope_corrected_se=se_b,
                r=r, r_lo=rlo, r_hi=rhi, rel_x=relx, rel_y=rely, err_x=ex, err_y=ey,
                r_corrected=r / f, r_corrected_lo=max(-1, rlo / f), r_corrected_hi=min(1, rhi / f),
                slope=lr.slope, slope_lo=lr.slope - t * lr.stderr, slope_hi=lr.slope + t * lr.stderr,
                slope_corrected=lr.slope / relx)


def main():
    c = read(sys.argv[1])
    w1, w2, m1, m2 = c["wright_1"], c["wright_2"], c["mini_1"], c["mini_2"]
    out = {"versions": {"numpy": np.__version__, "scipy": scipy.__version__}}
    out["bland_altman_k196"] = bland_altman(w1, m1, 1.96, 0.95)
    out["bland_altman_k2"] = bland_altman(w1, m1, 2.0, 0.95)
    out["repeatability_wright"] = repeatability([w1, w2], 0.95)
    out["repeatability_mini"] = repeatability([m1, m2], 0.95)
    # Mean of replicates (Bland & Altman 1999, section 5.3).
    sw_a, _ = within_sd([w1, w2])
    sw_b, _ = within_sd([m1, m2])
    dm = (w1 + w2) / 2 - (m1 + m2) / 2
    sdm = dm.std(ddof=1)
    sd_rep = np.sqrt(sdm ** 2 + 0.5 * sw_a ** 2 + 0.5 * sw_b ** 2)
    out["replicates"] = dict(bias=dm.mean(), sd_means=sdm, sd=sd_rep,
                             **exact_limits(dm.mean(), sd_rep, len(dm), 1.96, 0.95))
    # Deming of the mini meter (y) on the Wright meter (x).
    delta_rep = sw_b ** 2 / sw_a ** 2
    out["deming_delta1"] = deming(w1, m1, 1.0, 0.95)
    out["deming_delta_rep"] = deming((w1 + w2) / 2, (m1 + m2) / 2, delta_rep, 0.95)
    out["deming_delta4"] = deming(w1, m1, 4.0, 0.95)
    out["ccc"] = lin_ccc(w1, m1, 0.95)
    # Correction for measurement error, errors = each meter's within-subject SD.
    out["error_correction"] = error_correction(w1, m1, sw_a, sw_b, 0.95)
    json.dump(out, sys.stdout, indent=1, sort_keys=True,
              default=lambda o: o.item() if hasattr(o, "item") else str(o))
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
