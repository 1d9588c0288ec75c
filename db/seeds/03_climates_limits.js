// Climates, a limit table and templates for both demo organisations. Everything here is INVENTED for the
// Envelo demo: the climates describe no real place, the limit table is no published standard, and the
// layer values are generic figures (common practice, no source) to be checked against product data.
// Idempotent: rows that exist (by name) are kept as they are. Library links are made by material code
// from seed 02 when that material exists; otherwise the layer keeps its own values without a link.

const ORGS = [
	{ id: '00000000-0000-4000-8000-000000000001', adminId: '00000000-0000-4000-8000-000000000101' },
	{ id: '00000000-0000-4000-8000-000000000002', adminId: '00000000-0000-4000-8000-000000000201' }
];

const INVENTED = 'Invented for the Envelo demo — not measured at any place. Illustrative, not for design.';

/** [temperature °C, relative humidity %] for January … December. */
export const DEMO_CLIMATES = [
	{
		name: 'Demo coastal town (invented)',
		months: [
			[5.0, 87],
			[5.2, 85],
			[6.8, 83],
			[8.9, 80],
			[11.8, 79],
			[14.5, 80],
			[16.4, 81],
			[16.4, 82],
			[14.6, 83],
			[11.8, 85],
			[8.3, 87],
			[6.0, 88]
		]
	},
	{
		name: 'Demo upland village (invented)',
		months: [
			[-0.5, 92],
			[0.0, 90],
			[2.2, 86],
			[4.8, 81],
			[8.3, 78],
			[11.2, 79],
			[13.0, 81],
			[12.8, 83],
			[10.4, 86],
			[7.0, 89],
			[3.3, 91],
			[0.8, 92]
		]
	},
	{
		name: 'Demo inland city (invented)',
		months: [
			[1.5, 86],
			[2.3, 82],
			[5.3, 76],
			[8.6, 70],
			[12.9, 69],
			[16.2, 69],
			[18.4, 68],
			[18.0, 71],
			[14.8, 76],
			[10.6, 82],
			[5.7, 86],
			[2.6, 87]
		]
	}
];

export const DEMO_LIMIT_TABLE = {
	name: 'Demo scheme fabric limits',
	edition: 'Demo 2026',
	dated: '2026-01-01',
	source:
		'Invented for the Envelo demo; not a published standard. Check against the edition in force of the rules where you work.',
	limits: {
		'external-wall': 0.3,
		'party-wall': 0.2,
		'pitched-roof-ceiling': 0.16,
		'pitched-roof-rafters': 0.18,
		'flat-roof': 0.18,
		'ground-floor': 0.25,
		'exposed-floor': 0.22,
		window: 1.6,
		door: 1.8
	}
};

const GENERIC =
	'Generic, indicative layer values as in the demo library (common practice, no source); check them against the products used.';

