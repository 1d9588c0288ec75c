/**
 * What the ISO 13370 calculations beyond the slab on ground share (suspended floors, basements,
 * edge insulation): the floor's exposed perimeter and area, the ground's conductivity by value or by
 * kind of soil (the λ of ./ground), the wall thickness, their ranges, the conventional surface
 * resistances, the two expressions for a floor in the ground, and the cautions.
 * Formulas and clause numbers of ISO 13370:2017 are given FROM MEMORY, as in ./ground.
 */
import { z } from 'zod';
import {
	characteristicDimension,
	GROUND_KIND_LABELS,
	GROUND_LAMBDA,
	GROUND_LAMBDA_DEFAULT,
	GROUND_LAMBDA_SOURCE,
	groundLambdaSource,
	WALL_THICKNESS_DEFAULT_M,
	type GroundKind
} from './ground';
import { RSE, RSI } from './resistances';
import { CHARACTERISTIC_DIMENSION_MAX_M } from './bounds';
import {
	atMost,
	checkFields,
	isPositive,
	nonNegative,
	num,
	oneOf,
	positive,
	type Add,
	type Rule
} from './calc-parse';
import { CAUTIONS } from './cautions';
import { fmt } from './note-format';

/** Internal surface resistance of a floor (heat flow downward), m²·K/W, as ISO 13370 takes it from ISO 6946. */
export const GROUND_RSI_FLOOR = RSI.downward; // ISO 6946:2017, Table 7 (from memory): 0.17, downward
/** Internal surface resistance of a basement wall (horizontal heat flow), m²·K/W. */
export const GROUND_RSI_WALL = RSI.horizontal; // ISO 6946:2017, Table 7 (from memory): 0.13, horizontal
/** External surface resistance in the equivalent thicknesses, m²·K/W. */
export const GROUND_RSE = RSE; // ISO 6946:2017, Table 7 (from memory): 0.04

const GROUND_KINDS = Object.keys(GROUND_LAMBDA) as [GroundKind, ...GroundKind[]];

/** The floor's fields every ISO 13370 calculation takes. */
export const floorFields = {
	/** exposed perimeter P of the floor, m (walls to other heated spaces left out) */
	perimeterM: num(),
	/** floor area A, m² */
	areaM2: num(),
	/** thermal conductivity λ of the unfrozen ground, W/(m·K); or give groundKind; default 2.0 */
	groundLambda: num().optional(),
	/** the kind of soil, for its tabulated λ (ISO 13370:2017, Table 7, from memory) */
	groundKind: oneOf(GROUND_KINDS).optional(),
	/** full thickness w of the walls at ground level, m (default 0.3) */
	wallThicknessM: num().optional()
};

export interface FloorFields {
	perimeterM: number;
	areaM2: number;
	groundLambda?: number;
	groundKind?: GroundKind;
	wallThicknessM?: number;
}

/** Ranges of the floor's fields, the same as the slab on ground's in ./schema. */
export const FLOOR_RULES: Readonly<Record<string, readonly Rule[]>> = {
	perimeterM: [positive('m'), atMost(100000, '100 000 m')],
	areaM2: [positive('m²'), atMost(1000000, '1 000 000 m²')],
	groundLambda: [positive('W/(m·K)'), atMost(10, '10 W/(m·K)')],
	wallThicknessM: [nonNegative('m'), atMost(3, '3 m')]
};

/** The floor's ranges, λ or its kind (not both), and B′ within its bound. */
export function checkFloor(f: unknown, add: Add): void {
	if (typeof f !== 'object' || f === null) return;
	checkFields(f, FLOOR_RULES, [], add);
	const g = f as Record<string, unknown>;
	if (g.groundLambda !== undefined && g.groundKind !== undefined)
		add(['groundKind'], 'must not be given with groundLambda: give the ground’s λ or its kind, not both');
	if (isPositive(g.perimeterM) && isPositive(g.areaM2)) {
		const b = characteristicDimension(g.areaM2, g.perimeterM);
		if (b > CHARACTERISTIC_DIMENSION_MAX_M * (1 + 1e-9))
			add(
				['perimeterM'],
				`gives B′ = A/(0.5·P) = ${fmt(b, 0)} m, more than ${CHARACTERISTIC_DIMENSION_MAX_M} m: the exposed perimeter is too small for the floor area`
			);
	}
}

