/**
 * The method a report names for an element's U-value, taken from what the engine's result says it did:
 * layers in series, the combined method for bridged layers (with its limits and relative error), a roof
 * space added as a resistance (with the table the engine cites), an unheated space's Ru (ISO 6946's
 * method for other unheated spaces, with ISO 13789's air change and every part of Ru), or a floor on
 * the ground by its equivalent thickness (with B′, dt, the formula branch and the build-up's own RT
 * beside the floor's U; for a suspended floor, a basement or edge insulation every intermediate of
 * ISO 13370: Ug, Ux, dw, Ubf, Ubw, H, Uf, Δψ).
 * Pure functions of a stored element result; numbers written with `fx`, `trim` and `pct` (format.ts).
 */
import type { ElementResult } from '$lib/physics';
import { fx, pct, trim } from '$lib/format';

/** The method of an element of homogeneous layers only (ISO 6946:2017, 6.7.1). */
export const SERIES_METHOD =
	'Thermal transmittance by ISO 6946:2017 for homogeneous layers in series: RT = Rsi + ΣR + Rse and U = 1/RT.';

/** The combined method for bridged layers (ISO 6946:2017, 6.7.2). */
export const COMBINED_METHOD =
	'Thermal transmittance by ISO 6946:2017, combined method (6.7.2): the upper limit R′T from parallel heat-flow paths through each section, the lower limit R″T from layers of equivalent conductivity, RT = (R′T + R″T)/2, and the maximum relative error e = (R′T − R″T)/(2·RT).';

/** What the method section needs of a result. */
export type MethodResult = Pick<
	ElementResult,
	| 'rTotal'
	| 'rsi'
	| 'rse'
	| 'uUncorrected'
	| 'rUpper'
	| 'rLower'
	| 'relativeError'
	| 'rRoofSpace'
	| 'unheatedSpace'
	| 'ground'
	| 'rBuildUp'
	| 'uBuildUp'
	| 'notes'
>;

/** Which method gave the element's U: the element's kind of calculation, from its result. */
export type MethodKind =
	| 'series'
	| 'combined'
	| 'roof-space'
	| 'combined-roof-space'
	| 'unheated-space'
	| 'combined-unheated-space'
	| 'ground';

export function methodKind(r: MethodResult): MethodKind {
	if (r.ground) return 'ground';
	const bridged = r.rUpper !== undefined && r.rLower !== undefined;
	if (r.rRoofSpace !== undefined) return bridged ? 'combined-roof-space' : 'roof-space';
	if (r.unheatedSpace) return bridged ? 'combined-unheated-space' : 'unheated-space';
	return bridged ? 'combined' : 'series';
}

/** Used when the engine's note on the roof space cannot be read (the engine's own citation). */
const ROOF_SPACE_SOURCE_FALLBACK = 'ISO 6946:2017, roof-space table';

/**
 * The roof space as the engine's note states it: the roof covering in words and the source of Ru, with
 * the standard and table exactly as the note gives them ("Roof space above the ceiling (<covering>):
 * Ru = <value> m²·K/W (<source>) …"); null for an element without a roof space.
 */
export function roofSpaceOfResult(
	r: Pick<ElementResult, 'rRoofSpace' | 'notes'>
): { ru: number; covering: string | null; source: string } | null {
	if (r.rRoofSpace === undefined) return null;
	const note = r.notes.find((n) => n.startsWith('Roof space above the ceiling'));
	const covering = note ? (/^Roof space above the ceiling \(([^)]*)\)/.exec(note)?.[1] ?? null) : null;
	const source = note ? /Ru = [^(]*\(([^)]*)\)/.exec(note)?.[1] : undefined;
	return { ru: r.rRoofSpace, covering, source: source ?? ROOF_SPACE_SOURCE_FALLBACK };
}

/** "R′T = … and R″T = …, so RT = … with e = …" of a bridged build-up. */
function combinedFigures(rUpper: number, rLower: number, rT: number, e: number | undefined): string {
	const error = e ?? (rUpper - rLower) / (2 * rT);
	return `R′T = ${fx(rUpper, 3)} m²·K/W and R″T = ${fx(rLower, 3)} m²·K/W, so RT = ${fx(rT, 3)} m²·K/W with a maximum relative error e = ${pct(error, 1)}`;
}

