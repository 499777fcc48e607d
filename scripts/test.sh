#!/usr/bin/env bash
# The whole test suite: unit and reference checks, CLI, then the browser tests
# (which need Debian's chromium; installed here when missing). Ends with the
# plain line "N passed, N failed".
set -uo pipefail
cd "$(dirname "$0")/.."
bash scripts/ensure-chromium.sh || exit 1
mkdir -p test-output
npx vitest run --reporter=default --reporter=json --outputFile.json=test-output/vitest.json "$@"
status=$?
node -e '
  const fs = require("fs");
  try {
    const r = JSON.parse(fs.readFileSync("test-output/vitest.json", "utf8"));
    console.log(`${r.numPassedTests} passed, ${r.numFailedTests} failed`);
  } catch (error) {
    console.log("0 passed, 1 failed");
    console.error(`test summary unreadable: ${error.message}`);
  }
'
exit $status
