/** How the audit compares stored values. */

/** Canonical JSON (sorted keys) for comparing stored inputs. */
export function canonical(v: unknown): string {
	if (v === null || typeof v !== 'object') return JSON.stringify(v ?? null);
	if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
	const o = v as Record<string, unknown>;
	return `{${Object.keys(o)
		.filter((k) => o[k] !== undefined)
		.sort()
		.map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
		.join(',')}}`;
}

/**
 * Whether two stored numbers differ beyond floating-point noise: by more than 1e-9, or 1e-9 of the
 * larger when it is over 1 (common practice, no source). A missing number differs from nothing.
 */
export function different(a: number | null | undefined, b: number | null | undefined): boolean {
	if (a === undefined || a === null || b === undefined || b === null) return false;
	return Math.abs(a - b) > 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}
