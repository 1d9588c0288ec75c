/**
 * The database states what the code assumes.
 *
 * 1. CHECK constraints for every enumerated text column that had none: the same sets as the shared
 *    vocabularies in src/lib (element kinds, heat-flow directions, dwelling stages and statuses, material
 *    categories, λ kinds, template kinds, mail purposes, import-mapping kinds), and for areas and material
 *    thicknesses. `x > 0 AND x < 'Infinity'` also refuses NaN and ±Infinity, which double precision
 *    accepts and which sort above every number in PostgreSQL.
 * 2. Foreign keys that carry the organisation: a row that points at a parent (or at a climate, limit
 *    table, report or material revision) does so by (organisation_id, parent_id) against the parent's
 *    (organisation_id, id), so PostgreSQL refuses a reference across organisations. Each replaces the
 *    single-column key it repeats, with the same ON DELETE rule; the keys to organisations stay as they
 *    are, so deleting an organisation cascades exactly as before.
 *
 * When a vocabulary in the code grows, this is where the database learns it: a new migration that drops
 * and re-adds the constraint with the new set.
 */

/**
 * Values as the code writes them today (src/lib/dwellings/kinds.ts, library/schema.ts, …), copied rather
 * than imported so that this migration keeps meaning what it meant when the code moves on.
 */
const ELEMENT_KINDS = [
	'external-wall',
	'party-wall',
	'pitched-roof-ceiling',
	'pitched-roof-rafters',
	'flat-roof',
	'ground-floor',
	'exposed-floor',
	'window',
	'door'
];
/** Templates hold a build-up, so windows and doors (given U) are not template kinds. */
const TEMPLATE_KINDS = ELEMENT_KINDS.filter((k) => k !== 'window' && k !== 'door');
const HEAT_FLOWS = ['upward', 'horizontal', 'downward'];
const STAGES = ['design', 'as-built'];
const DWELLING_STATUSES = ['draft', 'issued', 'awaiting-review', 'accepted', 'returned', 'archived'];
const MATERIAL_CATEGORIES = [
	'masonry',
	'concrete',
	'timber-boards',
	'insulation',
	'membranes',
	'plasters-linings',
	'air-layers',
	'other'
];
const LAMBDA_KINDS = ['declared', 'design', 'table'];
/** The outbox carries issued reports and audit returns; invitations and sign-in mail go out directly. */
const MAIL_PURPOSES = ['report', 'audit-return'];
/** Only the material import remembers a column mapping today. */
const IMPORT_MAPPING_KINDS = ['materials'];

const list = (/** @type {string[]} */ values) => values.map((v) => `'${v}'`).join(', ');
const finitePositive = (/** @type {string} */ c) => `${c} > 0 AND ${c} < 'Infinity'::double precision`;

/** [table, constraint, expression] */
const CHECKS = [
	['dwellings', 'dwellings_stage_check', `stage IN (${list(STAGES)})`],
	['dwellings', 'dwellings_status_check', `status IN (${list(DWELLING_STATUSES)})`],
	['elements', 'elements_kind_check', `kind IN (${list(ELEMENT_KINDS)})`],
	['elements', 'elements_heat_flow_check', `heat_flow IN (${list(HEAT_FLOWS)})`],
	['elements', 'elements_area_check', finitePositive('area')],
	['templates', 'templates_kind_check', `kind IN (${list(TEMPLATE_KINDS)})`],
	['material_revisions', 'material_revisions_category_check', `category IN (${list(MATERIAL_CATEGORIES)})`],
	[
		'material_revisions',
		'material_revisions_lambda_kind_check',
		`lambda_kind IS NULL OR lambda_kind IN (${list(LAMBDA_KINDS)})`
	],
	[
		'material_revisions',
		'material_revisions_thickness_min_mm_check',
		`thickness_min_mm IS NULL OR (thickness_min_mm >= 0 AND thickness_min_mm < 'Infinity'::double precision)`
	],
	[
		'material_revisions',
		'material_revisions_thickness_max_mm_check',
		`thickness_max_mm IS NULL OR (${finitePositive('thickness_max_mm')})`
	],
	[
		'material_revisions',
		'material_revisions_thickness_range_check',
		'thickness_min_mm IS NULL OR thickness_max_mm IS NULL OR thickness_max_mm >= thickness_min_mm'
	],
	['mail_outbox', 'mail_outbox_purpose_check', `purpose IN (${list(MAIL_PURPOSES)})`],
	['import_mappings', 'import_mappings_kind_check', `kind IN (${list(IMPORT_MAPPING_KINDS)})`]
];

