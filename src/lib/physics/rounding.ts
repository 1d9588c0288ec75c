/**
 * Rounding of reported values. Every further calculation uses the unrounded value.
 */

export interface RoundingRule {
	mode: 'decimals' | 'significant';
	digits: number;
}

/** Default for U-values: half-up to two decimal places (the usual reporting convention). */
export const DEFAULT_U_ROUNDING: RoundingRule = { mode: 'decimals', digits: 2 };

/**
 * Round half away from zero to `digits` decimal places or significant figures. The value is
 * first reduced to 12 significant digits so that binary round-off (0.145 held as 0.14499…)
 * does not decide the last digit.
 */
export function roundValue(value: number, rule: RoundingRule = DEFAULT_U_ROUNDING): number {
	if (value === 0 || !Number.isFinite(value)) return value;
	if (rule.mode === 'decimals') {
		// Fast path: away from a half the plain scaled rounding is exact (n / 10^k is correctly rounded).
		const p = 10 ** rule.digits;
		const scaled = Math.abs(value) * p;
		if (Math.abs(scaled - Math.floor(scaled) - 0.5) > 1e-6)
			return (value < 0 ? -1 : 1) * (Math.round(scaled) / p);
	}
	const v = Number(value.toPrecision(12));
	const places =
		rule.mode === 'decimals' ? rule.digits : rule.digits - 1 - Math.floor(Math.log10(Math.abs(v)));
	const sign = v < 0 ? -1 : 1;
	const shifted = Math.round(shiftDecimal(Math.abs(v), places));
	return sign * shiftDecimal(shifted, -places);
}

/**
 * `x`·10^`places` by moving the decimal point in its shortest decimal form (exact, unlike a
 * multiplication), also for the exponent form that very large and very small numbers take.
 */
function shiftDecimal(x: number, places: number): number {
	const [mantissa, exponent] = x.toExponential().split('e');
	return Number(`${mantissa}e${Number(exponent) + places}`);
}

/** Plain statement of the rounding used, stored with every result. */
export function describeRounding(rule: RoundingRule): string {
	const form =
		rule.mode === 'decimals'
			? `${rule.digits} decimal place${rule.digits === 1 ? '' : 's'}`
			: `${rule.digits} significant figure${rule.digits === 1 ? '' : 's'}`;
	return (
		`U-value rounded half away from zero to ${form} for reporting; the unrounded value is used in every further calculation. ` +
		'ISO 6946 states final U-values to two significant figures, which gives the same digits as two decimal places for 0.10 ≤ U < 1.0 W/(m²·K).'
	);
}

/** The statement for the default rule, prepared once. */
export const DEFAULT_ROUNDING_DESCRIPTION = describeRounding(DEFAULT_U_ROUNDING);
