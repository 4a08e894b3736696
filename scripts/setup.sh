#!/usr/bin/env bash
# Shared set-up for `npm run demo` and `npm test`: dependencies, PostgreSQL, migrations, read models.
# Usage: source scripts/setup.sh <database-name>
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."

if [ ! -x node_modules/.bin/nuxt ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "› installing dependencies (npm ci)"
  npm ci --no-audit --no-fund
fi

bash scripts/db.sh start
export NUXT_DATABASE_URL="postgres://bayward@127.0.0.1:${BAYWARD_PG_PORT:-54329}/${1:-bayward}"
node scripts/migrate.mjs
# a migration that changes what the read models hold asks for them to be recomputed from the records
npx tsx scripts/rebuild-state.ts --if-needed
