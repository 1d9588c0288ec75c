/**
 * Library: revisions keep issued work reproducible. A revision's values never change once written
 * (only its status and who verified it); a value change is a new revision. Also: the indicative flag
 * for demo and generic values, and an index for "which elements use this material".
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.schema.alterTable('material_revisions', (t) => {
		t.boolean('indicative').notNullable().defaultTo(false);
	});
	await knex.raw(`
		CREATE FUNCTION material_revision_values_fixed() RETURNS trigger LANGUAGE plpgsql AS $$
		BEGIN
			IF TG_OP = 'DELETE' THEN
				-- Only as part of deleting the material or the organisation (a cascade runs inside a trigger).
				IF pg_trigger_depth() < 2 THEN
					RAISE EXCEPTION 'material revisions are kept: delete the material instead' USING ERRCODE = 'check_violation';
				END IF;
				RETURN OLD;
			END IF;
			IF (to_jsonb(NEW) - 'status' - 'verified_by' - 'verified_at')
				IS DISTINCT FROM (to_jsonb(OLD) - 'status' - 'verified_by' - 'verified_at') THEN
				RAISE EXCEPTION 'the values of a material revision never change: write a new revision' USING ERRCODE = 'check_violation';
			END IF;
			RETURN NEW;
		END $$;
		CREATE TRIGGER material_revisions_values_fixed BEFORE UPDATE OR DELETE ON material_revisions
			FOR EACH ROW EXECUTE FUNCTION material_revision_values_fixed();
		ALTER TABLE material_revisions ADD CONSTRAINT material_revisions_status_check
			CHECK (status IN ('unverified', 'verified', 'superseded'));
		CREATE INDEX elements_build_up_layers ON elements USING gin ((build_up -> 'layers') jsonb_path_ops);
		CREATE INDEX material_revisions_material ON material_revisions (material_id, revision DESC);
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw(`
		DROP INDEX IF EXISTS material_revisions_material;
		DROP INDEX IF EXISTS elements_build_up_layers;
		ALTER TABLE material_revisions DROP CONSTRAINT IF EXISTS material_revisions_status_check;
		DROP TRIGGER IF EXISTS material_revisions_values_fixed ON material_revisions;
		DROP FUNCTION IF EXISTS material_revision_values_fixed();
	`);
	await knex.schema.alterTable('material_revisions', (t) => {
		t.dropColumn('indicative');
	});
}
