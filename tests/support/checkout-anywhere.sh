#!/usr/bin/env bash
# CI-side check for issue-class "works wherever the checkout lives": clone this commit into a private (0700) temporary
# folder whose path has a space and is longer than 80 characters, and run the cluster-script tests there.
set -euo pipefail
src="$(cd "$(dirname "$0")/../.." && pwd)"
tmp="$(mktemp -d)"   # mode 0700: the postgres user cannot enter it
dest="$tmp/a checkout with spaces/$(printf 'deep-%.0s' {1..14})"
# The clone's cluster lives under /tmp (its folder is private): stop it and remove it too.
cleanup() {
  if [ -d "$dest" ]; then
    local data; data=$(cd "$dest" && bash server/cli/pg.sh where | sed -n 's/^data=//p')
    (cd "$dest" && bash server/cli/pg.sh stop >/dev/null 2>&1) || true
    case "$data" in /tmp/dw-pg-*) rm -rf "$(dirname "$data")" ;; esac
  fi
  rm -rf "$tmp"
}
trap cleanup EXIT
git clone -q "$src" "$dest"
ln -s "$src/node_modules" "$dest/node_modules"
cd "$dest"
echo "[ci] cluster-script tests from a 0700 folder, ${#dest}-character path with spaces"
npx vitest run --project api tests/api/pg-script.test.ts
