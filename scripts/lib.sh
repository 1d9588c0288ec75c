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
		# the physics tests' independent references are Python with numpy (tests/physics/reference)
		if ! python3 -c 'import numpy' >/dev/null 2>&1; then apt_ensure /usr/lib/python3/dist-packages/numpy python3-numpy; fi
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

# Three roles (README, Configuration). PG_SUPERUSER is the cluster's own superuser (made by initdb): the start
# script uses it to create the other two roles and the databases, nothing else does. PG_OWNER_ROLE owns the
# databases and their schema: migrations, seeds and pg-boss's set-up run as it. PG_APP_ROLE is what Envelo
# connects as: no superuser, owns nothing, may not create or alter anything, and writes only what the app
# writes (db/migrations/20261202004000_app-role-privileges.js; pgboss_prepare below for the job queue).
PG_SUPERUSER=envelo
PG_OWNER_ROLE=envelo_owner
PG_APP_ROLE=envelo_app

# pg_secret FILE : the password kept in FILE, made once (readable by its owner only).
pg_secret() {
	local file="$1"
	if [ ! -s "$file" ]; then
		(umask 077 && node -e "console.log(require('crypto').randomBytes(18).toString('hex'))" >"$file") ||
			die "cannot write $file"
	fi
	cat "$file"
}

# pg_start DATA_DIR PORT : initdb when new (password auth, the superuser's password kept in
# DATA_DIR/../pg-password), then start listening on 127.0.0.1 only. Sets PG_PASSWORD (not exported: the
# processes this script starts never see the superuser's password).
pg_start() {
	local data="$1" port="$2" pwfile
	pwfile="$(dirname "$data")/pg-password"
	if [ ! -f "$data/PG_VERSION" ]; then
		rm -f "$pwfile"
		pg_secret "$pwfile" >/dev/null
		local tmp_pw; tmp_pw=$(mktemp); cp "$pwfile" "$tmp_pw"; chmod 644 "$tmp_pw"
		pg_user_run "$PG_BIN/initdb" -D "$data" -U "$PG_SUPERUSER" --auth=scram-sha-256 --pwfile="$tmp_pw" -E UTF8 --locale=C.UTF-8 >/dev/null ||
			{ rm -f "$tmp_pw"; die "initdb failed in $data"; }
		rm -f "$tmp_pw"
	fi
	PG_PASSWORD=$(cat "$pwfile")
	PG_PORT="$port"
	pg_user_run "$PG_BIN/pg_ctl" -D "$data" -l "$data/server.log" -w -t 30 \
		-o "-h 127.0.0.1 -p $port -k $data -c fsync=${PG_FSYNC:-on}" start >/dev/null ||
		{ tail -20 "$data/server.log" >&2; die "PostgreSQL did not start (log above)"; }
}

pg_stop() {
	local data="$1"
	[ -f "$data/postmaster.pid" ] && pg_user_run "$PG_BIN/pg_ctl" -D "$data" -m fast -w stop >/dev/null 2>&1 || true
}

# pg_sql DATABASE ROLE : run the SQL on stdin in DATABASE of the cluster pg_start started, as ROLE (the
# superuser or the owner), stopping at the first error.
pg_sql() {
	local database="$1" role="$2" password
	case "$role" in
		"$PG_SUPERUSER") password="$PG_PASSWORD" ;;
		"$PG_OWNER_ROLE") password="$PG_OWNER_PASSWORD" ;;
		*) die "pg_sql: unknown role $role" ;;
	esac
	PGPASSWORD="$password" "$PG_BIN/psql" -X -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$PG_PORT" -U "$role" \
		-d "$database" -f - >/dev/null
}

# pg_url DATABASE ROLE : the connection string of ROLE (owner or app) for DATABASE.
pg_url() {
	local database="$1" role="$2"
	case "$role" in
		"$PG_OWNER_ROLE") printf 'postgres://%s:%s@127.0.0.1:%s/%s' "$role" "$PG_OWNER_PASSWORD" "$PG_PORT" "$database" ;;
		"$PG_APP_ROLE") printf 'postgres://%s:%s@127.0.0.1:%s/%s' "$role" "$PG_APP_PASSWORD" "$PG_PORT" "$database" ;;
		*) die "pg_url: unknown role $role" ;;
	esac
}

