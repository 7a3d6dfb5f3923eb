#!/usr/bin/env bash
# Release build: trunk (dist/) then the single-file page (dist-single/bufferwright.html).
# Expects scripts/setup.sh to have been sourced (PATH with wasm-opt); sources it if not.
# --record: also write the measured sizes into docs/BUILD.md (scripts/sizes.mjs).
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
if ! command -v wasm-opt >/dev/null || [[ "$(wasm-opt --version)" != *version_132* ]]; then
  # shellcheck source=scripts/setup.sh
  source scripts/setup.sh
fi
trunk build --release --offline
node scripts/single-file.mjs dist dist-single/bufferwright.html
node scripts/sizes.mjs "$@"
