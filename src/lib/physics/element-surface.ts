/**
 * Surface humidity (mould) check of an element, ISO 13788:2012 clause 5: the temperature factor
 * fRsi against the largest monthly fRsi,min from the 80 % criterion.
 */
import type { SurfaceResult } from './schema';
import type { ThermalModel } from './element-model';
import type { GlaserMonth } from './glaser';
import { minimumTemperatureFactor, temperatureFactor } from './moisture';
import { fmt } from './note-format';

/**
 * fRsi = 1 − Rsi/RT with RT of the element and Rsi = `rsiCheck` (ISO 13788:2012, 4.3: 0.25
 * m²·K/W) against fRsi,min of each month (5.2; pressures Pa, temperatures °C); the critical month
 * is the one of the largest fRsi,min, and the check passes when fRsi exceeds it. For bridged
 * elements also fRsi through the section of least resistance, with a warning when it fails.
 * Undefined, with a warning, when no month is colder outside than inside.
 */
export function surfaceCheck(
	tm: ThermalModel,
	months: readonly GlaserMonth[],
	rsiCheck: number,
	notes: string[],
	warnings: string[]
): SurfaceResult | undefined {
	const fRsi = temperatureFactor(tm.rTotal, tm.rsi, rsiCheck);
	let fRsiMin = -Infinity;
	let critical = 0;
	const surfaceMonths = months.map((m) => {
		const r = minimumTemperatureFactor(
			m.internalTemperature,
			m.externalTemperature,
			m.internalVapourPressure
		);
		if (r.fRsiMin !== null && r.fRsiMin > fRsiMin) {
			fRsiMin = r.fRsiMin;
			critical = m.month;
		}
		return {
			month: m.month,
			externalTemperature: m.externalTemperature,
			internalVapourPressure: m.internalVapourPressure,
			minSaturationPressure: r.minSaturationPressure,
			minSurfaceTemperature: r.minSurfaceTemperature,
			fRsiMin: r.fRsiMin
		};
	});
	if (critical === 0) {
		warnings.push('No month is colder outside than inside: the surface-humidity check does not apply.');
		return undefined;
	}
	const fRsiLowestSection = tm.bridged ? lowestSectionFactor(tm, rsiCheck, fRsiMin, warnings) : undefined;
	notes.push(
		`fRsi with Rsi = ${rsiCheck} m²·K/W against fRsi,min from the 80 % surface-humidity criterion (ISO 13788:2012, clause 5).`
	);
	return {
		fRsi,
		fRsiMin,
		criticalMonth: critical,
		pass: fRsi > fRsiMin,
		rsiUsed: rsiCheck,
		...(fRsiLowestSection !== undefined ? { fRsiLowestSection } : {}),
		months: surfaceMonths
	};
}

/**
 * 1-D temperature factor through the section of a bridged element with the lowest total
 * resistance (the combined method's sections, m²·K/W), with Rsi = `rsiCheck`; warns when it does
 * not exceed fRsi,min (the bridges then need a numerical check, ISO 10211).
 */
function lowestSectionFactor(
	tm: ThermalModel,
	rsiCheck: number,
	fRsiMin: number,
	warnings: string[]
): number {
	const rMinSection = tm.combined.sections.reduce((a, s) => Math.min(a, s.rTotal), Infinity);
	const fRsiLowestSection = temperatureFactor(rMinSection, tm.rsi, rsiCheck);
	if (fRsiLowestSection <= fRsiMin) {
		warnings.push(
			`Across the bridging members the 1-D temperature factor is ${fmt(fRsiLowestSection)} < fRsi,min ${fmt(fRsiMin)}: check the bridges numerically (ISO 10211).`
		);
	}
	return fRsiLowestSection;
}
