#!/usr/bin/env bash
# Side-by-side speed of the exact coverage engine (proportions/exact)
# against the straightforward vectorised NumPy enumeration of the same
# Wald coverage surface (n1 = n2 = 500, 101 × 101 grid), with the ratio,
# plus the Miettinen–Nurminen surface and the memory at 1000 per group.
# Installs Debian's python3-numpy when it is missing. Not part of `make
# test`: timings belong in benchmarks, never in tests.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

PY=/usr/bin/python3
if ! "$PY" -c 'import numpy' 2>/dev/null; then
	echo "installing Debian's python3-numpy" >&2
	SUDO=""
	if [ "$(id -u)" -ne 0 ]; then SUDO=sudo; fi
	$SUDO apt-get update -qq
	$SUDO apt-get install -y -qq python3-numpy >/dev/null
fi

GO_RUNS=${GO_RUNS:-5}
NUMPY_RUNS=${NUMPY_RUNS:-3}
out=$(mktemp)
trap 'rm -f "$out"' EXIT

echo "Go benchmarks ($(go env GOOS)/$(go env GOARCH), GOMAXPROCS = $(nproc), best of $GO_RUNS) ..." >&2
go test -run '^$' -bench '^Benchmark(WaldSurface500|MiettinenNurminenSurface500|Memory1000)$' \
	-benchtime 20x -count "$GO_RUNS" ./proportions/exact >"$out"
echo "NumPy enumeration (one core, best of $NUMPY_RUNS) ..." >&2
numpy=$("$PY" scripts/bench_coverage_numpy.py 500 "$NUMPY_RUNS")

best() { # best ns/op of a benchmark
	awk -v name="$1" '$1 ~ "^Benchmark"name"(-[0-9]+)?$" { if (min == "" || $3 < min) min = $3 } END { print min }' "$out"
}
metric() { # last value of a custom metric of a benchmark
	awk -v name="$1" -v unit="$2" '$1 ~ "^Benchmark"name"(-[0-9]+)?$" { for (i = 4; i < NF; i++) if ($(i+1) == unit) v = $i } END { print v }' "$out"
}
wald_ns=$(best WaldSurface500)
mn_ns=$(best MiettinenNurminenSurface500)
go_mean=$(metric WaldSurface500 mean-coverage)
mem=$(metric Memory1000 MB-heap)
np_s=$(awk '$1 == "numpy_seconds" { print $2 }' <<<"$numpy")
np_mean=$(awk '$1 == "numpy_mean" { print $2 }' <<<"$numpy")

awk -v wald="$wald_ns" -v mn="$mn_ns" -v nps="$np_s" -v gm="$go_mean" -v nm="$np_mean" -v mem="$mem" 'BEGIN {
	printf "Exact coverage of the 95%% Wald interval, n1 = n2 = 500, 101 x 101 grid\n"
	printf "  NumPy vectorised enumeration (1 core):  %10.3f s\n", nps
	printf "  propscope exact engine (all cores):     %10.3f ms\n", wald / 1e6
	printf "  ratio:                                  %10.0f x   (target >= 500 x, i.e. < 10 ms)\n", nps * 1e9 / wald
	printf "  grid mean coverage: NumPy %s, engine %s (benchmark metric, 4 digits)\n", nm, gm
	if (mn != "") printf "Miettinen-Nurminen surface, n = 500, incl. 251,001 intervals: %.3f s   (target < 0.25 s)\n", mn / 1e9
	printf "Heap in use for a table and surface at 1000 per group: %.1f MB   (target < 100 MB)\n", mem
}'
