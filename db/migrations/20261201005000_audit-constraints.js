/**
 * Audit: the allowed values of a decision and a batch status, and the indexes the review screens and
 * the "Returned to me" list read by.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.raw(`
		ALTER TABLE audit_items ADD CONSTRAINT audit_items_decision_check
			CHECK (decision IS NULL OR decision IN ('accepted', 'accepted-with-advice', 'returned'));
		ALTER TABLE audit_items ADD CONSTRAINT audit_items_resubmissions_check CHECK (resubmissions >= 0);
		ALTER TABLE audit_batches ADD CONSTRAINT audit_batches_status_check CHECK (status IN ('open', 'closed'));
	`);
	await knex.schema.alterTable('audit_items', (t) => {
		t.index(['organisation_id', 'dwelling_id']);
		t.index(['organisation_id', 'decision']);
	});
	await knex.schema.alterTable('audit_batches', (t) => {
		t.index(['organisation_id', 'created_at']);
	});
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.alterTable('audit_batches', (t) => {
		t.dropIndex(['organisation_id', 'created_at']);
	});
	await knex.schema.alterTable('audit_items', (t) => {
		t.dropIndex(['organisation_id', 'dwelling_id']);
		t.dropIndex(['organisation_id', 'decision']);
	});
	await knex.raw(`
		ALTER TABLE audit_batches DROP CONSTRAINT audit_batches_status_check;
		ALTER TABLE audit_items DROP CONSTRAINT audit_items_resubmissions_check;
		ALTER TABLE audit_items DROP CONSTRAINT audit_items_decision_check;
	`);
}
