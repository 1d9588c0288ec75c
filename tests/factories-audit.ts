// Factories for the audit tests: dwellings, elements, library materials and issued reports, inserted as
// rows directly (reports are immutable by trigger: insert only). Invented data, for tests only.
import { randomUUID, randomBytes, createHash } from 'node:crypto';
import { tdb } from './factories';
import { analyseElement, ENGINE_VERSION } from '../src/lib/physics';
import { toElementInput, type StoredBuildUp, type StoredLayer } from '../src/lib/dwellings/element-input';

/** Twelve invented months (demo values, not a real place). */
export const TEST_MONTHS = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
}));

export async function makeClimate(organisationId: string) {
	const [row] = await tdb()('climates')
		.insert({
			organisation_id: organisationId,
			name: `Test climate ${randomBytes(3).toString('hex')}`,
			source: 'invented for tests',
			illustrative: true,
			months: JSON.stringify(TEST_MONTHS)
		})
		.returning('id');
	return row.id as string;
}

export async function makeLimitTable(organisationId: string, limits: Record<string, number>) {
	const [row] = await tdb()('limit_tables')
		.insert({
			organisation_id: organisationId,
			name: `Test limits ${randomBytes(3).toString('hex')}`,
			edition: 'test',
			is_default: true,
			limits: JSON.stringify(limits)
		})
		.returning('id');
	return row.id as string;
}

type Rev = {
	name?: string;
	category?: string;
	lambda?: number | null;
	lambdaKind?: string;
	resistance?: number | null;
	muDry?: number | null;
	status?: string;
	thicknessMinMm?: number | null;
	thicknessMaxMm?: number | null;
};

/** A material with one revision (current). */
export async function makeMaterial(organisationId: string, rev: Rev = {}) {
	const materialId = randomUUID();
	const code = `T-${randomBytes(3).toString('hex')}`;
	await tdb().transaction(async (trx) => {
		await trx('materials').insert({ id: materialId, organisation_id: organisationId, code });
		const revisionId = await insertRevision(trx, organisationId, materialId, 1, rev);
		await trx('materials').where({ id: materialId }).update({ current_revision_id: revisionId });
	});
	const m = await tdb()('materials').where({ id: materialId }).first();
	return { materialId, code, revisionId: m.current_revision_id as string };
}

async function insertRevision(
	trx: ReturnType<typeof tdb>,
	organisationId: string,
	materialId: string,
	revision: number,
	rev: Rev
) {
	const [row] = await trx('material_revisions')
		.insert({
			organisation_id: organisationId,
			material_id: materialId,
			revision,
			name: rev.name ?? 'Test material',
			category: rev.category ?? 'masonry',
			lambda: rev.lambda === undefined ? 0.77 : rev.lambda,
			lambda_kind: rev.lambdaKind ?? 'declared',
			resistance: rev.resistance ?? null,
			mu_dry: rev.muDry === undefined ? 10 : rev.muDry,
			status: rev.status ?? 'verified',
			thickness_min_mm: rev.thicknessMinMm ?? null,
			thickness_max_mm: rev.thicknessMaxMm ?? null,
			source: 'invented for tests'
		})
		.returning('id');
	return row.id as string;
}

/** A newer revision that becomes current; the old one is marked superseded. */
export async function reviseMaterial(organisationId: string, materialId: string, rev: Rev) {
	return tdb().transaction(async (trx) => {
		const last = await trx('material_revisions')
			.where({ material_id: materialId })
			.max('revision as r')
			.first();
		await trx('material_revisions').where({ material_id: materialId }).update({ status: 'superseded' });
		const id = await insertRevision(trx, organisationId, materialId, Number(last?.r ?? 0) + 1, rev);
		await trx('materials').where({ id: materialId }).update({ current_revision_id: id });
		return id;
	});
}

export async function makeDwelling(
	organisationId: string,
	assessorId: string | null,
	opts: { reference?: string; programme?: string; climateId?: string | null; status?: string } = {}
) {
	const [row] = await tdb()('dwellings')
		.insert({
			organisation_id: organisationId,
			reference: opts.reference ?? `D-${randomBytes(4).toString('hex')}`,
			address: '1 Test Row',
			programme: opts.programme ?? null,
			assessor_id: assessorId,
			status: opts.status ?? 'draft',
			climate_id: opts.climateId ?? null
		})
		.returning(['id', 'reference']);
	return { id: row.id as string, reference: row.reference as string };
}

