/**
 * Supervisor audits: batches of dwellings, recomputed and flagged, sampled reproducibly, decided, with
 * every step in the append-only activity log. Every query filters by the caller's organisation.
 */
import { db, type Db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import { enqueueMail } from '$lib/server/outbox';
import { appUrl } from '$lib/server/config';
import type { Member } from '$lib/server/guard';
import type { DwellingAudit } from '$lib/audit/assess';
import { sampleDwellings, newSeed, type Candidate, type SamplingRule } from '$lib/audit/sampling';
import {
	auditDwellingsWith,
	insertItems,
	markQueuedWith,
	recomputeBatchWith,
	recomputeItemWith,
	type BatchProgress,
	type BatchSource
} from './recompute';
import { FLAG_LABELS, DECISION_LABELS, type Decision, type Flag, type ItemState } from '$lib/audit/flags';
import type { BatchFilter, DecisionInput, NewBatch } from '$lib/audit/schemas';
import { type ElementKind } from '$lib/dwellings/kinds';
import {
	ConflictError,
	ForbiddenError,
	NotFoundError,
	ValidationError,
	type FieldIssue
} from '$lib/server/errors';
import { exceedsLimit } from '$lib/limit-tables/rules';
import { DECIDER_ROLES, decisionRefusal, type Involvement } from '$lib/audit/rules';
import { changesSinceIssue, type IssueChanges } from '$lib/server/reports/changes';

export type { BatchProgress, BatchSource };

export type Batch = {
	id: string;
	name: string;
	filter: BatchSource;
	sampling: SamplingRule;
	seed: string;
	status: 'open' | 'closed';
	progress: BatchProgress;
	createdBy: string;
	createdByName: string | null;
	createdAt: string;
	updatedAt: string;
	counts: { items: number; decided: number; returned: number; flagged: number; population: number };
};

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

/* ------------------------------------------------------------------ look-ups for the forms */

export async function listAssessors(organisationId: string) {
	const rows = await db('memberships as m')
		.join('users as u', 'u.id', 'm.user_id')
		.where('m.organisation_id', organisationId)
		.orderBy('u.name')
		.select('u.id', 'u.name', 'u.email', 'm.role');
	return rows.map((r) => ({
		id: r.id as string,
		name: (r.name ?? r.email) as string,
		role: r.role as string
	}));
}

export async function listProgrammes(organisationId: string): Promise<string[]> {
	const rows = await db('dwellings')
		.where({ organisation_id: organisationId })
		.whereNotNull('programme')
		.distinct('programme')
		.orderBy('programme');
	return rows.map((r) => r.programme as string);
}

/* ------------------------------------------------------------------ creating a batch */

async function resolveFilter(organisationId: string, f: BatchFilter, trx: Db): Promise<Candidate[]> {
	const q = trx('dwellings as d')
		.leftJoin('users as u', 'u.id', 'd.assessor_id')
		.where('d.organisation_id', organisationId)
		.whereNot('d.status', 'archived')
		.select('d.id', 'd.assessor_id', 'u.name as assessor_name');
	if (f.assessorId) q.andWhere('d.assessor_id', f.assessorId);
	if (f.programme) q.andWhere('d.programme', f.programme);
	if (f.statuses && f.statuses.length) q.whereIn('d.status', f.statuses);
	if (f.issuedFrom || f.issuedTo) {
		q.whereExists(function () {
			this.select(trx.raw('1'))
				.from('reports as r')
				.whereRaw('r.dwelling_id = d.id')
				.andWhere('r.organisation_id', organisationId)
				.andWhere('r.scope', 'dwelling');
			if (f.issuedFrom) this.andWhere('r.issued_at', '>=', f.issuedFrom);
			if (f.issuedTo) this.andWhereRaw(`r.issued_at < (?::date + 1)`, [f.issuedTo]);
		});
	}
	const rows = await q;
	return rows.map((r) => ({ id: r.id, assessorId: r.assessor_id, assessorName: r.assessor_name }));
}

async function resolveReferences(
	organisationId: string,
	refs: { line: number; reference: string }[],
	trx: Db
): Promise<Candidate[]> {
	const unique = [...new Set(refs.map((r) => r.reference))];
	const rows = await trx('dwellings as d')
		.leftJoin('users as u', 'u.id', 'd.assessor_id')
		.where('d.organisation_id', organisationId)
		.whereIn('d.reference', unique)
		.select('d.id', 'd.reference', 'd.assessor_id', 'u.name as assessor_name');
	const byRef = new Map(rows.map((r) => [r.reference as string, r]));
	const issues: FieldIssue[] = [];
	const seen = new Map<string, number>();
	for (const r of refs) {
		if (!byRef.has(r.reference)) {
			issues.push({
				path: 'references',
				line: r.line,
				message: `line ${r.line}: no dwelling with the reference "${r.reference}" in this organisation`
			});
		} else if (seen.has(r.reference)) {
			issues.push({
				path: 'references',
				line: r.line,
				message: `line ${r.line}: "${r.reference}" is listed twice (also on line ${seen.get(r.reference)})`
			});
		} else seen.set(r.reference, r.line);
	}
	if (issues.length) {
		throw new ValidationError(
			issues,
			`${issues.length} line${issues.length === 1 ? '' : 's'} of the reference list could not be used; nothing was created.`
		);
	}
	return rows.map((r) => ({ id: r.id, assessorId: r.assessor_id, assessorName: r.assessor_name }));
}

/**
 * The dwellings a new batch is drawn from (its population): by the reference list, every line checked,
 * or by the filter. A 400 naming the field when none match.
 */
async function resolvePopulation(
	orgId: string,
	input: NewBatch & { referenceLines?: { line: number; reference: string }[] },
	trx: Db
): Promise<Candidate[]> {
	let population: Candidate[];
	if (input.source === 'references') {
		const lines =
			input.referenceLines ??
			(input.references ?? []).map((reference, i) => ({ line: i + 1, reference: reference.trim() }));
		population = await resolveReferences(
			orgId,
			lines.filter((l) => l.reference !== ''),
			trx
		);
	} else {
		if (input.filter.assessorId) {
			const m = await trx('memberships')
				.where({ organisation_id: orgId, user_id: input.filter.assessorId })
				.first('user_id');
			if (!m)
				throw new ValidationError(
					[{ path: 'filter.assessorId', message: 'is not a member of this organisation' }],
					'The assessor is not a member of this organisation.'
				);
		}
		population = await resolveFilter(orgId, input.filter, trx);
	}
	if (population.length === 0) {
		throw new ValidationError(
			[{ path: input.source === 'references' ? 'references' : 'filter', message: 'no dwellings match' }],
			'No dwellings match; nothing was created.'
		);
	}
	return population;
}

export type BatchPreview = {
	/** dwellings that match the filter or the list */
	population: number;
	/** how many the sample will hold (its members are drawn when the batch is created) */
	sample: number;
	/** by assessor: matching and sampled */
	assessors: { name: string; matching: number; sampled: number }[];
	includeFlagged: boolean;
};

/**
 * What a batch would hold, without creating it: the matching dwellings and the size of the sample by the
 * rule (with the seed given, the very dwellings; without, a draw of the same size), by assessor.
 */
export async function previewBatch(
	member: Pick<Member, 'organisationId'>,
	input: NewBatch & { referenceLines?: { line: number; reference: string }[] }
): Promise<BatchPreview> {
	const population = await resolvePopulation(member.organisationId, input, db);
	const sampling = input.sampling as SamplingRule;
	const picks = new Set(sampleDwellings(population, sampling, input.seed || 'preview').map((p) => p.id));
	const by = new Map<string, { name: string; matching: number; sampled: number }>();
	for (const c of population) {
		const key = c.assessorId ?? '';
		const row = by.get(key) ?? { name: c.assessorName ?? 'No assessor', matching: 0, sampled: 0 };
		row.matching++;
		if (picks.has(c.id)) row.sampled++;
		by.set(key, row);
	}
	return {
		population: population.length,
		sample: picks.size,
		assessors: [...by.values()].sort((a, b) => a.name.localeCompare(b.name)),
		includeFlagged: Boolean((sampling as { includeFlagged?: boolean }).includeFlagged)
	};
}

/**
 * Create a batch: resolve the dwellings (filter or references), draw the sample with a stored seed,
 * write the batch and its items, and log it, in one transaction. The recompute (which also adds
 * flagged dwellings when the rule asks for them) is queued by the caller.
 */
export async function createBatch(
	member: Pick<Member, 'organisationId'> & { user: { id: string } },
	input: NewBatch & { referenceLines?: { line: number; reference: string }[] }
): Promise<{ id: string; items: number; population: number }> {
	const orgId = member.organisationId;
	return db.transaction(async (trx) => {
		const population = await resolvePopulation(orgId, input, trx);
		const seed = input.seed && input.seed !== '' ? input.seed : newSeed();
		const sampling = input.sampling as SamplingRule;
		const picks = sampleDwellings(population, sampling, seed);
		const source: BatchSource = {
			...input.filter,
			source: input.source,
			...(input.source === 'references'
				? { references: (input.referenceLines ?? []).map((l) => l.reference).concat(input.references ?? []) }
				: {}),
			population: population.map((p) => p.id).sort()
		};
		const [batch] = await trx('audit_batches')
			.insert({
				organisation_id: orgId,
				name: input.name,
				filter: JSON.stringify(source),
				sampling: JSON.stringify(sampling),
				seed,
				status: 'open',
				progress: JSON.stringify({
					state: 'queued',
					done: 0,
					total: population.length
				} satisfies BatchProgress),
				created_by: member.user.id
			})
			.returning('id');
		await insertItems(trx, orgId, batch.id, picks);
		await logActivity(
			{
				organisationId: orgId,
				userId: member.user.id,
				action: 'audit-batch-create',
				entity: 'audit_batch',
				entityId: batch.id,
				details: {
					name: input.name,
					source: input.source,
					filter: input.filter,
					sampling,
					seed,
					population: population.length,
					picked: picks.length
				}
			},
			trx
		);
		return { id: batch.id as string, items: picks.length, population: population.length };
	});
}

/* ------------------------------------------------------------------ reading batches and items */

function mapBatch(r: Record<string, any>): Batch {
	return {
		id: r.id,
		name: r.name,
		filter: r.filter,
		sampling: r.sampling,
		seed: r.seed,
		status: r.status,
		progress: r.progress ?? {},
		createdBy: r.created_by,
		createdByName: r.created_by_name ?? null,
		createdAt: iso(r.created_at)!,
		updatedAt: iso(r.updated_at)!,
		counts: {
			items: Number(r.items ?? 0),
			decided: Number(r.decided ?? 0),
			returned: Number(r.returned ?? 0),
			flagged: Number(r.flagged ?? 0),
			population: Array.isArray(r.filter?.population) ? r.filter.population.length : 0
		}
	};
}

function batchQuery(organisationId: string) {
	return db('audit_batches as b')
		.leftJoin('users as u', 'u.id', 'b.created_by')
		.where('b.organisation_id', organisationId)
		.select(
			'b.*',
			'u.name as created_by_name',
			db.raw('(select count(*) from audit_items i where i.batch_id = b.id) as items'),
			db.raw(
				'(select count(*) from audit_items i where i.batch_id = b.id and i.decision is not null) as decided'
			),
			db.raw(
				`(select count(*) from audit_items i where i.batch_id = b.id and i.decision = 'returned') as returned`
			),
			db.raw(
				`(select count(*) from audit_items i where i.batch_id = b.id and jsonb_array_length(i.flags) > 0) as flagged`
			)
		);
}

export async function listBatches(organisationId: string): Promise<Batch[]> {
	const rows = await batchQuery(organisationId).orderBy('b.created_at', 'desc');
	return rows.map(mapBatch);
}

export async function getBatch(organisationId: string, batchId: string): Promise<Batch | null> {
	const row = await batchQuery(organisationId).andWhere('b.id', batchId).first();
	return row ? mapBatch(row) : null;
}

export type ItemRow = {
	id: string;
	batchId: string;
	dwellingId: string;
	reference: string;
	address: string;
	programme: string | null;
	assessorId: string | null;
	assessorName: string | null;
	dwellingStatus: string;
	pickedBecause: string;
	flags: Flag[];
	elements: number;
	decision: Decision | null;
	comment: string | null;
	decidedBy: string | null;
	decidedByName: string | null;
	decidedAt: string | null;
	resubmissions: number;
	recomputedAt: string | null;
	/** when the dwelling entered the batch */
	addedAt: string;
	state: ItemState;
};

export function itemState(decision: Decision | null, resubmissions: number): ItemState {
	return decision ?? (resubmissions > 0 ? 'resubmitted' : 'awaiting-review');
}

function itemQuery(organisationId: string) {
	return db('audit_items as i')
		.join('dwellings as d', 'd.id', 'i.dwelling_id')
		.leftJoin('users as a', 'a.id', 'd.assessor_id')
		.leftJoin('users as s', 's.id', 'i.decided_by')
		.where('i.organisation_id', organisationId)
		.select(
			'i.*',
			'd.reference',
			'd.address',
			'd.programme',
			'd.assessor_id',
			'd.status as dwelling_status',
			'a.name as assessor_name',
			's.name as decided_by_name',
			db.raw(
				`coalesce(jsonb_array_length(i.recompute->'elements'), (select count(*) from elements e where e.dwelling_id = i.dwelling_id)) as element_count`
			)
		);
}

function mapItem(r: Record<string, any>): ItemRow {
	return {
		id: r.id,
		batchId: r.batch_id,
		dwellingId: r.dwelling_id,
		reference: r.reference,
		address: r.address,
		programme: r.programme,
		assessorId: r.assessor_id,
		assessorName: r.assessor_name,
		dwellingStatus: r.dwelling_status,
		pickedBecause: r.picked_because,
		flags: r.flags ?? [],
		elements: Number(r.element_count ?? 0),
		decision: r.decision,
		comment: r.comment,
		decidedBy: r.decided_by,
		decidedByName: r.decided_by_name,
		decidedAt: iso(r.decided_at),
		resubmissions: r.resubmissions,
		recomputedAt: iso(r.recomputed_at),
		addedAt: iso(r.created_at)!,
		state: itemState(r.decision, r.resubmissions)
	};
}

export async function listItems(organisationId: string, batchId: string): Promise<ItemRow[]> {
	const rows = await itemQuery(organisationId).andWhere('i.batch_id', batchId).orderBy('d.reference');
	return rows.map(mapItem);
}

export type ItemDetail = ItemRow & {
	recompute: DwellingAudit | null;
	batchName: string;
	batchStatus: string;
	history: { id: number; action: string; at: string; who: string | null; details: Record<string, unknown> }[];
};

export async function getItem(organisationId: string, itemId: string): Promise<ItemDetail | null> {
	const row = await itemQuery(organisationId)
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.select('b.name as batch_name', 'b.status as batch_status')
		.andWhere('i.id', itemId)
		.first();
	if (!row) return null;
	const history = await db('activity_log as l')
		.leftJoin('users as u', 'u.id', 'l.user_id')
		.where({ 'l.organisation_id': organisationId, 'l.entity': 'audit_item', 'l.entity_id': itemId })
		.orderBy('l.id', 'asc')
		.select('l.id', 'l.action', 'l.created_at', 'l.details', 'u.name as who');
	return {
		...mapItem(row),
		recompute: row.recompute ?? null,
		batchName: row.batch_name,
		batchStatus: row.batch_status,
		history: history.map((h) => ({
			id: Number(h.id),
			action: h.action,
			at: iso(h.created_at)!,
			who: h.who ?? null,
			details: h.details ?? {}
		}))
	};
}

/* ------------------------------------------------------------------ after a decision */

export type Reopening = { at: string; who: string | null; reason: string; from: string; to: string };

/** The reopenings of a dwelling (reason, who, when), oldest first, after `since` when given. */
export async function listReopenings(
	organisationId: string,
	dwellingId: string,
	since: string | null = null
): Promise<Reopening[]> {
	const q = db('activity_log as l')
		.leftJoin('users as u', 'u.id', 'l.user_id')
		.where({
			'l.organisation_id': organisationId,
			'l.entity': 'dwelling',
			'l.entity_id': dwellingId,
			'l.action': 'reopen'
		})
		.orderBy('l.id', 'asc')
		.select('l.created_at', 'l.details', 'u.name', 'u.email');
	if (since) q.andWhere('l.created_at', '>', since);
	return (await q).map((r) => ({
		at: iso(r.created_at)!,
		who: r.name ?? r.email ?? null,
		reason: String(r.details?.reason ?? ''),
		from: String(r.details?.from ?? ''),
		to: String(r.details?.to ?? '')
	}));
}

/**
 * Whether a dwelling still matches what was decided on one audit item: nothing reopened it since the
 * decision (or, before one, since it entered the batch), no report was issued after the decision, and
 * it does not differ from its latest issued report.
 */
export async function decisionStanding(
	organisationId: string,
	item: { dwellingId: string; decidedAt: string | null; addedAt: string }
): Promise<{ matches: boolean; reopenings: Reopening[]; changes: IssueChanges; reissued: boolean }> {
	const since = item.decidedAt ?? item.addedAt;
	const [reopenings, changes, later] = await Promise.all([
		listReopenings(organisationId, item.dwellingId, since),
		changesSinceIssue(organisationId, item.dwellingId),
		db('reports')
			.where({ organisation_id: organisationId, dwelling_id: item.dwellingId, scope: 'dwelling' })
			.andWhere('issued_at', '>', since)
			.first('id')
	]);
	const reissued = Boolean(later) && item.decidedAt !== null;
	return {
		matches: reopenings.length === 0 && changes.changes.length === 0 && !reissued,
		reopenings,
		changes,
		reissued
	};
}

export type ChangedAfterDecision = {
	itemId: string;
	batchId: string;
	batchName: string;
	dwellingId: string;
	reference: string;
	address: string;
	dwellingStatus: string;
	decision: string | null;
	decidedAt: string | null;
	reopenedAt: string;
	reopenedBy: string | null;
	reason: string;
	issueChanges: number | null;
};

/**
 * The supervisors' queue of work reopened after (or during) its review: for each dwelling, its latest
 * audit item and the latest reopening that came after the item's decision (or, undecided, after the
 * dwelling entered the batch). Newest reopening first.
 */
export async function listChangedAfterDecision(organisationId: string): Promise<ChangedAfterDecision[]> {
	const { rows } = await db.raw(
		`SELECT DISTINCT ON (i.dwelling_id)
		        i.id AS item_id, i.batch_id, b.name AS batch_name, d.id AS dwelling_id, d.reference, d.address,
		        d.status AS dwelling_status, i.decision, i.decided_at, l.created_at AS reopened_at,
		        coalesce(u.name, u.email) AS reopened_by, l.details->>'reason' AS reason, d.issue_changes
		   FROM audit_items i
		   JOIN audit_batches b ON b.id = i.batch_id
		   JOIN dwellings d ON d.id = i.dwelling_id AND d.organisation_id = i.organisation_id
		   JOIN activity_log l ON l.organisation_id = i.organisation_id AND l.entity = 'dwelling'
		                      AND l.entity_id = i.dwelling_id::text AND l.action = 'reopen'
		                      AND l.created_at > coalesce(i.decided_at, i.created_at)
		   LEFT JOIN users u ON u.id = l.user_id
		  WHERE i.organisation_id = ?
		    AND i.id = (SELECT i2.id FROM audit_items i2 WHERE i2.dwelling_id = i.dwelling_id
		                 AND i2.organisation_id = i.organisation_id ORDER BY i2.created_at DESC LIMIT 1)
		  ORDER BY i.dwelling_id, l.created_at DESC
		  LIMIT 500`,
		[organisationId]
	);
	return (rows as Record<string, any>[])
		.map((r) => ({
			itemId: r.item_id,
			batchId: r.batch_id,
			batchName: r.batch_name,
			dwellingId: r.dwelling_id,
			reference: r.reference,
			address: r.address ?? '',
			dwellingStatus: r.dwelling_status,
			decision: r.decision ?? null,
			decidedAt: iso(r.decided_at),
			reopenedAt: iso(r.reopened_at)!,
			reopenedBy: r.reopened_by ?? null,
			reason: r.reason ?? '',
			issueChanges: r.issue_changes === null ? null : Number(r.issue_changes)
		}))
		.sort((a, b) => b.reopenedAt.localeCompare(a.reopenedAt));
}

/* ------------------------------------------------------------------ recompute */

/** Recompute a whole batch (the queue's job; tests call it directly). */
export const recomputeBatch = (
	organisationId: string,
	batchId: string,
	opts: { userId?: string | null; chunkSize?: number } = {}
) => recomputeBatchWith(db, organisationId, batchId, opts);
export const markQueued = (organisationId: string, batchId: string) =>
	markQueuedWith(db, organisationId, batchId);
export const recomputeItem = (orgId: string, batchId: string, dwellingId: string, userId: string | null) =>
	recomputeItemWith(db, orgId, batchId, dwellingId, userId);
export const auditDwellings = (orgId: string, ids: string[]) => auditDwellingsWith(db, orgId, ids);

/* ------------------------------------------------------------------ decisions */

/**
 * Who is tied to a dwelling: its assessor, everyone its activity log names as its assessor (at creation
 * or in a reassignment, before or after) and the issuer of each of its reports.
 */
export async function dwellingInvolvement(
	organisationId: string,
	dwellingId: string,
	trx: Db = db
): Promise<Involvement> {
	const dwelling = await trx('dwellings')
		.where({ organisation_id: organisationId, id: dwellingId })
		.first('assessor_id');
	const named = await trx('activity_log')
		.where({ organisation_id: organisationId, entity: 'dwelling', entity_id: dwellingId })
		.whereIn('action', ['create', 'reassign'])
		.select(
			trx.raw(`details->>'assessorId' as created_with`),
			trx.raw(`details->'from'->>'id' as from_id`),
			trx.raw(`details->'to'->>'id' as to_id`)
		);
	const reports = await trx('reports')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'issued_at' }, { column: 'revision' }])
		.select('number', 'revision', 'issued_by');
	const former = new Set<string>();
	for (const r of named) for (const id of [r.created_with, r.from_id, r.to_id]) if (id) former.add(id);
	return {
		assessorId: (dwelling?.assessor_id as string | null) ?? null,
		formerAssessorIds: [...former],
		reports: reports.map((r) => ({
			number: r.number as string,
			revision: Number(r.revision),
			issuedBy: r.issued_by as string
		}))
	};
}

