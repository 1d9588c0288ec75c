/**
 * Basements, ISO 13370:2017 (numbering as recalled; formulas FROM MEMORY):
 *
 * Heated basement (8.3), floor at depth z below the outside ground:
 *   dt = w + λ·(Rsi + Rf + Rse), dw = λ·(Rsi + Rw + Rse)
 *   floor: (dt + z/2) < B′: Ubf = 2λ/(π·B′ + dt + z/2)·ln(π·B′/(dt + z/2) + 1)
 *          otherwise:       Ubf = λ/(0.457·B′ + dt + z/2)
 *   walls: Ubw = 2λ/(π·z)·(1 + 0.5·dt/(dt + z))·ln(z/dw + 1), for dw ≥ dt; for dw < dt, dt is
 *          replaced by dw in it
 *   whole basement in the ground: H = A·Ubf + z·P·Ubw, U′ = H/(A + z·P)
 *
 * Unheated basement (8.4), the floor above it of U = Uf:
 *   1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V)
 * with Ubf and Ubw as above for the basement's own floor and walls, h and Uw the height and U of its
 * walls above the ground, n its air change rate (h⁻¹) and V its air volume (m³).
 */
import { z } from 'zod';
import {
	addTo,
	ALWAYS,
	assertFinite,
	assertParsed,
	atMost,
	checkFields,
	nonNegative,
	num,
	parseCalculation,
	positive,
	type Parsed,
	type Rule
} from './calc-parse';
import {
	basementFloorU,
	checkFloor,
	FLOOR_LABELS,
	floorObject,
	GROUND_CAUTIONS,
	GROUND_RSE,
	GROUND_RSI_FLOOR,
	GROUND_RSI_WALL,
	resolveFloor,
	type ResolvedFloor
} from './ground-input';
import { fmt } from './note-format';

/** Volumetric heat capacity of air, Wh/(m³·K), in the ventilation term 0.33·n·V. */
export const AIR_HEAT_CAPACITY_WH = 0.33; // ISO 13370:2017, 8.4 (from memory); also ISO 6946 and ISO 13789

const basementFields = {
	/** z, depth of the basement floor below the outside ground level, m */
	depthM: num(),
	/** Rf, thermal resistance of the basement floor construction (without surface resistances), m²·K/W */
	floorR: num(),
	/** Rw, thermal resistance of the basement walls below the ground (without surface resistances), m²·K/W */
	wallR: num()
};
const unheatedFields = {
	...basementFields,
	/** Uf, U of the floor between the heated space and the basement, W/(m²·K) */
	floorU: num(),
	/** h, height of the basement walls above the outside ground level, m */
	wallAboveGroundHeightM: num(),
	/** Uw, U of the basement walls above the ground, W/(m²·K) */
	wallAboveGroundU: num(),
	/** n, air change rate of the basement, h⁻¹ */
	airChangeRate: num(),
	/** V, air volume of the basement, m³ */
	volumeM3: num()
};

const heatedShape = floorObject(basementFields, 'depthM, floorR and wallR');
const unheatedShape = floorObject(
	unheatedFields,
	'depthM, floorR, wallR, floorU, wallAboveGroundHeightM, wallAboveGroundU, airChangeRate and volumeM3'
);
export type HeatedBasementInput = z.infer<typeof heatedShape>;
export type UnheatedBasementInput = z.infer<typeof unheatedShape>;

const R = [nonNegative('m²·K/W'), atMost(50, '50 m²·K/W')];
const U = [nonNegative('W/(m²·K)'), atMost(10, '10 W/(m²·K)')];
const RULES: Readonly<Record<string, readonly Rule[]>> = {
	depthM: [
		[
			(v: number) => v > 0,
			'must be greater than 0 m',
			'a floor at ground level is a slab on ground'
		] as const,
		atMost(50, '50 m')
	],
	floorR: R,
	wallR: R,
	floorU: [positive('W/(m²·K)'), atMost(10, '10 W/(m²·K)')],
	wallAboveGroundHeightM: [nonNegative('m'), atMost(50, '50 m')],
	wallAboveGroundU: U,
	airChangeRate: [nonNegative('h⁻¹'), atMost(100, '100 h⁻¹')],
	volumeM3: [nonNegative('m³'), atMost(1e7, '10 000 000 m³')]
};

