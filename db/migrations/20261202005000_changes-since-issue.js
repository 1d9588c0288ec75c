/**
 * The working copy and the issued record told apart.
 *
 * 1. `dwellings.issue_changes`: how many differences there are between the dwelling as it is and its
 *    latest issued dwelling report (null before the first issue, 0 when they match). The server keeps it
 *    in the same transaction as every write that can change it, so the dwellings list can filter on it.
 * 2. `dwellings.reopened_at`: when a dwelling awaiting review was reopened for changes (with a reason,
 *    logged); cleared when the supervisor decides or the dwelling is put in a batch again.
 * 3. A new status, 'changed-after-acceptance': an accepted dwelling reopened with a reason.
 */
const DWELLING_STATUSES = [
	'draft',
	'issued',
	'awaiting-review',
	'accepted',
	'changed-after-acceptance',
	'returned',
	'archived'
];
const BEFORE = ['draft', 'issued', 'awaiting-review', 'accepted', 'returned', 'archived'];
const list = (/** @type {string[]} */ values) => values.map((v) => `'${v}'`).join(', ');

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.schema.alterTable('dwellings', (t) => {
		t.integer('issue_changes').nullable();
		t.timestamp('reopened_at', { useTz: true }).nullable();
	});
	await knex.raw(`
		ALTER TABLE dwellings DROP CONSTRAINT dwellings_status_check;
		ALTER TABLE dwellings ADD CONSTRAINT dwellings_status_check CHECK (status IN (${list(DWELLING_STATUSES)}));
		ALTER TABLE dwellings ADD CONSTRAINT dwellings_issue_changes_check CHECK (issue_changes >= 0);
		CREATE INDEX dwellings_changed_since_issue ON dwellings (organisation_id, updated_at DESC)
			WHERE issue_changes > 0;
		UPDATE dwellings d SET issue_changes = 0
		 WHERE EXISTS (SELECT 1 FROM reports r WHERE r.dwelling_id = d.id AND r.scope = 'dwelling');
		CREATE INDEX IF NOT EXISTS activity_log_entity ON activity_log (organisation_id, entity, entity_id, created_at);
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw(`
		DROP INDEX IF EXISTS dwellings_changed_since_issue;
		DROP INDEX IF EXISTS activity_log_entity;
		UPDATE dwellings SET status = 'accepted' WHERE status = 'changed-after-acceptance';
		ALTER TABLE dwellings DROP CONSTRAINT dwellings_status_check;
		ALTER TABLE dwellings ADD CONSTRAINT dwellings_status_check CHECK (status IN (${list(BEFORE)}));
		ALTER TABLE dwellings DROP CONSTRAINT dwellings_issue_changes_check;
	`);
	await knex.schema.alterTable('dwellings', (t) => {
		t.dropColumn('issue_changes');
		t.dropColumn('reopened_at');
	});
}
