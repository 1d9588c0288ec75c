/**
 * The recompute of audit batches, self-contained (relative imports, the Knex instance passed in) so the
 * benchmark can run it outside SvelteKit. src/lib/server/audits.ts binds it to the app's database.
 */
import type { Knex } from 'knex';
import {
	auditDwelling,
	type AuditElement,
	type AuditReport,
	type AnalysisCache,
	type DwellingAudit,
	type LimitTableInfo,
	type RevisionInfo
} from '$lib/audit/assess';
import { FLAG_LABELS, type Flag } from '$lib/audit/flags';
import type { BatchFilter } from '$lib/audit/schemas';
import type { SamplingRule } from '$lib/audit/sampling';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { type ElementKind } from '$lib/dwellings/kinds';
import { limitTableFor } from '$lib/limit-tables/rules';

type Db = Knex | Knex.Transaction;

/**
 * The parts of a report snapshot the audit compares, cut out in the database: per element its inputs
 * and the headline figures of its result (not the per-month Glaser detail or the temperature profile).
 */
const SNAPSHOT_FIGURES = `jsonb_build_object('elements', coalesce((
	select jsonb_agg((e - 'result') || jsonb_build_object('result', case when e->'result' is null or e->'result' = 'null'::jsonb then null else jsonb_build_object(
		'uValue', e->'result'->'uValue',
		'uValueRounded', e->'result'->'uValueRounded',
		'condensation', case when e->'result'->'condensation' is null then null else jsonb_build_object(
			'outcome', e->'result'->'condensation'->'outcome',
			'maxAccumulation', e->'result'->'condensation'->'maxAccumulation') end,
		'surface', case when e->'result'->'surface' is null then null else jsonb_build_object(
			'pass', e->'result'->'surface'->'pass',
			'fRsi', e->'result'->'surface'->'fRsi',
			'fRsiMin', e->'result'->'surface'->'fRsiMin') end) end))
	from jsonb_array_elements(snapshot->'elements') e), '[]'::jsonb))`;
const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

export type BatchProgress = {
	state?: 'queued' | 'running' | 'done' | 'failed';
	done?: number;
	total?: number;
	flagged?: number;
	added?: number;
	startedAt?: string;
	finishedAt?: string;
	heartbeat?: string;
	error?: string;
};

export type BatchSource = BatchFilter & {
	source: 'filter' | 'references';
	references?: string[];
	/** the dwellings the batch was drawn from, resolved when it was created */
	population: string[];
};

export async function insertItems(
	trx: Db,
	orgId: string,
	batchId: string,
	picks: { id: string; reason: string }[]
) {
	for (let i = 0; i < picks.length; i += 500) {
		const chunk = picks.slice(i, i + 500);
		await trx('audit_items')
			.insert(
				chunk.map((p) => ({
					organisation_id: orgId,
					batch_id: batchId,
					dwelling_id: p.id,
					picked_because: p.reason
				}))
			)
			.onConflict(['batch_id', 'dwelling_id'])
			.ignore();
		await trx('dwellings')
			.where({ organisation_id: orgId })
			.whereIn(
				'id',
				chunk.map((p) => p.id)
			)
			.whereIn('status', ['issued', 'accepted'])
			.update({ status: 'awaiting-review', updated_at: trx.fn.now() });
	}
}

/* ------------------------------------------------------------------ recompute */

type Context = {
	climates: Map<string, ClimateMonthValues[]>;
	limitTables: (LimitTableInfo & { id: string; isDefault: boolean })[];
};

async function loadContext(trx: Db, orgId: string): Promise<Context> {
	const [climates, tables] = await Promise.all([
		trx('climates').where({ organisation_id: orgId }).select('id', 'months'),
		trx('limit_tables')
			.where({ organisation_id: orgId })
			.select('id', 'name', 'edition', 'limits', 'is_default')
	]);
	return {
		climates: new Map(climates.map((c) => [c.id as string, c.months as ClimateMonthValues[]])),
		limitTables: tables.map((t) => ({
			id: t.id as string,
			isDefault: Boolean(t.is_default),
			name: t.name as string,
			edition: t.edition as string,
			limits: t.limits ?? {}
		}))
	};
}

