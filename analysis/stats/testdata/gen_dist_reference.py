#!/usr/bin/python3
"""Write dist_reference.csv: reference values for the distribution functions
in analysis/stats/dist.go (read by TestDistReferenceTable).

Run from this directory:  /usr/bin/python3 gen_dist_reference.py > dist_reference.csv
(Debian's python3-scipy 1.10.1 and python3-mpmath 1.2.1; about 10 minutes.)

For every distribution, degrees of freedom and tail probability q on the
grid, mpmath finds the quantile x_q with P(X > x_q) = q (and, for the
asymmetric chi-squared and F, x_p with P(X <= x_p) = q); the arguments of
the CDF and survival rows are those quantiles rounded to doubles, so each
row is exact for the double it names. Every value is computed twice by
mpmath, at 40 and at 60 significant digits, and the script stops if the
two disagree beyond 1e-25 relative; the Student t tail is also checked
against a direct quadrature of the density (mpmath.quad) to 1e-14 on the
first 40 survival rows with nu >= 3 and 1 < x < 100.

Columns: family, func, df1, df2, arg, want, scipy, ref
  func   sf (P(X > arg)), cdf (P(X <= arg)), isf (x with P(X > x) = arg),
         ppf (x with P(X <= x) = arg)
  want   the reference value, 17 significant digits
  scipy  the scipy 1.10.1 value for the same double arguments
  ref    "scipy" when scipy agrees with mpmath to 1e-14 relative (then want
         is scipy's value), else "mpmath" (want is mpmath's, scipy is off)

The scipy calls are scipy.stats.{t,chi2,f,norm}.{sf,cdf,isf,ppf}(arg, df...)
with the same double arguments. The mpmath definitions (regularised):
  t sf      I(nu/(nu+x^2); nu/2, 1/2)/2 for x >= 0; cdf(x) = sf(-x)
  chi2 sf   gammainc(k/2, x/2, inf);  cdf P(k/2, x/2), or for k >= 1000 above mean - 6 sd 1 - sf
  F sf      I(d2/(d2+d1 x); d2/2, d1/2);  cdf I(d1 x/(d1 x+d2); d1/2, d2/2)
where I(x; a, b) is betainc(a, b, 0, x) and P(a, x) gammainc(a, 0, x), or,
for a and b both 500 or more or where mpmath's hypergeometric series give
up, the positive series of beta_inc_series and gamma_lower below.
  norm sf   erfc(x/sqrt 2)/2;  cdf erfc(-x/sqrt 2)/2
and quantiles by mpmath.findroot on the logarithm of those, started from
scipy's quantile where it is finite.
"""
import math
import sys

import mpmath as mp
import scipy
import scipy.stats as st

QS = [0.5, 0.4, 0.25, 0.1, 0.05, 0.01, 1e-3, 1e-5, 1e-8, 1e-12, 1e-20, 1e-50,
      1e-100, 1e-200, 1e-300]
T_DF = [1, 2, 3, 5, 10, 30, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e9]
CHI2_DF = T_DF
F_DF = [(1, 1), (1, 10), (2, 30), (5, 100), (10, 3), (30, 30), (1, 1e4),
        (2, 1e6), (10, 1e7), (4, 1e9), (1e3, 1e3), (1e5, 1e5), (1e6, 5),
        (1e6, 1e6)]
# Bonferroni outlier rule: t quantile at 1 - 0.05/(2n) with n - 3 df.
BONF_N = [1e5, 1e6, 1e7]

TINY = sys.float_info.min  # smallest normal double
HUGE = sys.float_info.max


def mpf(v):
    return mp.mpf(v)


MAXTERMS = 10**8


def beta_inc(a, b, x):
    """Regularised I_x(a, b): mpmath.betainc, or where both a and b are 500
    or more or its hypergeometric series gives up, the positive series
    I_x(a, b) = x^a (1-x)^b / (a B(a, b)) 2F1(a+b, 1; a+1; x) (A&S 26.5.23)
    summed on the side of the mean where it is the smaller."""
    a, b, x = mpf(a), mpf(b), mpf(x)
    if min(a, b) < 500:
        try:
            return mp.betainc(a, b, 0, x, regularized=True)
        except (mp.libmp.NoConvergence, ValueError):
            pass
    if x > a / (a + b):
        return 1 - beta_inc_series(b, a, 1 - x)
    return beta_inc_series(a, b, x)


