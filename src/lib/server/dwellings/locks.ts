/** Row locks and touches that the dwelling and element services share (neither imports the other for them). */
import type { Db } from '$lib/server/db';
import { NotFoundError } from '$lib/server/errors';
import { type DwellingStatus } from '$lib/dwellings/kinds';

/** Lock the dwelling row for the transaction; 404 when it is not the organisation's. */
export async function lockDwelling(t: Db, organisationId: string, id: string) {
	const row = await t('dwellings').where({ organisation_id: organisationId, id }).forUpdate().first();
	if (!row) throw new NotFoundError('No such dwelling.');
	return {
		id: row.id as string,
		reference: row.reference as string,
		status: row.status as DwellingStatus,
		version: row.version as number
	};
}

/** Mark a dwelling changed (its elements changed) so lists sort by real activity. */
export async function touchDwelling(t: Db, organisationId: string, id: string) {
	await t('dwellings').where({ organisation_id: organisationId, id }).update({ updated_at: t.fn.now() });
}
