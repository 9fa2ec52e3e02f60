#!/usr/bin/python3
"""Print the Taylor coefficients of Temme's functions c_k(eta), k = 0..4, of
the uniform asymptotic expansion of the incomplete gamma function, for
temmeC in analysis/stats/dist.go:

  Q(a, x) = erfc(eta sqrt(a/2))/2 + R_a(eta),
  R_a(eta) ~ exp(-a eta^2/2)/sqrt(2 pi a) * sum_k c_k(eta) a^-k,
  lambda = x/a,  eta^2/2 = lambda - 1 - ln(lambda),  sign(eta) = sign(lambda - 1)

(Temme 1979, SIAM J. Math. Anal. 10:757-766; DLMF 8.12.3-8.12.8), with

  c_0 = 1/(lambda - 1) - 1/eta,
  c_k = (1/eta) d c_{k-1}/d eta + g_k/(lambda - 1),

where g_k is fixed by the cancellation of the pole at eta = 0 (the script
prints the g_k it finds: they are -1/12, 1/288, 139/51840, ... up to sign,
the Stirling coefficients, as they must be). Everything is done on power
series in eta with mpmath 1.2.1 at 60 digits: lambda(eta) by reverting
eta = mu sqrt(2 (mu - ln(1+mu))/mu^2), mu = lambda - 1. The script checks
the truncated expansion against mpmath.gammainc before printing.

Run: /usr/bin/python3 gen_temme_coef.py
"""
import mpmath as mp

mp.mp.dps = 60
N = 48      # length of the series worked with
OUT = 30    # coefficients printed per c_k (|eta| <= 1: the rest is below 1e-17)


def mul(a, b):
    c = [mp.mpf(0)] * N
    for i, x in enumerate(a):
        if x:
            for j in range(N - i):
                c[i + j] += x * b[j]
    return c


def inv(a):
    b = [mp.mpf(0)] * N
    b[0] = 1 / a[0]
    for n in range(1, N):
        b[n] = -sum(a[k] * b[n - k] for k in range(1, n + 1)) / a[0]
    return b


def sqrt1(a):
    b = [mp.mpf(0)] * N
    b[0] = mp.mpf(1)
    for n in range(1, N):
        b[n] = (a[n] - sum(b[k] * b[n - k] for k in range(1, n))) / 2
    return b


def compose(a, m):
    res = [mp.mpf(0)] * N
    p = [mp.mpf(0)] * N
    p[0] = mp.mpf(1)
    for k in range(N):
        if a[k]:
            for i in range(N):
                res[i] += a[k] * p[i]
        p = mul(p, m)
    return res


def coefficients():
    f = [2 * mp.mpf(-1) ** n / (n + 2) for n in range(N)]   # 2(mu - ln(1+mu))/mu^2
    g = inv(sqrt1(f))
    mu = [mp.mpf(0)] * N
    mu[1] = mp.mpf(1)
    for _ in range(N + 2):                                    # mu = eta / sqrt(f(mu))
        mu = [mp.mpf(0)] + compose(g, mu)[:N - 1]
    eta_l = inv(mu[1:] + [mp.mpf(0)])                         # eta/(lambda - 1)
    c = [eta_l[1:] + [mp.mpf(0)]]                             # c_0
    gs = []
    for _ in range(1, 5):
        prev = c[-1]
        gk = -prev[1] / eta_l[0]                              # cancels the pole
        reg = [n * prev[n] for n in range(2, N)] + [mp.mpf(0)] * 2
        c.append([reg[n] + (gk * eta_l[n + 1] if n + 1 < N else 0) for n in range(N)])
        gs.append(gk)
    return c, gs


def check(c):
    worst = mp.mpf(0)
    for a in (100, 1000, 10 ** 5):
        a = mp.mpf(a)
        for lam in ('0.4', '0.7', '0.95', '1.02', '1.3', '2.0'):
            lam = mp.mpf(lam)
            eta = mp.sign(lam - 1) * mp.sqrt(2 * (lam - 1 - mp.log(lam)))
            if abs(eta) > 1:
                continue
            pre = mp.exp(-a * eta ** 2 / 2) / mp.sqrt(2 * mp.pi * a)
            r = pre * sum(sum(c[k][n] * eta ** n for n in range(OUT)) / a ** k for k in range(5))
            if eta > 0:
                want, got = mp.gammainc(a, a * lam, mp.inf, regularized=True), mp.erfc(eta * mp.sqrt(a / 2)) / 2 + r
            else:
                want, got = mp.gammainc(a, 0, a * lam, regularized=True), mp.erfc(-eta * mp.sqrt(a / 2)) / 2 - r
            worst = max(worst, abs((got - want) / want))
    if worst > mp.mpf('1e-13'):
        raise SystemExit("expansion check failed: %s" % worst)
    return worst


def main():
    c, gs = coefficients()
    worst = check(c)
    print("// g_k found: %s; largest relative error against mpmath.gammainc for a >= 100, |eta| <= 1: %s"
          % (", ".join(mp.nstr(x, 12) for x in gs), mp.nstr(worst, 2)))
    print("var temmeC = [5][%d]float64{" % OUT)
    for k in range(5):
        vals = [mp.nstr(x, 20, min_fixed=0, max_fixed=0) for x in c[k][:OUT]]
        print("\t{" + ", ".join(vals) + "},")
    print("}")


if __name__ == "__main__":
    main()