def beta_inc_series(a, b, x):
    lnpre = a * mp.log(x) + b * mp.log1p(-x) - mp.log(a) - (mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b))
    return mp.exp(lnpre) * mp.hyp2f1(a + b, 1, a + 1, x, maxterms=MAXTERMS)


def gamma_lower(a, x):
    """Regularised P(a, x): mpmath.gammainc, or where its series gives up
    (a near 10^9), x^a e^-x / Gamma(a+1) 1F1(1; a+1; x) (A&S 6.5.29, 13.1.2)."""
    a, x = mpf(a), mpf(x)
    try:
        return mp.gammainc(a, 0, x, regularized=True)
    except mp.libmp.NoConvergence:
        pass
    return mp.exp(a * mp.log(x) - x - mp.loggamma(a + 1)) * mp.hyp1f1(1, a + 1, x, maxterms=MAXTERMS)


def t_sf(x, nu):
    x, nu = mpf(x), mpf(nu)
    if x < 0:
        return 1 - t_sf(-x, nu)
    return beta_inc(nu / 2, mpf(1) / 2, nu / (nu + x * x)) / 2


def t_cdf(x, nu):
    return t_sf(-mpf(x), nu)


def chi2_sf(x, k):
    return mp.gammainc(mpf(k) / 2, mpf(x) / 2, mp.inf, regularized=True)


def chi2_cdf(x, k):
    x, k = mpf(x), mpf(k)
    if k >= 1000 and x >= k - 6 * mp.sqrt(2 * k):
        # for large k, above 6 sd below the mean the cdf exceeds 1e-10 and the upper tail
        # is the fast one: 1 - sf, with 20 more digits for the difference
        with mp.extradps(20):
            return 1 - chi2_sf(x, k)
    return gamma_lower(k / 2, x / 2)


def f_sf(x, d1, d2):
    x, d1, d2 = mpf(x), mpf(d1), mpf(d2)
    return beta_inc(d2 / 2, d1 / 2, d2 / (d2 + d1 * x))


def f_cdf(x, d1, d2):
    x, d1, d2 = mpf(x), mpf(d1), mpf(d2)
    return beta_inc(d1 / 2, d2 / 2, d1 * x / (d1 * x + d2))


def norm_sf(x):
    return mp.erfc(mpf(x) / mp.sqrt(2)) / 2


def norm_cdf(x):
    return mp.erfc(-mpf(x) / mp.sqrt(2)) / 2


def t_sf_quad(x, nu):
    """P(T > x) by quadrature of the density, scaled at x (check only)."""
    x, nu = mpf(x), mpf(nu)
    lc = mp.loggamma((nu + 1) / 2) - mp.loggamma(nu / 2) - mp.log(nu * mp.pi) / 2
    g = lambda s: -(nu + 1) / 2 * mp.log1p(s * s / nu)
    g0 = g(x)
    w = (nu + x * x) / (x * (nu + 1))
    integral = mp.quad(lambda u: mp.exp(g(x + u) - g0), [0, w, 10 * w, 100 * w, mp.inf])
    return mp.exp(lc + g0) * integral


def twice(fn, *args):
    """fn at 40 and 60 digits; stop if they disagree."""
    with mp.workdps(40):
        a = fn(*args)
    with mp.workdps(60):
        b = fn(*args)
    if b != 0 and abs((a - b) / b) > mpf('1e-25'):
        raise SystemExit("mpmath precision check failed: %s%r: %s vs %s" % (fn.__name__, args, a, b))
    return b