/** The rows one chunk of dwellings needs, in five queries. Exported for the benchmark's read-only floor. */
export async function loadDwellingRows(trx: Db, orgId: string, ids: string[]) {
	const [dwellings, elements, reports] = await Promise.all([
		trx('dwellings')
			.where({ organisation_id: orgId })
			.whereIn('id', ids)
			.select('id', 'reference', 'assessor_id', 'status', 'climate_id', 'limit_table_id'),
		trx('elements')
			.where({ organisation_id: orgId })
			.whereIn('dwelling_id', ids)
			.orderBy(['dwelling_id', 'position'])
			.select(
				'id',
				'dwelling_id',
				'name',
				'kind',
				'area',
				'heat_flow',
				'build_up',
				'given_u',
				'given_u_source',
				'internal',
				'climate_id'
			),
		trx.select('*').from(
			trx('reports')
				.where({ organisation_id: orgId, scope: 'dwelling' })
				.whereIn('dwelling_id', ids)
				.distinctOn('dwelling_id')
				.orderBy([
					{ column: 'dwelling_id' },
					{ column: 'issued_at', order: 'desc' },
					{ column: 'revision', order: 'desc' }
				])
				.select(
					'id',
					'dwelling_id',
					'number',
					'revision',
					'issued_at',
					trx.raw(`${SNAPSHOT_FIGURES} as snapshot`)
				)
				.as('latest')
		)
	]);
	const revisionIds = new Set<string>();
	const materialIds = new Set<string>();
	for (const e of elements) {
		for (const l of e.build_up?.layers ?? []) {
			if (l.materialRevisionId) revisionIds.add(l.materialRevisionId);
			if (l.materialId) materialIds.add(l.materialId);
		}
	}
	for (const r of reports) {
		for (const se of r.snapshot?.elements ?? []) {
			for (const m of se.materialRevisions ?? []) if (m.revisionId) revisionIds.add(m.revisionId);
			for (const l of se.buildUp?.layers ?? [])
				if (l.materialRevisionId) revisionIds.add(l.materialRevisionId);
		}
	}
	const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
	const revIds = [...revisionIds].filter((x) => uuid.test(x));
	const matIds = [...materialIds].filter((x) => uuid.test(x));
	const revisions =
		revIds.length || matIds.length
			? await trx('material_revisions as r')
					.join('materials as m', 'm.id', 'r.material_id')
					.where('r.organisation_id', orgId)
					.andWhere((w) => {
						if (revIds.length) w.whereIn('r.id', revIds);
						if (matIds.length)
							w.orWhereIn(
								'r.id',
								trx('materials')
									.whereIn('id', matIds)
									.whereNotNull('current_revision_id')
									.select('current_revision_id')
							);
					})
					.select('r.*', 'm.code', 'm.current_revision_id')
			: [];
	// the current revision of every material a used revision belongs to
	const haveCurrent = new Set(revisions.map((r) => r.id));
	const missing = [
		...new Set(revisions.map((r) => r.current_revision_id).filter((c) => c && !haveCurrent.has(c)))
	];
	if (missing.length) {
		const more = await trx('material_revisions as r')
			.join('materials as m', 'm.id', 'r.material_id')
			.where('r.organisation_id', orgId)
			.whereIn('r.id', missing)
			.select('r.*', 'm.code', 'm.current_revision_id');
		revisions.push(...more);
	}
	return { dwellings, elements, reports, revisions };
}

