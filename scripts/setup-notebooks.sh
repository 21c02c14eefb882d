#!/usr/bin/env bash
# Installs everything the notebooks and their tests need, and only what is
# missing, so it is cheap to run before every `make notebook`/`make test`:
#   - Debian's Jupyter Notebook and nbconvert, and Chromium for the browser
#     tests (apt-get; needs root or sudo, run only when a package is missing);
#   - GoNB and goimports, built from the pinned tool module tools/go.mod
#     into ./.bin (gitignored);
#   - the GoNB kernel spec, installed into ./.jupyter (gitignored) with
#     ./.bin first on the kernel's PATH, so nothing lands in your home folder.
# gopls only gives editing help (completion, hover) in the notebook; running
# cells does not need it (checked: every notebook executes without it), and
# GoNB starts it, with a telemetry helper of its own, whenever it finds it
# on the kernel's PATH. So it is opt-in: PROPSCOPE_GOPLS=1 builds it from
# tools/gopls/go.mod (about 70 s on a fresh cache) into ./.bin/editing and
# puts that folder on the kernel's PATH; without it, the kernel's PATH does
# not hold it. (PROPSCOPE_SKIP_GOPLS=1, the old switch, is the default.)
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

mkdir -p "$BIN" "$BIN/editing"
if [ ! -x "$BIN/gonb" ]; then echo "setup: building GoNB and goimports into $BIN (about a minute the first time)"; fi
GOBIN="$BIN" go install -C "$ROOT/tools" tool
# An older setup built gopls into .bin itself, where the kernel would find
# and start it: keep the build, out of the kernel's way.
if [ -x "$BIN/gopls" ]; then mv -f "$BIN/gopls" "$BIN/editing/gopls"; fi
gopls=0
if [ "${PROPSCOPE_GOPLS:-}" = 1 ]; then
  gopls=1
  echo "setup: building gopls into $BIN/editing (editing help; about 70 s the first time)"
  GOBIN="$BIN/editing" go install -C "$ROOT/tools/gopls" tool
fi

# gonb --install writes kernels/gonb/kernel.json under JUPYTER_DATA_DIR and
# points it at .bin/gonb (it copies the binary only from temporary folders).
# Without gopls gonb refuses to install unless told that the missing
# editing helper is expected.
force=()
if [ "$gopls" != 1 ]; then force=(--force_deps); fi
kernel_path="$BIN"
if [ "$gopls" = 1 ]; then kernel_path="$BIN:$BIN/editing"; fi
if ! log=$(JUPYTER_DATA_DIR="$KERNELS" PATH="$kernel_path:$PATH" "$BIN/gonb" --install "${force[@]}" --logtostderr 2>&1); then
  printf '%s\n' "$log" | tail -n 20 >&2
  echo "setup: gonb --install failed (output above)" >&2
  exit 1
fi
# The kernel finds goimports (and gopls) only through PATH: put .bin first,
# and .bin/editing only when gopls was asked for.
# The kernel's own log (GoNB logs every step to stderr, and v0.11.1 prints
# a panic trace as it shuts down) goes to .jupyter/gonb-kernel.log instead
# of the terminal that runs Jupyter: the kernel starts through sh, which
# sends its stderr to the log and then becomes the kernel (exec), so
# Jupyter's signals still reach GoNB itself.
/usr/bin/python3 - "$KERNELS/kernels/gonb/kernel.json" "$kernel_path" "$KERNELS/gonb-kernel.log" <<'PY'
import json, sys
path, bin_dir, log = sys.argv[1], sys.argv[2], sys.argv[3]
with open(path) as f:
    spec = json.load(f)
spec.setdefault("env", {})["PATH"] = bin_dir + ":${PATH}"
argv = spec["argv"]
if argv[0] != "/bin/sh":
    spec["argv"] = ["/bin/sh", "-c", 'exec "$0" "$@" 2>>"' + log + '"'] + argv
with open(path, "w") as f:
    json.dump(spec, f, indent=1)
PY
echo "setup: GoNB kernel ready in $KERNELS (tools in $BIN)"
