/**
 * zod schemas of the element input and result. The same schemas serve the forms, the JSON API
 * and the CSV import; every error names the field by its path, e.g. `layers.2.thicknessMm`.
 *
 * The object shapes check types only; ranges and cross-field rules are applied by one refinement
 * per schema (for the element: one for the whole build-up). zod runs every `.gt()` or nested
 * refinement as a separate check, and those checks cost more than the calculation itself for a
 * long build-up, while the page validates on every keystroke. The refinements run even when a
 * type error is present (`when`), so one pass reports every bad field.
 *
 * The bounds that keep the engine safe (./bounds: R = d/λ per layer and in total, μ and μ·d, the
 * thinnest layer, the number of layers, …) are ranges and cross-field rules like the others; a
 * total thermal resistance of zero needs the whole model and is checked once the schema passes
 * (`parseElementInput`, ./element-bounds). Every refusal names its field and says what to do.
 */
import { surfaceConditionsSchema } from './surface-films';
import { z } from 'zod';
import {
	AIR_LAYER_MAX_MM,
	AIR_OPENING_SLIGHTLY_MAX,
	AIR_OPENING_UNVENTILATED_MAX,
	effectiveHeatFlow,
	HEAT_FLOWS,
	heatFlowForInclination,
	unventilatedAirLayerResistance,
	type HeatFlow
} from './resistances';
import { MAX_BRIDGED_LAYERS } from './bridging';
import { characteristicDimension, GROUND_LAMBDA_DEFAULT, ROOF_SPACES, slabOnGroundU } from './ground';
import { EDGE_ORIENTATIONS, edgeInsulationPsi } from './ground-edge';
import { AIRTIGHTNESS_TYPES, CONVENTIONAL_AIR_CHANGE } from './unheated-space';
import { AIR_HEAT_CAPACITY_WH } from './ground-basement';
import {
	BRIDGE_SPACING_MAX_MM,
	CHARACTERISTIC_DIMENSION_MAX_M,
	FASTENER_AREA_MAX_MM2,
	FASTENER_LAMBDA_MAX,
	FASTENERS_PER_M2_MAX,
	LAYER_R_MAX,
	LAYER_SD_MAX,
	LAYERS_MAX,
	MU_MAX,
	NAME_MAX,
	negligibleAsZero,
	SD_NEGLIGIBLE,
	THICKNESS_MAX_MM,
	THICKNESS_MIN_MM,
	TOTAL_R_MAX
} from './bounds';
import { totalResistanceIsZero } from './element-bounds';
import { layerVapourThickness } from './element-layers';
import { fmt } from './note-format';

const describe = (v: unknown): string => {
	if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
	if (v === null) return 'null';
	if (typeof v === 'string') return `the text "${v.length > 20 ? v.slice(0, 20) + '…' : v}"`;
	return typeof v;
};

/** A finite number with plain-English messages (ranges are checked by the refinements below). */
const num = () =>
	z.number({
		error: (iss) =>
			iss.input === undefined ? 'is required' : `must be a finite number, got ${describe(iss.input)}`
	});

/** Adds an issue at a path relative to the object being checked. */
type Add = (path: readonly (string | number)[], message: string) => void;
type Rule = readonly [(v: number) => boolean, string];
const POSITIVE: Rule[] = [[(v) => v > 0, 'must be > 0']];
const NON_NEGATIVE: Rule[] = [[(v) => v >= 0, 'must be ≥ 0']];
const TEMPERATURE: Rule[] = [
	[(v) => v >= -80, 'must be ≥ −80 °C'],
	[(v) => v <= 80, 'must be ≤ 80 °C']
];
const MU: Rule[] = [
	[(v) => v >= 1, 'must be ≥ 1 (still air is 1)'],
	[(v) => v <= MU_MAX, 'must be ≤ 100 000 000 (10⁸, beyond any vapour-tight foil)']
];
const atMost = (max: number, text: string): Rule => [(v) => v <= max, `must be ≤ ${text}`];
const RESISTANCE_LIMIT: Rule[] = [
	[(v) => v >= 0, 'must be ≥ 0'],
	[(v) => v <= 10, 'must be ≤ 10 m²·K/W']
];

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;

/** Apply range rules to the numeric fields of `obj`, one issue per failing field (type errors are zod's). */
function checkRanges(
	obj: Record<string, unknown>,
	add: Add,
	rules: readonly (readonly [string, readonly Rule[]])[]
): void {
	for (let r = 0; r < rules.length; r++) {
		const field = rules[r][0];
		const v = obj[field];
		if (typeof v !== 'number' || !Number.isFinite(v)) continue;
		const list = rules[r][1];
		for (let k = 0; k < list.length; k++) {
			if (!list[k][0](v)) {
				add([field], list[k][1]);
				break;
			}
		}
	}
}

const prefixed =
	(add: Add, prefix: readonly (string | number)[]): Add =>
	(path, message) =>
		add([...prefix, ...path], message);
const fromCtx =
	(ctx: z.RefinementCtx): Add =>
	(path, message) =>
		ctx.addIssue({ code: 'custom', path: [...path], message });
const ALWAYS = { when: () => true };

/* ------------------------------------------------------------------ rules */

const BRIDGE_RANGES: (readonly [string, readonly Rule[]])[] = [
	['lambda', POSITIVE],
	['fraction', [[(v) => v > 0 && v < 1, 'must be between 0 and 1 (exclusive)']]],
	['widthMm', [...POSITIVE, atMost(BRIDGE_SPACING_MAX_MM, '10 000 mm')]],
	['centresMm', [...POSITIVE, atMost(BRIDGE_SPACING_MAX_MM, '10 000 mm')]],
	['mu', MU]
];

/** A finite number above zero (a field that passed its own type and range check). */
const isPositive = (v: unknown): v is number => typeof v === 'number' && v > 0 && v < Infinity;

/**
 * A figure derived from other fields (d/λ, μ·d, B′, a sum) above its bound by more than round-off:
 * 0.1 m over λ = 0.001 is 100 exactly, but λ typed from a computed R may give 100.00000000000001.
 */
const beyond = (v: number, max: number): boolean => v > max * (1 + 1e-9);

/** A derived figure for a message: as notes write it, or in powers of ten when large. */
const figure = (v: number): string =>
	v < 1e6 ? fmt(v) : Number.isFinite(v) ? v.toExponential(1) : 'more than 1e+308';

function checkName(o: Record<string, unknown>, add: Add): void {
	if (typeof o.name === 'string' && o.name.length > NAME_MAX)
		add(['name'], `must be at most ${NAME_MAX} characters, got ${o.name.length}`);
}

/**
 * The bounds that follow from a layer's thickness `d` (mm) and another field, for a layer and its
 * bridge alike: R = d/λ (ISO 6946:2017, 6.7.1) and sd = μ·d (ISO 13788:2012, 3.1), both held to
 * this product's bounds (./bounds) so that the temperature and vapour chains stay small and finite.
 */
function checkThicknessProducts(o: Record<string, unknown>, d: unknown, add: Add, what: string): void {
	if (!isPositive(d)) return;
	if (isPositive(o.lambda) && beyond(d / 1000 / o.lambda, LAYER_R_MAX))
		add(
			['lambda'],
			`gives ${what} R = d/λ = ${figure(d / 1000 / o.lambda)} m²·K/W, more than the ${LAYER_R_MAX} m²·K/W a layer may have: check λ (W/(m·K)) and the thickness (mm)`
		);
	// μ above its own bound has its issue already
	if (isPositive(o.mu) && o.mu <= MU_MAX && beyond((o.mu * d) / 1000, LAYER_SD_MAX))
		add(
			['mu'],
			`gives ${what} sd = μ·d = ${figure((o.mu * d) / 1000)} m, more than the 100 000 m a layer may have: check μ and the thickness (mm)`
		);
}

