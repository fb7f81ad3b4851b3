#!/usr/bin/env bash
# The whole test suite from a fresh clone: system packages, npm packages, then
# unit, integration (SQLite and a real PostgreSQL) and browser tests.
set -euo pipefail
cd "$(dirname "$0")/.."
export NEXT_TELEMETRY_DISABLED=1
bash scripts/install-system-deps.sh
if [ ! -d node_modules ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  npm ci --no-audit --no-fund
fi
exec node_modules/.bin/vitest run "$@"
