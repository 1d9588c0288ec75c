/** A number for a table cell: trimmed to significant digits, an en dash when there is none. */
export function shown(v: number | null | undefined, digits = 4): string {
	if (v === null || v === undefined) return '–';
	return String(+v.toPrecision(digits));
}

/** A change's value as text. */
export function changeText(v: unknown): string {
	if (v === null || v === undefined || v === '') return '(empty)';
	if (typeof v === 'boolean') return v ? 'yes' : 'no';
	return String(v);
}
