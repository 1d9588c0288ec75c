#!/usr/bin/env bash
# Envelo without Docker.
#   ./docker-free-start.sh        install what is missing, start PostgreSQL (127.0.0.1), the fake SMTP
#                                 server with its inbox, migrate, seed the demo, build and start Envelo.
#   ./docker-free-start.sh test   install what is missing and run every test against throwaway services.
# Ctrl-C stops everything this script started, and only that.
set -euo pipefail
cd "$(dirname "$0")"
ROOT=$(pwd)
. scripts/lib.sh

PIDS=()
PG_DATA_RUNNING=""
cleanup() {
	local pid left _
	for pid in "${PIDS[@]:-}"; do [ -n "$pid" ] && kill "$pid" 2>/dev/null || true; done
	# Give them ten seconds to finish their work, then stop them hard.
	for _ in $(seq 1 50); do
		left=0
		for pid in "${PIDS[@]:-}"; do [ -n "$pid" ] && kill -0 "$pid" 2>/dev/null && left=1; done
		[ "$left" -eq 0 ] && break
		sleep 0.2
	done
	for pid in "${PIDS[@]:-}"; do [ -n "$pid" ] && kill -9 "$pid" 2>/dev/null || true; done
	for pid in "${PIDS[@]:-}"; do [ -n "$pid" ] && wait "$pid" 2>/dev/null || true; done
	[ -n "$PG_DATA_RUNNING" ] && pg_stop "$PG_DATA_RUNNING"
	[ -n "${TEST_TMP:-}" ] && rm -rf "$TEST_TMP"
	[ -n "${TEST_BUILD:-}" ] && rm -rf "$TEST_BUILD"
	return 0
}
trap cleanup EXIT
trap 'exit 130' INT TERM

start_mail() {
	local smtp_port="$1" inbox_port="$2" dir="$3"
	node scripts/fake-smtp.js --smtp-port "$smtp_port" --inbox-port "$inbox_port" --dir "$dir" &
	PIDS+=($!)
	for _ in $(seq 1 50); do
		node -e "require('net').connect($inbox_port,'127.0.0.1').on('connect',()=>process.exit(0)).on('error',()=>process.exit(1))" && return 0
		sleep 0.2
	done
	die "the fake SMTP server did not start"
}

# A local S3-compatible store for evidence files (scripts/fake-s3.js, s3rver on loopback), and the
# S3_* settings Envelo reads (src/lib/server/evidence/storage.ts). Left alone when S3_BUCKET is set: a
# real store is configured.
start_s3() {
	local port="$1" dir="$2"
	if [ -n "${S3_BUCKET:-}" ]; then log "evidence files go to the configured S3 bucket $S3_BUCKET"; return 0; fi
	node scripts/fake-s3.js --port "$port" --dir "$dir" --bucket envelo-evidence &
	PIDS+=($!)
	for _ in $(seq 1 50); do
		if node -e "require('net').connect($port,'127.0.0.1').on('connect',()=>process.exit(0)).on('error',()=>process.exit(1))"; then
			export S3_ENDPOINT="http://127.0.0.1:$port" S3_REGION=us-east-1 S3_BUCKET=envelo-evidence
			export S3_ACCESS_KEY_ID=S3RVER S3_SECRET_ACCESS_KEY=S3RVER S3_FORCE_PATH_STYLE=true
			return 0
		fi
		sleep 0.2
	done
	die "the local S3 store for evidence files did not start"
}