/** The ISO 13370 branch of a ground floor's result, 'dt < B′' or 'dt ≥ B′'. */
export function groundBranch(g: NonNullable<ElementResult['ground']>): 'dt < B′' | 'dt ≥ B′' {
	if (g.regime === 'dt < B′' || g.regime === 'dt ≥ B′') return g.regime;
	return g.equivalentThicknessM < g.characteristicDimensionM ? 'dt < B′' : 'dt ≥ B′';
}

/** RT of a ground floor's build-up alone (Rsi + ΣR + Rse), m²·K/W: the result's, or 1/U less the ground's share. */
export function groundBuildUpResistance(r: Pick<ElementResult, 'rBuildUp' | 'rTotal' | 'ground'>): number {
	return r.rBuildUp ?? r.rTotal - (r.ground?.rGround ?? 0);
}

/**
 * The paragraphs of the method section that say how RT and U were found, before the surface
 * resistances, corrections and rounding the report states for every element. An element of plain
 * layers gets {@link SERIES_METHOD} alone, word for word.
 */
export function methodParagraphs(r: MethodResult): string[] {
	const kind = methodKind(r);
	if (kind === 'series') return [SERIES_METHOD];
	const bridged = r.rUpper !== undefined && r.rLower !== undefined;
	const out: string[] = [];
	if (kind === 'ground') {
		const g = r.ground!;
		const rBuildUp = groundBuildUpResistance(r);
		const rFloor = rBuildUp - r.rsi - r.rse;
		const uBuildUp = r.uBuildUp ?? 1 / rBuildUp;
		out.push(
			bridged
				? `The build-up by ISO 6946:2017, combined method (6.7.2), as if exposed to outside air: ${combinedFigures(r.rUpper!, r.rLower!, rBuildUp, r.relativeError)} (U = ${fx(uBuildUp, 4)} W/(m²·K)); the floor construction's resistance is Rf = RT − Rsi − Rse = ${fx(rFloor, 3)} m²·K/W.`
				: `The build-up by ISO 6946:2017, as if exposed to outside air: RT = Rsi + ΣR + Rse = ${fx(rBuildUp, 3)} m²·K/W (U = ${fx(uBuildUp, 4)} W/(m²·K)); the floor construction's resistance is Rf = ΣR = ${fx(rFloor, 3)} m²·K/W.`
		);
		if (g.suspended) {
			const sus = g.suspended;
			if (g.groundLambdaSource)
				out.push(
					`Thermal conductivity of the ground λg = ${fx(g.groundLambda, 2)} W/(m·K), ${g.groundLambdaSource}.`
				);
			out.push(
				`The floor deck over the ventilated underfloor space, with the internal surface resistance on both faces: Uf = 1/(Rsi + Rf + Rsi) = 1/(${fx(r.rsi, 2)} + ${fx(rFloor, 3)} + ${fx(r.rsi, 2)}) = ${fx(sus.floorU, 4)} W/(m²·K).`,
				`U of the suspended floor by ISO 13370:2017, 8.2: B′ = A/(0.5·P) = ${trim(g.areaM2, 2)}/(0.5·${trim(g.perimeterM, 2)}) = ${fx(g.characteristicDimensionM, 2)} m; dg = w + λg·(Rsi + Rg + Rse) = ${fx(g.equivalentThicknessM, 3)} m; Ug = 2λg/(π·B′ + dg)·ln(π·B′/dg + 1) = ${fx(sus.ug, 4)} W/(m²·K); ` +
					`Ux = 2·h·Uw/B′ + 1450·ε·v·fw/B′ = 2·${trim(sus.heightM, 3)}·${trim(sus.underfloorWallU, 3)}/${fx(g.characteristicDimensionM, 2)} + 1450·${trim(sus.openingsPerPerimeter, 5)}·${trim(sus.windSpeed, 2)}·${trim(sus.windShieldingFactor, 3)}/${fx(g.characteristicDimensionM, 2)} = ${fx(sus.uxWalls, 4)} + ${fx(sus.uxVentilation, 4)} = ${fx(sus.ux, 4)} W/(m²·K); U = 1/(1/Uf + 1/(Ug + Ux)) = ${fx(r.uUncorrected, 4)} W/(m²·K).`,
				`The floor's equivalent resistance 1/U = ${fx(r.rTotal, 3)} m²·K/W is used for the temperature profile and the surface check: the underfloor space and the ground add ${fx(g.rGround, 3)} m²·K/W below the deck.`
			);
			return out;
		}
		if (g.basement || g.edge) {
			if (g.groundLambdaSource)
				out.push(
					`Thermal conductivity of the ground λg = ${fx(g.groundLambda, 2)} W/(m·K), ${g.groundLambdaSource}.`
				);
			out.push(...(g.basement ? basementParagraphs(r, g, rFloor) : edgeParagraphs(r, g, rFloor)));
			return out;
		}
		const branch = groundBranch(g);
		if (g.groundLambdaSource)
			out.push(
				`Thermal conductivity of the ground λg = ${fx(g.groundLambda, 2)} W/(m·K), ${g.groundLambdaSource}.`
			);
		out.push(
			`U of the floor on the ground by ${g.method}, from its equivalent thickness: characteristic dimension B′ = A/(0.5·P) = ${trim(g.areaM2, 2)}/(0.5·${trim(g.perimeterM, 2)}) = ${fx(g.characteristicDimensionM, 2)} m; total equivalent thickness dt = w + λg·(Rsi + Rf + Rse) = ${fx(g.wallThicknessM, 2)} + ${fx(g.groundLambda, 2)}·(${fx(r.rsi, 2)} + ${fx(rFloor, 3)} + ${fx(r.rse, 2)}) = ${fx(g.equivalentThicknessM, 3)} m. ` +
				(branch === 'dt < B′'
					? `As dt < B′ (an uninsulated or moderately insulated floor), U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = ${fx(r.uUncorrected, 4)} W/(m²·K).`
					: `As dt ≥ B′ (a well-insulated floor), U = λg/(0.457·B′ + dt) = ${fx(r.uUncorrected, 4)} W/(m²·K).`)
		);
		out.push(
			`The floor's U stands beside the build-up's own RT of ${fx(rBuildUp, 3)} m²·K/W: the ground adds ${fx(g.rGround, 3)} m²·K/W, and the floor's equivalent resistance 1/U = ${fx(r.rTotal, 3)} m²·K/W is used for the temperature profile and the surface check.`
		);
		return out;
	}
	const roof = roofSpaceOfResult(r);
	const covering = roof?.covering ? ` (${roof.covering})` : '';
	const space = r.unheatedSpace;
	if (space) {
		out.push(
			bridged
				? `${COMBINED_METHOD} For this build-up ${combinedFigures(r.rUpper!, r.rLower!, r.rTotal, r.relativeError)}, and U = 1/RT; the unheated space's resistance Ru is added to every section, between the last layer and Rse.`
				: `Thermal transmittance by ISO 6946:2017 for homogeneous layers in series beside an unheated space, the space taken as an added homogeneous layer: RT = Rsi + ΣR + Ru + Rse = ${fx(r.rTotal, 3)} m²·K/W and U = 1/RT, that is U = 1/(1/U0 + Ru) with U0 = ${fx(space.uExposed, 4)} W/(m²·K) the element as if exposed to outside air.`,
			...unheatedSpaceParagraphs(space)
		);
		return out;
	}
	if (bridged) {
		out.push(
			`${COMBINED_METHOD} For this build-up ${combinedFigures(r.rUpper!, r.rLower!, r.rTotal, r.relativeError)}, and U = 1/RT.`
		);
		if (roof)
			out.push(
				`The roof space above the ceiling${covering} adds its thermal resistance Ru = ${fx(roof.ru, 2)} m²·K/W, from ${roof.source}, to every section, between the last layer and Rse.`
			);
		return out;
	}
	if (roof)
		out.push(
			`Thermal transmittance by ISO 6946:2017 for homogeneous layers in series under a roof space: RT = Rsi + ΣR + Ru + Rse and U = 1/RT, where Ru = ${fx(roof.ru, 2)} m²·K/W is the thermal resistance of the roof space above the ceiling${covering}, from ${roof.source}; here RT = ${fx(r.rTotal, 3)} m²·K/W.`
		);
	return out;
}

