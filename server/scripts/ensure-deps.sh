#!/bin/sh
# Installs npm dependencies from the lockfile when they are missing or stale.
# Plain sh on purpose: it runs before any npm package is available.
set -e
cd "$(dirname "$0")/../.."
want=$(sha256sum package-lock.json | cut -d' ' -f1)
have=$(cat node_modules/.rigshelf-lock 2>/dev/null || true)
if [ "$want" != "$have" ]; then
  echo "rigshelf: installing npm dependencies (npm ci)"
  npm ci --no-audit --no-fund
  echo "$want" > node_modules/.rigshelf-lock
fi
