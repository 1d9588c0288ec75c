/**
 * What lies beyond the last layer besides Rse: a roof space above an insulated ceiling
 * (ISO 6946:2017, Table 9, from memory) or, for a floor on the ground, the ground itself
 * (ISO 13370:2017, 8.1, slab on ground, from memory).
 */
import type { ElementInput } from './schema';
import type { ThermalModel } from './element-model';
import {
	groundLambdaSource,
	ROOF_SPACE_LABELS,
	ROOF_SPACE_RESISTANCE,
	ROOF_SPACE_SOURCE,
	slabOnGroundU
} from './ground';
import { fmt } from './note-format';
import { analyseSuspendedFloor } from './ground-suspended';
import { analyseHeatedBasement, analyseUnheatedBasement } from './ground-basement';
import { analyseEdgeInsulatedFloor } from './ground-edge';
import { analyseUnheatedSpace, type UnheatedSpaceResult } from './unheated-space';
import { CalculationInputError } from './calc-parse';

/** Where an element's unheated-space resistance comes from, as results and reports name it. */
export const UNHEATED_SPACE_METHOD =
	'ISO 6946:2017, 6.10.3, other unheated spaces (Ru = Ai/(ΣAe·Ue + 0.33·n·V)); air change by ISO 13789:2017 (from memory)';

/**
 * A core calculation of an element's part, its refusals named at the element's paths. The element's
 * schema (./schema) checks the same ranges and rules first, so a refusal here is a defect of that
 * schema; it still names the field.
 */
function named<T>(prefix: string, run: () => T): T {
	try {
		return run();
	} catch (e) {
		if (e instanceof CalculationInputError)
			throw new CalculationInputError(
				e.issues.map((i) => ({ path: `${prefix}.${i.path}`, message: i.message }))
			);
		throw e;
	}
}

/**
 * Ru of the unheated space beside the element by ISO 6946:2017, 6.10.3 (from memory): ./unheated-space
 * from the stored areas, U-values, volume and air change rate (ISO 13789's convention by airtightness).
 */
export function unheatedSpaceOf(input: ElementInput): UnheatedSpaceResult | null {
	const s = input.unheatedSpace;
	if (!s) return null;
	return named('unheatedSpace', () =>
		analyseUnheatedSpace({
			internalAreaM2: s.internalAreaM2,
			externalElements: s.externalElements,
			volumeM3: s.volumeM3,
			...(s.airChangeRate !== undefined ? { airChangeRate: s.airChangeRate } : {}),
			...(s.airtightness !== undefined ? { airtightness: s.airtightness } : {})
		})
	);
}

/**
 * Resistance Ru beyond the element's last layer, m²·K/W, added to RT between the last layer and Rse
 * (0 without): a roof space above an insulated ceiling by the table (ISO 6946:2017, Table 9, from
 * memory; Table 3 in the 2007 edition), or an unheated space beside the element by ISO 6946:2017,
 * 6.10.3 (the space as an added homogeneous layer: U = 1/(1/U0 + Ru), U0 the element as if exposed
 * to outside air, from memory). The schema refuses both together. Notes it.
 */
