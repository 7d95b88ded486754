#!/usr/bin/env bash
# npm test: typecheck, vitest (node + dom projects), client build, Playwright against the built app.
# Every stage runs even when an earlier one failed, so one run shows every problem.
# Ends with one line "N passed, N failed" counting every test; exits non-zero on any failure
# or when nothing ran at all.
set -uo pipefail

cd "$(dirname "$0")/.."

CHROMIUM=/usr/bin/chromium
COUNTS_FILE="$(mktemp -t fieldproof-counts.XXXXXX)"
export FP_COUNTS_FILE="$COUNTS_FILE"
trap 'rm -f "$COUNTS_FILE"' EXIT

passed=0
failed=0
declare -a notes=()

stamp() { date +%s; }
elapsed() { echo "$(( $(stamp) - $1 ))s"; }

# Adds the counts a runner appended as "<runner> P F"; a stage that failed without
# reporting any failed test (crash, config error, no tests) counts as one failure.
collect() {
  local runner="$1" rc="$2" p=0 f=0 line
  line="$(grep "^$runner " "$COUNTS_FILE" | tail -n 1 || true)"
  if [[ -n "$line" ]]; then
    read -r _ p f <<<"$line"
  fi
  if [[ "$rc" -ne 0 && "$f" -eq 0 ]]; then
    f=1
    notes+=("$runner exited with status $rc without reporting a failed test")
  fi
  passed=$(( passed + p ))
  failed=$(( failed + f ))
}

# One-check stages (typecheck, build) count as one test each.
check() {
  local name="$1" rc="$2"
  if [[ "$rc" -eq 0 ]]; then
    passed=$(( passed + 1 ))
  else
    failed=$(( failed + 1 ))
    notes+=("$name failed (status $rc)")
  fi
}

echo "== chromium"
if [[ ! -x "$CHROMIUM" ]]; then
  if [[ "$(id -u)" -eq 0 ]] && command -v apt-get >/dev/null 2>&1; then
    echo "Installing Debian's chromium with apt-get..."
    export DEBIAN_FRONTEND=noninteractive
    apt-get update && apt-get install -y --no-install-recommends chromium
  else
    echo "Playwright needs Debian's chromium at $CHROMIUM. Install it with:"
    echo "  sudo apt-get update && sudo apt-get install -y chromium"
    exit 1
  fi
  if [[ ! -x "$CHROMIUM" ]]; then
    echo "chromium is still missing at $CHROMIUM after apt-get; stopping."
    exit 1
  fi
fi
"$CHROMIUM" --version 2>/dev/null | head -n 1 || true

echo "== typecheck"
t=$(stamp)
npm run --silent typecheck
check typecheck $?
echo "typecheck took $(elapsed "$t")"

echo "== vitest"
t=$(stamp)
npx vitest run
collect vitest $?
echo "vitest took $(elapsed "$t")"

echo "== build"
t=$(stamp)
npx vite build --logLevel warn
build_rc=$?
check build $build_rc
echo "build took $(elapsed "$t")"

echo "== playwright"
t=$(stamp)
if [[ "$build_rc" -eq 0 ]]; then
  npx playwright test
  collect playwright $?
else
  failed=$(( failed + 1 ))
  notes+=("playwright not run: the client did not build")
fi
echo "playwright took $(elapsed "$t")"

echo "=="
for n in "${notes[@]+"${notes[@]}"}"; do echo "note: $n"; done
total=$(( passed + failed ))
if [[ "$total" -eq 0 ]]; then
  echo "note: no test ran"
fi
echo "$passed passed, $failed failed"
if [[ "$failed" -ne 0 || "$total" -eq 0 ]]; then
  exit 1
fi
exit 0
