/**
 * The reach of a library correction, read from the database: every element of the organisation whose
 * build-up has a layer on an older revision of a material, grouped by dwelling, with its U now (the
 * stored result) and recomputed with the material's current revision, the limit it is judged against,
 * whether pass/fail or the moisture outcome would change, and for each dwelling its status and issued
 * reports. Self-contained (the Knex instance passed in) so the benchmark can run it outside SvelteKit.
 *
 * "An older revision" is the rule the element editor's offer uses (`findNewerRevisions`): a layer that
 * names the material and one of its revisions, whose number is below the current one's. The layer's new
 * values are the ones the editor's "Use revision N" and the move write (`applyRevisionUpdate`).
 */
import type { Db } from '$lib/server/db';
import { ENGINE_VERSION, type ElementInput } from '$lib/physics';
import type { ClimateMonthValues, StoredBuildUp, StoredInternal } from '$lib/dwellings/element-input';
import { DWELLING_STATUS_LABELS, type DwellingStatus, type ElementKind } from '$lib/dwellings/kinds';
import { changeRefusal } from '$lib/dwellings/rules';
import { applyRevisionUpdate, type LayerValues } from '$lib/library/revisions';
import { limitTableFor, meetsLimit } from '$lib/limit-tables/rules';
import { engineInput, outcomesFor, type Computed, type ReachOutcome } from './reach-compute';
import type { Reach, ReachCount, ReachDwelling, ReachElement, ReachTotals } from '$lib/library/reach';

type Row = Record<string, any>;

/** The material, its revisions by id, and which of them are older than the current one. */
async function loadRevisions(k: Db, organisationId: string, materialId: string) {
	const rows: Row[] = await k('materials as m')
		.join('material_revisions as r', function () {
			this.on('r.material_id', 'm.id').andOn('r.organisation_id', 'm.organisation_id');
		})
		.where('m.organisation_id', organisationId)
		.andWhere('m.id', materialId)
		.orderBy('r.revision', 'desc')
		.select('m.code', 'm.current_revision_id', 'r.id', 'r.revision', 'r.name', 'r.lambda', 'r.resistance')
		.select('r.mu_dry', 'r.sd', 'r.status');
	const current = rows.find((r) => r.id === r.current_revision_id);
	if (!current) return null;
	const to: LayerValues = {
		id: current.id,
		revision: current.revision,
		code: current.code,
		name: current.name,
		lambda: current.lambda,
		resistance: current.resistance,
		muDry: current.mu_dry,
		sd: current.sd
	};
	const older = new Map<string, number>(
		rows.filter((r) => r.revision < current.revision).map((r) => [r.id as string, r.revision as number])
	);
	return { code: current.code as string, name: current.name as string, status: current.status, to, older };
}

/** The containments that find the layers naming the material at one of the given revisions. */
function containment(materialId: string, revisionIds: string[]) {
	const probes = revisionIds.map((r) => JSON.stringify([{ materialId, materialRevisionId: r }]));
	return {
		sql: `e.organisation_id = ? AND e.given_u IS NULL AND (${probes.map(() => `e.build_up -> 'layers' @> ?::jsonb`).join(' OR ')})`,
		bindings: probes
	};
}
type Where = ReturnType<typeof containment>;

/**
 * What an element shares with every other element of the same distinct build-up, in SQL: the fingerprint
 * of its build-up and inside conditions, its heat flow, area and own climate.
 */
const BUILD_KEY = `e.inputs_md5 || '|' || e.heat_flow || '|' || e.area::text || '|' || coalesce(e.climate_id::text, '')`;

/**
 * The elements found, without their build-ups: each answered by the GIN index on `build_up -> 'layers'`
 * (jsonb_path_ops). The stored result's headline figures come from its generated columns (the result
 * itself is large and kept compressed).
 */
async function loadElements(k: Db, organisationId: string, where: Where) {
	const { rows } = await k.raw(
		`SELECT e.id, e.dwelling_id, e.position, e.name, e.kind, e.version, ${BUILD_KEY} AS build_key,
		        e.engine_version IS DISTINCT FROM ? AS stale, e.result_u_value AS u_value,
		        e.result_u_rounded AS u_rounded, e.result_moisture AS moisture, e.result_surface_pass AS surface_pass
		   FROM elements e WHERE ${where.sql}
		  ORDER BY e.dwelling_id, e.position, e.created_at`,
		[ENGINE_VERSION, organisationId, ...where.bindings]
	);
	return rows as Row[];
}