export async function makeElement(
	organisationId: string,
	dwellingId: string,
	opts: {
		name?: string;
		kind?: string;
		heatFlow?: string;
		layers?: StoredLayer[];
		givenU?: number;
		internal?: object | null;
		position?: number;
	}
) {
	const buildUp: StoredBuildUp | null = opts.givenU !== undefined ? null : { layers: opts.layers ?? [] };
	const [row] = await tdb()('elements')
		.insert({
			organisation_id: organisationId,
			dwelling_id: dwellingId,
			position: opts.position ?? 0,
			name: opts.name ?? 'Wall',
			kind: opts.kind ?? 'external-wall',
			area: 10,
			heat_flow: opts.heatFlow ?? 'horizontal',
			build_up: buildUp ? JSON.stringify(buildUp) : null,
			given_u: opts.givenU ?? null,
			given_u_source: opts.givenU !== undefined ? 'test certificate' : null,
			internal: JSON.stringify(
				opts.internal === undefined ? { temperature: 20, humidityClass: 3 } : opts.internal
			)
		})
		.returning('id');
	return row.id as string;
}

/**
 * Issue a dwelling report the way the reports module does: a snapshot of every element with its input
 * and result, the PDF bytes and their SHA-256. `tamper` changes the stored U of the first element.
 */
export async function issueReport(
	organisationId: string,
	dwellingId: string,
	issuedBy: string,
	opts: { tamperU?: number; issuedAt?: Date } = {}
) {
	const t = tdb();
	const d = await t('dwellings').where({ id: dwellingId }).first();
	const climate = d.climate_id ? await t('climates').where({ id: d.climate_id }).first() : null;
	const els = await t('elements').where({ dwelling_id: dwellingId }).orderBy('position');
	const elements = els.map((e, i) => {
		const input = e.build_up
			? toElementInput(
					{ heatFlow: e.heat_flow, buildUp: e.build_up, internal: e.internal },
					climate?.months ?? null
				)
			: null;
		const result = input ? analyseElement(input) : null;
		if (result && i === 0 && opts.tamperU) result.uValue += opts.tamperU;
		return {
			id: e.id,
			name: e.name,
			kind: e.kind,
			area: e.area,
			heatFlow: e.heat_flow,
			givenU: e.given_u,
			givenUSource: e.given_u_source,
			buildUp: e.build_up,
			internal: e.internal,
			climate: climate
				? {
						id: climate.id,
						name: climate.name,
						source: climate.source,
						illustrative: climate.illustrative,
						months: climate.months
					}
				: null,
			input,
			result,
			limit: null,
			pass: null,
			materialRevisions: (e.build_up?.layers ?? []).flatMap((l: StoredLayer, layerIndex: number) =>
				l.materialRevisionId
					? [{ layerIndex, materialId: l.materialId, revisionId: l.materialRevisionId, revision: 1 }]
					: []
			)
		};
	});
	const last = await t('reports').where({ dwelling_id: dwellingId }).max('revision as r').first();
	const revision = Number(last?.r ?? 0) + 1;
	const pdf = Buffer.from(`%PDF-1.4 test ${randomBytes(4).toString('hex')}`);
	const issuedAt = opts.issuedAt ?? new Date();
	const [row] = await t('reports')
		.insert({
			organisation_id: organisationId,
			number: `R-${d.reference}`,
			revision,
			scope: 'dwelling',
			dwelling_id: dwellingId,
			snapshot: JSON.stringify({
				dwelling: { id: d.id, reference: d.reference },
				limitTable: null,
				elements,
				engineVersion: ENGINE_VERSION,
				issuedAt: issuedAt.toISOString()
			}),
			engine_version: ENGINE_VERSION,
			verification_code: randomBytes(8).toString('hex'),
			sha256: createHash('sha256').update(pdf).digest('hex'),
			pdf,
			issued_by: issuedBy,
			issued_at: issuedAt
		})
		.returning('id');
	await t('dwellings').where({ id: dwellingId }).update({ status: 'issued' });
	return row.id as string;
}

/** A clean, passing masonry wall with insulation from the library (values invented, plausible). */
export async function cleanWallLayers(organisationId: string): Promise<StoredLayer[]> {
	const plaster = await makeMaterial(organisationId, {
		name: 'Gypsum plaster',
		category: 'plasters-linings',
		lambda: 0.4,
		muDry: 10
	});
	const block = await makeMaterial(organisationId, {
		name: 'Aerated block',
		category: 'masonry',
		lambda: 0.15,
		muDry: 10
	});
	const pir = await makeMaterial(organisationId, {
		name: 'PIR board',
		category: 'insulation',
		lambda: 0.022,
		muDry: 60
	});
	const brick = await makeMaterial(organisationId, {
		name: 'Clay brick',
		category: 'masonry',
		lambda: 0.77,
		muDry: 10
	});
	const link = (m: { materialId: string; revisionId: string; code: string }) => ({
		materialId: m.materialId,
		materialRevisionId: m.revisionId,
		materialCode: m.code
	});
	return [
		{ name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10, ...link(plaster) },
		{ name: 'Aerated block', thicknessMm: 100, lambda: 0.15, mu: 10, ...link(block) },
		{ name: 'PIR board', thicknessMm: 100, lambda: 0.022, mu: 60, ...link(pir) },
		{ name: 'Clay brick', thicknessMm: 102, lambda: 0.77, mu: 10, ...link(brick) }
	];
}