const refine = (f: unknown, ctx: z.RefinementCtx) => {
	if (typeof f !== 'object' || f === null) return;
	const add = addTo(ctx);
	checkFloor(f, add);
	checkFields(f, RULES, [], add);
};
export const heatedBasementSchema = heatedShape.superRefine(refine, ALWAYS);
export const unheatedBasementSchema = unheatedShape.superRefine(refine, ALWAYS);

const LABELS = {
	lists: {},
	fields: {
		...FLOOR_LABELS,
		areaM2: 'basement floor area A',
		perimeterM: 'exposed perimeter P of the basement',
		depthM: 'basement depth z',
		floorR: 'basement floor resistance Rf',
		wallR: 'basement wall resistance Rw',
		floorU: 'U-value Uf of the floor above the basement',
		wallAboveGroundHeightM: 'height h of the basement walls above the ground',
		wallAboveGroundU: 'U-value Uw of the basement walls above the ground',
		airChangeRate: 'air change rate n',
		volumeM3: 'basement air volume V'
	}
};

/** Validate a raw heated-basement input without throwing: field-named issues, or the data. */
export function parseHeatedBasementInput(raw: unknown): Parsed<HeatedBasementInput> {
	return parseCalculation(heatedBasementSchema, raw, LABELS);
}

/** Validate a raw unheated-basement input without throwing: field-named issues, or the data. */
export function parseUnheatedBasementInput(raw: unknown): Parsed<UnheatedBasementInput> {
	return parseCalculation(unheatedBasementSchema, raw, LABELS);
}

/** The basement's floor and walls in the ground (8.3), shared by the heated and unheated cases. */
export interface BasementInGround extends ResolvedFloor {
	depthM: number;
	/** dt = w + λ·(Rsi + Rf + Rse), m */
	floorEquivalentThicknessM: number;
	/** dw = λ·(Rsi + Rw + Rse), m */
	wallEquivalentThicknessM: number;
	floorRegime: '(dt + z/2) < B′' | '(dt + z/2) ≥ B′';
	/** Ubf, W/(m²·K) */
	ubf: number;
	/** Ubw, W/(m²·K) */
	ubw: number;
	/** true when dw < dt and dw took dt's place in Ubw */
	wallUsedDw: boolean;
	rsiFloor: number;
	rsiWall: number;
	rse: number;
}

/** Ubf and Ubw of a basement in the ground (ISO 13370:2017, 8.3, from memory). */
export function basementInGround(f: HeatedBasementInput): BasementInGround {
	const floor = resolveFloor(f);
	const { groundLambda: lambda, characteristicDimensionM: b, wallThicknessM: w } = floor;
	const z = f.depthM;
	const dt = w + lambda * (GROUND_RSI_FLOOR + f.floorR + GROUND_RSE);
	const dw = lambda * (GROUND_RSI_WALL + f.wallR + GROUND_RSE);
	const bf = basementFloorU(lambda, b, dt, z);
	const d = Math.min(dt, dw); // dw < dt: dt replaced by dw
	const ubw = ((2 * lambda) / (Math.PI * z)) * (1 + (0.5 * d) / (d + z)) * Math.log(z / dw + 1);
	return {
		...floor,
		depthM: z,
		floorEquivalentThicknessM: dt,
		wallEquivalentThicknessM: dw,
		floorRegime: bf.wellInsulated ? '(dt + z/2) ≥ B′' : '(dt + z/2) < B′',
		ubf: bf.u,
		ubw,
		wallUsedDw: dw < dt,
		rsiFloor: GROUND_RSI_FLOOR,
		rsiWall: GROUND_RSI_WALL,
		rse: GROUND_RSE
	};
}

