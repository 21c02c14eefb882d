#!/usr/bin/env bash
# The default analysis (Analyze in its quick scope) and one score interval
# (Mee, Miettinen–Nurminen), each beside the yardstick of the speed
# targets: both limits of Mee's interval by plain bisection, about 60 score
# evaluations (BenchmarkPlainBracketing; 6–7 µs on the machines where the
# targets were set). Shared machines vary by a third from one minute to the
# next, so the benchmarks run in alternating rounds and the table gives,
# per case, the fastest and the median round and the median ratio to the
# yardstick's time in the same round. Not part of `make test`.
#
#   scripts/bench-analysis.sh              # 7 rounds of 0.3 s per case
#   ROUNDS=15 BENCHTIME=1s scripts/bench-analysis.sh
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

rounds="${ROUNDS:-7}"
benchtime="${BENCHTIME:-0.3s}"
if ! [[ "$rounds" =~ ^[1-9][0-9]*$ ]]; then
	echo "bench-analysis: ROUNDS=$rounds is not a whole number of rounds (1 or more, e.g. ROUNDS=7)" >&2
	exit 2
fi
if ! [[ "$benchtime" =~ ^[0-9]+(\.[0-9]+)?(ns|us|µs|ms|s|m|x)$ ]]; then
	echo "bench-analysis: BENCHTIME=$benchtime is not a Go benchmark time (a duration such as 0.3s or 1s, or a count such as 1000x)" >&2
	exit 2
fi
bin="$(mktemp)"
raw="$(mktemp)"
trap 'rm -f "$bin" "$raw"' EXIT
go test -c -o "$bin" ./proportions/

for ((r = 1; r <= rounds; r++)); do
	for pattern in 'PlainBracketing' 'Analyze/quick' 'DifferenceIntervals/^(mee|miettinen-nurminen)$/'; do
		"$bin" -test.run '^$' -test.bench "$pattern" -test.benchtime "$benchtime" |
			awk -v r="$r" '/^Benchmark/ { name = $1; sub(/-[0-9]+$/, "", name); sub(/^Benchmark/, "", name); print r, name, $3 }' >>"$raw"
	done
	echo "round $r of $rounds done" >&2
done

# Columns: case, fastest, median, median of (time / yardstick of the same
# table and round); the score intervals are set against the yardstick's
# mean over the tables of that round.
awk '
function median(list,   n, a, i, j, t) {
	n = split(list, a, " ")
	for (i = 2; i <= n; i++) { t = a[i] + 0; for (j = i - 1; j >= 1 && a[j] + 0 > t; j--) a[j + 1] = a[j]; a[j + 1] = t }
	return n % 2 ? a[(n + 1) / 2] : (a[n / 2] + a[n / 2 + 1]) / 2
}
{
	round = $1; name = $2; ns = $3
	if (name ~ /PlainBracketing/) {
		key = name; sub(/.*PlainBracketing\//, "", key)
		yard[round, key] = ns; ysum[round] += ns; ycount[round]++
	}
	if (!(name in seen)) { seen[name] = 1; order[++cases] = name }
	times[name] = times[name] " " ns
	if (!(name in fast) || ns < fast[name]) fast[name] = ns
	rows[++nrows] = round SUBSEP name SUBSEP ns
}
END {
	for (i = 1; i <= nrows; i++) {
		split(rows[i], f, SUBSEP); round = f[1]; name = f[2]; ns = f[3]
		key = name; sub(/.*(quick|PlainBracketing)\//, "", key)
		if (name ~ /Analyze|PlainBracketing/ && (round, key) in yard) ref = yard[round, key]
		else ref = ysum[round] / ycount[round]
		ratio[name] = ratio[name] " " ns / ref
	}
	printf "%-58s %11s %11s %12s\n", "case", "fastest µs", "median µs", "× yardstick"
	for (i = 1; i <= cases; i++) {
		name = order[i]
		printf "%-58s %11.2f %11.2f %12.2f\n", name, fast[name] / 1000, median(times[name]) / 1000, median(ratio[name])
	}
	print ""
	print "Targets: an analysis under 10 µs (about 1.5 × the 6–7 µs yardstick), one score interval under 2 µs (about 0.3 ×)."
}' "$raw"
