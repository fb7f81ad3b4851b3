#!/usr/bin/env bash
# From a fresh clone: install, create the SQLite database with the demo workspace,
# build, and start Haulcase on http://127.0.0.1:3000 (PORT to change it).
set -euo pipefail
cd "$(dirname "$0")/.."
export NEXT_TELEMETRY_DISABLED=1
npm ci --no-audit --no-fund
npm run --silent db:setup
node_modules/.bin/tsx scripts/build-workers.ts
node_modules/.bin/next build
echo
echo "Haulcase is starting on http://127.0.0.1:${PORT:-3000}. Demo logins (password: haulcase-demo):"
echo "  admin@aldervane.test  analyst@aldervane.test  approver@aldervane.test  viewer@aldervane.test"
exec node_modules/.bin/next start -H 127.0.0.1 -p "${PORT:-3000}"
