#!/usr/bin/env bash
# Command two: the whole check, as CI runs it (.ci/run execs this).
#   setup -> fmt -> clippy (native, wasm) -> cargo test (native) -> browser tests (wasm) ->
#   trunk release build -> single-file build -> e2e (node --test tests/e2e/, Chromium) ->
#   cross-engine journeys (node --test tests/engines/, in Chromium, Firefox and WebKit)
# Every step runs even if an earlier one failed (steps that need the build fail fast without it).
# The last line is "N passed, N failed" counting steps; exit status is non-zero on any failure.
set -uo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
export CI="${CI:-}" CARGO_TERM_COLOR="${CARGO_TERM_COLOR:-never}"

passed=0
failed=0
failed_names=()
declare -a report=()
# step NAME MINUTES COMMAND...: run one step under a time cap, so a hang fails that step (with its
# output so far) instead of holding the whole run past CI's limit.
step() {
  local name="$1" minutes="$2"
  shift 2
  local t0=$SECONDS
  printf '\n==================== %s ====================\n' "$name"
  printf '$ %s   (cap %s min, started %s)\n' "$*" "$minutes" "$(date -u +%H:%M:%S)"
  if timeout --kill-after=20 "$((minutes * 60))" bash -c '"$@"' _ "$@"; then
    passed=$((passed + 1))
    report+=("PASS  ${name} ($((SECONDS - t0))s)")
  else
    local rc=$?
    failed=$((failed + 1))
    failed_names+=("$name")
    if [[ $rc -eq 124 || $rc -eq 137 ]]; then
      report+=("FAIL  ${name} (stopped at its ${minutes}-minute cap)")
    else
      report+=("FAIL  ${name} ($((SECONDS - t0))s)")
    fi
  fi
}

printf '==================== setup ====================\n'
# shellcheck source=scripts/setup.sh
if ! (source scripts/setup.sh); then
  echo "setup failed: see the message above"
  echo "0 passed, 1 failed"
  exit 1
fi
export PATH="$root/tests/node_modules/.bin:$HOME/.cargo/bin:$PATH"

wasm_tests() {
  CARGO_TARGET_WASM32_UNKNOWN_UNKNOWN_RUNNER=wasm-bindgen-test-runner \
    CHROMEDRIVER=/usr/bin/chromedriver \
    WASM_BINDGEN_TEST_WEBDRIVER_JSON="$root/tests/webdriver.json" \
    WASM_BINDGEN_USE_BROWSER=1 \
    WASM_BINDGEN_TEST_TIMEOUT=120 \
    WASM_BINDGEN_TEST_DRIVER_TIMEOUT=90 \
    cargo test -p app --target wasm32-unknown-unknown --tests
}
have_dist() {
  [[ -f dist/index.html ]] || {
    echo "no dist/index.html: the trunk build failed"
    return 1
  }
}
build_trunk() {
  rm -rf dist dist-single
  trunk build --release --offline || return 1
  local wasm
  wasm="$(ls dist/*_bg.wasm)"
  echo "wasm size: $(stat -c %s "$wasm") bytes raw, $(gzip -9 -c "$wasm" | wc -c) bytes gzip -9 ($(basename "$wasm"))"
}
single_file() {
  have_dist || return 1
  node scripts/single-file.mjs dist dist-single/bufferwright.html && node scripts/sizes.mjs
}
e2e() {
  have_dist || return 1
  [[ -f dist-single/bufferwright.html ]] || { echo "no single-file build"; return 1; }
  node --test --test-concurrency=1 --test-timeout=180000 --test-force-exit tests/e2e/
}

# The journeys of tests/engines/ once per engine (BW_ENGINES picks it), one engine after another:
# each run prints its time, so a slow engine shows. Engine start-up is retried inside the layer;
# assertions never are.
engines() {
  have_dist || return 1
  [[ -f dist-single/bufferwright.html ]] || { echo "no single-file build"; return 1; }
  local e t0 rc=0 times=()
  for e in chromium firefox webkit; do
    printf -- '--- %s ---\n' "$e"
    t0=$SECONDS
    if ! BW_ENGINES="$e" node --test --test-concurrency=1 --test-timeout=240000 --test-force-exit tests/engines/; then
      rc=1
      times+=("$e FAILED ($((SECONDS - t0))s)")
    else
      times+=("$e $((SECONDS - t0))s")
    fi
  done
  echo "cross-engine times: ${times[*]}"
  return $rc
}

export -f wasm_tests have_dist build_trunk single_file e2e engines
export root
step "cargo fmt --check" 3 cargo fmt --all --check
step "clippy (native)" 20 cargo clippy --workspace --all-targets -- -D warnings
step "clippy (wasm32, app)" 15 cargo clippy -p app --target wasm32-unknown-unknown -- -D warnings
step "cargo test (native)" 20 cargo test --workspace
step "browser tests (wasm-bindgen-test in Chromium)" 15 wasm_tests
step "trunk build --release" 20 build_trunk
step "single-file build + sizes" 5 single_file
step "e2e (node --test tests/e2e/)" 20 e2e
step "cross-engine journeys (tests/engines/: Chromium, Firefox, WebKit)" 20 engines

printf '\n==================== summary ====================\n'
printf '%s\n' "${report[@]}"
echo "total: $((SECONDS / 60)) min $((SECONDS % 60)) s"
if [[ $failed -gt 0 ]]; then
  printf 'failed steps: %s\n' "${failed_names[*]}"
fi
echo "${passed} passed, ${failed} failed"
[[ $failed -eq 0 ]]
