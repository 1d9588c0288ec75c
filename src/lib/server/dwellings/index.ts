import { containsPattern, db, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import {
	dwellingCopySchema,
	dwellingFieldsSchema,
	dwellingListQuerySchema,
	dwellingUpdateSchema,
	reopenSchema,
	type DwellingListQuery
} from '$lib/dwellings/schema';
import {
	ConflictError,
	ForbiddenError,
	NotFoundError,
	ValidationError,
	assertVersion,
	uniqueViolationAs,
	type FieldIssue
} from '$lib/server/errors';
import { fieldIssues } from '$lib/validation';
import { DWELLING_STATUS_LABELS, type DwellingStatus } from '$lib/dwellings/kinds';
import { summariseElements, type ElementSummaryRow } from '$lib/dwellings/summary';
import { listElementSummaries, toElementBrief } from './elements';
import { getClimateBrief, toClimateBrief, type ClimateBrief } from '$lib/server/climates';
import {
	applicableLimitTableSql,
	getApplicableLimitTable,
	toLimitTableBrief,
	type LimitTableBrief
} from '$lib/server/limit-tables';
import { assertChangeable, lockDwelling } from './locks';
import { refreshIssueChanges } from '$lib/server/reports/changes';
import { ASSESSOR_ROLES, reassignRefusal } from '$lib/dwellings/rules';

/** Roles that create and change dwellings and elements; supervisors read only. */
export const WRITE_ROLES = ['assessor', 'admin'] as const;

/* ------------------------------------------------------------ reads */

const SORT_COLUMNS: Record<DwellingListQuery['sort'], string> = {
	reference: 'd.reference',
	address: 'd.address',
	status: 'd.status',
	updated: 'd.updated_at',
	assessor: 'u.name'
};

/** A page of the organisation's dwellings, searched by reference, address, programme and client. */
export async function listDwellings(organisationId: string, rawQuery: unknown): Promise<DwellingPage> {
	const parsed = dwellingListQuerySchema.safeParse(rawQuery ?? {});
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const q = parsed.data;
	const base = db('dwellings as d')
		.leftJoin('users as u', 'u.id', 'd.assessor_id')
		.where('d.organisation_id', organisationId);
	if (q.q) {
		const like = containsPattern(q.q);
		base.andWhere((w) =>
			w
				.whereILike('d.reference', like)
				.orWhereILike('d.address', like)
				.orWhereILike('d.programme', like)
				.orWhereILike('d.client_name', like)
		);
	}
	if (q.status === 'active') base.andWhereNot('d.status', 'archived');
	else if (q.status && q.status !== 'all') base.andWhere('d.status', q.status);
	if (q.assessorId) base.andWhere('d.assessor_id', q.assessorId);
	if (q.changed) base.andWhere('d.issue_changes', '>', 0);

	const [{ n }] = await base.clone().count({ n: '*' });
	// The page's ids first, in order (an index serves the order; nothing but the ids is sorted), then the
	// rows, their assessor and their element count for those ids only.
	const ids: string[] = (
		await base
			.clone()
			.select('d.id')
			.orderByRaw(`${SORT_COLUMNS[q.sort]} ${q.dir} NULLS LAST, d.reference ASC`)
			.limit(q.pageSize)
			.offset((q.page - 1) * q.pageSize)
	).map((r) => r.id as string);
	const found = ids.length
		? await db('dwellings as d')
				.leftJoin('users as u', 'u.id', 'd.assessor_id')
				.where('d.organisation_id', organisationId)
				.whereIn('d.id', ids)
				.select(
					'd.*',
					'u.name as assessor_name',
					'u.email as assessor_email',
					db.raw(
						'(SELECT count(*) FROM elements e WHERE e.dwelling_id = d.id AND e.organisation_id = d.organisation_id) AS element_count'
					)
				)
		: [];
	const byId = new Map(found.map((r) => [r.id as string, r]));
	const rows = ids.map((id) => byId.get(id)).filter((r) => r !== undefined);
	return {
		items: rows.map((r) => ({ ...toDwelling(r), elementCount: Number(r.element_count) })),
		total: Number(n),
		page: q.page,
		pageSize: q.pageSize
	};
}

export async function getDwelling(
	organisationId: string,
	id: string,
	trx: Db = db
): Promise<Dwelling | null> {
	const row = await trx('dwellings as d')
		.leftJoin('users as u', 'u.id', 'd.assessor_id')
		.where({ 'd.organisation_id': organisationId, 'd.id': id })
		.first('d.*', 'u.name as assessor_name', 'u.email as assessor_email');
	return row ? toDwelling(row) : null;
}

/** The dwelling with its elements, limit table, climate and fabric totals (ΣU·A, area-weighted U). */
export async function getDwellingOverview(
	organisationId: string,
	id: string
): Promise<DwellingOverview | null> {
	const dwelling = await getDwelling(organisationId, id);
	if (!dwelling) return null;
	const [elements, limitTable, climate] = await Promise.all([
		listElementSummaries(organisationId, id),
		getApplicableLimitTable(organisationId, dwelling.limitTableId),
		dwelling.climateId ? getClimateBrief(organisationId, dwelling.climateId) : Promise.resolve(null)
	]);
	const { rows, totals } = summariseElements(elements, limitTable?.limits ?? null);
	return { dwelling, elements: rows, totals, limitTable, climate };
}

/** The supervisor's latest return of the dwelling for correction (comment, who, when, which batch), or null. */
export async function getReturnNote(organisationId: string, dwellingId: string, trx: Db = db) {
	const row = await trx('audit_items as i')
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.leftJoin('users as u', 'u.id', 'i.decided_by')
		.where({ 'i.organisation_id': organisationId, 'i.dwelling_id': dwellingId, 'i.decision': 'returned' })
		.orderBy('i.decided_at', 'desc')
		.first(
			'i.id',
			'i.batch_id',
			'i.comment',
			'i.decided_at',
			'b.name as batch_name',
			'u.name as decided_by_name',
			'u.email as decided_by_email'
		);
	if (!row) return null;
	return {
		itemId: row.id as string,
		batchId: row.batch_id as string,
		batchName: row.batch_name as string,
		comment: (row.comment ?? '') as string,
		decidedByName: ((row.decided_by_name ?? row.decided_by_email) as string | null) ?? null,
		decidedAt: row.decided_at ? new Date(row.decided_at).toISOString() : null
	};
}
export type ReturnNote = NonNullable<Awaited<ReturnType<typeof getReturnNote>>>;

/**
 * Everything the dwelling page shows, in one round trip to PostgreSQL: the same answer as
 * {@link getDwellingOverview} plus {@link listDwellingOptions}, read by one statement of sub-selects
 * (the page is opened often; eight queries cost more than the page itself). Null when the dwelling is
 * not the organisation's.
 */
export async function getDwellingPage(
	organisationId: string,
	id: string
): Promise<(DwellingOverview & { options: Awaited<ReturnType<typeof listDwellingOptions>> }) | null> {
	const { rows } = await db.raw(
		`WITH d AS (
			SELECT d.*, u.name AS assessor_name, u.email AS assessor_email
			FROM dwellings d LEFT JOIN users u ON u.id = d.assessor_id
			WHERE d.organisation_id = :org AND d.id = :id
		)
		SELECT
			(SELECT to_jsonb(d) FROM d) AS dwelling,
			(SELECT coalesce(jsonb_agg(e ORDER BY e.position, e.created_at), '[]'::jsonb) FROM (
				SELECT x.id, x.position, x.name, x.kind, x.area, x.heat_flow, x.given_u, x.engine_version,
					x.version, x.updated_at, x.created_at,
					-- the stored result's headline figures, kept as generated columns: no result is read
					x.result_u_value AS u_value,
					x.result_u_rounded AS u_value_rounded,
					x.result_moisture AS moisture,
					x.result_surface_pass AS surface_pass
				FROM elements x, d
				WHERE x.organisation_id = :org AND x.dwelling_id = d.id
			) e) AS elements,
			(SELECT to_jsonb(t) FROM limit_tables t, d
				WHERE t.organisation_id = :org
					AND ${applicableLimitTableSql('d', 't')}
				LIMIT 1) AS limit_table,
			(SELECT jsonb_build_object('id', c.id, 'name', c.name, 'source', c.source,
					'illustrative', c.illustrative, 'months', c.months)
				FROM climates c, d WHERE c.organisation_id = :org AND c.id = d.climate_id) AS climate,
			(SELECT coalesce(jsonb_agg(jsonb_build_object('id', c.id, 'name', c.name, 'illustrative', c.illustrative)
					ORDER BY c.name), '[]'::jsonb)
				FROM climates c WHERE c.organisation_id = :org AND EXISTS (SELECT 1 FROM d)) AS climates,
			(SELECT coalesce(jsonb_agg(jsonb_build_object('id', t.id, 'name', t.name, 'edition', t.edition,
					'is_default', t.is_default) ORDER BY t.name), '[]'::jsonb)
				FROM limit_tables t WHERE t.organisation_id = :org AND EXISTS (SELECT 1 FROM d)) AS limit_tables,
			(SELECT coalesce(jsonb_agg(jsonb_build_object('id', u.id, 'name', u.name, 'email', u.email)
					ORDER BY u.name), '[]'::jsonb)
				FROM memberships m JOIN users u ON u.id = m.user_id
				WHERE m.organisation_id = :org AND m.role IN ('assessor', 'admin') AND EXISTS (SELECT 1 FROM d)) AS assessors`,
		{ org: organisationId, id }
	);
	const r = rows[0] as Record<string, unknown> | undefined;
	if (!r || !r.dwelling) return null;
	const dwelling = toDwelling(r.dwelling as Record<string, unknown>);
	const t = r.limit_table as Record<string, unknown> | null;
	const limitTable: LimitTableBrief | null = t ? toLimitTableBrief(t, Boolean(dwelling.limitTableId)) : null;
	const c = r.climate as Record<string, unknown> | null;
	const climate: ClimateBrief | null = c ? toClimateBrief(c) : null;
	const briefs = (r.elements as Record<string, unknown>[]).map(toElementBrief);
	const { rows: elements, totals } = summariseElements(briefs, limitTable?.limits ?? null);
	const options = {
		climates: (r.climates as Record<string, unknown>[]).map(climateOption),
		limitTables: (r.limit_tables as Record<string, unknown>[]).map(limitTableOption),
		assessors: (r.assessors as Record<string, unknown>[]).map(assessorOption)
	};
	return { dwelling, elements, totals, limitTable, climate, options };
}

/* The choices of the dwelling form, from their rows (also as read inside a JSON aggregate). */
const climateOption = (x: Record<string, unknown>) => ({
	id: x.id as string,
	name: x.name as string,
	illustrative: Boolean(x.illustrative)
});
const limitTableOption = (x: Record<string, unknown>) => ({
	id: x.id as string,
	name: `${x.name} (${x.edition})`,
	isDefault: Boolean(x.is_default)
});
const assessorOption = (x: Record<string, unknown>) => ({
	id: x.id as string,
	name: (x.name ?? x.email) as string,
	email: x.email as string
});

/** Members of the organisation who can be named as the dwelling's assessor. */
export async function listAssessors(organisationId: string) {
	const rows = await db('memberships as m')
		.join('users as u', 'u.id', 'm.user_id')
		.where('m.organisation_id', organisationId)
		.whereIn('m.role', ['assessor', 'admin'])
		.orderBy('u.name')
		.select('u.id', 'u.name', 'u.email', 'm.role');
	return rows.map(assessorOption);
}

/** Options for the dwelling form: climates and limit tables of the organisation. */
export async function listDwellingOptions(organisationId: string) {
	const [climates, limitTables, assessors] = await Promise.all([
		db('climates')
			.where('organisation_id', organisationId)
			.orderBy('name')
			.select('id', 'name', 'illustrative'),
		db('limit_tables')
			.where('organisation_id', organisationId)
			.orderBy('name')
			.select('id', 'name', 'edition', 'is_default'),
		listAssessors(organisationId)
	]);
	return {
		climates: climates.map(climateOption),
		limitTables: limitTables.map(limitTableOption),
		assessors
	};
}

/* ------------------------------------------------------------ writes */

async function checkReferences(
	organisationId: string,
	data: { assessorId?: string | null; limitTableId?: string | null; climateId?: string | null },
	trx: Db
) {
	const issues: FieldIssue[] = [];
	if (data.assessorId) {
		const m = await trx('memberships')
			.where({ organisation_id: organisationId, user_id: data.assessorId })
			.first('role');
		if (!m) issues.push({ path: 'assessorId', message: 'is not a member of your organisation' });
		else if (!ASSESSOR_ROLES.includes(m.role))
			issues.push({
				path: 'assessorId',
				message: `is a ${m.role}: a dwelling’s assessor is an assessor or an admin of your organisation`
			});
	}
	if (data.limitTableId) {
		const t = await trx('limit_tables')
			.where({ organisation_id: organisationId, id: data.limitTableId })
			.first('id');
		if (!t) issues.push({ path: 'limitTableId', message: 'is not one of your organisation’s limit tables' });
	}
	if (data.climateId) {
		const c = await trx('climates')
			.where({ organisation_id: organisationId, id: data.climateId })
			.first('id');
		if (!c) issues.push({ path: 'climateId', message: 'is not one of your organisation’s climates' });
	}
	if (issues.length) throw new ValidationError(issues);
}

const log = activityLog('dwelling');

/** A unique violation of the reference as its refusal; any other error as it is. */
const referenceTaken = (e: unknown, reference: string) =>
	uniqueViolationAs(
		e,
		new ValidationError([
			{ path: 'reference', message: `“${reference}” is already used by another dwelling` }
		])
	);

/**
 * Create a dwelling. Its creator names its assessor (an assessor who names nobody becomes it); changing
 * the assessor afterwards follows `reassignRefusal` in `$lib/dwellings/rules`.
 */
export async function createDwelling(member: Member, raw: unknown, trx?: Db): Promise<Dwelling> {
	const parsed = dwellingFieldsSchema.safeParse(raw);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const data = parsed.data;
	const assessorId = data.assessorId ?? (member.role === 'assessor' ? member.user.id : null);
	const write = async (t: Db) => {
		await checkReferences(member.organisationId, data, t);
		try {
			const [row] = await t('dwellings')
				.insert({
					organisation_id: member.organisationId,
					reference: data.reference,
					address: data.address,
					programme: data.programme,
					client_name: data.clientName,
					client_email: data.clientEmail,
					assessor_id: assessorId,
					stage: data.stage,
					limit_table_id: data.limitTableId,
					climate_id: data.climateId,
					floor_area: data.floorArea
				})
				.returning('id');
			await log(member, 'create', row.id, { reference: data.reference, assessorId }, t);
			return (await getDwelling(member.organisationId, row.id, t)) as Dwelling;
		} catch (e) {
			throw referenceTaken(e, data.reference);
		}
	};
	return trx ? write(trx) : db.transaction(write);
}

const COLUMN: Record<string, string> = {
	reference: 'reference',
	address: 'address',
	programme: 'programme',
	clientName: 'client_name',
	clientEmail: 'client_email',
	assessorId: 'assessor_id',
	stage: 'stage',
	limitTableId: 'limit_table_id',
	climateId: 'climate_id',
	floorArea: 'floor_area'
};

/**
 * Change the dwelling's details; `version` must be the one the caller loaded (else 409). A new assessor
 * must be allowed by `reassignRefusal` (else 403) and is logged as `reassign` with before and after.
 */
export async function updateDwelling(member: Member, id: string, raw: unknown): Promise<Dwelling> {
	const parsed = dwellingUpdateSchema.safeParse(raw);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { version, ...data } = parsed.data;
	// Only the fields the caller sent: `partial()` leaves defaults out of absent keys.
	const sent = new Set(Object.keys((raw ?? {}) as object));
	return db.transaction(async (t) => {
		const current = await lockDwelling(t, member.organisationId, id);
		assertChangeable(current);
		assertVersion(current.version, version);
		// The form sends the assessor with every save: only a different one is a reassignment.
		const before = await t('dwellings').where({ organisation_id: member.organisationId, id }).first();
		const from = (before?.assessor_id as string | null) ?? null;
		const to = data.assessorId ?? null;
		const reassigning = sent.has('assessorId') && to !== from;
		if (reassigning) {
			const refusal = reassignRefusal({ userId: member.user.id, role: member.role }, from, to);
			if (refusal) throw new ForbiddenError(refusal, { issues: [{ path: 'assessorId', message: refusal }] });
		}
		await checkReferences(member.organisationId, reassigning ? data : { ...data, assessorId: undefined }, t);
		const patch: Record<string, unknown> = { version: current.version + 1, updated_at: t.fn.now() };
		const changed: string[] = [];
		const was: Record<string, unknown> = {};
		const now: Record<string, unknown> = {};
		for (const [key, value] of Object.entries(data)) {
			if (!sent.has(key) || !(key in COLUMN)) continue;
			patch[COLUMN[key]] = value;
			if ((before?.[COLUMN[key]] ?? null) === (value ?? null)) continue;
			changed.push(key);
			was[key] = before?.[COLUMN[key]] ?? null;
			now[key] = value ?? null;
		}
		try {
			await t('dwellings').where({ organisation_id: member.organisationId, id }).update(patch);
		} catch (e) {
			throw referenceTaken(e, String(data.reference));
		}
		await log(member, 'update', id, { changed, before: was, after: now }, t);
		await refreshIssueChanges(t, member.organisationId, id);
		if (reassigning) {
			const people = await personNames(t, [from, to]);
			await log(
				member,
				'reassign',
				id,
				{
					reference: current.reference,
					from: from ? { id: from, name: people.get(from) ?? null } : null,
					to: to ? { id: to, name: people.get(to) ?? null } : null
				},
				t
			);
		}
		return (await getDwelling(member.organisationId, id, t)) as Dwelling;
	});
}

/**
 * Reopen an accepted dwelling, or one awaiting review, for changes, with a reason (`REOPEN_RULE` in
 * `$lib/dwellings/rules`). The decision it reopens (the latest audit item's) is logged with the reason;
 * an accepted dwelling becomes "changed after acceptance", one awaiting review stays in its batch, marked
 * reopened, until the supervisor decides. `version` must be the one the caller loaded (else 409).
 */
export async function reopenDwelling(member: Member, id: string, raw: unknown): Promise<Dwelling> {
	const parsed = reopenSchema.safeParse(raw);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { reason, version } = parsed.data;
	return db.transaction(async (t) => {
		const current = await lockDwelling(t, member.organisationId, id);
		assertVersion(current.version, version);
		const reopenable =
			current.status === 'accepted' || (current.status === 'awaiting-review' && !current.reopenedAt);
		if (!reopenable) {
			throw new ConflictError(
				`This dwelling is ${DWELLING_STATUS_LABELS[current.status].toLowerCase()}${current.reopenedAt ? ' and already reopened' : ''}: it changes without being reopened.`
			);
		}
		const to: DwellingStatus = current.status === 'accepted' ? 'changed-after-acceptance' : current.status;
		await t('dwellings')
			.where({ organisation_id: member.organisationId, id })
			.update({
				status: to,
				reopened_at: current.status === 'awaiting-review' ? t.fn.now() : null,
				version: current.version + 1,
				updated_at: t.fn.now()
			});
		await log(
			member,
			'reopen',
			id,
			{
				reference: current.reference,
				reason,
				from: current.status,
				to,
				decision: await latestDecision(t, member.organisationId, id)
			},
			t
		);
		return (await getDwelling(member.organisationId, id, t)) as Dwelling;
	});
}

/** The decision a reopening sets aside: the dwelling's latest audit item, as it stood. */
async function latestDecision(t: Db, organisationId: string, dwellingId: string) {
	const item = await t('audit_items as i')
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.leftJoin('users as u', 'u.id', 'i.decided_by')
		.where({ 'i.organisation_id': organisationId, 'i.dwelling_id': dwellingId })
		.orderBy('i.created_at', 'desc')
		.first(
			'i.id',
			'i.batch_id',
			'b.name as batch',
			'i.decision',
			'i.comment',
			'i.decided_at',
			'u.name',
			'u.email'
		);
	if (!item) return null;
	return {
		itemId: item.id,
		batchId: item.batch_id,
		batch: item.batch,
		decision: item.decision ?? null,
		comment: item.comment ?? null,
		decidedBy: item.name ?? item.email ?? null,
		decidedAt: item.decided_at ? new Date(item.decided_at).toISOString() : null
	};
}

/** Names (else e-mail addresses) of users by id, for log entries that must read without a join. */
async function personNames(t: Db, ids: (string | null)[]): Promise<Map<string, string>> {
	const wanted = ids.filter((x): x is string => Boolean(x));
	if (!wanted.length) return new Map();
	const rows = await t('users').whereIn('id', wanted).select('id', 'name', 'email');
	return new Map(rows.map((u) => [u.id as string, (u.name ?? u.email) as string]));
}

/** Archive (or restore to draft) a dwelling; archived dwellings leave the default list and refuse edits. */
export async function setDwellingArchived(
	member: Member,
	id: string,
	archived: boolean,
	version: number
): Promise<Dwelling> {
	return db.transaction(async (t) => {
		const current = await lockDwelling(t, member.organisationId, id);
		assertVersion(current.version, version);
		if (archived === (current.status === 'archived'))
			throw new ConflictError(archived ? 'Already archived.' : 'Not archived.');
		await t('dwellings')
			.where({ organisation_id: member.organisationId, id })
			.update({
				status: archived ? 'archived' : 'draft',
				version: current.version + 1,
				updated_at: t.fn.now()
			});
		await log(member, archived ? 'archive' : 'restore', id, { reference: current.reference }, t);
		return (await getDwelling(member.organisationId, id, t)) as Dwelling;
	});
}

/** Delete a dwelling that has no issued reports and is in no audit; otherwise archive it. */
export async function deleteDwelling(member: Member, id: string, version: number): Promise<void> {
	await db.transaction(async (t) => {
		const current = await lockDwelling(t, member.organisationId, id);
		assertVersion(current.version, version);
		const [{ n: reports }] = await t('reports')
			.where({ organisation_id: member.organisationId, dwelling_id: id })
			.count({ n: '*' });
		const [{ n: audits }] = await t('audit_items')
			.where({ organisation_id: member.organisationId, dwelling_id: id })
			.count({ n: '*' });
		if (Number(reports) > 0 || Number(audits) > 0) {
			throw new ConflictError(
				'This dwelling has issued reports or audit records and cannot be deleted; archive it instead.'
			);
		}
		await t('mail_outbox')
			.where({ organisation_id: member.organisationId, dwelling_id: id })
			.update({ dwelling_id: null });
		await t('dwellings').where({ organisation_id: member.organisationId, id }).delete();
		await log(member, 'delete', id, { reference: current.reference }, t);
	});
}

/** A new draft dwelling with the same details and copies of every element (build-ups, results). */
export async function copyDwelling(member: Member, id: string, raw: unknown): Promise<Dwelling> {
	const parsed = dwellingCopySchema.safeParse(raw);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	return db.transaction(async (t) => {
		const source = await t('dwellings').where({ organisation_id: member.organisationId, id }).first();
		if (!source) throw new NotFoundError('No such dwelling.');
		const asBuilt = parsed.data.asBuilt === true;
		if (asBuilt && source.stage !== 'design') {
			throw new ValidationError([
				{ path: 'asBuilt', message: 'only a design-stage dwelling is copied as its as-built record' }
			]);
		}
		let newId: string;
		try {
			const [row] = await t('dwellings')
				.insert({
					organisation_id: member.organisationId,
					reference: parsed.data.reference,
					address: parsed.data.address ?? source.address,
					programme: source.programme,
					client_name: source.client_name,
					client_email: source.client_email,
					assessor_id: member.role === 'assessor' ? member.user.id : source.assessor_id,
					stage: asBuilt ? 'as-built' : source.stage,
					design_id: asBuilt ? source.id : null,
					limit_table_id: source.limit_table_id,
					climate_id: source.climate_id,
					floor_area: source.floor_area
				})
				.returning('id');
			newId = row.id;
		} catch (e) {
			throw referenceTaken(e, parsed.data.reference);
		}
		const elements = await t('elements')
			.where({ organisation_id: member.organisationId, dwelling_id: id })
			.orderBy('position');
		// the copies' ids are drawn first, so that the junctions can point at the copied elements
		const ids: string[] = elements.length
			? (
					await t.raw('select gen_random_uuid() as id from generate_series(1, ?::int)', [elements.length])
				).rows.map((r: { id: string }) => r.id)
			: [];
		const copyOf = new Map<string, string>(elements.map((e, i) => [e.id as string, ids[i]]));
		if (elements.length) {
			await t('elements').insert(
				elements.map((e, i) => ({
					id: ids[i],
					organisation_id: member.organisationId,
					dwelling_id: newId,
					position: e.position,
					name: e.name,
					kind: e.kind,
					area: e.area,
					heat_flow: e.heat_flow,
					build_up: e.build_up === null ? null : JSON.stringify(e.build_up),
					given_u: e.given_u,
					given_u_source: e.given_u_source,
					window_parts: e.window_parts === null ? null : JSON.stringify(e.window_parts),
					climate_id: e.climate_id,
					internal: e.internal === null ? null : JSON.stringify(e.internal),
					last_result: e.last_result === null ? null : JSON.stringify(e.last_result),
					engine_version: e.engine_version,
					design_element_id: asBuilt ? e.id : null
				}))
			);
		}
		const junctions = await copyJunctions(t, member.organisationId, id, newId, copyOf);
		await log(
			member,
			'copy',
			newId,
			{
				from: id,
				fromReference: source.reference,
				reference: parsed.data.reference,
				elements: elements.length,
				junctions,
				asBuilt
			},
			t
		);
		return (await getDwelling(member.organisationId, newId, t)) as Dwelling;
	});
}

/**
 * Copy a dwelling's junctions to its copy, in their order, each pointing at the copies of the elements
 * it was built from (`copyOf`: element id → its copy's id), its stored result kept and naming the copied
 * elements at their new versions (the same build-ups give the same model and result). The number copied.
 */
async function copyJunctions(
	t: Db,
	organisationId: string,
	fromId: string,
	toId: string,
	copyOf: Map<string, string>
): Promise<number> {
	const rows = await t('junctions')
		.where({ organisation_id: organisationId, dwelling_id: fromId })
		.orderBy([{ column: 'created_at' }, { column: 'id' }]);
	if (!rows.length) return 0;
	const copied = await t('elements')
		.where({ organisation_id: organisationId, dwelling_id: toId })
		.select('id', 'version');
	const versionOf = new Map(copied.map((e) => [e.id as string, e.version as number]));
	const mapId = (v: unknown) => (typeof v === 'string' ? (copyOf.get(v) ?? v) : v);
	const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));
	await t('junctions').insert(
		rows.map((j, i) => {
			const details = j.details
				? {
						...j.details,
						elements: Object.fromEntries(
							Object.entries(j.details.elements ?? {}).map(([k, v]) => [k, mapId(v)])
						)
					}
				: null;
			const result = j.last_result
				? {
						...j.last_result,
						...(Array.isArray(j.last_result.elements)
							? {
									elements: j.last_result.elements.map((e: { id: string; name: string }) => ({
										...e,
										id: mapId(e.id),
										version: versionOf.get(mapId(e.id) as string) ?? null
									}))
								}
							: {})
					}
				: null;
			return {
				organisation_id: organisationId,
				dwelling_id: toId,
				name: j.name,
				type: j.type,
				length_m: j.length_m,
				source: j.source,
				dimension_system: j.dimension_system,
				psi_entered: j.psi_entered,
				psi_source: j.psi_source,
				model: json(j.model),
				details: json(details),
				last_result: json(result),
				engine_version: j.engine_version,
				// one after another, so that the copy lists them in the same order
				created_at: t.raw('now() + make_interval(secs => ?)', [i / 1e6]),
				updated_at: t.fn.now()
			};
		})
	);
	return rows.length;
}

