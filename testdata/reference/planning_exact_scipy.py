#!/usr/bin/python3
"""Exact power of Fisher's exact test (two-sided, alpha = 0.05) by full
enumeration with SciPy's general functions: scipy.stats.binom.pmf for the
outcome probabilities and scipy.stats.fisher_exact for the decision on every
2x2 table. Used as a cross-implementation check of proportions/planning
(status 'recomputed'). Run with Debian's python3-scipy:
/usr/bin/python3 testdata/reference/planning_exact_scipy.py"""
import json
import scipy
from scipy.stats import binom, fisher_exact

def power(p1, p2, n1, n2, alpha=0.05):
    total = 0.0
    for x1 in range(n1 + 1):
        for x2 in range(n2 + 1):
            _, p = fisher_exact([[x1, n1 - x1], [x2, n2 - x2]], alternative="two-sided")
            if p <= alpha:
                total += binom.pmf(x1, n1, p1) * binom.pmf(x2, n2, p2)
    return total

cases = [(0.45, 0.20, 40, 40), (0.70, 0.20, 19, 19), (0.70, 0.20, 20, 20),
         (0.70, 0.20, 21, 21), (0.10, 0.35, 30, 45)]
out = []
for p1, p2, n1, n2 in cases:
    out.append({"id": "SP-fisher-power-%g-%g-%d-%d" % (p1, p2, n1, n2), "test": "fisher-test",
                "p1": p1, "p2": p2, "n1": n1, "n2": n2, "alpha": 0.05,
                "alternative": "two-sided", "power": round(power(p1, p2, n1, n2), 12),
                "source": "SciPy %s (Debian python3-scipy): binom.pmf and fisher_exact over every table; "
                          "testdata/reference/planning_exact_scipy.py" % scipy.__version__,
                "status": "recomputed"})
print(json.dumps(out, indent=1))
