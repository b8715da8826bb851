#!/usr/bin/env bash
# Lotwise's one entry point for `npm start`, `npm run dev`, `npm test`, `npm run bench`, `npm run worker` and
# `npm run redis` on a fresh machine:
# installs what is missing (npm packages, Debian's MariaDB, Redis for the distributed-mode tests and benchmark, and
# Chromium for the browser tests), then hands over
# to scripts/stack.ts, which starts and stops everything else.
set -euo pipefail
cd "$(dirname "$0")/.."
mode="${1:-start}"

if [ ! -x node_modules/.bin/tsx ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
  echo "lotwise: installing npm packages (npm ci)"
  npm ci --no-audit --no-fund
fi

# The lotwise command line runs from a bundle built ahead of time (dist/cli, scripts/build-cli.mjs); this builds it
# only when it is missing or older than its sources, and bin/lotwise.js checks again before each start.
node scripts/build-cli.mjs >/dev/null || echo "lotwise: the CLI bundle did not build (bin/lotwise.js will try again)" >&2

if [ "$mode" = "worker" ]; then
  # A worker process needs only Node.js and Redis somewhere on the network.
  exec node_modules/.bin/tsx workers/queue-worker.ts
fi

missing=()
if [ "$mode" != "bench" ] && [ "$mode" != "redis" ]; then
  command -v mariadbd >/dev/null 2>&1 || [ -x /usr/sbin/mariadbd ] || missing+=(mariadb-server)
fi
if [ "$mode" = "test" ] || [ "$mode" = "bench" ] || [ "$mode" = "redis" ]; then
  command -v redis-server >/dev/null 2>&1 || [ -x /usr/bin/redis-server ] || missing+=(redis-server)
fi
if [ "$mode" = "test" ] && [ ! -x /usr/bin/chromium ]; then missing+=(chromium); fi
if [ "${#missing[@]}" -gt 0 ]; then
  if [ "$(id -u)" -ne 0 ]; then
    echo "lotwise: ${missing[*]} missing; install with: sudo apt-get install -y ${missing[*]}" >&2
    exit 1
  fi
  echo "lotwise: installing ${missing[*]} from Debian (apt-get)"
  apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "${missing[@]}" >/dev/null
fi

if [ "$mode" = "bench" ]; then
  exec node_modules/.bin/tsx scripts/bench.ts
fi

if [ "$mode" = "soak" ]; then
  shift
  exec node_modules/.bin/tsx scripts/soak.ts "$@"
fi

# Node itself with tsx's loader, not the tsx command: that wrapper relays Ctrl-C to its child and kills it (SIGKILL)
# when the child does not acknowledge within ~60 ms (a busy event loop), which would leave MariaDB running.
exec node --import tsx scripts/stack.ts "$@"