function refineBridge(b: Record<string, unknown>, add: Add): void {
	checkRanges(b, add, BRIDGE_RANGES);
	checkName(b, add);
	const byWidth = b.widthMm !== undefined || b.centresMm !== undefined;
	if (b.fraction === undefined && !byWidth)
		add(['fraction'], 'give the bridging fraction, or widthMm and centresMm');
	else if (b.fraction !== undefined && byWidth)
		add(['fraction'], 'give either fraction or widthMm and centresMm, not both');
	else if (byWidth) {
		if (b.widthMm === undefined) add(['widthMm'], 'is required with centresMm');
		else if (b.centresMm === undefined) add(['centresMm'], 'is required with widthMm');
		else if ((b.widthMm as number) > 0 && (b.widthMm as number) >= (b.centresMm as number))
			add(['widthMm'], 'must be smaller than centresMm');
	}
}

const FASTENER_RANGES: (readonly [string, readonly Rule[]])[] = [
	['lambda', [...POSITIVE, atMost(FASTENER_LAMBDA_MAX, '1000 W/(m·K) (above any metal)')]],
	['areaMm2', [...POSITIVE, atMost(FASTENER_AREA_MAX_MM2, '10 000 mm²')]],
	['perM2', [...POSITIVE, atMost(FASTENERS_PER_M2_MAX, '10 000 per m²')]],
	['penetrationMm', POSITIVE]
];

function refineFasteners(f: Record<string, unknown>, add: Add): void {
	checkRanges(f, add, FASTENER_RANGES);
}

const LAYER_RANGES: (readonly [string, readonly Rule[]])[] = [
	[
		'thicknessMm',
		[
			...POSITIVE,
			[(v) => v >= THICKNESS_MIN_MM, 'must be at least 0.001 mm (1 µm)'],
			atMost(THICKNESS_MAX_MM, '10 000 mm')
		]
	],
	['lambda', POSITIVE],
	['resistance', [...NON_NEGATIVE, atMost(LAYER_R_MAX, `${LAYER_R_MAX} m²·K/W`)]],
	['openingAreaMm2', NON_NEGATIVE],
	['mu', MU],
	['sd', [...NON_NEGATIVE, atMost(LAYER_SD_MAX, '100 000 m')]]
];

const PLAUSIBLE_RANGES: (readonly [string, readonly Rule[]])[] = [
	['lambdaMin', POSITIVE],
	['lambdaMax', POSITIVE],
	['thicknessMinMm', NON_NEGATIVE],
	['thicknessMaxMm', POSITIVE],
	['smallestMm', NON_NEGATIVE]
];

/** The usual ranges a layer carries from the library: each positive, each minimum at most its maximum. */
function refinePlausible(p: Record<string, unknown>, add: Add): void {
	checkRanges(p, add, PLAUSIBLE_RANGES);
	for (const k of ['category', 'lambdaSource'] as const)
		if (typeof p[k] === 'string' && (p[k] as string).length > NAME_MAX)
			add([k], `must be at most ${NAME_MAX} characters`);
	const pairs = [
		['lambdaMin', 'lambdaMax'],
		['thicknessMinMm', 'thicknessMaxMm']
	] as const;
	for (const [lo, hi] of pairs)
		if (isPositive(p[hi]) && typeof p[lo] === 'number' && (p[lo] as number) > (p[hi] as number))
			add([hi], `must be at least ${lo}`);
}

function refineLayer(l: Record<string, unknown>, add: Add): void {
	checkRanges(l, add, LAYER_RANGES);
	checkName(l, add);
	if (isObject(l.plausible)) refinePlausible(l.plausible, prefixed(add, ['plausible']));
	const thickness = l.thicknessMm as number;
	// λ of an air layer is ignored (its resistance comes from the table), so only a material's counts.
	checkThicknessProducts(l.air === undefined ? l : { mu: l.mu }, thickness, add, 'this layer');
	if (isObject(l.bridge))
		checkThicknessProducts(l.bridge, thickness, prefixed(add, ['bridge']), 'the bridging material');
	if (l.air === undefined) {
		if (l.lambda === undefined && l.resistance === undefined)
			add(['lambda'], 'give λ or the thermal resistance');
		else if (l.lambda !== undefined && l.resistance !== undefined)
			add(['resistance'], 'give either λ or the thermal resistance, not both');
		if (l.openingAreaMm2 !== undefined) add(['openingAreaMm2'], 'applies to air layers only');
	} else {
		if (l.air !== 'well-ventilated' && l.resistance === undefined && thickness > AIR_LAYER_MAX_MM) {
			add(
				['thicknessMm'],
				`an air layer over ${AIR_LAYER_MAX_MM} mm is outside the ISO 6946 table; give its resistance directly`
			);
		}
		const a = l.openingAreaMm2 as number | undefined;
		if (l.air === 'unventilated' && a !== undefined && a > AIR_OPENING_UNVENTILATED_MAX) {
			add(['openingAreaMm2'], `must be ≤ ${AIR_OPENING_UNVENTILATED_MAX} mm² for an unventilated air layer`);
		}
		if (l.air === 'slightly-ventilated') {
			if (a === undefined) add(['openingAreaMm2'], 'is required for a slightly ventilated air layer');
			else if (!(a > AIR_OPENING_UNVENTILATED_MAX && a <= AIR_OPENING_SLIGHTLY_MAX)) {
				add(['openingAreaMm2'], 'must be over 500 and at most 1500 mm² for a slightly ventilated air layer');
			}
		}
		if (l.air === 'well-ventilated') {
			if (a !== undefined && a <= AIR_OPENING_SLIGHTLY_MAX)
				add(['openingAreaMm2'], 'must be over 1500 mm² for a well-ventilated air layer');
			if (l.bridge) add(['bridge'], 'a well-ventilated air layer cannot be bridged');
		}
	}
	if (l.mu !== undefined && l.sd !== undefined) add(['sd'], 'give either μ or sd, not both');
	if (isObject(l.bridge)) refineBridge(l.bridge, prefixed(add, ['bridge']));
	if (isObject(l.fasteners)) {
		refineFasteners(l.fasteners, prefixed(add, ['fasteners']));
		const pen = l.fasteners.penetrationMm;
		if (typeof pen === 'number' && pen > thickness)
			add(['fasteners', 'penetrationMm'], 'must not exceed the layer thickness');
	}
}