# pg_roles DIR : create the owner and app roles when missing, with generated passwords kept in
# DIR/pg-owner-password and DIR/pg-app-password, and (every start, also for a cluster made before there
# were two roles) put back their attributes and passwords. Sets PG_OWNER_PASSWORD and PG_APP_PASSWORD.
pg_roles() {
	local dir="$1"
	PG_OWNER_PASSWORD=$(pg_secret "$dir/pg-owner-password")
	PG_APP_PASSWORD=$(pg_secret "$dir/pg-app-password")
	pg_sql postgres "$PG_SUPERUSER" <<SQL || die "cannot create the database roles"
SET client_min_messages = warning;
DO \$\$
DECLARE m record;
BEGIN
	IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = '$PG_OWNER_ROLE') THEN CREATE ROLE $PG_OWNER_ROLE; END IF;
	IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = '$PG_APP_ROLE') THEN CREATE ROLE $PG_APP_ROLE; END IF;
	-- The app's privileges are its own: it is a member of no role.
	FOR m IN SELECT roleid::regrole AS parent FROM pg_auth_members WHERE member = '$PG_APP_ROLE'::regrole LOOP
		EXECUTE format('REVOKE %s FROM $PG_APP_ROLE', m.parent);
	END LOOP;
END \$\$;
ALTER ROLE $PG_OWNER_ROLE LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS PASSWORD '$PG_OWNER_PASSWORD';
ALTER ROLE $PG_APP_ROLE LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS NOINHERIT PASSWORD '$PG_APP_PASSWORD';
SQL
}

