#!/usr/bin/env bash
# Starts Jupyter Notebook on 127.0.0.1 with the example notebooks open,
# after making sure the kernel and its tools are installed.
# Extra arguments go to Jupyter, e.g. `scripts/notebook.sh --no-browser --port=9999`.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
"$ROOT/scripts/setup-notebooks.sh"
args=(--ip=127.0.0.1 --notebook-dir="$ROOT" --NotebookApp.default_url=/tree/notebooks)
# Jupyter refuses to start as root unless told that this is intended.
if [ "$(id -u)" -eq 0 ]; then args+=(--allow-root); fi
# Debian's Jupyter, with the project-local kernel spec (not a python3 that
# happens to be first on PATH, which may lack Jupyter).
export JUPYTER_PATH="$ROOT/.jupyter" JUPYTER_DATA_DIR="$ROOT/.jupyter"
exec /usr/bin/python3 -m notebook "${args[@]}" "$@"
