#!/usr/bin/env bash
# Side-by-side benchmark of the exact tests and the exact unconditional
# interval against SciPy (Debian's python3-scipy, used as a reference
# library only). Installs python3-scipy when it is missing. Not part of
# `make test`.
#
#   scripts/bench-exact.sh            # Go cases ≥ 2 s CPU each, SciPy ≥ 1 s
#   MINTIME=5s SCIPY_MIN_CPU=3 scripts/bench-exact.sh
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

if ! /usr/bin/python3 -c 'import scipy' 2>/dev/null; then
	echo "installing python3-scipy (Debian) ..." >&2
	SUDO=""
	[ "$(id -u)" -ne 0 ] && SUDO="sudo"
	$SUDO apt-get update -qq
	DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq python3-scipy >/dev/null
fi

out="$(mktemp)"
trap 'rm -f "$out"' EXIT
go run ./cmd/benchexact -mintime "${MINTIME:-2s}" >"$out"
/usr/bin/python3 scripts/bench_exact_scipy.py "$out"
