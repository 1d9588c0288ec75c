/**
 * Numbers, months, dates and codes as Envelo writes them, in one place for the page and the PDFs: fixed
 * decimals, a real minus sign, dates in UTC, no locale surprises (the same text on the server and in the
 * browser).
 */

export const MONTHS = [
	'Jan',
	'Feb',
	'Mar',
	'Apr',
	'May',
	'Jun',
	'Jul',
	'Aug',
	'Sep',
	'Oct',
	'Nov',
	'Dec'
] as const;
export const MONTH_NAMES = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
] as const;

/** Fixed decimals with U+2212 for negatives; "—" for missing values. */
export function fx(v: number | null | undefined, decimals = 2): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	const s = Math.abs(v).toFixed(decimals);
	const negative = v < 0 && Number(s) !== 0;
	return (negative ? '\u2212' : '') + s;
}

/** Up to `max` decimals, trailing zeros dropped (for inputs such as λ = 0.035 or d = 12.5). */
export function trim(v: number | null | undefined, max = 4): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	const s = Number(v.toFixed(max)).toString();
	return s.startsWith('-') ? '\u2212' + s.slice(1) : s;
}

export function pct(fraction: number, decimals = 1): string {
	return `${fx(fraction * 100, decimals)} %`;
}

/** "March" for 3; "—" outside 1–12. */
export function monthName(m: number | null | undefined): string {
	return m && m >= 1 && m <= 12 ? MONTH_NAMES[m - 1] : '—';
}

const two = (n: number) => String(n).padStart(2, '0');

/** A calendar date in UTC, e.g. "3 March 2026" (issue dates). */
export function longDate(iso: string | Date): string {
	const d = new Date(iso);
	return `${d.getUTCDate()} ${MONTH_NAMES[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/** A calendar date in UTC, short, e.g. "3 Mar 2026" (lists). */
export function shortDate(iso: string | Date): string {
	const d = new Date(iso);
	return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/** "3 March 2026, 10:04 UTC" (report pages). */
export function dateTime(iso: string | Date): string {
	const d = new Date(iso);
	return `${longDate(d)}, ${two(d.getUTCHours())}:${two(d.getUTCMinutes())} UTC`;
}

/** "3 Mar 2026, 10:04 UTC" (activity, mail and audit lists). */
export function whenUtc(iso: string | Date): string {
	const d = new Date(iso);
	return `${shortDate(d)}, ${two(d.getUTCHours())}:${two(d.getUTCMinutes())} UTC`;
}

/**
 * A stored calendar day as `YYYY-MM-DD`, or null. A PostgreSQL DATE comes back as local midnight, so a
 * Date is read in local time; text is cut to its date.
 */
export function calendarDay(d: unknown): string | null {
	if (d === null || d === undefined || d === '') return null;
	if (d instanceof Date) return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}`;
	return String(d).slice(0, 10);
}

/** "ABCD-EFGH-JK" for a ten-character verification code. */
export function groupCode(code: string): string {
	return code.replace(/^(.{4})(.{4})(.*)$/, '$1-$2-$3');
}
