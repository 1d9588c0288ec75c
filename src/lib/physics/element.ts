/**
 * `analyseElement`: the U-value (ISO 6946), the temperature profile from the finite-element
 * solve, the surface-humidity check by fRsi and the monthly Glaser cycle (ISO 13788), composed
 * into one result.
 */
import {
	assertElementInput,
	ElementInputError,
	type ElementInput,
	type ElementResult,
	type Layer,
	type LayerResult
} from './schema';
import {
	RSE,
	RSI,
	SLIGHTLY_VENTILATED_OUTER_CAP,
	layerResistance,
	slightlyVentilatedTotal,
	unventilatedAirLayerResistance
} from './resistances';
import {
	COMBINED_METHOD_MAX_RATIO,
	bridgeFraction,
	combinedMethod,
	type CombinedResult,
	type SeriesLayerR
} from './bridging';
import { airGapCorrection, applyCorrections, fastenerCorrection } from './corrections';
import {
	MONTH_DAYS,
	RSI_SURFACE_CHECK,
	internalVapourPressure,
	minimumTemperatureFactor,
	saturationPressure,
	temperatureFactor,
	vapourThickness
} from './moisture';
import { solveSeries } from './series';
import { ROOF_SPACE_RESISTANCE, ROOF_SPACE_LABELS, slabOnGroundU } from './ground';
import { runGlaser, type GlaserMonth, type NodeKind } from './glaser';
import { DEFAULT_ROUNDING_DESCRIPTION, DEFAULT_U_ROUNDING, describeRounding, roundValue } from './rounding';
import { CAUTIONS, ENGINE_VERSION } from './cautions';

/** Largest resistance of one sublayer in the Glaser calculation, m²·K/W. */
export const GLASER_SUBLAYER_MAX_R = 0.25; // ISO 13788:2012, 6.2 (layers of R > 0.25 are divided)

/** Bridging conductivity from which a bridge is taken to be metal, W/(m·K). */
const METAL_LAMBDA = 10; // common practice, no source: metals lie far above, other building materials below

/** Layer as the thermal model sees it. */
export interface LayerModel {
	index: number;
	layer: Layer;
	kind: LayerResult['kind'];
	startMm: number;
	endMm: number;
	disregarded: boolean;
	/** resistance of the layer or its main material, m²·K/W */
	r: number;
	rBridge?: number;
	fraction?: number;
	rEquivalent: number;
	/** resistance along the profile and moisture path, m²·K/W */
	rPath: number;
	/** m, or null when unknown */
	sd: number | null;
}

/** The thermal part of an analysis (no profile, no moisture): what U and the inverse need. */
export interface ThermalModel {
	rsi: number;
	rse: number;
	/** resistance between the last active layer and the external air: Rse, plus a roof space or the ground's equivalent resistance, m²·K/W */
	rExternal: number;
	/** ground floors: RT and U of the build-up alone, and the ISO 13370 figures */
	ground?: NonNullable<ElementResult['ground']> & { rBuildUp: number; uBuildUp: number };
	/** roof-space resistance included in RT, m²·K/W */
	rRoofSpace?: number;
	layers: LayerModel[];
	/** number of layers inside a well-ventilated air layer (all layers when there is none) */
	active: number;
	combined: CombinedResult;
	rTotal: number;
	rUpper: number;
	rLower: number;
	relativeError: number;
	bridged: boolean;
	uUncorrected: number;
	deltaUAirGaps: number;
	deltaUFasteners: number;
	deltaU: number;
	correctionsApplied: boolean;
	u: number;
	notes: string[];
	warnings: string[];
}

const fmt = (v: number, d = 3) => {
	const f = 10 ** d;
	return String(Math.round(v * f) / f);
};

