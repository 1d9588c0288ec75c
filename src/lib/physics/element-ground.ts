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

/**
 * Resistance Ru of the element's roof space, m²·K/W (ISO 6946:2017, Table 9, from memory; Table 3
 * in the 2007 edition), added to RT between the last layer and Rse; 0 without a roof space. Notes it.
 */
export function roofSpaceResistance(input: ElementInput, notes: string[]): number {
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
