#!/usr/bin/env bash
# First step of `npm start` and `npm test` on any machine: install what is
# missing. npm itself runs this script, so it only needs bash and node.
#   - node_modules: `npm ci` when missing, or not installed from this package-lock.json
#   - PostgreSQL 15 (Debian package) when its server binary is absent
#   - Debian's Chromium and its headless build, for `npm test` only (browser tests)
set -euo pipefail
cd "$(dirname "$0")/../.."
want="${1:-start}"

as_root() { if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi; }
apt_updated=0
apt_install() {
  if [ "$apt_updated" = 0 ]; then as_root apt-get update -qq; apt_updated=1; fi
  DEBIAN_FRONTEND=noninteractive as_root apt-get install -y -qq "$@" >/dev/null
}

lock_sum=$(sha256sum package-lock.json | cut -d' ' -f1)
# Installed by hand (`npm ci`) after the lock file was written: npm's own record of the tree
# (node_modules/.package-lock.json) is newer than the lock, so the tree is the lock's.
if [ ! -f node_modules/.rollwise-lock-sum ] && [ node_modules/.package-lock.json -nt package-lock.json ]; then
  echo "$lock_sum" > node_modules/.rollwise-lock-sum
fi
if [ ! -f node_modules/.rollwise-lock-sum ] || [ "$(cat node_modules/.rollwise-lock-sum)" != "$lock_sum" ]; then
  echo "[rollwise] installing npm packages (npm ci)…"
  npm ci --no-audit --no-fund --loglevel=error
  echo "$lock_sum" > node_modules/.rollwise-lock-sum
fi

if [ ! -x /usr/lib/postgresql/15/bin/postgres ]; then
  echo "[rollwise] installing PostgreSQL 15 (Debian package)…"
  apt_install postgresql
fi

if [ "$want" = test ] && { [ ! -x /usr/bin/chromium ] || [ ! -x /usr/lib/chromium/chromium-headless-shell ]; }; then
  # The tests drive the headless build (lighter); `npm run bench` measures the UI in the full browser.
  echo "[rollwise] installing Chromium and its headless build (Debian packages) for the browser tests…"
  apt_install chromium chromium-headless-shell
fi
