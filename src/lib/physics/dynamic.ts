/**
 * Dynamic thermal characteristics of a plane build-up of homogeneous layers under a sinusoidal
 * temperature variation of period T, by the heat-transfer-matrix method of ISO 13786:2017 (the
 * simplified method for plane components of plane homogeneous layers). Formulas, names and clause
 * titles are given FROM MEMORY (not checked against a copy of the standard); the tests compare every
 * figure with an independent Python/numpy implementation and with closed-form limits.
 *
 * Side 1 is the internal side, side 2 the external; layers are listed from inside to outside, layer 1
 * beside side 1. The matrix of the element, environment to environment, is
 * Z = Zs2 · ZN · … · Z1 · Zs1 and relates the complex amplitudes (θ2, q2) = Z·(θ1, q1), the heat
 * flow density q counted positive from side 1 towards side 2.
 */
import { z } from 'zod';
import { argument, complex, div, matMul, modulus, sub, type Complex, type Matrix2 } from './dynamic-complex';
import { RSE, RSI } from './resistances';
import {
	LAYER_R_MAX,
	LAYERS_MAX,
	R_NEGLIGIBLE,
	THICKNESS_MAX_MM,
	THICKNESS_MIN_MM,
	TOTAL_R_MAX
} from './bounds';
import {
	addTo,
	ALWAYS,
	assertFinite,
	assertParsed,
	atLeast,
	atMost,
	checkFields,
	isPositive,
	listOf,
	nonNegative,
	num,
	parseCalculation,
	positive,
	text,
	type Add,
	type Labels,
	type Parsed
} from './calc-parse';
import { CAUTIONS } from './cautions';
import { fmt } from './note-format';

export type { Complex, Matrix2 } from './dynamic-complex';

/** Where the method comes from, as results cite it. */
export const DYNAMIC_SOURCE =
	'ISO 13786:2017, heat transfer matrix method for plane homogeneous layers (from memory)';

/** Period of the variation when none is given, h: the daily cycle the standard's examples use. */
export const DYNAMIC_PERIOD_DEFAULT_H = 24; // ISO 13786:2017 (from memory): the daily period, T = 86 400 s

/** Shortest and longest period accepted, h (an hour; a year). */
export const DYNAMIC_PERIOD_MIN_H = 1; // this product's bound, no source
export const DYNAMIC_PERIOD_MAX_H = 8760; // this product's bound, no source: one year of 365 days

/** Densest material accepted, kg/m³ (osmium, the densest element, is about 22 600). */
export const DYNAMIC_DENSITY_MAX = 25000; // this product's bound, no source (osmium ~22 600, from memory)
/** Lightest material accepted, kg/m³ (the lightest aerogels are about 1; air is 1.2). */
export const DYNAMIC_DENSITY_MIN = 0.1; // this product's bound, no source
/**
 * Specific heat capacity accepted, J/(kg·K): every solid at room temperature lies above about 110
 * (lead 129, from memory), so a value below 50 is one given in kJ/(kg·K); hydrogen gas is 14 300.
 */
export const DYNAMIC_SPECIFIC_HEAT_MIN = 50; // this product's bound, no source
export const DYNAMIC_SPECIFIC_HEAT_MAX = 20000; // this product's bound, no source
/** Most conductive material accepted, W/(m·K) (copper ~400). */
export const DYNAMIC_LAMBDA_MAX = 1000; // this product's bound, no source
/**
 * Largest Σξ = Σ d/δ, the build-up's thickness in penetration depths. At 100 the periodic
 * transmittance is of the order of e⁻¹⁰⁰ ≈ 10⁻⁴⁴ of U, which no measurement or use can tell from
 * zero, while cosh ξ of the layers and their products stay far from overflowing.
 */
export const DYNAMIC_XI_TOTAL_MAX = 100; // this product's bound, no source
/**
 * Largest modulus of an entry of the element's heat transfer matrix. Real build-ups stay far below
 * it; only contrived alternations of extreme layers approach it, and beyond it the products could
 * overflow double precision (10³⁰⁸).
 */