def quantile(prob_fn, q, start):
    """x > 0 with prob_fn(x) = q: a bracket in log x found by growing steps
    from start, then findroot's Anderson–Björck bracketing solver (bisection
    where it stalls) on log prob against log x, at 60 digits."""
    with mp.workdps(60):
        lq = mp.log(mpf(q))
        g = lambda v: mp.log(prob_fn(mp.exp(v))) - lq
        v0 = mp.log(mpf(start))
        g0 = g(v0)
        if g0 == 0:
            return mp.exp(v0)
        step = mpf('1e-7')
        for direction in (1, -1):
            v1 = v0 + direction * step
            g1 = g(v1)
            s = step
            while g1 * g0 > 0 and abs(g1) <= abs(g0) * 2 + 1 and s < 2000:
                s *= 4
                v1 = v0 + direction * s
                g1 = g(v1)
            if g1 * g0 < 0:
                lo, hi = min(v0, v1), max(v0, v1)
                try:
                    return mp.exp(mp.findroot(g, (lo, hi), solver='anderson', tol=mpf('1e-45')))
                except ValueError:
                    return mp.exp(bisect(g, lo, hi))
        raise ValueError("no bracket for q=%r from %r" % (q, start))


def bisect(g, lo, hi):
    """The sign change of g in [lo, hi] by bisection to 1e-40 (fallback when
    the Anderson–Björck iteration stalls)."""
    glo = g(lo)
    while hi - lo > mpf('1e-40') * max(1, abs(lo)):
        mid = (lo + hi) / 2
        gm = g(mid)
        if gm == 0:
            return mid
        if (gm < 0) == (glo < 0):
            lo, glo = mid, gm
        else:
            hi = mid
    return (lo + hi) / 2


class Skip(Exception):
    pass


def guarded(fn, *args):
    """fn(*args) with a 120-second limit; Skip on a limit or NoConvergence."""
    import signal

    def alarm(signum, frame):
        raise Skip("over 120 s")
    old = signal.signal(signal.SIGALRM, alarm)
    signal.alarm(120)
    try:
        return fn(*args)
    except (mp.libmp.NoConvergence, ValueError) as e:
        raise Skip(str(e)[:80])
    finally:
        signal.alarm(0)
        signal.signal(signal.SIGALRM, old)


def fmt(v):
    return repr(float(v)) if v is not None else ""


def close(a, b, tol):
    if a is None or b == 0:
        return False
    return abs(a - b) <= tol * abs(b)


rows = []


def add(family, func, df1, df2, arg, mpval, scipyval):
    m = float(mpval)
    if not TINY <= abs(m) <= HUGE:  # not a normal double: no row
        return
    sv = None if scipyval is None or not math.isfinite(scipyval) else float(scipyval)
    if sv is not None and close(sv, m, 1e-14):
        want, ref = sv, "scipy"
    else:
        want, ref = m, "mpmath"
    rows.append((family, func, df1, df2, arg, want, sv, ref))


def normal_double(x):
    return TINY <= abs(float(x)) <= HUGE


def start_from(scipyval, fallback):
    if scipyval is not None and math.isfinite(scipyval) and scipyval > 0:
        return scipyval
    return fallback


skipped = []


def group(family, df1, df2, q, sf, cdf, dist, args, lower, fallback):
    """Rows for one (distribution, df, q): isf and sf at the upper quantile
    and, when lower is true, ppf and cdf at the lower one."""
    try:
        sq = dist.isf(q, *args)
        x = guarded(quantile, sf, q, start_from(sq, fallback))
        add(family, "isf", df1, df2, q, x, sq)
        if normal_double(x):
            xd = float(x)
            add(family, "sf", df1, df2, xd, guarded(twice, sf, xd), dist.sf(xd, *args))
            if family in ("t", "norm"):  # symmetric: ppf(q) = -isf(q), cdf(-x) = sf(x)
                add(family, "ppf", df1, df2, q, -x, dist.ppf(q, *args))
                add(family, "cdf", df1, df2, -xd, guarded(twice, cdf, -xd), dist.cdf(-xd, *args))
        if lower:
            sp = dist.ppf(q, *args)
            x = guarded(quantile, cdf, q, start_from(sp, fallback))
            add(family, "ppf", df1, df2, q, x, sp)
            if normal_double(x):
                xd = float(x)
                add(family, "cdf", df1, df2, xd, guarded(twice, cdf, xd), dist.cdf(xd, *args))
    except Skip as e:
        skipped.append("%s df=(%r, %r) q=%r: %s" % (family, df1, df2, q, e))
        print("skipped", skipped[-1], file=sys.stderr)


