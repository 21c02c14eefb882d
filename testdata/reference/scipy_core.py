#!/usr/bin/python3
"""Writes scipy-core.json: check values for the core methods from SciPy's
general-purpose functions (chi2_contingency, beta.ppf, norm.logsf,
chi2.logsf/ppf). Run with Debian's python3-scipy: /usr/bin/python3 scipy_core.py.
Values copied from the shared scipy-checks.json keep their own source."""
import json
import scipy
from scipy import stats

SRC = "SciPy %s (Debian python3-scipy), %%s; run by testdata/reference/scipy_core.py" % scipy.__version__
STATUS = "reference-library"

shared = json.load(open('/work/shared/reference/scipy-checks.json'))
checks = []
for x in shared['checks']:
    q = x['quantity']
    if q.startswith('Pearson chi-square') or q.startswith('single proportion interval'):
        e = dict(x)
        e['source'] = shared['source']
        e['status'] = STATUS
        checks.append(e)

tables = [(56, 70, 48, 80), (9, 10, 3, 10), (5, 56, 0, 29), (0, 10, 3, 10), (10, 10, 2, 20),
          (5, 10, 6, 11), (1, 3, 2, 3), (300, 1000, 450, 1000), (3000, 10000, 4500, 10000),
          (74, 105, 43, 75), (1, 1, 0, 1)]
for x1, n1, x2, n2 in tables:
    t = [[x1, x2], [n1 - x1, n2 - x2]]
    for corr, lam, q in [(False, None, 'Pearson chi-square, no continuity correction'),
                         (True, None, 'Pearson chi-square with Yates correction'),
                         (False, 'log-likelihood', 'likelihood-ratio G2, no continuity correction')]:
        s, p, dof, _ = stats.chi2_contingency(t, correction=corr, lambda_=lam)
        checks.append({'data': {'x1': x1, 'n1': n1, 'x2': x2, 'n2': n2}, 'quantity': q,
                       'statistic': float(s), 'p_two_sided': float(p), 'df': int(dof),
                       'source': SRC % "scipy.stats.chi2_contingency(correction=%s, lambda_=%r) on [[x1,x2],[n1-x1,n2-x2]]" % (corr, lam),
                       'status': STATUS})

for x, n in [(81, 263), (15, 148), (0, 20), (1, 29), (29, 29), (13, 300), (7, 7), (0, 1), (1, 2)]:
    for level in (0.9, 0.95, 0.99):
        a = 1 - level
        lo = 0.0 if x == 0 else float(stats.beta.ppf(a / 2, x + 0.5, n - x + 0.5))
        hi = 1.0 if x == n else float(stats.beta.ppf(1 - a / 2, x + 0.5, n - x + 0.5))
        checks.append({'data': {'x': x, 'n': n}, 'quantity': 'single proportion interval, Jeffreys equal-tailed, boundary rule lower=0 at x=0, upper=1 at x=n',
                       'level': level, 'lower': lo, 'upper': hi,
                       'source': SRC % "scipy.stats.beta.ppf quantiles of Beta(x+1/2, n-x+1/2)", 'status': STATUS})
        lo = 0.0 if x == 0 else float(stats.beta.ppf(a / 2, x, n - x + 1))
        hi = 1.0 if x == n else float(stats.beta.ppf(1 - a / 2, x + 1, n - x))
        checks.append({'data': {'x': x, 'n': n}, 'quantity': 'single proportion interval, Clopper-Pearson via beta quantiles',
                       'level': level, 'lower': lo, 'upper': hi,
                       'source': SRC % "scipy.stats.beta.ppf: Beta(x, n-x+1) at a/2 and Beta(x+1, n-x) at 1-a/2", 'status': STATUS})

for z in (1.0, 5.0, 10.0, 20.0, 30.0, 30.2, 37.0, 38.0, 40.0, 50.0, 100.0):
    checks.append({'data': {'z': z}, 'quantity': 'standard normal upper tail, natural log',
                   'value': float(stats.norm.sf(z)), 'log_value': float(stats.norm.logsf(z)),
                   'source': SRC % "scipy.stats.norm.sf / norm.logsf", 'status': STATUS})
for x in (3.841458820694124, 100.0, 900.0):
    checks.append({'data': {'x': x, 'df': 1}, 'quantity': 'chi-square upper tail, natural log',
                   'value': float(stats.chi2.sf(x, 1)), 'log_value': float(stats.chi2.logsf(x, 1)),
                   'source': SRC % "scipy.stats.chi2.sf / chi2.logsf", 'status': STATUS})
checks.append({'data': {'p': 0.95, 'df': 1}, 'quantity': 'chi-square quantile', 'value': float(stats.chi2.ppf(0.95, 1)),
               'source': SRC % "scipy.stats.chi2.ppf", 'status': STATUS})

# Far tails: the pooled z of large tables (the formula evaluated here, an
# independent recomputation) and SciPy's log of its two-sided normal p.
import math
for x1, n1, x2, n2 in [(5000, 10000, 3000, 10000), (5150, 10000, 3000, 10000), (6000, 10000, 3000, 10000),
                       (60000, 100000, 30000, 100000)]:
    p1, p2, pooled = x1 / n1, x2 / n2, (x1 + x2) / (n1 + n2)
    z = (p1 - p2) / math.sqrt(pooled * (1 - pooled) * (1 / n1 + 1 / n2))
    logp = float(stats.norm.logsf(abs(z))) + math.log(2)
    checks.append({'data': {'x1': x1, 'n1': n1, 'x2': x2, 'n2': n2}, 'quantity': 'pooled z, two-sided normal p and its natural log',
                   'statistic': z, 'value': math.exp(logp), 'log_value': logp,
                   'source': SRC % "pooled z formula evaluated in Python (recomputed), tail from scipy.stats.norm.logsf", 'status': STATUS})

out = {'description': 'Check values from SciPy, a general-purpose reference library (not software for comparing proportions). '
                      'status "reference-library": cross-implementation checks from a general library, compared at 1e-9 relative unless a test says otherwise.',
       'conventions': shared['conventions'],
       'checks': checks}
json.dump(out, open('scipy-core.json', 'w'), indent=1)
print(len(checks))