export function roofSpaceResistance(input: ElementInput, notes: string[]): number {
	const space = unheatedSpaceOf(input);
	if (space) {
		const n =
			space.airChangeSource === 'given'
				? `n = ${fmt(space.airChangeRate, 2)} h⁻¹ (given)`
				: `n = ${fmt(space.airChangeRate, 2)} h⁻¹ (${space.airChangeSource})`;
		notes.push(
			`Beside an unheated space, ${UNHEATED_SPACE_METHOD}: ΣAe·Ue = ${fmt(space.transmissionCoefficient)} W/K, ${n}, 0.33·n·V = ${fmt(space.ventilationCoefficient)} W/K, ` +
				`Ru = ${fmt(space.internalAreaM2)}/(${fmt(space.transmissionCoefficient)} + ${fmt(space.ventilationCoefficient)}) = ${fmt(space.ru, 4)} m²·K/W, added to RT between the last layer and Rse.`
		);
		notes.push(
			'The temperature profile and the moisture checks take the outside climate beyond Ru: the unheated space is between the element and the outside air (a steady-state simplification; its own humidity is not modelled).'
		);
		return space.ru;
	}
	if (!input.roofSpace) return 0;
	const rRoofSpace = ROOF_SPACE_RESISTANCE[input.roofSpace];
	notes.push(
		`Roof space above the ceiling (${ROOF_SPACE_LABELS[input.roofSpace].toLowerCase()}): Ru = ${rRoofSpace} m²·K/W (${ROOF_SPACE_SOURCE}) is added to RT between the last layer and Rse.`
	);
	return rRoofSpace;
}

/** A floor on the ground as the thermal model takes it. */
export interface GroundFloorModel {
	/** equivalent total resistance 1/U, m²·K/W */
	rTotal: number;
	/** Rse plus the ground's share of 1/U, between the slab's underside and the external air, m²·K/W */
	rExternal: number;
	/** the ISO 13370 figures, and RT and U of the build-up alone */
	ground: NonNullable<ThermalModel['ground']>;
}

/**
 * Floor on the ground, ISO 13370:2017, 8.1 (slab on ground, from memory): Rf = RT − Rsi − Rse of
 * the build-up (m²·K/W), U from B′ and dt (W/(m²·K)); the floor is then carried as its equivalent
 * resistance 1/U, the ground adding 1/U − RT outside the slab. Notes show the calculation and where
 * the ground's λ comes from (ISO 13370:2017, Table 7, from memory).
 */
export function groundFloorModel(
	ground: NonNullable<ElementInput['ground']>,
	rsi: number,
	rse: number,
	rBuildUp: number,
	notes: string[]
): GroundFloorModel {
	if (ground.suspended) return suspendedFloorModel(ground, ground.suspended, rsi, rse, rBuildUp, notes);
	if (ground.basement) return basementModel(ground, ground.basement, rsi, rse, rBuildUp, notes);
	if (ground.edge) return edgeModel(ground, ground.edge, rsi, rse, rBuildUp, notes);
	const rFloor = rBuildUp - rsi - rse;
	const g = slabOnGroundU(ground, rsi, rFloor, rse);
	// ≥ 0 by the formulas (1/U ≥ RT); the clamp only removes round-off
	const rGround = Math.max(0, 1 / g.u - rBuildUp);
	const rTotal = 1 / g.u;
	const lambdaSource = groundLambdaSource(ground.groundLambda);
	// 2.0 as the table writes it; a typed value as typed
	const lambdaText = Number.isInteger(g.groundLambda * 10)
		? g.groundLambda.toFixed(1)
		: String(g.groundLambda);
	notes.push(`Ground thermal conductivity λg = ${lambdaText} W/(m·K), ${lambdaSource}.`);
	notes.push(
		`Floor on the ground, U by ISO 13370:2017, 8.1 (slab on ground): B′ = A/(0.5·P) = ${fmt(g.characteristicDimensionM)} m, ` +
			`dt = w + λg·(Rsi + Rf + Rse) = ${fmt(g.wallThicknessM)} + ${fmt(g.groundLambda)}·(${fmt(rsi)} + ${fmt(rFloor)} + ${fmt(rse)}) = ${fmt(g.equivalentThicknessM)} m, ` +
			(g.regime === 'dt < B′'
				? `dt < B′: U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = ${fmt(g.u, 4)} W/(m²·K).`
				: `dt ≥ B′: U = λg/(0.457·B′ + dt) = ${fmt(g.u, 4)} W/(m²·K).`)
	);
	notes.push(
		`The build-up alone (as if exposed to outside air) has RT = ${fmt(rBuildUp)} m²·K/W, U = ${fmt(1 / rBuildUp, 4)} W/(m²·K). ` +
			`The temperature profile and the surface check use the floor's equivalent resistance 1/U = ${fmt(rTotal)} m²·K/W: the ground adds ${fmt(rGround)} m²·K/W between the underside of the floor and the external air (a steady-state simplification; the ground's heat storage is not modelled).`
	);
	return {
		rTotal,
		rExternal: rse + rGround,
		ground: {
			method: 'ISO 13370:2017, 8.1 (slab on ground)',
			perimeterM: ground.perimeterM,
			areaM2: ground.areaM2,
			characteristicDimensionM: g.characteristicDimensionM,
			equivalentThicknessM: g.equivalentThicknessM,
			groundLambda: g.groundLambda,
			groundLambdaSource: lambdaSource,
			wallThicknessM: g.wallThicknessM,
			regime: g.regime,
			rGround,
			rBuildUp,
			uBuildUp: 1 / rBuildUp
		}
	};
}

