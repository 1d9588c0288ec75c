/**
 * Evidence: photos and documents an assessor attaches to a dwelling, to one of its elements or to a layer
 * of an element, and the supervisor's requests for more.
 *
 * 1. `evidence`: one row per stored file. The file itself is an object in the S3 bucket (`storage_key`,
 *    and `thumbnail_key` for images); the row carries what was checked while it streamed in: its type by
 *    content, its size and its SHA-256. Keys carry the organisation, as in 20261202002000: the dwelling by
 *    (organisation_id, dwelling_id), the element by (organisation_id, dwelling_id, element_id), so an
 *    element of another dwelling (or organisation) cannot be named. A deleted element leaves its evidence
 *    on the dwelling (element_id and layer_index cleared).
 * 2. `reported_at`: when the evidence was first listed in an issued report. Every report of a dwelling
 *    lists all of the dwelling's evidence, so inserting a report marks every unmarked row of its dwelling
 *    (a trigger, in the issuing transaction). Marked evidence is part of an issued record: the database
 *    refuses to delete it, and refuses to change any row except for the element link a deletion clears.
 * 3. `evidence_requests`: a supervisor's request on an audit item, with a note and a due date; answered
 *    (who, when, by which upload) automatically by the next upload to the dwelling, or explicitly.
 */

