/**
 * The working data of an organisation: material library with revisions, climates, limit tables,
 * dwellings and their elements, templates, issued reports with their outbox, and audits.
 * Every row an organisation owns carries organisation_id. Physical quantities are double precision
 * (pg returns numeric as strings). Build-ups, inputs and results are JSONB validated by the zod
 * schemas of src/lib/physics/schema.ts at the boundary.
 * @param {import('knex').Knex} knex
 */
export async function up(knex) {
	const id = (/** @type {import('knex').Knex.CreateTableBuilder} */ t) =>
		t.uuid('id').primary().defaultTo(knex.raw('gen_random_uuid()'));
	const org = (/** @type {import('knex').Knex.CreateTableBuilder} */ t) =>
		t.uuid('organisation_id').notNullable().references('organisations.id').onDelete('CASCADE');
	const stamps = (/** @type {import('knex').Knex.CreateTableBuilder} */ t) => {
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
	};

	// ---- Library ----
	await knex.schema.createTable('materials', (t) => {
		id(t);
		org(t);
		t.text('code').notNullable();
		t.uuid('current_revision_id'); // set after the first revision is written
		stamps(t);
		t.unique(['organisation_id', 'code']);
	});
	await knex.schema.createTable('material_revisions', (t) => {
		id(t);
		org(t);
		t.uuid('material_id').notNullable().references('materials.id').onDelete('CASCADE');
		t.integer('revision').notNullable();
		t.text('name').notNullable();
		t.text('manufacturer').notNullable().defaultTo('generic');
		t.text('category').notNullable(); // masonry | concrete | timber-boards | insulation | membranes | plasters-linings | air-layers | other
		t.double('lambda'); // W/(m·K)
		t.text('lambda_kind'); // declared | design | table
		t.double('resistance'); // m²K/W, fixed thermal resistance instead of λ
		t.double('mu_dry');
		t.double('mu_wet');
		t.double('sd'); // m, instead of μ
		t.double('density'); // kg/m³
		t.double('specific_heat'); // J/(kg·K)
		t.double('thickness_min_mm');
		t.double('thickness_max_mm');
		t.text('source');
		t.date('source_issued');
		t.date('source_expires');
		t.text('status').notNullable().defaultTo('unverified'); // unverified | verified | superseded
		t.uuid('verified_by').references('users.id');
		t.timestamp('verified_at', { useTz: true });
		t.text('notes');
		t.uuid('created_by').references('users.id');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.unique(['material_id', 'revision']);
		t.index(['organisation_id', 'category']);
	});
	await knex.raw(
		`ALTER TABLE materials ADD CONSTRAINT materials_current_revision_fk FOREIGN KEY (current_revision_id) REFERENCES material_revisions(id) DEFERRABLE INITIALLY DEFERRED`
	);
	await knex.schema.createTable('import_mappings', (t) => {
		id(t);
		org(t);
		t.text('kind').notNullable(); // 'materials' | 'climates' | 'audit-references'
		t.text('header_signature').notNullable(); // the file's header row, normalised
		t.jsonb('mapping').notNullable(); // { fileHeader: fieldName }
		stamps(t);
		t.unique(['organisation_id', 'kind', 'header_signature']);
	});

	// ---- Climates and limits ----
	await knex.schema.createTable('climates', (t) => {
		id(t);
		org(t);
		t.text('name').notNullable();
		t.text('source').notNullable();
		t.boolean('illustrative').notNullable().defaultTo(false);
		t.jsonb('months').notNullable(); // [{ month, temperature, relativeHumidity }] × 12
		stamps(t);
		t.unique(['organisation_id', 'name']);
	});
	await knex.schema.createTable('limit_tables', (t) => {
		id(t);
		org(t);
		t.text('name').notNullable();
		t.text('edition').notNullable();
		t.date('dated');
		t.text('source');
		t.boolean('is_default').notNullable().defaultTo(false);
		t.jsonb('limits').notNullable(); // { [elementKind]: maximum U in W/(m²K) }
		stamps(t);
		t.unique(['organisation_id', 'name', 'edition']);
	});
	await knex.raw(
		`CREATE UNIQUE INDEX limit_tables_one_default ON limit_tables (organisation_id) WHERE is_default`
	);

	// ---- Dwellings and elements ----
	await knex.schema.createTable('dwellings', (t) => {
		id(t);
		org(t);
		t.text('reference').notNullable();
		t.text('address').notNullable().defaultTo('');
		t.text('programme'); // e.g. a housing programme the dwelling belongs to
		t.text('client_name');
		t.text('client_email');
		t.uuid('assessor_id').references('users.id');
		t.text('stage').notNullable().defaultTo('design'); // design | as-built
		t.text('status').notNullable().defaultTo('draft'); // draft | issued | awaiting-review | accepted | returned | archived
		t.uuid('limit_table_id').references('limit_tables.id');
		t.uuid('climate_id').references('climates.id');
		t.integer('version').notNullable().defaultTo(1);
		stamps(t);
		t.unique(['organisation_id', 'reference']);
		t.index(['organisation_id', 'status']);
	});
	await knex.schema.createTable('elements', (t) => {
		id(t);
		org(t);
		t.uuid('dwelling_id').notNullable().references('dwellings.id').onDelete('CASCADE');
		t.integer('position').notNullable().defaultTo(0);
		t.text('name').notNullable();
		t.text('kind').notNullable(); // external-wall | party-wall | pitched-roof-ceiling | pitched-roof-rafters | flat-roof | ground-floor | exposed-floor | window | door
		t.double('area').notNullable(); // m²
		t.text('heat_flow').notNullable(); // upward | horizontal | downward
		t.jsonb('build_up'); // ElementInput layers, each may carry materialId/materialRevisionId
		t.double('given_u'); // windows and doors
		t.text('given_u_source');
		t.uuid('climate_id').references('climates.id');
		t.jsonb('internal'); // { temperature, relativeHumidity?, humidityClass? }
		t.jsonb('last_result');
		t.text('engine_version');
		t.integer('version').notNullable().defaultTo(1);
		stamps(t);
		t.index(['dwelling_id', 'position']);
	});
	await knex.schema.createTable('templates', (t) => {
		id(t);
		org(t);
		t.text('name').notNullable();
		t.text('kind').notNullable();
		t.text('description');
		t.jsonb('build_up').notNullable();
		t.uuid('created_by').references('users.id');
		stamps(t);
		t.unique(['organisation_id', 'name']);
	});

	// ---- Reports and mail ----
	await knex.schema.createTable('reports', (t) => {
		id(t);
		org(t);
		t.text('number').notNullable(); // report number shown on every page
		t.integer('revision').notNullable().defaultTo(1);
		t.text('scope').notNullable(); // element | dwelling
		t.uuid('dwelling_id').notNullable().references('dwellings.id');
		t.uuid('element_id').references('elements.id');
		t.uuid('supersedes_id').references('reports.id');
		t.jsonb('snapshot').notNullable(); // all inputs, results, material revisions, limit table
		t.text('engine_version').notNullable();
		t.text('verification_code').notNullable().unique();
		t.text('sha256').notNullable();
		t.binary('pdf').notNullable();
		t.uuid('issued_by').notNullable().references('users.id');
		t.timestamp('issued_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.unique(['organisation_id', 'number', 'revision']);
	});
	// Issued reports are immutable; "superseded" is derived from a newer revision's supersedes_id.
	await knex.raw(`
		CREATE TRIGGER reports_immutable BEFORE UPDATE OR DELETE ON reports
			FOR EACH ROW EXECUTE FUNCTION refuse_change();
		CREATE TRIGGER reports_no_truncate BEFORE TRUNCATE ON reports
			FOR EACH STATEMENT EXECUTE FUNCTION refuse_change();
	`);
	await knex.schema.createTable('mail_outbox', (t) => {
		id(t);
		t.uuid('organisation_id').references('organisations.id').onDelete('CASCADE');
		t.uuid('dwelling_id').references('dwellings.id').onDelete('SET NULL');
		t.uuid('report_id').references('reports.id');
		t.text('purpose').notNullable(); // report | invitation | audit-return | ...
		t.text('to_address').notNullable();
		t.text('subject').notNullable();
		t.text('body_text').notNullable();
		t.text('body_html');
		t.jsonb('attachments').notNullable().defaultTo('[]'); // [{ filename, reportId }]
		t.text('status').notNullable().defaultTo('queued'); // queued | sent | failed
		t.integer('attempts').notNullable().defaultTo(0);
		t.text('last_error');
		t.timestamp('next_attempt_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.timestamp('sent_at', { useTz: true });
		t.uuid('created_by').references('users.id');
		t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
		t.index(['status', 'next_attempt_at']);
	});

	// ---- Audit ----
	await knex.schema.createTable('audit_batches', (t) => {
		id(t);
		org(t);
		t.text('name').notNullable();
		t.jsonb('filter').notNullable().defaultTo('{}');
		t.jsonb('sampling').notNullable(); // { rule: 'all' | 'random', percent?, minimumPerAssessor?, includeFlagged }
		t.text('seed').notNullable();
		t.text('status').notNullable().defaultTo('open'); // open | closed
		t.jsonb('progress').notNullable().defaultTo('{}'); // { done, total, state, startedAt, finishedAt }
		t.uuid('created_by').notNullable().references('users.id');
		stamps(t);
	});
	await knex.schema.createTable('audit_items', (t) => {
		id(t);
		org(t);
		t.uuid('batch_id').notNullable().references('audit_batches.id').onDelete('CASCADE');
		t.uuid('dwelling_id').notNullable().references('dwellings.id');
		t.text('picked_because').notNullable();
		t.jsonb('flags').notNullable().defaultTo('[]'); // [{ code, severity, reason, elementId? }]
		t.jsonb('recompute'); // per element: with used revisions and with current revisions
		t.timestamp('recomputed_at', { useTz: true });
		t.text('decision'); // accepted | accepted-with-advice | returned
		t.text('comment');
		t.uuid('decided_by').references('users.id');
		t.timestamp('decided_at', { useTz: true });
		t.integer('resubmissions').notNullable().defaultTo(0);
		stamps(t);
		t.unique(['batch_id', 'dwelling_id']);
	});
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	for (const table of ['audit_items', 'audit_batches', 'mail_outbox']) {
		await knex.schema.dropTable(table);
	}
	await knex.raw(
		'DROP TRIGGER IF EXISTS reports_immutable ON reports; DROP TRIGGER IF EXISTS reports_no_truncate ON reports'
	);
	for (const table of [
		'reports',
		'templates',
		'elements',
		'dwellings',
		'limit_tables',
		'climates',
		'import_mappings'
	]) {
		await knex.schema.dropTable(table);
	}
	await knex.raw('ALTER TABLE materials DROP CONSTRAINT materials_current_revision_fk');
	await knex.schema.dropTable('material_revisions');
	await knex.schema.dropTable('materials');
}
