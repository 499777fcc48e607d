#!/usr/bin/env bash
# The whole test suite: unit and reference checks, then the browser tests
# (which need Debian's chromium; installed here when missing).
set -euo pipefail
cd "$(dirname "$0")/.."
if [ -f scripts/ensure-chromium.sh ]; then bash scripts/ensure-chromium.sh; fi
exec npx vitest run "$@"
