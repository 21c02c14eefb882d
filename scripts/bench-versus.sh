#!/usr/bin/env bash
# Every benchmark of this tree beside the same benchmark of an older
# checkout, to show that a change made nothing slower. Each package's test
# binary is built once in both trees; then, for ROUNDS rounds, all the old
# binaries run and all the new ones, old first in odd rounds and new first in
# even ones, so that the drift of a shared machine (a third from one minute
# to the next) falls on both sides alike. The table gives, per case, the
# median ns/op of each side, the median and the range of the per-round
# ratios new/old (the ratio of two runs a minute apart, so the drift mostly
# cancels), and the allocations per op of each side; the last lines give the
# worst ratio, the count of cases slower by more than 5 % (median ratio above
# 1.05) and the benchmarks found on one side only. Not part of `make test`.
#
#   scripts/bench-versus.sh OLD_DIR [ROUNDS] [BENCHTIME]
#
#   OLD_DIR    a checkout of an older revision (e.g. made with git worktree)
#   ROUNDS     rounds of old and new runs, 5 by default
#   BENCHTIME  the -test.benchtime of each run, 0.2s by default
#
# Packages compared (old → new): proportions → proportions,
# proportions/exact → proportions/operating (or proportions/operating when
# OLD_DIR has no proportions/exact), proportions/planning →
# proportions/planning, notebookui → notebookui. A benchmark is matched by
# name across these packages (BenchmarkSampleSize, BenchmarkPowerAt and
# BenchmarkDetectableDifference moved from proportions to
# proportions/planning), after the old name is rewritten by the rename rules
# below: the method keys in sub-benchmark names ("katz" → "katz-ratio",
# "score" → "farrington-manning-test", ...) and renamed benchmark functions.
#
# The whole set (about 240 cases a side) takes some 2–2.5 minutes a side and
# round, so a default run takes 20–25 minutes. To run fewer cases or to look
# again at one case with more rounds:
#
#   BENCH='^BenchmarkAnalyze$' scripts/bench-versus.sh ../old
#   BENCH='^BenchmarkFisher$/^n1e6$/^near$/^fisher-test$/^two-sided$' scripts/bench-versus.sh ../old 15
#   BENCH_SKIP='Previous|/previous$' scripts/bench-versus.sh ../old
#
# Environment:
#   BENCH       -test.bench pattern, in the new names (default "."); the old
#               binaries get the same pattern with each slash-separated part
#               that is a renamed key or function (bare or in ^…$) put back
#               to its old name
#   BENCH_OLD   the pattern for the old binaries, when that rewriting is not
#               enough
#   BENCH_SKIP  -test.skip pattern for both sides (default none); e.g.
#               'Previous|/previous$' leaves out the benchmarks of the
#               previous implementations kept in the tests for comparison
#   BENCH_MAP   a file of extra rename rules (same format as below)
#   NEW_DIR     the new tree (default: the tree holding this script)
#   RAW         a file to keep the raw per-round records in
#               (side round package name ns/op B/op allocs/op)
#
# Run both sides under the same conditions (the same nice level, nothing
# else of yours running); `nice -n 10 scripts/bench-versus.sh ...` is fine.
set -euo pipefail