type Ground = NonNullable<ElementResult['ground']>;

/** A basement's method (ISO 13370:2017, 8.3 heated, 8.4 unheated; numbering and formulas from memory). */
function basementParagraphs(r: MethodResult, g: Ground, rLayers: number): string[] {
	const b = g.basement!;
	const z = b.depthM;
	const bPrime = `B′ = A/(0.5·P) = ${trim(g.areaM2, 2)}/(0.5·${trim(g.perimeterM, 2)}) = ${fx(g.characteristicDimensionM, 2)} m`;
	const dt = b.floorEquivalentThicknessM;
	const floor =
		b.floorRegime === '(dt + z/2) ≥ B′'
			? `as (dt + z/2) ≥ B′, Ubf = λg/(0.457·B′ + dt + z/2) = ${fx(b.ubf, 4)} W/(m²·K)`
			: `as (dt + z/2) < B′, Ubf = 2λg/(π·B′ + dt + z/2)·ln(π·B′/(dt + z/2) + 1) = ${fx(b.ubf, 4)} W/(m²·K)`;
	const walls = `Ubw = 2λg/(π·z)·(1 + 0.5·dt/(dt + z))·ln(z/dw + 1) = ${fx(b.ubw, 4)} W/(m²·K)${b.wallUsedDw ? ' (dw < dt, so dw takes the place of dt in it)' : ''}`;
	const ground =
		`${bPrime}; the basement floor at depth z = ${trim(z, 3)} m below the outside ground: dt = w + λg·(Rsi + Rf + Rse) = ${fx(g.wallThicknessM, 2)} + ${fx(g.groundLambda, 2)}·(0.17 + ${fx(b.floorR, 3)} + 0.04) = ${fx(dt, 3)} m, ${floor}; ` +
		`the walls in the ground, Rw = ${fx(b.wallR, 3)} m²·K/W: dw = λg·(Rsi + Rw + Rse) = ${fx(g.groundLambda, 2)}·(0.13 + ${fx(b.wallR, 3)} + 0.04) = ${fx(b.wallEquivalentThicknessM, 3)} m, ${walls}`;
	if (b.kind === 'heated')
		return [
			`U of the heated basement by ISO 13370:2017, 8.3 (from memory), the layers being the basement floor (Rf = ${fx(rLayers, 3)} m²·K/W): ${ground}. ` +
				`H = A·Ubf + z·P·Ubw = ${trim(g.areaM2, 2)}·${fx(b.ubf, 4)} + ${trim(z, 3)}·${trim(g.perimeterM, 2)}·${fx(b.ubw, 4)} = ${fx(b.heatTransferCoefficient, 2)} W/K; U′ = H/(A + z·P) = ${fx(b.heatTransferCoefficient, 2)}/${fx(b.areaInGroundM2, 2)} = ${fx(r.uUncorrected, 4)} W/(m²·K), over the floor and the walls in the ground together (A + z·P = ${fx(b.areaInGroundM2, 2)} m²).`,
			`The temperature profile and the surface check are those of the basement floor, with its equivalent resistance 1/Ubf = ${fx(1 / b.ubf, 3)} m²·K/W; the walls above the ground are external walls of their own.`
		];
	return [
		`The floor between the heated space and the unheated basement, with the internal surface resistance on both faces: Uf = 1/(Rsi + Rf + Rsi) = 1/(${fx(r.rsi, 2)} + ${fx(rLayers, 3)} + ${fx(r.rsi, 2)}) = ${fx(b.floorU, 4)} W/(m²·K).`,
		`The unheated basement by ISO 13370:2017, 8.3 and 8.4 (from memory): ${ground}; its walls above the ground h = ${trim(b.wallAboveGroundHeightM, 3)} m with Uw = ${trim(b.wallAboveGroundU, 3)} W/(m²·K); its air change n = ${trim(b.airChangeRate, 3)} h⁻¹ and volume V = ${trim(b.volumeM3, 1)} m³ give 0.33·n·V = ${fx(b.ventilationCoefficient, 2)} W/K (ISO 13789's air exchange with the outside). ` +
			`A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V = ${fx(b.basementLossCoefficient, 2)} W/K; 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V) = 1/${fx(b.floorU, 4)} + ${trim(g.areaM2, 2)}/${fx(b.basementLossCoefficient, 2)}, U = ${fx(r.uUncorrected, 4)} W/(m²·K).`,
		`The floor's equivalent resistance 1/U = ${fx(r.rTotal, 3)} m²·K/W is used for the temperature profile and the surface check: the basement and the ground add ${fx(g.rGround, 3)} m²·K/W below the floor.`
	];
}

