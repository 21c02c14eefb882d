#!/usr/bin/env bash
# Every benchmark of this tree beside the same benchmark of an older
# checkout, to show that a change made nothing slower. Each package's test
# binary is built once in both trees, and one quick pass (-test.benchtime 1x)
# lists the cases of both sides and pairs them by name. Then, for ROUNDS
# rounds, every paired case runs in the old binary and at once in the new
# one (old first in odd rounds, new first in even ones), each run a process
# of its own with the case's exact name as pattern, so that the two
# measurements of a round are seconds apart and the drift of a shared
# machine (a third from one minute to the next) falls on both alike. The
# table gives, per case, the median ns/op of each side, the median and the
# range of the per-round ratios new/old, and the allocations per op of each
# side, and the ratio of the fastest rounds (new/old; the least disturbed
# runs, a second opinion on a loaded machine); the last lines give the
# geometric mean of the median ratios, the worst ratio, the count of cases
# slower by more than 5 % (median ratio above 1.05) and the cases found on
# one side only. Not part of `make test`.
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
# proportions/planning, notebookui → notebookui. A case is paired by name
# across these packages (BenchmarkSampleSize, BenchmarkPowerAt and
# BenchmarkDetectableDifference moved from proportions to
# proportions/planning), after the old name is rewritten by the rename rules
# below: the method keys in sub-benchmark names ("katz" → "katz-ratio",
# "score" → "farrington-manning-test", ...) and renamed benchmark functions.
#
# The whole set (about 240 cases a side, half a second to a second a run)
# takes 20–25 minutes with the defaults on a loaded two-core machine. To run
# fewer cases, or to look again at one case with more rounds:
#
#   BENCH='^BenchmarkAnalyze$' scripts/bench-versus.sh ../old
#   BENCH='^BenchmarkFisher$/^n1e6$/^near$/^fisher-test$/^two-sided$' scripts/bench-versus.sh ../old 15
#   BENCH_SKIP='Previous|/old-|/gonum-|///^previous$' scripts/bench-versus.sh ../old
#
# Environment:
#   BENCH       -test.bench pattern, in the new names (default "."); the old
#               binaries get the same pattern with each part between / and |
#               that is a renamed key or function (bare or in ^…$) put back
#               to its old name
#   BENCH_OLD   the pattern for the old binaries, when that rewriting is not
#               enough
#   BENCH_SKIP  -test.skip pattern for both sides (default none), put back
#               to the old names like BENCH; e.g.
#               'Previous|/old-|/gonum-|///^previous$' leaves out the
#               yardsticks (previous implementations kept in the tests, and
#               gonum), 69 of the 241 cases
#   BENCH_CASES a file of case names (new names, as in the table's first
#               column), one a line: exactly those cases are run
#   SLOWER      a file to write the names of the cases slower by more than
#               5 % to, ready for BENCH_CASES:
#                 SLOWER=slow.txt scripts/bench-versus.sh ../old
#                 BENCH_CASES=slow.txt scripts/bench-versus.sh ../old 15
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

# exact(NAME): the pattern that selects one case, its name anchored part by
# part.
awk_exact='
function exact(name,   n, seg, i, j, c, out, e) {
	n = split(name, seg, "/")
	for (i = 1; i <= n; i++) {
		e = ""
		for (j = 1; j <= length(seg[i]); j++) {
			c = substr(seg[i], j, 1)
			e = e (index("\\.^$*+?()[]{}|", c) ? "\\" : "") c
		}
		out = out (i > 1 ? "/" : "") "^" e "$"
	}
	return out
}'

# BENCH_CASES: the listed cases and nothing under them.
if [[ -n "${BENCH_CASES:-}" ]]; then
	[[ -r "$BENCH_CASES" ]] || { echo "bench-versus: BENCH_CASES=$BENCH_CASES cannot be read" >&2; exit 2; }
	bench="$(awk "$awk_exact"'NF { out = out (out == "" ? "" : "|") exact($1) } END { print out }' "$BENCH_CASES")"
	below="$(awk "$awk_exact"'NF { out = out (out == "" ? "" : "|") exact($1) "/." } END { print out }' "$BENCH_CASES")"
	[[ -n "$bench" ]] || { echo "bench-versus: BENCH_CASES=$BENCH_CASES names no case" >&2; exit 2; }
	skip="${below}${skip:+|$skip}"
