/**
 * The dwelling's total floor area (m², measured inside the external walls as the assessor's method
 * measures it), for figures per floor area such as the heat-capacity parameter. Null until given.
 */
/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.schema.alterTable('dwellings', (t) => {
		t.double('floor_area').nullable(); // m²
	});
	await knex.raw(
		`ALTER TABLE dwellings ADD CONSTRAINT dwellings_floor_area_range CHECK (floor_area IS NULL OR (floor_area > 0 AND floor_area <= 100000))`
	);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw('ALTER TABLE dwellings DROP CONSTRAINT dwellings_floor_area_range');
	await knex.schema.alterTable('dwellings', (t) => t.dropColumn('floor_area'));
}