/** Edge insulation of a slab (ISO 13370:2017, U = U0 + 2·Δψ/B′; formulas from memory). */
function edgeParagraphs(r: MethodResult, g: Ground, rFloor: number): string[] {
	const e = g.edge!;
	const branch = groundBranch(g);
	const k = e.orientation === 'horizontal' ? 'D' : '2D';
	return [
		`U0 of the slab without its edge insulation by ISO 13370:2017, 8.1: B′ = A/(0.5·P) = ${trim(g.areaM2, 2)}/(0.5·${trim(g.perimeterM, 2)}) = ${fx(g.characteristicDimensionM, 2)} m; dt = w + λg·(Rsi + Rf + Rse) = ${fx(g.wallThicknessM, 2)} + ${fx(g.groundLambda, 2)}·(0.17 + ${fx(rFloor, 3)} + 0.04) = ${fx(g.equivalentThicknessM, 3)} m; ` +
			(branch === 'dt < B′'
				? `as dt < B′, U0 = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = ${fx(e.u0, 4)} W/(m²·K).`
				: `as dt ≥ B′, U0 = λg/(0.457·B′ + dt) = ${fx(e.u0, 4)} W/(m²·K).`),
		`${e.orientation === 'horizontal' ? 'Horizontal edge insulation of width' : 'Vertical edge insulation of depth'} D = ${trim(e.widthM, 3)} m and thickness dn = ${trim(e.insulationThicknessM, 3)} m, of thermal resistance Rn = ${fx(e.insulationR, 3)} m²·K/W${e.insulationLambda !== undefined ? ` (Rn = dn/λn, λn = ${trim(e.insulationLambda, 4)} W/(m·K))` : ''}: ` +
			`its added resistance R′ = Rn − dn/λg = ${fx(e.additionalResistance, 3)} m²·K/W, d′ = R′·λg = ${fx(e.additionalThicknessM, 3)} m; ` +
			`Δψ = −(λg/π)·[ln(${k}/dt + 1) − ln(${k}/(dt + d′) + 1)] = ${fx(e.deltaPsi, 4)} W/(m·K); U = U0 + 2·Δψ/B′ = ${fx(e.u0, 4)} + 2·(${fx(e.deltaPsi, 4)})/${fx(g.characteristicDimensionM, 2)} = ${fx(r.uUncorrected, 4)} W/(m²·K) (ISO 13370:2017, edge insulation, from memory).`,
		`The floor's equivalent resistance 1/U = ${fx(r.rTotal, 3)} m²·K/W is used for the temperature profile and the surface check (the edge insulation spread over the floor).`
	];
}