/**
 * The build-up and inside conditions, as text, of one element of each distinct build-up (see
 * `BUILD_KEY`): a programme built from templates has far fewer of them than elements.
 */
async function loadBuilds(k: Db, organisationId: string, rows: Row[]): Promise<Row[]> {
	const one = new Map<string, string>();
	for (const r of rows) if (!one.has(r.build_key)) one.set(r.build_key, r.id);
	if (one.size === 0) return [];
	const { rows: found } = await k.raw(
		`SELECT e.id, ${BUILD_KEY} AS build_key, e.heat_flow, e.area, e.climate_id, e.build_up::text AS build_up,
		        e.internal::text AS internal
		   FROM elements e WHERE e.organisation_id = ? AND e.id = ANY(?::uuid[])`,
		[organisationId, [...one.values()]]
	);
	// an element changed since the first read has another key now: its build is left out
	return (found as Row[]).filter((g) => one.get(g.build_key) === g.id);
}

/**
 * The dwellings with elements found by `where`, with their issued dwelling reports, latest audit decision
 * and latest audit item (read beside the elements, not after them).
 */
async function loadDwellings(k: Db, organisationId: string, where: Where) {
	const { rows } = await k.raw(
		`WITH ids AS MATERIALIZED (SELECT DISTINCT e.dwelling_id AS id FROM elements e WHERE ${where.sql})
		 SELECT d.id, d.reference, d.address, d.status, d.reopened_at, d.issue_changes, d.limit_table_id,
		        d.climate_id, rp.n AS reports, rp.last_issued_at, au.decision AS audit_decision,
		        ai.item_id, ai.batch_id, ai.batch_name, ai.batch_status, ai.decision AS item_decision,
		        ai.decided_at AS item_decided_at
		   FROM dwellings d
		   LEFT JOIN (
		        SELECT r.dwelling_id, count(*)::int AS n, max(r.issued_at) AS last_issued_at FROM reports r
		         WHERE r.organisation_id = ? AND r.scope = 'dwelling' AND r.dwelling_id IN (SELECT id FROM ids)
		         GROUP BY r.dwelling_id
		   ) rp ON rp.dwelling_id = d.id
		   LEFT JOIN (
		        SELECT DISTINCT ON (a.dwelling_id) a.dwelling_id, a.decision FROM audit_items a
		         WHERE a.organisation_id = ? AND a.decision IS NOT NULL AND a.dwelling_id IN (SELECT id FROM ids)
		         ORDER BY a.dwelling_id, a.decided_at DESC NULLS LAST
		   ) au ON au.dwelling_id = d.id
		   LEFT JOIN (
		        SELECT DISTINCT ON (a.dwelling_id) a.dwelling_id, a.id AS item_id, a.batch_id, b.name AS batch_name,
		               b.status AS batch_status, a.decision, a.decided_at
		          FROM audit_items a
		          JOIN audit_batches b ON b.id = a.batch_id AND b.organisation_id = a.organisation_id
		         WHERE a.organisation_id = ? AND a.dwelling_id IN (SELECT id FROM ids)
		         ORDER BY a.dwelling_id, a.created_at DESC, a.id
		   ) ai ON ai.dwelling_id = d.id
		  WHERE d.organisation_id = ? AND d.id IN (SELECT id FROM ids)
		  ORDER BY d.reference`,
		[organisationId, ...where.bindings, organisationId, organisationId, organisationId, organisationId]
	);
	return rows as Row[];
}

/**
 * How many elements and dwellings use the current revision itself: asked only when it is superseded with
 * no newer revision (marked not for new work), when that work has nothing to move to yet.
 */
async function countOnCurrent(k: Db, organisationId: string, materialId: string, revisionId: string) {
	const where = containment(materialId, [revisionId]);
	const { rows } = await k.raw(
		`SELECT count(*)::int AS elements, count(DISTINCT e.dwelling_id)::int AS dwellings
		   FROM elements e WHERE ${where.sql}`,
		[organisationId, ...where.bindings]
	);
	return { elements: rows[0].elements as number, dwellings: rows[0].dwellings as number };
}

