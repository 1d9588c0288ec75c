/**
 * Slab-on-ground floor with edge insulation, ISO 13370:2017 (the edge-insulation clause beside the
 * slab on ground, 8.1; numbering as recalled, formulas FROM MEMORY):
 *   U = U0 + 2·Δψ/B′
 * with U0 the floor's U without the edge insulation (./ground, slabOnGroundU), and the edge
 * insulation's linear thermal transmittance Δψ (ψg,e) from
 *   R′ = Rn − dn/λ, d′ = R′·λ           the additional resistance of the edge insulation, and its thickness of ground
 *   horizontal, width D:  Δψ = −(λ/π)·[ln(D/dt + 1) − ln(D/(dt + d′) + 1)]
 *   vertical, depth D:    Δψ = −(λ/π)·[ln(2D/dt + 1) − ln(2D/(dt + d′) + 1)]
 * Rn and dn are the thermal resistance and the thickness of the edge insulation (or of a foundation
 * of low-density material), D its width (horizontal, from the wall) or depth below the ground (vertical).
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
	oneOf,
	parseCalculation,
	type Add,
	type Parsed
} from './calc-parse';
import {
	checkFloor,
	FLOOR_LABELS,
	floorObject,
	GROUND_CAUTIONS,
	GROUND_RSE,
	GROUND_RSI_FLOOR,
	resolveFloor,
	type ResolvedFloor
} from './ground-input';
import { slabOnGroundU } from './ground';
import { fmt } from './note-format';

export const EDGE_ORIENTATIONS = ['horizontal', 'vertical'] as const;
export type EdgeOrientation = (typeof EDGE_ORIENTATIONS)[number];

const edgeShape = z.object(
	{
		orientation: oneOf(EDGE_ORIENTATIONS),
		/** D: width of horizontal insulation from the wall, or depth of vertical insulation below the ground, m */
		widthM: num(),
		/** Rn, thermal resistance of the edge insulation, m²·K/W */
		insulationR: num(),
		/** dn, thickness of the edge insulation, m */
		insulationThicknessM: num()
	},
	{ error: () => 'must be an object with orientation, widthM, insulationR and insulationThicknessM' }
);

const shape = floorObject(
	{
		/** Rf, thermal resistance of the floor construction (without surface resistances), m²·K/W */
		floorR: num(),
		edge: edgeShape
	},
	'floorR and edge'
);
export type EdgeInsulatedFloorInput = z.infer<typeof shape>;

const RULES = { floorR: [nonNegative('m²·K/W'), atMost(50, '50 m²·K/W')] };
const EDGE_RULES = {
	widthM: [nonNegative('m'), atMost(10, '10 m')],
	insulationR: [nonNegative('m²·K/W'), atMost(50, '50 m²·K/W')],
	insulationThicknessM: [nonNegative('m'), atMost(2, '2 m')]
};

function checkEdge(f: Record<string, unknown>, add: Add): void {
	checkFloor(f, add);
	checkFields(f, RULES, [], add);
	checkFields(f.edge, EDGE_RULES, ['edge'], add);
}

export const edgeInsulatedFloorSchema = shape.superRefine((f, ctx) => {
	if (typeof f === 'object' && f !== null) checkEdge(f as Record<string, unknown>, addTo(ctx));
}, ALWAYS);

const LABELS = {
	lists: {},
	fields: {
		...FLOOR_LABELS,
		floorR: 'floor resistance Rf',
		edge: 'edge insulation',
		orientation: 'orientation',
		widthM: 'width or depth D',
		insulationR: 'resistance Rn',
		insulationThicknessM: 'thickness dn'
	}
};

/** Δψ (ψg,e) of edge insulation, W/(m·K) (ISO 13370:2017, edge insulation, from memory). */
export function edgeInsulationPsi(
	orientation: EdgeOrientation,
	lambda: number,
	dt: number,
	dPrime: number,
	d: number
): number {
	const k = orientation === 'horizontal' ? 1 : 2;
	return -(lambda / Math.PI) * (Math.log((k * d) / dt + 1) - Math.log((k * d) / (dt + dPrime) + 1));
}