export const DYNAMIC_MATRIX_MAX = 1e100; // this product's bound, no source

/* ------------------------------------------------------------------ input */

const layerShape = z.object(
	{
		name: text().optional(),
		/** thickness d, mm (required for a material layer; optional for a resistance-only layer) */
		thicknessMm: num().optional(),
		/** thermal conductivity λ, W/(m·K) */
		lambda: num().optional(),
		/** density ρ, kg/m³ */
		density: num().optional(),
		/** specific heat capacity c, J/(kg·K) */
		specificHeat: num().optional(),
		/** thermal resistance R of a layer without heat capacity (an air layer), m²·K/W */
		resistance: num().optional()
	},
	{
		error: () =>
			'must be an object: a material layer (thicknessMm, lambda, density, specificHeat) or a resistance'
	}
);

const shape = z.object(
	{
		/** from inside (side 1) to outside (side 2) */
		layers: listOf(layerShape, 1, LAYERS_MAX),
		/** internal surface resistance Rsi, m²·K/W (default 0.13, ISO 6946 horizontal heat flow) */
		rsi: num().optional(),
		/** external surface resistance Rse, m²·K/W (default 0.04) */
		rse: num().optional(),
		/** period T of the variation, h (default 24) */
		periodH: num().optional()
	},
	{ error: () => 'must be an object with layers' }
);

const LAYER_RULES = {
	thicknessMm: [
		positive('mm'),
		atLeast(THICKNESS_MIN_MM, `${THICKNESS_MIN_MM} mm`),
		atMost(THICKNESS_MAX_MM, `${THICKNESS_MAX_MM} mm`)
	],
	lambda: [positive('W/(m·K)'), atMost(DYNAMIC_LAMBDA_MAX, `${DYNAMIC_LAMBDA_MAX} W/(m·K)`)],
	density: [
		atLeast(
			DYNAMIC_DENSITY_MIN,
			`${DYNAMIC_DENSITY_MIN} kg/m³`,
			'a layer without heat capacity (an air layer) is given by its resistance R'
		),
		atMost(DYNAMIC_DENSITY_MAX, `${DYNAMIC_DENSITY_MAX} kg/m³`)
	],
	specificHeat: [
		atLeast(
			DYNAMIC_SPECIFIC_HEAT_MIN,
			`${DYNAMIC_SPECIFIC_HEAT_MIN} J/(kg·K)`,
			'a value in kJ/(kg·K) must be multiplied by 1000'
		),
		atMost(DYNAMIC_SPECIFIC_HEAT_MAX, `${DYNAMIC_SPECIFIC_HEAT_MAX} J/(kg·K)`)
	],
	resistance: [nonNegative('m²·K/W'), atMost(LAYER_R_MAX, `${LAYER_R_MAX} m²·K/W`)]
} as const;

const SURFACE_RULE = [nonNegative('m²·K/W'), atMost(10, '10 m²·K/W')] as const;
const TOP_RULES = {
	rsi: SURFACE_RULE,
	rse: SURFACE_RULE,
	periodH: [
		atLeast(DYNAMIC_PERIOD_MIN_H, `${DYNAMIC_PERIOD_MIN_H} h`),
		atMost(DYNAMIC_PERIOD_MAX_H, `${DYNAMIC_PERIOD_MAX_H} h (a year)`)
	]
} as const;

const MATERIAL_FIELDS = ['thicknessMm', 'lambda', 'density', 'specificHeat'] as const;

