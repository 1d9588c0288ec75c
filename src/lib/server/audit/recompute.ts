/**
 * The recompute of audit batches, self-contained (the Knex instance passed in, types only from the
 * database module) so the benchmark can run it outside SvelteKit. The audit service binds it to the app's
 * database.
 */
import { randomUUID } from 'node:crypto';
import type { Db } from '$lib/server/db';
import { hostname } from 'node:os';
import type { Knex } from 'knex';
import {
	auditDwelling,
	type AuditElement,
	type AuditJunction,
	type AuditReport,
	type JunctionCache,
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
import { isStalled, STALL_AFTER_MS } from '$lib/audit/rules';

/**
 * The parts of a report snapshot the audit compares, cut out in the database: per element its inputs
 * and the headline figures of its result (not the per-month Glaser detail or the temperature profile);
 * per junction its fields, choices and model with its ψ and fRsi (not its result or temperature field),
 * null when the report was issued before junctions were reported.
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
	from jsonb_array_elements(snapshot->'elements') e), '[]'::jsonb),
	'junctions', case when jsonb_typeof(snapshot->'junctions') = 'array' then coalesce((
		select jsonb_agg((j - 'result' - 'field') || jsonb_build_object('fRsi', j->'result'->'surface'->'fRsi'))
		from jsonb_array_elements(snapshot->'junctions') j), '[]'::jsonb) end)`;
const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

export type BatchProgress = {
	state?: 'queued' | 'running' | 'done' | 'failed';
	done?: number;
	total?: number;
	flagged?: number;
	added?: number;
	startedAt?: string;
	finishedAt?: string;
	/** written by the running recompute every few seconds (null: its run stopped and left the batch) */
	heartbeat?: string | null;
	error?: string;
	/** the run that holds the batch while it is running */
	runId?: string | null;
	/** the process whose worker holds (or last held) the run: host name and process id */
	runner?: string | null;
	/** when a stalled run was taken over and continued at its `done` */
	resumedAt?: string | null;
	/** the run covers only some dwellings: its `done` is no place to continue at */
	partial?: boolean | null;
	/** how many recomputes have been asked for, and the last one a finished run answered */
	requested?: number;
	served?: number;
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
			.whereIn('status', ['issued', 'accepted', 'changed-after-acceptance'])
			.update({ status: 'awaiting-review', reopened_at: null, updated_at: trx.fn.now() });
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

/** The rows one chunk of dwellings needs, in six queries. Exported for the benchmark's read-only floor. */
export async function loadDwellingRows(trx: Db, orgId: string, ids: string[]) {
	const [dwellings, elements, reports, junctions] = await Promise.all([
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
				'window_parts',
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
		),
		trx('junctions')
			.where({ organisation_id: orgId })
			.whereIn('dwelling_id', ids)
			.orderBy([{ column: 'dwelling_id' }, { column: 'created_at' }, { column: 'id' }])
			.select(
				'id',
				'dwelling_id',
				'name',
				'type',
				'length_m',
				'source',
				'dimension_system',
				'psi_entered',
				'psi_source',
				'details',
				trx.raw(`case when details->>'mode' = 'free-form' then model end as model`)
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
	return { dwellings, elements, reports, revisions, junctions };
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
			windowParts: e.window_parts ?? null,
			internal: e.internal,
			climateId: e.climate_id
		});
		elementsBy.set(e.dwelling_id, list);
	}
	const junctionsBy = new Map<string, AuditJunction[]>();
	for (const j of rows.junctions) {
		const list = junctionsBy.get(j.dwelling_id) ?? [];
		list.push({
			id: j.id,
			name: j.name,
			type: j.type,
			lengthM: Number(j.length_m),
			source: j.source,
			dimensionSystem: j.dimension_system,
			psiEntered: j.psi_entered == null ? null : Number(j.psi_entered),
			psiSource: j.psi_source ?? null,
			details: j.details ?? null,
			model: j.model ?? null
		});
		junctionsBy.set(j.dwelling_id, list);
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
	const junctionCache: JunctionCache = new Map();
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
					currentRevisions,
					junctions: junctionsBy.get(d.id) ?? []
				},
				cache,
				junctionCache
			)
		);
	}
	return out;
}