function mapRevision(r: Record<string, any>): RevisionInfo {
	return {
		id: r.id,
		materialId: r.material_id,
		code: r.code ?? null,
		revision: r.revision,
		name: r.name,
		category: r.category,
		lambda: r.lambda,
		lambdaKind: r.lambda_kind,
		resistance: r.resistance,
		muDry: r.mu_dry,
		sd: r.sd,
		thicknessMinMm: r.thickness_min_mm,
		thicknessMaxMm: r.thickness_max_mm,
		status: r.status
	};
}

/** Audit a set of dwellings of one organisation: returns dwelling id → audit. */
export async function auditDwellingsWith(
	trx: Db,
	orgId: string,
	ids: string[],
	ctx?: Context
): Promise<Map<string, DwellingAudit>> {
	const c = ctx ?? (await loadContext(trx, orgId));
	return auditRows(await loadDwellingRows(trx, orgId, ids), c);
}

type DwellingRows = Awaited<ReturnType<typeof loadDwellingRows>>;

/** The CPU part: recompute and flag loaded rows (no I/O). */
function auditRows(rows: DwellingRows, c: Context): Map<string, DwellingAudit> {
	const revisions = new Map<string, RevisionInfo>();
	const currentRevisions = new Map<string, RevisionInfo>();
	for (const r of rows.revisions) revisions.set(r.id, mapRevision(r));
	for (const r of rows.revisions)
		if (r.current_revision_id === r.id) currentRevisions.set(r.material_id, revisions.get(r.id)!);
	const elementsBy = new Map<string, AuditElement[]>();
	for (const e of rows.elements) {
		const list = elementsBy.get(e.dwelling_id) ?? [];
		list.push({
			id: e.id,
			name: e.name,
			kind: e.kind as ElementKind,
			area: e.area,
			heatFlow: e.heat_flow,
			buildUp: e.build_up,
			givenU: e.given_u,
			givenUSource: e.given_u_source,
			internal: e.internal,
			climateId: e.climate_id
		});
		elementsBy.set(e.dwelling_id, list);
	}
	const reportBy = new Map<string, AuditReport>(
		rows.reports.map((r) => [
			r.dwelling_id,
			{
				id: r.id,
				number: r.number,
				revision: r.revision,
				issuedAt: iso(r.issued_at)!,
				snapshot: r.snapshot ?? {}
			}
		])
	);
	const out = new Map<string, DwellingAudit>();
	const cache: AnalysisCache = new Map();
	for (const d of rows.dwellings) {
		const table = limitTableFor(d.limit_table_id, c.limitTables);
		const limitTable = table && { name: table.name, edition: table.edition, limits: table.limits };
		out.set(
			d.id,
			auditDwelling(
				{
					dwellingId: d.id,
					climateId: d.climate_id,
					elements: elementsBy.get(d.id) ?? [],
					report: reportBy.get(d.id) ?? null,
					limitTable,
					climates: c.climates,
					revisions,
					currentRevisions
				},
				cache
			)
		);
	}
	return out;
}

const STALE_AFTER_MS = 2 * 60_000;

/** Members of a batch's progress to set (null clears one). */
type ProgressPatch = { [K in keyof BatchProgress]?: BatchProgress[K] | null };

/** The batch's progress with `patch` merged in (jsonb `||`), for an update of audit_batches. */
const progressWith = (k: Db, patch: ProgressPatch) => k.raw(`progress || ?::jsonb`, [JSON.stringify(patch)]);

/** Merge `patch` into the progress of the batch; `touch` moves its updated_at too. */
const writeProgress = (k: Db, organisationId: string, batchId: string, patch: ProgressPatch, touch = false) =>
	k('audit_batches')
		.where({ id: batchId, organisation_id: organisationId })
		.update({ progress: progressWith(k, patch), ...(touch ? { updated_at: k.fn.now() } : {}) });

/**
 * Recompute every dwelling of a batch's population in chunks, writing each item's flags and figures and
 * the batch's progress after every chunk (the page follows it). With `includeFlagged`, dwellings outside
 * the sample that carry a flag are added, saying which flags. Returns false when another run holds the batch.
 */