/** Why `userId` may not decide on the dwelling (they assessed it or issued its report), or null. */
export async function decisionRefusalFor(
	organisationId: string,
	dwellingId: string,
	userId: string,
	trx: Db = db
): Promise<string | null> {
	return decisionRefusal(userId, await dwellingInvolvement(organisationId, dwellingId, trx));
}

/**
 * Record a supervisor's decision on one dwelling: the item, the dwelling's status and a log row in one
 * transaction; a return then e-mails the assessor (a failed e-mail is logged, the decision stands).
 * Nobody decides on a dwelling they assessed or issued (`decisionRefusal` in `$lib/audit/rules`; 403).
 */
export async function decideItem(member: Member, itemId: string, input: DecisionInput): Promise<ItemRow> {
	if (!DECIDER_ROLES.includes(member.role))
		throw new ForbiddenError('Only supervisors and admins decide on audited dwellings.');
	const orgId = member.organisationId;
	await db.transaction(async (trx) => {
		const item = await trx('audit_items as i')
			.join('audit_batches as b', 'b.id', 'i.batch_id')
			.where({ 'i.organisation_id': orgId, 'i.id': itemId })
			.forUpdate('i')
			.first('i.*', 'b.status as batch_status', 'b.name as batch_name');
		if (!item) throw new NotFoundError('No such audit item.');
		if (item.batch_status === 'closed')
			throw new ConflictError('The batch is closed; reopen it to change decisions.');
		// The dwelling row is locked so that its assessor cannot change under the check.
		const dwelling = await trx('dwellings')
			.where({ organisation_id: orgId, id: item.dwelling_id })
			.forUpdate()
			.first('id', 'reference', 'address', 'assessor_id', 'status');
		const refusal = await decisionRefusalFor(orgId, item.dwelling_id, member.user.id, trx);
		if (refusal) throw new ForbiddenError(refusal);
		if (item.decision === 'returned' && input.decision === 'returned') {
			throw new ConflictError('This dwelling is already returned; wait for the assessor to resubmit it.');
		}
		await trx('audit_items')
			.where({ id: itemId })
			.update({
				decision: input.decision,
				comment: input.comment || null,
				decided_by: member.user.id,
				decided_at: trx.fn.now(),
				updated_at: trx.fn.now()
			});
		const status = input.decision === 'returned' ? 'returned' : 'accepted';
		await trx('dwellings')
			.where({ organisation_id: orgId, id: item.dwelling_id })
			.update({ status, reopened_at: null, updated_at: trx.fn.now() });
		await logActivity(
			{
				organisationId: orgId,
				userId: member.user.id,
				action: 'audit-decision',
				entity: 'audit_item',
				entityId: itemId,
				details: {
					batchId: item.batch_id,
					dwellingId: item.dwelling_id,
					reference: dwelling?.reference,
					decision: input.decision,
					comment: input.comment,
					previousDecision: item.decision,
					resubmissions: item.resubmissions,
					flags: (item.flags ?? []).map((f: Flag) => f.code)
				}
			},
			trx
		);
		if (input.decision === 'returned' && dwelling?.assessor_id) {
			await notifyReturn(trx, member, itemId, item, dwelling, input.comment);
		}
		return { item, dwelling };
	});
	const rows = await itemQuery(orgId).andWhere('i.id', itemId);
	return mapItem(rows[0]);
}