const CLIMATE_RANGES: (readonly [string, readonly Rule[]])[] = [
	['month', [[(v) => Number.isInteger(v) && v >= 1 && v <= 12, 'must be 1–12']]],
	['temperature', TEMPERATURE],
	['relativeHumidity', [[(v) => v >= 0 && v <= 100, 'must be 0–100 %']]]
];
const INTERNAL_RANGES: (readonly [string, readonly Rule[]])[] = [
	['temperature', TEMPERATURE],
	['relativeHumidity', [[(v) => v > 0 && v <= 100, 'must be over 0 and at most 100 %']]]
];
const ROUNDING_RANGES: (readonly [string, readonly Rule[]])[] = [
	['digits', [[(v) => Number.isInteger(v) && v >= 0 && v <= 6, 'must be a whole number 0–6']]]
];
const LIMIT_RANGES: (readonly [string, readonly Rule[]])[] = [
	['maxAtInterfaceGm2', NON_NEGATIVE],
	['maxTotalGm2', NON_NEGATIVE]
];
const ELEMENT_RANGES: (readonly [string, readonly Rule[]])[] = [
	['rsi', RESISTANCE_LIMIT],
	['rse', RESISTANCE_LIMIT],
	['inclinationDeg', [[(v) => v >= 0 && v <= 90, 'must be 0–90° from the horizontal (0 flat, 90 vertical)']]],
	['surfaceRsi', [[(v) => v > 0 && v <= 10, 'must be over 0 and at most 10 m²·K/W']]]
];
const SUSPENDED_RANGES: (readonly [string, readonly Rule[]])[] = [
	['heightM', [...NON_NEGATIVE, [(v) => v <= 10, 'must be ≤ 10 m']]],
	['underfloorWallU', [...NON_NEGATIVE, [(v) => v <= 10, 'must be ≤ 10 W/(m²·K)']]],
	['openingsPerPerimeter', [...NON_NEGATIVE, [(v) => v <= 1, 'must be ≤ 1 m²/m (1 000 000 mm² per metre)']]],
	['windSpeed', [...NON_NEGATIVE, [(v) => v <= 50, 'must be ≤ 50 m/s']]]
];
/** A basement's fields, the ranges of ./ground-basement (ISO 13370:2017, 8.3 and 8.4). */
const BASEMENT_RANGES: (readonly [string, readonly Rule[]])[] = [
	[
		'depthM',
		[
			[(v) => v > 0, 'must be greater than 0 m: a floor at ground level is a slab on the ground'],
			atMost(50, '50 m (50 000 mm)')
		]
	],
	['wallR', [[(v) => v >= 0, 'must be 0 m²·K/W or more'], atMost(50, '50 m²·K/W')]],
	['floorR', [[(v) => v >= 0, 'must be 0 m²·K/W or more'], atMost(50, '50 m²·K/W')]],
	['wallAboveGroundHeightM', [[(v) => v >= 0, 'must be 0 m or more'], atMost(50, '50 m (50 000 mm)')]],
	['wallAboveGroundU', [[(v) => v >= 0, 'must be 0 W/(m²·K) or more'], atMost(10, '10 W/(m²·K)')]],
	['airChangeRate', [[(v) => v >= 0, 'must be 0 h⁻¹ or more'], atMost(100, '100 h⁻¹')]],
	['volumeM3', [[(v) => v >= 0, 'must be 0 m³ or more'], atMost(1e7, '10 000 000 m³')]]
];
/** The fields an unheated basement needs beyond a heated one's. */
const UNHEATED_BASEMENT_FIELDS = [
	'floorR',
	'wallAboveGroundHeightM',
	'wallAboveGroundU',
	'airChangeRate',
	'volumeM3'
] as const;
/** Edge insulation, the ranges of ./ground-edge. */
const EDGE_RANGES: (readonly [string, readonly Rule[]])[] = [
	['widthM', [[(v) => v >= 0, 'must be 0 m or more'], atMost(10, '10 m (10 000 mm)')]],
	['insulationR', [[(v) => v >= 0, 'must be 0 m²·K/W or more'], atMost(50, '50 m²·K/W')]],
	['insulationLambda', [[(v) => v > 0, 'must be greater than 0 W/(m·K)'], atMost(10, '10 W/(m·K)')]],
	['insulationThicknessM', [[(v) => v >= 0, 'must be 0 m or more'], atMost(2, '2 m (2000 mm)')]]
];
/** An unheated space beside the element, the ranges of ./unheated-space. */
const UNHEATED_SPACE_RANGES: (readonly [string, readonly Rule[]])[] = [
	['internalAreaM2', [[(v) => v > 0, 'must be greater than 0 m²'], atMost(1e6, '1 000 000 m²')]],
	['airChangeRate', [[(v) => v >= 0, 'must be 0 h⁻¹ or more'], atMost(100, '100 h⁻¹')]],
	['volumeM3', [[(v) => v >= 0, 'must be 0 m³ or more'], atMost(1e7, '10 000 000 m³')]]
];
const UNHEATED_ELEMENT_RANGES: (readonly [string, readonly Rule[]])[] = [
	['areaM2', [[(v) => v >= 0, 'must be 0 m² or more'], atMost(1e6, '1 000 000 m²')]],
	['uValue', [[(v) => v >= 0, 'must be 0 W/(m²·K) or more'], atMost(10, '10 W/(m²·K)')]]
];
const GROUND_RANGES: (readonly [string, readonly Rule[]])[] = [
	['perimeterM', [...POSITIVE, [(v) => v <= 100000, 'must be ≤ 100 000 m']]],
	['areaM2', [...POSITIVE, [(v) => v <= 1000000, 'must be ≤ 1 000 000 m²']]],
	['groundLambda', [...POSITIVE, [(v) => v <= 10, 'must be ≤ 10 W/(m·K)']]],
	['wallThicknessM', [...NON_NEGATIVE, [(v) => v <= 3, 'must be ≤ 3 m']]]
];
const DESIGN_RANGES: (readonly [string, readonly Rule[]])[] = [
	['internal', TEMPERATURE],
	['external', TEMPERATURE]
];

function refineBasement(b: Record<string, unknown>, add: Add): void {
	checkRanges(b, add, BASEMENT_RANGES);
	if (b.kind !== 'unheated') return;
	for (const f of UNHEATED_BASEMENT_FIELDS)
		if (b[f] === undefined) add([f], 'is required for an unheated basement');
}

/**
 * Edge insulation (./ground-edge): its ranges, Rn or λn (not both), Rn at least the resistance dn/λ
 * of the ground it replaces, and a floor U above zero. `rLayers` is the floor's Rf from its layers.
 */
function refineEdge(g: Record<string, unknown>, e: Record<string, unknown>, rLayers: number, add: Add): void {
	const at = prefixed(add, ['edge']);
	checkRanges(e, at, EDGE_RANGES);
	if (e.insulationR !== undefined && e.insulationLambda !== undefined)
		at(
			['insulationLambda'],
			'must not be given together with the resistance Rn: give the resistance or the λ, not both'
		);
	else if (e.insulationR === undefined && e.insulationLambda === undefined)
		at(['insulationR'], 'is required: the edge insulation’s thermal resistance Rn, or its λ');
	const d = e.insulationThicknessM;
	const rn = isPositive(e.insulationLambda) && typeof d === 'number' ? d / e.insulationLambda : e.insulationR;
	if (e.insulationR === undefined && typeof rn === 'number' && rn > 50)
		at(
			['insulationLambda'],
			`gives Rn = dn/λn = ${figure(rn)} m²·K/W, more than 50 m²·K/W: check the thickness and the λ`
		);
	const lambda = g.groundLambda === undefined ? GROUND_LAMBDA_DEFAULT : g.groundLambda;
	const w = g.wallThicknessM === undefined ? 0.3 : g.wallThicknessM;
	if (
		!(typeof rn === 'number' && rn >= 0 && rn <= 50) ||
		!(typeof d === 'number' && d >= 0 && d <= 2) ||
		!(isPositive(lambda) && lambda <= 10)
	)
		return;
	if (rn < d / lambda) {
		at(
			[e.insulationR === undefined ? 'insulationLambda' : 'insulationR'],
			`gives Rn = ${fmt(rn)} m²·K/W, less than dn/λ = ${fmt(d / lambda)} m²·K/W, the resistance of the ground it replaces: the edge insulation would conduct better than the ground`
		);
		return;
	}
	const width = e.widthM;
	if (
		!isPositive(g.perimeterM) ||
		!isPositive(g.areaM2) ||
		!(typeof w === 'number' && w >= 0 && w <= 3) ||
		!(typeof width === 'number' && width >= 0 && width <= 10) ||
		!(EDGE_ORIENTATIONS as readonly unknown[]).includes(e.orientation) ||
		!(rLayers >= 0 && Number.isFinite(rLayers))
	)
		return;
	const slab = slabOnGroundU(
		{ perimeterM: g.perimeterM, areaM2: g.areaM2, groundLambda: lambda, wallThicknessM: w },
		0.17,
		rLayers,
		0.04
	); // ISO 6946:2017, Table 7 (from memory): Rsi 0.17 downward, Rse 0.04, as ./ground-edge
	const psi = edgeInsulationPsi(
		e.orientation as (typeof EDGE_ORIENTATIONS)[number],
		lambda,
		slab.equivalentThicknessM,
		(rn - d / lambda) * lambda,
		width
	);
	if (!(slab.u + (2 * psi) / slab.characteristicDimensionM > 0))
		at(
			['widthM'],
			'gives a floor U of zero or less: this edge insulation lies outside the range of the method for a floor of this size; calculate the floor numerically (ISO 10211)'
		);
}

/** An unheated space beside the element (./unheated-space): ranges, n or the airtightness, a heat loss to the outside. */
function refineUnheatedSpace(s: Record<string, unknown>, add: Add): void {
	checkRanges(s, add, UNHEATED_SPACE_RANGES);
	const list = Array.isArray(s.externalElements) ? s.externalElements : [];
	let transmission = 0;
	list.forEach((e, i) => {
		if (!isObject(e)) return;
		checkRanges(e, prefixed(add, ['externalElements', i]), UNHEATED_ELEMENT_RANGES);
		if (typeof e.areaM2 === 'number' && typeof e.uValue === 'number') transmission += e.areaM2 * e.uValue;
	});
	if (s.airChangeRate !== undefined && s.airtightness !== undefined)
		add(
			['airtightness'],
			'must not be given with airChangeRate: give the rate or the airtightness, not both'
		);
	else if (s.airChangeRate === undefined && s.airtightness === undefined)
		add(['airChangeRate'], 'is required (h⁻¹), or the airtightness for the conventional value of ISO 13789');
	const n =
		typeof s.airChangeRate === 'number'
			? s.airChangeRate
			: CONVENTIONAL_AIR_CHANGE[s.airtightness as (typeof AIRTIGHTNESS_TYPES)[number]];
	const v = s.volumeM3;
	if (typeof n === 'number' && typeof v === 'number' && Number.isFinite(transmission) && transmission >= 0) {
		if (!(transmission + AIR_HEAT_CAPACITY_WH * n * v > 0))
			add(
				['externalElements'],
				'these elements and the air change lose no heat to the outside (ΣAe·Ue + 0.33·n·V = 0): the space would be at the inside temperature; give the elements between it and the outside, or its air change'
			);
	}
}