/**
 * A suspended floor over a ventilated underfloor space, ISO 13370:2017, 8.2 (from memory): the layers
 * are the deck, whose Uf = 1/(Rsi + Rf + Rsi) takes the internal surface resistance on both faces (the
 * underfloor space is still air); U = 1/(1/Uf + 1/(Ug + Ux)) by ./ground-suspended. As for a slab, the
 * floor is then carried as its equivalent resistance 1/U, the underfloor space and the ground adding
 * 1/U − RT outside the deck.
 */
function suspendedFloorModel(
	ground: NonNullable<ElementInput['ground']>,
	sus: NonNullable<NonNullable<ElementInput['ground']>['suspended']>,
	rsi: number,
	rse: number,
	rBuildUp: number,
	notes: string[]
): GroundFloorModel {
	const rFloor = rBuildUp - rsi - rse;
	const floorU = 1 / (rsi + rFloor + rsi);
	const r = analyseSuspendedFloor({
		perimeterM: ground.perimeterM,
		areaM2: ground.areaM2,
		groundLambda: ground.groundLambda,
		wallThicknessM: ground.wallThicknessM,
		floorU,
		heightM: sus.heightM,
		underfloorWallU: sus.underfloorWallU,
		openingsPerPerimeter: sus.openingsPerPerimeter,
		windSpeed: sus.windSpeed,
		windShielding: sus.windShielding
	});
	const rTotal = 1 / r.u;
	const rGround = Math.max(0, rTotal - rBuildUp);
	notes.push(...r.notes);
	notes.push(
		`Suspended floor, U by ISO 13370:2017, 8.2: the deck Uf = 1/(Rsi + Rf + Rsi) = 1/(${fmt(rsi)} + ${fmt(rFloor)} + ${fmt(rsi)}) = ${fmt(floorU, 4)} W/(m²·K); ` +
			`B′ = ${fmt(r.characteristicDimensionM)} m, dg = w + λ·(Rsi + Rg + Rse) = ${fmt(r.equivalentThicknessM)} m, Ug = ${fmt(r.ug, 4)}; ` +
			`Ux = 2·h·Uw/B′ + 1450·ε·v·fw/B′ = ${fmt(r.uxWalls, 4)} + ${fmt(r.uxVentilation, 4)} = ${fmt(r.ux, 4)} W/(m²·K); ` +
			`U = 1/(1/Uf + 1/(Ug + Ux)) = ${fmt(r.u, 4)} W/(m²·K).`
	);
	notes.push(
		`The temperature profile and the surface check use the floor's equivalent resistance 1/U = ${fmt(rTotal)} m²·K/W: the underfloor space and the ground add ${fmt(rGround)} m²·K/W below the deck (a steady-state simplification).`
	);
	return {
		rTotal,
		rExternal: rse + rGround,
		ground: {
			method: 'ISO 13370:2017, 8.2 (suspended floor)',
			perimeterM: ground.perimeterM,
			areaM2: ground.areaM2,
			characteristicDimensionM: r.characteristicDimensionM,
			equivalentThicknessM: r.equivalentThicknessM,
			groundLambda: r.groundLambda,
			groundLambdaSource: r.groundLambdaSource,
			wallThicknessM: r.wallThicknessM,
			regime: 'suspended',
			rGround,
			rBuildUp,
			uBuildUp: 1 / rBuildUp,
			suspended: {
				floorU,
				ug: r.ug,
				ux: r.ux,
				uxWalls: r.uxWalls,
				uxVentilation: r.uxVentilation,
				heightM: sus.heightM,
				underfloorWallU: sus.underfloorWallU,
				openingsPerPerimeter: sus.openingsPerPerimeter,
				windSpeed: sus.windSpeed,
				windShieldingFactor: r.windShieldingFactor
			}
		}
	};
}

