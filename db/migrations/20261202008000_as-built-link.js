/**
 * Design and as-built: an as-built dwelling copied from its design-stage dwelling keeps the link
 * (`dwellings.design_id`), and each copied element keeps its design element (`elements.design_element_id`),
 * so the comparison pairs them even after a rename. Both links are cleared if the design side is deleted.
 */
/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.schema.alterTable('dwellings', (t) => {
		t.uuid('design_id').nullable().references('id').inTable('dwellings').onDelete('SET NULL');
		t.index(['organisation_id', 'design_id']);
	});
	await knex.schema.alterTable('elements', (t) => {
		t.uuid('design_element_id').nullable().references('id').inTable('elements').onDelete('SET NULL');
	});
	await knex.raw(`ALTER TABLE dwellings ADD CONSTRAINT dwellings_design_not_self CHECK (design_id <> id)`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.alterTable('elements', (t) => t.dropColumn('design_element_id'));
	await knex.raw('ALTER TABLE dwellings DROP CONSTRAINT dwellings_design_not_self');
	await knex.schema.alterTable('dwellings', (t) => t.dropColumn('design_id'));
}
