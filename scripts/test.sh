#!/usr/bin/env bash
# `npm test`: everything a fresh Debian machine needs, then every check. Any failing step fails the run.
set -uo pipefail
cd "$(dirname "$0")/.."

bash scripts/ensure-system.sh || { echo "[test] system packages could not be installed" >&2; exit 1; }
node scripts/ensure-node-deps.mjs || { echo "[test] npm ci failed" >&2; exit 1; }

passed=0
failed=()
step() {
  local name=$1
  shift
  echo
  echo "== $name: $*"
  local started=$SECONDS
  if "$@"; then
    passed=$((passed + 1))
    echo "== $name: ok ($((SECONDS - started)) s)"
  else
    failed+=("$name")
    echo "== $name: FAILED ($((SECONDS - started)) s)"
  fi
}

step types npx tsc --noEmit -p tsconfig.json
step lint npx eslint --max-warnings 0 .
step cli-build node scripts/build-cli.mjs
step unit npx vitest run
step app-build npx vite build --logLevel warn
step e2e npx playwright test

echo
if [ ${#failed[@]} -gt 0 ]; then
  echo "[test] failed steps: ${failed[*]}"
fi
echo "steps: $passed passed, ${#failed[@]} failed"
[ ${#failed[@]} -eq 0 ]