/** Queue the e-mail to the assessor in the decision's transaction (the outbox worker sends and retries). */
async function notifyReturn(
	trx: Db,
	member: Member,
	itemId: string,
	item: Record<string, any>,
	dwelling: Record<string, any>,
	comment: string
) {
	const assessor = await trx('users').where({ id: dwelling.assessor_id }).first('email', 'name');
	if (!assessor?.email) return;
	const flags: Flag[] = item.flags ?? [];
	const lines = [
		`Hello ${assessor.name ?? ''},`.trim(),
		'',
		`${member.user.name ?? member.user.email} has returned dwelling ${dwelling.reference}${dwelling.address ? ` (${dwelling.address})` : ''} for correction, in the audit batch "${item.batch_name}".`,
		'',
		'Comment:',
		comment,
		'',
		...(flags.length
			? ['Flags raised by the recompute:', ...flags.map((f) => `- [${f.severity}] ${f.reason}`), '']
			: []),
		'Correct the dwelling, issue its report again, then resubmit it from "Returned to me":',
		appUrl('/audit/returned'),
		'',
		'Envelo supports, and does not replace, professional judgement.'
	];
	const mailId = await enqueueMail(
		{
			organisationId: member.organisationId,
			dwellingId: dwelling.id,
			purpose: 'audit-return',
			to: assessor.email,
			subject: `Returned for correction: ${dwelling.reference}`,
			text: lines.join('\n'),
			createdBy: member.user.id
		},
		trx
	);
	await logActivity(
		{
			organisationId: member.organisationId,
			userId: member.user.id,
			action: 'audit-return-mailed',
			entity: 'audit_item',
			entityId: itemId,
			details: { to: assessor.email, mailId }
		},
		trx
	);
}

