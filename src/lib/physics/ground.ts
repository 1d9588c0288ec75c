/**
 * Heat transfer through a slab-on-ground floor, ISO 13370:2017 clause 8.1 (ground conductivity:
 * Table 7), and the thermal resistance of a roof space above an insulated ceiling, ISO 6946:2017
 * (Table 9).
 * Formulas, clause and table numbers are given FROM MEMORY (not checked against a copy of the
 * standards); the tests show the hand calculations.
 */

/** Where the ground conductivities come from, as notes and reports cite it (no parentheses inside). */
export const GROUND_LAMBDA_SOURCE = 'ISO 13370:2017, Table 7, from memory; Table 1 in the 2007 edition';

/**
 * Thermal conductivity of the ground when its kind is not known, W/(m·K): the conventional choice.
 * ISO 13370:2017, Table 7 and the text beside it (from memory; Table 1 in the 2007 edition).
 */
export const GROUND_LAMBDA_DEFAULT = 2.0; // ISO 13370:2017, Table 7 (from memory): to use when the ground is not known

/**
 * Thermal conductivity of the unfrozen ground by kind, W/(m·K).
 * ISO 13370:2017, Table 7 (from memory; Table 1 in the 2007 edition).
 */
export const GROUND_LAMBDA = {
	'clay-or-silt': 1.5, // ISO 13370:2017, Table 7 (from memory): clay or silt
	'sand-or-gravel': 2.0, // ISO 13370:2017, Table 7 (from memory): sand or gravel
	'homogeneous-rock': 3.5 // ISO 13370:2017, Table 7 (from memory): homogeneous rock
} as const;
export type GroundKind = keyof typeof GROUND_LAMBDA;

/** Plain names of the kinds of ground. */
export const GROUND_KIND_LABELS: Readonly<Record<GroundKind, string>> = {
	'clay-or-silt': 'clay or silt',
	'sand-or-gravel': 'sand or gravel',
	'homogeneous-rock': 'homogeneous rock'
};

/** The kind of ground whose tabulated λ (W/(m·K)) equals `lambda`, if any. */
export function groundKindOf(lambda: number): GroundKind | null {
	const kinds = Object.keys(GROUND_LAMBDA) as GroundKind[];
	return kinds.find((k) => Math.abs(GROUND_LAMBDA[k] - lambda) < 1e-9) ?? null;
}

/**
 * Where the ground's λ (W/(m·K)) of a floor comes from, in words: the conventional value when none is
 * given, else the value as given and, when it is one of them, the kind of ground it is tabulated for
 * (ISO 13370:2017, Table 7, from memory).
 */
export function groundLambdaSource(given: number | undefined): string {
	if (given === undefined)
		return `not given: the conventional value where the ground is not known (${GROUND_LAMBDA_SOURCE})`;
	const kind = groundKindOf(given);
	if (!kind) return 'as given';
	const unknown = kind === 'sand-or-gravel' ? ', also the value where the ground is not known' : '';
	return `as given: the value for ${GROUND_KIND_LABELS[kind]}${unknown} (${GROUND_LAMBDA_SOURCE})`;
}

/** Thickness of the external walls at ground level when none is given, m. */
export const WALL_THICKNESS_DEFAULT_M = 0.3; // common practice, no source (a typical full wall thickness)

export interface GroundFloorInput {
	/** exposed perimeter of the floor (the length of external wall around it), m */
	perimeterM: number;
	/** floor area, m² */
	areaM2: number;
	/** thermal conductivity of the unfrozen ground, W/(m·K) (default 2.0) */
	groundLambda?: number;
	/** full thickness of the external walls at ground level, m (default 0.3) */
	wallThicknessM?: number;
}

export interface GroundFloorResult {
	/** characteristic dimension B' = A / (0.5·P), m */
	characteristicDimensionM: number;
	/** total equivalent thickness dt = w + λg·(Rsi + Rf + Rse), m */
	equivalentThicknessM: number;
	groundLambda: number;
	wallThicknessM: number;
	/** which of the two expressions applies */
	regime: 'dt < B′' | 'dt ≥ B′';
	/** U-value of the floor in contact with the ground, W/(m²·K) */
	u: number;
}