export async function recomputeBatchWith(
	db: Knex,
	organisationId: string,
	batchId: string,
	opts: { userId?: string | null; chunkSize?: number; onlyDwellings?: string[] } = {}
): Promise<boolean> {
	const now = new Date().toISOString();
	const claimed = await db('audit_batches')
		.where({ organisation_id: organisationId, id: batchId })
		.andWhere((w) =>
			w
				.whereRaw(`coalesce(progress->>'state', '') <> 'running'`)
				.orWhereRaw(`coalesce((progress->>'heartbeat')::timestamptz, 'epoch') < ?`, [
					new Date(Date.now() - STALE_AFTER_MS).toISOString()
				])
		)
		.update({
			progress: progressWith(db, { state: 'running', startedAt: now, heartbeat: now, done: 0, error: null }),
			updated_at: db.fn.now()
		})
		.returning(['filter', 'sampling']);
	if (claimed.length === 0) return false;
	const source = claimed[0].filter as BatchSource;
	const sampling = claimed[0].sampling as SamplingRule;
	const population = opts.onlyDwellings ?? source.population ?? [];
	const total = population.length;
	const chunkSize = opts.chunkSize ?? 200;
	let flagged = 0;
	let added = 0;
	try {
		const ctx = await loadContext(db, organisationId);
		const items = await db('audit_items')
			.where({ organisation_id: organisationId, batch_id: batchId })
			.select('id', 'dwelling_id');
		const itemBy = new Map(items.map((i) => [i.dwelling_id as string, i.id as string]));
		// Read the next chunk while this one is computed: PostgreSQL works in its own process meanwhile.
		const load = (at: number) => {
			if (at >= total) return null;
			const p = loadDwellingRows(db, organisationId, population.slice(at, at + chunkSize));
			p.catch(() => {}); // awaited below; this only keeps an early failure from being "unhandled"
			return p;
		};
		let pending = load(0);
		for (let i = 0; i < total; i += chunkSize) {
			const ids = population.slice(i, i + chunkSize);
			const rows = await pending!;
			pending = load(i + chunkSize);
			const audits = auditRows(rows, ctx);
			await db.transaction(async (trx) => {
				const updates: { id: string; flags: Flag[]; recompute: DwellingAudit }[] = [];
				const toAdd: { id: string; reason: string }[] = [];
				for (const [dwellingId, audit] of audits) {
					if (audit.flags.length) flagged++;
					const itemId = itemBy.get(dwellingId);
					if (itemId) updates.push({ id: itemId, flags: audit.flags, recompute: audit });
					else if (sampling.includeFlagged && audit.flags.length) {
						const kinds = [...new Set(audit.flags.map((f) => FLAG_LABELS[f.code]))];
						toAdd.push({
							id: dwellingId,
							reason: `carries ${audit.flags.length === 1 ? 'a flag' : `${audit.flags.length} flags`}: ${kinds.join('; ')}`
						});
					}
				}
				if (toAdd.length) {
					await insertItems(trx, organisationId, batchId, toAdd);
					const fresh = await trx('audit_items')
						.where({ batch_id: batchId })
						.whereIn(
							'dwelling_id',
							toAdd.map((t) => t.id)
						)
						.select('id', 'dwelling_id');
					for (const f of fresh) {
						itemBy.set(f.dwelling_id, f.id);
						const audit = audits.get(f.dwelling_id)!;
						updates.push({ id: f.id, flags: audit.flags, recompute: audit });
					}
					added += toAdd.length;
				}
				if (updates.length) {
					await trx.raw(
						`UPDATE audit_items AS a SET flags = x.flags, recompute = x.recompute, recomputed_at = now(), updated_at = now()
						 FROM jsonb_to_recordset(?::jsonb) AS x(id uuid, flags jsonb, recompute jsonb)
						 WHERE a.id = x.id AND a.organisation_id = ?`,
						[JSON.stringify(updates), organisationId]
					);
					await trx('activity_log').insert(
						updates.map((u) => ({
							organisation_id: organisationId,
							user_id: opts.userId ?? null,
							action: 'audit-recompute',
							entity: 'audit_item',
							entity_id: u.id,
							details: JSON.stringify({
								batchId,
								engineVersion: u.recompute.engineVersion,
								reportNumber: u.recompute.reportNumber,
								flags: u.flags.map((f) => ({
									code: f.code,
									severity: f.severity,
									elementId: f.elementId ?? null
								}))
							})
						}))
					);
				}
				const done = Math.min(total, i + ids.length);
				await writeProgress(trx, organisationId, batchId, {
					state: 'running',
					done,
					total,
					flagged,
					added,
					heartbeat: new Date().toISOString()
				});
			});
		}
		await writeProgress(
			db,
			organisationId,
			batchId,
			{ state: 'done', done: total, total, flagged, added, finishedAt: new Date().toISOString() },
			true
		);
		await logRow(db, {
			organisationId,
			userId: opts.userId ?? null,
			action: 'audit-batch-recompute',
			entity: 'audit_batch',
			entityId: batchId,
			details: { dwellings: total, flagged, added, partial: Boolean(opts.onlyDwellings) }
		});
		return true;
	} catch (e) {
		await writeProgress(db, organisationId, batchId, {
			state: 'failed',
			error: e instanceof Error ? e.message : String(e),
			finishedAt: new Date().toISOString()
		});
		throw e;
	}
}

