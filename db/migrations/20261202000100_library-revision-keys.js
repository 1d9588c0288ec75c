/**
 * Library: a revision belongs to a material of its own organisation. One foreign key on
 * (organisation_id, material_id) replaces the two separate keys to organisations and to materials, so
 * PostgreSQL can no longer accept a revision whose organisation differs from its material's, and a bulk
 * import checks one key per row instead of two. The index on (material_id, revision DESC) repeated the
 * unique constraint on (material_id, revision), which serves the same lookups.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.raw(`
		ALTER TABLE materials ADD CONSTRAINT materials_organisation_id_id_unique UNIQUE (organisation_id, id);
		ALTER TABLE material_revisions
			DROP CONSTRAINT material_revisions_organisation_id_foreign,
			DROP CONSTRAINT material_revisions_material_id_foreign,
			ADD CONSTRAINT material_revisions_material_foreign FOREIGN KEY (organisation_id, material_id)
				REFERENCES materials (organisation_id, id) ON DELETE CASCADE;
		DROP INDEX IF EXISTS material_revisions_material;
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw(`
		CREATE INDEX material_revisions_material ON material_revisions (material_id, revision DESC);
		ALTER TABLE material_revisions
			DROP CONSTRAINT material_revisions_material_foreign,
			ADD CONSTRAINT material_revisions_material_id_foreign FOREIGN KEY (material_id)
				REFERENCES materials (id) ON DELETE CASCADE,
			ADD CONSTRAINT material_revisions_organisation_id_foreign FOREIGN KEY (organisation_id)
				REFERENCES organisations (id) ON DELETE CASCADE;
		ALTER TABLE materials DROP CONSTRAINT materials_organisation_id_id_unique;
	`);
}