/* ------------------------------------------------------------------ the assessor's side */

export type ReturnedRow = ItemRow & {
	batchName: string;
	reissued: boolean;
	latestReportNumber: string | null;
	latestIssuedAt: string | null;
};

/** Dwellings returned to this assessor (admins see every returned dwelling of the organisation). */
export async function listReturned(member: Member): Promise<ReturnedRow[]> {
	const q = itemQuery(member.organisationId)
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.select(
			'b.name as batch_name',
			db.raw(
				`(select r.number || ' rev. ' || r.revision from reports r where r.dwelling_id = i.dwelling_id and r.scope = 'dwelling' order by r.issued_at desc, r.revision desc limit 1) as latest_report`
			),
			db.raw(
				`(select max(r.issued_at) from reports r where r.dwelling_id = i.dwelling_id and r.scope = 'dwelling') as latest_issued_at`
			)
		)
		.andWhere('i.decision', 'returned')
		.orderBy('i.decided_at', 'desc');
	if (member.role !== 'admin') q.andWhere('d.assessor_id', member.user.id);
	const rows = await q;
	return rows.map((r) => {
		const latest = iso(r.latest_issued_at);
		return {
			...mapItem(r),
			batchName: r.batch_name,
			latestReportNumber: r.latest_report ?? null,
			latestIssuedAt: latest,
			reissued: Boolean(latest && r.decided_at && new Date(latest) > new Date(r.decided_at))
		};
	});
}

