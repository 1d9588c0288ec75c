/**
 * A shared record changed (a climate's months, a limit table's limits, which table is the default): every
 * issued dwelling that uses it is marked as differing from its report, at least by one change, in the
 * same transaction. The exact list is worked out when the dwelling is next read or changed
 * (`changesSinceIssue`), which also corrects the count. Kept apart from `./changes` so that the climate
 * and limit-table services can call it without importing the report service.
 */
import type { Db } from '$lib/server/db';

/** Mark the organisation's issued dwellings that `using` selects (a Knex where-builder on `dwellings as d`). */
export async function markIssuedDwellings(
	t: Db,
	organisationId: string,
	using: (q: any) => void
): Promise<number> {
	return t('dwellings as d')
		.where('d.organisation_id', organisationId)
		.whereNotNull('d.issue_changes')
		.andWhere(using)
		.update({ issue_changes: t.raw('GREATEST(d.issue_changes, 1)') });
}

/** Dwellings that use a climate: their own, or one of their elements'. */
export const usingClimate = (climateId: string) => (q: any) =>
	q.where('d.climate_id', climateId).orWhereExists(function (this: any) {
		this.select(1).from('elements as e').whereRaw('e.dwelling_id = d.id').andWhere('e.climate_id', climateId);
	});

/** Dwellings judged against a limit table: named, or (with none named) the default when `isDefault`. */
export const usingLimitTable = (limitTableId: string, isDefault: boolean) => (q: any) =>
	isDefault
		? q.where('d.limit_table_id', limitTableId).orWhereNull('d.limit_table_id')
		: q.where('d.limit_table_id', limitTableId);
