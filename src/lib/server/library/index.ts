/**
 * The material library of an organisation: materials (a code, unique in the organisation) and their
 * revisions. A revision's values never change (the database refuses it); a change of value writes a
 * new revision and moves materials.current_revision_id, so a layer that points at a revision keeps
 * the values it was calculated with. Every query filters by the caller's organisation.
 */
import { calendarDay } from '$lib/format';
import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { containsPattern, db, type Db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import {
	diffValues,
	FIELD_COLUMNS,
	materialValuesSchema,
	asMaterialIssue,
	materialIssues,
	REVISION_FIELDS,
	type ListQuery,
	type MaterialRevision,
	type MaterialSummary,
	type MaterialValues,
	type MaterialValuesInput,
	type FieldChange
} from '$lib/library/schema';
import { plausibilityWarnings, type Warning } from '$lib/library/ranges';
import {
	applyRevisionUpdate,
	type BuildUpLike,
	type LayerValues,
	type RevisionUpdate
} from '$lib/library/revisions';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '$lib/server/errors';
import type { MaterialRevisionRow, MaterialRow } from '$lib/server/tables';

export { applyRevisionUpdate };
export type { RevisionUpdate };

/** Who is acting, for created_by / verified_by and the activity log. */
export type Actor = { userId: string; organisationId: string };

const dateText = calendarDay;

// Rows as Knex returns them (snake_case); converted at the module edge by the functions below.
/** A revision with its material's code, as every revision query selects it. */
type RevisionWithCode = MaterialRevisionRow & Pick<MaterialRow, 'code'>;
/** …with the people who wrote and verified it (`revisionQuery`; their e-mail is there whenever their id is). */
type RevisionWithPeople = RevisionWithCode & {
	verifier_name: string | null;
	verifier_email: string;
	creator_name: string | null;
	creator_email: string;
};

/** The columns of a revision row that both its values and its list row carry, name to source. */
function describedValues(r: MaterialRevisionRow) {
	return {
		name: r.name,
		manufacturer: r.manufacturer,
		category: r.category,
		lambda: r.lambda,
		lambdaKind: r.lambda_kind,
		resistance: r.resistance,
		muDry: r.mu_dry,
		muWet: r.mu_wet,
		sd: r.sd,
		density: r.density,
		specificHeat: r.specific_heat,
		thicknessMinMm: r.thickness_min_mm,
		thicknessMaxMm: r.thickness_max_mm,
		source: r.source
	};
}

/** The values of a revision row, in the shape of MaterialValues. */
export function valuesOfRow(r: RevisionWithCode): MaterialValues {
	return {
		code: r.code,
		...describedValues(r),
		sourceIssued: dateText(r.source_issued),
		sourceExpires: dateText(r.source_expires),
		indicative: Boolean(r.indicative),
		notes: r.notes
	};
}

function toSummary(r: RevisionWithCode): MaterialSummary {
	return {
		id: r.material_id,
		code: r.code,
		revisionId: r.id,
		revision: r.revision,
		...describedValues(r),
		status: r.status
	};
}

function toRevision(r: RevisionWithPeople): MaterialRevision {
	return {
		...toSummary(r),
		sourceIssued: dateText(r.source_issued),
		sourceExpires: dateText(r.source_expires),
		indicative: Boolean(r.indicative),
		notes: r.notes,
		verifiedBy: r.verified_by ? { id: r.verified_by, name: r.verifier_name, email: r.verifier_email } : null,
		verifiedAt: r.verified_at ? new Date(r.verified_at).toISOString() : null,
		createdBy: r.created_by ? { id: r.created_by, name: r.creator_name, email: r.creator_email } : null,
		createdAt: new Date(r.created_at).toISOString()
	};
}

/** Revisions joined with their material's code and the people who wrote and verified them. */
function revisionQuery(k: Db, organisationId: string) {
	return k('material_revisions as r')
		.join('materials as m', 'm.id', 'r.material_id')
		.leftJoin('users as cu', 'cu.id', 'r.created_by')
		.leftJoin('users as vu', 'vu.id', 'r.verified_by')
		.where('r.organisation_id', organisationId)
		.andWhere('m.organisation_id', organisationId)
		.select(
			'r.*',
			'm.code',
			'cu.name as creator_name',
			'cu.email as creator_email',
			'vu.name as verifier_name',
			'vu.email as verifier_email'
		);
}

const SORT_COLUMNS: Record<string, string[]> = {
	code: ['m.code'],
	name: ['r.name', 'm.code'],
	category: ['r.category', 'm.code'],
	lambda: ['r.lambda', 'm.code'],
	updated: ['r.created_at', 'm.code']
};

/** The library list: search over code, name, manufacturer and source; filters; sort; one page. */
export async function listMaterials(
	organisationId: string,
	query: ListQuery
): Promise<{ items: MaterialSummary[]; total: number; page: number; pageSize: number }> {
	const base = db('materials as m')
		.join('material_revisions as r', 'r.id', 'm.current_revision_id')
		.where('m.organisation_id', organisationId);
	if (query.q) {
		const like = containsPattern(query.q);
		base.andWhere((w) =>
			w
				.whereILike('m.code', like)
				.orWhereILike('r.name', like)
				.orWhereILike('r.manufacturer', like)
				.orWhereILike('r.source', like)
		);
	}
	if (query.category) base.andWhere('r.category', query.category);
	if (query.status) base.andWhere('r.status', query.status);
	const [{ count }] = await base.clone().count<{ count: number }[]>({ count: '*' });
	const desc = query.sort.startsWith('-');
	const cols = SORT_COLUMNS[query.sort.replace(/^-/, '')] ?? SORT_COLUMNS.code;
	const rows = base
		.clone()
		.select('r.*', 'm.code', 'm.id as material_id')
		.limit(query.pageSize)
		.offset((query.page - 1) * query.pageSize);
	cols.forEach((c, i) => rows.orderBy(c, i === 0 && desc ? 'desc' : 'asc', 'last'));
	return {
		items: (await rows).map(toSummary),
		total: Number(count),
		page: query.page,
		pageSize: query.pageSize
	};
}

/** One revision, by id, in the organisation; null when there is none. */
export async function getRevision(
	organisationId: string,
	revisionId: string
): Promise<MaterialRevision | null> {
	const row = await revisionQuery(db, organisationId).andWhere('r.id', revisionId).first();
	return row ? toRevision(row) : null;
}

/** The current revision of a material in the organisation; null when there is none. */
export async function getCurrentRevision(
	organisationId: string,
	materialId: string
): Promise<MaterialRevision | null> {
	const row = await revisionQuery(db, organisationId)
		.andWhere('m.id', materialId)
		.andWhereRaw('r.id = m.current_revision_id')
		.first();
	return row ? toRevision(row) : null;
}

/** A material with its current revision's values and every revision, newest first. */
export async function getMaterial(
	organisationId: string,
	materialId: string
): Promise<(MaterialRevision & { revisions: MaterialRevision[] }) | null> {
	const rows = await revisionQuery(db, organisationId)
		.andWhere('m.id', materialId)
		.select('m.current_revision_id')
		.orderBy('r.revision', 'desc');
	if (rows.length === 0) return null;
	const current = rows.find((r) => r.id === r.current_revision_id) ?? rows[0];
	return { ...toRevision(current), revisions: rows.map(toRevision) };
}

/** The current revision of each of the given codes (for the import), keyed by code. */
export async function currentByCodes(
	k: Db,
	organisationId: string,
	codes: string[]
): Promise<
	Map<
		string,
		{ materialId: string; revisionId: string; revision: number; status: string; values: MaterialValues }
	>
> {
	const out = new Map<
		string,
		{ materialId: string; revisionId: string; revision: number; status: string; values: MaterialValues }
	>();
	if (codes.length === 0) return out;
	// One array parameter, however many codes: no statement with thousands of bindings, and a plan that
	// uses the (organisation_id, code) index.
	const { rows } = await k.raw(
		`SELECT r.*, m.code FROM materials m JOIN material_revisions r ON r.id = m.current_revision_id
		 WHERE m.organisation_id = ? AND m.code = ANY(?::text[])`,
		[organisationId, codes]
	);
	for (const r of rows) {
		out.set(r.code, {
			materialId: r.material_id,
			revisionId: r.id,
			revision: r.revision,
			status: r.status,
			values: valuesOfRow(r)
		});
	}
	return out;
}

/** What an import compares a code by: its current revision and that revision's status. */
export const revisionState = (revisionId: string, status: string) => `${revisionId}:${status}`;

/** The state (`revisionState`) of each of these codes that exists in the organisation's library. */
export async function currentRevisionStates(
	k: Db,
	organisationId: string,
	codes: string[]
): Promise<Map<string, string>> {
	const out = new Map<string, string>();
	if (codes.length === 0) return out;
	const { rows } = await k.raw(
		`SELECT m.code, r.id, r.status FROM materials m JOIN material_revisions r ON r.id = m.current_revision_id
		 WHERE m.organisation_id = ? AND m.code = ANY(?::text[])`,
		[organisationId, codes]
	);
	for (const r of rows) out.set(r.code, revisionState(r.id, r.status));
	return out;
}

const REVISION_COPY_COLUMNS = [
	'id',
	'organisation_id',
	'material_id',
	'revision',
	...REVISION_FIELDS.map((f) => FIELD_COLUMNS[f]),
	'status',
	'created_by'
];

const COPY_SPECIAL = /[\\\t\n\r]/;
const COPY_ESCAPES: Record<string, string> = { '\\': '\\\\', '\t': '\\t', '\n': '\\n', '\r': '\\r' };

/** One value in PostgreSQL's COPY text format: \N for null, backslash escapes for the rest. */
function copyValue(v: unknown): string {
	if (v === null || v === undefined) return '\\N';
	switch (typeof v) {
		case 'string':
			return COPY_SPECIAL.test(v) ? v.replace(/[\\\t\n\r]/g, (c) => COPY_ESCAPES[c]) : v;
		case 'number':
			return String(v);
		case 'boolean':
			return v ? 't' : 'f';
		default:
			return copyValue(String(v));
	}
}

/** A revision as one COPY line (without its line end), in REVISION_COPY_COLUMNS order. */
function revisionLine(
	id: string,
	organisationId: string,
	materialId: string,
	revision: number,
	v: MaterialValues,
	createdBy: string
): string {
	const cells = [id, organisationId, materialId, String(revision)];
	for (const f of REVISION_FIELDS) {
		const value =
			f === 'manufacturer'
				? v.manufacturer || 'generic'
				: f === 'indicative'
					? Boolean(v.indicative)
					: v[f] === ''
						? null
						: v[f];
		cells.push(copyValue(value));
	}
	cells.push('unverified', createdBy);
	return cells.join('\t');
}

/**
 * Bulk-write rows with COPY … FROM STDIN on the transaction's own connection: the quickest way into
 * PostgreSQL, with every constraint and trigger still checked. `lines` are COPY text lines, without
 * their line ends.
 */
async function copyInto(
	trx: Db,
	table: 'materials' | 'material_revisions',
	columns: string[],
	lines: string[]
) {
	if (lines.length === 0) return;
	if (!(trx as { isTransaction?: boolean }).isTransaction) {
		await trx.transaction((t) => copyInto(t, table, columns, lines));
		return;
	}
	// The foreign-key checks PostgreSQL runs per row use plans it cached on this connection, perhaps when
	// the tables were small (a sequential scan then looks cheapest). Kept for a large batch, such a plan
	// makes the checks quadratic: seconds instead of a fraction of one for an empty library's first
	// import. Dropping the cached plans lets them be made again for the tables as they now are.
	if (lines.length >= 500) await trx.raw('DISCARD PLANS');
	const connection = (await trx.client.acquireConnection()) as pg.ClientBase;
	const cols = columns.map((c) => `"${c}"`).join(', ');
	const sink = connection.query(copyFrom(`COPY ${table} (${cols}) FROM STDIN`));
	async function* batches() {
		for (let i = 0; i < lines.length; i += 1000) yield lines.slice(i, i + 1000).join('\n') + '\n';
	}
	await pipeline(Readable.from(batches()), sink);
}

/** Insert new materials with their first revision; returns the ids by code. Caller owns the transaction. */
export async function insertNewMaterials(
	trx: Db,
	actor: Actor,
	items: MaterialValues[]
): Promise<Map<string, { materialId: string; revisionId: string }>> {
	const out = new Map<string, { materialId: string; revisionId: string }>();
	const mats: string[] = [];
	const revs: string[] = [];
	for (const v of items) {
		const materialId = randomUUID();
		const revisionId = randomUUID();
		// materials.current_revision_id is checked at commit (deferred), so both rows go in at once.
		mats.push(`${materialId}\t${actor.organisationId}\t${copyValue(v.code)}\t${revisionId}`);
		revs.push(revisionLine(revisionId, actor.organisationId, materialId, 1, v, actor.userId));
		out.set(v.code, { materialId, revisionId });
	}
	await copyInto(trx, 'materials', ['id', 'organisation_id', 'code', 'current_revision_id'], mats);
	await copyInto(trx, 'material_revisions', REVISION_COPY_COLUMNS, revs);
	return out;
}

/**
 * Write a new revision for each given material (values changed): the previous current revision becomes
 * superseded and the material points at the new one. Caller owns the transaction.
 */
export async function insertNewRevisions(
	trx: Db,
	actor: Actor,
	items: { materialId: string; previousRevisionId: string; revision: number; values: MaterialValues }[]
): Promise<{ materialId: string; revisionId: string }[]> {
	const out: { materialId: string; revisionId: string }[] = [];
	if (items.length === 0) return out;
	const lines: string[] = [];
	for (const it of items) {
		const revisionId = randomUUID();
		lines.push(
			revisionLine(revisionId, actor.organisationId, it.materialId, it.revision + 1, it.values, actor.userId)
		);
		out.push({ materialId: it.materialId, revisionId });
	}
	await copyInto(trx, 'material_revisions', REVISION_COPY_COLUMNS, lines);
	await trx.raw(
		`UPDATE material_revisions SET status = 'superseded'
		 WHERE organisation_id = ? AND status <> 'superseded'
		   AND id IN (SELECT (jsonb_array_elements_text(?::jsonb))::uuid)`,
		[actor.organisationId, JSON.stringify(items.map((c) => c.previousRevisionId))]
	);
	await trx.raw(
		`UPDATE materials AS m SET current_revision_id = v.current_revision_id, updated_at = now()
		 FROM json_populate_recordset(NULL::materials, ?::json) AS v
		 WHERE m.id = v.id AND m.organisation_id = ?`,
		[
			JSON.stringify(out.map((r) => ({ id: r.materialId, current_revision_id: r.revisionId }))),
			actor.organisationId
		]
	);
	return out;
}

/** Validate values for a form or the API: field issues refuse, warnings need confirming. */
export function checkValues(raw: unknown, confirmWarnings: boolean): MaterialValues {
	const parsed = materialValuesSchema.safeParse(raw);
	if (!parsed.success)
		throw new ValidationError(materialIssues(parsed.error), 'Some values are not right.', { warnings: [] });
	const warnings = plausibilityWarnings(parsed.data);
	if (warnings.length > 0 && !confirmWarnings) {
		throw new ValidationError(
			[],
			'Some values are unusual: check them and confirm.',
			{ warnings: warnings.map(asMaterialIssue) },
			422
		);
	}
	return parsed.data;
}

/** Add a material to the library (its first revision, unverified). */
export async function createMaterial(
	actor: Actor,
	raw: MaterialValuesInput | unknown,
	opts: { confirmWarnings?: boolean } = {}
): Promise<MaterialRevision> {
	const values = checkValues(raw, Boolean(opts.confirmWarnings));
	const taken = () =>
		new ConflictError(`The code ${values.code} is already in the library.`, {
			issues: [asMaterialIssue({ field: 'code', message: 'is already in the library' })]
		});
	const materialId = await db.transaction(async (trx) => {
		const exists = await trx('materials')
			.where({ organisation_id: actor.organisationId, code: values.code })
			.first('id');
		if (exists) throw taken();
		// Someone else (an import, another form) may add the same code meanwhile: the unique key decides.
		const ids = await insertNewMaterials(trx, actor, [values]).catch(
			(e: { code?: string; constraint?: string }) => {
				if (e?.code === '23505' && e.constraint === 'materials_organisation_id_code_unique') throw taken();
				throw e;
			}
		);
		const id = ids.get(values.code)!;
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'create',
				entity: 'material',
				entityId: id.materialId,
				details: { code: values.code, revisionId: id.revisionId }
			},
			trx
		);
		return id.materialId;
	});
	return (await getCurrentRevision(actor.organisationId, materialId))!;
}

