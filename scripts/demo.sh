#!/usr/bin/env bash
# `npm run demo`: set-up, seed the demo scenario, build, and serve on http://localhost:3000.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/setup.sh bayward
# files on local disk by default; NUXT_UPLOADS_DRIVER=s3 with no bucket named starts a local S3-compatible server
# (before the seed, which writes the demo's certificates there)
if [ "${NUXT_UPLOADS_DRIVER:-disk}" = s3 ] && [ -z "${NUXT_UPLOADS_S3_ENDPOINT:-}" ]; then
  node scripts/s3-fake.mjs > .data/s3-fake.log 2>&1 &
  export NUXT_UPLOADS_S3_ENDPOINT="http://127.0.0.1:${BAYWARD_S3_FAKE_PORT:-4569}" NUXT_UPLOADS_S3_BUCKET=bayward \
    NUXT_UPLOADS_S3_ACCESS_KEY_ID=S3RVER NUXT_UPLOADS_S3_SECRET_ACCESS_KEY=S3RVER NUXT_UPLOADS_S3_REGION=us-east-1
  for _ in $(seq 50); do grep -q listening .data/s3-fake.log 2>/dev/null && break; sleep 0.1; done
  echo "› files go to the local S3 server on $NUXT_UPLOADS_S3_ENDPOINT (bucket bayward, objects in .data/s3/)"
else
  echo "› files go to .data/uploads/ (NUXT_UPLOADS_DRIVER=${NUXT_UPLOADS_DRIVER:-disk})"
fi
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
