#!/usr/bin/env bash
# Starts Jupyter Notebook on 127.0.0.1 with the example notebooks open,
# after making sure the kernel and its tools are installed, and leaves
# nothing running when it stops (Ctrl-C, a closed terminal, or the server's
# own shut-down).
# Extra arguments go to Jupyter, e.g. `scripts/notebook.sh --no-browser --port=9999`.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
"$ROOT/scripts/setup-notebooks.sh"
args=(--ip=127.0.0.1 --notebook-dir="$ROOT" --NotebookApp.default_url=/tree/notebooks)
# Jupyter refuses to start as root unless told that this is intended.
if [ "$(id -u)" -eq 0 ]; then args+=(--allow-root); fi
# On a machine with no web browser (a server, a container) Jupyter would
# warn "No web browser found"; say instead what to do with the address.
if ! /usr/bin/python3 -c 'import webbrowser; webbrowser.get()' >/dev/null 2>&1; then
  args+=(--no-browser)
  echo "notebook: no web browser on this machine; open the http://127.0.0.1:... address printed below in a browser here, or through an SSH tunnel"
fi
# Debian's Jupyter, with the project-local kernel spec (not a python3 that
# happens to be first on PATH, which may lack Jupyter).
export JUPYTER_PATH="$ROOT/.jupyter" JUPYTER_DATA_DIR="$ROOT/.jupyter"

# Jupyter starts each kernel in a session (process group) of its own, and
# the GoNB kernel (v0.11.1) can panic as it shuts down ("close of closed
# channel"), leaving its children behind (gopls and gopls' telemetry
# helper, when PROPSCOPE_GOPLS=1 installed gopls). So Jupyter runs as this
# script's child, not in its place: on exit the script lists every process
# below Jupyter and the process groups they lead, stops Jupyter (which
# shuts its kernels down), then ends by id whatever of that list still runs.
/usr/bin/python3 -m notebook "${args[@]}" "$@" &
jupyter=$!

# below prints the ids of every process below $1, depth first.
below() {
  local child
  for child in $(ps -o pid= --ppid "$1" 2>/dev/null); do
    echo "$child"
    below "$child"
  done
}

# alive keeps the ids in $@ that still run.
alive() {
  local p
  for p in "$@"; do if kill -0 "$p" 2>/dev/null; then echo "$p"; fi; done
}

cleanup() {
  trap - EXIT INT TERM HUP
  local own pids groups p g left
  own=$(ps -o pgid= -p $$ | tr -d ' ')
  pids=$(below "$jupyter")
  groups=""
  for p in $pids; do
    g=$(ps -o pgid= -p "$p" 2>/dev/null | tr -d ' ') || continue
    # A kernel leads its own group; never this script's group.
    if [ -n "$g" ] && [ "$g" != "$own" ] && [ "$g" = "$p" ]; then groups="$groups $g"; fi
  done
  kill -TERM "$jupyter" 2>/dev/null || true
  for _ in $(seq 100); do kill -0 "$jupyter" 2>/dev/null || break; sleep 0.1; done
  # Whatever of the kernels' groups and Jupyter's descendants is left.
  for g in $groups; do kill -TERM -- "-$g" 2>/dev/null || true; done
  # shellcheck disable=SC2086
  left=$(alive $pids $jupyter)
  if [ -n "$left" ]; then
    # shellcheck disable=SC2086
    kill -TERM $left 2>/dev/null || true
    sleep 1
    # shellcheck disable=SC2086
    left=$(alive $left)
    # shellcheck disable=SC2086
    if [ -n "$left" ]; then kill -KILL $left 2>/dev/null || true; fi
  fi
  echo "notebook: server and kernels stopped"
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM
trap 'exit 129' HUP
status=0
wait "$jupyter" || status=$?
exit "$status"