run_start() {
	ensure_system_packages
	ensure_node_modules
	local data_root="$ROOT/.data" port="${ENVELO_PG_PORT:-54329}"
	local app_port="${PORT:-3000}" smtp_port="${SMTP_PORT:-2525}" inbox_port="${INBOX_PORT:-8025}"
	mkdir -p "$data_root"
	if ! pg_prepare_dir "$data_root/postgres"; then
		# The postgres user cannot reach the project folder (e.g. under a private home): keep the cluster
		# in a folder of its own, named after this checkout.
		data_root="/var/tmp/envelo-$(printf '%s' "$ROOT" | sha256sum | cut -c1-12)"
		log "the project folder is not reachable by the postgres user; keeping the cluster in $data_root"
		mkdir -p "$data_root"; pg_prepare_dir "$data_root/postgres" || die "cannot prepare $data_root/postgres"
	fi
	log "starting PostgreSQL on 127.0.0.1:$port"
	pg_start "$data_root/postgres" "$port"
	PG_DATA_RUNNING="$data_root/postgres"
	# The owner role runs the migrations and seeds; Envelo connects as the app role (README, Configuration).
	pg_roles "$data_root"
	pg_createdb envelo
	export DATABASE_URL; DATABASE_URL=$(pg_url envelo "$PG_APP_ROLE")
	unset DATABASE_OWNER_URL # given to the migrations only, never to Envelo

	if [ ! -f "$ROOT/.data/auth-secret" ]; then
		node -e "console.log(require('crypto').randomBytes(32).toString('base64url'))" >"$ROOT/.data/auth-secret"
		chmod 600 "$ROOT/.data/auth-secret"
	fi
	export AUTH_SECRET="$(cat "$ROOT/.data/auth-secret")"
	export ORIGIN="http://127.0.0.1:$app_port"
	export SMTP_HOST=127.0.0.1 SMTP_PORT="$smtp_port" MAIL_FROM="Envelo <no-reply@envelo.example.test>"
	export HOST=127.0.0.1 PORT="$app_port" BODY_SIZE_LIMIT="${BODY_SIZE_LIMIT:-25M}"

	log "migrating and seeding the demo data"
	pg_migrate envelo seed
	pgboss_prepare envelo

	start_mail "$smtp_port" "$inbox_port" "$ROOT/.data/mail"
	start_s3 "${S3_PORT:-4569}" "$ROOT/.data/s3"

	if [ ! -f build/index.js ] || [ -n "$(find src static svelte.config.js vite.config.ts tailwind.config.js package-lock.json -newer build/index.js -print -quit 2>/dev/null)" ]; then
		log "building Envelo"
		build_app "$ROOT/.data/build.log" || { tail -30 "$ROOT/.data/build.log"; die "build failed (.data/build.log)"; }
	fi
	node build &
	PIDS+=($!)
	for _ in $(seq 1 100); do
		node -e "fetch('http://127.0.0.1:$app_port/healthz').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))" && break
		sleep 0.3
	done
	log "issuing the demo reports (once; dwellings that have a report are left alone)"
	node scripts/demo-reports.js "http://127.0.0.1:$app_port" || log "some demo reports were not issued (see above)"
	cat <<TXT

  Envelo        http://127.0.0.1:$app_port
  Mail inbox    http://127.0.0.1:$inbox_port   (every e-mail Envelo sends lands here)
  Evidence      ${S3_ENDPOINT:-S3} bucket $S3_BUCKET   (photos and documents kept with a dwelling)
  PostgreSQL    127.0.0.1:$port, database envelo: Envelo connects as $PG_APP_ROLE, migrations run as
                $PG_OWNER_ROLE (passwords in $data_root/pg-app-password, pg-owner-password)

  Sign in: open Envelo, enter one of the demo addresses below, then open the inbox and follow the link.
    admin       ada.mensah@northfield-retrofit.example.test
    assessor    ben.okafor@northfield-retrofit.example.test
    assessor    carla.reyes@northfield-retrofit.example.test
    supervisor  dara.quinn@northfield-retrofit.example.test
    (second organisation, for isolation) eli.brandt@harbourline-surveys.example.test

  Ctrl-C stops Envelo, the mail server, the local S3 store and PostgreSQL.
TXT
	wait -n "${PIDS[@]}" || true
}