usage() {
	echo "usage: scripts/bench-versus.sh OLD_DIR [ROUNDS] [BENCHTIME]   (see the comment at the top for BENCH and the rest)" >&2
	exit 2
}
[[ $# -ge 1 && $# -le 3 ]] || usage

here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
new_dir="$(cd "${NEW_DIR:-$here}" && pwd)"
[[ -d "$1" ]] || { echo "bench-versus: OLD_DIR $1 is not a directory" >&2; exit 2; }
old_dir="$(cd "$1" && pwd)"
rounds="${2:-5}"
benchtime="${3:-0.2s}"
bench="${BENCH:-.}"
skip="${BENCH_SKIP:-}"
if ! [[ "$rounds" =~ ^[1-9][0-9]*$ ]]; then
	echo "bench-versus: ROUNDS=$rounds is not a whole number of rounds (1 or more, e.g. 5)" >&2
	exit 2
fi
if ! [[ "$benchtime" =~ ^[0-9]+(\.[0-9]+)?(ns|us|µs|ms|s|m|x)$ ]]; then
	echo "bench-versus: BENCHTIME=$benchtime is not a Go benchmark time (a duration such as 0.2s or 1s, or a count such as 100x)" >&2
	exit 2
fi
if [[ -n "${BENCH_MAP:-}" && ! -r "$BENCH_MAP" ]]; then
	echo "bench-versus: BENCH_MAP=$BENCH_MAP cannot be read" >&2
	exit 2
fi
# One GOMAXPROCS for both sides, given explicitly so that the "-N" suffix of
# the benchmark names is known.
procs="${GOMAXPROCS:-$(nproc)}"

work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

# Rename rules, old → new. "key OLD NEW": a sub-benchmark name segment that
# is a method key; "func OLD NEW": a benchmark function (OLD* NEW* renames a
# prefix).
cat >"$work/map" <<'EOF'
key  katz                katz-ratio
key  katz-zero-adjusted  katz-zero-adjusted-ratio
key  koopman             koopman-ratio
key  mn-ratio            miettinen-nurminen-ratio
key  woolf               woolf-odds-ratio
key  gart                gart-odds-ratio
key  mn-odds-ratio       miettinen-nurminen-odds-ratio
key  cornfield           cornfield-odds-ratio
key  cornfield-midp      cornfield-mid-p-odds-ratio
key  baptista-pike       baptista-pike-odds-ratio
key  wilson              wilson-rate
key  wilson-cc           wilson-cc-rate
key  clopper-pearson     clopper-pearson-rate
key  jeffreys            jeffreys-rate
key  score               farrington-manning-test
key  mn-test             miettinen-nurminen-test
key  chi-square          pearson-chi-square-test
key  yates               yates-test
key  g-test              likelihood-ratio-chi-square-test
key  fisher              fisher-test
key  fisher-midp         fisher-mid-p-test
key  barnard             barnard-test
key  barnard-wald        barnard-wald-test
key  boschloo            boschloo-test
key  boschloo-doubled    boschloo-doubled-test
key  fm-ratio-test       farrington-manning-ratio-test
key  mn-ratio-test       miettinen-nurminen-ratio-test
key  mn-odds-ratio-test  miettinen-nurminen-odds-ratio-test
EOF
if [[ -n "${BENCH_MAP:-}" ]]; then
	cat "$BENCH_MAP" >>"$work/map"
fi

# The old binaries' pattern: each slash-separated part of BENCH that is a new
# name (bare or anchored) goes back to its old name.
if [[ -n "${BENCH_OLD:-}" ]]; then
	bench_old="$BENCH_OLD"
else
	bench_old="$(awk -v pat="$bench" '
		$1 == "key" || ($1 == "func" && $2 !~ /\*$/) { back[$3] = $2 }
		END {
			n = split(pat, part, "/")
			for (i = 1; i <= n; i++) {
				p = part[i]; pre = ""; post = ""
				if (substr(p, 1, 1) == "^") { pre = "^"; p = substr(p, 2) }
				if (substr(p, length(p), 1) == "$") { post = "$"; p = substr(p, 1, length(p) - 1) }
				if (p in back) p = back[p]
				out = out (i > 1 ? "/" : "") pre p post
			}
			print out
		}' <(grep -v '^[[:space:]]*\(#\|$\)' "$work/map"))"
fi

# old package → new package; the old one falls back to the new path.
old_pkgs=(proportions proportions/exact proportions/planning notebookui)
new_pkgs=(proportions proportions/operating proportions/planning notebookui)
old_paths=()
new_paths=()
for i in "${!new_pkgs[@]}"; do
	o="${old_pkgs[$i]}"
	n="${new_pkgs[$i]}"
	[[ -d "$old_dir/$o" ]] || o="$n"
	if [[ -d "$old_dir/$o" ]]; then
		echo "building old $o" >&2
		(cd "$old_dir" && go test -c -o "$work/old.$i.test" "./$o") >&2
	else
		echo "bench-versus: $old_dir has neither ${old_pkgs[$i]} nor $n; skipped" >&2
	fi
	if [[ -d "$new_dir/$n" ]]; then
		echo "building new $n" >&2
		(cd "$new_dir" && go test -c -o "$work/new.$i.test" "./$n") >&2
	else
		echo "bench-versus: $new_dir has no $n; skipped" >&2
	fi
	old_paths+=("$o")
	new_paths+=("$n")
done

raw="${RAW:-$work/raw}"
: >"$raw"
failures=0

# run SIDE ROUND: every binary of one side, appending
# "side round package name ns/op B/op allocs/op" records to the raw file.
run() {
	local side="$1" r="$2" i dir bin pat out
	for i in "${!new_pkgs[@]}"; do
		bin="$work/$side.$i.test"
		[[ -x "$bin" ]] || continue
		if [[ "$side" == old ]]; then
			dir="$old_dir/${old_paths[$i]}"
			pat="$bench_old"
		else
			dir="$new_dir/${new_paths[$i]}"
			pat="$bench"
		fi
		out="$work/out.$side.$r.$i"
		if ! (cd "$dir" && "$bin" -test.run '^$' -test.bench "$pat" ${skip:+-test.skip "$skip"} \
			-test.benchtime "$benchtime" -test.benchmem -test.cpu "$procs") >"$out" 2>&1; then
			echo "bench-versus: the $side ${new_pkgs[$i]} benchmarks failed in round $r:" >&2
			grep -E -- '--- FAIL|panic|Error' "$out" | head -20 >&2 || true
			failures=$((failures + 1))
		fi
		awk -v side="$side" -v r="$r" -v pkg="${new_pkgs[$i]}" -v procs="$procs" '
			/^Benchmark/ {
				name = $1
				if (procs != 1) sub("-" procs "$", "", name)
				ns = ""; bytes = "-"; allocs = "-"
				for (f = 2; f < NF; f++) {
					if ($(f + 1) == "ns/op") ns = $f
					if ($(f + 1) == "B/op") bytes = $f
					if ($(f + 1) == "allocs/op") allocs = $f
				}
				if (ns != "") print side, r, pkg, name, ns, bytes, allocs
			}' "$out" >>"$raw"
	done
}

start=$SECONDS
for ((r = 1; r <= rounds; r++)); do
	if ((r % 2)); then order=(old new); else order=(new old); fi
	for side in "${order[@]}"; do
		run "$side" "$r"
	done
	elapsed=$((SECONDS - start))
	echo "round $r of $rounds done (${order[0]} first), $((elapsed / 60))m$((elapsed % 60))s, about $(((elapsed * (rounds - r) / r + 30) / 60)) min to go" >&2
done

[[ -s "$raw" ]] || { echo "bench-versus: no benchmark ran (BENCH=$bench, old pattern $bench_old)" >&2; exit 1; }

echo "old: $old_dir ($(git -C "$old_dir" rev-parse --short HEAD 2>/dev/null || echo '?'))   new: $new_dir ($(git -C "$new_dir" rev-parse --short HEAD 2>/dev/null || echo '?'))"
echo "$rounds rounds, -test.benchtime $benchtime, GOMAXPROCS $procs, BENCH ${bench}${skip:+, BENCH_SKIP $skip}"
echo

awk '
function median(list,   n, a, i, j, t) {
	n = split(list, a, " ")
	for (i = 2; i <= n; i++) { t = a[i] + 0; for (j = i - 1; j >= 1 && a[j] + 0 > t; j--) a[j + 1] = a[j]; a[j + 1] = t }
	return n % 2 ? a[(n + 1) / 2] : (a[n / 2] + a[n / 2 + 1]) / 2
}
function fmtns(x) { return x < 100 ? sprintf("%.2f", x) : x < 10000 ? sprintf("%.1f", x) : sprintf("%.0f", x) }
function rename(name,   n, seg, i, out, f, p) {
	n = split(name, seg, "/")
	f = seg[1]
	if (f in func_) f = func_[f]
	else for (p in prefix) if (index(f, p) == 1) { f = prefix[p] substr(f, length(p) + 1); break }
	out = f
	for (i = 2; i <= n; i++) out = out "/" ((seg[i] in key_) ? key_[seg[i]] : seg[i])
	return out
}
FNR == 1 { file++ }
file == 1 {
	if ($0 ~ /^[ \t]*(#|$)/) next
	if ($1 == "key") key_[$2] = $3
	else if ($1 == "func" && $2 ~ /\*$/) prefix[substr($2, 1, length($2) - 1)] = substr($3, 1, length($3) - 1)
	else if ($1 == "func") func_[$2] = $3
	next
}
# First pass over the records: in how many packages does each (side, name)
# occur? A name found in one package per side is matched across packages.
file == 2 {
	name = $1 == "old" ? rename($4) : $4
	if (!(($1, name, $3) in seenpkg)) { seenpkg[$1, name, $3] = 1; npkg[$1, name]++ }
	next
}
{
	side = $1; r = $2; pkg = $3; orig = $4
	name = side == "old" ? rename(orig) : orig
	k = npkg[side, name] > 1 ? pkg ": " name : name
	if (!((side, k) in has)) {
		has[side, k] = 1; pkgof[side, k] = pkg
		if (side == "new") order[++cases] = k
		else { oldorder[++oldcases] = k; oldname[k] = orig }
	}
	times[side, k] = times[side, k] " " $5
	ns[side, k, r] = $5
	if ($7 != "-") allocs[side, k] = allocs[side, k] " " $7
	rounds[r] = 1
}
END {
	w = 20
	for (i = 1; i <= cases; i++) if (length(order[i]) > w) w = length(order[i])
	printf "%-" w "s %13s %13s %8s %13s %10s %10s\n", "benchmark (new name)", "old ns/op", "new ns/op", "new/old", "range", "allocs old", "allocs new"
	worst = 0; slower = 0; compared = 0; renamed = 0
	for (pi = 1; pi <= 4; pi++) {
		pkgname = pi == 1 ? "proportions" : pi == 2 ? "proportions/operating" : pi == 3 ? "proportions/planning" : "notebookui"
		header = 0
		for (i = 1; i <= cases; i++) {
			k = order[i]
			if (pkgof["new", k] != pkgname || !(("old", k) in has)) continue
			if (!header) { printf "-- %s\n", pkgname; header = 1 }
			ratios = ""; lo = ""; hi = ""
			for (r in rounds) if ((("old", k, r) in ns) && (("new", k, r) in ns) && ns["old", k, r] > 0) {
				q = ns["new", k, r] / ns["old", k, r]
				ratios = ratios " " q
				if (lo == "" || q < lo) lo = q
				if (hi == "" || q > hi) hi = q
			}
			if (ratios == "") continue
			m = median(ratios); compared++
			if (oldname[k] != k) renamed++
			flag = ""
			if (m > 1.05) { slower++; flag = "  SLOWER"; slowlist = slowlist "\n  " k sprintf(" (%.3f)", m) }
			if (m > worst) { worst = m; worstname = k }
			if (pkgof["old", k] != pkgname) moved[pkgof["old", k] " → " pkgname] = moved[pkgof["old", k] " → " pkgname] + 1
			printf "%-" w "s %13s %13s %8.3f %6.3f..%-5.3f %10s %10s%s\n", k, fmtns(median(times["old", k])), fmtns(median(times["new", k])), m, lo, hi,
				allocs["old", k] == "" ? "-" : median(allocs["old", k]), allocs["new", k] == "" ? "-" : median(allocs["new", k]), flag
		}
	}
	print ""
	for (mv in moved) printf "%d cases moved package (%s), matched by name\n", moved[mv], mv
	printf "%d cases matched through renamed keys or functions\n", renamed
	for (i = 1; i <= oldcases; i++) if (!(("new", oldorder[i]) in has)) { nold++; onlyold = onlyold "\n  " oldname[oldorder[i]] " (" pkgof["old", oldorder[i]] ")" }
	for (i = 1; i <= cases; i++) if (!(("old", order[i]) in has)) { nnew++; onlynew = onlynew "\n  " order[i] " (" pkgof["new", order[i]] ")" }
	printf "only in old (no match in new): %d%s\n", nold, onlyold
	printf "only in new (no match in old): %d%s\n", nnew, onlynew
	if (slower) printf "slower by more than 5%%:%s\n", slowlist
	if (compared) printf "worst new/old: %.3f (%s); %d of %d cases slower by more than 5%%\n", worst, worstname, slower, compared
	else print "worst new/old: none (no case ran on both sides)"
}' "$work/map" "$raw" "$raw"

if ((failures)); then
	echo "bench-versus: $failures benchmark runs failed; their cases may be missing above" >&2
	exit 1
fi
