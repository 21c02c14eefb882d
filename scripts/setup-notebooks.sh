#!/usr/bin/env bash
# Installs everything the notebooks and their tests need, and only what is
# missing, so it is cheap to run before every `make notebook`/`make test`:
#   - Debian's Jupyter Notebook and nbconvert, and Chromium for the browser
#     tests (apt-get; needs root or sudo, run only when a package is missing);
#   - GoNB, goimports and gopls, built from the pinned tool modules
#     tools/go.mod and tools/gopls/go.mod into ./.bin (gitignored);
#   - the GoNB kernel spec, installed into ./.jupyter (gitignored) with
#     ./.bin first on the kernel's PATH, so nothing lands in your home folder.
# Set PROPSCOPE_SKIP_GOPLS=1 to skip gopls (about 70 s to build on a fresh
# cache): only editing help in the notebook needs it; executing notebooks
# does not (checked: cells compile and run without it).
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
BIN="$ROOT/.bin"
KERNELS="$ROOT/.jupyter"

apt_packages=(jupyter-notebook python3-nbconvert python3-notebook chromium)
missing=()
for p in "${apt_packages[@]}"; do
  if ! dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q 'install ok installed'; then
    missing+=("$p")
  fi
done
if ((${#missing[@]})); then
  echo "setup: installing Debian packages: ${missing[*]}"
  sudo=()
  if [ "$(id -u)" -ne 0 ]; then sudo=(sudo); fi
  "${sudo[@]}" apt-get update -qq
  DEBIAN_FRONTEND=noninteractive "${sudo[@]}" apt-get install -y -qq "${missing[@]}" >/dev/null
fi

mkdir -p "$BIN"
GOBIN="$BIN" go install -C "$ROOT/tools" tool
if [ "${PROPSCOPE_SKIP_GOPLS:-}" != 1 ]; then
  GOBIN="$BIN" go install -C "$ROOT/tools/gopls" tool
fi

# gonb --install writes kernels/gonb/kernel.json under JUPYTER_DATA_DIR and
# points it at .bin/gonb (it copies the binary only from temporary folders).
# Without gopls (PROPSCOPE_SKIP_GOPLS=1) gonb refuses to install unless told
# that the missing editing helper is expected.
force=()
if [ "${PROPSCOPE_SKIP_GOPLS:-}" = 1 ]; then force=(--force_deps); fi
if ! log=$(JUPYTER_DATA_DIR="$KERNELS" PATH="$BIN:$PATH" "$BIN/gonb" --install "${force[@]}" --logtostderr 2>&1); then
  printf '%s\n' "$log" | tail -n 20 >&2
  echo "setup: gonb --install failed (output above)" >&2
  exit 1
fi
# The kernel finds goimports and gopls only through PATH: put .bin first.
/usr/bin/python3 - "$KERNELS/kernels/gonb/kernel.json" "$BIN" <<'PY'
import json, sys
path, bin_dir = sys.argv[1], sys.argv[2]
with open(path) as f:
    spec = json.load(f)
spec.setdefault("env", {})["PATH"] = bin_dir + ":${PATH}"
with open(path, "w") as f:
    json.dump(spec, f, indent=1)
PY
echo "setup: GoNB kernel ready in $KERNELS (tools in $BIN)"
