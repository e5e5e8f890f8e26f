#!/usr/bin/env bash
# The Debian tools the tests use: Chromium (browser tests), poppler-utils (pdfsig, pdftotext,
# pdftoppm: report checks) and ngspice (the outside reference for filter responses).
# As root, missing ones are installed; otherwise this stops with the exact command to run.
set -euo pipefail
need=()
command -v chromium >/dev/null 2>&1 || need+=(chromium)
{ command -v pdfsig >/dev/null 2>&1 && command -v pdftotext >/dev/null 2>&1 && command -v pdftoppm >/dev/null 2>&1; } || need+=(poppler-utils)
command -v ngspice >/dev/null 2>&1 || need+=(ngspice)
[ ${#need[@]} -eq 0 ] && exit 0
if [ "$(id -u)" = "0" ]; then
  echo "Installing Debian test tools: ${need[*]}"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -q
  apt-get install -y -q --no-install-recommends "${need[@]}"
else
  echo "Missing test tools: ${need[*]}. Install them with:" >&2
  echo "  sudo apt-get update && sudo apt-get install -y ${need[*]}" >&2
  exit 1
fi
