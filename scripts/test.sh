#!/usr/bin/env bash
# npm test: a fresh PostgreSQL cluster and database of its own on a free port, a build of its own,
# then the unit, API and browser tests (vitest). Safe to run while npm start is running.
set -euo pipefail
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
started=$SECONDS

ensure_node_modules
ensure_postgres
[ -x /usr/bin/chromium ] || apt_install chromium

# A new cluster for every run: nothing left over from an earlier run can make a test pass or fail.
pg_down test
rm -rf "$(cluster_dir test)"
trap 'pg_down test' EXIT
PG_PORT="$(free_port "${TRAPLINE_TEST_PG_PORT:-54400}")"
PG_FSYNC=off pg_up test "$PG_PORT"
ensure_database "$PG_PORT" trapline_test
export TEST_DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/trapline_test"
migrate "$TEST_DATABASE_URL"

# The tests run against a production build in its own folder, so a running npm start is untouched.
export TRAPLINE_OUTPUT_DIR="$ROOT/.output-test"
if [ ! -f "$TRAPLINE_OUTPUT_DIR/server/index.mjs" ] || [ -n "$(find app server shared nuxt.config.ts tailwind.config.ts package-lock.json -newer "$TRAPLINE_OUTPUT_DIR/server/index.mjs" -print -quit 2>/dev/null)" ]; then
  say "building the app for the tests…"
  build_start=$SECONDS
  node_modules/.bin/nuxt build >"$DATA/test-build.log" 2>&1 || { tail -n 40 "$DATA/test-build.log" >&2; die "the build failed; see $DATA/test-build.log"; }
  say "built in $((SECONDS - build_start)) s"
fi

say "linting…"
node_modules/.bin/eslint . || die "lint errors; see above (npm run lint:fix mends the mechanical ones)."

say "type-checking…"
node_modules/.bin/nuxt typecheck >"$DATA/typecheck.log" 2>&1 || { cat "$DATA/typecheck.log" >&2; die "type errors; see above."; }

say "running the tests…"
node node_modules/vitest/vitest.mjs run "$@"
say "npm test took $((SECONDS - started)) s"
