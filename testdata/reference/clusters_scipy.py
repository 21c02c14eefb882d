"""Reference values for the clustered analyses (proportions/clusters), from
SciPy's general one-way ANOVA (scipy.stats.f_oneway), two-sample t test
(scipy.stats.ttest_ind) and F distribution (scipy.stats.f), on invented
trays of seeds. Run with Debian's python3-scipy:

    /usr/bin/python3 testdata/reference/clusters_scipy.py > testdata/reference/clusters-scipy.json

The ANOVA is nested (clusters within the two groups): each unit's 0/1
outcome is centred on its group's rate before f_oneway sees all clusters
as one family, which makes f_oneway's between-cluster sum of squares
sum n_ij (p_ij - p_i)^2 and leaves the within sum unchanged; its F has
M - 1 numerator degrees of freedom, so MSC/MSW = F (M - 1)/(M - 2).
"""
import json

import numpy as np
import scipy
from scipy import stats

CASES = [
    # (name, group 1 clusters, group 2 clusters), clusters as (events, trials)
    ("eight trays of twenty", [(15, 20), (18, 20), (12, 20), (19, 20)], [(9, 20), (14, 20), (6, 20), (11, 20)]),
    ("unequal trays", [(3, 5), (10, 12), (20, 31), (7, 8), (1, 4)], [(2, 9), (6, 10), (11, 25), (0, 3)]),
    ("mild clustering", [(40, 60), (38, 60), (44, 60)], [(30, 60), (33, 60), (29, 60), (35, 60)]),
    ("strong clustering", [(10, 10), (0, 10), (9, 10), (2, 10), (10, 10)], [(1, 10), (0, 10), (8, 10), (0, 10), (3, 10)]),
]


def units(events, trials):
    return np.array([1.0] * events + [0.0] * (trials - events))


def case(name, g1, g2, level=0.95):
    families = []
    n_total, m_total, n0_sum = 0, 0, 0.0
    for g in (g1, g2):
        n_g = sum(n for _, n in g)
        p_g = sum(x for x, _ in g) / n_g
        for x, n in g:
            families.append(units(x, n) - p_g)
        n_total += n_g
        m_total += len(g)
        n0_sum += sum(n * n for _, n in g) / n_g
    f_scipy, _ = stats.f_oneway(*families)
    ratio = f_scipy * (m_total - 1) / (m_total - 2)
    df1, df2 = m_total - 2, n_total - m_total
    n0 = (n_total - n0_sum) / df1
    rho = (ratio - 1) / (ratio + n0 - 1)
    alpha = 1 - level
    fl = ratio / stats.f.ppf(1 - alpha / 2, df1, df2)
    fu = ratio / stats.f.ppf(alpha / 2, df1, df2)
    rates1 = [x / n for x, n in g1]
    rates2 = [x / n for x, n in g2]
    t = stats.ttest_ind(rates1, rates2, equal_var=True)
    tq = stats.t.ppf(1 - alpha / 2, len(rates1) + len(rates2) - 2)
    return {
        "name": name,
        "group1": [[x, n] for x, n in g1],
        "group2": [[x, n] for x, n in g2],
        "level": level,
        "f_oneway_centred": float(f_scipy),
        "msc_over_msw": float(ratio),
        "n0": n0,
        "anova_icc": float(rho),
        "searle_lower": float((fl - 1) / (fl + n0 - 1)),
        "searle_upper": float((fu - 1) / (fu + n0 - 1)),
        "cluster_t": float(t.statistic),
        "cluster_t_p": float(t.pvalue),
        "cluster_t_quantile": float(tq),
    }


print(json.dumps({
    "description": "Nested one-way ANOVA mean-square ratio, ANOVA intracluster correlation with Searle's F interval, and the two-sample t test on cluster rates, from SciPy %s (scipy.stats.f_oneway, ttest_ind, f.ppf, t.ppf; Debian python3-scipy); run by testdata/reference/clusters_scipy.py" % scipy.__version__,
    "status": "reference-library",
    "checks": [case(*c) for c in CASES],
}, indent=1))
