/** Numbers as notes and warnings write them. */

/** `v` rounded to `d` decimal places (default 3) and written in its shortest form, e.g. 0.297. */
export const fmt = (v: number, d = 3): string => {
	const f = 10 ** d;
	return String(Math.round(v * f) / f);
};
