#!/usr/bin/env bash
# npm test – everything CI checks, in order: Debian test tools, lint, types, unit + integration
# tests (vitest, temporary SQLite files), the production build, and the browser tests
# (Playwright in Debian's Chromium against `next start`, with the mail sink and the Stripe fake).
set -euo pipefail
cd "$(dirname "$0")/.."
export PLAYWRIGHT_SKIP_BROWSER_DOWNLOAD=1
export NEXT_TELEMETRY_DISABLED=1
step() { printf '\n\033[1m== %s\033[0m\n' "$1"; }
step "test tools";  bash scripts/test-tools.sh
step "lint";        npx eslint . --max-warnings=0
step "types";       npx tsc --noEmit -p .
step "unit and integration tests"; npx vitest run
step "build";       npx next build
step "browser tests"; npx playwright test
echo; echo "All checks passed."