type Ground = NonNullable<ElementInput['ground']>;
type GroundFigures = NonNullable<ThermalModel['ground']>;

/** The floor fields every ISO 13370 core takes, from the element's ground. */
const floorOf = (g: Ground) => ({
	perimeterM: g.perimeterM,
	areaM2: g.areaM2,
	...(g.groundLambda !== undefined ? { groundLambda: g.groundLambda } : {}),
	...(g.wallThicknessM !== undefined ? { wallThicknessM: g.wallThicknessM } : {})
});

/**
 * A basement, ISO 13370:2017, 8.3 and 8.4 (from memory), by ./ground-basement.
 *
 * Heated: the layers are the basement floor, Rf = RT − Rsi − Rse; the element's U is U′ = H/(A + z·P),
 * H = A·Ubf + z·P·Ubw, over the floor and the walls in the ground together (the element's area is then
 * A + z·P). The temperature profile and the surface check use the floor's own 1/Ubf.
 *
 * Unheated: the layers are the floor between the heated space and the basement; its Uf = 1/(Rsi + Rf +
 * Rsi) takes the internal surface resistance on both faces (the basement is still air), and
 * 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V). The basement and the ground add 1/U − RT.
 */
function basementModel(
	ground: Ground,
	b: NonNullable<Ground['basement']>,
	rsi: number,
	rse: number,
	rBuildUp: number,
	notes: string[]
): GroundFloorModel {
	const rLayers = rBuildUp - rsi - rse;
	const common = { ...floorOf(ground), depthM: b.depthM, wallR: b.wallR };
	let u: number;
	let rProfile: number;
	let basement: NonNullable<GroundFigures['basement']>;
	let r: ReturnType<typeof analyseHeatedBasement> | ReturnType<typeof analyseUnheatedBasement>;
	if (b.kind === 'heated') {
		const h = named('ground.basement', () => analyseHeatedBasement({ ...common, floorR: rLayers }));
		r = h;
		u = h.u;
		rProfile = 1 / h.ubf;
		const areaInGround = ground.areaM2 + b.depthM * ground.perimeterM;
		basement = {
			kind: 'heated',
			depthM: b.depthM,
			floorR: rLayers,
			wallR: b.wallR,
			floorEquivalentThicknessM: h.floorEquivalentThicknessM,
			wallEquivalentThicknessM: h.wallEquivalentThicknessM,
			floorRegime: h.floorRegime,
			ubf: h.ubf,
			ubw: h.ubw,
			wallUsedDw: h.wallUsedDw,
			heatTransferCoefficient: h.heatTransferCoefficient,
			areaInGroundM2: areaInGround
		};
		notes.push(`Ground λ = ${fmt(h.groundLambda, 2)} W/(m·K), ${h.groundLambdaSource}.`);
		notes.push(
			`Heated basement, ISO 13370:2017, 8.3: B′ = ${fmt(h.characteristicDimensionM)} m, z = ${fmt(b.depthM)} m; dt = w + λ·(Rsi + Rf + Rse) = ${fmt(h.floorEquivalentThicknessM)} m, dw = λ·(Rsi + Rw + Rse) = ${fmt(h.wallEquivalentThicknessM)} m; ` +
				`Ubf = ${fmt(h.ubf, 4)} (${h.floorRegime}), Ubw = ${fmt(h.ubw, 4)} W/(m²·K)${h.wallUsedDw ? ' (dw < dt: dw in place of dt)' : ''}; H = A·Ubf + z·P·Ubw = ${fmt(h.heatTransferCoefficient)} W/K; U′ = H/(A + z·P) = ${fmt(h.u, 4)} W/(m²·K).`
		);
		notes.push(
			`U′ applies to the floor and the walls in the ground together, A + z·P = ${fmt(areaInGround)} m²: give the element that area. The walls above the ground are ordinary external walls. The temperature profile and the surface check are those of the floor, with its equivalent resistance 1/Ubf = ${fmt(rProfile)} m²·K/W.`
		);
	} else {
		const floorU = 1 / (rsi + rLayers + rsi);
		const x = named('ground.basement', () =>
			analyseUnheatedBasement({
				...common,
				floorR: b.floorR!,
				floorU,
				wallAboveGroundHeightM: b.wallAboveGroundHeightM!,
				wallAboveGroundU: b.wallAboveGroundU!,
				airChangeRate: b.airChangeRate!,
				volumeM3: b.volumeM3!
			})
		);
		r = x;
		u = x.u;
		rProfile = 1 / x.u;
		basement = {
			kind: 'unheated',
			depthM: b.depthM,
			floorR: b.floorR!,
			wallR: b.wallR,
			floorEquivalentThicknessM: x.floorEquivalentThicknessM,
			wallEquivalentThicknessM: x.wallEquivalentThicknessM,
			floorRegime: x.floorRegime,
			ubf: x.ubf,
			ubw: x.ubw,
			wallUsedDw: x.wallUsedDw,
			floorU,
			wallAboveGroundHeightM: b.wallAboveGroundHeightM!,
			wallAboveGroundU: b.wallAboveGroundU!,
			airChangeRate: b.airChangeRate!,
			volumeM3: b.volumeM3!,
			ventilationCoefficient: x.ventilationCoefficient,
			basementLossCoefficient: x.basementLossCoefficient
		};
		notes.push(`Ground λ = ${fmt(x.groundLambda, 2)} W/(m·K), ${x.groundLambdaSource}.`);
		notes.push(
			`Floor over an unheated basement, ISO 13370:2017, 8.4: the floor Uf = 1/(Rsi + Rf + Rsi) = 1/(${fmt(rsi)} + ${fmt(rLayers)} + ${fmt(rsi)}) = ${fmt(floorU, 4)} W/(m²·K); ` +
				`the basement's floor and walls in the ground: dt = ${fmt(x.floorEquivalentThicknessM)} m, dw = ${fmt(x.wallEquivalentThicknessM)} m, Ubf = ${fmt(x.ubf, 4)}, Ubw = ${fmt(x.ubw, 4)} W/(m²·K); ` +
				`A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V = ${fmt(x.basementLossCoefficient)} W/K (ventilation ${fmt(x.ventilationCoefficient)} W/K); U = 1/(1/Uf + A/(…)) = ${fmt(x.u, 4)} W/(m²·K).`
		);
		notes.push(
			`The temperature profile and the surface check use the floor's equivalent resistance 1/U = ${fmt(rProfile)} m²·K/W: the basement and the ground add ${fmt(Math.max(0, rProfile - rBuildUp))} m²·K/W below the floor (a steady-state simplification).`
		);
	}
	return {
		rTotal: 1 / u,
		rExternal: rse + Math.max(0, rProfile - rBuildUp),
		ground: {
			method: `ISO 13370:2017, ${b.kind === 'heated' ? '8.3 (heated basement)' : '8.4 (unheated basement)'}`,
			perimeterM: ground.perimeterM,
			areaM2: ground.areaM2,
			characteristicDimensionM: r.characteristicDimensionM,
			equivalentThicknessM: r.floorEquivalentThicknessM,
			groundLambda: r.groundLambda,
			groundLambdaSource: r.groundLambdaSource,
			wallThicknessM: r.wallThicknessM,
			regime: r.floorRegime,
			rGround: Math.max(0, 1 / u - rBuildUp),
			rBuildUp,
			uBuildUp: 1 / rBuildUp,
			basement
		}
	};
}