/**
 * The assessor answers a return: only after issuing the dwelling report again. Clears the decision (the
 * earlier one stays in the log), counts the resubmission, sets the dwelling to awaiting review, logs the
 * reply, then recomputes that dwelling so the supervisor sees fresh flags.
 */
export async function resubmitItem(
	member: Member,
	itemId: string,
	input: { comment: string }
): Promise<ItemRow> {
	const orgId = member.organisationId;
	const out = await db.transaction(async (trx) => {
		const item = await trx('audit_items as i')
			.join('dwellings as d', 'd.id', 'i.dwelling_id')
			.where({ 'i.organisation_id': orgId, 'i.id': itemId })
			.forUpdate('i')
			.first('i.*', 'd.assessor_id', 'd.reference');
		if (!item) throw new NotFoundError('No such audit item.');
		if (member.role !== 'admin' && item.assessor_id !== member.user.id) {
			throw new ForbiddenError("Only the dwelling's assessor (or an admin) resubmits it.");
		}
		if (item.decision !== 'returned')
			throw new ConflictError('This dwelling is not returned, so there is nothing to resubmit.');
		const report = await trx('reports')
			.where({ organisation_id: orgId, dwelling_id: item.dwelling_id, scope: 'dwelling' })
			.andWhere('issued_at', '>', item.decided_at)
			.orderBy('issued_at', 'desc')
			.first('id', 'number', 'revision');
		if (!report) {
			throw new ConflictError('Issue the dwelling report again after your corrections, then resubmit.', {
				issues: [{ path: 'report', message: 'no dwelling report has been issued since the return' }]
			});
		}
		await trx('audit_items')
			.where({ id: itemId })
			.update({
				decision: null,
				comment: null,
				decided_by: null,
				decided_at: null,
				resubmissions: trx.raw('resubmissions + 1'),
				updated_at: trx.fn.now()
			});
		await trx('dwellings')
			.where({ organisation_id: orgId, id: item.dwelling_id })
			.update({ status: 'awaiting-review', reopened_at: null, updated_at: trx.fn.now() });
		await logActivity(
			{
				organisationId: orgId,
				userId: member.user.id,
				action: 'audit-resubmit',
				entity: 'audit_item',
				entityId: itemId,
				details: {
					batchId: item.batch_id,
					dwellingId: item.dwelling_id,
					reference: item.reference,
					comment: input.comment,
					returnedWith: item.comment,
					returnedBy: item.decided_by,
					reportNumber: report.number,
					reportRevision: report.revision,
					resubmission: item.resubmissions + 1
				}
			},
			trx
		);
		return item;
	});
	await recomputeItem(orgId, out.batch_id, out.dwelling_id, member.user.id);
	const rows = await itemQuery(orgId).andWhere('i.id', itemId);
	return mapItem(rows[0]);
}