/** A layer is a material (d, λ, ρ, c) or a resistance without heat capacity (R), never both. */
function checkLayerKind(l: Record<string, unknown>, path: (string | number)[], add: Add): void {
	const given = MATERIAL_FIELDS.filter((f) => l[f] !== undefined);
	if (l.resistance !== undefined) {
		for (const f of ['lambda', 'density', 'specificHeat'] as const)
			if (l[f] !== undefined)
				add([...path, f], 'must not be given with a resistance: give either d, λ, ρ and c, or R');
		return;
	}
	if (given.length === 0) {
		add(
			path,
			'needs d, λ, ρ and c (thicknessMm, lambda, density, specificHeat), or the resistance R of a layer without heat capacity'
		);
		return;
	}
	for (const f of MATERIAL_FIELDS)
		if (l[f] === undefined) add([...path, f], 'must be given for a material layer');
	if (
		isPositive(l.thicknessMm) &&
		isPositive(l.lambda) &&
		l.thicknessMm / 1000 / l.lambda > LAYER_R_MAX * (1 + 1e-9)
	)
		add(
			[...path, 'lambda'],
			`gives R = d/λ = ${fmt(l.thicknessMm / 1000 / l.lambda)} m²·K/W, more than the ${LAYER_R_MAX} m²·K/W a layer may have: check λ and the thickness (mm)`
		);
}

/** Thermal resistance of a layer as given, m²·K/W (0 while a field is still missing). */
const layerR = (l: Record<string, unknown>): number =>
	typeof l.resistance === 'number'
		? l.resistance
		: isPositive(l.thicknessMm) && isPositive(l.lambda)
			? l.thicknessMm / 1000 / l.lambda
			: 0;

export const dynamicInputSchema = shape.superRefine((input, ctx) => {
	const add = addTo(ctx);
	checkFields(input, TOP_RULES, [], add);
	if (!Array.isArray(input?.layers)) return;
	input.layers.forEach((l, i) => {
		if (typeof l !== 'object' || l === null) return;
		checkFields(l, LAYER_RULES, ['layers', i], add);
		checkLayerKind(l as Record<string, unknown>, ['layers', i], add);
	});
	const sum = input.layers.reduce((s, l) => s + (typeof l === 'object' && l ? layerR(l) : 0), 0);
	if (sum > TOTAL_R_MAX * (1 + 1e-9))
		add(
			['layers'],
			`add up to a thermal resistance of ${fmt(sum)} m²·K/W, more than the ${TOTAL_R_MAX} m²·K/W an element may have: check the λ-values and thicknesses`
		);
}, ALWAYS);

export type DynamicLayerInput = z.infer<typeof layerShape>;
export type DynamicInput = z.infer<typeof shape>;

const LABELS: Labels = {
	lists: { layers: 'Layer' },
	fields: {
		thicknessMm: 'thickness d',
		lambda: 'thermal conductivity λ',
		density: 'density ρ',
		specificHeat: 'specific heat capacity c',
		resistance: 'thermal resistance R',
		rsi: 'internal surface resistance Rsi',
		rse: 'external surface resistance Rse',
		periodH: 'period T',
		layers: 'Layers'
	}
};

/** Penetration depth δ = √(λT/(πρc)), m, with T in seconds (ISO 13786:2017, from memory). */
export function penetrationDepth(
	lambda: number,
	density: number,
	specificHeat: number,
	periodS: number
): number {
	return Math.sqrt((lambda * periodS) / (Math.PI * density * specificHeat));
}

/** Σξ of the material layers for the period given, for the bound on the build-up's thickness. */
function totalXi(input: DynamicInput, periodS: number): number {
	let sum = 0;
	for (const l of input.layers)
		if (l.resistance === undefined)
			sum += l.thicknessMm! / 1000 / penetrationDepth(l.lambda!, l.density!, l.specificHeat!, periodS);
	return sum;
}

/**
 * The whole-input rules: a total resistance above zero, a thickness within the Σξ bound, and (a
 * backstop for contrived build-ups that alternate extreme layers) a matrix whose entries stay
 * within {@link DYNAMIC_MATRIX_MAX}.
 */
