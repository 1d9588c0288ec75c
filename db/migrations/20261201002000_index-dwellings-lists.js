/**
 * Indexes for the dwellings list (filter by assessor, sort by last change) and for reading a dwelling's
 * elements within the organisation.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.schema.alterTable('dwellings', (t) => {
		t.index(['organisation_id', 'assessor_id'], 'dwellings_org_assessor_idx');
		t.index(['organisation_id', 'updated_at'], 'dwellings_org_updated_idx');
	});
	await knex.schema.alterTable('elements', (t) => {
		t.index(['organisation_id', 'dwelling_id'], 'elements_org_dwelling_idx');
	});
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.alterTable('elements', (t) => t.dropIndex([], 'elements_org_dwelling_idx'));
	await knex.schema.alterTable('dwellings', (t) => {
		t.dropIndex([], 'dwellings_org_updated_idx');
		t.dropIndex([], 'dwellings_org_assessor_idx');
	});
}