/**
 * Build the ISO 6946 thermal model of a validated element: surface resistances (6.8), layer and
 * air-layer resistances (6.7.1, 6.9), the combined method for bridged layers (6.7.2), and the ΔU
 * corrections with their omission rule (Annex F, clause 7). `override` replaces the thickness of
 * one layer (used by the inverse solve). Resistances m²·K/W, U W/(m²·K).
 */
export function buildThermalModel(
	input: ElementInput,
	override?: { index: number; thicknessMm: number }
): ThermalModel {
	const notes: string[] = [];
	const warnings: string[] = [];
	const dir = input.heatFlow;
	const rsi = input.rsi ?? RSI[dir];
	const rseBase = input.rse ?? RSE;
	notes.push(
		input.rsi === undefined
			? `Rsi = ${rsi} m²·K/W for ${dir} heat flow (ISO 6946:2017, Table 7).`
			: `Rsi = ${rsi} m²·K/W as given (overrides ISO 6946).`
	);

	const well = input.layers.findIndex((l) => l.air === 'well-ventilated');
	const active = well < 0 ? input.layers.length : well;
	let rse = rseBase;
	if (well >= 0) {
		rse = input.rse ?? rsi;
		notes.push(
			`Layer ${well + 1} is a well-ventilated air layer: it and the ${input.layers.length - well - 1} layer(s) outside it are disregarded and ` +
				(input.rse === undefined
					? `Rse takes the value of Rsi, ${rse} m²·K/W (ISO 6946:2017, 6.9.4).`
					: `Rse = ${rse} m²·K/W as given.`)
		);
	} else {
		notes.push(
			input.rse === undefined
				? `Rse = ${rse} m²·K/W (ISO 6946:2017, Table 7).`
				: `Rse = ${rse} m²·K/W as given (overrides ISO 6946).`
		);
	}

	const rRoofSpace = input.roofSpace ? ROOF_SPACE_RESISTANCE[input.roofSpace] : 0;
	if (input.roofSpace) {
		notes.push(
			`Roof space above the ceiling (${ROOF_SPACE_LABELS[input.roofSpace].toLowerCase()}): Ru = ${rRoofSpace} m²·K/W (ISO 6946:2017, roof-space table) is added to RT between the last layer and Rse.`
		);
	}
	/** resistance outside the last layer that enters RT */
	const rOut = rse + rRoofSpace;

	const layers: LayerModel[] = new Array(input.layers.length);
	let pos = 0;
	for (let i = 0; i < input.layers.length; i++) {
		const l = input.layers[i];
		const d = override && override.index === i ? override.thicknessMm : l.thicknessMm;
		let kind: LayerResult['kind'];
		let r: number;
		if (l.air === 'well-ventilated') {
			kind = 'air-well-ventilated';
			r = 0;
		} else if (l.air) {
			kind = l.air === 'unventilated' ? 'air-unventilated' : 'air-slightly-ventilated';
			r = l.resistance ?? unventilatedAirLayerResistance(d, dir);
			if (l.lambda !== undefined)
				warnings.push(
					`Layer ${i + 1} (${l.name}): λ is ignored for an air layer; its resistance comes from ISO 6946.`
				);
		} else if (l.resistance !== undefined) {
			kind = 'resistance';
			r = l.resistance;
		} else {
			kind = 'material';
			r = layerResistance(d, l.lambda as number);
		}
		let rBridge: number | undefined;
		let fraction: number | undefined;
		if (l.bridge && i < active) {
			rBridge = layerResistance(d, l.bridge.lambda);
			fraction =
				l.bridge.fraction ?? bridgeFraction(l.bridge.widthMm as number, l.bridge.centresMm as number);
			if (l.bridge.lambda >= METAL_LAMBDA) {
				warnings.push(
					`Layer ${i + 1} (${l.name}) is bridged by a material of λ = ${l.bridge.lambda} W/(m·K) (metal): the ISO 6946 combined method is not meant for insulation bridged by metal; use a numerical calculation (ISO 10211).`
				);
			}
		}
		// sd of the layer; a bridged layer takes the parallel vapour paths through main and bridge.
		let sd: number | null =
			l.sd ?? (l.mu !== undefined ? vapourThickness(l.mu, d) : l.air ? vapourThickness(1, d) : null);
		if (sd !== null && l.sd !== undefined && override && override.index === i)
			sd = (l.sd * d) / l.thicknessMm;
		if (sd !== null && fraction !== undefined && l.bridge?.mu !== undefined) {
			const sdB = vapourThickness(l.bridge.mu, d);
			sd = sd === 0 || sdB === 0 ? 0 : 1 / ((1 - fraction) / sd + fraction / sdB);
		}
		layers[i] = {
			index: i,
			layer: l,
			kind,
			startMm: pos,
			endMm: pos + d,
			disregarded: i >= active,
			r,
			rBridge,
			fraction,
			rEquivalent: r,
			rPath: r,
			sd
		};
		pos += d;
	}

	const series = (from: number, to: number, scale = 1): SeriesLayerR[] => {
		const out: SeriesLayerR[] = [];
		for (let i = from; i < to; i++) {
			const m = layers[i];
			out.push(
				m.fraction !== undefined
					? { r: m.r * scale, rBridge: (m.rBridge as number) * scale, fraction: m.fraction }
					: { r: m.r * scale }
			);
		}
		return out;
	};

	const slightly = layers.findIndex((m, i) => i < active && m.kind === 'air-slightly-ventilated');
	let combined: CombinedResult;
	let rTotal: number;
	let rUpper: number;
	let rLower: number;
	let rClear: number;
	if (slightly < 0) {
		combined = combinedMethod(rsi, rOut, series(0, active));
		({ rTotal, rUpper, rLower, rClear } = combined);
	} else {
		// ISO 6946:2017, 6.9.3: weighted between the unventilated and the well-ventilated case.
		const av = layers[slightly].layer.openingAreaMm2 as number;
		const outer = combinedMethod(0, 0, series(slightly + 1, active)).rLower;
		const scale = outer > SLIGHTLY_VENTILATED_OUTER_CAP ? SLIGHTLY_VENTILATED_OUTER_CAP / outer : 1;
		const unvent = combinedMethod(rsi, rOut, [
			...series(0, slightly + 1),
			...series(slightly + 1, active, scale)
		]);
		const vent = combinedMethod(rsi, input.rse ?? rsi, series(0, slightly));
		const w = (a: number, b: number) => slightlyVentilatedTotal(av, a, b);
		combined = unvent;
		rTotal = w(unvent.rTotal, vent.rTotal);
		rUpper = w(unvent.rUpper, vent.rUpper);
		rLower = w(unvent.rLower, vent.rLower);
		rClear = w(unvent.rClear, vent.rClear);
		notes.push(
			`Layer ${slightly + 1} is slightly ventilated (${av} mm²): RT = (1500 − Av)/1000·RT,u + (Av − 500)/1000·RT,v (ISO 6946:2017, 6.9.3)` +
				(scale < 1
					? `, with the ${fmt(outer)} m²·K/W outside it limited to ${SLIGHTLY_VENTILATED_OUTER_CAP} m²·K/W in RT,u.`
					: '.')
		);
		// Along the profile path the air layer carries whatever makes the series total equal RT (clear field).
		let others = rsi + rOut;
		for (let i = 0; i < active; i++) if (i !== slightly) others += layers[i].r;
		const eff = rClear - others;
		layers[slightly].rPath = Math.max(0, eff);
		warnings.push(
			`Layer ${slightly + 1} (${layers[slightly].layer.name}): the temperature profile through a slightly ventilated air layer is approximate` +
				(eff < 0 ? ' and does not reproduce RT exactly.' : '.')
		);
	}
	if (slightly >= 0) combined = combinedMethod(rsi, rOut, series(0, active)); // sections and equivalents, unscaled
	for (let i = 0; i < active; i++) layers[i].rEquivalent = combined.rEquivalent[i];
	if (slightly >= 0) layers[slightly].rEquivalent = layers[slightly].rPath;

	if (!(rTotal > 0)) {
		throw new ElementInputError([
			{
				path: 'layers',
				message: 'the total thermal resistance is zero: give Rsi, Rse or a layer with resistance'
			}
		]);
	}
	const bridged = combined.bridged;
	const relativeError = (rUpper - rLower) / (2 * rTotal);
	if (bridged) {
		notes.push(
			`Bridged layers by the combined method (ISO 6946:2017, 6.7.2): R'T = ${fmt(rUpper)}, R''T = ${fmt(rLower)}, RT = ${fmt(rTotal)} m²·K/W, maximum relative error ${fmt(relativeError * 100, 1)} %.`
		);
		notes.push(
			'Temperatures and moisture checks follow the section through the main material of each bridged layer (the colder path for the outer layers); the U-value uses the combined method.'
		);
		if (rUpper / rLower > COMBINED_METHOD_MAX_RATIO) {
			warnings.push(
				`The upper limit exceeds the lower limit by more than ${COMBINED_METHOD_MAX_RATIO}× (relative error ${fmt(relativeError * 100, 1)} % > 20 %): the combined method is outside its range; use a numerical calculation (ISO 10211).`
			);
		}
	}

	let rExternal = rOut;
	let ground: ThermalModel['ground'];
	if (input.ground) {
		// ISO 13370:2017, 8.1: the floor's layers give Rf; the ground adds the rest.
		const rBuildUp = rTotal;
		const rFloor = rBuildUp - rsi - rse;
		const g = slabOnGroundU(input.ground, rsi, rFloor, rse);
		const rGround = 1 / g.u - rBuildUp;
		rTotal = 1 / g.u;
		rExternal = rse + rGround;
		ground = {
			method: 'ISO 13370:2017, 8.1 (slab on ground)',
			perimeterM: input.ground.perimeterM,
			areaM2: input.ground.areaM2,
			characteristicDimensionM: g.characteristicDimensionM,
			equivalentThicknessM: g.equivalentThicknessM,
			groundLambda: g.groundLambda,
			wallThicknessM: g.wallThicknessM,
			regime: g.regime,
			rGround,
			rBuildUp,
			uBuildUp: 1 / rBuildUp
		};
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
	}

	const uUncorrected = 1 / rTotal;
	let deltaUAirGaps = 0;
	let deltaUFasteners = 0;
	for (let i = 0; i < active; i++) {
		const m = layers[i];
		const level = m.layer.airGapLevel;
		if (level !== undefined && level > 0) deltaUAirGaps += airGapCorrection(level, m.r, rTotal);
		if (m.layer.fasteners) {
			const d0 = m.endMm - m.startMm;
			const f = m.layer.fasteners;
			deltaUFasteners += fastenerCorrection(f, d0, m.r, rClear);
			if (f.lambda < 1)
				notes.push(`Layer ${i + 1}: fasteners of λ < 1 W/(m·K) need no correction (ISO 6946:2017, F.3).`);
		}
	}
	const deltaU = deltaUAirGaps + deltaUFasteners;
	const applied = applyCorrections(uUncorrected, deltaU, input.corrections ?? 'standard');
	const gapsGiven = input.layers.some((l, i) => i < active && l.airGapLevel !== undefined);
	const fastenersGiven = input.layers.some((l, i) => i < active && l.fasteners !== undefined);
	const parts: string[] = [];
	if (gapsGiven) parts.push(`air gaps ${fmt(deltaUAirGaps, 4)}`);
	if (fastenersGiven) parts.push(`fasteners ${fmt(deltaUFasteners, 4)}`);
	if (!gapsGiven && !fastenersGiven) {
		notes.push('Corrections ΔU: no air-gap level and no fasteners entered, so none is calculated.');
	} else if (deltaU === 0) {
		notes.push(
			`Corrections ΔU: ${parts.join(', ')} W/(m²·K) — nothing to add` +
				(!gapsGiven ? '; air-gap level not given.' : !fastenersGiven ? '; no fasteners entered.' : '.')
		);
	}
	if (deltaU > 0) {
		notes.push(
			applied.applied
				? `ΔU = ${fmt(deltaU, 4)} W/(m²·K) (${parts.join(', ')}; ISO 6946:2017 Annex F) is applied` +
						(input.corrections === 'always'
							? ' as asked.'
							: `: it is ${fmt((deltaU / uUncorrected) * 100, 1)} % of U, not below 3 %.`)
				: `ΔU = ${fmt(deltaU, 4)} W/(m²·K) (${parts.join(', ')}) is ${fmt((deltaU / uUncorrected) * 100, 1)} % of U, below 3 %, and is omitted (ISO 6946:2017, clause 7).`
		);
		if (!gapsGiven) notes.push('Air-gap level not given: no air-gap correction.');
		if (!fastenersGiven) notes.push('No fasteners entered: no fastener correction.');
	}

	return {
		rsi,
		rse,
		rExternal,
		...(ground ? { ground } : {}),
		...(input.roofSpace ? { rRoofSpace } : {}),
		layers,
		active,
		combined,
		rTotal,
		rUpper,
		rLower,
		relativeError,
		bridged,
		uUncorrected,
		deltaUAirGaps,
		deltaUFasteners,
		deltaU,
		correctionsApplied: applied.applied,
		u: applied.u,
		notes,
		warnings
	};
}

