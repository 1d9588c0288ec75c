/**
 * The surface check of a junction (ISO 13788): fRsi of the two-dimensional model against the
 * fRsi,min of each month of the dwelling's climate (80 % surface humidity, ISO 13788:2012 5.2),
 * the critical month being the one of the highest fRsi,min; and against the figure of 0.75 commonly
 * used for dwellings (common practice, no source).
 */
import { internalVapourPressure, minimumTemperatureFactor, saturationPressure } from '$lib/physics';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { FRSI_RULE_OF_THUMB } from './kinds';
import type { JunctionInternal } from './schema';

/** Inside conditions when none are given: 20 °C and humidity class 3, as the element editor starts. */
export const DEFAULT_JUNCTION_INTERNAL: JunctionInternal = { temperature: 20, humidityClass: 3 }; // common practice, no source

export interface MonthCriterion {
	month: number;
	externalTemperature: number;
	fRsiMin: number | null;
}

export interface SurfaceVerdict {
	fRsi: number;
	months: MonthCriterion[];
	/** the month of the highest fRsi,min, and whether fRsi reaches it; null without a climate or vapour */
	critical: { month: number; fRsiMin: number; pass: boolean } | null;
	ruleOfThumb: { value: number; pass: boolean; source: string };
}

/** fRsi,min of each month (ISO 13788:2012 4.2.3 and 5.2): pe = φe·psat(θe), pi from the inside conditions. */
export function monthlyCriteria(
	internal: JunctionInternal,
	months: readonly ClimateMonthValues[]
): MonthCriterion[] {
	const conditions =
		internal.humidityClass === undefined && internal.relativeHumidity === undefined
			? { ...internal, humidityClass: DEFAULT_JUNCTION_INTERNAL.humidityClass }
			: internal;
	return months.map((m) => {
		const pe = (m.relativeHumidity / 100) * saturationPressure(m.temperature);
		const pi = internalVapourPressure(conditions, m.temperature, pe);
		const { fRsiMin } = minimumTemperatureFactor(internal.temperature, m.temperature, pi);
		return { month: m.month, externalTemperature: m.temperature, fRsiMin };
	});
}

/** fRsi against the climate's critical month and against the rule of thumb. */
export function surfaceVerdict(
	fRsi: number,
	internal: JunctionInternal,
	months: readonly ClimateMonthValues[] | null
): SurfaceVerdict {
	const list = months?.length ? monthlyCriteria(internal, months) : [];
	let critical: SurfaceVerdict['critical'] = null;
	for (const m of list) {
		if (m.fRsiMin === null) continue;
		if (!critical || m.fRsiMin > critical.fRsiMin)
			critical = { month: m.month, fRsiMin: m.fRsiMin, pass: false };
	}
	if (critical) critical.pass = fRsi >= critical.fRsiMin;
	return {
		fRsi,
		months: list,
		critical,
		ruleOfThumb: {
			value: FRSI_RULE_OF_THUMB,
			pass: fRsi >= FRSI_RULE_OF_THUMB,
			source: 'common practice, no source'
		}
	};
}