/** The result before the check that U stays above zero. */
function compute(f: EdgeInsulatedFloorInput) {
	const floor = resolveFloor(f);
	const slab = slabOnGroundU(
		{
			perimeterM: f.perimeterM,
			areaM2: f.areaM2,
			groundLambda: floor.groundLambda,
			wallThicknessM: floor.wallThicknessM
		},
		GROUND_RSI_FLOOR,
		f.floorR,
		GROUND_RSE
	);
	const lambda = floor.groundLambda;
	const rPrime = f.edge.insulationR - f.edge.insulationThicknessM / lambda;
	const dPrime = rPrime * lambda;
	const psi = edgeInsulationPsi(f.edge.orientation, lambda, slab.equivalentThicknessM, dPrime, f.edge.widthM);
	const u = slab.u + (2 * psi) / floor.characteristicDimensionM;
	return { floor, slab, rPrime, dPrime, psi, u };
}

/** Validate a raw edge-insulated floor without throwing: field-named issues, or the data. */
export function parseEdgeInsulatedFloorInput(raw: unknown): Parsed<EdgeInsulatedFloorInput> {
	return parseCalculation(edgeInsulatedFloorSchema, raw, LABELS, (f, add) => {
		const lambda = resolveFloor(f).groundLambda;
		if (f.edge.insulationR < f.edge.insulationThicknessM / lambda)
			add(
				['edge', 'insulationR'],
				`must be at least dn/λ = ${fmt(f.edge.insulationThicknessM / lambda)} m²·K/W, the resistance of the ground it replaces (R′ = Rn − dn/λ would be negative)`
			);
		else if (compute(f).u <= 0)
			add(
				['edge'],
				'gives a floor U of zero or less: this edge insulation lies outside the range of the method for a floor of this size; calculate the floor numerically (ISO 10211)'
			);
	});
}

export interface EdgeInsulatedFloorResult extends ResolvedFloor {
	/** dt of the slab, m */
	equivalentThicknessM: number;
	regime: string;
	/** U0, the floor without edge insulation (ISO 13370, 8.1), W/(m²·K) */
	u0: number;
	orientation: EdgeOrientation;
	/** D, m */
	widthM: number;
	/** R′ = Rn − dn/λ, m²·K/W */
	additionalResistance: number;
	/** d′ = R′·λ, m */
	additionalThicknessM: number;
	/** Δψ, W/(m·K) (≤ 0) */
	deltaPsi: number;
	/** U = U0 + 2·Δψ/B′, W/(m²·K) */
	u: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

/**
 * A slab on ground with edge insulation by ISO 13370 (see the module's comment). Raw input is
 * validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseEdgeInsulatedFloor(raw: unknown): EdgeInsulatedFloorResult {
	const f = assertParsed(parseEdgeInsulatedFloorInput(raw));
	const { floor, slab, rPrime, dPrime, psi, u } = compute(f);
	const notes = [`Ground λ = ${fmt(floor.groundLambda, 2)} W/(m·K): ${floor.groundLambdaSource}.`];
	if ((-2 * psi) / floor.characteristicDimensionM > 0.5 * slab.u)
		notes.push(
			'The edge insulation lowers U by more than half: check that it is within the range the method was made for, or calculate the floor numerically (ISO 10211).'
		);
	const result: EdgeInsulatedFloorResult = {
		...floor,
		equivalentThicknessM: slab.equivalentThicknessM,
		regime: slab.regime,
		u0: slab.u,
		orientation: f.edge.orientation,
		widthM: f.edge.widthM,
		additionalResistance: rPrime,
		additionalThicknessM: dPrime,
		deltaPsi: psi,
		u,
		method: [
			'ISO 13370:2017, slab on ground, 8.1, with edge insulation (numbering and formulas from memory): U = U0 + 2·Δψ/B′, U0 the floor without edge insulation (dt = w + λ·(Rsi + Rf + Rse), Rsi = 0.17, Rse = 0.04 m²·K/W).',
			'R′ = Rn − dn/λ, d′ = R′·λ; horizontal edge insulation of width D: Δψ = −(λ/π)·[ln(D/dt + 1) − ln(D/(dt + d′) + 1)]; vertical, of depth D: Δψ = −(λ/π)·[ln(2D/dt + 1) − ln(2D/(dt + d′) + 1)].'
		],
		notes,
		cautions: [...GROUND_CAUTIONS]
	};
	assertFinite(result, 'the ISO 13370 edge insulation');
	return result;
}