/** Which process runs a recompute, for the operator (several Envelo processes share the queue). */
const RUNNER = `${hostname()}:${process.pid}`;

/** A running recompute writes its heartbeat this often (between chunks too: a chunk takes a few seconds). */
export const HEARTBEAT_EVERY_MS = 5_000;
/**
 * A run that has finished no chunk for this long stops writing its heartbeat (a query that hangs would
 * otherwise keep a batch "running" for ever), so the batch is taken over as stalled half a minute later.
 */
const STUCK_AFTER_MS = 10 * 60_000;

/** Members of a batch's progress to set (null clears one). */
type ProgressPatch = { [K in keyof BatchProgress]?: BatchProgress[K] | null };

/** The batch's progress with `patch` merged in (jsonb `||`), for an update of audit_batches. */
const progressWith = (k: Db, patch: ProgressPatch) => k.raw(`progress || ?::jsonb`, [JSON.stringify(patch)]);

/** The batch row, locked for the rest of the transaction. */
const lockBatch = (trx: Knex.Transaction, organisationId: string, batchId: string) =>
	trx('audit_batches')
		.where({ organisation_id: organisationId, id: batchId })
		.forUpdate()
		.first('progress', 'filter', 'sampling');

/** Merge `patch` into the progress of the batch while run `runId` holds it; the rows changed (0 or 1). */
const writeRun = (
	k: Db,
	organisationId: string,
	batchId: string,
	runId: string,
	patch: ProgressPatch,
	touch = false
) =>
	k('audit_batches')
		.where({ id: batchId, organisation_id: organisationId })
		.whereRaw(`progress->>'runId' = ?`, [runId])
		.update({ progress: progressWith(k, patch), ...(touch ? { updated_at: k.fn.now() } : {}) });

/** Add flagged dwellings from outside the sample as items of the batch; the new items' ids. */
async function addItems(
	trx: Knex.Transaction,
	organisationId: string,
	batchId: string,
	toAdd: { id: string; reason: string }[]
): Promise<{ id: string; dwelling_id: string }[]> {
	await insertItems(trx, organisationId, batchId, toAdd);
	return trx('audit_items')
		.where({ batch_id: batchId })
		.whereIn(
			'dwelling_id',
			toAdd.map((t) => t.id)
		)
		.select('id', 'dwelling_id');
}

export type RecomputeOptions = {
	userId?: string | null;
	chunkSize?: number;
	/** recompute only these dwellings (after a resubmission); such a run is never continued by another */
	onlyDwellings?: string[];
	/**
	 * The request this run answers (from requestRecomputeWith): a job that comes back after a later run
	 * has finished (a retry, a duplicate) finds its request served and does nothing.
	 */
	request?: number;
	/** Stop before the next chunk and leave the batch to be taken over at once (shutdown). */
	signal?: AbortSignal;
	/** Called after each chunk is written, with the batch's progress so far. */
	onChunk?: (p: { done: number; total: number }) => void | Promise<void>;
	heartbeatMs?: number;
};

/**
 * Recompute every dwelling of a batch's population in chunks, writing each item's flags and figures and
 * the batch's progress after every chunk, in one transaction per chunk (the page follows it). With
 * `includeFlagged`, dwellings outside the sample that carry a flag are added, saying which flags.
 *
 * The run claims the batch with a fresh `runId` and a `heartbeat` it renews every few seconds; a batch
 * still running with an older heartbeat than STALL_AFTER_MS has lost its worker and is taken over: the new
 * run continues at the stalled run's `done` (written with the chunk it counts, so the dwellings before it
 * are not recomputed again) and carries its counts on. A run that finds another `runId` on the batch has
 * been taken over: it stops, and the chunk it was writing is rolled back.
 *
 * Returns false when another live run holds the batch, the request was served already, or this run was
 * stopped or taken over before the end.
 */
