# Installs what Glowgap's build and tests need, only where it is missing. Sourced by
# .ci/serve and .ci/test; safe to run again. Every step says what it does.
#   glowgap_setup_build    wasm32 target, wasm-bindgen-cli matching Cargo.lock, trunk 0.21,
#                          binaryen's wasm-opt from the npm registry (on PATH for trunk)
#   glowgap_setup_browser  Debian chromium + chromedriver, npm packages of tests/browser

set -euo pipefail
export PATH="$HOME/.cargo/bin:$PATH"
GLOWGAP_ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"

say() { printf '[glowgap setup] %s\n' "$*" >&2; }

glowgap_setup_build() {
    command -v cargo >/dev/null || { say "cargo is missing: install Rust with rustup first (https://rustup.rs is the usual way)"; exit 1; }
    if ! rustup target list --installed 2>/dev/null | grep -qx wasm32-unknown-unknown; then
        say "adding the wasm32-unknown-unknown target"
        rustup target add wasm32-unknown-unknown
    fi
    # wasm-bindgen-cli must be exactly the version of the wasm-bindgen crate in Cargo.lock
    (cd "$GLOWGAP_ROOT" && [ -f Cargo.lock ] || cargo generate-lockfile)
    local want
    want="$(awk '/^name = "wasm-bindgen"$/ {getline; gsub(/version = |"/, ""); print; exit}' "$GLOWGAP_ROOT/Cargo.lock")"
    if [ -z "$want" ]; then say "no wasm-bindgen in Cargo.lock"; exit 1; fi
    if [ "$(wasm-bindgen --version 2>/dev/null | awk '{print $2}')" != "$want" ]; then
        say "installing wasm-bindgen-cli $want (about 2 minutes)"
        cargo install wasm-bindgen-cli --version "$want"
    fi
    # wasm-opt: binaryen compiled to WebAssembly, from the npm registry, pinned in
    # .ci/wasm-opt/package.json and Trunk.toml (Debian's binaryen 108 writes modules that
    # Chromium refuses, so ours goes first on PATH)
    command -v node >/dev/null || { say "node is missing: install Node.js 20 (Debian package nodejs)"; exit 1; }
    if [ ! -x "$GLOWGAP_ROOT/.ci/wasm-opt/node_modules/.bin/wasm-opt" ]; then
        say "installing binaryen's wasm-opt from the npm registry"
        (cd "$GLOWGAP_ROOT/.ci/wasm-opt" && npm ci --no-audit --no-fund --loglevel=error)
    fi
    export PATH="$GLOWGAP_ROOT/.ci/wasm-opt/node_modules/.bin:$PATH"
    # trunk 0.22 needs a newer rustc than this toolchain; the 0.21 line builds here
    if ! trunk --version 2>/dev/null | grep -q '^trunk 0\.21\.'; then
        say "installing trunk 0.21 (about 6-8 minutes on 2 cores)"
        cargo install trunk --version '~0.21' --locked
    fi
}

glowgap_setup_browser() {
    if [ ! -x /usr/bin/chromium ] || [ ! -x /usr/bin/chromedriver ]; then
        say "installing Debian chromium and chromium-driver"
        if [ "$(id -u)" = 0 ]; then
            apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium chromium-driver >/dev/null
        else
            sudo apt-get update -qq && sudo DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium chromium-driver >/dev/null
        fi
    fi
    command -v node >/dev/null || { say "node is missing: install Node.js 20 (Debian package nodejs)"; exit 1; }
    if [ ! -d "$GLOWGAP_ROOT/tests/browser/node_modules/playwright-core" ]; then
        say "installing the browser-test npm packages (playwright-core, no browser download)"
        (cd "$GLOWGAP_ROOT/tests/browser" && npm ci --no-audit --no-fund --loglevel=error)
    fi
}
