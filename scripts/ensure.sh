#!/usr/bin/env bash
# Installs what `npm start` (ensure.sh start) or `npm test` (ensure.sh test) needs and is missing:
# Debian's PostgreSQL server, Debian's Chromium for the browser tests, and the npm dependencies.
set -euo pipefail
cd "$(dirname "$0")/.."
mode=${1:-start}

as_root() {
  if [ "$(id -u)" = 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else
    echo "Need root to run: $*  (install it by hand, then run again)" >&2; exit 1; fi
}

apt_updated=0
apt_install() {
  if [ $apt_updated = 0 ]; then as_root apt-get update -qq; apt_updated=1; fi
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq --no-install-recommends "$@"
}

if [ -z "${DATABASE_URL:-}" ] || [ "$mode" = test ]; then
  if ! ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1; then
    echo "Installing PostgreSQL from Debian's packages…"
    apt_install postgresql
  fi
fi

if [ "$mode" = test ] && ! command -v chromium >/dev/null 2>&1; then
  echo "Installing Chromium from Debian's packages (browser tests)…"
  apt_install chromium
fi

# npm dependencies: install when node_modules is missing or older than the lock file.
stamp=node_modules/.backsight-lock.sha256
want=$(sha256sum package-lock.json | cut -d' ' -f1)
if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
  echo "Installing npm dependencies (npm ci)…"
  npm ci --no-audit --no-fund --loglevel=error
  echo "$want" > "$stamp"
fi
