#!/usr/bin/python3
"""Writes strata-scipy.json: check values for the stratified analysis
(proportions/strata) computed here independently of the Go code, with
SciPy's general functions only: nchypergeom_fisher (each stratum's
conditional distribution; the distribution of the sum over strata is their
convolution, by numpy), chi2 and norm (tails), brentq (limits) and
minimize_scalar (the restricted maximum likelihood, numerically rather than
by the closed form the Go code uses). Run with Debian's python3-scipy:
/usr/bin/python3 strata_scipy.py."""
import json
import math
import numpy as np
import scipy
from scipy import stats, optimize

SRC = "SciPy %s (Debian python3-scipy), run by testdata/reference/strata_scipy.py" % scipy.__version__

# Each breakdown: rows of (x1, n1, x2, n2). Invented counts.
BREAKDOWNS = {
    "confounded-blocks": [(19, 20, 70, 80), (18, 20, 68, 80), (19, 20, 67, 80), (18, 20, 69, 80),
                          (38, 80, 8, 20), (36, 80, 8, 20), (40, 80, 9, 20), (35, 80, 7, 20)],
    "small-trays": [(3, 5, 1, 6), (2, 4, 0, 3), (4, 6, 2, 5), (1, 3, 1, 4)],
    "heterogeneous-sites": [(30, 50, 10, 50), (12, 40, 25, 40), (20, 45, 19, 45)],
    "uneven-lines": [(5, 120, 14, 130), (9, 200, 20, 180), (2, 60, 6, 75), (11, 300, 18, 260), (4, 90, 7, 95)],
}
LEVEL = 0.95


def support(n1, n2, m):
    return max(0, m - n2), min(n1, m)


def stratum_pmf(n1, n2, m, psi):
    lo, hi = support(n1, n2, m)
    k = np.arange(lo, hi + 1)
    return lo, stats.nchypergeom_fisher(n1 + n2, n1, m, psi).pmf(k)


def sum_pmf(rows, psi):
    lo, p = 0, np.array([1.0])
    for x1, n1, x2, n2 in rows:
        l, q = stratum_pmf(n1, n2, x1 + x2, psi)
        lo, p = lo + l, np.convolve(p, q)
    return lo, p / p.sum()


def exact(rows):
    s = sum(r[0] for r in rows)
    lo, p = sum_pmf(rows, 1.0)
    i = s - lo
    two = p[p <= p[i] * (1 + 1e-7)].sum()
    out = {"sum": s, "p_two_sided": min(1.0, two), "p_greater": min(1.0, p[i:].sum()), "p_less": min(1.0, p[:i + 1].sum())}
    half = (1 - LEVEL) / 2

    def tail_above(t):
        lo, q = sum_pmf(rows, math.exp(t))
        return q[s - lo:].sum() - half

    def tail_below(t):
        lo, q = sum_pmf(rows, math.exp(t))
        return q[:s - lo + 1].sum() - half

    def mean(t):
        lo, q = sum_pmf(rows, math.exp(t))
        return (np.arange(lo, lo + len(q)) * q).sum() - s

    out["lower"] = math.exp(optimize.brentq(tail_above, -12, 12, xtol=1e-13))
    out["upper"] = math.exp(optimize.brentq(tail_below, -12, 12, xtol=1e-13))
    out["estimate"] = math.exp(optimize.brentq(mean, -12, 12, xtol=1e-13))
    return out


def cmh(rows):
    o = e = v = 0.0
    for x1, n1, x2, n2 in rows:
        n, m1 = n1 + n2, x1 + x2
        o += x1
        e += n1 * m1 / n
        v += n1 * n2 * m1 * (n - m1) / (n * n * (n - 1))
    d = o - e
    x = d * d / v
    xc = max(0.0, abs(d) - 0.5) ** 2 / v
    return {"statistic": x, "p": stats.chi2.sf(x, 1), "corrected_statistic": xc, "corrected_p": stats.chi2.sf(xc, 1),
            "p_greater": stats.norm.sf(d / math.sqrt(v)), "p_less": stats.norm.cdf(d / math.sqrt(v)),
            "corrected_p_greater": stats.norm.sf((d - 0.5) / math.sqrt(v)),
            "corrected_p_less": stats.norm.cdf((d + 0.5) / math.sqrt(v))}


