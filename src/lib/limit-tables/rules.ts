/** The rules of limit tables, in one place for the page, the server, the SQL, the PDFs and the audit. */

/**
 * How far above a limit a figure may be and still meet it: room for binary floating point only (a
 * reported U of 0.28 against a limit of 0.28 meets it). Common practice, no source.
 */
export const LIMIT_TOLERANCE = 1e-9;

/**
 * Whether a U-value meets a limit, W/(m²·K). Compare the figure as reported (rounded), as assessors and
 * schemes do (common practice, no source). Null when either is unknown: nothing to judge.
 */
export function meetsLimit(u: number | null | undefined, limit: number | null | undefined): boolean | null {
	if (u === null || u === undefined || limit === null || limit === undefined) return null;
	return u <= limit + LIMIT_TOLERANCE;
}

/** Whether a U-value exceeds a limit: the negation of meetsLimit where both are known. */
export function exceedsLimit(u: number | null | undefined, limit: number | null | undefined): boolean {
	return meetsLimit(u, limit) === false;
}

/**
 * The limit table that applies to a dwelling: the one chosen for it, else the organisation's default.
 * `tables` are the organisation's tables; a chosen id that is not among them gives null (never another
 * organisation's table).
 */
export function limitTableFor<T extends { id: string; isDefault: boolean }>(
	chosenId: string | null | undefined,
	tables: Iterable<T>
): T | null {
	for (const t of tables) if (chosenId ? t.id === chosenId : t.isDefault) return t;
	return null;
}
