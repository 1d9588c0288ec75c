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

/**
 * A thermal conductivity λ for a table column: three decimals (0.035, 1.350, 2.000) so the decimal points
 * line up in tabular figures; a value that needs a fourth decimal (vacuum panels, 0.0045) keeps it.
 */
export function lambdaShown(v: number | null | undefined): string {
	if (v === null || v === undefined) return '–';
	const three = v.toFixed(3);
	return Math.abs(+three - v) > 1e-9 ? String(+v.toFixed(4)) : three;
}