/**
 * The layers of a basement floor or an edge-insulated slab as the ISO 13370 modules take them: Rf at
 * most 50 m²·K/W (./ground-basement, ./ground-edge), and the floor above an unheated basement with Uf =
 * 1/(Rsi + Rf + Rsi) of at most 10 W/(m²·K).
 */
function refineFloorBuildUp(g: Record<string, unknown>, rsi: unknown, rLayers: number, add: Add): void {
	if (!(g.basement !== undefined || g.edge !== undefined) || !Number.isFinite(rLayers)) return;
	if (rLayers > 50)
		add(
			['layers'],
			`the floor's layers add up to Rf = ${figure(rLayers)} m²·K/W, more than the 50 m²·K/W the ISO 13370 calculation takes: check the λ-values and thicknesses`
		);
	const b = isObject(g.basement) ? g.basement : undefined;
	const rsiFloor = typeof rsi === 'number' && rsi >= 0 && rsi <= 10 ? rsi : 0.17; // ISO 6946:2017, Table 7 (from memory): 0.17, downward
	if (b?.kind === 'unheated' && 2 * rsiFloor + rLayers < 0.1)
		add(
			['layers'],
			`the floor above the unheated basement has Uf = 1/(Rsi + Rf + Rsi) = ${figure(1 / (2 * rsiFloor + rLayers))} W/(m²·K), more than 10 W/(m²·K): check its layers and Rsi`
		);
}

const FLOOR_TYPE_WORDS = { suspended: 'a suspended floor', basement: 'a basement', edge: 'edge insulation' };

function refineGround(g: Record<string, unknown>, add: Add, rLayers = NaN): void {
	checkRanges(g, add, GROUND_RANGES);
	if (isObject(g.suspended)) checkRanges(g.suspended, prefixed(add, ['suspended']), SUSPENDED_RANGES);
	if (isObject(g.basement)) refineBasement(g.basement, prefixed(add, ['basement']));
	if (isObject(g.edge)) refineEdge(g, g.edge, rLayers, add);
	const types = (['suspended', 'basement', 'edge'] as const).filter((k) => g[k] !== undefined);
	if (types.length > 1)
		add(
			[types[1]],
			`must not be given together with ${FLOOR_TYPE_WORDS[types[0]]}: a floor is one of a slab on the ground (with or without edge insulation), a suspended floor or a basement`
		);
	// P is the EXPOSED perimeter (ISO 13370: walls between heated spaces are left out), so a terraced
	// house's floor may have far less perimeter than its shape; no lower bound beyond P > 0 but that
	// of B′ = A/(0.5·P), which keeps the ground's U finite and above zero.
	if (isPositive(g.perimeterM) && isPositive(g.areaM2)) {
		const b = characteristicDimension(g.areaM2, g.perimeterM);
		if (beyond(b, CHARACTERISTIC_DIMENSION_MAX_M))
			add(
				['perimeterM'],
				`gives B′ = A/(0.5·P) = ${fmt(b, 0)} m, more than ${CHARACTERISTIC_DIMENSION_MAX_M} m: the exposed perimeter is too small for the floor area; check perimeterM (m) and areaM2 (m²)`
			);
	}
}

function refineClimateMonth(m: Record<string, unknown>, add: Add): void {
	checkRanges(m, add, CLIMATE_RANGES);
}

function refineInternal(i: Record<string, unknown>, add: Add): void {
	checkRanges(i, add, INTERNAL_RANGES);
}

function refineRounding(r: Record<string, unknown>, add: Add): void {
	checkRanges(r, add, ROUNDING_RANGES);
	if (r.mode === 'significant' && r.digits === 0)
		add(['digits'], 'must be at least 1 for significant figures');
}

function refineLimits(l: Record<string, unknown>, add: Add): void {
	checkRanges(l, add, LIMIT_RANGES);
}

/* ------------------------------------------------------------------ shapes */

/** Heat-flow direction; its type is `HeatFlow` (./resistances). */
export const heatFlowSchema = z.enum(HEAT_FLOWS, {
	error: (iss) => (iss.input === undefined ? 'is required' : 'must be upward, horizontal or downward')
});

const bridgeShape = z.object({
	/** thermal conductivity of the bridging material, W/(m·K); > 0 */
	lambda: num(),
	/** area fraction of the bridging material, 0 < f < 1 */
	fraction: num().optional(),
	/** width of one bridging member, mm (with centresMm, instead of fraction); > 0 */
	widthMm: num().optional(),
	/** centre-to-centre spacing of the bridging members, mm; > 0 */
	centresMm: num().optional(),
	/** vapour resistance factor of the bridging material (defaults to that of the main material); ≥ 1 */
	mu: num().optional(),
	name: z.string().optional()
});

const fastenersShape = z.object({
	/** thermal conductivity of the fastener, W/(m·K); > 0 */
	lambda: num(),
	/** cross-sectional area of one fastener, mm²; > 0 */
	areaMm2: num(),
	/** number of fasteners per m²; > 0 */
	perM2: num(),
	/** length inside the insulation layer, mm (defaults to the layer thickness); > 0 */
	penetrationMm: num().optional()
});

const plausibleShape = z.object({
	/** the material's category as the library names it, for messages */
	category: z.string({ error: 'must be text' }).optional(),
	/** λ its category allows, W/(m·K); > 0, min ≤ max */
	lambdaMin: num().optional(),
	lambdaMax: num().optional(),
	/** where that λ range comes from */
	lambdaSource: z.string({ error: 'must be text' }).optional(),
	/** the thicknesses the material is stated to come in, mm (the product's own data); min ≤ max */
	thicknessMinMm: num().optional(),
	thicknessMaxMm: num().optional(),
	/** the thinnest product of its category, mm (common practice, no source) */
	smallestMm: num().optional()
});

const layerShape = z.object({
	name: z.string({ error: 'must be text' }),
	/** mm; > 0 */
	thicknessMm: num(),
	/** W/(m·K); > 0 */
	lambda: num().optional(),
	/** m²·K/W, given directly (0 for a thin membrane); ≥ 0 */
	resistance: num().optional(),
	air: z
		.enum(['unventilated', 'slightly-ventilated', 'well-ventilated'], {
			error: 'must be unventilated, slightly-ventilated or well-ventilated'
		})
		.optional(),
	/** opening area of an air layer, mm² per m length (vertical) or per m² (horizontal); ≥ 0 */
	openingAreaMm2: num().optional(),
	/** vapour resistance factor, dimensionless; ≥ 1 */
	mu: num().optional(),
	/** vapour diffusion-equivalent air layer thickness, m; ≥ 0 */
	sd: num().optional(),
	/** ISO 6946 air-gap correction level */
	airGapLevel: z.literal([0, 1, 2], { error: 'must be 0, 1 or 2' }).optional(),
	bridge: bridgeShape.optional(),
	fasteners: fastenersShape.optional(),
	/**
	 * What is usual for the layer's material, as the library states it (the engine does not know the
	 * material): used for plausibility warnings only, never to refuse an input or change a result.
	 */
	plausible: plausibleShape.optional()
});

const climateMonthShape = z.object({
	/** 1–12 */
	month: num(),
	/** monthly mean external temperature, °C */
	temperature: num(),
	/** monthly mean external relative humidity, % (0–100) */
	relativeHumidity: num()
});

