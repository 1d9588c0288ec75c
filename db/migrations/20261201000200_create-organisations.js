/**
 * Organisations, their members with a role, sign-in rate limiting and the append-only activity log.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.schema.createTable('organisations', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.text('name').notNullable();
		t.text('slug').notNullable().unique();
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
	});
	await knex.schema.createTable('memberships', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
		t.uuid('user_id').notNullable().references('users.id').onDelete('CASCADE');
		t.text('role').notNullable();
		t.uuid('invited_by').references('users.id').onDelete('SET NULL');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.unique(['organisation_id', 'user_id']);
		// One organisation per person keeps "which organisation am I in?" unambiguous.
		t.unique(['user_id']);
	});
	await knex.raw(
		`ALTER TABLE memberships ADD CONSTRAINT memberships_role_check CHECK (role IN ('assessor','supervisor','admin'))`
	);
	await knex.schema.createTable('sign_in_attempts', (t) => {
		t.bigIncrements('id');
		t.text('email').notNullable();
		t.text('client').notNullable();
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['email', 'created_at']);
		t.index(['client', 'created_at']);
	});
	await knex.schema.createTable('activity_log', (t) => {
		t.bigIncrements('id');
		// No foreign keys: the log outlives what it describes and must never be rewritten by a cascade.
		t.uuid('organisation_id');
		t.uuid('user_id');
		t.text('action').notNullable();
		t.text('entity').notNullable();
		t.text('entity_id');
		t.jsonb('details').notNullable().defaultTo('{}');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['organisation_id', 'created_at']);
		t.index(['entity', 'entity_id']);
	});
	// The log is append-only: the database itself refuses to change or remove a past row.
	await knex.raw(`
		CREATE FUNCTION refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
		BEGIN
			RAISE EXCEPTION '% rows are append-only: % refused', TG_TABLE_NAME, TG_OP
				USING ERRCODE = 'insufficient_privilege';
		END $$;
		CREATE TRIGGER activity_log_append_only BEFORE UPDATE OR DELETE ON activity_log
			FOR EACH ROW EXECUTE FUNCTION refuse_change();
		CREATE TRIGGER activity_log_no_truncate BEFORE TRUNCATE ON activity_log
			FOR EACH STATEMENT EXECUTE FUNCTION refuse_change();
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.dropTable('activity_log');
	await knex.raw('DROP FUNCTION IF EXISTS refuse_change() CASCADE');
	await knex.schema.dropTable('sign_in_attempts');
	await knex.schema.dropTable('memberships');
	await knex.schema.dropTable('organisations');
}
