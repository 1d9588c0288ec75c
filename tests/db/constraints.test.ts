// The database's own checks on the domain tables (migration 20261202002000_domain-constraints): every
// enumerated column accepts exactly the values the code has and refuses others, areas and material
// thicknesses are positive numbers, and a row that points at a parent of another organisation is refused.
// The sets are the code's own (src/lib/dwellings/kinds.ts, src/lib/library/schema.ts …); the rules are
// the product's (common practice, no source). Rows are inserted directly, as the factories do.
import { describe, it, expect, beforeAll } from 'vitest';
import { randomBytes, randomUUID } from 'node:crypto';
import { hasDatabase, makeOrganisation, makeMember, tdb } from '../factories';
import { makeClimate, makeDwelling, makeElement, makeLimitTable, makeMaterial } from '../factories-audit';
import {
	DEFAULT_HEAT_FLOW,
	DWELLING_STATUSES,
	ELEMENT_KINDS,
	GIVEN_U_KINDS
} from '../../src/lib/dwellings/kinds';
import { MATERIAL_CATEGORIES } from '../../src/lib/library/categories';
import { LAMBDA_KINDS } from '../../src/lib/library/schema';

const CHECK_VIOLATION = '23514';
const FOREIGN_KEY_VIOLATION = '23503';

/** The insert (or transaction) fails on this constraint. */
async function refusedBy(write: Promise<unknown>, constraint: string, code = CHECK_VIOLATION) {
	await expect(write).rejects.toMatchObject({ code, constraint });
}

const hex = () => randomBytes(4).toString('hex');
const STAGES = ['design', 'as-built']; // src/lib/dwellings/schema.ts STAGES
const HEAT_FLOWS = [...new Set(Object.values(DEFAULT_HEAT_FLOW))];
const TEMPLATE_KINDS = ELEMENT_KINDS.filter((k) => !GIVEN_U_KINDS.includes(k));

type Org = {
	id: string;
	userId: string;
	climateId: string;
	limitTableId: string;
	dwellingId: string;
	elementId: string;
	reportId: string;
	batchId: string;
	material: { materialId: string; revisionId: string };
};

async function makeWorld(): Promise<Org> {
	const org = await makeOrganisation();
	const member = await makeMember(org.id, 'assessor');
	const climateId = await makeClimate(org.id);
	const limitTableId = await makeLimitTable(org.id, { 'external-wall': 0.3 });
	const dwelling = await makeDwelling(org.id, member.id, { climateId });
	const elementId = await makeElement(org.id, dwelling.id, { layers: [] });
	const reportId = await insertReport(org.id, dwelling.id, member.id);
	const batchId = await insertBatch(org.id, member.id);
	const material = await makeMaterial(org.id);
	return {
		id: org.id,
		userId: member.id,
		climateId,
		limitTableId,
		dwellingId: dwelling.id,
		elementId,
		reportId,
		batchId,
		material
	};
}

const dwellingRow = (organisationId: string, over: Record<string, unknown> = {}) => ({
	organisation_id: organisationId,
	reference: `C-${hex()}`,
	address: '1 Check Row',
	...over
});

const elementRow = (organisationId: string, dwellingId: string, over: Record<string, unknown> = {}) => ({
	organisation_id: organisationId,
	dwelling_id: dwellingId,
	name: 'Check wall',
	kind: 'external-wall',
	area: 10,
	heat_flow: 'horizontal',
	build_up: JSON.stringify({ layers: [] }),
	...over
});

function reportRow(
	organisationId: string,
	dwellingId: string,
	issuedBy: string,
	over: Record<string, unknown> = {}
) {
	return {
		organisation_id: organisationId,
		number: `R-${hex()}`,
		revision: 1,
		scope: 'dwelling',
		dwelling_id: dwellingId,
		snapshot: JSON.stringify({ invented: 'for a constraint test' }),
		engine_version: 'test',
		verification_code: randomBytes(8).toString('hex'),
		sha256: '0'.repeat(64),
		pdf: Buffer.from('%PDF-1.4 test'),
		issued_by: issuedBy,
		...over
	};
}

async function insertReport(organisationId: string, dwellingId: string, issuedBy: string) {
	const [row] = await tdb()('reports')
		.insert(reportRow(organisationId, dwellingId, issuedBy))
		.returning('id');
	return row.id as string;
}

const batchRow = (organisationId: string, createdBy: string) => ({
	organisation_id: organisationId,
	name: `Batch ${hex()}`,
	sampling: JSON.stringify({ rule: 'all', includeFlagged: false }),
	seed: hex(),
	created_by: createdBy
});