function checkWhole(input: DynamicInput, add: Add): void {
	const rsi = input.rsi ?? RSI.horizontal;
	const rse = input.rse ?? RSE;
	const rt = rsi + rse + input.layers.reduce((s, l) => s + layerR(l), 0);
	if (rt < R_NEGLIGIBLE)
		add(
			['layers'],
			'and the surface resistances give a total thermal resistance of zero: give Rsi, Rse or a layer with resistance'
		);
	const periodS = (input.periodH ?? DYNAMIC_PERIOD_DEFAULT_H) * 3600;
	const xi = totalXi(input, periodS);
	if (xi > DYNAMIC_XI_TOTAL_MAX) {
		add(
			['layers'],
			`are ${fmt(xi, 1)} penetration depths thick at this period (Σξ = Σ d/δ), more than ${DYNAMIC_XI_TOTAL_MAX}: the periodic transmittance would be below 10⁻⁴⁴ of U. Check the thicknesses, λ, ρ and c, or use a longer period`
		);
		return;
	}
	const zm = elementMatrix(layerResults(input, periodS), resistanceMatrix(rsi), resistanceMatrix(rse));
	const largest = Math.max(...[zm.m11, zm.m12, zm.m21, zm.m22].map(modulus));
	if (!(largest <= DYNAMIC_MATRIX_MAX))
		add(
			['layers'],
			`damp the periodic variation too strongly to be computed (an entry of the heat transfer matrix exceeds 10¹⁰⁰): check the thicknesses, λ, ρ and c, or use a longer period`
		);
}

/** Validate a raw input without throwing: field-named issues, or the data with nothing filled in. */
export function parseDynamicInput(raw: unknown): Parsed<DynamicInput> {
	return parseCalculation(dynamicInputSchema, raw, LABELS, checkWhole);
}

/* ------------------------------------------------------------------ matrices */

/**
 * Heat transfer matrix of a homogeneous layer (ISO 13786:2017, from memory), ξ = d/δ:
 *   Z11 = Z22 = cosh ξ·cos ξ + i·sinh ξ·sin ξ
 *   Z12 = −(δ/(2λ))·{sinh ξ·cos ξ + cosh ξ·sin ξ + i·(cosh ξ·sin ξ − sinh ξ·cos ξ)}   (m²·K/W)
 *   Z21 = −(λ/δ)·{sinh ξ·cos ξ − cosh ξ·sin ξ + i·(sinh ξ·cos ξ + cosh ξ·sin ξ)}      (W/(m²·K))
 */
export function layerMatrix(lambda: number, delta: number, xi: number): Matrix2 {
	const [ch, sh, c, s] = [Math.cosh(xi), Math.sinh(xi), Math.cos(xi), Math.sin(xi)];
	const diagonal = complex(ch * c, sh * s);
	const k12 = -delta / (2 * lambda);
	const k21 = -lambda / delta;
	return {
		m11: diagonal,
		m12: complex(k12 * (sh * c + ch * s), k12 * (ch * s - sh * c)),
		m21: complex(k21 * (sh * c - ch * s), k21 * (sh * c + ch * s)),
		m22: diagonal
	};
}

/**
 * Heat transfer matrix of a thermal resistance without heat capacity, [[1, −R], [0, 1]]: a surface
 * resistance Rs (ISO 13786:2017, boundary layer matrix, from memory) or an air layer.
 */
export function resistanceMatrix(r: number): Matrix2 {
	return { m11: complex(1), m12: complex(-r), m21: complex(0), m22: complex(1) };
}

/** A periodic quantity: its complex value, modulus and time shift Δt = T/(2π)·arg, h. */
export interface PeriodicQuantity {
	value: Complex;
	modulus: number;
	/** arg, radians in (−π, π] */
	argumentRad: number;
	/** Δt = T·arg/(2π), h, in (−T/2, T/2]: known only to within whole periods */
	timeShiftH: number;
}

function periodic(value: Complex, periodH: number): PeriodicQuantity {
	const arg = argument(value);
	return { value, modulus: modulus(value), argumentRad: arg, timeShiftH: (periodH * arg) / (2 * Math.PI) };
}

export interface DynamicLayerResult {
	index: number;
	name: string;
	kind: 'material' | 'resistance';
	/** d, mm (null for a resistance given without thickness) */
	thicknessMm: number | null;
	/** R = d/λ, or as given, m²·K/W */
	r: number;
	/** ρ·c·d, kJ/(m²·K) (0 for a resistance) */
	heatCapacity: number;
	/** periodic penetration depth δ, m (null for a resistance) */
	delta: number | null;
	/** ξ = d/δ (0 for a resistance) */
	xi: number;
	/** the layer's heat transfer matrix Z */
	z: Matrix2;
}

