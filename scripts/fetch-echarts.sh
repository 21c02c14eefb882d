#!/usr/bin/env bash
# Re-fetches echarts 5.4.3 from the npm registry and checks that the copy
# vendored in notebookui/echarts is byte-identical. With --write it replaces
# the vendored files instead (for an audited upgrade: update the checksums
# in notebookui/echarts/README.md and notebookui/engine.go as well).
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
DEST="$ROOT/notebookui/echarts"
VERSION=5.4.3
TMP="$(mktemp -d)"
trap 'rm -rf "$TMP"' EXIT
cd "$TMP"
npm pack --silent "echarts@$VERSION" >/dev/null
echo "f5522ef24419164903eedcfd2b506c6fc91fb20c  echarts-$VERSION.tgz" | sha1sum -c --quiet
tar -xzf "echarts-$VERSION.tgz"
pairs=("package/dist/echarts.min.js:echarts.min.js" "package/LICENSE:LICENSE" "package/NOTICE:NOTICE" "package/licenses/LICENSE-d3:LICENSE-d3")
status=0
for p in "${pairs[@]}"; do
  src="${p%%:*}" dst="$DEST/${p##*:}"
  if [[ "${1:-}" == "--write" ]]; then
    cp "$src" "$dst"
  elif ! cmp -s "$src" "$dst"; then
    echo "differs from npm echarts@$VERSION: $dst" >&2
    status=1
  fi
done
[[ $status -eq 0 ]] && echo "notebookui/echarts matches npm echarts@$VERSION"
exit $status