const internalShape = z.object({
	/** °C */
	temperature: num(),
	/** %, over 0 and at most 100 */
	relativeHumidity: num().optional(),
	humidityClass: z.literal([1, 2, 3, 4, 5], { error: 'must be 1, 2, 3, 4 or 5' }).optional()
});

const roundingShape = z.object({
	mode: z.enum(['decimals', 'significant'], { error: 'must be decimals or significant' }),
	digits: num()
});

const moistureLimitsShape = z.object({
	/** largest acceptable amount at any one interface, g/m²; ≥ 0 */
	maxAtInterfaceGm2: num().optional(),
	/** largest acceptable total over all interfaces, g/m²; ≥ 0 */
	maxTotalGm2: num().optional(),
	/** whether condensate must evaporate within the year (default true) */
	requireEvaporation: z.boolean({ error: 'must be true or false' }).optional()
});

/** Standalone schemas (e.g. for a CSV row of layers or of climate months), with their rules. */
const standalone = <T extends z.ZodType>(shape: T, rule: (v: Record<string, unknown>, add: Add) => void) =>
	shape.superRefine((v, ctx) => {
		if (isObject(v)) rule(v, fromCtx(ctx));
	}, ALWAYS);

export const bridgeSchema = standalone(bridgeShape, refineBridge);
export const fastenersSchema = standalone(fastenersShape, refineFasteners);
export const layerSchema = standalone(layerShape, refineLayer);
export const climateMonthSchema = standalone(climateMonthShape, refineClimateMonth);
export const internalSchema = standalone(internalShape, refineInternal);
export const roundingSchema = standalone(roundingShape, refineRounding);
export const moistureLimitsSchema = standalone(moistureLimitsShape, refineLimits);

const groundShape = z.object({
	/** exposed perimeter of the floor, m; > 0 */
	perimeterM: num(),
	/** floor area, m²; > 0 */
	areaM2: num(),
	/** thermal conductivity of the ground, W/(m·K); default 2.0 */
	groundLambda: num().optional(),
	/** thickness of the external walls, m; default 0.3 */
	wallThicknessM: num().optional(),
	/**
	 * a suspended floor over a ventilated underfloor space (ISO 13370, 8.2): the layers are then the
	 * floor deck, whose U takes an internal surface resistance on both faces
	 */
	suspended: z
		.object(
			{
				/** h, height of the floor's upper surface above the outside ground, m */
				heightM: num(),
				/** Uw, U-value of the underfloor space's walls above the ground, W/(m²·K) */
				underfloorWallU: num(),
				/** ε, ventilation openings per metre of exposed perimeter, m²/m */
				openingsPerPerimeter: num(),
				/** v, mean wind speed at 10 m height, m/s */
				windSpeed: num(),
				windShielding: z.enum(['sheltered', 'average', 'exposed'], {
					error: 'must be sheltered, average or exposed'
				})
			},
			{
				error:
					'must be an object with heightM, underfloorWallU, openingsPerPerimeter, windSpeed and windShielding'
			}
		)
		.optional(),
	/**
	 * a basement (ISO 13370, 8.3 and 8.4). Heated: the layers are the basement floor, and the U is
	 * U′ over the floor and the walls in the ground. Unheated: the layers are the floor between the
	 * heated space and the basement, whose U takes the internal surface resistance on both faces.
	 */
	basement: z
		.object(
			{
				kind: z.enum(['heated', 'unheated'], { error: 'must be heated or unheated' }),
				/** z, depth of the basement floor below the outside ground, m */
				depthM: num(),
				/** Rw, resistance of the basement walls in the ground (no surface resistances), m²·K/W */
				wallR: num(),
				/** unheated: Rf, resistance of the basement's own floor (no surface resistances), m²·K/W */
				floorR: num().optional(),
				/** unheated: h, height of the basement walls above the outside ground, m */
				wallAboveGroundHeightM: num().optional(),
				/** unheated: Uw, U of the basement walls above the ground, W/(m²·K) */
				wallAboveGroundU: num().optional(),
				/** unheated: n, the basement's air change rate, h⁻¹ */
				airChangeRate: num().optional(),
				/** unheated: V, the basement's air volume, m³ */
				volumeM3: num().optional()
			},
			{ error: 'must be an object with kind, depthM and wallR' }
		)
		.optional(),
	/** edge insulation of a slab on the ground (ISO 13370, U = U0 + 2·Δψ/B′) */
	edge: z
		.object(
			{
				orientation: z.enum(EDGE_ORIENTATIONS, { error: 'must be horizontal or vertical' }),
				/** D: width of horizontal insulation from the wall, or depth of vertical insulation, m */
				widthM: num(),
				/** dn, thickness of the edge insulation, m */
				insulationThicknessM: num(),
				/** Rn, its thermal resistance, m²·K/W; or give insulationLambda (Rn = dn/λn) */
				insulationR: num().optional(),
				/** λn, its thermal conductivity, W/(m·K) */
				insulationLambda: num().optional()
			},
			{
				error:
					'must be an object with orientation, widthM, insulationThicknessM and insulationR or insulationLambda'
			}
		)
		.optional()
});

/**
 * An unheated space beside the element (ISO 6946:2017, 6.10.3): its resistance Ru is added to RT
 * between the last layer and Rse, n by ISO 13789's convention when given by airtightness.
 */
const unheatedSpaceShape = z.object(
	{
		/** Ai, area of all elements between the heated and the unheated space, m² */
		internalAreaM2: num(),
		/** the elements between the unheated space and the outside, each Ae (m²) and Ue (W/(m²·K)) */
		externalElements: z
			.array(
				z.object(
					{
						name: z
							.string({ error: 'must be text' })
							.max(NAME_MAX, `must be at most ${NAME_MAX} characters`)
							.optional(),
						areaM2: num(),
						uValue: num()
					},
					{ error: 'must be an object with areaM2 and uValue' }
				),
				{ error: 'must be a list of elements' }
			)
			.max(100, 'at most 100 elements'),
		/** n, h⁻¹; or give airtightness for ISO 13789's conventional value */
		airChangeRate: num().optional(),
		airtightness: z
			.enum(AIRTIGHTNESS_TYPES, { error: `must be one of ${AIRTIGHTNESS_TYPES.join(', ')}` })
			.optional(),
		/** V, air volume of the unheated space, m³ */
		volumeM3: num()
	},
	{ error: 'must be an object with internalAreaM2, externalElements and volumeM3' }
);

export const roofSpaceSchema = z.enum(ROOF_SPACES, { error: `must be one of ${ROOF_SPACES.join(', ')}` });

const elementShape = z.object({
	heatFlow: heatFlowSchema,
	/** m²·K/W; overrides the ISO 6946 value for U and profile (0–10) */
	rsi: num().optional(),
	/** m²·K/W; overrides the ISO 6946 value for U and profile (0–10) */
	rse: num().optional(),
	/** from inside to outside */
	layers: z.array(layerShape, { error: 'must be a list of layers' }).min(1, 'at least one layer is required'),
	/** °C, for the temperature profile */
	designTemperatures: z.object({ internal: num(), external: num() }).optional(),
	internal: internalShape.optional(),
	/** twelve months, relative humidity in % */
	climate: z.array(climateMonthShape, { error: 'must be a list of months' }).optional(),
	/** internal surface resistance for the fRsi check, m²·K/W (ISO 13788: 0.25) */
	surfaceRsi: num().optional(),
	/** ISO 6946 rule (omit ΔU below 3 % of U) or always apply ΔU */
	corrections: z.enum(['standard', 'always'], { error: 'must be standard or always' }).optional(),
	rounding: roundingShape.optional(),
	moistureLimits: moistureLimitsShape.optional(),
	/** slab-on-ground floor: U by ISO 13370 from the floor's geometry and the ground */
	ground: groundShape.optional(),
	/** roof space above an insulated ceiling: its resistance (ISO 6946) is added to RT */
	roofSpace: roofSpaceSchema.optional(),
	/** the element lies between the heated space and an unheated one (a garage, a stairwell, a sunspace) */
	unheatedSpace: unheatedSpaceShape.optional(),
	/** surface conditions other than the conventional ones (ISO 6946:2017, Annex C): emissivities, wind speed */
	surfaceConditions: surfaceConditionsSchema.optional(),
	/**
	 * inclination of the element from the horizontal, degrees (0 flat, 90 vertical); when given, it
	 * decides whether the heat flow is horizontal (60° or more, ISO 6946:2017, 6.8, note to Table 7)
	 * and `heatFlow` gives its sense (upward or downward)
	 */
	inclinationDeg: num().optional()
});

