/**
 * Moisture properties and boundary conditions of ISO 13788:2012 (clause and annex numbers as
 * recalled): saturation vapour pressure, humidity classes, vapour diffusion thickness, and the
 * temperature factor for the surface-humidity (mould) criterion.
 */

import { DT_NEGLIGIBLE_K } from './bounds';

/** Water vapour permeability of still air, kg/(m·s·Pa). */
export const DELTA_0 = 2e-10; // ISO 13788:2012, 3.1 / clause 6 (δ0 = 2 × 10⁻¹⁰)

/** Internal surface resistance for the mould and surface-humidity check of opaque elements, m²·K/W. */
export const RSI_SURFACE_CHECK = 0.25; // ISO 13788:2012, 4.3

/** Critical relative humidity at the internal surface for mould growth. */
export const SURFACE_RH_CRITICAL = 0.8; // ISO 13788:2012, 5.1 / 5.2

/** Safety factor on the internal vapour-pressure excess of the humidity classes. */
export const HUMIDITY_CLASS_SAFETY_FACTOR = 1.1; // ISO 13788:2012, 4.2.3 (Annex A)

/** Vapour-pressure excess Δp at θe ≤ 0 °C by humidity class 1–5, Pa. */
export const HUMIDITY_CLASS_EXCESS: Readonly<Record<1 | 2 | 3 | 4 | 5, number>> = {
	1: 270, // ISO 13788:2012, Annex A, Figure A.1 (unoccupied, dry storage)
	2: 540, // ISO 13788:2012, Annex A (offices, dwellings with normal occupancy and ventilation)
	3: 810, // ISO 13788:2012, Annex A (buildings with unknown occupancy)
	4: 1080, // ISO 13788:2012, Annex A (sports halls, kitchens, canteens)
	5: 1350 // ISO 13788:2012, Annex A (special buildings: laundry, brewery, swimming pool)
};

/** External temperature at and above which the humidity-class excess is zero, °C. */
export const HUMIDITY_CLASS_ZERO_AT = 20; // ISO 13788:2012, Annex A, Figure A.1

/** Days in each calendar month (index 0 = January). */
export const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31] as const; // ISO 13788:2012, clause 6: amounts are taken over each month's length (February of 28 days)

const P0 = 610.5; // ISO 13788:2012, Annex E: psat at 0 °C, Pa
const A_WATER = 17.269; // ISO 13788:2012, Annex E, over water (θ ≥ 0 °C)
const B_WATER = 237.3; // ISO 13788:2012, Annex E, over water, °C
const A_ICE = 21.875; // ISO 13788:2012, Annex E, over ice (θ < 0 °C)
const B_ICE = 265.5; // ISO 13788:2012, Annex E, over ice, °C

/**
 * Saturation water vapour pressure, Pa, at temperature θ in °C (ISO 13788:2012, Annex E):
 * over water for θ ≥ 0, psat = 610.5·exp(17.269·θ/(237.3 + θ)); over ice for θ < 0,
 * psat = 610.5·exp(21.875·θ/(265.5 + θ)).
 */
export function saturationPressure(temperatureC: number): number {
	return temperatureC >= 0
		? P0 * Math.exp((A_WATER * temperatureC) / (B_WATER + temperatureC))
		: P0 * Math.exp((A_ICE * temperatureC) / (B_ICE + temperatureC));
}

/**
 * Temperature, °C, at which the saturation pressure equals p (Pa): the inverse of
 * {@link saturationPressure} (ISO 13788:2012, Annex E), over ice below 610.5 Pa.
 */
export function saturationTemperature(pressurePa: number): number {
	const l = Math.log(pressurePa / P0);
	return pressurePa >= P0 ? (B_WATER * l) / (A_WATER - l) : (B_ICE * l) / (A_ICE - l);
}

