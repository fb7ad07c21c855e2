#!/usr/bin/env bash
# First step of `npm start` and `npm test`: bring in what a fresh machine lacks, then hand over to
# the TypeScript script of that mode (scripts/start.ts or scripts/test.ts).
set -euo pipefail
cd "$(dirname "$0")/.."
mode="${1:?usage: bootstrap.sh start|test}"

as_root() {
  if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi
}

apt_install() {
  echo "phaselot: installing $* from Debian's packages"
  as_root env DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=120 update -qq
  as_root env DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=120 install -y -qq "$@" >/dev/null
}

if [ ! -x node_modules/.bin/tsx ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "phaselot: installing npm dependencies"
  npm ci --no-audit --no-fund --loglevel=error
fi

if ! compgen -G "/usr/lib/postgresql/*/bin/initdb" >/dev/null; then
  apt_install postgresql
fi

if [ "$mode" = test ] && [ ! -x /usr/bin/chromium ]; then
  apt_install chromium
fi

# The server's Node flags (scripts/server-node-options, also read by the benchmarks' server): a
# bounded old space makes V8 collect garbage before its heap grows to four times what is live.
if [ "$mode" = start ]; then
  export NODE_OPTIONS="$(cat scripts/server-node-options) ${NODE_OPTIONS:-}"
fi

exec node_modules/.bin/tsx "scripts/$mode.ts" "${@:2}"
