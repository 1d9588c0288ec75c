/**
 * Monthly boundary conditions of the moisture checks (ISO 13788:2012): external and internal
 * vapour pressures of every calendar month, and the notes when the checks are not run.
 */
import type { ClimateMonth, ElementInput, InternalConditions } from './schema';
import type { GlaserMonth } from './glaser';
import { MONTH_DAYS, internalVapourPressure, saturationPressure } from './moisture';

/**
 * The twelve months in calendar order, pressures in Pa: pe = φe·psat(θe) (psat by ISO 13788:2012,
 * Annex E), pi from the fixed internal humidity or the humidity class (4.2.3, Annex A), and the
 * month's length in days (clause 6). `climate` holds each month 1–12 once, in any order (as
 * validated). Warns of months whose pi exceeds saturation at θi; notes the humidity model.
 */
export function monthlyConditions(
	internal: InternalConditions,
	climate: readonly ClimateMonth[],
	notes: string[],
	warnings: string[]
): GlaserMonth[] {
	const byMonth: ClimateMonth[] = new Array(12);
	for (const c of climate) byMonth[c.month - 1] = c;
	const months: GlaserMonth[] = byMonth.map((c) => {
		const pe = (c.relativeHumidity / 100) * saturationPressure(c.temperature);
		return {
			month: c.month,
			days: MONTH_DAYS[c.month - 1],
			externalTemperature: c.temperature,
			externalVapourPressure: pe,
			internalTemperature: internal.temperature,
			internalVapourPressure: internalVapourPressure(internal, c.temperature, pe)
		};
	});
	const piSat = saturationPressure(internal.temperature);
	const humid = months.filter((m) => m.internalVapourPressure > piSat).map((m) => m.month);
	if (humid.length)
		warnings.push(
			`The internal vapour pressure exceeds saturation at ${internal.temperature} °C in month(s) ${humid.join(', ')}.`
		);
	notes.push(
		internal.humidityClass !== undefined
			? `Internal humidity: class ${internal.humidityClass}, pi = pe + 1.1·Δp(θe) (ISO 13788:2012, Annex A).`
			: `Internal humidity: ${internal.relativeHumidity} % at ${internal.temperature} °C in every month.`
	);
	return months;
}

/** The note for a floor on the ground with a climate: the surface check runs, the Glaser check not. */
export function groundCondensationNote(notes: string[]): void {
	// The Glaser method needs the vapour conditions on both faces; under a slab lies ground, not outside air.
	notes.push(
		'Interstitial condensation: not assessed for a floor in contact with the ground (the Glaser method with the external climate does not describe the ground under the slab).'
	);
}

/** The note when the moisture checks do not run (no climate or no internal conditions). */
export function moistureSkippedNote(input: ElementInput, notes: string[]): void {
	if (input.ground) {
		notes.push('Interstitial condensation: not assessed for a floor in contact with the ground.');
	} else if (input.climate === undefined && input.internal !== undefined) {
		notes.push('No climate given: the moisture checks are not run.');
	}
}