/**
 * Internal vapour-pressure excess of a humidity class, Pa, at the external temperature θe (°C),
 * without the safety factor (ISO 13788:2012, Annex A): Δp0 at θe ≤ 0 °C falling linearly to 0 at 20 °C.
 */
export function humidityClassExcess(humidityClass: 1 | 2 | 3 | 4 | 5, externalTemperatureC: number): number {
	const dp0 = HUMIDITY_CLASS_EXCESS[humidityClass];
	if (externalTemperatureC <= 0) return dp0;
	if (externalTemperatureC >= HUMIDITY_CLASS_ZERO_AT) return 0;
	return dp0 * (1 - externalTemperatureC / HUMIDITY_CLASS_ZERO_AT);
}

export interface InternalCondition {
	temperature: number;
	relativeHumidity?: number;
	humidityClass?: 1 | 2 | 3 | 4 | 5;
}

/**
 * Internal vapour pressure, Pa, for one month (ISO 13788:2012, 4.2.3): from a fixed internal
 * relative humidity (%), pi = φi·psat(θi); or from a humidity class, pi = pe + 1.1·Δp(θe),
 * with pe the external vapour pressure in Pa.
 */
export function internalVapourPressure(
	internal: InternalCondition,
	externalTemperatureC: number,
	externalVapourPressurePa: number
): number {
	if (internal.humidityClass !== undefined) {
		return (
			externalVapourPressurePa +
			HUMIDITY_CLASS_SAFETY_FACTOR * humidityClassExcess(internal.humidityClass, externalTemperatureC)
		);
	}
	return ((internal.relativeHumidity as number) / 100) * saturationPressure(internal.temperature);
}

/** Water vapour diffusion-equivalent air layer thickness sd = μ·d, m (ISO 13788:2012, 3.1), d in mm. */
export function vapourThickness(mu: number, thicknessMm: number): number {
	return (mu * thicknessMm) / 1000;
}

/**
 * Temperature factor at the internal surface of a plane element, fRsi = (θsi − θe)/(θi − θe)
 * = 1 − Rsi/RT (ISO 13788:2012, 3.1 and 5.4), with the surface-check Rsi (0.25 m²·K/W) in place
 * of the conventional one: RT is the element total in m²·K/W computed with `rsiUsed`.
 */
export function temperatureFactor(
	rTotal: number,
	rsiUsed: number,
	rsiCheck: number = RSI_SURFACE_CHECK
): number {
	const rt = rTotal - rsiUsed + rsiCheck;
	return 1 - rsiCheck / rt;
}

/**
 * Minimum temperature factor for one month from the 80 % surface-humidity criterion
 * (ISO 13788:2012, 5.2): psat,min = pi/0.8, θsi,min = θ(psat,min), fRsi,min = (θsi,min − θe)/(θi − θe).
 * fRsi,min is null when θe ≥ θi (no heat flows out; the factor is undefined), also when θi − θe
 * is below {@link DT_NEGLIGIBLE_K} (the factor would be round-off divided by nothing), and, with
 * θsi,min, when there is no vapour inside (pi = 0). Temperatures °C, pi Pa.
 */
export function minimumTemperatureFactor(
	internalTemperatureC: number,
	externalTemperatureC: number,
	internalVapourPressurePa: number,
	criticalRh: number = SURFACE_RH_CRITICAL
): { fRsiMin: number | null; minSurfaceTemperature: number | null; minSaturationPressure: number } {
	const psatMin = internalVapourPressurePa / criticalRh;
	if (!(psatMin > 0)) return { fRsiMin: null, minSurfaceTemperature: null, minSaturationPressure: 0 };
	const thetaSiMin = saturationTemperature(psatMin);
	const dT = internalTemperatureC - externalTemperatureC;
	return {
		fRsiMin: dT >= DT_NEGLIGIBLE_K ? (thetaSiMin - externalTemperatureC) / dT : null,
		minSurfaceTemperature: thetaSiMin,
		minSaturationPressure: psatMin
	};
}
