// Factories for the report suites: dwellings, elements, climates, limit tables and library revisions
// inserted as rows, so the report module is tested on its own. Each call makes fresh rows.
import { randomUUID, randomBytes } from 'node:crypto';
import { tdb } from './factories';

export type Month = { month: number; temperature: number; relativeHumidity: number };

/**
 * Twelve monthly means of an invented temperate maritime climate, for tests and demos only (invented,
 * shaped like a mild coastal climate: coldest in January, 4–17 °C, 73–88 % RH).
 */
export const MILD_CLIMATE: Month[] = [
	[1, 4.5, 87],
	[2, 4.7, 85],
	[3, 6.5, 81],
	[4, 8.6, 76],
	[5, 11.8, 74],
	[6, 14.6, 73],
	[7, 16.6, 73],
	[8, 16.4, 76],
	[9, 14.1, 79],
	[10, 10.9, 84],
	[11, 7.2, 87],
	[12, 5.1, 88]
].map(([month, temperature, relativeHumidity]) => ({ month, temperature, relativeHumidity }));

/** A cold continental winter (invented): a long frost that drives condensation in a leaky build-up. */
export const COLD_CLIMATE: Month[] = [
	[1, -8, 88],
	[2, -6, 86],
	[3, -1, 80],
	[4, 6, 72],
	[5, 12, 68],
	[6, 16, 68],
	[7, 18, 70],
	[8, 17, 73],
	[9, 12, 78],
	[10, 6, 83],
	[11, 0, 87],
	[12, -5, 89]
].map(([month, temperature, relativeHumidity]) => ({ month, temperature, relativeHumidity }));

export async function makeClimate(organisationId: string, months: Month[] = MILD_CLIMATE, name?: string) {
	const id = randomUUID();
	await tdb()('climates').insert({
		id,
		organisation_id: organisationId,
		name: name ?? `Climate ${id.slice(0, 6)}`,
		source: 'Invented for tests',
		illustrative: true,
		months: JSON.stringify(months)
	});
	return id;
}

export async function makeLimitTable(
	organisationId: string,
	limits: Record<string, number> = { 'external-wall': 0.3, 'flat-roof': 0.2, window: 1.6, door: 1.8 },
	opts: { isDefault?: boolean; name?: string; edition?: string } = {}
) {
	const id = randomUUID();
	await tdb()('limit_tables').insert({
		id,
		organisation_id: organisationId,
		name: opts.name ?? `Limits ${id.slice(0, 6)}`,
		edition: opts.edition ?? '2026 test edition',
		dated: '2026-01-01',
		source: 'Invented for tests',
		is_default: opts.isDefault ?? true,
		limits: JSON.stringify(limits)
	});
	return id;
}

export async function makeMaterialRevision(
	organisationId: string,
	v: { name: string; lambda?: number; mu?: number; lambdaKind?: string; source?: string; revision?: number }
) {
	const materialId = randomUUID();
	const revisionId = randomUUID();
	const code = `M-${randomBytes(3).toString('hex')}`;
	await tdb().transaction(async (t) => {
		await t('materials').insert({ id: materialId, organisation_id: organisationId, code });
		await t('material_revisions').insert({
			id: revisionId,
			organisation_id: organisationId,
			material_id: materialId,
			revision: v.revision ?? 1,
			name: v.name,
			category: 'other',
			lambda: v.lambda ?? null,
			lambda_kind: v.lambdaKind ?? 'declared',
			mu_dry: v.mu ?? null,
			source: v.source ?? 'Invented for tests'
		});
		await t('materials').where({ id: materialId }).update({ current_revision_id: revisionId });
	});
	return { materialId, revisionId, code };
}

export async function makeDwelling(
	organisationId: string,
	opts: {
		assessorId?: string | null;
		climateId?: string | null;
		limitTableId?: string | null;
		clientEmail?: string | null;
		status?: string;
	} = {}
) {
	const id = randomUUID();
	const reference = `T-${randomBytes(3).toString('hex').toUpperCase()}`;
	await tdb()('dwellings').insert({
		id,
		organisation_id: organisationId,
		reference,
		address: '1 Test Lane, Testville',
		client_name: 'Test Client',
		client_email: opts.clientEmail ?? 'client@example.test',
		assessor_id: opts.assessorId ?? null,
		stage: 'design',
		status: opts.status ?? 'draft',
		climate_id: opts.climateId ?? null,
		limit_table_id: opts.limitTableId ?? null
	});
	return { id, reference };
}

/**
 * A masonry cavity wall with full-fill insulation: 15 mm plaster (λ 0.57), 100 mm dense block (λ 1.13),
 * 100 mm mineral wool (λ 0.035), 102.5 mm brick (λ 0.77); values typical of design tables
 * (from memory, illustrative), μ typical too. U ≈ 0.30 W/(m²·K).
 */
export function cavityWall(plasterRevision?: { materialId: string; revisionId: string; code: string }) {
	return {
		layers: [
			{
				name: 'Gypsum plaster',
				thicknessMm: 15,
				lambda: 0.57,
				mu: 10,
				...(plasterRevision
					? {
							materialId: plasterRevision.materialId,
							materialRevisionId: plasterRevision.revisionId,
							materialCode: plasterRevision.code
						}
					: {})
			},
			{ name: 'Dense concrete block', thicknessMm: 100, lambda: 1.13, mu: 15 },
			{ name: 'Mineral wool full fill', thicknessMm: 100, lambda: 0.035, mu: 1 },
			{ name: 'Brick outer leaf', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
		]
	};
}

/**
 * A timber-frame wall without a vapour control layer and with a vapour-tight sheathing outside:
 * condensation forms at the insulation/sheathing interface in a cold winter.
 */
export function leakyTimberWall() {
	return {
		layers: [
			{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
			{
				name: 'Mineral wool between studs',
				thicknessMm: 140,
				lambda: 0.04,
				mu: 1,
				bridge: { lambda: 0.13, fraction: 38 / 600, name: 'timber studs' },
				bridgeGeometry: { widthMm: 38, centresMm: 600 }
			},
			{ name: 'Vapour-tight sheathing', thicknessMm: 10, lambda: 0.2, sd: 50 },
			{ name: 'Render on board', thicknessMm: 20, lambda: 0.5, mu: 20 }
		]
	};
}

export async function makeElement(
	organisationId: string,
	dwellingId: string,
	opts: {
		name?: string;
		kind?: string;
		area?: number;
		heatFlow?: string;
		buildUp?: unknown;
		givenU?: number | null;
		givenUSource?: string | null;
		internal?: unknown;
		climateId?: string | null;
		position?: number;
	} = {}
) {
	const id = randomUUID();
	const given = opts.givenU !== undefined && opts.givenU !== null;
	await tdb()('elements').insert({
		id,
		organisation_id: organisationId,
		dwelling_id: dwellingId,
		position: opts.position ?? 0,
		name: opts.name ?? 'External wall',
		kind: opts.kind ?? 'external-wall',
		area: opts.area ?? 40,
		heat_flow: opts.heatFlow ?? 'horizontal',
		build_up: given ? null : JSON.stringify(opts.buildUp ?? cavityWall()),
		given_u: opts.givenU ?? null,
		given_u_source: opts.givenUSource ?? null,
		internal: JSON.stringify(opts.internal ?? { temperature: 20, relativeHumidity: 50 }),
		climate_id: opts.climateId ?? null
	});
	return id;
}