/** Parents that other rows reach by (organisation_id, id). materials has its own from an earlier migration. */
const PARENTS = [
	'dwellings',
	'elements',
	'reports',
	'audit_batches',
	'climates',
	'limit_tables',
	'material_revisions'
];

/**
 * [table, column, parent, ON DELETE of the key it replaces]. The new key is named
 * `<table>_<column without _id>_foreign`; the one it replaces is the single-column key Knex named
 * `<table>_<column>_foreign`, except the deferred key from materials to its current revision.
 * @type {[string, string, string, string][]}
 */
const KEYS = [
	['elements', 'dwelling_id', 'dwellings', 'CASCADE'],
	['elements', 'climate_id', 'climates', ''],
	['dwellings', 'climate_id', 'climates', ''],
	['dwellings', 'limit_table_id', 'limit_tables', ''],
	['reports', 'dwelling_id', 'dwellings', ''],
	['reports', 'element_id', 'elements', ''],
	['reports', 'supersedes_id', 'reports', ''],
	['mail_outbox', 'dwelling_id', 'dwellings', 'SET NULL'],
	['mail_outbox', 'report_id', 'reports', ''],
	['audit_items', 'batch_id', 'audit_batches', 'CASCADE'],
	['audit_items', 'dwelling_id', 'dwellings', ''],
	['materials', 'current_revision_id', 'material_revisions', '']
];
const DEFERRED = new Set(['materials_current_revision_foreign']);
const OLD_NAMES = /** @type {Record<string, string>} */ ({
	materials_current_revision_foreign: 'materials_current_revision_fk'
});

const keyName = (/** @type {string} */ table, /** @type {string} */ column) =>
	`${table}_${column.replace(/_id$/, '')}_foreign`;
const oldName = (/** @type {string} */ table, /** @type {string} */ column) =>
	OLD_NAMES[keyName(table, column)] ?? `${table}_${column}_foreign`;
const deferral = (/** @type {string} */ name) => (DEFERRED.has(name) ? ' DEFERRABLE INITIALLY DEFERRED' : '');

/** @param {import('knex').Knex} knex */
export async function up(knex) {
	for (const [table, name, expression] of CHECKS) {
		await knex.raw(`ALTER TABLE ${table} ADD CONSTRAINT ${name} CHECK (${expression})`);
	}
	for (const table of PARENTS) {
		await knex.raw(
			`ALTER TABLE ${table} ADD CONSTRAINT ${table}_organisation_id_id_unique UNIQUE (organisation_id, id)`
		);
	}
	for (const [table, column, parent, onDelete] of KEYS) {
		const name = keyName(table, column);
		// SET NULL names its column: the organisation of a row stays when its parent goes.
		const action =
			onDelete === 'SET NULL' ? ` ON DELETE SET NULL (${column})` : onDelete ? ` ON DELETE ${onDelete}` : '';
		await knex.raw(`
			ALTER TABLE ${table}
				DROP CONSTRAINT ${oldName(table, column)},
				ADD CONSTRAINT ${name} FOREIGN KEY (organisation_id, ${column})
					REFERENCES ${parent} (organisation_id, id)${action}${deferral(name)}
		`);
	}
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	for (const [table, column, parent, onDelete] of [...KEYS].reverse()) {
		const name = keyName(table, column);
		await knex.raw(`
			ALTER TABLE ${table}
				DROP CONSTRAINT ${name},
				ADD CONSTRAINT ${oldName(table, column)} FOREIGN KEY (${column})
					REFERENCES ${parent} (id)${onDelete ? ` ON DELETE ${onDelete}` : ''}${deferral(name)}
		`);
	}
	for (const table of [...PARENTS].reverse()) {
		await knex.raw(`ALTER TABLE ${table} DROP CONSTRAINT ${table}_organisation_id_id_unique`);
	}
	for (const [table, name] of [...CHECKS].reverse()) {
		await knex.raw(`ALTER TABLE ${table} DROP CONSTRAINT ${name}`);
	}
}
