#!/usr/bin/env bash
# The browser and PDF tests need Debian's chromium and poppler-utils (pdftotext). As root, install what is missing
# (the way pg.sh ensure-installed does for PostgreSQL); otherwise say in one line what to install and fail.
set -euo pipefail
need=()
command -v chromium >/dev/null || need+=(chromium)
command -v pdftotext >/dev/null || need+=(poppler-utils)
[ ${#need[@]} -eq 0 ] && exit 0
if [ "$(id -u)" = 0 ] && command -v apt-get >/dev/null; then
  echo "[test] installing ${need[*]} (apt-get)"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${need[@]}" >/dev/null
else
  echo "[test] the browser and PDF tests need: sudo apt-get install -y ${need[*]}" >&2
  exit 1
fi
