/**
 * A window's or door's parts (ISO 10077-1: glazing, frame, panel) kept with the element when its U was
 * worked out from them, so that reports show how and audits work it out again. JSONB validated by the
 * window calculation's zod schema at the boundary; null for a declared U and for every other kind.
 */
/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.schema.alterTable('elements', (t) => {
		t.jsonb('window_parts').nullable();
	});
	await knex.raw(
		`ALTER TABLE elements ADD CONSTRAINT elements_window_parts_kind CHECK (window_parts IS NULL OR kind IN ('window', 'door'))`
	);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw('ALTER TABLE elements DROP CONSTRAINT elements_window_parts_kind');
	await knex.schema.alterTable('elements', (t) => t.dropColumn('window_parts'));
}
