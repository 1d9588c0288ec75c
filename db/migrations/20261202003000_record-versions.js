/**
 * Climates, templates and limit tables carry a version, as dwellings and elements do: every update raises
 * it by one, and a save states the version it loaded, so a save made from a stale copy is refused instead
 * of silently overwriting somebody else's changes. Existing rows start at 1; a CHECK keeps it ≥ 1.
 */

const TABLES = ['climates', 'templates', 'limit_tables'];

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	for (const table of TABLES) {
		await knex.raw(`
			ALTER TABLE ${table}
				ADD COLUMN version integer NOT NULL DEFAULT 1,
				ADD CONSTRAINT ${table}_version_check CHECK (version >= 1);
		`);
	}
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	for (const table of TABLES) {
		await knex.raw(`ALTER TABLE ${table} DROP CONSTRAINT ${table}_version_check, DROP COLUMN version;`);
	}
}
