/**
 * Suspended floor over an underfloor space ventilated by outside air, ISO 13370:2017, 8.2
 * (numbering as recalled; formulas FROM MEMORY):
 *   dg = w + λ·(Rsi + Rg + Rse)                                  equivalent thickness of the ground
 *   Ug = 2λ/(π·B′ + dg)·ln(π·B′/dg + 1)                          heat flow through the ground
 *   Ux = 2·h·Uw/B′ + 1450·ε·v·fw/B′                             through the underfloor walls and by ventilation
 *   U  = 1/(1/Uf + 1/(Ug + Ux))
 * with Uf the U of the suspended floor deck, h the height of its upper surface above the outside
 * ground, Uw the U of the underfloor space's walls above the ground, ε the area of ventilation
 * openings per metre of exposed perimeter, v the mean wind speed at 10 m height and fw the wind
 * shielding factor.
 */
import { z } from 'zod';
import {
	addTo,
	ALWAYS,
	assertFinite,
	assertParsed,
	atMost,
	checkFields,
	isPositive,
	nonNegative,
	num,
	oneOf,
	parseCalculation,
	positive,
	type Add,
	type Parsed
} from './calc-parse';
import {
	checkFloor,
	FLOOR_LABELS,
	floorLogU,
	floorObject,
	GROUND_CAUTIONS,
	GROUND_RSE,
	GROUND_RSI_FLOOR,
	resolveFloor,
	type ResolvedFloor
} from './ground-input';
import { fmt } from './note-format';

/** The ventilation term's coefficient, 1450 (ISO 13370:2017, 8.2, from memory). */
export const SUSPENDED_VENTILATION_COEFFICIENT = 1450; // ISO 13370:2017, 8.2 (from memory): Ux ventilation term 1450·ε·v·fw/B′

export const WIND_SHIELDINGS = ['sheltered', 'average', 'exposed'] as const;
export type WindShielding = (typeof WIND_SHIELDINGS)[number];

/** Wind shielding factor fw by the site's exposure (ISO 13370:2017, table of wind shielding factors, from memory). */
export const WIND_SHIELDING_FACTOR: Readonly<Record<WindShielding, number>> = {
	sheltered: 0.02, // ISO 13370:2017 (from memory): sheltered, e.g. a city centre
	average: 0.05, // ISO 13370:2017 (from memory): average, e.g. suburban
	exposed: 0.1 // ISO 13370:2017 (from memory): exposed, e.g. rural
};

export const WIND_SHIELDING_LABELS: Readonly<Record<WindShielding, string>> = {
	sheltered: 'sheltered (city centre)',
	average: 'average (suburban)',
	exposed: 'exposed (rural)'
};

const shape = floorObject(
	{
		/** Uf, thermal transmittance of the suspended floor deck (inside to the underfloor space), W/(m²·K) */
		floorU: num(),
		/** h, height of the floor's upper surface above the outside ground level, m */
		heightM: num(),
		/** Uw, thermal transmittance of the underfloor space's walls above the ground, W/(m²·K) */
		underfloorWallU: num(),
		/** ε, area of ventilation openings per metre of exposed perimeter, m²/m */
		openingsPerPerimeter: num(),
		/** v, mean wind speed at 10 m height, m/s */
		windSpeed: num(),
		/** fw by exposure; or give windShieldingFactor */
		windShielding: oneOf(WIND_SHIELDINGS).optional(),
		/** fw as a number */
		windShieldingFactor: num().optional(),
		/** Rg, thermal resistance of insulation on the ground under the floor, m²·K/W (default 0) */
		groundInsulationR: num().optional()
	},
	'floorU, heightM, underfloorWallU, openingsPerPerimeter and windSpeed'
);
export type SuspendedFloorInput = z.infer<typeof shape>;

const RULES = {
	floorU: [positive('W/(m²·K)'), atMost(10, '10 W/(m²·K)')],
	heightM: [nonNegative('m'), atMost(10, '10 m')],
	underfloorWallU: [nonNegative('W/(m²·K)'), atMost(10, '10 W/(m²·K)')],
	openingsPerPerimeter: [nonNegative('m²/m'), atMost(1, '1 m²/m')],
	windSpeed: [nonNegative('m/s'), atMost(50, '50 m/s')],
	windShieldingFactor: [nonNegative(), atMost(1, '1')],
	groundInsulationR: [nonNegative('m²·K/W'), atMost(50, '50 m²·K/W')]
};