const BASEMENT_METHOD = [
	'Basement in the ground, ISO 13370:2017, 8.3 (numbering and formulas from memory): dt = w + λ·(Rsi + Rf + Rse) with Rsi = 0.17, dw = λ·(Rsi + Rw + Rse) with Rsi = 0.13, Rse = 0.04 m²·K/W; B′ = A/(0.5·P).',
	'Floor: (dt + z/2) < B′: Ubf = 2λ/(π·B′ + dt + z/2)·ln(π·B′/(dt + z/2) + 1); otherwise Ubf = λ/(0.457·B′ + dt + z/2).',
	'Walls: Ubw = 2λ/(π·z)·(1 + 0.5·dt/(dt + z))·ln(z/dw + 1), dt replaced by dw where dw < dt.'
];

export interface HeatedBasementResult extends BasementInGround {
	/** H = A·Ubf + z·P·Ubw, the steady-state heat transfer coefficient through the ground, W/K */
	heatTransferCoefficient: number;
	/** U′ = H/(A + z·P), the basement's characteristic U over its floor and walls in the ground, W/(m²·K) */
	u: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

const lambdaNote = (g: ResolvedFloor) =>
	`Ground λ = ${fmt(g.groundLambda, 2)} W/(m·K): ${g.groundLambdaSource}.`;

/**
 * A heated basement by ISO 13370 (see the module's comment): Ubf, Ubw, H and U′. Raw input is
 * validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseHeatedBasement(raw: unknown): HeatedBasementResult {
	const f = assertParsed(parseHeatedBasementInput(raw));
	const g = basementInGround(f);
	const h = f.areaM2 * g.ubf + f.depthM * f.perimeterM * g.ubw;
	const result: HeatedBasementResult = {
		...g,
		heatTransferCoefficient: h,
		u: h / (f.areaM2 + f.depthM * f.perimeterM),
		method: [
			...BASEMENT_METHOD,
			'Heated basement: H = A·Ubf + z·P·Ubw, U′ = H/(A + z·P). The walls above the ground are ordinary external walls (ISO 6946), not included here.'
		],
		notes: [lambdaNote(g)],
		cautions: [...GROUND_CAUTIONS]
	};
	assertFinite(result, 'the ISO 13370 heated basement');
	return result;
}

export interface UnheatedBasementResult extends BasementInGround {
	/** A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V, W/K */
	basementLossCoefficient: number;
	/** its ventilation part 0.33·n·V, W/K */
	ventilationCoefficient: number;
	floorU: number;
	/** U of the floor above the unheated basement, W/(m²·K) */
	u: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

/**
 * The floor above an unheated basement by ISO 13370 (see the module's comment), W/(m²·K). Raw
 * input is validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseUnheatedBasement(raw: unknown): UnheatedBasementResult {
	const f = assertParsed(parseUnheatedBasementInput(raw));
	const g = basementInGround(f);
	const ventilation = AIR_HEAT_CAPACITY_WH * f.airChangeRate * f.volumeM3;
	const loss =
		f.areaM2 * g.ubf +
		f.depthM * f.perimeterM * g.ubw +
		f.wallAboveGroundHeightM * f.perimeterM * f.wallAboveGroundU +
		ventilation;
	const result: UnheatedBasementResult = {
		...g,
		basementLossCoefficient: loss,
		ventilationCoefficient: ventilation,
		floorU: f.floorU,
		u: 1 / (1 / f.floorU + f.areaM2 / loss),
		method: [
			...BASEMENT_METHOD,
			`Unheated basement, 8.4: 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + ${AIR_HEAT_CAPACITY_WH}·n·V), n in h⁻¹ and V in m³.`
		],
		notes: [lambdaNote(g)],
		cautions: [...GROUND_CAUTIONS]
	};
	assertFinite(result, 'the ISO 13370 unheated basement');
	return result;
}