/**
 * Sum of the layers' thermal resistances, m²·K/W (R = d/λ or as given, ISO 6946:2017, 6.7.1; an
 * air layer by Table 8 unless given; a well-ventilated one 0); NaN when a field is not a number,
 * which then has its own issue.
 */
function layersResistance(
	layers: readonly Record<string, unknown>[],
	heatFlow: unknown,
	inclinationDeg: unknown
): number {
	const given: HeatFlow = (HEAT_FLOWS as readonly unknown[]).includes(heatFlow)
		? (heatFlow as HeatFlow)
		: 'downward';
	const inclined = typeof inclinationDeg === 'number' && inclinationDeg >= 0 && inclinationDeg <= 90;
	const dir = effectiveHeatFlow({ heatFlow: given, inclinationDeg: inclined ? inclinationDeg : undefined });
	let sum = 0;
	for (let i = 0; i < layers.length; i++) {
		const l = layers[i];
		const d = l.thicknessMm as number;
		if (l.air === 'well-ventilated') continue;
		if (l.resistance !== undefined) sum += l.resistance as number;
		else if (l.air !== undefined)
			sum += d >= 0 && d <= AIR_LAYER_MAX_MM ? unventilatedAirLayerResistance(d, dir) : NaN;
		else sum += d / 1000 / (l.lambda as number);
	}
	return sum;
}

/**
 * sd-value of a layer that counts, m, as the thermal model takes it (./element-layers: sd = μ·d,
 * parallel paths through a bridge with its own μ, a negligible sd as zero), so that the check of
 * the total and the Glaser chain agree; NaN when a field is not a number, which has its own issue.
 */
function modelledVapourThickness(l: Record<string, unknown>): number {
	const b = isObject(l.bridge) ? l.bridge : undefined;
	const fraction = b
		? ((b.fraction as number | undefined) ?? (b.widthMm as number) / (b.centresMm as number))
		: undefined;
	const sd = layerVapourThickness(l as Layer, l.thicknessMm as number, false, fraction) ?? 0;
	return negligibleAsZero(sd, SD_NEGLIGIBLE);
}

/**
 * An inclination and the heat flow it gives (ISO 6946:2017, 6.8, note to Table 7, from memory): an
 * element inclined less than 60° from the horizontal has a vertical heat flow, so `heatFlow` must say
 * its sense; a floor on the ground and a ceiling under a roof space need a vertical one.
 */
function refineInclination(e: Record<string, unknown>, add: Add): void {
	const deg = e.inclinationDeg;
	if (typeof deg !== 'number' || !(deg >= 0 && deg <= 90)) return;
	const horizontal = heatFlowForInclination(deg, 'upward') === 'horizontal';
	if (!horizontal && e.heatFlow === 'horizontal')
		add(
			['heatFlow'],
			`an element inclined ${deg}° from the horizontal has a vertical heat flow (horizontal only at 60° or more, ISO 6946 Table 7): give upward or downward, its sense`
		);
	if (horizontal && isObject(e.ground))
		add(['inclinationDeg'], 'a floor on the ground lies flat: leave the inclination out or below 60°');
	if (horizontal && e.roofSpace !== undefined)
		add(['inclinationDeg'], 'a ceiling under a roof space lies flat: leave the inclination out or below 60°');
}

function refineElement(e: Record<string, unknown>, add: Add): void {
	checkRanges(e, add, ELEMENT_RANGES);
	if (isObject(e.designTemperatures))
		checkRanges(e.designTemperatures, prefixed(add, ['designTemperatures']), DESIGN_RANGES);
	if (isObject(e.rounding)) refineRounding(e.rounding, prefixed(add, ['rounding']));
	if (isObject(e.moistureLimits)) refineLimits(e.moistureLimits, prefixed(add, ['moistureLimits']));
	const internal = isObject(e.internal) ? e.internal : undefined;
	if (internal) {
		refineInternal(internal, prefixed(add, ['internal']));
		if (internal.relativeHumidity !== undefined && internal.humidityClass !== undefined) {
			add(['internal', 'humidityClass'], 'give either relativeHumidity or humidityClass, not both');
		}
	}

	// Entries that are not objects are type errors zod reports; the rules see them as empty.
	const layers: Record<string, unknown>[] = Array.isArray(e.layers)
		? e.layers.map((l) => (isObject(l) ? l : {}))
		: [];
	if (layers.length > LAYERS_MAX)
		add(['layers'], `at most ${LAYERS_MAX} layers are supported, got ${layers.length}`);
	for (let i = 0; i < layers.length; i++) refineLayer(layers[i], prefixed(add, ['layers', i]));
	const rLayers = layersResistance(layers, e.heatFlow, e.inclinationDeg);
	if (beyond(rLayers, TOTAL_R_MAX))
		add(
			['layers'],
			`the layers' thermal resistances add up to ${figure(rLayers)} m²·K/W, more than the ${TOTAL_R_MAX} m²·K/W an element may have: check the λ-values and thicknesses`
		);
	const well = layers.findIndex((l) => l.air === 'well-ventilated');
	refineInclination(e, add);
	if (isObject(e.unheatedSpace)) {
		refineUnheatedSpace(e.unheatedSpace, prefixed(add, ['unheatedSpace']));
		if (e.roofSpace !== undefined)
			add(
				['unheatedSpace'],
				'must not be given together with a roof space: a roof space above an insulated ceiling takes the table’s Ru; choose one or the other'
			);
		if (e.ground !== undefined)
			add(
				['unheatedSpace'],
				'does not apply to a floor on the ground: a floor over an unheated basement is a ground floor of the unheated-basement type'
			);
		if (well >= 0)
			add(
				['unheatedSpace'],
				'give either an unheated space or a well-ventilated air layer: the unheated space takes the place of what lies beyond the layers'
			);
	}
	if (isObject(e.ground)) {
		refineGround(e.ground, prefixed(add, ['ground']), rLayers);
		refineFloorBuildUp(e.ground, e.rsi, rLayers, add);
		if (e.heatFlow !== undefined && e.heatFlow !== 'downward')
			add(['ground'], 'applies to a floor only: the heat flow must be downward');
		if (well >= 0)
			add(
				['ground'],
				'a floor on the ground cannot have a well-ventilated air layer (a suspended floor over a ventilated void is not covered)'
			);
		if (e.roofSpace !== undefined) add(['roofSpace'], 'a floor on the ground has no roof space');
	}
	if (e.roofSpace !== undefined) {
		if (e.heatFlow !== undefined && e.heatFlow !== 'upward')
			add(['roofSpace'], 'applies to a ceiling under a roof space only: the heat flow must be upward');
		if (well >= 0)
			add(
				['roofSpace'],
				'give either a roof space or a well-ventilated air layer: the roof space already includes the ventilated space'
			);
	}
	if (well === 0)
		add(['layers', 0, 'air'], 'the first layer cannot be well ventilated: no layer would remain inside it');
	const active = well < 0 ? layers.length : well;
	let slightly = 0;
	let bridged = 0;
	for (let i = 0; i < active; i++) {
		const l = layers[i];
		if (l.air === 'slightly-ventilated' && ++slightly > 1)
			add(['layers', i, 'air'], 'only one slightly ventilated air layer is supported');
		if (l.bridge && ++bridged > MAX_BRIDGED_LAYERS)
			add(['layers', i, 'bridge'], `at most ${MAX_BRIDGED_LAYERS} bridged layers are supported`);
	}

	if (e.climate === undefined) return;
	if (Array.isArray(e.climate)) {
		const climate = e.climate;
		for (let i = 0; i < climate.length; i++)
			if (isObject(climate[i])) refineClimateMonth(climate[i], prefixed(add, ['climate', i]));
		if (climate.length !== 12) {
			add(['climate'], `12 months are required, got ${climate.length}`);
		} else {
			const seen = new Map<unknown, number>();
			climate.forEach((m, i) => {
				const month = isObject(m) ? m.month : undefined;
				if (typeof month !== 'number') return;
				if (seen.has(month))
					add(['climate', i, 'month'], `month ${month} is given twice (also at climate.${seen.get(month)})`);
				else seen.set(month, i);
			});
		}
	}
	if (!internal) {
		add(['internal'], 'internal conditions are required with a climate');
	} else if (internal.relativeHumidity === undefined && internal.humidityClass === undefined) {
		add(['internal', 'relativeHumidity'], 'give relativeHumidity or humidityClass for the moisture checks');
	}
	// A floor on the ground gets the surface check only: no vapour data is needed.
	if (isObject(e.ground)) return;
	let sdTotal = 0;
	let allGiven = true;
	for (let i = 0; i < active; i++) {
		const l = layers[i];
		if (l.mu === undefined && l.sd === undefined && l.air === undefined) {
			add(['layers', i, 'mu'], 'give μ or sd for the condensation check');
			allGiven = false;
		}
		sdTotal += modelledVapourThickness(l);
	}
	if (allGiven && sdTotal <= 0)
		add(['layers'], 'the total sd-value is zero: the condensation check needs some vapour resistance');
}