export async function recomputeBatchWith(
	db: Knex,
	organisationId: string,
	batchId: string,
	opts: RecomputeOptions = {}
): Promise<boolean> {
	const runId = randomUUID();
	const claim = await db.transaction(async (trx) => {
		const row = await lockBatch(trx, organisationId, batchId);
		if (!row) return null;
		const p = (row.progress ?? {}) as BatchProgress;
		if (p.state === 'running' && !isStalled(p)) return null;
		if (opts.request !== undefined && (p.served ?? 0) >= opts.request) return null;
		const source = row.filter as BatchSource;
		const population = opts.onlyDwellings ?? source.population ?? [];
		const total = population.length;
		// Only a whole-population run that stalled is continued; anything else starts at the first dwelling.
		const carry =
			p.state === 'running' &&
			!p.partial &&
			!opts.onlyDwellings &&
			p.total === total &&
			Number.isInteger(p.done) &&
			p.done! >= 0 &&
			p.done! <= total;
		const start = carry ? p.done! : 0;
		const now = new Date().toISOString();
		await trx('audit_batches')
			.where({ organisation_id: organisationId, id: batchId })
			.update({
				progress: progressWith(trx, {
					state: 'running',
					runId,
					runner: RUNNER,
					startedAt: start > 0 && p.startedAt ? p.startedAt : now,
					resumedAt: start > 0 ? now : null,
					heartbeat: now,
					done: start,
					total,
					flagged: carry ? (p.flagged ?? 0) : 0,
					added: carry ? (p.added ?? 0) : 0,
					partial: opts.onlyDwellings ? true : null,
					error: null,
					finishedAt: null
				}),
				updated_at: trx.fn.now()
			});
		return {
			population,
			total,
			start,
			flagged: carry ? (p.flagged ?? 0) : 0,
			added: carry ? (p.added ?? 0) : 0,
			serving: p.requested ?? 0,
			sampling: row.sampling as SamplingRule
		};
	});
	if (!claim) return false;
	const { population, total, start, sampling } = claim;
	const chunkSize = opts.chunkSize ?? 200;
	let flagged = claim.flagged;
	let added = claim.added;

	// The heartbeat: written on a timer so that a long chunk does not look like a dead worker. Finding the
	// batch held by another run (0 rows) means this one was taken over.
	let lost = false;
	let lastStep = Date.now();
	const beat = setInterval(() => {
		if (lost || Date.now() - lastStep > STUCK_AFTER_MS) return;
		writeRun(db, organisationId, batchId, runId, { heartbeat: new Date().toISOString() }).then(
			(n) => {
				if (n === 0) lost = true;
			},
			(e) => console.error('[envelo] audit recompute heartbeat:', e)
		);
	}, opts.heartbeatMs ?? HEARTBEAT_EVERY_MS);
	beat.unref?.();

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
		let pending = load(start);
		for (let i = start; i < total; i += chunkSize) {
			if (lost) return false;
			if (opts.signal?.aborted) {
				// Left running with no heartbeat: stalled at once, so the next worker continues at `done`.
				await writeRun(db, organisationId, batchId, runId, { heartbeat: null }).catch((e) =>
					console.error('[envelo] audit recompute could not leave its batch:', e)
				);
				return false;
			}
			const ids = population.slice(i, i + chunkSize);
			const rows = await pending!;
			pending = load(i + chunkSize);
			const audits = auditRows(rows, ctx);
			await db.transaction(async (trx) => {
				const updates: { id: string; flags: Flag[]; recompute: DwellingAudit }[] = [];
				const toAdd: { id: string; reason: string }[] = [];
				let chunkFlagged = 0;
				for (const [dwellingId, audit] of audits) {
					if (audit.flags.length) chunkFlagged++;
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
				const fresh = toAdd.length ? await addItems(trx, organisationId, batchId, toAdd) : [];
				for (const f of fresh) {
					const audit = audits.get(f.dwelling_id)!;
					updates.push({ id: f.id, flags: audit.flags, recompute: audit });
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
				// `done` is written with the items it counts: a run that continues here recomputes none twice.
				const held = await writeRun(trx, organisationId, batchId, runId, {
					state: 'running',
					done: Math.min(total, i + ids.length),
					total,
					flagged: flagged + chunkFlagged,
					added: added + toAdd.length,
					heartbeat: new Date().toISOString()
				});
				if (held === 0) {
					lost = true;
					throw new Error('the recompute of this batch was taken over by another run');
				}
				// Counted only once the chunk is written (a rolled-back chunk counts nothing).
				flagged += chunkFlagged;
				added += toAdd.length;
				for (const f of fresh) itemBy.set(f.dwelling_id, f.id);
			});
			lastStep = Date.now();
			await opts.onChunk?.({ done: Math.min(total, i + ids.length), total });
		}
		if (lost) return false;
		const finished = await db.transaction(async (trx) => {
			const held = await writeRun(
				trx,
				organisationId,
				batchId,
				runId,
				{
					state: 'done',
					done: total,
					total,
					flagged,
					added,
					served: claim.serving,
					finishedAt: new Date().toISOString()
				},
				true
			);
			if (held === 0) return false;
			await logRow(trx, {
				organisationId,
				userId: opts.userId ?? null,
				action: 'audit-batch-recompute',
				entity: 'audit_batch',
				entityId: batchId,
				details: {
					dwellings: total,
					flagged,
					added,
					partial: Boolean(opts.onlyDwellings),
					...(start > 0 ? { continuedFrom: start } : {})
				}
			});
			return true;
		});
		return finished;
	} catch (e) {
		if (lost) return false;
		await writeRun(db, organisationId, batchId, runId, {
			state: 'failed',
			error: e instanceof Error ? e.message : String(e),
			finishedAt: new Date().toISOString()
		}).catch((w) => console.error('[envelo] audit recompute could not record its failure:', w));
		throw e;
	} finally {
		clearInterval(beat);
	}
}

/**
 * Ask for a recompute of the batch; the request's number for the job, or null while a live run holds
 * the batch. An idle batch waits as queued from its first dwelling; a stalled one stays running at its
 * `done` (its run is disowned, so it can write nothing more) until the next run takes it over there.
 */
export async function requestRecomputeWith(
	db: Knex,
	organisationId: string,
	batchId: string
): Promise<number | null> {
	return db.transaction(async (trx) => {
		const row = await lockBatch(trx, organisationId, batchId);
		if (!row) return null;
		const p = (row.progress ?? {}) as BatchProgress;
		if (p.state === 'running' && !isStalled(p)) return null;
		const request = (p.requested ?? 0) + 1;
		const patch: ProgressPatch =
			p.state === 'running'
				? { requested: request, runId: null }
				: { state: 'queued', done: 0, requested: request };
		await trx('audit_batches')
			.where({ organisation_id: organisationId, id: batchId })
			.update({ progress: progressWith(trx, patch), updated_at: trx.fn.now() });
		return request;
	});
}

/** Ask for a recompute of the batch (requestRecomputeWith); false while a live run holds it. */
export async function markQueuedWith(db: Knex, organisationId: string, batchId: string): Promise<boolean> {
	return (await requestRecomputeWith(db, organisationId, batchId)) !== null;
}

/**
 * The batches of every organisation whose recompute has stalled (running, no heartbeat for
 * STALL_AFTER_MS), for the worker to queue again.
 */
export async function stalledBatchesWith(
	db: Knex,
	at = Date.now()
): Promise<{ organisationId: string; batchId: string }[]> {
	const rows = await db('audit_batches')
		.whereRaw(`progress->>'state' = 'running'`)
		.whereRaw(`coalesce((progress->>'heartbeat')::timestamptz, 'epoch') < ?`, [
			new Date(at - STALL_AFTER_MS).toISOString()
		])
		.orderBy('updated_at')
		.select('id', 'organisation_id');
	return rows.map((r) => ({ organisationId: r.organisation_id as string, batchId: r.id as string }));
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
