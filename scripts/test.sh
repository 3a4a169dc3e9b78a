#!/usr/bin/env bash
# The whole suite: type check, lint fences, unit, integration (real MariaDB) and browser tests.
set -euo pipefail
cd "$(dirname "$0")/.."
export NEXT_TELEMETRY_DISABLED=1
export LOG_LEVEL="${LOG_LEVEL:-warn}"
bash scripts/ensure-deps.sh
bash scripts/ensure-chromium.sh
echo "tessera: type check"
npx next typegen >/dev/null
npx tsc --noEmit -p .
echo "tessera: lint"
npx eslint . --max-warnings 0
echo "tessera: tests"
npx vitest run "$@"