run_test() {
	ensure_system_packages test
	ensure_node_modules
	TEST_TMP=$(mktemp -d /tmp/envelo-test.XXXXXX)
	chmod 755 "$TEST_TMP"
	local port; port=$(free_port)
	pg_prepare_dir "$TEST_TMP/postgres" || die "cannot prepare $TEST_TMP/postgres"
	log "starting a throwaway PostgreSQL on 127.0.0.1:$port"
	PG_FSYNC=off pg_start "$TEST_TMP/postgres" "$port"
	PG_DATA_RUNNING="$TEST_TMP/postgres"
	pg_roles "$TEST_TMP"
	pg_createdb envelo_test
	pg_createdb envelo_e2e
	pgboss_prepare envelo_test # vitest's global setup rebuilds only the public schema
	# The suites and the app under test connect as the app role; only the schema set-up (vitest's global
	# setup, the e2e migrations) is given the owner's connection string.
	export TEST_DATABASE_URL E2E_DATABASE_URL DATABASE_URL
	TEST_DATABASE_URL=$(pg_url envelo_test "$PG_APP_ROLE")
	E2E_DATABASE_URL=$(pg_url envelo_e2e "$PG_APP_ROLE")
	DATABASE_URL="$TEST_DATABASE_URL"
	unset DATABASE_OWNER_URL TEST_DATABASE_OWNER_URL
	local smtp_port inbox_port; smtp_port=$(free_port); inbox_port=$(free_port)
	start_mail "$smtp_port" "$inbox_port" "$TEST_TMP/mail"
	export SMTP_HOST=127.0.0.1 SMTP_PORT="$smtp_port" INBOX_URL="http://127.0.0.1:$inbox_port"
	export MAIL_FROM="Envelo <no-reply@envelo.example.test>"
	export AUTH_SECRET="test-secret-$(date +%s)-$RANDOM$RANDOM"

	# For working on one part: ONLY_UNIT="tests/server/x.test.ts" and/or ONLY_E2E="e2e/x.e2e.ts" run just
	# those ("none" skips the stage); SKIP_STATIC=1 skips svelte-check and prettier. CI runs everything.
	local failed=0 only_unit="${ONLY_UNIT:-}" only_e2e="${ONLY_E2E:-}"
	if [ -z "${SKIP_STATIC:-}" ]; then
		log "svelte-check"
		node_modules/.bin/svelte-kit sync >/dev/null
		node_modules/.bin/svelte-check --tsconfig ./tsconfig.json --fail-on-warnings --output human || failed=1
		log "formatting (prettier --check)"
		node_modules/.bin/prettier --check . --log-level warn || failed=1
		log "import directions"; node scripts/check-imports.js || failed=1
	fi
	if [ "$only_unit" != "none" ]; then
		log "unit and server tests (vitest)"
		# shellcheck disable=SC2086
		TEST_DATABASE_OWNER_URL=$(pg_url envelo_test "$PG_OWNER_ROLE") \
			node_modules/.bin/vitest run $only_unit --reporter=default --reporter=json \
			--outputFile.json="$TEST_TMP/vitest.json" || failed=1
	fi
	if [ "$only_e2e" != "none" ]; then
		log "building for the end-to-end tests"
		# Inside the project (packages resolve from node_modules), one folder per run.
		TEST_BUILD="$ROOT/.test-builds/$(basename "$TEST_TMP")"
		export BUILD_DIR="$TEST_BUILD/build" KIT_OUT_DIR="$TEST_BUILD/kit"
		build_app "$TEST_TMP/build.log" || { tail -40 "$TEST_TMP/build.log"; die "build failed"; }
		# The browser tests store evidence in a local S3 store; the server tests start their own.
		start_s3 "$(free_port)" "$TEST_TMP/s3"
		log "end-to-end tests (Playwright, Debian's Chromium)"
		pg_migrate envelo_e2e seed
		pgboss_prepare envelo_e2e
		export APP_PORT PW_OUTPUT_DIR="$TEST_BUILD/test-results"; APP_PORT=$(free_port)
		# shellcheck disable=SC2086
		DATABASE_URL="$E2E_DATABASE_URL" PLAYWRIGHT_JSON_OUTPUT_NAME="$TEST_TMP/playwright.json" \
			node_modules/.bin/playwright test $only_e2e --reporter=list,json || failed=1
	fi
	# One closing line over both runners: "tests: N passed, N failed".
	node -e '
		const fs = require("fs");
		const read = (f) => { try { return JSON.parse(fs.readFileSync(f, "utf8")); } catch { return null; } };
		const v = read(process.argv[1]), p = read(process.argv[2]);
		let passed = 0, failed = 0, skipped = 0;
		if (v) { passed += v.numPassedTests; failed += v.numFailedTests; skipped += v.numPendingTests + v.numTodoTests; }
		if (p) { passed += p.stats.expected + p.stats.flaky; failed += p.stats.unexpected; skipped += p.stats.skipped; }
		console.log(`tests: ${passed} passed, ${failed} failed` + (skipped ? `, ${skipped} skipped` : ""));
	' "$TEST_TMP/vitest.json" "$TEST_TMP/playwright.json"
	if [ "$failed" -ne 0 ]; then log "FAILED"; exit 1; fi
	log "all tests passed"
}