def breslow_day_tarone(rows, psi):
    bd = dev = vs = 0.0
    k = 0
    for x1, n1, x2, n2 in rows:
        m1 = x1 + x2
        if m1 == 0 or m1 == n1 + n2:
            continue
        lo, hi = support(n1, n2, m1)
        # A(n2 - m1 + A) = psi (n1 - A)(m1 - A): the root of the quadratic inside the margins
        a2, a1, a0 = 1 - psi, n2 - m1 + psi * (n1 + m1), -psi * n1 * m1
        roots = [-a0 / a1] if abs(a2) < 1e-15 else np.roots([a2, a1, a0]).real
        A = [r for r in roots if lo - 1e-9 <= r <= hi + 1e-9][0]
        V = 1 / (1 / A + 1 / (n1 - A) + 1 / (m1 - A) + 1 / (n2 - m1 + A))
        k += 1
        bd += (x1 - A) ** 2 / V
        dev += x1 - A
        vs += V
    x = bd - dev * dev / vs
    return {"statistic": x, "df": k - 1, "p": stats.chi2.sf(x, k - 1)}


def cochran_q(rows):
    ws, ds = [], []
    for x1, n1, x2, n2 in rows:
        p1, p2 = x1 / n1, x2 / n2
        v = p1 * (1 - p1) / n1 + p2 * (1 - p2) / n2
        if v > 0:
            ws.append(1 / v)
            ds.append(p1 - p2)
    ws, ds = np.array(ws), np.array(ds)
    mean = (ws * ds).sum() / ws.sum()
    q = (ws * (ds - mean) ** 2).sum()
    return {"statistic": q, "df": len(ws) - 1, "p": stats.chi2.sf(q, len(ws) - 1)}


def restricted(x1, n1, x2, n2, delta):
    """The MLE of pi1 under pi1 - pi2 = delta, by a bounded scalar search."""
    lo, hi = max(0.0, delta), min(1.0, 1.0 + delta)

    def nll(p):
        q = p - delta
        s = 0.0
        for x, n, r in ((x1, n1, p), (x2, n2, q)):
            if x > 0:
                s -= x * math.log(max(r, 1e-300))
            if n - x > 0:
                s -= (n - x) * math.log(max(1 - r, 1e-300))
        return s
    res = optimize.minimize_scalar(nll, bounds=(lo, hi), method="bounded", options={"xatol": 1e-13})
    p = res.x
    # the bounded search never reaches the ends; compare with them
    for edge in (lo, hi):
        if nll(edge) < nll(p):
            p = edge
    return p, p - delta


def score_z(rows, delta):
    num = var = 0.0
    for x1, n1, x2, n2 in rows:
        n = n1 + n2
        w = n1 * n2 / n
        num += w * (x1 / n1 - x2 / n2 - delta)
        p1, p2 = restricted(x1, n1, x2, n2, delta)
        var += w * w * n / (n - 1) * (p1 * (1 - p1) / n1 + p2 * (1 - p2) / n2)
    return num / math.sqrt(var)


def stratified_score(rows):
    z = stats.norm.ppf((1 + LEVEL) / 2)
    w = sum(n1 * n2 / (n1 + n2) for _, n1, _, n2 in rows)
    rd = sum((x1 * n2 - x2 * n1) / (n1 + n2) for x1, n1, x2, n2 in rows) / w
    lower = optimize.brentq(lambda d: score_z(rows, d) - z, -0.999999, rd, xtol=1e-12)
    upper = optimize.brentq(lambda d: score_z(rows, d) + z, rd, 0.999999, xtol=1e-12)
    return {"estimate": rd, "lower": lower, "upper": upper}


def mh_odds_ratio(rows):
    r = sum(x1 * (n2 - x2) / (n1 + n2) for x1, n1, x2, n2 in rows)
    s = sum((n1 - x1) * x2 / (n1 + n2) for x1, n1, x2, n2 in rows)
    return r / s


checks = []
for name, rows in BREAKDOWNS.items():
    psi = mh_odds_ratio(rows)
    checks.append({"breakdown": name, "rows": rows, "level": LEVEL,
                   "cmh": cmh(rows), "exact": exact(rows),
                   "breslow_day_tarone": breslow_day_tarone(rows, psi), "cochran_q": cochran_q(rows),
                   "stratified_score": stratified_score(rows)})

tails = [{"x": x, "df": df, "p": stats.chi2.sf(x, df), "log_p": stats.chi2.logsf(x, df)}
         for x, df in [(0.5, 2), (3.2, 2), (7.81, 3), (15.0, 7), (1.0, 7), (40.0, 5), (120.0, 4), (2.0, 10),
                       (900.0, 3), (700.0, 12)]]

json.dump({"description": "Check values for the stratified analysis from SciPy's general functions (not software for stratified "
                          "comparisons). status \"reference-library\": cross-implementation checks.",
           "source": SRC, "status": "reference-library", "checks": checks, "chi2_tails": tails},
          open("strata-scipy.json", "w"), indent=1, default=float)