/** The organisation's climates and limit tables. */
async function loadContext(k: Db, organisationId: string) {
	const [climates, tables] = await Promise.all([
		k('climates').where('organisation_id', organisationId).select('id', 'months'),
		k('limit_tables')
			.where('organisation_id', organisationId)
			.select('id', 'name', 'edition', 'is_default', 'limits')
	]);
	return {
		climates: new Map<string, ClimateMonthValues[]>(climates.map((c: Row) => [c.id, c.months])),
		tables: tables.map((t: Row) => ({
			id: t.id as string,
			name: t.name as string,
			edition: t.edition as string,
			isDefault: Boolean(t.is_default),
			limits: (t.limits ?? {}) as Partial<Record<ElementKind, number>>
		}))
	};
}

/** The stored result's headline figures, as the row carries them. */
function storedOutcome(r: Row): ReachOutcome {
	return {
		u: r.u_value ?? null,
		uRounded: r.u_rounded ?? r.u_value ?? null,
		moisture: r.moisture ?? null,
		surfacePass: r.surface_pass ?? null
	};
}

type Context = Awaited<ReturnType<typeof loadContext>>;
type Revisions = NonNullable<Awaited<ReturnType<typeof loadRevisions>>>;

/** One distinct build-up with the current revision in place of each older one, as the move writes it. */
type Build = {
	layers: ReachElement['layers'];
	/** with the climate that applies (the element's own, else its dwelling's): the engine input's key */
	keyFor: (climateId: string | null) => string;
};

/**
 * Each distinct build-up's layers on older revisions, and its engine input with the current revision
 * (`applyRevisionUpdate`) for each climate it is judged with; `inputs` collects the inputs by key.
 */
function prepareBuild(
	g: Row,
	materialId: string,
	revs: Revisions,
	ctx: Context,
	inputs: Map<string, ElementInput>
): Build {
	const buildUp = JSON.parse(g.build_up) as StoredBuildUp;
	const updates = buildUp.layers.flatMap((l, layerIndex) =>
		l.materialId === materialId && l.materialRevisionId && revs.older.has(l.materialRevisionId)
			? [{ layerIndex, materialId, fromRevisionId: l.materialRevisionId, to: revs.to }]
			: []
	);
	const el = {
		heatFlow: g.heat_flow,
		buildUp: applyRevisionUpdate(buildUp, updates),
		internal: g.internal ? (JSON.parse(g.internal) as StoredInternal) : null,
		area: g.area
	};
	const keys = new Map<string, string>();
	const keyFor = (climateId: string | null) => {
		const c = g.climate_id ?? climateId ?? '';
		let key = keys.get(c);
		if (!key) {
			const prepared = engineInput(el, c ? (ctx.climates.get(c) ?? null) : null);
			inputs.set(prepared.key, prepared.input);
			keys.set(c, (key = prepared.key));
		}
		return key;
	};
	const layers = updates.map((u) => ({
		layerIndex: u.layerIndex,
		fromRevisionId: u.fromRevisionId,
		fromRevision: revs.older.get(u.fromRevisionId)!
	}));
	return { layers, keyFor };
}

const withPass = (o: ReachOutcome, pass: boolean | null) => ({
	u: o.u,
	uRounded: o.uRounded,
	moisture: o.moisture,
	surfacePass: o.surfacePass,
	pass
});

/** Whether pass/fail changes from `now` to `next`, and which way. */
function flipOf(now: boolean | null, next: boolean | null): ReachElement['passFlip'] {
	if (now === null || next === null || now === next) return null;
	return next ? 'to-pass' : 'to-fail';
}

/** One element of the reach: its layers on older revisions, U now and with the current revision, flips. */
function reachElement(
	r: Row,
	layers: ReachElement['layers'],
	computed: Computed,
	limits: Partial<Record<ElementKind, number>>
): ReachElement {
	const now = storedOutcome(r);
	const outcome = 'outcome' in computed ? computed.outcome : null;
	const v = limits[r.kind as ElementKind];
	const limit = typeof v === 'number' ? v : null;
	const passNow = meetsLimit(now.uRounded, limit);
	const passNext = outcome ? meetsLimit(outcome.uRounded, limit) : null;
	return {
		id: r.id,
		name: r.name,
		kind: r.kind,
		position: r.position,
		version: r.version,
		layers,
		limit,
		now: withPass(now, passNow),
		next: outcome ? withPass(outcome, passNext) : null,
		error: 'error' in computed ? computed.error : null,
		passFlip: flipOf(passNow, passNext),
		moistureChanged: outcome !== null && outcome.moisture !== now.moisture,
		surfaceChanged: outcome !== null && outcome.surfacePass !== now.surfacePass,
		stale: Boolean(r.stale)
	};
}