/**
 * Characteristic dimension of a floor, B' = A / (0.5·P), m (ISO 13370:2017, 8.1, from memory):
 * area A in m², exposed perimeter P in m.
 */
export function characteristicDimension(areaM2: number, perimeterM: number): number {
	return areaM2 / (0.5 * perimeterM);
}

/**
 * U-value of a slab-on-ground floor, W/(m²·K) (ISO 13370:2017, 8.1, from memory):
 * dt = w + λg·(Rsi + Rf + Rse), with Rf the thermal resistance of the floor construction (its
 * layers, without surface resistances), and
 *   dt < B' (uninsulated and moderately insulated): U = 2λg / (π·B' + dt) · ln(π·B'/dt + 1)
 *   dt ≥ B' (well insulated):                     U = λg / (0.457·B' + dt)
 * Resistances in m²·K/W, lengths in m.
 */
export function slabOnGroundU(
	ground: GroundFloorInput,
	rsi: number,
	rFloor: number,
	rse: number
): GroundFloorResult {
	const lambda = ground.groundLambda ?? GROUND_LAMBDA_DEFAULT;
	const w = ground.wallThicknessM ?? WALL_THICKNESS_DEFAULT_M;
	const b = characteristicDimension(ground.areaM2, ground.perimeterM);
	const dt = w + lambda * (rsi + rFloor + rse);
	const small = dt < b;
	const u = small
		? ((2 * lambda) / (Math.PI * b + dt)) * Math.log((Math.PI * b) / dt + 1)
		: lambda / (0.457 * b + dt);
	return {
		characteristicDimensionM: b,
		equivalentThicknessM: dt,
		groundLambda: lambda,
		wallThicknessM: w,
		regime: small ? 'dt < B′' : 'dt ≥ B′',
		u
	};
}

export const ROOF_SPACES = [
	'tiles-no-felt',
	'tiles-with-felt-or-boards',
	'tiles-with-foil-lined-felt',
	'boards-and-felt'
] as const;
export type RoofSpace = (typeof ROOF_SPACES)[number];

/** Where the roof-space resistances come from, as notes cite it (no parentheses inside: reports read it). */
export const ROOF_SPACE_SOURCE = 'ISO 6946:2017, Table 9, from memory; Table 3 in the 2007 edition';

/**
 * Thermal resistance Ru of a roof space above an insulated flat ceiling, m²·K/W, which includes
 * the resistance of the ventilated roof space and of the roof covering, and replaces nothing: it
 * is added between the last layer and Rse (ISO 6946:2017, Table 9 "thermal resistance of roof
 * spaces", from memory; Table 3 in the 2007 edition).
 */
export const ROOF_SPACE_RESISTANCE: Readonly<Record<RoofSpace, number>> = {
	'tiles-no-felt': 0.06, // ISO 6946:2017, Table 9 (from memory): tiled roof, no felt, boards or similar
	'tiles-with-felt-or-boards': 0.2, // ISO 6946:2017, Table 9 (from memory): sheeted or tiled roof with felt or boards under the tiles
	'tiles-with-foil-lined-felt': 0.3, // ISO 6946:2017, Table 9 (from memory): as above with aluminium-faced cladding or other low-emissivity surface at the underside
	'boards-and-felt': 0.3 // ISO 6946:2017, Table 9 (from memory): roof lined with boards and felt
};

/** Plain descriptions of the roof-space kinds. */
export const ROOF_SPACE_LABELS: Readonly<Record<RoofSpace, string>> = {
	'tiles-no-felt': 'Tiles, no felt or boards under them',
	'tiles-with-felt-or-boards': 'Tiles with felt or boards under them',
	'tiles-with-foil-lined-felt': 'Tiles with foil-faced felt under them',
	'boards-and-felt': 'Roof lined with boards and felt'
};
