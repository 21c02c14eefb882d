#!/usr/bin/env bash
# Runs one long step of `make test` (or another target) between two short
# progress lines, so a long run is never silent:
#   make test [01:12] Go tests ...
#   make test [04:05] Go tests: done in 2 min 53 s
# Usage: scripts/step.sh "what" command [args...]. The elapsed time counts
# from PROPSCOPE_T0 (seconds since the epoch; the Makefile sets it when
# make starts), else from this step's start. The command's own output
# passes through unchanged, and so does its exit status.
set -uo pipefail
what=$1
shift
start=$(date +%s)
t0=${PROPSCOPE_T0:-$start}
clock() { local s=$(($(date +%s) - t0)); printf '%02d:%02d' $((s / 60)) $((s % 60)); }
took() {
  local s=$(($(date +%s) - start))
  if ((s >= 60)); then printf '%d min %d s' $((s / 60)) $((s % 60)); else printf '%d s' "$s"; fi
}
echo "make test [$(clock)] $what ..."
"$@"
status=$?
if ((status == 0)); then
  echo "make test [$(clock)] $what: done in $(took)"
else
  echo "make test [$(clock)] $what: FAILED (exit $status) after $(took)"
fi
exit "$status"