function layerResults(input: DynamicInput, periodS: number): DynamicLayerResult[] {
	return input.layers.map((l, index) => {
		const name = l.name ?? `Layer ${index + 1}`;
		if (l.resistance !== undefined) {
			const thicknessMm = l.thicknessMm ?? null;
			return {
				index,
				name,
				kind: 'resistance',
				thicknessMm,
				r: l.resistance,
				heatCapacity: 0,
				delta: null,
				xi: 0,
				z: resistanceMatrix(l.resistance)
			};
		}
		const d = l.thicknessMm! / 1000;
		const delta = penetrationDepth(l.lambda!, l.density!, l.specificHeat!, periodS);
		const xi = d / delta;
		const heatCapacity = (l.density! * l.specificHeat! * d) / 1000;
		return {
			index,
			name,
			kind: 'material',
			thicknessMm: l.thicknessMm!,
			r: d / l.lambda!,
			heatCapacity,
			delta,
			xi,
			z: layerMatrix(l.lambda!, delta, xi)
		};
	});
}

/* ------------------------------------------------------------------ result */

export interface DynamicResult {
	source: string;
	/** T, h */
	periodH: number;
	rsi: number;
	rse: number;
	/** RT = Rsi + ΣR + Rse, m²·K/W */
	rTotal: number;
	/** steady-state thermal transmittance U = 1/RT, W/(m²·K) */
	u: number;
	layers: DynamicLayerResult[];
	/** Zs1 (internal) and Zs2 (external) */
	surfaceMatrices: { internal: Matrix2; external: Matrix2 };
	/** Z = Zs2·ZN·…·Z1·Zs1, environment to environment */
	z: Matrix2;
	/** periodic thermal transmittance Y12 = −1/Z12, W/(m²·K); `timeLagH`: the delay of the internal response, h, in [0, T) */
	y12: PeriodicQuantity & { timeLagH: number };
	/** decrement factor f = |Y12|/U */
	decrementFactor: number;
	/** internal thermal admittance Y11 = −Z11/Z12, W/(m²·K) */
	y11: PeriodicQuantity;
	/** external thermal admittance Y22 = −Z22/Z12, W/(m²·K) */
	y22: PeriodicQuantity;
	/** internal areal heat capacity κ1 = (T/2π)·|(Z11 − 1)/Z12|, kJ/(m²·K) */
	kappa1: number;
	/** external areal heat capacity κ2 = (T/2π)·|(Z22 − 1)/Z12|, kJ/(m²·K) */
	kappa2: number;
	/** Σ ρ·c·d of the layers, kJ/(m²·K) (for comparison; not one of the standard's characteristics) */
	heatCapacityTotal: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

/** The element's matrix, environment to environment: Zs2·ZN·…·Z1·Zs1. */
function elementMatrix(layers: DynamicLayerResult[], zs1: Matrix2, zs2: Matrix2): Matrix2 {
	let m = zs1;
	for (const l of layers) m = matMul(l.z, m);
	return matMul(zs2, m);
}

function methodText(periodH: number): string[] {
	return [
		`${DYNAMIC_SOURCE}: one-dimensional conduction through plane homogeneous layers under a sinusoidal variation of period T = ${fmt(periodH)} h (T in seconds in every formula).`,
		'Each layer: periodic penetration depth δ = √(λ·T/(π·ρ·c)), ξ = d/δ, and its heat transfer matrix Z with Z11 = Z22 = cosh ξ·cos ξ + i·sinh ξ·sin ξ, Z12 = −(δ/2λ)·{sinh ξ·cos ξ + cosh ξ·sin ξ + i·(cosh ξ·sin ξ − sinh ξ·cos ξ)}, Z21 = −(λ/δ)·{sinh ξ·cos ξ − cosh ξ·sin ξ + i·(sinh ξ·cos ξ + cosh ξ·sin ξ)}.',
		'Surface resistances and layers without heat capacity (air layers): Z = [[1, −R], [0, 1]].',
		'The element, environment to environment, side 1 internal: Z = Zs2·ZN·…·Z1·Zs1, layer 1 the innermost.',
		'Periodic thermal transmittance Y12 = −1/Z12 and decrement factor f = |Y12|/U; thermal admittances Y11 = −Z11/Z12 and Y22 = −Z22/Z12; time shifts Δt = T·arg(Y)/(2π); areal heat capacities κ1 = (T/2π)·|(Z11 − 1)/Z12| and κ2 = (T/2π)·|(Z22 − 1)/Z12|.'
	];
}

/** Cautions carried by every dynamic result. */
export const DYNAMIC_CAUTIONS: readonly string[] = [
	'Dynamic characteristics by ISO 13786 assume plane, homogeneous layers with constant properties, one-dimensional heat flow and a purely sinusoidal variation of one period. Framed or bridged layers (studs, rafters, fixings), moisture and temperature-dependent properties are not described.',
	'Time shifts are known only to within whole periods: a thick or heavy element can lag by more than half a period, which the principal value shown cannot tell. Judge a long time lag from the build-up, not from this figure alone.',
	'Heat capacities of air layers are neglected; surface resistances are conventional values unless given.',
	CAUTIONS[CAUTIONS.length - 1]
];

function assemble(input: DynamicInput): DynamicResult {
	const periodH = input.periodH ?? DYNAMIC_PERIOD_DEFAULT_H;
	const periodS = periodH * 3600;
	const rsi = input.rsi ?? RSI.horizontal;
	const rse = input.rse ?? RSE;
	const layers = layerResults(input, periodS);
	const rTotal = rsi + rse + layers.reduce((s, l) => s + l.r, 0);
	const surfaceMatrices = { internal: resistanceMatrix(rsi), external: resistanceMatrix(rse) };
	const zm = elementMatrix(layers, surfaceMatrices.internal, surfaceMatrices.external);
	const one = complex(1);
	const minusOne = complex(-1);
	const y12 = periodic(div(minusOne, zm.m12), periodH);
	const lag = (((-y12.timeShiftH % periodH) + periodH) % periodH) % periodH;
	const toKj = periodS / (2 * Math.PI) / 1000;
	return {
		source: DYNAMIC_SOURCE,
		periodH,
		rsi,
		rse,
		rTotal,
		u: 1 / rTotal,
		layers,
		surfaceMatrices,
		z: zm,
		y12: { ...y12, timeLagH: lag },
		decrementFactor: y12.modulus * rTotal,
		y11: periodic(div(sub(complex(0), zm.m11), zm.m12), periodH),
		y22: periodic(div(sub(complex(0), zm.m22), zm.m12), periodH),
		kappa1: toKj * modulus(div(sub(zm.m11, one), zm.m12)),
		kappa2: toKj * modulus(div(sub(zm.m22, one), zm.m12)),
		heatCapacityTotal: layers.reduce((s, l) => s + l.heatCapacity, 0),
		method: methodText(periodH),
		notes: [],
		cautions: [...DYNAMIC_CAUTIONS]
	};
}

function notesFor(input: DynamicInput): string[] {
	const notes: string[] = [];
	if (input.rsi === undefined)
		notes.push(`Rsi not given: ${RSI.horizontal} m²·K/W (ISO 6946:2017, Table 7, horizontal heat flow).`);
	if (input.rse === undefined) notes.push(`Rse not given: ${RSE} m²·K/W (ISO 6946:2017, Table 7).`);
	if (input.periodH === undefined)
		notes.push(`Period not given: ${DYNAMIC_PERIOD_DEFAULT_H} h, the daily cycle.`);
	return notes;
}

/**
 * ISO 13786 dynamic thermal characteristics of a build-up (see the module's comment): Y12 and its
 * time shift, the decrement factor, the admittances Y11 and Y22, the areal heat capacities κ1 and κ2.
 * Raw input is validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseDynamic(raw: unknown): DynamicResult {
	const input = assertParsed(parseDynamicInput(raw));
	const result = assemble(input);
	result.notes = notesFor(input);
	assertFinite(result, 'the ISO 13786 calculation');
	return result;
}