/* ------------------------------------------------------------------ summary */

export type BatchSummary = {
	items: number;
	byState: Record<ItemState, number>;
	flagsByCode: {
		code: string;
		label: string;
		high: number;
		medium: number;
		low: number;
		dwellings: number;
	}[];
	perAssessor: {
		assessorId: string | null;
		name: string;
		dwellings: number;
		flagged: number;
		flags: number;
		accepted: number;
		advice: number;
		returned: number;
		awaiting: number;
		resubmissions: number;
	}[];
	uByKind: {
		kind: ElementKind;
		limit: number | null;
		values: { u: number; reference: string; over: boolean }[];
	}[];
	resubmissions: number;
};

export async function batchSummary(organisationId: string, batchId: string): Promise<BatchSummary> {
	const items = await listItems(organisationId, batchId);
	const recomputes = await db('audit_items')
		.where({ organisation_id: organisationId, batch_id: batchId })
		.select('dwelling_id', db.raw(`recompute->'elements' as elements`));
	const elementsBy = new Map(
		recomputes.map((r) => [r.dwelling_id as string, (r.elements ?? []) as DwellingAudit['elements']])
	);
	const byState: Record<ItemState, number> = {
		'awaiting-review': 0,
		resubmitted: 0,
		accepted: 0,
		'accepted-with-advice': 0,
		returned: 0
	};
	const flagMap = new Map<string, BatchSummary['flagsByCode'][number]>();
	const assessors = new Map<string, BatchSummary['perAssessor'][number]>();
	const kinds = new Map<string, BatchSummary['uByKind'][number]>();
	let resubmissions = 0;
	for (const it of items) {
		byState[it.state]++;
		resubmissions += it.resubmissions;
		const seen = new Set<string>();
		for (const f of it.flags) {
			const e = flagMap.get(f.code) ?? {
				code: f.code,
				label: FLAG_LABELS[f.code] ?? f.code,
				high: 0,
				medium: 0,
				low: 0,
				dwellings: 0
			};
			e[f.severity]++;
			if (!seen.has(f.code)) e.dwellings++;
			seen.add(f.code);
			flagMap.set(f.code, e);
		}
		const key = it.assessorId ?? '';
		const a = assessors.get(key) ?? {
			assessorId: it.assessorId,
			name: it.assessorName ?? 'No assessor',
			dwellings: 0,
			flagged: 0,
			flags: 0,
			accepted: 0,
			advice: 0,
			returned: 0,
			awaiting: 0,
			resubmissions: 0
		};
		a.dwellings++;
		if (it.flags.length) a.flagged++;
		a.flags += it.flags.length;
		if (it.state === 'accepted') a.accepted++;
		else if (it.state === 'accepted-with-advice') a.advice++;
		else if (it.state === 'returned') a.returned++;
		else a.awaiting++;
		a.resubmissions += it.resubmissions;
		assessors.set(key, a);
		for (const el of elementsBy.get(it.dwellingId) ?? []) {
			const u = el.used?.uRounded ?? el.used?.u;
			if (typeof u !== 'number') continue;
			const k = kinds.get(el.kind) ?? { kind: el.kind, limit: el.limit, values: [] };
			if (k.limit === null && el.limit !== null) k.limit = el.limit;
			k.values.push({ u, reference: it.reference, over: exceedsLimit(u, el.limit) });
			kinds.set(el.kind, k);
		}
	}
	return {
		items: items.length,
		byState,
		flagsByCode: [...flagMap.values()].sort((a, b) => b.high - a.high || b.dwellings - a.dwellings),
		perAssessor: [...assessors.values()].sort((a, b) => a.name.localeCompare(b.name)),
		uByKind: [...kinds.values()],
		resubmissions
	};
}

export { DECISION_LABELS };