/**
 * Change a material's values: a new revision when anything differs (the code stays), nothing when all
 * is the same. `expectedRevisionId` refuses the change when someone else wrote a revision meanwhile.
 */
export async function updateMaterial(
	actor: Actor,
	materialId: string,
	raw: unknown,
	opts: { confirmWarnings?: boolean; expectedRevisionId?: string } = {}
): Promise<{ outcome: 'changed' | 'unchanged'; changes: FieldChange[]; material: MaterialRevision }> {
	const current = await getCurrentRevision(actor.organisationId, materialId);
	if (!current) throw new NotFoundError('No such material.');
	const values = checkValues({ ...(raw as object), code: current.code }, Boolean(opts.confirmWarnings));
	const result = await db.transaction(async (trx) => {
		const locked = await trx('materials')
			.where({ id: materialId, organisation_id: actor.organisationId })
			.forUpdate()
			.first('current_revision_id');
		const rev = await trx('material_revisions').where({ id: locked.current_revision_id }).first();
		if (opts.expectedRevisionId && opts.expectedRevisionId !== rev.id) {
			throw new ConflictError(
				'Someone changed this material meanwhile; reload it and make your change again.'
			);
		}
		const changes = diffValues(valuesOfRow(rev), values);
		if (changes.length === 0) return { outcome: 'unchanged' as const, changes };
		const [written] = await insertNewRevisions(trx, actor, [
			{ materialId, previousRevisionId: rev.id, revision: rev.revision, values }
		]);
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'revise',
				entity: 'material',
				entityId: materialId,
				details: { code: current.code, fromRevisionId: rev.id, toRevisionId: written.revisionId, changes }
			},
			trx
		);
		return { outcome: 'changed' as const, changes };
	});
	return { ...result, material: (await getCurrentRevision(actor.organisationId, materialId))! };
}

