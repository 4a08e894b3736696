#!/usr/bin/env bash
# `npm run demo`: set-up, seed the demo scenario, build, and serve on http://localhost:3000.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/setup.sh bayward
npx tsx scripts/seed.ts
export NUXT_SESSION_PASSWORD="${NUXT_SESSION_PASSWORD:-demo-session-password-change-me-in-production-42}"
export NUXT_PUBLIC_BASE_URL="${NUXT_PUBLIC_BASE_URL:-http://localhost:${PORT:-3000}}"
echo "› building"
npx nuxt build > .data/build.log 2>&1 || { tail -40 .data/build.log; exit 1; }
npx tsx scripts/print-sign-ins.ts
# the local SMTP fake: every message Bayward sends lands in .data/mail/*.eml
BAYWARD_SMTP_FAKE_PORT="${NUXT_SMTP_PORT:-2525}" node scripts/smtp-fake.mjs > .data/smtp-fake.log 2>&1 &
echo "› mail goes to the local SMTP fake on 127.0.0.1:${NUXT_SMTP_PORT:-2525}; read it in .data/mail/"
echo "› serving on http://localhost:${PORT:-3000}  (Ctrl-C to stop)"
PORT="${PORT:-3000}" exec node .output/server/index.mjs
