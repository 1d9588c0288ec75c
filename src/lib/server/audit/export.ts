/** The batch summary as CSV, one row per dwelling; text cells are neutralised against formula injection. */
import { toCsv } from '$lib/server/csv/write';
import { FLAG_LABELS, ITEM_STATE_LABELS } from '$lib/audit/flags';
import { DWELLING_STATUS_LABELS, type DwellingStatus } from '$lib/dwellings/kinds';
import type { ItemRow } from '$lib/server/audit';

export function batchCsv(items: ItemRow[]): string {
	const headers = [
		'reference',
		'address',
		'programme',
		'assessor',
		'picked because',
		'elements',
		'flags high',
		'flags medium',
		'flags low',
		'flag kinds',
		'outcome',
		'dwelling status',
		'comment',
		'decided by',
		'decided at',
		'resubmissions',
		'recomputed at'
	];
	const rows = items.map((i) => [
		i.reference,
		i.address,
		i.programme,
		i.assessorName,
		i.pickedBecause,
		i.elements,
		i.flags.filter((f) => f.severity === 'high').length,
		i.flags.filter((f) => f.severity === 'medium').length,
		i.flags.filter((f) => f.severity === 'low').length,
		[...new Set(i.flags.map((f) => FLAG_LABELS[f.code] ?? f.code))].join('; '),
		ITEM_STATE_LABELS[i.state],
		DWELLING_STATUS_LABELS[i.dwellingStatus as DwellingStatus] ?? i.dwellingStatus,
		i.comment,
		i.decidedByName,
		i.decidedAt,
		i.resubmissions,
		i.recomputedAt
	]);
	return toCsv(headers, rows);
}
