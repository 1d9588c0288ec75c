/**
 * Auth.js tables for @auth/pg-adapter (it ships no schema). Ids are UUIDs; column names are the
 * adapter's own (camelCase, quoted) because it issues the SQL itself.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.schema.createTable('users', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.text('name');
		t.text('email').notNullable().unique();
		t.timestamp('emailVerified', { useTz: true });
		t.text('image');
		// Shown on reports beside the assessor's name (accreditation or registration number).
		t.text('registration_number');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
	});
	await knex.schema.createTable('accounts', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('userId').notNullable().references('users.id').onDelete('CASCADE');
		t.text('type').notNullable();
		t.text('provider').notNullable();
		t.text('providerAccountId').notNullable();
		t.text('refresh_token');
		t.text('access_token');
		t.bigInteger('expires_at');
		t.text('id_token');
		t.text('scope');
		t.text('session_state');
		t.text('token_type');
	});
	await knex.schema.createTable('sessions', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('userId').notNullable().references('users.id').onDelete('CASCADE');
		t.timestamp('expires', { useTz: true }).notNullable();
		t.text('sessionToken').notNullable().unique();
	});
	await knex.schema.createTable('verification_token', (t) => {
		t.text('identifier').notNullable();
		t.timestamp('expires', { useTz: true }).notNullable();
		t.text('token').notNullable();
		t.primary(['identifier', 'token']);
	});
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.dropTable('verification_token');
	await knex.schema.dropTable('sessions');
	await knex.schema.dropTable('accounts');
	await knex.schema.dropTable('users');
}