/**
 * Verify or supersede the current revision of a material (supervisors and admins; the caller checks
 * the role). Nobody verifies a revision they wrote themselves.
 */
export async function setMaterialStatus(
	actor: Actor,
	materialId: string,
	action: 'verify' | 'supersede',
	expectedRevisionId?: string
): Promise<MaterialRevision> {
	await db.transaction(async (trx) => {
		const m = await trx('materials')
			.where({ id: materialId, organisation_id: actor.organisationId })
			.forUpdate()
			.first('current_revision_id', 'code');
		if (!m) throw new NotFoundError('No such material.');
		const rev = await trx('material_revisions').where({ id: m.current_revision_id }).first();
		if (expectedRevisionId && expectedRevisionId !== rev.id) {
			throw new ConflictError('A newer revision was written meanwhile; reload and check it before you act.');
		}
		if (action === 'verify') {
			if (rev.status !== 'unverified')
				throw new ConflictError(
					`Revision ${rev.revision} is ${rev.status}; only an unverified revision can be verified.`
				);
			if (rev.created_by === actor.userId) {
				throw new ForbiddenError(
					'You wrote this revision: someone else checks it against its source and verifies it.'
				);
			}
			await trx('material_revisions')
				.where({ id: rev.id })
				.update({ status: 'verified', verified_by: actor.userId, verified_at: trx.fn.now() });
		} else {
			if (rev.status === 'superseded')
				throw new ConflictError(`Revision ${rev.revision} is already superseded.`);
			await trx('material_revisions').where({ id: rev.id }).update({ status: 'superseded' });
		}
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action,
				entity: 'material',
				entityId: materialId,
				details: { code: m.code, revisionId: rev.id, revision: rev.revision }
			},
			trx
		);
	});
	return (await getCurrentRevision(actor.organisationId, materialId))!;
}

