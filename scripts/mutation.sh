#!/usr/bin/env bash
# npm run test:mutation: StrykerJS mutates the pure code (shared/rules, shared/inspection, shared/utils/money.ts)
# one change at a time and runs the unit tests alone against each mutant; a mutant no test notices "survives".
# The report: reports/mutation/index.html (and mutation.json); the scores per area are printed at the end.
# Extra arguments go to Stryker: npm run test:mutation -- --mutate shared/rules/protests.ts
set -euo pipefail
source "$(dirname "$0")/lib.sh"
cd "$ROOT"
ensure_node_modules
started=$SECONDS
node node_modules/@stryker-mutator/core/bin/stryker.js run "$@" || die "Stryker could not run; see above."
status=0
node scripts/mutation-score.mjs reports/mutation/mutation.json tests/unit/equivalent-mutants.md || status=$?
say "mutation testing took $((SECONDS - started)) s"
exit "$status"