async function insertBatch(organisationId: string, createdBy: string) {
	const [row] = await tdb()('audit_batches').insert(batchRow(organisationId, createdBy)).returning('id');
	return row.id as string;
}

const outboxRow = (organisationId: string, over: Record<string, unknown> = {}) => ({
	organisation_id: organisationId,
	purpose: 'report',
	to_address: 'client@example.test',
	subject: 'Check',
	body_text: 'Check',
	...over
});

const templateRow = (organisationId: string, over: Record<string, unknown> = {}) => ({
	organisation_id: organisationId,
	name: `Template ${hex()}`,
	kind: 'external-wall',
	build_up: JSON.stringify({ layers: [] }),
	...over
});

let revisionNumber = 100;
const revisionRow = (org: Org, over: Record<string, unknown> = {}) => ({
	organisation_id: org.id,
	material_id: org.material.materialId,
	revision: revisionNumber++,
	name: 'Check board',
	category: 'insulation',
	lambda: 0.035,
	lambda_kind: 'declared',
	status: 'unverified',
	source: 'invented for a constraint test',
	...over
});

const mappingRow = (organisationId: string, over: Record<string, unknown> = {}) => ({
	organisation_id: organisationId,
	kind: 'materials',
	header_signature: `h-${hex()}`,
	mapping: JSON.stringify({}),
	...over
});