export type BulkVerifyOutcome = {
	verified: { revisionId: string; materialId: string; code: string; revision: number }[];
	/** revisions left as they were, each with the reason */
	skipped: { revisionId: string; code: string | null; reason: string }[];
};

/**
 * Verify several current revisions at once (supervisors and admins; the caller checks the role), in one
 * transaction. The same rules as one at a time: only an unverified current revision, never by its author;
 * a revision that breaks a rule is left as it was and listed with its reason, the others are verified.
 * Each verification is logged as a single one is.
 */
export async function verifyMaterials(actor: Actor, revisionIds: string[]): Promise<BulkVerifyOutcome> {
	return db.transaction(async (trx) => {
		const rows = await trx('material_revisions as r')
			.join('materials as m', 'm.id', 'r.material_id')
			.where('r.organisation_id', actor.organisationId)
			.whereIn('r.id', revisionIds)
			.orderBy('m.code')
			.forUpdate()
			.select(
				'r.id',
				'r.status',
				'r.created_by',
				'r.revision',
				'm.id as material_id',
				'm.code',
				'm.current_revision_id'
			);
		const byId = new Map(rows.map((r) => [r.id as string, r]));
		const out: BulkVerifyOutcome = { verified: [], skipped: [] };
		for (const id of [...new Set(revisionIds)]) {
			const r = byId.get(id);
			const skip = (reason: string) => out.skipped.push({ revisionId: id, code: r?.code ?? null, reason });
			if (!r) skip('no such revision in this library');
			else if (r.current_revision_id !== r.id)
				skip(`revision ${r.revision} is no longer current: a newer one was written; check that one`);
			else if (r.status !== 'unverified') skip(`revision ${r.revision} is already ${r.status}`);
			else if (r.created_by === actor.userId)
				skip('you wrote this revision: someone else checks it against its source and verifies it');
			else {
				await trx('material_revisions')
					.where({ id })
					.update({ status: 'verified', verified_by: actor.userId, verified_at: trx.fn.now() });
				await logActivity(
					{
						organisationId: actor.organisationId,
						userId: actor.userId,
						action: 'verify',
						entity: 'material',
						entityId: r.material_id,
						details: { code: r.code, revisionId: id, revision: r.revision, bulk: true }
					},
					trx
				);
				out.verified.push({ revisionId: id, materialId: r.material_id, code: r.code, revision: r.revision });
			}
		}
		return out;
	});
}