# Benchmarks get the same throwaway services as the tests: BENCH_DATABASE_URL (the app role; migrated and
# demo-seeded as the owner),
# SMTP_HOST/SMTP_PORT, and a built app in BENCH_BUILD_DIR.
run_bench() {
	ensure_system_packages
	ensure_node_modules
	TEST_TMP=$(mktemp -d /tmp/envelo-bench.XXXXXX)
	chmod 755 "$TEST_TMP"
	local port; port=$(free_port)
	pg_prepare_dir "$TEST_TMP/postgres" || die "cannot prepare $TEST_TMP/postgres"
	PG_FSYNC=off pg_start "$TEST_TMP/postgres" "$port"
	PG_DATA_RUNNING="$TEST_TMP/postgres"
	pg_roles "$TEST_TMP"
	pg_createdb envelo_bench
	pg_migrate envelo_bench seed
	pgboss_prepare envelo_bench
	export BENCH_DATABASE_URL DATABASE_URL
	BENCH_DATABASE_URL=$(pg_url envelo_bench "$PG_APP_ROLE")
	DATABASE_URL="$BENCH_DATABASE_URL"
	unset DATABASE_OWNER_URL
	local smtp_port inbox_port; smtp_port=$(free_port); inbox_port=$(free_port)
	start_mail "$smtp_port" "$inbox_port" "$TEST_TMP/mail"
	start_s3 "$(free_port)" "$TEST_TMP/s3"
	export SMTP_HOST=127.0.0.1 SMTP_PORT="$smtp_port" INBOX_URL="http://127.0.0.1:$inbox_port"
	export AUTH_SECRET="bench-secret-$RANDOM$RANDOM"
	TEST_BUILD="$ROOT/.test-builds/$(basename "$TEST_TMP")"
	export BUILD_DIR="$TEST_BUILD/build" KIT_OUT_DIR="$TEST_BUILD/kit" BENCH_BUILD_DIR="$TEST_BUILD/build"
	log "building for the HTTP benchmarks"
	build_app "$TEST_TMP/build.log" || { tail -40 "$TEST_TMP/build.log"; die "build failed"; }
	# The filter, for benches that run only when named (bench/scale.bench.ts: `bench scale`, or SCALE_BENCH=1).
	export BENCH_FILTER="${1:-}"
	node scripts/bench.js "$@"
}

# Faults: throwaway services as for the benchmarks (PostgreSQL with fsync on, as in production), then
# scripts/faults.js starts Envelo itself (one process, then two), breaks things on purpose (PostgreSQL
# restarted and killed, Envelo killed mid-import, mid-recompute and mid-issue, the SMTP server down) and
# prints a table of what held; it exits non-zero when a row failed. FAULTS_ONLY="smtp two" runs some rows.
run_faults() {
	ensure_system_packages
	ensure_node_modules
	TEST_TMP=$(mktemp -d /tmp/envelo-faults.XXXXXX)
	chmod 755 "$TEST_TMP"
	local port; port=$(free_port)
	pg_prepare_dir "$TEST_TMP/postgres" || die "cannot prepare $TEST_TMP/postgres"
	log "starting a throwaway PostgreSQL on 127.0.0.1:$port (fsync on)"
	PG_FSYNC=on pg_start "$TEST_TMP/postgres" "$port"
	PG_DATA_RUNNING="$TEST_TMP/postgres"
	pg_roles "$TEST_TMP"
	pg_createdb envelo_faults
	pg_migrate envelo_faults seed
	pgboss_prepare envelo_faults
	export FAULTS_DATABASE_URL; FAULTS_DATABASE_URL=$(pg_url envelo_faults "$PG_APP_ROLE")
	unset DATABASE_OWNER_URL
	local smtp_port inbox_port; smtp_port=$(free_port); inbox_port=$(free_port)
	start_mail "$smtp_port" "$inbox_port" "$TEST_TMP/mail"
	# faults.js stops and starts the mail server itself (the SMTP row): it is told which process it is.
	export FAULTS_MAIL_PID="${PIDS[-1]}" FAULTS_MAIL_DIR="$TEST_TMP/mail" FAULTS_INBOX_PORT="$inbox_port"
	start_s3 "$(free_port)" "$TEST_TMP/s3"
	export SMTP_HOST=127.0.0.1 SMTP_PORT="$smtp_port" INBOX_URL="http://127.0.0.1:$inbox_port"
	export MAIL_FROM="Envelo <no-reply@envelo.example.test>"
	export AUTH_SECRET="faults-secret-$RANDOM$RANDOM$RANDOM"
	# PostgreSQL's own controls, for restarting and killing it (as the postgres user when we are root).
	export FAULTS_PG_BIN="$PG_BIN" FAULTS_PG_DATA="$TEST_TMP/postgres" FAULTS_PG_PORT="$port" FAULTS_TMP="$TEST_TMP"
	TEST_BUILD="$ROOT/.test-builds/$(basename "$TEST_TMP")"
	export BUILD_DIR="$TEST_BUILD/build" KIT_OUT_DIR="$TEST_BUILD/kit" FAULTS_BUILD_DIR="$TEST_BUILD/build"
	log "building Envelo for the fault scenarios"
	build_app "$TEST_TMP/build.log" || { tail -40 "$TEST_TMP/build.log"; die "build failed"; }
	node scripts/faults.js
}

case "${1:-start}" in
	start) run_start ;;
	test) run_test ;;
	bench) shift; run_bench "$@" ;;
	faults) run_faults ;;
	*) die "usage: $0 [start|test|bench|faults]" ;;
esac