/** One dwelling of the reach, with its elements on older revisions. */
function reachDwelling(d: Row, elements: ReachElement[], ctx: Context): ReachDwelling {
	const table = limitTableFor(d.limit_table_id, ctx.tables);
	const status = d.status as DwellingStatus;
	const reopened = d.reopened_at !== null;
	const refusal = changeRefusal(status, reopened);
	return {
		id: d.id,
		reference: d.reference,
		address: d.address,
		status,
		statusLabel: DWELLING_STATUS_LABELS[status] ?? status,
		reopened,
		needsReopening: refusal?.needsReason === true,
		refusal: refusal?.message ?? null,
		issuedReports: d.reports ?? 0,
		lastIssuedAt: d.last_issued_at ? new Date(d.last_issued_at).toISOString() : null,
		changesSinceIssue: d.issue_changes ?? null,
		auditDecision: d.audit_decision ?? null,
		audit: d.item_id
			? {
					itemId: d.item_id,
					batchId: d.batch_id,
					batchName: d.batch_name,
					open: d.item_decision === null && d.batch_status === 'open',
					decision: d.item_decision ?? null,
					decidedAt: d.item_decided_at ? new Date(d.item_decided_at).toISOString() : null
				}
			: null,
		limitTable: table ? { id: table.id, name: table.name, edition: table.edition } : null,
		elements
	};
}

function totalsOf(dwellings: ReachDwelling[]): ReachTotals {
	const t: ReachTotals = {
		elements: 0,
		dwellings: dwellings.length,
		flips: 0,
		toFail: 0,
		toPass: 0,
		moistureChanges: 0,
		surfaceChanges: 0,
		errors: 0,
		withIssuedReports: dwellings.filter((d) => d.issuedReports > 0).length,
		needsReopening: dwellings.filter((d) => d.needsReopening).length,
		accepted: dwellings.filter((d) => isAccepted(d)).length,
		inOpenAudit: dwellings.filter((d) => d.audit?.open).length,
		staleResults: 0
	};
	for (const e of dwellings.flatMap((d) => d.elements)) {
		t.elements++;
		if (e.passFlip) t.flips++;
		if (e.passFlip === 'to-fail') t.toFail++;
		if (e.passFlip === 'to-pass') t.toPass++;
		if (e.moistureChanged) t.moistureChanges++;
		if (e.surfaceChanged) t.surfaceChanges++;
		if (e.error) t.errors++;
		if (e.stale) t.staleResults++;
	}
	return t;
}

/** A dwelling whose audit was accepted: its status says so, or its latest audit decision does. */
export function isAccepted(d: Pick<ReachDwelling, 'status' | 'auditDecision'>): boolean {
	return (
		d.status === 'accepted' ||
		d.status === 'changed-after-acceptance' ||
		d.auditDecision === 'accepted' ||
		d.auditDecision === 'accepted-with-advice'
	);
}

/** An element found, with its distinct build-up and the key of its engine input. */
type Hit = { r: Row; build: Build; key: string };

/** The dwellings in reference order, each with its elements in the order of its page. */
function assemble(dRows: Row[], hits: Hit[], outcomes: Map<string, Computed>, ctx: Context): ReachDwelling[] {
	const byDwelling = new Map<string, Hit[]>();
	for (const h of hits) {
		const list = byDwelling.get(h.r.dwelling_id);
		if (list) list.push(h);
		else byDwelling.set(h.r.dwelling_id, [h]);
	}
	const out: ReachDwelling[] = [];
	for (const d of dRows) {
		const list = byDwelling.get(d.id);
		if (!list) continue;
		const limits = limitTableFor(d.limit_table_id, ctx.tables)?.limits ?? {};
		const els = list.map((h) => reachElement(h.r, h.build.layers, outcomes.get(h.key)!, limits));
		out.push(reachDwelling(d, els, ctx));
	}
	return out;
}

