/**
 * Surface resistances for conditions other than the conventional ones (ISO 6946:2017, Annex C; clause,
 * table and formula numbers FROM MEMORY): a surface of low emissivity, another wind speed at the outer
 * surface, other mean temperatures.
 *
 *   Rs = 1 / (hc + hr),   hr = ε·hr0,   hr0 = 4·σ·Tmn³
 *   hci = 5.0 (upward), 2.5 (horizontal), 0.7 (downward) W/(m²·K);   hce = 4 + 4·v
 *
 * with ε the hemispherical emissivity of the surface, σ the Stefan–Boltzmann constant, Tmn the mean
 * thermodynamic temperature of the surface and its surroundings, and v the wind speed next to the
 * surface, m/s. With ε = 0.9, an inside mean of 20 °C, an outside mean of 0 °C and v = 4 m/s these give
 * the conventional values of Table 7 (Rsi 0.10, 0.13, 0.17; Rse 0.04) once rounded to two decimals.
 */
import { z } from 'zod';
import type { HeatFlow } from './resistances';
import { fmt } from './note-format';

/** Stefan–Boltzmann constant σ, W/(m²·K⁴) (CODATA 2018, exact in the SI since 2019). */
export const STEFAN_BOLTZMANN = 5.670374419e-8;

/** Convective coefficient at an inside surface hci, W/(m²·K), by heat-flow direction (Annex C, from memory). */
export const HCI: Readonly<Record<HeatFlow, number>> = { upward: 5.0, horizontal: 2.5, downward: 0.7 };

/** The emissivity and mean temperatures the conventional values are worked out with (Annex C, from memory). */
export const CONVENTIONAL = {
	emissivity: 0.9,
	internalMeanC: 20,
	externalMeanC: 0,
	windSpeed: 4
} as const;

/** What may be given for the surfaces; each absent field takes its conventional value. */
export const surfaceConditionsSchema = z
	.object({
		/** hemispherical emissivity of the inside surface, 0.05–1 */
		internalEmissivity: z
			.number({ error: 'must be a number between 0.05 and 1' })
			.min(0.05, 'must be at least 0.05 (polished metal foil is about 0.05)')
			.max(1, 'must be at most 1')
			.optional(),
		/** hemispherical emissivity of the outside surface, 0.05–1 */
		externalEmissivity: z
			.number({ error: 'must be a number between 0.05 and 1' })
			.min(0.05, 'must be at least 0.05 (polished metal foil is about 0.05)')
			.max(1, 'must be at most 1')
			.optional(),
		/** wind speed next to the outer surface, m/s, 0–30 */
		windSpeed: z
			.number({ error: 'must be a number of m/s' })
			.min(0, 'must be 0 m/s or more')
			.max(30, 'must be at most 30 m/s')
			.optional()
	})
	.strict();
export type SurfaceConditions = z.infer<typeof surfaceConditionsSchema>;

/** hr0 = 4·σ·Tmn³, W/(m²·K), for a mean temperature in °C. */
export const blackBodyCoefficient = (meanC: number) => 4 * STEFAN_BOLTZMANN * (meanC + 273.15) ** 3;

/** External convective coefficient hce = 4 + 4·v, W/(m²·K). */
export const externalConvection = (windSpeed: number) => 4 + 4 * windSpeed;

export interface SurfaceFilmFigures {
	rsi: number;
	rse: number;
	hci: number;
	hri: number;
	hce: number;
	hre: number;
	/** the method lines for the notes and the report */
	notes: string[];
}

/**
 * Rsi and Rse, m²·K/W, for the conditions given (the rest conventional), by Annex C. Unrounded: a
 * figure worked out for other conditions is used as it comes.
 */
export function surfaceFilms(dir: HeatFlow, c: SurfaceConditions): SurfaceFilmFigures {
	const ei = c.internalEmissivity ?? CONVENTIONAL.emissivity;
	const ee = c.externalEmissivity ?? CONVENTIONAL.emissivity;
	const v = c.windSpeed ?? CONVENTIONAL.windSpeed;
	const hci = HCI[dir];
	const hri = ei * blackBodyCoefficient(CONVENTIONAL.internalMeanC);
	const hce = externalConvection(v);
	const hre = ee * blackBodyCoefficient(CONVENTIONAL.externalMeanC);
	const rsi = 1 / (hci + hri);
	const rse = 1 / (hce + hre);
	return {
		rsi,
		rse,
		hci,
		hri,
		hce,
		hre,
		notes: [
			`Rsi = 1/(hci + ε·hr0) = 1/(${fmt(hci, 1)} + ${fmt(ei, 2)} × ${fmt(hri / ei, 2)}) = ${fmt(rsi, 4)} m²·K/W for ${dir} heat flow, inside emissivity ${fmt(ei, 2)}, hr0 at ${CONVENTIONAL.internalMeanC} °C (ISO 6946:2017, Annex C).`,
			`Rse = 1/(hce + ε·hr0) = 1/(${fmt(hce, 1)} + ${fmt(ee, 2)} × ${fmt(hre / ee, 2)}) = ${fmt(rse, 4)} m²·K/W with hce = 4 + 4·v for a wind speed of ${fmt(v, 1)} m/s, outside emissivity ${fmt(ee, 2)}, hr0 at ${CONVENTIONAL.externalMeanC} °C (ISO 6946:2017, Annex C).`
		]
	};
}

/** Whether any condition is given (an empty object keeps the conventional values of Table 7). */
export const hasConditions = (c: SurfaceConditions | undefined): c is SurfaceConditions =>
	!!c &&
	(c.internalEmissivity !== undefined || c.externalEmissivity !== undefined || c.windSpeed !== undefined);
