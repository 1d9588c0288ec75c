/** Number formatting for reports: fixed decimals, a real minus sign, no locale surprises. */

export const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
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
];

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

export function monthName(m: number | null | undefined): string {
	return m && m >= 1 && m <= 12 ? MONTH_NAMES[m - 1] : '—';
}

/** Issue dates are shown as a calendar date in UTC, e.g. 3 March 2026. */
export function longDate(iso: string): string {
	const d = new Date(iso);
	return `${d.getUTCDate()} ${MONTH_NAMES[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

export function dateTime(iso: string): string {
	const d = new Date(iso);
	const p = (n: number) => String(n).padStart(2, '0');
	return `${longDate(iso)}, ${p(d.getUTCHours())}:${p(d.getUTCMinutes())} UTC`;
}
