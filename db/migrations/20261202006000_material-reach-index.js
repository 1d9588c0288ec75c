/**
 * The reach of a library correction: which elements still use an older revision of a material, and
 * moving a chosen set of them to the new revision.
 *
 * 1. `elements_layers_path`: a GIN index (jsonb_path_ops) on `build_up -> 'layers'`, so a containment
 *    such as `build_up -> 'layers' @> '[{"materialId": M, "materialRevisionId": R}]'` reads only the
 *    elements whose build-up has such a layer instead of every element of every organisation. The
 *    library's "elements that use it" list asks the same kind of question and uses it too.
 * 2. The headline figures of each element's stored result as stored generated columns (`result_u_value`,
 *    `result_u_rounded`, `result_moisture`, `result_surface_pass`), which PostgreSQL keeps equal to
 *    `last_result` on every write. A stored result is some 30–60 kB of JSON (the temperature profile, the
 *    monthly Glaser cycle), kept compressed out of line: reading its U for 10,000 elements meant
 *    decompressing every one of them (about 0.5 ms a row), where these columns are read with the row.
 *    A value of another JSON type than expected gives null, never a refused write. Beside them,
 *    `inputs_md5`, a fingerprint of the build-up and inside conditions as text: elements made from one
 *    template share it, so the reach reads and recomputes each distinct build-up once, not once per
 *    element (turning 10,000 build-ups into text took longer than everything else the reach reads).
 * 3. `material_reach_outcomes`: the headline figures of an element recomputed with a material's new
 *    revision, kept by the SHA-256 of the engine input and the engine version. The engine is a pure
 *    function, so an input is calculated once and read back by every later look at the reach.
 * 4. `material_moves`: one row per request to move elements to a revision (who asked, which elements,
 *    the target revision) with its progress; a move of many elements runs as a background job that
 *    writes its progress here, so a restart loses nothing and a second run continues where it stopped.
 * 5. `material_move_items`: one outcome per element of a move (moved, already on the revision, skipped
 *    with the reason, failed with the reason), written as the move goes; an element already in it is
 *    not done again by a retried run.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	await knex.raw(
		`CREATE INDEX elements_layers_path ON elements USING gin ((build_up -> 'layers') jsonb_path_ops)`
	);
	await knex.raw(`
		ALTER TABLE elements
			ADD COLUMN result_u_value double precision GENERATED ALWAYS AS (
				CASE WHEN jsonb_typeof(last_result -> 'uValue') = 'number'
					THEN (last_result ->> 'uValue')::double precision END) STORED,
			ADD COLUMN result_u_rounded double precision GENERATED ALWAYS AS (
				CASE WHEN jsonb_typeof(last_result -> 'uValueRounded') = 'number'
					THEN (last_result ->> 'uValueRounded')::double precision END) STORED,
			ADD COLUMN result_moisture text GENERATED ALWAYS AS (
				CASE WHEN jsonb_typeof(last_result -> 'condensation' -> 'outcome') = 'string'
					THEN last_result -> 'condensation' ->> 'outcome' END) STORED,
			ADD COLUMN result_surface_pass boolean GENERATED ALWAYS AS (
				CASE WHEN jsonb_typeof(last_result -> 'surface' -> 'pass') = 'boolean'
					THEN (last_result -> 'surface' ->> 'pass')::boolean END) STORED,
			ADD COLUMN inputs_md5 text GENERATED ALWAYS AS (
				md5(coalesce(build_up::text, 'null') || '|' || coalesce(internal::text, 'null'))) STORED;
	`);
	await knex.raw(`
		CREATE TABLE material_reach_outcomes (
			organisation_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
			engine_version text NOT NULL,
			input_key text NOT NULL,
			u_value double precision,
			u_rounded double precision,
			moisture text,
			surface_pass boolean,
			error text,
			created_at timestamptz NOT NULL DEFAULT now(),
			PRIMARY KEY (organisation_id, engine_version, input_key),
			CONSTRAINT material_reach_outcomes_key_check CHECK (input_key ~ '^[0-9a-f]{64}$'),
			CONSTRAINT material_reach_outcomes_moisture_check
				CHECK (moisture IS NULL OR moisture IN ('none', 'dries', 'accumulates')),
			CONSTRAINT material_reach_outcomes_either_check CHECK ((error IS NULL) <> (u_value IS NULL))
		);
		CREATE TABLE material_moves (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			organisation_id uuid NOT NULL REFERENCES organisations (id) ON DELETE CASCADE,
			material_id uuid NOT NULL,
			to_revision_id uuid NOT NULL,
			requested_by uuid REFERENCES users (id),
			element_ids uuid[] NOT NULL,
			state text NOT NULL DEFAULT 'queued',
			total integer NOT NULL,
			done integer NOT NULL DEFAULT 0,
			moved integer NOT NULL DEFAULT 0,
			already integer NOT NULL DEFAULT 0,
			skipped integer NOT NULL DEFAULT 0,
			failed integer NOT NULL DEFAULT 0,
			error text,
			heartbeat_at timestamptz,
			created_at timestamptz NOT NULL DEFAULT now(),
			started_at timestamptz,
			finished_at timestamptz,
			CONSTRAINT material_moves_material_foreign FOREIGN KEY (organisation_id, material_id)
				REFERENCES materials (organisation_id, id) ON DELETE CASCADE,
			CONSTRAINT material_moves_to_revision_foreign FOREIGN KEY (organisation_id, to_revision_id)
				REFERENCES material_revisions (organisation_id, id) ON DELETE CASCADE,
			CONSTRAINT material_moves_state_check CHECK (state IN ('queued', 'running', 'done', 'failed')),
			CONSTRAINT material_moves_total_check CHECK (total = cardinality(element_ids) AND total > 0),
			CONSTRAINT material_moves_counts_check CHECK (
				moved >= 0 AND already >= 0 AND skipped >= 0 AND failed >= 0
				AND done = moved + already + skipped + failed AND done <= total)
		);
		CREATE INDEX material_moves_material ON material_moves (organisation_id, material_id, created_at DESC);
		CREATE INDEX material_moves_unfinished ON material_moves (state, heartbeat_at)
			WHERE state IN ('queued', 'running');
		CREATE TABLE material_move_items (
			move_id uuid NOT NULL REFERENCES material_moves (id) ON DELETE CASCADE,
			-- no key to elements: an element deleted later keeps its outcome here
			element_id uuid NOT NULL,
			outcome text NOT NULL,
			reason text,
			from_revision integer,
			to_revision integer,
			version integer,
			created_at timestamptz NOT NULL DEFAULT now(),
			PRIMARY KEY (move_id, element_id),
			CONSTRAINT material_move_items_outcome_check
				CHECK (outcome IN ('moved', 'already', 'skipped', 'failed'))
		);
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw(`
		DROP TABLE IF EXISTS material_move_items;
		DROP TABLE IF EXISTS material_moves;
		DROP TABLE IF EXISTS material_reach_outcomes;
		ALTER TABLE elements
			DROP COLUMN IF EXISTS result_u_value,
			DROP COLUMN IF EXISTS result_u_rounded,
			DROP COLUMN IF EXISTS result_moisture,
			DROP COLUMN IF EXISTS result_surface_pass,
			DROP COLUMN IF EXISTS inputs_md5;
		DROP INDEX IF EXISTS elements_layers_path;
	`);
}
