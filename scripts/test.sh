#!/usr/bin/env bash
# `npm test`: set-up against the test database, then lint, type-check, build, and every vitest project.
set -euo pipefail
cd "$(dirname "$0")/.."
source scripts/setup.sh bayward_test
bash scripts/ensure-tools.sh
export NUXT_SESSION_PASSWORD="${NUXT_SESSION_PASSWORD:-test-session-password-not-for-production-use-0123}"
export NUXT_PUBLIC_BASE_URL="${NUXT_PUBLIC_BASE_URL:-http://localhost:3000}"
export BAYWARD_SMTP_CAPTURE_DIR="${BAYWARD_SMTP_CAPTURE_DIR:-$(pwd)/.data/mail-test}"
export NUXT_SMTP_PORT="${NUXT_SMTP_PORT:-2526}"
export BAYWARD_DIGEST_DISABLED="${BAYWARD_DIGEST_DISABLED:-true}"
BAYWARD_SMTP_FAKE_PORT="$NUXT_SMTP_PORT" node scripts/smtp-fake.mjs > .data/smtp-fake-test.log 2>&1 &
SMTP_FAKE_PID=$!
trap 'kill "$SMTP_FAKE_PID" 2>/dev/null || true' EXIT

echo "› lint";       npx eslint .
# two commands, not an && list: under set -e a failure left of && would not stop the run
echo "› typecheck";  npx nuxt typecheck
npx tsc -p service-worker
echo "› build";      npx nuxt build > .data/build.log 2>&1 || { tail -40 .data/build.log; exit 1; }
echo "› tests";      npx vitest run "$@"
