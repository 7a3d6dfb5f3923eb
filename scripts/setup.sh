#!/usr/bin/env bash
# Idempotent installer for everything Bufferwright's build and tests need.
#   bash scripts/setup.sh          install what is missing, print what is there
#   source scripts/setup.sh        same, and keep the PATH it sets (scripts/serve.sh, test.sh do this)
# Needs root (or sudo-less apt) only when a Debian package is missing. Never downloads a browser
# or prebuilt binary: Rust tools come from crates.io, JS tools from npm, Chromium, Firefox ESR and
# WebKitGTK (the cross-engine journeys) from Debian.
#
# Pinned versions:
TRUNK_SERIES="0.21"            # trunk 0.22 needs a newer rustc than this toolchain
TRUNK_PIN="=0.21.14"           # installed when no 0.21.x is present
BINARYEN_WANT="version_132"    # wasm-opt from npm binaryen 132.0.0 (tests/package-lock.json)

_bw_is_sourced() { [[ "${BASH_SOURCE[0]}" != "$0" ]]; }
_bw_die() {
  echo "setup: ERROR: $*" >&2
  exit 1
}
_bw_ok() { echo "setup: ok       $*"; }
_bw_do() { echo "setup: install  $*"; }

_bw_setup() {
  local - # keep the caller's shell options when sourced
  set -euo pipefail
  local root
  root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
  export DEBIAN_FRONTEND=noninteractive
  [[ -d "$HOME/.cargo/bin" ]] && case ":$PATH:" in *":$HOME/.cargo/bin:"*) ;; *) export PATH="$HOME/.cargo/bin:$PATH" ;; esac

  local apt_updated=0
  _bw_apt() {
    command -v apt-get >/dev/null || _bw_die "apt-get not found; install $* by hand"
    local sudo=""
    [[ "$(id -u)" -ne 0 ]] && sudo="sudo -n"
    if [[ $apt_updated -eq 0 ]]; then
      $sudo apt-get update -qq || _bw_die "apt-get update failed (needed for: $*)"
      apt_updated=1
    fi
    $sudo apt-get install -y -qq --no-install-recommends "$@" >/dev/null || _bw_die "apt-get install $* failed"
  }
  _bw_dpkg_has() { [[ "$(dpkg-query -W -f='${Status}' "$1" 2>/dev/null)" == "install ok installed" ]]; }

  # --- Rust toolchain -----------------------------------------------------------------------
  command -v cargo >/dev/null || _bw_die "cargo not found: install Rust with rustup first"
  command -v rustup >/dev/null || _bw_die "rustup not found: needed to add the wasm32-unknown-unknown target"
  if rustup target list --installed | grep -qx wasm32-unknown-unknown; then
    _bw_ok "rust target wasm32-unknown-unknown"
  else
    _bw_do "rust target wasm32-unknown-unknown"
    rustup target add wasm32-unknown-unknown || _bw_die "rustup target add wasm32-unknown-unknown failed"
  fi
  local comp
  for comp in rustfmt clippy; do
    if rustup component list --installed 2>/dev/null | grep -q "^$comp"; then
      _bw_ok "rust component $comp"
    else
      _bw_do "rust component $comp"
      rustup component add "$comp" || _bw_die "rustup component add $comp failed"
    fi
  done

  # --- trunk 0.21.x ---------------------------------------------------------------------------
  local have
  have="$(trunk --version 2>/dev/null | awk '{print $2}' || true)"
  if [[ "$have" == "$TRUNK_SERIES".* ]]; then
    _bw_ok "trunk $have"
  else
    _bw_do "trunk $TRUNK_PIN (found: ${have:-none}; builds from source, ~10 min on 2 cores)"
    cargo install trunk --version "$TRUNK_PIN" --locked || _bw_die "cargo install trunk $TRUNK_PIN failed"
  fi

  # --- wasm-bindgen CLI = wasm-bindgen crate version -----------------------------------------------
  local wb=""
  if [[ -f "$root/Cargo.lock" ]]; then
    wb="$(awk '/^name = "wasm-bindgen"$/ {getline; gsub(/"/, "", $3); print $3; exit}' "$root/Cargo.lock")"
  fi
  if [[ -z "$wb" ]]; then
    # No lock file yet: fall back to the exact pin in the workspace manifest.
    wb="$(sed -n 's/^wasm-bindgen *= *"=\([0-9.]*\)".*/\1/p' "$root/Cargo.toml" | head -n1)"
  fi
  [[ -n "$wb" ]] || _bw_die "cannot find the wasm-bindgen version in Cargo.lock or Cargo.toml"
  have="$(wasm-bindgen --version 2>/dev/null | awk '{print $2}' || true)"
  local have_runner
  have_runner="$(wasm-bindgen-test-runner --version 2>/dev/null | awk '{print $2}' || true)"
  if [[ "$have" == "$wb" && "$have_runner" == "$wb" ]]; then
    _bw_ok "wasm-bindgen-cli $have (matches Cargo.lock)"
  else
    _bw_do "wasm-bindgen-cli =$wb (found: ${have:-none})"
    # Not --locked: one locked dependency of the CLI is missing from the registry index.
    cargo install wasm-bindgen-cli --version "=$wb" --force || _bw_die "cargo install wasm-bindgen-cli =$wb failed"
  fi
  grep -q "\"$wb\"" "$root/Trunk.toml" || _bw_die "Trunk.toml [tools] wasm_bindgen must be \"$wb\" (Cargo.lock)"

  # --- Node.js -------------------------------------------------------------------------------
  if ! command -v node >/dev/null || ! command -v npm >/dev/null; then
    _bw_do "nodejs npm (Debian)"
    _bw_apt nodejs npm
  fi
  local node_major
  node_major="$(node -p 'process.versions.node.split(".")[0]')"
  [[ "$node_major" -ge 18 ]] || _bw_die "Node.js >= 18 needed for 'node --test' (found $(node --version))"
  _bw_ok "node $(node --version), npm $(npm --version)"

  # --- npm packages (binaryen/wasm-opt, playwright-core, puppeteer-core, axe-core, jsqr) from tests/package-lock.json ---
  local lock="$root/tests/package-lock.json" stamp="$root/tests/node_modules/.bufferwright-lock"
  [[ -f "$lock" ]] || _bw_die "tests/package-lock.json missing"
  local want_stamp
  want_stamp="$(sha256sum "$lock" | awk '{print $1}')"
  if [[ -f "$stamp" && "$(cat "$stamp")" == "$want_stamp" && -x "$root/tests/node_modules/.bin/wasm-opt" ]]; then
    _bw_ok "npm packages (tests/node_modules matches package-lock.json)"
  else
    _bw_do "npm ci in tests/"
    # puppeteer-core (Firefox) drives Debian's firefox-esr: it must never fetch a browser.
    (cd "$root/tests" && PUPPETEER_SKIP_DOWNLOAD=1 npm ci --no-audit --no-fund --loglevel=error) || _bw_die "npm ci in tests/ failed"
    echo "$want_stamp" >"$stamp"
  fi
  export PATH="$root/tests/node_modules/.bin:$PATH"
  have="$(wasm-opt --version 2>/dev/null || true)"
  [[ "$have" == *"$BINARYEN_WANT"* ]] || _bw_die "wasm-opt on PATH is '$have', want $BINARYEN_WANT (npm binaryen)"
  _bw_ok "wasm-opt $BINARYEN_WANT ($(command -v wasm-opt))"

  # --- Chromium + chromedriver (Debian) -------------------------------------------------------------
  if _bw_dpkg_has chromium && _bw_dpkg_has chromium-driver && [[ -x /usr/bin/chromium && -x /usr/bin/chromedriver ]]; then
    _bw_ok "chromium + chromium-driver $(dpkg-query -W -f='${Version}' chromium)"
  else
    _bw_do "chromium chromium-driver (Debian apt)"
    _bw_apt chromium chromium-driver
    [[ -x /usr/bin/chromium && -x /usr/bin/chromedriver ]] || _bw_die "chromium/chromedriver still missing after apt-get"
  fi

  # --- poppler-utils (pdftotext, pdftoppm: the printed sheet's PDF in tests/e2e/bench-sheet) ---------
  if _bw_dpkg_has poppler-utils && command -v pdftoppm >/dev/null && command -v pdftotext >/dev/null; then
    _bw_ok "poppler-utils $(dpkg-query -W -f='${Version}' poppler-utils)"
  else
    _bw_do "poppler-utils (Debian apt)"
    _bw_apt poppler-utils
    command -v pdftoppm >/dev/null || _bw_die "pdftoppm still missing after apt-get"
  fi

  # --- Other engines for the cross-engine journeys (tests/engines/): Firefox and WebKit (Debian) ----
  # firefox-esr is driven by puppeteer-core (tests/package-lock.json) over WebDriver BiDi;
  # webkit2gtk-driver gives WebKitWebDriver, which starts MiniBrowser (libwebkit2gtk-4.1-0)
  # under a virtual display from xvfb (xvfb-run needs xauth). No browser is downloaded.
  local minibrowser=/usr/lib/x86_64-linux-gnu/webkit2gtk-4.1/MiniBrowser
  if _bw_dpkg_has firefox-esr && [[ -x /usr/bin/firefox-esr ]]; then
    _bw_ok "firefox-esr $(dpkg-query -W -f='${Version}' firefox-esr)"
  else
    _bw_do "firefox-esr (Debian apt)"
    _bw_apt firefox-esr
    [[ -x /usr/bin/firefox-esr ]] || _bw_die "firefox-esr still missing after apt-get"
  fi
  if _bw_dpkg_has webkit2gtk-driver && _bw_dpkg_has xvfb && _bw_dpkg_has xauth &&
    [[ -x /usr/bin/WebKitWebDriver && -x "$minibrowser" && -x /usr/bin/xvfb-run ]]; then
    _bw_ok "webkit2gtk-driver $(dpkg-query -W -f='${Version}' webkit2gtk-driver) + xvfb"
  else
    _bw_do "webkit2gtk-driver xvfb xauth (Debian apt)"
    _bw_apt webkit2gtk-driver xvfb xauth
    [[ -x /usr/bin/WebKitWebDriver && -x "$minibrowser" && -x /usr/bin/xvfb-run ]] ||
      _bw_die "WebKitWebDriver, MiniBrowser or xvfb-run still missing after apt-get"
  fi

  echo "setup: done. PATH includes tests/node_modules/.bin (wasm-opt) and ~/.cargo/bin."
}

if _bw_is_sourced; then
  _bw_setup
else
  _bw_setup "$@"
  echo "setup: (to keep PATH in your shell: source scripts/setup.sh)"
fi