/** Mark a batch as waiting for the queue (the page shows it at once). */
export async function markQueuedWith(db: Knex, organisationId: string, batchId: string): Promise<boolean> {
	const n = await db('audit_batches')
		.where({ organisation_id: organisationId, id: batchId })
		.whereRaw(`coalesce(progress->>'state', '') <> 'running'`)
		.update({
			progress: progressWith(db, { state: 'queued', done: 0 }),
			updated_at: db.fn.now()
		});
	return n > 0;
}

/** Recompute one dwelling of a batch now (after a resubmission), without touching the batch's progress. */
export async function recomputeItemWith(
	db: Knex,
	orgId: string,
	batchId: string,
	dwellingId: string,
	userId: string | null
) {
	const audits = await auditDwellingsWith(db, orgId, [dwellingId]);
	const audit = audits.get(dwellingId);
	if (!audit) return;
	await db.transaction(async (trx) => {
		const [row] = await trx('audit_items')
			.where({ organisation_id: orgId, batch_id: batchId, dwelling_id: dwellingId })
			.update({
				flags: JSON.stringify(audit.flags),
				recompute: JSON.stringify(audit),
				recomputed_at: trx.fn.now(),
				updated_at: trx.fn.now()
			})
			.returning('id');
		if (row) {
			await logRow(trx, {
				organisationId: orgId,
				userId,
				action: 'audit-recompute',
				entity: 'audit_item',
				entityId: row.id,
				details: {
					batchId,
					engineVersion: audit.engineVersion,
					reportNumber: audit.reportNumber,
					flags: audit.flags.map((f) => ({
						code: f.code,
						severity: f.severity,
						elementId: f.elementId ?? null
					}))
				}
			});
		}
	});
}

/** One append-only activity row (the same shape logActivity writes; the database refuses changes). */
async function logRow(
	trx: Db,
	e: {
		organisationId: string;
		userId: string | null;
		action: string;
		entity: string;
		entityId: string;
		details: Record<string, unknown>;
	}
) {
	await trx('activity_log').insert({
		organisation_id: e.organisationId,
		user_id: e.userId,
		action: e.action,
		entity: e.entity,
		entity_id: e.entityId,
		details: JSON.stringify(e.details)
	});
}
