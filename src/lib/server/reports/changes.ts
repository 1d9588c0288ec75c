/**
 * The working copy against the issued record: what differs between a dwelling as it is now and its
 * latest issued dwelling report, with who made each change and when (from the activity log). The
 * dwelling row keeps the count (`issue_changes`: null before the first issue, 0 when they match) in the
 * transaction of every write that can change it, so lists can filter on it; the list itself is always
 * worked out afresh.
 */
import { db, type Db } from '$lib/server/db';
import { compareRecords, type IssueChanges } from '$lib/dwellings/changes';
import { buildSnapshot } from './index';
import type { ReportSnapshot } from './snapshot';

export type { IssueChanges };

/** The latest issued dwelling report of a dwelling, with its snapshot. */
async function latestIssued(t: Db, organisationId: string, dwellingId: string) {
	return t('reports')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId, scope: 'dwelling' })
		.orderBy('revision', 'desc')
		.first('id', 'number', 'revision', 'issued_at', 'snapshot');
}

/**
 * The dwelling as a report would freeze it now (nothing is stored), its junctions as last saved: a
 * junction's figures are computed when it is saved, and counting changes never solves one.
 */
async function workingCopy(t: Db, organisationId: string, dwellingId: string): Promise<ReportSnapshot> {
	const now = new Date().toISOString();
	const { snapshot } = await buildSnapshot(
		organisationId,
		dwellingId,
		null,
		{
			scope: 'dwelling',
			draft: true,
			number: '',
			revision: 0,
			verificationCode: null,
			verifyUrl: null,
			supersedes: null,
			issuedBy: { id: '', name: '' }
		},
		now,
		t,
		{ junctions: 'stored' }
	);
	return snapshot;
}

/**
 * Who last changed each element (by element id), each junction (`junction:` and its id) and the
 * dwelling (key ''), since `since`.
 */
async function lastChanges(t: Db, organisationId: string, dwellingId: string, since: Date) {
	const rows = await t('activity_log as a')
		.leftJoin('users as u', 'u.id', 'a.user_id')
		.where('a.organisation_id', organisationId)
		.andWhere('a.created_at', '>', since)
		.andWhere((q) =>
			q
				.where({ 'a.entity': 'dwelling', 'a.entity_id': dwellingId })
				.orWhere((w) =>
					w
						.whereIn('a.entity', ['element', 'junction'])
						.andWhereRaw(`a.details->>'dwellingId' = ?`, [dwellingId])
				)
		)
		.orderBy('a.created_at', 'asc')
		.select('a.entity', 'a.entity_id', 'a.created_at', 'u.name', 'u.email');
	const last = new Map<string, { by: string | null; at: string }>();
	for (const r of rows) {
		const key =
			r.entity === 'element' ? String(r.entity_id) : r.entity === 'junction' ? `junction:${r.entity_id}` : '';
		last.set(key, { by: r.name ?? r.email ?? null, at: new Date(r.created_at).toISOString() });
	}
	return last;
}

/** Every difference between the dwelling now and its latest issued dwelling report. */
export async function changesSinceIssue(
	organisationId: string,
	dwellingId: string,
	t: Db = db
): Promise<IssueChanges> {
	const issued = await latestIssued(t, organisationId, dwellingId);
	if (!issued) return { report: null, changes: [] };
	const current = await workingCopy(t, organisationId, dwellingId);
	const changes = compareRecords(issued.snapshot as ReportSnapshot, current);
	const last = changes.length
		? await lastChanges(t, organisationId, dwellingId, new Date(issued.issued_at))
		: new Map();
	return {
		report: {
			id: issued.id,
			number: issued.number,
			revision: Number(issued.revision),
			issuedAt: new Date(issued.issued_at).toISOString()
		},
		changes: changes.map((c) => {
			const key = c.junctionId ? `junction:${c.junctionId}` : (c.elementId ?? '');
			const who = last.get(key) ?? last.get('') ?? null;
			return { ...c, by: who?.by ?? null, at: who?.at ?? null };
		})
	};
}

/**
 * Work out the dwelling's differences from its latest issued report again and store their number, in
 * the caller's transaction (every write to a dwelling or its elements calls this). Nothing is done for a
 * dwelling that has never been issued.
 */
export async function refreshIssueChanges(
	t: Db,
	organisationId: string,
	dwellingId: string
): Promise<number | null> {
	const row = await t('dwellings')
		.where({ organisation_id: organisationId, id: dwellingId })
		.first('issue_changes');
	if (!row || row.issue_changes === null) return null;
	const { changes } = await changesSinceIssue(organisationId, dwellingId, t);
	if (changes.length !== row.issue_changes) {
		await t('dwellings')
			.where({ organisation_id: organisationId, id: dwellingId })
			.update({ issue_changes: changes.length });
	}
	return changes.length;
}

/**
 * The changes for a page or the API, correcting the stored count when it has drifted (a climate or limit
 * table edited after issue marks its dwellings with at least one change; the exact number is set here).
 */
export async function readIssueChanges(
	organisationId: string,
	dwellingId: string,
	storedCount: number | null
): Promise<IssueChanges> {
	const found = await changesSinceIssue(organisationId, dwellingId);
	if (found.report && found.changes.length !== storedCount) {
		await db('dwellings')
			.where({ organisation_id: organisationId, id: dwellingId })
			.update({ issue_changes: found.changes.length });
	}
	return found;
}
