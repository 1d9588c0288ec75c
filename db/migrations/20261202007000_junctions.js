/**
 * Junctions of a dwelling (linear thermal bridges): each has a length in the dwelling and a ψ-value,
 * either calculated by Envelo from a two-dimensional model (ISO 10211; `model` is the engine's
 * JunctionInput, `details` the builder's choices, `last_result` the stored calculation) or entered
 * from another source, which is then named (`psi_entered`, `psi_source`). The ψ-value refers to one
 * dimension system (ISO 13789). The key to the dwelling carries the organisation, as every other
 * child row's does (20261202002000_domain-constraints.js), and deleting the dwelling deletes them.
 */

/** As src/lib/junctions/kinds.ts writes them today, copied so that this migration keeps its meaning. */
const TYPES = [
	'external-corner',
	'internal-corner',
	'ground-floor',
	'intermediate-floor',
	'eaves',
	'flat-roof',
	'window-head',
	'window-jamb',
	'window-sill',
	'party-wall',
	'other'
];
const SOURCES = ['calculated', 'entered'];
const DIMENSION_SYSTEMS = ['internal', 'overall-internal', 'external'];

const list = (/** @type {string[]} */ values) => values.map((v) => `'${v}'`).join(', ');

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.schema.createTable('junctions', (t) => {
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
		t.uuid('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
		t.uuid('dwelling_id').notNullable();
		t.text('name').notNullable();
		t.text('type').notNullable();
		t.double('length_m').notNullable(); // m, in the dimension system of ψ
		t.text('source').notNullable();
		t.text('dimension_system').notNullable();
		t.double('psi_entered'); // W/(m·K), when entered
		t.text('psi_source'); // where an entered ψ comes from
		t.jsonb('model'); // JunctionInput (src/lib/physics/junction-schema.ts)
		t.jsonb('details'); // the builder's choices (src/lib/junctions/schema.ts)
		t.jsonb('last_result'); // JunctionCalculation (src/lib/junctions/calculate.ts)
		t.text('engine_version');
		t.integer('version').notNullable().defaultTo(1);
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['organisation_id', 'dwelling_id']);
	});
	await knex.raw(`
		ALTER TABLE junctions
			ADD CONSTRAINT junctions_dwelling_foreign FOREIGN KEY (organisation_id, dwelling_id)
				REFERENCES dwellings (organisation_id, id) ON DELETE CASCADE,
			ADD CONSTRAINT junctions_type_check CHECK (type IN (${list(TYPES)})),
			ADD CONSTRAINT junctions_source_check CHECK (source IN (${list(SOURCES)})),
			ADD CONSTRAINT junctions_dimension_system_check CHECK (dimension_system IN (${list(DIMENSION_SYSTEMS)})),
			ADD CONSTRAINT junctions_length_m_check CHECK (length_m > 0 AND length_m <= 100000),
			ADD CONSTRAINT junctions_name_check CHECK (length(btrim(name)) > 0),
			ADD CONSTRAINT junctions_version_check CHECK (version >= 1),
			ADD CONSTRAINT junctions_entered_check CHECK (
				source <> 'entered' OR (
					psi_entered IS NOT NULL AND psi_entered >= -10 AND psi_entered <= 10
					AND psi_source IS NOT NULL AND length(btrim(psi_source)) > 0
				)
			),
			ADD CONSTRAINT junctions_calculated_check CHECK (
				source <> 'calculated' OR (model IS NOT NULL AND psi_entered IS NULL AND psi_source IS NULL)
			),
			ADD CONSTRAINT junctions_result_engine_check CHECK ((last_result IS NULL) = (engine_version IS NULL))
	`);
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.schema.dropTable('junctions');
}
