/**
 * Reports and the mail outbox: lookups by dwelling, and one successor per report (a revision is
 * superseded at most once, so the chain of revisions never forks).
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.schema.alterTable('reports', (t) => {
		t.index(['organisation_id', 'dwelling_id', 'scope', 'element_id', 'revision'], 'reports_subject_idx');
	});
	await knex.raw(
		'CREATE UNIQUE INDEX reports_one_successor ON reports (supersedes_id) WHERE supersedes_id IS NOT NULL'
	);
	await knex.raw(
		`ALTER TABLE reports ADD CONSTRAINT reports_scope_check CHECK ((scope = 'dwelling' AND element_id IS NULL) OR (scope = 'element' AND element_id IS NOT NULL))`
	);
	await knex.schema.alterTable('mail_outbox', (t) => {
		t.index(['organisation_id', 'dwelling_id', 'created_at'], 'mail_outbox_dwelling_idx');
		t.index(['report_id'], 'mail_outbox_report_idx');
	});
	await knex.raw(
		`ALTER TABLE mail_outbox ADD CONSTRAINT mail_outbox_status_check CHECK (status IN ('queued', 'sent', 'failed'))`
	);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw('ALTER TABLE mail_outbox DROP CONSTRAINT IF EXISTS mail_outbox_status_check');
	await knex.schema.alterTable('mail_outbox', (t) => {
		t.dropIndex([], 'mail_outbox_report_idx');
		t.dropIndex([], 'mail_outbox_dwelling_idx');
	});
	await knex.raw('ALTER TABLE reports DROP CONSTRAINT IF EXISTS reports_scope_check');
	await knex.raw('DROP INDEX IF EXISTS reports_one_successor');
	await knex.schema.alterTable('reports', (t) => {
		t.dropIndex([], 'reports_subject_idx');
	});
}
