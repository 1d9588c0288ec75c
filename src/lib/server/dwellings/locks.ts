/** Row locks and touches that the dwelling and element services share (neither imports the other for them). */
import type { Db } from '$lib/server/db';
import { ConflictError, NotFoundError } from '$lib/server/errors';
import { type DwellingStatus } from '$lib/dwellings/kinds';
import { changeRefusal } from '$lib/dwellings/rules';
import { refreshIssueChanges } from '$lib/server/reports/changes';

/** Lock the dwelling row for the transaction; 404 when it is not the organisation's. */
export async function lockDwelling(t: Db, organisationId: string, id: string) {
	const row = await t('dwellings').where({ organisation_id: organisationId, id }).forUpdate().first();
	if (!row) throw new NotFoundError('No such dwelling.');
	return {
		id: row.id as string,
		reference: row.reference as string,
		status: row.status as DwellingStatus,
		version: row.version as number,
		reopenedAt: (row.reopened_at ?? null) as Date | null
	};
}

/**
 * Refuse a change to a dwelling that is archived, accepted or awaiting review (409): an accepted
 * dwelling, or one a supervisor is reviewing, is reopened with a reason first (`changeRefusal`).
 */
export function assertChangeable(dwelling: { status: DwellingStatus; reopenedAt: Date | null }) {
	const refusal = changeRefusal(dwelling.status, dwelling.reopenedAt !== null);
	if (refusal) {
		throw new ConflictError(
			refusal.message,
			refusal.needsReason
				? { code: 'reopen-required', issues: [{ path: 'reason', message: refusal.message }] }
				: {}
		);
	}
}

/**
 * Mark a dwelling changed (its elements changed) so lists sort by real activity, and count again how far
 * it now differs from its latest issued report.
 */
export async function touchDwelling(t: Db, organisationId: string, id: string) {
	await t('dwellings').where({ organisation_id: organisationId, id }).update({ updated_at: t.fn.now() });
	await refreshIssueChanges(t, organisationId, id);
}