function checkSuspended(f: Record<string, unknown>, add: Add): void {
	checkFloor(f, add);
	checkFields(f, RULES, [], add);
	if (f.windShielding !== undefined && f.windShieldingFactor !== undefined)
		add(
			['windShieldingFactor'],
			'must not be given with windShielding: give the exposure or the factor, not both'
		);
	else if (
		f.windShielding === undefined &&
		f.windShieldingFactor === undefined &&
		isPositive(f.openingsPerPerimeter) &&
		isPositive(f.windSpeed)
	)
		add(
			['windShielding'],
			'must be given (sheltered, average or exposed), or windShieldingFactor, for the ventilation term'
		);
}

export const suspendedFloorSchema = shape.superRefine((f, ctx) => {
	if (typeof f === 'object' && f !== null) checkSuspended(f, addTo(ctx));
}, ALWAYS);

const LABELS = {
	lists: {},
	fields: {
		...FLOOR_LABELS,
		floorU: 'floor deck U-value Uf',
		heightM: 'floor height above the ground h',
		underfloorWallU: 'underfloor wall U-value Uw',
		openingsPerPerimeter: 'ventilation openings per perimeter ε',
		windSpeed: 'wind speed v',
		windShielding: 'wind shielding',
		windShieldingFactor: 'wind shielding factor fw',
		groundInsulationR: 'ground insulation resistance Rg'
	}
};

/** Validate a raw suspended-floor input without throwing: field-named issues, or the data. */
export function parseSuspendedFloorInput(raw: unknown): Parsed<SuspendedFloorInput> {
	return parseCalculation(suspendedFloorSchema, raw, LABELS);
}

export interface SuspendedFloorResult extends ResolvedFloor {
	/** dg = w + λ·(Rsi + Rg + Rse), m */
	equivalentThicknessM: number;
	rsi: number;
	rse: number;
	groundInsulationR: number;
	/** fw used (0 when there are no openings and none is given) */
	windShieldingFactor: number;
	/** Ug, W/(m²·K) */
	ug: number;
	/** Ux and its two parts, W/(m²·K) */
	ux: number;
	uxWalls: number;
	uxVentilation: number;
	/** Uf as given, W/(m²·K) */
	floorU: number;
	/** U of the whole suspended floor, W/(m²·K) */
	u: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

function methodText(): string[] {
	return [
		'ISO 13370:2017, 8.2 (suspended floors; numbering and formulas from memory): U = 1/(1/Uf + 1/(Ug + Ux)).',
		'Ground: dg = w + λ·(Rsi + Rg + Rse), Ug = 2λ/(π·B′ + dg)·ln(π·B′/dg + 1), B′ = A/(0.5·P).',
		`Underfloor walls and ventilation: Ux = 2·h·Uw/B′ + ${SUSPENDED_VENTILATION_COEFFICIENT}·ε·v·fw/B′.`,
		'Uf is the floor deck’s U between the inside and the underfloor space, by ISO 6946 with an internal surface resistance on both faces (as recalled); Rsi = 0.17 and Rse = 0.04 m²·K/W in dg.'
	];
}

/**
 * U of a suspended floor by ISO 13370 (see the module's comment), W/(m²·K). Raw input is
 * validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseSuspendedFloor(raw: unknown): SuspendedFloorResult {
	const f = assertParsed(parseSuspendedFloorInput(raw));
	const floor = resolveFloor(f);
	const { groundLambda: lambda, characteristicDimensionM: b } = floor;
	const rg = f.groundInsulationR ?? 0;
	const fw = f.windShieldingFactor ?? (f.windShielding ? WIND_SHIELDING_FACTOR[f.windShielding] : 0);
	const dg = floor.wallThicknessM + lambda * (GROUND_RSI_FLOOR + rg + GROUND_RSE);
	const ug = floorLogU(lambda, b, dg);
	const uxWalls = (2 * f.heightM * f.underfloorWallU) / b;
	const uxVentilation = (SUSPENDED_VENTILATION_COEFFICIENT * f.openingsPerPerimeter * f.windSpeed * fw) / b;
	const ux = uxWalls + uxVentilation;
	const notes = [`Ground λ = ${fmt(lambda, 2)} W/(m·K): ${floor.groundLambdaSource}.`];
	if (f.windShielding)
		notes.push(`fw = ${fw}: ${WIND_SHIELDING_LABELS[f.windShielding]} (ISO 13370:2017, from memory).`);
	const result: SuspendedFloorResult = {
		...floor,
		equivalentThicknessM: dg,
		rsi: GROUND_RSI_FLOOR,
		rse: GROUND_RSE,
		groundInsulationR: rg,
		windShieldingFactor: fw,
		ug,
		ux,
		uxWalls,
		uxVentilation,
		floorU: f.floorU,
		u: 1 / (1 / f.floorU + 1 / (ug + ux)),
		method: methodText(),
		notes,
		cautions: [...GROUND_CAUTIONS]
	};
	assertFinite(result, 'the ISO 13370 suspended floor');
	return result;
}
