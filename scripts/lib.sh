# Shared steps for scripts/start.sh and scripts/test.sh (sourced, not run).
# Each step checks first, so a second run does no work.

REPO="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$REPO"

log() { printf '\033[1;36m==>\033[0m %s\n' "$*"; }

as_root() {
  if [[ "$(id -u)" == "0" ]]; then "$@"
  elif command -v sudo >/dev/null 2>&1; then sudo "$@"
  else echo "need root (or sudo) to run: $*" >&2; return 1
  fi
}

APT_UPDATED=0
apt_install() {
  if [[ "$APT_UPDATED" == "0" ]]; then
    as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq
    APT_UPDATED=1
  fi
  as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}

ensure_postgresql() {
  if dpkg -s postgresql >/dev/null 2>&1 && ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1; then return; fi
  log "installing Debian's postgresql"
  apt_install postgresql
}

ensure_chromium() {
  if [[ -x /usr/bin/chromium ]]; then return; fi
  log "installing Debian's chromium"
  apt_install chromium
}

# npm ci when node_modules is missing or older than package-lock.json. --include=dev: start.sh exports
# NODE_ENV=production first, which makes npm leave out devDependencies (tsx, the build's CSS tools) by default.
ensure_node_modules() {
  if [[ -d node_modules && -f node_modules/.package-lock.json && ! package-lock.json -nt node_modules/.package-lock.json ]]; then return; fi
  log "npm ci"
  npm ci --no-audit --no-fund --include=dev
}

start_database() {
  log "PostgreSQL (project-local cluster)"
  bash db/cluster.sh start
}

# A random session secret for this checkout, made once: 48 bytes from node's CSPRNG, base64
# (64 characters), in .local/secret readable by its owner only. Kept across runs so sessions
# survive a restart; delete the file to sign everybody out and get a new one.
LOCAL_SECRET_FILE="$REPO/.local/secret"
ensure_local_secret() {
  if [[ -s "$LOCAL_SECRET_FILE" ]]; then return; fi
  log "creating a session secret in .local/secret"
  mkdir -p "$REPO/.local"
  (
    umask 077
    node -e "process.stdout.write(require('node:crypto').randomBytes(48).toString('base64'))" >"$LOCAL_SECRET_FILE.tmp"
  )
  chmod 600 "$LOCAL_SECRET_FILE.tmp"
  mv "$LOCAL_SECRET_FILE.tmp" "$LOCAL_SECRET_FILE"
}

# tsx with the react-server condition so `import 'server-only'` resolves to its empty module outside Next.js.
tsx_server() { node_modules/.bin/tsx --conditions=react-server "$@"; }

# Build unless .next is newer than every source file that goes into it.
build_app() {
  # The engine's worker-thread bundle (lib/runs/worker-bundle.ts): rebuilt every time, 0.1 s.
  npx tsx scripts/build-engine-worker.ts
  if [[ -f .next/BUILD_ID ]]; then
    local newer
    newer="$(find app components lib db simulator public proxy.ts next.config.mjs tailwind.config.ts postcss.config.mjs package-lock.json tsconfig.json \
      -newer .next/BUILD_ID -type f -not -path '*/node_modules/*' 2>/dev/null | head -n 1 || true)"
    if [[ -z "$newer" ]]; then log "build is up to date"; return; fi
  fi
  log "next build"
  NEXT_TELEMETRY_DISABLED=1 npx next build
}

# The local S3 fake (scripts/object-store.ts, s3rver) for the bucket in S3_BUCKET at the port of
# S3_ENDPOINT, its files in .local/s3. Started directly (not in a subshell) so OBJECT_STORE_PID is
# tsx itself, which passes signals on; left alone when something already listens there.
start_object_store() {
  local port
  port="$(node -e "process.stdout.write(new URL(process.argv[1]).port || '80')" "$S3_ENDPOINT")"
  if port_open "$port"; then
    log "S3 fake already listening on 127.0.0.1:$port"
    return
  fi
  log "S3 fake on 127.0.0.1:$port (files in .local/s3, log in .local/log/object-store.log)"
  mkdir -p .local/log
  node_modules/.bin/tsx --conditions=react-server scripts/object-store.ts >>.local/log/object-store.log 2>&1 &
  OBJECT_STORE_PID=$!
  wait_for_port "$port" 150
}

# HTTP 2xx check with node (a fresh machine may have no curl).
http_ok() { node -e "fetch(process.argv[1]).then((r) => process.exit(r.ok ? 0 : 1), () => process.exit(1))" "$1"; }

port_open() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

wait_for_port() {
  local port="$1" tries="${2:-100}"
  for ((i = 0; i < tries; i++)); do
    if port_open "$port"; then return 0; fi
    sleep 0.1
  done
  echo "nothing answered on 127.0.0.1:$port" >&2
  return 1
}