describe.skipIf(!hasDatabase)('domain constraints', () => {
	let a: Org;
	let b: Org;
	beforeAll(async () => {
		[a, b] = await Promise.all([makeWorld(), makeWorld()]);
	});

	describe('enumerated columns take exactly the values the code has', () => {
		it('dwellings: stage and status', async () => {
			for (const stage of STAGES) await tdb()('dwellings').insert(dwellingRow(a.id, { stage }));
			for (const status of DWELLING_STATUSES) await tdb()('dwellings').insert(dwellingRow(a.id, { status }));
			for (const stage of ['built', 'Design', '']) {
				await refusedBy(tdb()('dwellings').insert(dwellingRow(a.id, { stage })), 'dwellings_stage_check');
			}
			for (const status of ['deleted', 'Draft', 'awaiting_review']) {
				await refusedBy(tdb()('dwellings').insert(dwellingRow(a.id, { status })), 'dwellings_status_check');
			}
		});

		it('elements: kind and heat-flow direction', async () => {
			const t = tdb()('elements');
			for (const kind of ELEMENT_KINDS) await t.clone().insert(elementRow(a.id, a.dwellingId, { kind }));
			for (const heat_flow of HEAT_FLOWS) {
				await t.clone().insert(elementRow(a.id, a.dwellingId, { heat_flow }));
			}
			expect(HEAT_FLOWS.sort()).toEqual(['downward', 'horizontal', 'upward']);
			await refusedBy(
				t.clone().insert(elementRow(a.id, a.dwellingId, { kind: 'roof' })),
				'elements_kind_check'
			);
			await refusedBy(
				t.clone().insert(elementRow(a.id, a.dwellingId, { heat_flow: 'sideways' })),
				'elements_heat_flow_check'
			);
		});

		it('templates: element kinds with a build-up, so no window or door', async () => {
			for (const kind of TEMPLATE_KINDS) await tdb()('templates').insert(templateRow(a.id, { kind }));
			for (const kind of ['window', 'door', 'roof']) {
				await refusedBy(tdb()('templates').insert(templateRow(a.id, { kind })), 'templates_kind_check');
			}
		});

		it('material revisions: category and kind of λ (none when a fixed R is given)', async () => {
			const t = tdb()('material_revisions');
			for (const category of MATERIAL_CATEGORIES) await t.clone().insert(revisionRow(a, { category }));
			for (const lambda_kind of LAMBDA_KINDS) await t.clone().insert(revisionRow(a, { lambda_kind }));
			await t.clone().insert(revisionRow(a, { lambda: null, lambda_kind: null, resistance: 0.18 }));
			await refusedBy(
				t.clone().insert(revisionRow(a, { category: 'metals' })),
				'material_revisions_category_check'
			);
			await refusedBy(
				t.clone().insert(revisionRow(a, { lambda_kind: 'measured' })),
				'material_revisions_lambda_kind_check'
			);
		});

		it('mail outbox: purpose', async () => {
			for (const purpose of ['report', 'audit-return']) {
				await tdb()('mail_outbox').insert(outboxRow(a.id, { purpose }));
			}
			await refusedBy(
				tdb()('mail_outbox').insert(outboxRow(a.id, { purpose: 'newsletter' })),
				'mail_outbox_purpose_check'
			);
		});

		it('import mappings: kind', async () => {
			await tdb()('import_mappings').insert(mappingRow(a.id));
			await refusedBy(
				tdb()('import_mappings').insert(mappingRow(a.id, { kind: 'climates' })),
				'import_mappings_kind_check'
			);
		});
	});

	describe('areas and material thicknesses are positive numbers', () => {
		it('an element area must be greater than 0 m² and finite', async () => {
			await tdb()('elements').insert(elementRow(a.id, a.dwellingId, { area: 0.01 }));
			for (const area of [0, -5, Number.NaN, Number.POSITIVE_INFINITY]) {
				await refusedBy(
					tdb()('elements').insert(elementRow(a.id, a.dwellingId, { area })),
					'elements_area_check'
				);
			}
		});

		it('a thickness range starts at 0 mm or more, ends above 0 mm and not below its start', async () => {
			const t = tdb()('material_revisions');
			await t.clone().insert(revisionRow(a, { thickness_min_mm: 0, thickness_max_mm: 300 }));
			await t.clone().insert(revisionRow(a, { thickness_min_mm: 100, thickness_max_mm: 100 }));
			await t.clone().insert(revisionRow(a, { thickness_min_mm: null, thickness_max_mm: null }));
			await refusedBy(
				t.clone().insert(revisionRow(a, { thickness_min_mm: -1 })),
				'material_revisions_thickness_min_mm_check'
			);
			for (const thickness_max_mm of [0, -10, Number.NaN]) {
				await refusedBy(
					t.clone().insert(revisionRow(a, { thickness_max_mm })),
					'material_revisions_thickness_max_mm_check'
				);
			}
			await refusedBy(
				t.clone().insert(revisionRow(a, { thickness_min_mm: 50, thickness_max_mm: 20 })),
				'material_revisions_thickness_range_check'
			);
		});
	});

	describe('a row never points at a parent of another organisation', () => {
		it('elements → dwellings and → climates', async () => {
			await tdb()('elements').insert(elementRow(a.id, a.dwellingId, { climate_id: a.climateId }));
			await refusedBy(
				tdb()('elements').insert(elementRow(a.id, b.dwellingId)),
				'elements_dwelling_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(
				tdb()('elements').insert(elementRow(a.id, a.dwellingId, { climate_id: b.climateId })),
				'elements_climate_foreign',
				FOREIGN_KEY_VIOLATION
			);
		});

		it('dwellings → climates and → limit tables', async () => {
			await tdb()('dwellings').insert(
				dwellingRow(a.id, { climate_id: a.climateId, limit_table_id: a.limitTableId })
			);
			await refusedBy(
				tdb()('dwellings').insert(dwellingRow(a.id, { climate_id: b.climateId })),
				'dwellings_climate_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(
				tdb()('dwellings').insert(dwellingRow(a.id, { limit_table_id: b.limitTableId })),
				'dwellings_limit_table_foreign',
				FOREIGN_KEY_VIOLATION
			);
			// Moving a row's reference later is held to the same rule.
			await refusedBy(
				tdb()('dwellings').where({ id: a.dwellingId }).update({ climate_id: b.climateId }),
				'dwellings_climate_foreign',
				FOREIGN_KEY_VIOLATION
			);
		});

		it('reports → dwellings, → elements and → the report they supersede', async () => {
			const r = (over: Record<string, unknown>) =>
				tdb()('reports').insert(reportRow(a.id, a.dwellingId, a.userId, over));
			await r({ scope: 'element', element_id: a.elementId, supersedes_id: a.reportId });
			await refusedBy(
				tdb()('reports').insert(reportRow(a.id, b.dwellingId, a.userId)),
				'reports_dwelling_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(
				r({ scope: 'element', element_id: b.elementId }),
				'reports_element_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(r({ supersedes_id: b.reportId }), 'reports_supersedes_foreign', FOREIGN_KEY_VIOLATION);
		});

		it('mail outbox → dwellings and → reports', async () => {
			await tdb()('mail_outbox').insert(
				outboxRow(a.id, { dwelling_id: a.dwellingId, report_id: a.reportId })
			);
			await refusedBy(
				tdb()('mail_outbox').insert(outboxRow(a.id, { dwelling_id: b.dwellingId })),
				'mail_outbox_dwelling_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(
				tdb()('mail_outbox').insert(outboxRow(a.id, { report_id: b.reportId })),
				'mail_outbox_report_foreign',
				FOREIGN_KEY_VIOLATION
			);
		});

		it('audit items → batches and → dwellings', async () => {
			const item = (batchId: string, dwellingId: string) => ({
				organisation_id: a.id,
				batch_id: batchId,
				dwelling_id: dwellingId,
				picked_because: 'constraint test'
			});
			await tdb()('audit_items').insert(item(a.batchId, a.dwellingId));
			await refusedBy(
				tdb()('audit_items').insert(item(b.batchId, a.dwellingId)),
				'audit_items_batch_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await refusedBy(
				tdb()('audit_items').insert(item(a.batchId, b.dwellingId)),
				'audit_items_dwelling_foreign',
				FOREIGN_KEY_VIOLATION
			);
		});

		it('a material → its current revision (checked at commit)', async () => {
			const write = (revisionId: string) =>
				tdb().transaction(async (trx) => {
					await trx('materials').insert({ id: randomUUID(), organisation_id: a.id, code: `C-${hex()}` });
					await trx('materials')
						.where({ organisation_id: a.id, id: a.material.materialId })
						.update({ current_revision_id: revisionId });
				});
			await write(a.material.revisionId);
			await refusedBy(
				write(b.material.revisionId),
				'materials_current_revision_foreign',
				FOREIGN_KEY_VIOLATION
			);
			expect(
				(await tdb()('materials').where({ id: a.material.materialId }).first()).current_revision_id
			).toBe(a.material.revisionId);
		});
	});

	describe('deleting keeps the rules it had', () => {
		it('a deleted dwelling takes its elements; its mail keeps the organisation and loses the dwelling', async () => {
			const [d] = await tdb()('dwellings').insert(dwellingRow(a.id)).returning('id');
			const [e] = await tdb()('elements').insert(elementRow(a.id, d.id)).returning('id');
			const [m] = await tdb()('mail_outbox')
				.insert(outboxRow(a.id, { dwelling_id: d.id }))
				.returning('id');
			await tdb()('dwellings').where({ id: d.id }).delete();
			expect(await tdb()('elements').where({ id: e.id }).first()).toBeUndefined();
			expect(await tdb()('mail_outbox').where({ id: m.id }).first()).toMatchObject({
				organisation_id: a.id,
				dwelling_id: null
			});
		});

		it('a deleted batch takes its items; a climate or dwelling still in use cannot be deleted', async () => {
			const batchId = await insertBatch(a.id, a.userId);
			const climateId = await makeClimate(a.id);
			const [d] = await tdb()('dwellings')
				.insert(dwellingRow(a.id, { climate_id: climateId }))
				.returning('id');
			await tdb()('audit_items').insert({
				organisation_id: a.id,
				batch_id: batchId,
				dwelling_id: d.id,
				picked_because: 'constraint test'
			});
			await refusedBy(
				tdb()('dwellings').where({ id: d.id }).delete(),
				'audit_items_dwelling_foreign',
				FOREIGN_KEY_VIOLATION
			);
			await tdb()('audit_batches').where({ id: batchId }).delete();
			expect(await tdb()('audit_items').where({ batch_id: batchId }).first()).toBeUndefined();
			await refusedBy(
				tdb()('climates').where({ id: climateId }).delete(),
				'dwellings_climate_foreign',
				FOREIGN_KEY_VIOLATION
			);
		});
	});

	it('every constraint of the migration is in place', async () => {
		const names = [
			'dwellings_stage_check',
			'dwellings_status_check',
			'elements_kind_check',
			'elements_heat_flow_check',
			'elements_area_check',
			'templates_kind_check',
			'material_revisions_category_check',
			'material_revisions_lambda_kind_check',
			'material_revisions_thickness_min_mm_check',
			'material_revisions_thickness_max_mm_check',
			'material_revisions_thickness_range_check',
			'mail_outbox_purpose_check',
			'import_mappings_kind_check',
			'elements_dwelling_foreign',
			'elements_climate_foreign',
			'dwellings_climate_foreign',
			'dwellings_limit_table_foreign',
			'reports_dwelling_foreign',
			'reports_element_foreign',
			'reports_supersedes_foreign',
			'mail_outbox_dwelling_foreign',
			'mail_outbox_report_foreign',
			'audit_items_batch_foreign',
			'audit_items_dwelling_foreign',
			'materials_current_revision_foreign'
		];
		const rows = await tdb()('pg_constraint')
			.whereIn('conname', names)
			.select('conname', tdb().raw('pg_get_constraintdef(oid) as def'));
		expect(rows.map((r) => r.conname).sort()).toEqual([...names].sort());
		// Every new key carries the organisation; none of the single-column keys it replaced is left.
		for (const r of rows.filter((r) => r.conname.endsWith('_foreign'))) {
			expect(r.def).toMatch(/^FOREIGN KEY \(organisation_id, \w+\) REFERENCES \w+\(organisation_id, id\)/);
		}
		const old = await tdb()('pg_constraint')
			.whereIn('conname', [
				'elements_dwelling_id_foreign',
				'reports_element_id_foreign',
				'materials_current_revision_fk'
			])
			.select('conname');
		expect(old).toEqual([]);
	});
});
