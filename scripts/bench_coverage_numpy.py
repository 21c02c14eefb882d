#!/usr/bin/python3
"""The straightforward vectorised NumPy enumeration of the exact coverage of
the 95% Wald interval for pi1 - pi2, the side-by-side anchor for
proportions/exact (run by scripts/bench-coverage.sh).

Grid pi1, pi2 in {0, 0.01, ..., 1}; for each pi1 one broadcast over
(pi2 x every outcome), as a careful analyst would write it in NumPy. One
core (BLAS threads pinned to 1). Prints the best time of a few runs, the
grid mean and the coverage at (0.3, 0.45).

usage: bench_coverage_numpy.py N [runs]
"""
import os

for _v in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ[_v] = "1"

import math
import sys
import time

import numpy as np

Z = 1.959963984540054  # standard normal quantile at 0.975


def binom_pmf(n, grid):
    """Binomial probabilities, rows = grid values, columns = 0..n."""
    k = np.arange(n + 1)
    logc = np.array([math.lgamma(n + 1) - math.lgamma(i + 1) - math.lgamma(n - i + 1) for i in k])
    out = np.empty((grid.size, n + 1))
    for r, p in enumerate(grid):
        if p == 0:
            out[r] = (k == 0)
        elif p == 1:
            out[r] = (k == n)
        else:
            out[r] = np.exp(logc + k * math.log(p) + (n - k) * math.log1p(-p))
    return out


def wald_coverage(n1, n2, grid):
    x1, x2 = np.arange(n1 + 1), np.arange(n2 + 1)
    p1, p2 = x1 / n1, x2 / n2
    d = p1[:, None] - p2[None, :]
    se = np.sqrt((p1 * (1 - p1) / n1)[:, None] + (p2 * (1 - p2) / n2)[None, :])
    lo, hi = (d - Z * se).ravel(), (d + Z * se).ravel()
    b1, b2 = binom_pmf(n1, grid), binom_pmf(n2, grid)
    cov = np.empty((grid.size, grid.size))
    m = lo.size
    for i in range(grid.size):
        delta = (grid[i] - grid)[:, None]
        inside = (lo[None, :] <= delta) & (delta <= hi[None, :])
        w = (b1[i][None, :, None] * b2[:, None, :]).reshape(grid.size, m)
        cov[i] = (w * inside).sum(axis=1)
    return cov


def main():
    n = int(sys.argv[1])
    runs = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    grid = np.arange(101) / 100.0
    best = math.inf
    for _ in range(runs):
        t0 = time.perf_counter()
        cov = wald_coverage(n, n, grid)
        best = min(best, time.perf_counter() - t0)
    print(f"numpy_seconds {best:.6f}")
    print(f"numpy_mean {cov.mean():.12f}")
    print(f"numpy_point {cov[30, 45]:.12f}")


if __name__ == "__main__":
    main()