fi

# to_old PATTERN: the pattern with each part (between / and |) that is a new
# name, bare or anchored, put back to its old name.
to_old() {
	awk -v pat="$1" '
		$1 == "key" || ($1 == "func" && $2 !~ /\*$/) { back[$3] = $2 }
		END {
			rest = pat
			while (rest != "") {
				if (match(rest, /[\/|]/)) { p = substr(rest, 1, RSTART - 1); sep = substr(rest, RSTART, 1); rest = substr(rest, RSTART + 1) }
				else { p = rest; sep = ""; rest = "" }
				pre = ""; post = ""
				if (substr(p, 1, 1) == "^") { pre = "^"; p = substr(p, 2) }
				if (p != "" && substr(p, length(p), 1) == "$") { post = "$"; p = substr(p, 1, length(p) - 1) }
				if (p in back) p = back[p]
				out = out pre p post sep
			}
			print out
		}' <(grep -v '^[[:space:]]*\(#\|$\)' "$work/map")
}
bench_old="${BENCH_OLD:-$(to_old "$bench")}"
skip_old=""
[[ -z "$skip" ]] || skip_old="$(to_old "$skip")"

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

# runbin SIDE I PATTERN SKIP BENCHTIME OUT: one run of one binary, in its
# package directory, its output in OUT.
runbin() {
	local side="$1" i="$2" pat="$3" skp="$4" bt="$5" out="$6" dir
	if [[ "$side" == old ]]; then dir="$old_dir/${old_paths[$i]}"; else dir="$new_dir/${new_paths[$i]}"; fi
	(cd "$dir" && "$work/$side.$i.test" -test.run '^$' -test.bench "$pat" ${skp:+-test.skip "$skp"} \
		-test.benchtime "$bt" -test.benchmem -test.cpu "$procs") </dev/null >"$out" 2>&1
}

# parse OUT: "name ns/op B/op allocs/op" for each result line.
parse() {
	awk -v procs="$procs" '
		/^Benchmark/ {
			name = $1
			if (procs != 1) sub("-" procs "$", "", name)
			ns = ""; bytes = "-"; allocs = "-"
			for (f = 2; f < NF; f++) {
				if ($(f + 1) == "ns/op") ns = $f
				if ($(f + 1) == "B/op") bytes = $f
				if ($(f + 1) == "allocs/op") allocs = $f
			}
			if (ns != "") print name, ns, bytes, allocs
		}' "$1"
}

failed() {
	echo "bench-versus: $1 failed:" >&2
	grep -E -- '--- FAIL|panic|[Ee]rror' "$2" | head -20 >&2 || true
	failures=$((failures + 1))
}

# The cases of each side: "binary name" lines, in the order they ran.
echo "listing the cases (one iteration each)" >&2
for side in old new; do
	: >"$work/cases.$side"
	if [[ "$side" == old ]]; then pat="$bench_old" skp="$skip_old"; else pat="$bench" skp="$skip"; fi
	for i in "${!new_pkgs[@]}"; do
		[[ -x "$work/$side.$i.test" ]] || continue
		out="$work/list.$side.$i"
		runbin "$side" "$i" "$pat" "$skp" 1x "$out" || failed "listing the $side ${new_pkgs[$i]} benchmarks" "$out"
		parse "$out" | awk -v i="$i" '{ print i, $1 }' >>"$work/cases.$side"
	done
done

# Pair them: "old-binary old-name old-pattern new-binary new-name
# new-pattern label" lines (tab-separated), in the new order, where a pattern
# is the name anchored part by part; the label is the new name, prefixed by
# the package when the name occurs in more than one package of a side. The
# cases of one side only go to "$work/unpaired".
awk -v pkgs="${new_pkgs[*]}" -v unpaired="$work/unpaired" "$awk_exact"'
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
file == 2 { oi[++no] = $1; on[no] = $2; om[no] = rename($2); if (!((om[no], $1) in od)) { od[om[no], $1] = 1; ocount[om[no]]++ }; next }
file == 3 { ni[++nn] = $1; nm[nn] = $2; if (!(($2, $1) in nd)) { nd[$2, $1] = 1; ncount[$2]++ }; next }
END {
	split(pkgs, pkg, " ")
	for (k = 1; k <= no; k++) {
		key = ocount[om[k]] > 1 || ncount[om[k]] > 1 ? oi[k] SUBSEP om[k] : om[k]
		if (!(key in oldof)) oldof[key] = k
	}
	for (k = 1; k <= nn; k++) {
		dup = ocount[nm[k]] > 1 || ncount[nm[k]] > 1
		key = dup ? ni[k] SUBSEP nm[k] : nm[k]
		if (key in oldof && !(key in done)) {
			done[key] = 1; o = oldof[key]
			printf "%s\t%s\t%s\t%s\t%s\t%s\t%s\n", oi[o], on[o], exact(on[o]), ni[k], nm[k], exact(nm[k]), (dup ? pkg[ni[k] + 1] ": " : "") nm[k]
		} else if (!(key in done)) { done[key] = 1; onlynew = onlynew "\n  " nm[k] " (" pkg[ni[k] + 1] ")"; nnew++ }
	}
	for (key in oldof) if (!(key in done)) { o = oldof[key]; onlyold = onlyold "\n  " on[o] " (" pkg[oi[o] + 1] ")"; nold++ }
	printf "only in old (no match in new): %d%s\n", nold, onlyold >unpaired
	printf "only in new (no match in old): %d%s\n", nnew, onlynew >unpaired
}' <(grep -v '^[[:space:]]*\(#\|$\)' "$work/map") "$work/cases.old" "$work/cases.new" >"$work/pairs"

ncases=$(wc -l <"$work/pairs")
if ((ncases == 0)); then
	echo "bench-versus: no case ran on both sides (BENCH=$bench, old pattern $bench_old)" >&2
	cat "$work/unpaired" >&2
	exit 1
fi
echo "$ncases cases on both sides" >&2

# measure SIDE ROUND BINARY NAME PATTERN LABEL: one case on one side.
measure() {
	local side="$1" r="$2" i="$3" name="$4" pat="$5" label="$6" out="$work/run.out"
	runbin "$side" "$i" "$pat" "$pat/." "$benchtime" "$out" || failed "$side $name in round $r" "$out"
	parse "$out" | awk -v side="$side" -v r="$r" -v pkg="${new_pkgs[$i]}" -v want="$name" -v label="$label" '
		$1 == want { print side, r, pkg, label, $2, $3, $4; found = 1 }
		END { if (!found) print "bench-versus: no result for " side " " want " in round " r > "/dev/stderr" }' >>"$raw"
}

start=$SECONDS
for ((r = 1; r <= rounds; r++)); do
	while IFS=$'\t' read -r io on op in nn np label; do
		if ((r % 2)); then
			measure old "$r" "$io" "$on" "$op" "$label"
			measure new "$r" "$in" "$nn" "$np" "$label"
		else
			measure new "$r" "$in" "$nn" "$np" "$label"
			measure old "$r" "$io" "$on" "$op" "$label"
		fi
	done <"$work/pairs"
	elapsed=$((SECONDS - start))
	echo "round $r of $rounds done ($( ((r % 2)) && echo old || echo new) first in each case), $((elapsed / 60))m$((elapsed % 60))s, about $(((elapsed * (rounds - r) / r + 30) / 60)) min to go" >&2
done

echo "old: $old_dir ($(git -C "$old_dir" rev-parse --short HEAD 2>/dev/null || echo '?'))   new: $new_dir ($(git -C "$new_dir" rev-parse --short HEAD 2>/dev/null || echo '?'))"
if [[ -n "${BENCH_CASES:-}" ]]; then
	echo "$rounds rounds, -test.benchtime $benchtime, GOMAXPROCS $procs, the cases named in $BENCH_CASES${BENCH_SKIP:+, BENCH_SKIP $BENCH_SKIP}"
else
	echo "$rounds rounds, -test.benchtime $benchtime, GOMAXPROCS $procs, BENCH ${bench}${skip:+, BENCH_SKIP $skip}"
fi
echo

[[ -z "${SLOWER:-}" ]] || : >"$SLOWER"
awk -v pkgs="${new_pkgs[*]}" -v slowfile="${SLOWER:-}" '
function median(list,   n, a, i, j, t) {
	n = split(list, a, " ")
	for (i = 2; i <= n; i++) { t = a[i] + 0; for (j = i - 1; j >= 1 && a[j] + 0 > t; j--) a[j + 1] = a[j]; a[j + 1] = t }
	return n % 2 ? a[(n + 1) / 2] : (a[n / 2] + a[n / 2 + 1]) / 2
}
function fastest(list,   n, a, i, m) {
	n = split(list, a, " ")
	for (i = 1; i <= n; i++) if (i == 1 || a[i] + 0 < m) m = a[i] + 0
	return m
}
function fmtns(x) { return x < 100 ? sprintf("%.2f", x) : x < 10000 ? sprintf("%.1f", x) : sprintf("%.0f", x) }
BEGIN { FS = "\t"; npkg = split(pkgs, pkg, " ") }
FNR == 1 { file++ }
file == 1 {
	k = $7; order[++cases] = k; newpkg[k] = pkg[$4 + 1]; oldpkg[k] = pkg[$1 + 1]
	if ($2 != $5) renamed++
	if (length(k) > w) w = length(k)
	next
}
file == 2 {
	split($0, f, " ")
	side = f[1]; r = f[2]; k = f[4]
	times[side, k] = times[side, k] " " f[5]
	ns[side, k, r] = f[5]
	if (f[7] != "-") allocs[side, k] = allocs[side, k] " " f[7]
	rounds[r] = 1
	next
}
{ unpaired = unpaired $0 "\n" }
END {
	if (w < 20) w = 20
	printf "%-" w "s %13s %13s %8s %13s %8s %10s %10s\n", "benchmark (new name)", "old ns/op", "new ns/op", "new/old", "range", "fastest", "allocs old", "allocs new"
	for (pi = 1; pi <= npkg; pi++) {
		header = 0
		for (i = 1; i <= cases; i++) {
			k = order[i]
			if (newpkg[k] != pkg[pi]) continue
			ratios = ""; lo = ""; hi = ""
			for (r in rounds) if ((("old", k, r) in ns) && (("new", k, r) in ns) && ns["old", k, r] > 0) {
				q = ns["new", k, r] / ns["old", k, r]
				ratios = ratios " " q
				if (lo == "" || q < lo) lo = q
				if (hi == "" || q > hi) hi = q
			}
			if (ratios == "") { missing = missing "\n  " k; continue }
			if (!header) { printf "-- %s\n", pkg[pi]; header = 1 }
			m = median(ratios); compared++; logsum += log(m)
			if (m < 1 / 1.05) faster++
			flag = ""
			if (m > 1.05) { slower++; flag = "  SLOWER"; slowlist = slowlist "\n  " k sprintf(" (%.3f)", m); if (slowfile != "") print k >slowfile }
			if (m > worst) { worst = m; worstname = k }
			if (oldpkg[k] != newpkg[k]) moved[oldpkg[k] " → " newpkg[k]]++
			printf "%-" w "s %13s %13s %8.3f %6.3f..%-5.3f %8.3f %10s %10s%s\n", k, fmtns(median(times["old", k])), fmtns(median(times["new", k])), m, lo, hi,
				fastest(times["new", k]) / fastest(times["old", k]),
				allocs["old", k] == "" ? "-" : median(allocs["old", k]), allocs["new", k] == "" ? "-" : median(allocs["new", k]), flag
		}
	}
	print ""
	for (mv in moved) printf "%d cases moved package (%s), paired by name\n", moved[mv], mv
	printf "%d cases paired through renamed keys or functions\n", renamed
	printf "%s", unpaired
	if (missing != "") printf "paired but without a result on both sides in any round:%s\n", missing
	if (slower) printf "slower by more than 5%%:%s\n", slowlist
	if (compared) printf "geometric mean of the median ratios: %.3f; %d cases faster by more than 5%% (new/old below 1/1.05)\n", exp(logsum / compared), faster
	if (compared) printf "worst new/old: %.3f (%s); %d of %d cases slower by more than 5%%\n", worst, worstname, slower, compared
	else print "worst new/old: none (no case ran on both sides)"
}' "$work/pairs" "$raw" "$work/unpaired"

if ((failures)); then
	echo "bench-versus: $failures runs failed; their cases may be missing above" >&2
	exit 1
fi
