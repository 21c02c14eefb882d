#!/usr/bin/python3
"""Writes betaquantile-mpmath.json: lower-tail quantiles x of Beta(a, b),
I_x(a, b) = q, and their complements 1 - x, at 60 significant digits, for the
beta-quantile checks of proportions/betaquantile_test.go. mpmath is a
general-purpose arbitrary-precision library (Debian python3-mpmath, or any
python3 with mpmath): it supplies the arithmetic and log-gamma; I_x is
evaluated here by the continued fraction of Abramowitz & Stegun 26.5.8 (on
whichever side of the mean it converges) to 1e-45, cross-checked against
mpmath.betainc where that converges, and the quantile is found by Newton's
method to 1e-40. Run: python3 betaquantile_mpmath.py > betaquantile-mpmath.json"""
import json
import mpmath as mp

mp.mp.dps = 60
EPS = mp.mpf(10) ** -45


def cf(a, b, x):
    # A&S 26.5.8 continued fraction by the modified Lentz method
    tiny = mp.mpf(10) ** -300
    c, d = mp.mpf(1), 1 - (a + b) * x / (a + 1)
    d = 1 / d
    h, m = d, 1
    while True:
        m2 = 2 * m
        aa = m * (b - m) * x / ((a - 1 + m2) * (a + m2))
        d = 1 + aa * d; c = 1 + aa / c; d = 1 / d; h *= d * c
        aa = -(a + m) * (a + b + m) * x / ((a + m2) * (a + 1 + m2))
        d = 1 + aa * d; c = 1 + aa / c; d = 1 / d
        h *= d * c
        if abs(d * c - 1) < EPS:
            return h
        m += 1


def lower(a, b, x, y):
    """I_x(a, b) and the density, with y = 1 - x given exactly."""
    lp = a * mp.log(x) + b * mp.log(y) - (mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b))
    if x * (a + b + 2) < a + 1:
        i = mp.exp(lp) / a * cf(a, b, x)
    else:
        i = 1 - mp.exp(lp) / b * cf(b, a, y)
    return i, mp.exp(lp) / (x * y)


def quantile(a, b, q):
    a, b, q = mp.mpf(a), mp.mpf(b), mp.mpf(q)
    # start: normal approximation in the logit, then safeguarded Newton
    lo, hi = mp.mpf(0), mp.mpf(1)
    x = a / (a + b)
    y = 1 - x
    for _ in range(2000):
        i, dens = lower(a, b, x, y)
        if i < q:
            lo = x
        else:
            hi = x
        dx = (i - q) / dens
        xn = x - dx
        if not (lo < xn < hi):
            xn = (lo + hi) / 2 if lo > 0 else hi / 8
            dx = x - xn
        if abs(dx) < mp.mpf(10) ** -40 * min(xn, 1 - xn):
            x, y = xn, y + dx
            break
        x, y = xn, y + dx
    i, _ = lower(a, b, x, y)
    assert abs(i - q) < mp.mpf(10) ** -35 * q, (a, b, q)
    if a + b <= 2000:  # independent evaluation by mpmath's own betainc
        j = mp.betainc(a, b, 0, x, regularized=True)
        assert abs(j - i) < mp.mpf(10) ** -30 * q, (a, b, q, i, j)
    return x, y


def main():
    levels = [0.5, 0.95, 0.999999]
    cases = []
    # Clopper-Pearson and Jeffreys shapes: lower limit = lower tail of the
    # first pair, upper limit = lower tail of the reflected second pair.
    for n in [1, 2, 3, 10, 50, 1000, 100000, 1000000, 2 ** 40, 2 ** 50]:
        xs = {0, 1, 2, 5, 30, n - 30, n - 5, n - 2, n - 1, n}
        if n <= 1000000:
            xs |= {n // 3, n // 2}
        for x in sorted(v for v in xs if 0 <= v <= n):
            for a, b in [(x, n - x + 1), (n - x, x + 1), (x + 0.5, n - x + 0.5), (n - x + 0.5, x + 0.5)]:
                if a <= 0 or b <= 0:
                    continue
                for lev in levels:
                    cases.append((a, b, (1 - lev) / 2))
                if n <= 1000 or min(a, b) <= 30:
                    cases.append((a, b, 1e-10))
    # Around the switch to the series branch: m = min(a, b) near 40, and the
    # deviate near (z + 1)^2 = 0.09 * 4 pi m.
    for a, b in [(39.5, 60.5), (40, 61), (40.5, 59.5), (40, 10 ** 6), (39.5, 10 ** 6 + 0.5), (60, 90), (100, 1000)]:
        for q in [0.25, 0.025, 0.005, 1e-3, 5e-4, 1e-4, 5e-5, 5e-7, 1e-10]:
            cases.append((a, b, q))
    seen, checks = set(), []
    for a, b, q in cases:
        key = (float(a), float(b), float(q))
        if key in seen:
            continue
        seen.add(key)
        x, y = quantile(key[0], key[1], key[2])
        checks.append({"a": key[0], "b": key[1], "q": key[2],
                       "x": mp.nstr(x, 25, min_fixed=-400, max_fixed=400),
                       "one_minus_x": mp.nstr(y, 25, min_fixed=-400, max_fixed=400)})
    print(json.dumps({
        "description": "Lower-tail beta quantiles x with I_x(a,b) = q and 1 - x, 25 significant digits of a "
                       "60-digit computation with mpmath %s (general-purpose arbitrary-precision library); "
                       "run by testdata/reference/betaquantile_mpmath.py" % mp.__version__,
        "status": "reference-library",
        "checks": checks}, indent=1))


main()