def main():
    for q in QS:
        if q != 0.5:
            group("norm", 0, 0, q, norm_sf, norm_cdf, st.norm, (), False, 1)
    for nu in T_DF:
        sf = lambda v, nu=nu: t_sf(v, nu)
        cdf = lambda v, nu=nu: t_cdf(v, nu)
        for q in QS:
            if q == 0.5:
                continue
            group("t", nu, 0, q, sf, cdf, st.t, (nu,), False, 1)
            if q >= 1e-15:
                # the p-quantile for the double p = 1 - q, whose exact upper tail is 1 - p
                p = 1 - q
                try:
                    with mp.workdps(60):
                        qexact = 1 - mpf(p)
                    add("t", "ppf", nu, 0, p, guarded(quantile, sf, qexact, start_from(st.t.isf(q, nu), 1)), st.t.ppf(p, nu))
                except Skip as e:
                    skipped.append("t ppf df=%r p=%r: %s" % (nu, p, e))
        print("t", nu, file=sys.stderr)
    # The quadrature check of the t tail.
    checked = 0
    for r in rows:
        if r[0] == "t" and r[1] == "sf" and r[2] >= 3 and 1 < r[4] < 100 and checked < 40:
            with mp.workdps(40):
                qd = t_sf_quad(r[4], r[2])
            want = mpf(r[5])
            if abs((qd - want) / want) > mpf('1e-14'):
                raise SystemExit("t quadrature check failed at %r: %s vs %s" % (r, want, qd))
            checked += 1
    for n in BONF_N:
        nu = n - 3
        sf = lambda v, nu=nu: t_sf(v, nu)
        p = 1 - 0.05 / (2 * n)
        with mp.workdps(60):
            qexact = 1 - mpf(p)
        add("t", "ppf", nu, 0, p, guarded(quantile, sf, qexact, 5), st.t.ppf(p, nu))
        q = 0.05 / (2 * n)
        add("t", "isf", nu, 0, q, guarded(quantile, sf, q, 5), st.t.isf(q, nu))
    for k in CHI2_DF:
        sf = lambda v, k=k: chi2_sf(v, k)
        cdf = lambda v, k=k: chi2_cdf(v, k)
        for q in QS:
            group("chi2", k, 0, q, sf, cdf, st.chi2, (k,), True, k)
        print("chi2", k, file=sys.stderr)
    for d1, d2 in F_DF:
        sf = lambda v, d1=d1, d2=d2: f_sf(v, d1, d2)
        cdf = lambda v, d1=d1, d2=d2: f_cdf(v, d1, d2)
        for q in QS:
            group("f", d1, d2, q, sf, cdf, st.f, (d1, d2), True, 1)
        print("f", d1, d2, file=sys.stderr)

    print("# Reference values for analysis/stats/dist.go, written by gen_dist_reference.py (see its docstring).")
    print("# scipy %s (scipy.stats.t/chi2/f/norm .sf/.cdf/.isf/.ppf), mpmath %s (betainc, gammainc, hyp2f1, hyp1f1, erfc, findroot; 40 and 60 digits)."
          % (scipy.__version__, mp.__version__))
    print("# ref = scipy: want is scipy's value, within 1e-14 of mpmath; ref = mpmath: scipy is further off and want is mpmath's.")
    for sk in skipped:
        print("# not computed (mpmath too slow or not converging): " + sk)
    print("family,func,df1,df2,arg,want,scipy,ref")
    for r in rows:
        print("%s,%s,%s,%s,%s,%s,%s,%s" % (r[0], r[1], fmt(r[2]), fmt(r[3]), fmt(r[4]), fmt(r[5]), fmt(r[6]), r[7]))


if __name__ == "__main__":
    main()
