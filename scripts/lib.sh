# Shared shell functions for docker-free-start.sh (sourced, not run).
# They install what a fresh Debian machine lacks and run a private PostgreSQL on loopback.

PG_BIN="${PG_BIN:-}"
log() { printf '\033[1m[envelo]\033[0m %s\n' "$*"; }
die() { printf '\033[1;31m[envelo] %s\033[0m\n' "$*" >&2; exit 1; }

as_root() {
	if [ "$(id -u)" -eq 0 ]; then "$@"; elif command -v sudo >/dev/null; then sudo "$@"; else
		die "need root or sudo to run: $*"; fi
}

# apt_ensure CMD-OR-PATH PACKAGE... : install the Debian packages when the thing is missing.
apt_ensure() {
	local probe="$1"; shift
	if [ -e "$probe" ] || command -v "$probe" >/dev/null 2>&1; then return 0; fi
	log "installing Debian packages: $*"
	if [ -z "${APT_UPDATED:-}" ]; then as_root apt-get update -qq || die "apt-get update failed"; APT_UPDATED=1; fi
	as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$@" >/dev/null ||
		die "apt-get install $* failed"
}

find_pg_bin() {
	if [ -n "$PG_BIN" ] && [ -x "$PG_BIN/initdb" ]; then return 0; fi
	local d
	for d in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
		if [ -x "$d/initdb" ] && [ -x "$d/pg_ctl" ]; then PG_BIN="$d"; return 0; fi
	done
	return 1
}

ensure_system_packages() {
	find_pg_bin || { apt_ensure /nonexistent-envelo-probe postgresql; find_pg_bin || die "PostgreSQL binaries not found after install"; }
	if [ "${1:-}" = "test" ]; then
		apt_ensure /usr/bin/chromium chromium
		apt_ensure pdftotext poppler-utils
	fi
}

ensure_node_modules() {
	command -v node >/dev/null || die "Node.js 20 or newer is required"
	local stamp=node_modules/.package-lock.json
	if [ ! -d node_modules ] || [ ! -f "$stamp" ] || [ package-lock.json -nt "$stamp" ]; then
		log "installing npm packages (npm ci)"
		npm ci --no-audit --no-fund >/dev/null || die "npm ci failed"
	fi
}

# Build the app into $BUILD_DIR (or build/), logging to $1. SvelteKit's generated files
# (.svelte-kit/tsconfig.json, the route types) are made first: a fresh clone has none.
build_app() {
	local logfile="$1"
	node_modules/.bin/svelte-kit sync >"$logfile" 2>&1 && node_modules/.bin/vite build >>"$logfile" 2>&1
}

# PostgreSQL refuses to run as root: when we are root, the cluster belongs to Debian's postgres user.
pg_user_run() {
	if [ "$(id -u)" -eq 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}

pg_prepare_dir() {
	local dir="$1"
	mkdir -p "$dir"
	if [ "$(id -u)" -eq 0 ]; then
		id postgres >/dev/null 2>&1 || die "the postgres system user is missing (install Debian's postgresql)"
		chown -R postgres:postgres "$dir"
		chmod 700 "$dir"
		runuser -u postgres -- test -w "$dir" || return 1
	fi
	return 0
}

free_port() {
	node -e "const s=require('net').createServer();s.listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})"
}

# pg_start DATA_DIR PORT : initdb when new (password auth, password kept in DATA_DIR/../pg-password),
# then start listening on 127.0.0.1 only. Sets PG_PASSWORD.
pg_start() {
	local data="$1" port="$2" pwfile
	pwfile="$(dirname "$data")/pg-password"
	if [ ! -f "$data/PG_VERSION" ]; then
		node -e "console.log(require('crypto').randomBytes(18).toString('hex'))" >"$pwfile"
		chmod 600 "$pwfile"
		local tmp_pw; tmp_pw=$(mktemp); cp "$pwfile" "$tmp_pw"; chmod 644 "$tmp_pw"
		pg_user_run "$PG_BIN/initdb" -D "$data" -U envelo --auth=scram-sha-256 --pwfile="$tmp_pw" -E UTF8 --locale=C.UTF-8 >/dev/null ||
			{ rm -f "$tmp_pw"; die "initdb failed in $data"; }
		rm -f "$tmp_pw"
	fi
	PG_PASSWORD=$(cat "$pwfile")
	export PGPASSWORD="$PG_PASSWORD"
	pg_user_run "$PG_BIN/pg_ctl" -D "$data" -l "$data/server.log" -w -t 30 \
		-o "-h 127.0.0.1 -p $port -k $data -c fsync=${PG_FSYNC:-on}" start >/dev/null ||
		{ tail -20 "$data/server.log" >&2; die "PostgreSQL did not start (log above)"; }
}

pg_stop() {
	local data="$1"
	[ -f "$data/postmaster.pid" ] && pg_user_run "$PG_BIN/pg_ctl" -D "$data" -m fast -w stop >/dev/null 2>&1 || true
}

pg_createdb() {
	local port="$1" name="$2"
	"$PG_BIN/psql" -h 127.0.0.1 -p "$port" -U envelo -d postgres -tAc "SELECT 1 FROM pg_database WHERE datname='$name'" | grep -q 1 ||
		"$PG_BIN/createdb" -h 127.0.0.1 -p "$port" -U envelo "$name" || die "createdb $name failed"
}