export type ElementUse = {
	id: string;
	name: string;
	kind: string;
	dwellingId: string;
	dwellingReference: string;
	layers: { layerIndex: number; revisionId: string | null; revision: number | null }[];
	outdated: boolean;
};

/** The elements of the organisation whose build-up has a layer from this material. */
export async function listElementsUsingMaterial(
	organisationId: string,
	materialId: string
): Promise<ElementUse[]> {
	const rows = await db('elements as e')
		.join('dwellings as d', 'd.id', 'e.dwelling_id')
		.where('e.organisation_id', organisationId)
		.andWhere('d.organisation_id', organisationId)
		.andWhereRaw(`e.build_up -> 'layers' @> ?::jsonb`, [JSON.stringify([{ materialId }])])
		.orderBy([{ column: 'd.reference' }, { column: 'e.position' }])
		.select('e.id', 'e.name', 'e.kind', 'e.build_up', 'd.id as dwelling_id', 'd.reference');
	const m = await db('materials')
		.where({ id: materialId, organisation_id: organisationId })
		.first('current_revision_id');
	const revIds = new Set<string>();
	for (const r of rows)
		for (const l of r.build_up.layers)
			if (l.materialId === materialId && l.materialRevisionId) revIds.add(l.materialRevisionId);
	const revs = revIds.size
		? await db('material_revisions')
				.where('organisation_id', organisationId)
				.whereIn('id', [...revIds])
				.select('id', 'revision')
		: [];
	const revNo = new Map(revs.map((r) => [r.id, r.revision as number]));
	return rows.map((r) => {
		const layers = (r.build_up.layers as { materialId?: string; materialRevisionId?: string }[])
			.map((l, layerIndex) => ({ l, layerIndex }))
			.filter(({ l }) => l.materialId === materialId)
			.map(({ l, layerIndex }) => ({
				layerIndex,
				revisionId: l.materialRevisionId ?? null,
				revision: l.materialRevisionId ? (revNo.get(l.materialRevisionId) ?? null) : null
			}));
		return {
			id: r.id,
			name: r.name,
			kind: r.kind,
			dwellingId: r.dwelling_id,
			dwellingReference: r.reference,
			layers,
			outdated: layers.some((l) => l.revisionId !== m?.current_revision_id)
		};
	});
}