/** Labels of the floor's fields for messages. */
export const FLOOR_LABELS: Readonly<Record<string, string>> = {
	perimeterM: 'exposed perimeter P',
	areaM2: 'floor area A',
	groundLambda: 'ground conductivity λ',
	groundKind: 'kind of ground',
	wallThicknessM: 'wall thickness w'
};

/** The floor as the formulas take it: λ with its source, w, B′. */
export interface ResolvedFloor {
	/** λ of the ground, W/(m·K) */
	groundLambda: number;
	/** where λ comes from, in words */
	groundLambdaSource: string;
	/** w, m */
	wallThicknessM: number;
	/** B′ = A/(0.5·P), m */
	characteristicDimensionM: number;
}

/** λ (given, by kind, or the conventional 2.0), w and B′ of a validated floor. */
export function resolveFloor(f: FloorFields): ResolvedFloor {
	const lambda = f.groundLambda ?? (f.groundKind ? GROUND_LAMBDA[f.groundKind] : GROUND_LAMBDA_DEFAULT);
	const source = f.groundKind
		? `by the kind of ground: the value for ${GROUND_KIND_LABELS[f.groundKind]} (${GROUND_LAMBDA_SOURCE})`
		: groundLambdaSource(f.groundLambda);
	return {
		groundLambda: lambda,
		groundLambdaSource: source,
		wallThicknessM: f.wallThicknessM ?? WALL_THICKNESS_DEFAULT_M,
		characteristicDimensionM: characteristicDimension(f.areaM2, f.perimeterM)
	};
}

/**
 * U of a floor in the ground by the expression of uninsulated and moderately insulated floors,
 * 2λ/(π·B′ + d)·ln(π·B′/d + 1), W/(m²·K): the suspended floor's ground part Ug with d = dg
 * (ISO 13370:2017, 8.2), and the floor of a basement with d = dt + z/2 (8.3) (from memory).
 */
export function floorLogU(lambda: number, b: number, d: number): number {
	return ((2 * lambda) / (Math.PI * b + d)) * Math.log((Math.PI * b) / d + 1);
}

/**
 * U of a basement floor at depth z, W/(m²·K) (ISO 13370:2017, 8.3, from memory):
 * (dt + z/2) < B′: Ubf = 2λ/(π·B′ + dt + z/2)·ln(π·B′/(dt + z/2) + 1); otherwise
 * Ubf = λ/(0.457·B′ + dt + z/2). With z = 0 these are the slab on ground's (8.1, ./ground).
 */
export function basementFloorU(
	lambda: number,
	b: number,
	dt: number,
	z: number
): { u: number; wellInsulated: boolean } {
	const d = dt + z / 2;
	const wellInsulated = d >= b;
	return { u: wellInsulated ? lambda / (0.457 * b + d) : floorLogU(lambda, b, d), wellInsulated };
}

/** Cautions carried by every ISO 13370 result of these modules. */
export const GROUND_CAUTIONS: readonly string[] = [
	'Heat transfer through the ground by ISO 13370 is the steady-state (annual mean) part only: seasonal variations, groundwater, frost and the three-dimensional effects of corners and irregular shapes are not included. The characteristic dimension B′ stands for the whole floor.',
	'The ground’s conductivity is conventional unless measured; results for a particular site can differ.',
	CAUTIONS[CAUTIONS.length - 1]
];

/** The zod object of a floor with `extra` fields. */
export const floorObject = <T extends z.ZodRawShape>(extra: T, what: string) =>
	z.object({ ...floorFields, ...extra }, { error: () => `must be an object with ${what}` });