# pg_createdb NAME : create the database (owned by the owner role) when missing. A database made before there
# were two roles is handed over: it and everything the superuser had created in it (tables, sequences,
# views, functions, types, schemas such as pgboss) pass to the owner role, data untouched. Only the owner and
# the app may connect; nobody else may create in the public schema.
pg_createdb() {
	local name="$1"
	PGPASSWORD="$PG_PASSWORD" "$PG_BIN/psql" -X -h 127.0.0.1 -p "$PG_PORT" -U "$PG_SUPERUSER" -d postgres -tAc \
		"SELECT 1 FROM pg_database WHERE datname='$name'" | grep -q 1 ||
		PGPASSWORD="$PG_PASSWORD" "$PG_BIN/createdb" -h 127.0.0.1 -p "$PG_PORT" -U "$PG_SUPERUSER" \
			-O "$PG_OWNER_ROLE" "$name" || die "createdb $name failed"
	pg_sql "$name" "$PG_SUPERUSER" <<SQL || die "cannot hand the database $name to $PG_OWNER_ROLE"
SET client_min_messages = warning;
ALTER DATABASE "$name" OWNER TO $PG_OWNER_ROLE;
REVOKE ALL ON DATABASE "$name" FROM PUBLIC;
-- TEMPORARY: session-local scratch tables only (the import benchmark's write floor uses one).
GRANT CONNECT, TEMPORARY ON DATABASE "$name" TO $PG_APP_ROLE;
DO \$\$
DECLARE
	su oid := (SELECT oid FROM pg_roles WHERE rolname = current_user);
	r record;
BEGIN
	-- Schemas of the database's own (public when it is not already pg_database_owner's, pgboss).
	FOR r IN SELECT nspname FROM pg_namespace
		WHERE nspowner = su AND nspname NOT LIKE 'pg\_%' AND nspname <> 'information_schema'
	LOOP
		EXECUTE format('ALTER SCHEMA %I OWNER TO $PG_OWNER_ROLE', r.nspname);
	END LOOP;
	-- Tables and partitions (with their indexes, row types and owned sequences), views, free sequences.
	FOR r IN SELECT c.oid::regclass AS rel, c.relkind FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
		WHERE c.relowner = su AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema'
			AND c.relkind IN ('r', 'p', 'v', 'm', 'f', 'S')
			AND NOT EXISTS (SELECT FROM pg_depend d WHERE d.classid = 'pg_class'::regclass AND d.objid = c.oid
				AND (d.deptype = 'e' OR (c.relkind = 'S' AND d.deptype IN ('a', 'i'))))
	LOOP
		EXECUTE format('ALTER %s %s OWNER TO $PG_OWNER_ROLE', CASE r.relkind WHEN 'v' THEN 'VIEW'
			WHEN 'm' THEN 'MATERIALIZED VIEW' WHEN 'f' THEN 'FOREIGN TABLE' WHEN 'S' THEN 'SEQUENCE' ELSE 'TABLE' END, r.rel);
	END LOOP;
	-- Functions and procedures (the append-only trigger function, pg-boss's queue functions).
	FOR r IN SELECT p.oid::regprocedure AS fn FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
		WHERE p.proowner = su AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema'
			AND p.prokind IN ('f', 'p')
			AND NOT EXISTS (SELECT FROM pg_depend d WHERE d.classid = 'pg_proc'::regclass AND d.objid = p.oid AND d.deptype = 'e')
	LOOP
		EXECUTE format('ALTER ROUTINE %s OWNER TO $PG_OWNER_ROLE', r.fn);
	END LOOP;
	-- Enums, domains, ranges and free-standing composite types (pg-boss's job_state); a table's row type
	-- and array types follow their table or element.
	FOR r IN SELECT t.oid::regtype AS ty, t.typtype FROM pg_type t JOIN pg_namespace n ON n.oid = t.typnamespace
		WHERE t.typowner = su AND n.nspname NOT LIKE 'pg\_%' AND n.nspname <> 'information_schema'
			AND t.typtype IN ('e', 'd', 'r', 'c')
			AND (t.typrelid = 0 OR (SELECT relkind FROM pg_class WHERE oid = t.typrelid) = 'c')
			AND NOT EXISTS (SELECT FROM pg_depend d WHERE d.classid = 'pg_type'::regclass AND d.objid = t.oid AND d.deptype = 'e')
	LOOP
		EXECUTE format('ALTER %s %s OWNER TO $PG_OWNER_ROLE', CASE r.typtype WHEN 'd' THEN 'DOMAIN' ELSE 'TYPE' END, r.ty);
	END LOOP;
END \$\$;
REVOKE CREATE ON SCHEMA public FROM PUBLIC;
SQL
}

# pg_migrate NAME [seed] : migrations (and the demo seed) as the owner role. Only the knex command sees the
# owner's connection string.
pg_migrate() {
	local name="$1" owner_url
	owner_url=$(pg_url "$name" "$PG_OWNER_ROLE")
	DATABASE_OWNER_URL="$owner_url" node_modules/.bin/knex --knexfile knexfile.js migrate:latest >/dev/null ||
		die "migrating $name failed"
	if [ "${2:-}" = "seed" ]; then
		DATABASE_OWNER_URL="$owner_url" node_modules/.bin/knex --knexfile knexfile.js seed:run >/dev/null ||
			die "seeding $name failed"
	fi
}

# pgboss_prepare NAME : the job queue's schema (pgboss, as in src/lib/server/audit/worker.ts) is made and
# upgraded by pg-boss itself on start; the app role may not create it, so the owner starts pg-boss once
# (without its maintenance and schedules) before the app does. The app then gets what working the queues
# takes: rows of the queue's tables, and create_queue (a new queue is a new partition of pgboss.job, which
# only its owner may attach) running as the owner with a fixed search_path. Nothing else in pgboss runs as
# the owner. Run on every start: a pg-boss upgrade rewrites its functions.
pgboss_prepare() {
	local name="$1"
	DATABASE_OWNER_URL=$(pg_url "$name" "$PG_OWNER_ROLE") node -e '
		const PgBoss = require("pg-boss");
		const boss = new PgBoss({
			connectionString: process.env.DATABASE_OWNER_URL,
			schema: "pgboss",
			max: 1,
			supervise: false,
			schedule: false
		});
		boss.on("error", (e) => console.error("[envelo] pg-boss:", e));
		boss.start()
			.then(() => boss.stop({ graceful: false, close: true, wait: true }))
			.catch((e) => { console.error("[envelo] pg-boss:", e); process.exit(1); });
	' || die "cannot prepare the job queue's schema in $name"
	pg_sql "$name" "$PG_OWNER_ROLE" <<SQL || die "cannot grant the job queue to $PG_APP_ROLE in $name"
SET client_min_messages = warning;
GRANT USAGE ON SCHEMA pgboss TO $PG_APP_ROLE;
GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA pgboss TO $PG_APP_ROLE;
GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA pgboss TO $PG_APP_ROLE;
ALTER DEFAULT PRIVILEGES IN SCHEMA pgboss GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO $PG_APP_ROLE;
ALTER FUNCTION pgboss.create_queue(text, json) SECURITY DEFINER SET search_path = pg_catalog, pg_temp;
REVOKE ALL ON FUNCTION pgboss.create_queue(text, json) FROM PUBLIC;
GRANT EXECUTE ON FUNCTION pgboss.create_queue(text, json) TO $PG_APP_ROLE;
REVOKE ALL ON FUNCTION pgboss.delete_queue(text) FROM PUBLIC;
SQL
}