const CONTENT_TYPES = ['image/jpeg', 'image/png', 'application/pdf'];
const list = (/** @type {string[]} */ values) => values.map((v) => `'${v}'`).join(', ');

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	// The parents reached by (organisation_id, dwelling_id, id): an element, an audit item of that dwelling.
	await knex.raw(`
		ALTER TABLE elements ADD CONSTRAINT elements_organisation_id_dwelling_id_id_unique
			UNIQUE (organisation_id, dwelling_id, id);
		ALTER TABLE audit_items ADD CONSTRAINT audit_items_organisation_id_dwelling_id_id_unique
			UNIQUE (organisation_id, dwelling_id, id);
	`);
	await knex.schema.createTable('evidence', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
		t.uuid('dwelling_id').notNullable();
		t.uuid('element_id').nullable();
		t.integer('layer_index').nullable(); // 0-based, as in the element's build-up; shown as "layer N+1"
		t.text('layer_name').nullable(); // the layer's name when the file was uploaded
		t.text('name').notNullable(); // the file name as uploaded, made safe
		t.text('content_type').notNullable(); // by content, never the client's claim
		t.bigInteger('bytes').notNullable();
		t.text('sha256').notNullable();
		t.text('storage_key').notNullable().unique();
		t.text('thumbnail_key').nullable().unique();
		t.uuid('uploaded_by').notNullable().references('users.id');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('reported_at', { useTz: true }).nullable();
		t.unique(['organisation_id', 'id']);
		t.index(['organisation_id', 'dwelling_id', 'created_at']);
	});
	await knex.raw(`
		ALTER TABLE evidence
			ADD CONSTRAINT evidence_dwelling_foreign FOREIGN KEY (organisation_id, dwelling_id)
				REFERENCES dwellings (organisation_id, id) ON DELETE CASCADE,
			ADD CONSTRAINT evidence_element_foreign FOREIGN KEY (organisation_id, dwelling_id, element_id)
				REFERENCES elements (organisation_id, dwelling_id, id) ON DELETE SET NULL (element_id),
			ADD CONSTRAINT evidence_layer_index_check CHECK (layer_index IS NULL OR (layer_index >= 0 AND element_id IS NOT NULL)),
			ADD CONSTRAINT evidence_name_check CHECK (length(name) BETWEEN 1 AND 255),
			ADD CONSTRAINT evidence_content_type_check CHECK (content_type IN (${list(CONTENT_TYPES)})),
			ADD CONSTRAINT evidence_bytes_check CHECK (bytes > 0),
			ADD CONSTRAINT evidence_sha256_check CHECK (sha256 ~ '^[0-9a-f]{64}$');

		CREATE FUNCTION evidence_kept() RETURNS trigger LANGUAGE plpgsql AS $$
		BEGIN
			IF TG_OP = 'DELETE' THEN
				IF OLD.reported_at IS NOT NULL THEN
					RAISE EXCEPTION 'evidence listed in an issued report is kept: it cannot be deleted'
						USING ERRCODE = 'check_violation';
				END IF;
				RETURN OLD;
			END IF;
			-- A deleted element clears element_id (its key's ON DELETE); its layer goes with it.
			IF NEW.element_id IS NULL THEN NEW.layer_index := NULL; END IF;
			IF OLD.reported_at IS NOT NULL AND NEW.reported_at IS DISTINCT FROM OLD.reported_at THEN
				RAISE EXCEPTION 'evidence stays marked as reported' USING ERRCODE = 'check_violation';
			END IF;
			IF (NEW.element_id IS NOT NULL AND NEW.element_id IS DISTINCT FROM OLD.element_id)
				OR (NEW.layer_index IS NOT NULL AND NEW.layer_index IS DISTINCT FROM OLD.layer_index)
				OR (to_jsonb(NEW) - 'element_id' - 'layer_index' - 'reported_at')
					IS DISTINCT FROM (to_jsonb(OLD) - 'element_id' - 'layer_index' - 'reported_at') THEN
				RAISE EXCEPTION 'evidence never changes: upload the file again' USING ERRCODE = 'check_violation';
			END IF;
			RETURN NEW;
		END $$;
		CREATE TRIGGER evidence_kept BEFORE UPDATE OR DELETE ON evidence
			FOR EACH ROW EXECUTE FUNCTION evidence_kept();

		CREATE FUNCTION evidence_mark_reported() RETURNS trigger LANGUAGE plpgsql AS $$
		BEGIN
			UPDATE evidence SET reported_at = NEW.issued_at
			 WHERE organisation_id = NEW.organisation_id AND dwelling_id = NEW.dwelling_id AND reported_at IS NULL;
			RETURN NULL;
		END $$;
		CREATE TRIGGER reports_mark_evidence AFTER INSERT ON reports
			FOR EACH ROW EXECUTE FUNCTION evidence_mark_reported();
	`);

	await knex.schema.createTable('evidence_requests', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
		t.uuid('dwelling_id').notNullable();
		t.uuid('audit_item_id').notNullable();
		t.uuid('requested_by').notNullable().references('users.id');
		t.text('note').notNullable();
		t.date('due_date').notNullable();
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('answered_at', { useTz: true }).nullable();
		t.uuid('answered_by').nullable().references('users.id');
		t.uuid('answer_evidence_id').nullable();
		t.index(['organisation_id', 'audit_item_id', 'created_at']);
	});
	await knex.raw(`
		ALTER TABLE evidence_requests
			ADD CONSTRAINT evidence_requests_dwelling_foreign FOREIGN KEY (organisation_id, dwelling_id)
				REFERENCES dwellings (organisation_id, id) ON DELETE CASCADE,
			ADD CONSTRAINT evidence_requests_audit_item_foreign FOREIGN KEY (organisation_id, dwelling_id, audit_item_id)
				REFERENCES audit_items (organisation_id, dwelling_id, id) ON DELETE CASCADE,
			ADD CONSTRAINT evidence_requests_answer_evidence_foreign FOREIGN KEY (organisation_id, answer_evidence_id)
				REFERENCES evidence (organisation_id, id) ON DELETE SET NULL (answer_evidence_id),
			ADD CONSTRAINT evidence_requests_note_check CHECK (length(note) BETWEEN 1 AND 2000),
			ADD CONSTRAINT evidence_requests_answered_check CHECK ((answered_at IS NULL) = (answered_by IS NULL)),
			ADD CONSTRAINT evidence_requests_answer_check CHECK (answer_evidence_id IS NULL OR answered_at IS NOT NULL);
		CREATE INDEX evidence_requests_open ON evidence_requests (organisation_id, dwelling_id)
			WHERE answered_at IS NULL;
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.dropTable('evidence_requests');
	await knex.raw(`
		DROP TRIGGER IF EXISTS reports_mark_evidence ON reports;
		DROP FUNCTION IF EXISTS evidence_mark_reported();
		DROP TRIGGER IF EXISTS evidence_kept ON evidence;
		DROP FUNCTION IF EXISTS evidence_kept();
	`);
	await knex.schema.dropTable('evidence');
	await knex.raw(`
		ALTER TABLE audit_items DROP CONSTRAINT audit_items_organisation_id_dwelling_id_id_unique;
		ALTER TABLE elements DROP CONSTRAINT elements_organisation_id_dwelling_id_id_unique;
	`);
}
