#!/usr/bin/env bash
# Command one: install what is missing, build the release bundle and the single-file page,
# then serve dist/ on loopback. PORT (default 8080) and HOST (default 127.0.0.1) override.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
# shellcheck source=scripts/setup.sh
source scripts/setup.sh
bash scripts/build.sh
echo "Single-file build: file://$root/dist-single/bufferwright.html"
exec node scripts/static-server.mjs dist "${PORT:-8080}"
