/**
 * What the app's database role may do. Envelo connects as envelo_app (DATABASE_URL); the schema belongs to
 * the role that runs the migrations and seeds (DATABASE_OWNER_URL). The start script creates both roles
 * (README, Configuration). envelo_app is no superuser and owns nothing, so it can neither set
 * session_replication_role nor disable or drop a trigger, and it cannot create or alter anything. It may
 * read and write the rows of the tables the app works with, except on the append-only tables: there it may
 * only INSERT and SELECT, so an issued report or a logged action stays as written even before the triggers
 * of refuse_change() are reached. Knex's own bookkeeping tables are not the app's.
 *
 * Tables and sequences the owner creates later (in later migrations) are granted to envelo_app by default
 * privileges: SELECT, INSERT, UPDATE and DELETE, and USAGE, SELECT on sequences. A later append-only table
 * revokes UPDATE and DELETE itself, beside its triggers; tests/db/roles.test.ts checks the two here.
 * pg-boss's schema is not made by migrations: the start script prepares it and its grants.
 */

const APP_ROLE = 'envelo_app';
const APPEND_ONLY = ['reports', 'activity_log'];
const KNEX_TABLES = ['knex_migrations', 'knex_migrations_lock'];

/** @param {import('knex').Knex} knex */
async function requireAppRole(knex) {
	const { rows } = await knex.raw('SELECT 1 FROM pg_roles WHERE rolname = ?', [APP_ROLE]);
	if (!rows.length) {
		throw new Error(
			`the database role ${APP_ROLE} does not exist: create it (LOGIN, not a superuser) before migrating; ` +
				'./docker-free-start.sh does (README, Configuration)'
		);
	}
}

/**
 * The schema the migrations write to (public), with its tables and sequences, Knex's own left out; names
 * come quoted for SQL.
 * @param {import('knex').Knex} knex
 */
async function appRelations(knex) {
	const { rows } = await knex.raw(
		`SELECT c.relname AS name, c.relkind AS kind
		 FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
		 WHERE n.nspname = current_schema() AND c.relkind IN ('r', 'p', 'S')
		 ORDER BY c.relname`
	);
	/** @type {{ name: string, kind: string }[]} */
	const all = rows;
	const q = (/** @type {string} */ name) => `"${name.replace(/"/g, '""')}"`;
	const ours = all.filter((r) => !KNEX_TABLES.some((k) => r.name === k || r.name.startsWith(`${k}_`)));
	return {
		schema: q((await knex.raw('SELECT current_schema() AS s')).rows[0].s),
		tables: ours.filter((r) => r.kind !== 'S').map((r) => q(r.name)),
		sequences: ours.filter((r) => r.kind === 'S').map((r) => q(r.name))
	};
}

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await requireAppRole(knex);
	const { schema, tables, sequences } = await appRelations(knex);
	await knex.raw(`GRANT USAGE ON SCHEMA ${schema} TO ${APP_ROLE}`);
	await knex.raw(`GRANT SELECT, INSERT, UPDATE, DELETE ON TABLE ${tables.join(', ')} TO ${APP_ROLE}`);
	await knex.raw(
		`REVOKE UPDATE, DELETE, TRUNCATE, REFERENCES, TRIGGER ON TABLE ${APPEND_ONLY.join(', ')} FROM ${APP_ROLE}`
	);
	if (sequences.length)
		await knex.raw(`GRANT USAGE, SELECT ON SEQUENCE ${sequences.join(', ')} TO ${APP_ROLE}`);
	await knex.raw(`
		ALTER DEFAULT PRIVILEGES GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${APP_ROLE};
		ALTER DEFAULT PRIVILEGES GRANT USAGE, SELECT ON SEQUENCES TO ${APP_ROLE};
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	const { rows } = await knex.raw('SELECT 1 FROM pg_roles WHERE rolname = ?', [APP_ROLE]);
	if (!rows.length) return;
	const { schema, tables, sequences } = await appRelations(knex);
	await knex.raw(`
		ALTER DEFAULT PRIVILEGES REVOKE ALL ON SEQUENCES FROM ${APP_ROLE};
		ALTER DEFAULT PRIVILEGES REVOKE ALL ON TABLES FROM ${APP_ROLE};
	`);
	if (sequences.length) await knex.raw(`REVOKE ALL ON SEQUENCE ${sequences.join(', ')} FROM ${APP_ROLE}`);
	await knex.raw(`REVOKE ALL ON TABLE ${tables.join(', ')} FROM ${APP_ROLE}`);
	await knex.raw(`REVOKE USAGE ON SCHEMA ${schema} FROM ${APP_ROLE}`);
}