/**
 * Analyse one element: ISO 6946 U-value (unrounded and rounded), interface temperatures and heat
 * flux from the 1-D finite-element solve at the design temperatures, and — with a climate and
 * internal conditions — the ISO 13788 surface check (fRsi against fRsi,min) and the monthly Glaser
 * cycle. Temperatures °C, resistances m²·K/W, U W/(m²·K), flux W/m², amounts g/m².
 * Throws {@link ElementInputError} (from ./schema) naming every invalid field.
 */
export function analyseElement(raw: ElementInput): ElementResult {
	const input = assertElementInput(raw);
	const tm = buildThermalModel(input);
	const notes = tm.notes;
	const warnings = tm.warnings;
	const { layers, active, rsi, rse } = tm;

	// Heat chain: Rsi film, every active layer split into sub-elements of R ≤ 0.25, Rse film.
	const splits: number[] = new Array(active);
	let nElem = 2;
	for (let i = 0; i < active; i++) {
		splits[i] = Math.max(1, Math.ceil(layers[i].rPath / GLASER_SUBLAYER_MAX_R - 1e-9));
		nElem += splits[i];
	}
	// Plain arrays: small typed arrays are costly to allocate, and this runs on every keystroke.
	const gHeat: number[] = new Array(nElem);
	const posNode: number[] = new Array(nElem + 1);
	const layerOfNode: number[] = new Array(nElem + 1);
	const kindOfNode: NodeKind[] = new Array(nElem + 1);
	const sdElem: number[] = new Array(nElem);
	const moistureReady = input.climate !== undefined && input.internal !== undefined;
	gHeat[0] = rsi > 0 ? 1 / rsi : Infinity;
	posNode[0] = 0;
	layerOfNode[0] = -1;
	kindOfNode[0] = 'internal-surface';
	posNode[1] = 0;
	layerOfNode[1] = -1;
	kindOfNode[1] = 'internal-surface';
	let e = 1;
	for (let i = 0; i < active; i++) {
		const m = layers[i];
		const k = splits[i];
		const rSub = m.rPath / k;
		const sdSub = (m.sd ?? 0) / k;
		for (let s = 0; s < k; s++) {
			gHeat[e] = rSub > 0 ? 1 / rSub : Infinity;
			sdElem[e] = sdSub;
			posNode[e + 1] = m.startMm + ((m.endMm - m.startMm) * (s + 1)) / k;
			layerOfNode[e + 1] = i;
			kindOfNode[e + 1] = s === k - 1 ? 'interface' : 'sublayer';
			e++;
		}
	}
	gHeat[e] = tm.rExternal > 0 ? 1 / tm.rExternal : Infinity;
	posNode[e + 1] = posNode[e];
	layerOfNode[e + 1] = active - 1;
	kindOfNode[e] = 'external-surface';
	kindOfNode[e + 1] = 'external-surface';

	// Dimensionless solve: φ = 1 at the internal air, 0 at the external air.
	const phi: number[] = new Array(nElem + 1);
	const fluxPhi = solveSeries(gHeat, 0, nElem, 1, 0, phi);

	const coldest = input.climate?.reduce((a, c) => Math.min(a, c.temperature), Infinity);
	const design = input.designTemperatures ?? {
		internal: input.internal?.temperature ?? 20,
		external: coldest !== undefined && Number.isFinite(coldest) ? coldest : 0
	};
	if (!input.designTemperatures) {
		notes.push(
			`Profile at ${design.internal} °C inside (${input.internal ? 'internal temperature' : 'default'}) and ${design.external} °C outside (${coldest !== undefined ? 'coldest climate month' : 'default'}).`
		);
	}
	const dT = design.internal - design.external;
	const tAt = (node: number) => design.external + dT * phi[node];

	// Node that ends layer i in the chain: 1 + Σ splits up to i.
	const endNode: number[] = new Array(active);
	{
		let n = 1;
		for (let i = 0; i < active; i++) {
			n += splits[i];
			endNode[i] = n;
		}
	}
	const interfaces: { positionMm: number; temperature: number }[] = [{ positionMm: 0, temperature: tAt(1) }];
	const layerResults: LayerResult[] = [];
	for (let i = 0; i < layers.length; i++) {
		const m = layers[i];
		const tIn = i < active ? tAt(i === 0 ? 1 : endNode[i - 1]) : design.external;
		const tOut = i < active ? tAt(endNode[i]) : design.external;
		interfaces.push({ positionMm: m.endMm, temperature: tOut });
		layerResults.push({
			index: i,
			name: m.layer.name,
			thicknessMm: m.endMm - m.startMm,
			positionStartMm: m.startMm,
			positionEndMm: m.endMm,
			kind: m.kind,
			r: m.rPath,
			rBridge: m.rBridge,
			bridgeFraction: m.fraction,
			rEquivalent: m.rEquivalent,
			sd: m.sd,
			temperatureInside: tIn,
			temperatureOutside: tOut,
			disregarded: m.disregarded
		});
	}
	const profile: { positionMm: number; temperature: number }[] = [];
	for (let n = 1; n < nElem; n++) profile.push({ positionMm: posNode[n], temperature: tAt(n) });
	for (let i = active; i < layers.length; i++)
		profile.push({ positionMm: layers[i].endMm, temperature: design.external });

	const rounding = input.rounding ?? DEFAULT_U_ROUNDING;
	const result: ElementResult = {
		engineVersion: ENGINE_VERSION,
		uValue: tm.u,
		uValueRounded: roundValue(tm.u, rounding),
		roundingConvention: input.rounding ? describeRounding(rounding) : DEFAULT_ROUNDING_DESCRIPTION,
		uUncorrected: tm.uUncorrected,
		rTotal: tm.rTotal,
		...(tm.ground
			? {
					uBuildUp: tm.ground.uBuildUp,
					rBuildUp: tm.ground.rBuildUp,
					ground: {
						method: tm.ground.method,
						perimeterM: tm.ground.perimeterM,
						areaM2: tm.ground.areaM2,
						characteristicDimensionM: tm.ground.characteristicDimensionM,
						equivalentThicknessM: tm.ground.equivalentThicknessM,
						groundLambda: tm.ground.groundLambda,
						wallThicknessM: tm.ground.wallThicknessM,
						regime: tm.ground.regime,
						rGround: tm.ground.rGround
					}
				}
			: {}),
		...(tm.rRoofSpace !== undefined ? { rRoofSpace: tm.rRoofSpace } : {}),
		...(tm.bridged ? { rUpper: tm.rUpper, rLower: tm.rLower, relativeError: tm.relativeError } : {}),
		deltaU: tm.deltaU,
		deltaUAirGaps: tm.deltaUAirGaps,
		deltaUFasteners: tm.deltaUFasteners,
		correctionsApplied: tm.correctionsApplied,
		rsi,
		rse,
		designTemperatures: { internal: design.internal, external: design.external },
		interfaces,
		heatFlux: dT * fluxPhi,
		heatFluxElement: tm.u * dT,
		profile,
		layers: layerResults,
		notes,
		warnings,
		cautions: [...CAUTIONS]
	};

	if (moistureReady) {
		const internal = input.internal!;
		// Calendar order; validation guarantees each month 1–12 exactly once.
		const climate: NonNullable<ElementInput['climate']> = new Array(12);
		for (const c of input.climate!) climate[c.month - 1] = c;
		const months: GlaserMonth[] = climate.map((c) => {
			const pe = (c.relativeHumidity / 100) * saturationPressure(c.temperature);
			return {
				month: c.month,
				days: MONTH_DAYS[c.month - 1],
				externalTemperature: c.temperature,
				externalVapourPressure: pe,
				internalTemperature: internal.temperature,
				internalVapourPressure: internalVapourPressure(internal, c.temperature, pe)
			};
		});
		const piSat = saturationPressure(internal.temperature);
		const humid = months.filter((m) => m.internalVapourPressure > piSat).map((m) => m.month);
		if (humid.length)
			warnings.push(
				`The internal vapour pressure exceeds saturation at ${internal.temperature} °C in month(s) ${humid.join(', ')}.`
			);
		notes.push(
			internal.humidityClass !== undefined
				? `Internal humidity: class ${internal.humidityClass}, pi = pe + 1.1·Δp(θe) (ISO 13788:2012, Annex A).`
				: `Internal humidity: ${internal.relativeHumidity} % at ${internal.temperature} °C in every month.`
		);

		// Surface humidity (mould) check, ISO 13788:2012 clause 5.
		const rsiCheck = input.surfaceRsi ?? RSI_SURFACE_CHECK;
		const fRsi = temperatureFactor(tm.rTotal, rsi, rsiCheck);
		let fRsiMin = -Infinity;
		let critical = 0;
		const surfaceMonths = months.map((m) => {
			const r = minimumTemperatureFactor(
				m.internalTemperature,
				m.externalTemperature,
				m.internalVapourPressure
			);
			if (r.fRsiMin !== null && r.fRsiMin > fRsiMin) {
				fRsiMin = r.fRsiMin;
				critical = m.month;
			}
			return {
				month: m.month,
				externalTemperature: m.externalTemperature,
				internalVapourPressure: m.internalVapourPressure,
				minSaturationPressure: r.minSaturationPressure,
				minSurfaceTemperature: r.minSurfaceTemperature,
				fRsiMin: r.fRsiMin
			};
		});
		if (critical === 0) {
			warnings.push('No month is colder outside than inside: the surface-humidity check does not apply.');
		} else {
			let fRsiLowestSection: number | undefined;
			if (tm.bridged) {
				const rMinSection = tm.combined.sections.reduce((a, s) => Math.min(a, s.rTotal), Infinity);
				fRsiLowestSection = temperatureFactor(rMinSection, rsi, rsiCheck);
				if (fRsiLowestSection <= fRsiMin) {
					warnings.push(
						`Across the bridging members the 1-D temperature factor is ${fmt(fRsiLowestSection)} < fRsi,min ${fmt(fRsiMin)}: check the bridges numerically (ISO 10211).`
					);
				}
			}
			result.surface = {
				fRsi,
				fRsiMin,
				criticalMonth: critical,
				pass: fRsi > fRsiMin,
				rsiUsed: rsiCheck,
				...(fRsiLowestSection !== undefined ? { fRsiLowestSection } : {}),
				months: surfaceMonths
			};
			notes.push(
				`fRsi with Rsi = ${rsiCheck} m²·K/W against fRsi,min from the 80 % surface-humidity criterion (ISO 13788:2012, clause 5).`
			);
		}

		if (input.ground) {
			// The Glaser method needs the vapour conditions on both faces; under a slab lies ground, not outside air.
			notes.push(
				'Interstitial condensation: not assessed for a floor in contact with the ground (the Glaser method with the external climate does not describe the ground under the slab).'
			);
			return result;
		}

		// Interstitial condensation, ISO 13788:2012 clause 6: nodes from internal to external surface.
		const nV = nElem - 2;
		const glaser = runGlaser(
			{
				elements: nV,
				positionMm: posNode.slice(1, nElem),
				sd: sdElem.slice(1, nElem - 1),
				phi: phi.slice(1, nElem),
				layerIndex: layerOfNode.slice(1, nElem),
				kind: kindOfNode.slice(1, nElem)
			},
			months
		);
		const limits = input.moistureLimits ?? {};
		const reasons: string[] = [];
		if ((limits.requireEvaporation ?? true) && !glaser.evaporatesFully)
			reasons.push('condensate does not evaporate fully within the year');
		if (limits.maxAtInterfaceGm2 !== undefined && glaser.maxAtInterface > limits.maxAtInterfaceGm2) {
			reasons.push(
				`${fmt(glaser.maxAtInterface, 1)} g/m² at one interface exceeds the limit of ${limits.maxAtInterfaceGm2} g/m²`
			);
		}
		if (limits.maxTotalGm2 !== undefined && glaser.maxAccumulation > limits.maxTotalGm2) {
			reasons.push(
				`${fmt(glaser.maxAccumulation, 1)} g/m² in total exceeds the limit of ${limits.maxTotalGm2} g/m²`
			);
		}
		if (glaser.surfaceCondensationMonths.length) {
			warnings.push(
				`The internal vapour pressure exceeds saturation at the internal surface (Rsi ${rsi}) in month(s) ${glaser.surfaceCondensationMonths.join(', ')}: surface condensation, outside the Glaser method.`
			);
		}
		if (glaser.condensesEveryMonth) {
			notes.push(
				'Condensation is predicted in every month; the Glaser cycle starts in the first month of the climate.'
			);
		} else if (glaser.startMonth !== null) {
			notes.push(
				`The Glaser cycle starts in month ${glaser.startMonth}, the first month with condensation after one without (ISO 13788:2012, clause 6).`
			);
		}
		result.condensation = {
			months: glaser.months,
			maxAccumulation: glaser.maxAccumulation,
			peakMonth: glaser.peakMonth,
			maxAtInterface: glaser.maxAtInterface,
			maxAtInterfaceNode: glaser.maxAtInterfaceNode,
			evaporatesFully: glaser.evaporatesFully,
			condensationMonths: glaser.condensationMonths,
			outcome: glaser.outcome,
			startMonth: glaser.startMonth,
			condensesEveryMonth: glaser.condensesEveryMonth,
			surfaceCondensationMonths: glaser.surfaceCondensationMonths,
			nodes: glaser.nodes,
			vapourProfile: glaser.vapourProfile,
			acceptance: { pass: reasons.length === 0, reasons }
		};
	} else if (input.ground) {
		notes.push('Interstitial condensation: not assessed for a floor in contact with the ground.');
	} else if (input.climate === undefined && input.internal !== undefined) {
		notes.push('No climate given: the moisture checks are not run.');
	}
	return result;
}
