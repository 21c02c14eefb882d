#!/usr/bin/python3
"""Side-by-side timing of propscope's exact tests against SciPy.

Reads the JSON lines written by `go run ./cmd/benchexact` (file given as the
first argument), times SciPy's general-purpose functions on the same tables
(fisher_exact, barnard_exact, boschloo_exact), and prints a table with both
times and the ratio against the speed targets. SciPy is used only as a
reference library. BLAS threads are pinned to 1; times are CPU time per call
(time.process_time), less disturbed than wall time on a shared machine;
wall time is printed too.
"""
import os

for _v in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ[_v] = "1"

import json
import sys
import time

import scipy
from scipy import stats

# case -> (SciPy call, speed-up target over SciPy, note)
TARGETS = {
    "fisher-10000": (50, "fisher_exact two-sided"),
    "barnard-800": (100, "barnard_exact two-sided, pooled, n=32 points (default)"),
    "boschloo-doubled-400": (500, "boschloo_exact two-sided (doubling), n=32 points (default)"),
    "boschloo-400": (None, "vs boschloo_exact two-sided; ours orders by two-sided Fisher p (another convention)"),
}
# case -> target in seconds of CPU per call (no SciPy counterpart)
ABSOLUTE = {
    "chan-zhang-100": 0.2, "agresti-min-100": 0.2,
    "chan-zhang-500": 0.5, "chan-zhang-1000": 2.0,
    "barnard-sample-size": 3.0, "boschloo-sample-size": 3.0,
    "barnard-power-curve": 10.0, "boschloo-power-curve": 10.0,
}


def scipy_call(case, t):
    if case.startswith("fisher-test"):
        return lambda: stats.fisher_exact(t, alternative="two-sided").pvalue
    if case.startswith("barnard-test"):
        return lambda: stats.barnard_exact(t, alternative="two-sided").pvalue
    return lambda: stats.boschloo_exact(t, alternative="two-sided").pvalue


def timed(f, min_cpu):
    f()  # warm-up
    calls, c0, w0 = 0, time.process_time(), time.perf_counter()
    while calls < 1 or time.process_time() - c0 < min_cpu:
        r = f()
        calls += 1
    return r, (time.process_time() - c0) / calls, (time.perf_counter() - w0) / calls, calls


def fmt(s):
    return f"{s * 1e6:.1f} µs" if s < 1e-3 else (f"{s * 1e3:.2f} ms" if s < 1 else f"{s:.2f} s")


def main():
    rows = [json.loads(l) for l in open(sys.argv[1]) if l.strip()]
    min_cpu = float(os.environ.get("SCIPY_MIN_CPU", "1.0"))
    print(f"SciPy {scipy.__version__}; times are CPU time per call (wall in brackets)\n")
    print(f"{'case':22} {'propscope':>22} {'SciPy':>24} {'ratio':>8} {'target':>8}  result (propscope / SciPy)")
    ok = True
    for r in rows:
        case, go_cpu, go_wall = r["case"], r["cpu_seconds_per_call"], r["wall_seconds_per_call"]
        n, x1, x2 = r["n_per_group"], r["x1"], r["x2"]
        t = [[x1, x2], [n - x1, n - x2]]  # SciPy: the two samples are the COLUMNS
        gocol = f"{fmt(go_cpu)} [{fmt(go_wall)}]"
        if case in ABSOLUTE:
            lim = ABSOLUTE[case]
            verdict = "ok" if go_cpu < lim else "SLOW"
            ok &= go_cpu < lim
            print(f"{case:22} {gocol:>22} {'(no SciPy function)':>24} {'':>8} {'<' + str(lim) + ' s':>8}  {r['result']}  {verdict}")
            continue
        target, note = TARGETS[case]
        p, sc_cpu, sc_wall, _ = timed(scipy_call(case, t), min_cpu)
        ratio = sc_cpu / go_cpu
        verdict = ""
        if target:
            verdict = "ok" if ratio >= target else "BELOW TARGET"
            ok &= ratio >= target
        scol = f"{fmt(sc_cpu)} [{fmt(sc_wall)}]"
        tg = f"{target}x" if target else "-"
        print(f"{case:22} {gocol:>22} {scol:>24} {ratio:>7.0f}x {tg:>8}  {r['result']} / {p:.10g}  {verdict}  ({note})")
    print("\nall targets met" if ok else "\nsome targets missed (the machine may be busy: rerun)")


if __name__ == "__main__":
    main()
