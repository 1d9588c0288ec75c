const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A moment as "3 Mar 2026, 10:04 UTC": the same text on the server and in the browser. */
export function whenUtc(iso: string): string {
	const d = new Date(iso);
	const p = (n: number) => String(n).padStart(2, '0');
	return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${p(d.getUTCHours())}:${p(d.getUTCMinutes())} UTC`;
}

/** "ABCD-EFGH-JK" for a ten-character verification code. */
export function groupCode(code: string): string {
	return code.replace(/^(.{4})(.{4})(.*)$/, '$1-$2-$3');
}