/* ------------------------------------------------------------ mapping */

function toDwelling(r: Record<string, unknown>): Dwelling {
	return {
		id: r.id as string,
		reference: r.reference as string,
		address: (r.address as string) ?? '',
		programme: (r.programme as string | null) ?? null,
		clientName: (r.client_name as string | null) ?? null,
		clientEmail: (r.client_email as string | null) ?? null,
		assessorId: (r.assessor_id as string | null) ?? null,
		assessorName: ((r.assessor_name ?? r.assessor_email) as string | null) ?? null,
		stage: r.stage as Dwelling['stage'],
		status: r.status as DwellingStatus,
		limitTableId: (r.limit_table_id as string | null) ?? null,
		climateId: (r.climate_id as string | null) ?? null,
		floorArea: r.floor_area === null || r.floor_area === undefined ? null : Number(r.floor_area),
		designId: (r.design_id as string | null) ?? null,
		issueChanges: r.issue_changes === null || r.issue_changes === undefined ? null : Number(r.issue_changes),
		reopened: Boolean(r.reopened_at),
		version: r.version as number,
		createdAt: new Date(r.created_at as string).toISOString(),
		updatedAt: new Date(r.updated_at as string).toISOString()
	};
}

export type Dwelling = {
	id: string;
	reference: string;
	address: string;
	programme: string | null;
	clientName: string | null;
	clientEmail: string | null;
	assessorId: string | null;
	assessorName: string | null;
	stage: 'design' | 'as-built';
	status: DwellingStatus;
	limitTableId: string | null;
	climateId: string | null;
	/** total floor area, m², or null until given */
	floorArea: number | null;
	/** the design-stage dwelling this as-built one was copied from */
	designId: string | null;
	/** differences from the latest issued dwelling report: null before the first issue, 0 when it matches */
	issueChanges: number | null;
	/** reopened for changes (with a reason) during the review it awaits */
	reopened: boolean;
	version: number;
	createdAt: string;
	updatedAt: string;
};
export type DwellingListItem = Dwelling & { elementCount: number };
export type DwellingPage = { items: DwellingListItem[]; total: number; page: number; pageSize: number };
export type DwellingOverview = {
	dwelling: Dwelling;
	elements: ElementSummaryRow[];
	totals: ReturnType<typeof summariseElements>['totals'];
	limitTable: LimitTableBrief | null;
	climate: ClimateBrief | null;
};

/** Climates with their months, for the element editor's live calculation. */
export async function listEditorClimates(organisationId: string) {
	const rows = await db('climates')
		.where('organisation_id', organisationId)
		.orderBy('name')
		.select('id', 'name', 'illustrative', 'months');
	return rows.map((c) => ({
		id: c.id as string,
		name: c.name as string,
		illustrative: Boolean(c.illustrative),
		months: c.months as { month: number; temperature: number; relativeHumidity: number }[]
	}));
}