/**
 * The reach of the material's current revision: null when the material is not the organisation's.
 * `timings` (ms) adds up where the time went, for the benchmark; `stats` counts the engine inputs read
 * back and calculated.
 */
export async function loadReachWith(
	k: Db,
	organisationId: string,
	materialId: string,
	opts: { timings?: Record<string, number>; stats?: { kept: number; calculated: number } } = {}
): Promise<Reach | null> {
	const timings = opts.timings ?? {};
	let t = performance.now();
	const lap = (name: string) => {
		const now = performance.now();
		timings[name] = (timings[name] ?? 0) + now - t;
		t = now;
	};
	const revs = await loadRevisions(k, organisationId, materialId);
	if (!revs) return null;
	const where = revs.older.size ? containment(materialId, [...revs.older.keys()]) : null;
	const [rows, dRows, ctx, onCurrent] = await Promise.all([
		where ? loadElements(k, organisationId, where) : [],
		where ? loadDwellings(k, organisationId, where) : [],
		loadContext(k, organisationId),
		revs.status === 'superseded' ? countOnCurrent(k, organisationId, materialId, revs.to.id) : null
	]);
	lap('elements');
	const groups = await loadBuilds(k, organisationId, rows);
	lap('builds');
	const inputs = new Map<string, ElementInput>();
	const builds = new Map<string, Build>(
		groups.map((g) => [g.build_key as string, prepareBuild(g, materialId, revs, ctx, inputs)])
	);
	const dwellingOf = new Map(dRows.map((d) => [d.id as string, d]));
	// the reads are separate statements: a row written between them is left out rather than half-read
	const hits: Hit[] = [];
	for (const r of rows) {
		const build = builds.get(r.build_key);
		const d = dwellingOf.get(r.dwelling_id);
		if (build && d) hits.push({ r, build, key: build.keyFor(d.climate_id) });
	}
	lap('prepare');
	const outcomes = await outcomesFor(k, organisationId, inputs, opts.stats);
	lap('compute');
	const dwellings = assemble(dRows, hits, outcomes, ctx);
	lap('assemble');
	return {
		material: { id: materialId, code: revs.code, name: revs.name },
		to: { id: revs.to.id, revision: revs.to.revision, status: revs.status },
		olderRevisions: [...revs.older.values()].sort((a, b) => a - b),
		onSupersededCurrent: onCurrent,
		totals: totalsOf(dwellings),
		distinctInputs: inputs.size,
		dwellings
	};
}

/**
 * For each given material: how many elements and dwellings use an older revision of it (no recompute).
 * For the import's summary; materials not of the organisation are left out.
 */
export async function countReachWith(
	k: Db,
	organisationId: string,
	materialIds: string[]
): Promise<ReachCount[]> {
	if (materialIds.length === 0) return [];
	const { rows } = await k.raw(
		`WITH older AS (
		   SELECT m.id AS material_id, m.code, cur.revision AS current_revision, r.id AS revision_id
		     FROM materials m
		     JOIN material_revisions cur ON cur.id = m.current_revision_id
		     JOIN material_revisions r ON r.material_id = m.id AND r.organisation_id = m.organisation_id
		          AND r.revision < cur.revision
		    WHERE m.organisation_id = ? AND m.id = ANY(?::uuid[]))
		 SELECT o.material_id, o.code, o.current_revision, count(DISTINCT e.id)::int AS elements,
		        count(DISTINCT e.dwelling_id)::int AS dwellings
		   FROM older o
		   JOIN elements e ON e.organisation_id = ? AND e.given_u IS NULL
		    AND e.build_up -> 'layers' @> jsonb_build_array(jsonb_build_object(
		          'materialId', o.material_id::text, 'materialRevisionId', o.revision_id::text))
		  GROUP BY o.material_id, o.code, o.current_revision`,
		[organisationId, materialIds, organisationId]
	);
	const found = new Map(rows.map((r: Row) => [r.material_id as string, r]));
	return materialIds.flatMap((id) => {
		const r = found.get(id) as Row | undefined;
		return r
			? [
					{
						materialId: id,
						code: r.code,
						revision: r.current_revision,
						elements: r.elements,
						dwellings: r.dwellings
					}
				]
			: [];
	});
}

export type {
	Reach,
	ReachCount,
	ReachDwelling,
	ReachElement,
	ReachOutcome,
	ReachTotals
} from '$lib/library/reach';