/** Ru of an unheated space and its parts (ISO 6946:2017, 6.10.3; n by ISO 13789; from memory). */
function unheatedSpaceParagraphs(s: NonNullable<ElementResult['unheatedSpace']>): string[] {
	const list = s.externalElements
		.map((e, i) => `${e.name ?? `element ${i + 1}`} ${trim(e.areaM2, 2)} m² × ${trim(e.uValue, 3)} W/(m²·K)`)
		.join('; ');
	const n =
		s.airChangeSource === 'given'
			? `n = ${trim(s.airChangeRate, 3)} h⁻¹ as given`
			: `n = ${trim(s.airChangeRate, 3)} h⁻¹, ${s.airChangeSource}`;
	return [
		`The unheated space's thermal resistance by ISO 6946:2017, 6.10.3 (other unheated spaces, from memory), with the air exchange of ISO 13789: Ru = Ai/(Σ(Ae,k·Ue,k) + 0.33·n·V). ` +
			`Ai = ${trim(s.internalAreaM2, 2)} m² between the heated and the unheated space; the elements between the unheated space and the outside${list ? ` (${list})` : ' (none given)'} give ΣAe·Ue = ${fx(s.transmissionCoefficient, 2)} W/K; ` +
			`${n}, and V = ${trim(s.volumeM3, 1)} m³ give 0.33·n·V = ${fx(s.ventilationCoefficient, 2)} W/K; Hue = ${fx(s.heatLossToOutside, 2)} W/K, so Ru = ${trim(s.internalAreaM2, 2)}/${fx(s.heatLossToOutside, 2)} = ${fx(s.ru, 4)} m²·K/W.`,
		`The same heat loss as ISO 13789's adjustment factor b = Hue/(Hiu + Hue) = ${fx(s.adjustmentFactor, 3)} with Hiu = Ai·U0. The unheated space is taken as one zone at a steady temperature; its solar and internal gains are ignored.`
	];
}