/**
 * A slab on the ground with edge insulation, ISO 13370:2017 (from memory), by ./ground-edge:
 * U = U0 + 2·Δψ/B′, U0 the slab of 8.1 with Rf = RT − Rsi − Rse of the layers; Rn given or dn/λn.
 */
function edgeModel(
	ground: Ground,
	e: NonNullable<Ground['edge']>,
	rsi: number,
	rse: number,
	rBuildUp: number,
	notes: string[]
): GroundFloorModel {
	const rFloor = rBuildUp - rsi - rse;
	const insulationR = e.insulationR ?? e.insulationThicknessM / e.insulationLambda!;
	const r = named('ground.edge', () =>
		analyseEdgeInsulatedFloor({
			...floorOf(ground),
			floorR: rFloor,
			edge: {
				orientation: e.orientation,
				widthM: e.widthM,
				insulationR,
				insulationThicknessM: e.insulationThicknessM
			}
		})
	);
	const rTotal = 1 / r.u;
	const rGround = Math.max(0, rTotal - rBuildUp);
	notes.push(...r.notes);
	notes.push(
		`Floor on the ground with ${e.orientation} edge insulation, ISO 13370:2017 (from memory): B′ = ${fmt(r.characteristicDimensionM)} m, dt = ${fmt(r.equivalentThicknessM)} m (${r.regime}), U0 = ${fmt(r.u0, 4)} W/(m²·K) without it; ` +
			`Rn = ${fmt(insulationR)} m²·K/W${e.insulationLambda !== undefined ? ` (dn/λn = ${fmt(e.insulationThicknessM)}/${fmt(e.insulationLambda)})` : ''}, R′ = Rn − dn/λ = ${fmt(r.additionalResistance)} m²·K/W, d′ = R′·λ = ${fmt(r.additionalThicknessM)} m, ` +
			`${e.orientation === 'horizontal' ? 'width' : 'depth'} D = ${fmt(e.widthM)} m: Δψ = ${fmt(r.deltaPsi, 4)} W/(m·K); U = U0 + 2·Δψ/B′ = ${fmt(r.u, 4)} W/(m²·K).`
	);
	notes.push(
		`The temperature profile and the surface check use the floor's equivalent resistance 1/U = ${fmt(rTotal)} m²·K/W (the edge insulation spread over the floor: a steady-state simplification; the floor's edge itself is colder).`
	);
	return {
		rTotal,
		rExternal: rse + rGround,
		ground: {
			method: 'ISO 13370:2017, 8.1 with edge insulation',
			perimeterM: ground.perimeterM,
			areaM2: ground.areaM2,
			characteristicDimensionM: r.characteristicDimensionM,
			equivalentThicknessM: r.equivalentThicknessM,
			groundLambda: r.groundLambda,
			groundLambdaSource: r.groundLambdaSource,
			wallThicknessM: r.wallThicknessM,
			regime: r.regime,
			rGround,
			rBuildUp,
			uBuildUp: 1 / rBuildUp,
			edge: {
				orientation: e.orientation,
				widthM: e.widthM,
				insulationR,
				...(e.insulationLambda !== undefined ? { insulationLambda: e.insulationLambda } : {}),
				insulationThicknessM: e.insulationThicknessM,
				u0: r.u0,
				additionalResistance: r.additionalResistance,
				additionalThicknessM: r.additionalThicknessM,
				deltaPsi: r.deltaPsi
			}
		}
	};
}