export const elementInputSchema = elementShape.superRefine((e, ctx) => {
	if (isObject(e)) refineElement(e, fromCtx(ctx));
}, ALWAYS);

export type BridgeInput = z.infer<typeof bridgeSchema>;
export type FastenersInput = z.infer<typeof fastenersSchema>;
export type Layer = z.infer<typeof layerSchema>;
export type ClimateMonth = z.infer<typeof climateMonthSchema>;
export type InternalConditions = z.infer<typeof internalSchema>;
export type Rounding = z.infer<typeof roundingSchema>;
export type MoistureLimits = z.infer<typeof moistureLimitsSchema>;
export type ElementInput = z.infer<typeof elementInputSchema>;

/* ------------------------------------------------------------------ result */

const point = z.object({ positionMm: z.number(), temperature: z.number() });

export const layerResultSchema = z.object({
	index: z.number().int(),
	name: z.string(),
	thicknessMm: z.number(),
	positionStartMm: z.number(),
	positionEndMm: z.number(),
	kind: z.enum([
		'material',
		'resistance',
		'air-unventilated',
		'air-slightly-ventilated',
		'air-well-ventilated'
	]),
	/** resistance used along the calculation path (main material of a bridged layer), m²·K/W */
	r: z.number(),
	rBridge: z.number().optional(),
	bridgeFraction: z.number().optional(),
	/** equivalent resistance of a bridged layer in the lower limit, m²·K/W */
	rEquivalent: z.number(),
	/** m, null when no vapour data is given */
	sd: z.number().nullable(),
	temperatureInside: z.number(),
	temperatureOutside: z.number(),
	/** outside a well-ventilated air layer (or that layer itself): not part of U or the moisture checks */
	disregarded: z.boolean()
});

export const surfaceMonthSchema = z.object({
	month: z.number(),
	externalTemperature: z.number(),
	internalVapourPressure: z.number(),
	minSaturationPressure: z.number(),
	minSurfaceTemperature: z.number().nullable(),
	fRsiMin: z.number().nullable()
});

export const surfaceResultSchema = z.object({
	fRsi: z.number(),
	fRsiMin: z.number(),
	criticalMonth: z.number(),
	pass: z.boolean(),
	rsiUsed: z.number(),
	/** for bridged elements: fRsi of the section with the lowest resistance (1-D estimate) */
	fRsiLowestSection: z.number().optional(),
	months: z.array(surfaceMonthSchema)
});

export const glaserNodeSchema = z.object({
	index: z.number(),
	positionMm: z.number(),
	positionStartMm: z.number(),
	sdM: z.number(),
	layerIndex: z.number(),
	kind: z.enum(['internal-surface', 'interface', 'sublayer', 'external-surface'])
});

export const glaserMonthSchema = z.object({
	month: z.number(),
	days: z.number(),
	externalTemperature: z.number(),
	externalVapourPressure: z.number(),
	internalTemperature: z.number(),
	internalVapourPressure: z.number(),
	temperature: z.array(z.number()),
	saturationPressure: z.array(z.number()),
	vapourPressure: z.array(z.number()),
	rate: z.array(z.number()),
	accumulatedAt: z.array(z.number()),
	accumulated: z.number(),
	condensed: z.number(),
	evaporated: z.number()
});

export const condensationResultSchema = z.object({
	months: z.array(glaserMonthSchema),
	maxAccumulation: z.number(),
	peakMonth: z.number().nullable(),
	maxAtInterface: z.number(),
	maxAtInterfaceNode: z.number().nullable(),
	evaporatesFully: z.boolean(),
	condensationMonths: z.array(z.number()),
	outcome: z.enum(['none', 'dries', 'accumulates']),
	startMonth: z.number().nullable(),
	condensesEveryMonth: z.boolean(),
	surfaceCondensationMonths: z.array(z.number()),
	nodes: z.array(glaserNodeSchema),
	vapourProfile: z.object({
		month: z.number(),
		points: z.array(
			z.object({
				positionMm: z.number(),
				sdM: z.number(),
				temperature: z.number(),
				saturationPressure: z.number(),
				vapourPressure: z.number()
			})
		)
	}),
	acceptance: z.object({ pass: z.boolean(), reasons: z.array(z.string()) }),
	/**
	 * The mass balance of the monthly method: `created`, g/m², the moisture its months produced
	 * beyond the net vapour flux over the year (sum over the months of the change in the total held
	 * minus (flux in at the internal surface − flux out at the external surface) × the month's
	 * length; positive when moisture appears from nothing), and the same cycle with each month split
	 * where an interface dries out (`conserving`: same meanings and units as above, its `created` ≈ 0).
	 * Always given by this engine; absent in results of earlier engines (e.g. stored report snapshots).
	 */
	massBalance: z
		.object({
			created: z.number(),
			conserving: z.object({
				months: z.array(glaserMonthSchema),
				maxAccumulation: z.number(),
				peakMonth: z.number().nullable(),
				evaporatesFully: z.boolean(),
				outcome: z.enum(['none', 'dries', 'accumulates']),
				created: z.number()
			})
		})
		.optional()
});

export const groundResultSchema = z.object({
	method: z.string(),
	perimeterM: z.number(),
	areaM2: z.number(),
	characteristicDimensionM: z.number(),
	equivalentThicknessM: z.number(),
	groundLambda: z.number(),
	/** where λg comes from, in words (given by engines from 1.3.0) */
	groundLambdaSource: z.string().optional(),
	wallThicknessM: z.number(),
	regime: z.string(),
	/** a suspended floor (ISO 13370, 8.2): the deck's Uf, the ground's Ug and Ux with its two parts, W/(m²·K) */
	suspended: z
		.object({
			floorU: z.number(),
			ug: z.number(),
			ux: z.number(),
			uxWalls: z.number(),
			uxVentilation: z.number(),
			heightM: z.number(),
			underfloorWallU: z.number(),
			openingsPerPerimeter: z.number(),
			windSpeed: z.number(),
			windShieldingFactor: z.number()
		})
		.optional(),
	/**
	 * a basement (ISO 13370, 8.3 and 8.4): dt, dw, Ubf, Ubw; heated: H and U′ over A + z·P;
	 * unheated: the floor above's Uf, the basement's loss A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V
	 */
	basement: z
		.object({
			kind: z.enum(['heated', 'unheated']),
			depthM: z.number(),
			floorR: z.number(),
			wallR: z.number(),
			floorEquivalentThicknessM: z.number(),
			wallEquivalentThicknessM: z.number(),
			floorRegime: z.string(),
			ubf: z.number(),
			ubw: z.number(),
			wallUsedDw: z.boolean(),
			/** heated: H = A·Ubf + z·P·Ubw, W/K, and the area it is spread over, A + z·P, m² */
			heatTransferCoefficient: z.number().optional(),
			areaInGroundM2: z.number().optional(),
			/** unheated: Uf of the floor above, W/(m²·K), and the basement's figures */
			floorU: z.number().optional(),
			wallAboveGroundHeightM: z.number().optional(),
			wallAboveGroundU: z.number().optional(),
			airChangeRate: z.number().optional(),
			volumeM3: z.number().optional(),
			ventilationCoefficient: z.number().optional(),
			basementLossCoefficient: z.number().optional()
		})
		.optional(),
	/** edge insulation of a slab (ISO 13370): U0 without it, R′, d′, Δψ; U = U0 + 2·Δψ/B′ */
	edge: z
		.object({
			orientation: z.enum(EDGE_ORIENTATIONS),
			widthM: z.number(),
			insulationR: z.number(),
			insulationLambda: z.number().optional(),
			insulationThicknessM: z.number(),
			u0: z.number(),
			additionalResistance: z.number(),
			additionalThicknessM: z.number(),
			deltaPsi: z.number()
		})
		.optional(),
	/** resistance of the ground between the last layer and Rse that gives the floor's U, m²·K/W */
	rGround: z.number()
});