/** Layers inside → outside; `code` is the demo library's material code tried for a link. */
export const DEMO_TEMPLATES = [
	{
		name: 'Masonry cavity wall, full-fill mineral wool',
		kind: 'external-wall',
		description: `Plaster on aerated concrete inner leaf, 100 mm full-fill mineral-wool cavity batts, clay-brick outer leaf. ${GENERIC}`,
		layers: [
			{ code: 'G-PLA-GYP-1000', name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
			{
				code: 'G-MAS-AAC-500',
				name: 'Aerated concrete block inner leaf',
				thicknessMm: 100,
				lambda: 0.14,
				mu: 10
			},
			{ code: 'G-INS-GLW-035', name: 'Mineral wool cavity batt', thicknessMm: 100, lambda: 0.035, mu: 1 },
			{ code: 'G-MAS-BRICK-1800', name: 'Clay brick outer leaf', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
		]
	},
	{
		name: 'Timber-frame wall, brick cladding',
		kind: 'external-wall',
		description: `Plasterboard, vapour control layer, 140 mm studs filled with mineral wool (15 % timber fraction with noggings), OSB sheathing, 40 mm wood-fibre board, breather membrane, ventilated cavity and brick cladding. ${GENERIC}`,
		layers: [
			{ code: 'G-PLA-GYPBD-700', name: 'Gypsum plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
			{ code: 'G-MEM-VCL-PE', name: 'Vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
			{
				code: 'G-INS-GLW-035',
				name: 'Mineral wool between timber studs',
				thicknessMm: 140,
				lambda: 0.035,
				mu: 1,
				bridge: { lambda: 0.13, fraction: 0.15, mu: 50, name: 'Softwood studs and noggings' }
			},
			{ code: 'G-TIM-OSB-650', name: 'OSB sheathing', thicknessMm: 9, lambda: 0.13, mu: 50 },
			{ code: 'G-INS-WF-040', name: 'Wood-fibre sheathing board', thicknessMm: 40, lambda: 0.04, mu: 5 },
			{ code: 'G-MEM-BREATH', name: 'Breather membrane', thicknessMm: 0.5, resistance: 0, sd: 0.02 },
			{ code: null, name: 'Ventilated cavity', thicknessMm: 50, air: 'well-ventilated', sd: 0 },
			{ code: 'G-MAS-BRICK-1800', name: 'Clay brick cladding', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
		]
	},
	{
		name: 'Loft insulated at ceiling, 250 mm mineral wool',
		kind: 'pitched-roof-ceiling',
		description: `Plasterboard ceiling, 100 mm mineral wool between 47 mm joists at 600 mm centres, 150 mm across the joists, ventilated roof space above. ${GENERIC}`,
		layers: [
			{ code: 'G-PLA-GYPBD-700', name: 'Gypsum plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
			{
				code: 'G-INS-GLW-035',
				name: 'Mineral wool between joists',
				thicknessMm: 100,
				lambda: 0.035,
				mu: 1,
				bridge: { lambda: 0.13, fraction: 47 / 600, mu: 50, name: 'Softwood ceiling joists' },
				bridgeGeometry: { widthMm: 47, centresMm: 600 }
			},
			{ code: 'G-INS-GLW-035', name: 'Mineral wool across joists', thicknessMm: 150, lambda: 0.035, mu: 1 },
			{ code: null, name: 'Ventilated roof space', thicknessMm: 300, air: 'well-ventilated', sd: 0 }
		]
	}
];

/** @param {import('knex').Knex} knex */
export async function seed(knex) {
	await knex.transaction(async (trx) => {
		for (const org of ORGS) {
			const present = await trx('organisations').where({ id: org.id }).first('id');
			if (!present) continue;

			for (const c of DEMO_CLIMATES) {
				await trx('climates')
					.insert({
						organisation_id: org.id,
						name: c.name,
						source: INVENTED,
						illustrative: true,
						months: JSON.stringify(
							c.months.map(([temperature, relativeHumidity], i) => ({
								month: i + 1,
								temperature,
								relativeHumidity
							}))
						)
					})
					.onConflict(['organisation_id', 'name'])
					.ignore();
			}

			const hasDefault = await trx('limit_tables')
				.where({ organisation_id: org.id, is_default: true })
				.first('id');
			await trx('limit_tables')
				.insert({
					organisation_id: org.id,
					name: DEMO_LIMIT_TABLE.name,
					edition: DEMO_LIMIT_TABLE.edition,
					dated: DEMO_LIMIT_TABLE.dated,
					source: DEMO_LIMIT_TABLE.source,
					is_default: !hasDefault,
					limits: JSON.stringify(DEMO_LIMIT_TABLE.limits)
				})
				.onConflict(['organisation_id', 'name', 'edition'])
				.ignore();

			for (const t of DEMO_TEMPLATES) {
				const layers = [];
				for (const { code, ...layer } of t.layers) {
					layers.push(await linkToLibrary(trx, org.id, code, layer));
				}
				await trx('templates')
					.insert({
						organisation_id: org.id,
						name: t.name,
						kind: t.kind,
						description: t.description,
						build_up: JSON.stringify({ layers }),
						created_by: org.adminId
					})
					.onConflict(['organisation_id', 'name'])
					.ignore();
			}
		}
	});
}

/**
 * The layer linked to the library material with this code, with the revision's values copied in (so the
 * build-up alone reproduces the result); the layer as given when there is no such material.
 * @param {import('knex').Knex.Transaction} trx
 * @param {string} organisationId
 * @param {string | null} code
 * @param {Record<string, unknown>} layer
 */
async function linkToLibrary(trx, organisationId, code, layer) {
	if (!code) return layer;
	const hasLibrary = await trx.schema.hasTable('materials');
	if (!hasLibrary) return layer;
	const m = await trx('materials as m')
		.join('material_revisions as r', 'r.id', 'm.current_revision_id')
		.where({ 'm.organisation_id': organisationId, 'm.code': code })
		.first(
			'm.id as material_id',
			'r.id as revision_id',
			'r.lambda',
			'r.resistance',
			'r.mu_dry',
			'r.mu_wet',
			'r.sd'
		);
	if (!m) return layer;
	/** @type {Record<string, unknown>} */
	const linked = {
		...layer,
		materialId: m.material_id,
		materialRevisionId: m.revision_id,
		materialCode: code
	};
	// Copy the library's values only when they fit the layer's kind of description (λ for a material, R
	// for a thin membrane); a layer the library cannot describe keeps its own values.
	if (layer.lambda !== undefined && m.lambda != null) linked.lambda = m.lambda;
	if (layer.resistance !== undefined && m.resistance != null) linked.resistance = m.resistance;
	if (layer.mu !== undefined && (m.mu_dry ?? m.mu_wet) != null) linked.mu = m.mu_dry ?? m.mu_wet;
	if (layer.sd !== undefined && m.sd != null) linked.sd = m.sd;
	return linked;
}