function layerValues(r: RevisionWithCode): LayerValues {
	return {
		id: r.id,
		revision: r.revision,
		code: r.code,
		name: r.name,
		lambda: r.lambda,
		resistance: r.resistance,
		muDry: r.mu_dry,
		sd: r.sd
	};
}

/**
 * For each layer of a build-up that points at a material revision with a newer one in the library:
 * what would change. Layers of other organisations' materials are ignored (never revealed).
 */
export async function findNewerRevisions(
	organisationId: string,
	buildUp: BuildUpLike | null | undefined
): Promise<RevisionUpdate[]> {
	const layers = (buildUp?.layers ?? [])
		.map((l, layerIndex) => ({ l, layerIndex }))
		.filter(({ l }) => typeof l.materialId === 'string' && typeof l.materialRevisionId === 'string');
	if (layers.length === 0) return [];
	const uuid = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
	const ids = [...new Set(layers.flatMap(({ l }) => [l.materialRevisionId!]))].filter((s) => uuid.test(s));
	const matIds = [...new Set(layers.map(({ l }) => l.materialId!))].filter((s) => uuid.test(s));
	if (matIds.length === 0) return [];
	const currents = await revisionQuery(db, organisationId)
		.whereIn('m.id', matIds)
		.andWhereRaw('r.id = m.current_revision_id');
	const froms = ids.length ? await revisionQuery(db, organisationId).whereIn('r.id', ids) : [];
	const currentByMat = new Map(currents.map((r) => [r.material_id, r]));
	const fromById = new Map(froms.map((r) => [r.id, r]));
	const out: RevisionUpdate[] = [];
	for (const { l, layerIndex } of layers) {
		const cur = currentByMat.get(l.materialId!);
		const from = fromById.get(l.materialRevisionId!);
		if (!cur || !from || from.material_id !== cur.material_id) continue;
		if (cur.id === from.id || cur.revision <= from.revision) continue;
		out.push({
			layerIndex,
			materialId: cur.material_id,
			fromRevisionId: from.id,
			toRevisionId: cur.id,
			fromRevision: from.revision,
			toRevision: cur.revision,
			changes: diffValues(valuesOfRow(from), valuesOfRow(cur)),
			to: layerValues(cur)
		});
	}
	return out;
}

/** Every current revision of the organisation in code order, for the export. */
export async function listAllCurrent(organisationId: string): Promise<MaterialValues[]> {
	const rows = await db('materials as m')
		.join('material_revisions as r', 'r.id', 'm.current_revision_id')
		.where('m.organisation_id', organisationId)
		.orderBy('m.code')
		.select('r.*', 'm.code');
	return rows.map(valuesOfRow);
}