/** An element beside an unheated space: Ru and its parts (ISO 6946:2017, 6.10.3; n by ISO 13789). */
export const unheatedSpaceResultSchema = z.object({
	method: z.string(),
	internalAreaM2: z.number(),
	externalElements: z.array(
		z.object({ name: z.string().optional(), areaM2: z.number(), uValue: z.number() })
	),
	/** ΣAe·Ue, W/K */
	transmissionCoefficient: z.number(),
	/** n used, h⁻¹, and where it comes from */
	airChangeRate: z.number(),
	airChangeSource: z.string(),
	volumeM3: z.number(),
	/** 0.33·n·V, W/K */
	ventilationCoefficient: z.number(),
	/** Hue = ΣAe·Ue + 0.33·n·V, W/K */
	heatLossToOutside: z.number(),
	/** Ru = Ai/Hue, m²·K/W */
	ru: z.number(),
	/** U0 of the element as if exposed to outside air (before ΔU), W/(m²·K) */
	uExposed: z.number(),
	/** ISO 13789's b = Hue/(Hiu + Hue), Hiu = Ai·U0 */
	adjustmentFactor: z.number()
});

/**
 * A plausibility warning: an input that is allowed but unusual (a layer over 1 m, thinner than any
 * product of its kind, outside its material's stated thicknesses or its category's λ, an inside
 * temperature outside 5–35 °C). It never refuses an input nor changes a figure; `path` names the
 * field of the input (`layers.2.thicknessMm`, `internal.temperature`), `source` the range's origin.
 */
export const plausibilityWarningSchema = z.object({
	kind: z.literal('plausibility'),
	check: z.enum([
		'layer-too-thick',
		'layer-too-thin',
		'thickness-outside-range',
		'lambda-outside-range',
		'inside-temperature'
	]),
	path: z.string(),
	layerIndex: z.number().int().optional(),
	value: z.number(),
	message: z.string(),
	source: z.string()
});

export const elementResultSchema = z.object({
	engineVersion: z.string(),
	uValue: z.number(),
	uValueRounded: z.number(),
	roundingConvention: z.string(),
	/** U before corrections, W/(m²·K) */
	uUncorrected: z.number(),
	rTotal: z.number(),
	/** ground floors: U and RT of the build-up alone (as if exposed to outside air) */
	uBuildUp: z.number().optional(),
	rBuildUp: z.number().optional(),
	ground: groundResultSchema.optional(),
	/** ceilings under a roof space: the roof-space resistance included in RT, m²·K/W */
	rRoofSpace: z.number().optional(),
	/** elements beside an unheated space: Ru (included in RT) and its parts */
	unheatedSpace: unheatedSpaceResultSchema.optional(),
	rUpper: z.number().optional(),
	rLower: z.number().optional(),
	relativeError: z.number().optional(),
	deltaU: z.number(),
	deltaUAirGaps: z.number(),
	deltaUFasteners: z.number(),
	correctionsApplied: z.boolean(),
	rsi: z.number(),
	rse: z.number(),
	designTemperatures: z.object({ internal: z.number(), external: z.number() }),
	interfaces: z.array(point),
	heatFlux: z.number(),
	heatFluxElement: z.number(),
	profile: z.array(point),
	layers: z.array(layerResultSchema),
	surface: surfaceResultSchema.optional(),
	condensation: condensationResultSchema.optional(),
	notes: z.array(z.string()),
	warnings: z.array(z.string()),
	/** plausibility warnings (given by engines from 1.3.0; absent in earlier stored results) */
	plausibility: z.array(plausibilityWarningSchema).optional(),
	cautions: z.array(z.string())
});

export type LayerResult = z.infer<typeof layerResultSchema>;
export type SurfaceResult = z.infer<typeof surfaceResultSchema>;
export type CondensationResult = z.infer<typeof condensationResultSchema>;
export type ElementResult = z.infer<typeof elementResultSchema>;
export type PlausibilityWarning = z.infer<typeof plausibilityWarningSchema>;

/* ------------------------------------------------------------------ parsing */

export interface FieldIssue {
	/** dotted path, e.g. `layers.2.thicknessMm` */
	path: string;
	message: string;
}

/** Flatten zod issues to `{ path, message }` with dotted paths. */
export function formatIssues(error: z.ZodError): FieldIssue[] {
	return error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(input)', message: i.message }));
}

/** Thrown by the engine for invalid input; `issues` name each field, `message` lists them. */
export class ElementInputError extends Error {
	readonly issues: FieldIssue[];
	constructor(issues: FieldIssue[]) {
		super(issues.map((i) => `${i.path}: ${i.message}`).join('; '));
		this.name = 'ElementInputError';
		this.issues = issues;
	}
}

/**
 * Inputs this module has validated and returned, each deep-frozen (zod's output is a fresh object
 * each time, so the caller's raw input is never frozen). The calculation trusts them without a
 * second validation, which would cost a third of the calculation itself: a frozen value cannot be
 * changed after its check (an assignment throws a TypeError in strict code), and a changed copy is
 * a new object, validated again. Weak: nothing is kept alive.
 */
const validated = new WeakSet<object>();

function deepFreeze(v: unknown): void {
	if (typeof v !== 'object' || v === null || Object.isFrozen(v)) return;
	Object.freeze(v);
	const keys = Object.keys(v);
	for (let i = 0; i < keys.length; i++) deepFreeze((v as Record<string, unknown>)[keys[i]]);
}

type Parsed = { ok: true; data: ElementInput } | { ok: false; issues: FieldIssue[] };

const ZERO_TOTAL: FieldIssue = {
	path: 'layers',
	message: 'the total thermal resistance is zero: give Rsi, Rse or a layer with resistance'
};

/**
 * The schema, then what needs the whole validated element (a total thermal resistance of zero, by
 * the thermal model itself: ./element-bounds). `keep`: freeze the value and remember it as
 * validated, for a value handed out; the engine's own check of raw input (`checkedElementInput`)
 * keeps its copy to itself and skips both.
 */
function validate(raw: unknown, keep: boolean): Parsed {
	if (typeof raw === 'object' && raw !== null && validated.has(raw))
		return { ok: true, data: raw as ElementInput };
	const r = elementInputSchema.safeParse(raw);
	if (!r.success) return { ok: false, issues: formatIssues(r.error) };
	if (totalResistanceIsZero(r.data)) return { ok: false, issues: [{ ...ZERO_TOTAL }] };
	if (keep) {
		deepFreeze(r.data);
		validated.add(r.data);
	}
	return { ok: true, data: r.data };
}

/**
 * Validate raw input (form, JSON, CSV row) without throwing. The data returned is deep-frozen: to
 * change an input, change a copy (or the raw object) and parse it again.
 */
export function parseElementInput(raw: unknown): Parsed {
	return validate(raw, true);
}

/** Validate raw input; throws {@link ElementInputError} naming every bad field. Frozen as above. */
export function assertElementInput(raw: unknown): ElementInput {
	const r = validate(raw, true);
	if (!r.ok) throw new ElementInputError(r.issues);
	return r.data;
}

/**
 * For the engine itself (`analyseElement`): a value returned by {@link parseElementInput} as it is,
 * anything else validated into a private copy that never leaves the calculation (so neither frozen
 * nor remembered). Throws {@link ElementInputError} naming every bad field.
 */
export function checkedElementInput(raw: unknown): ElementInput {
	const r = validate(raw, false);
	if (!r.ok) throw new ElementInputError(r.issues);
	return r.data;
}
