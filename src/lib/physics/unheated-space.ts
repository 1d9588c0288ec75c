/**
 * An unheated space next to a heated one, taken as a thermal resistance Ru of the element between
 * them, ISO 6946:2017, 6.10.3 "other unheated spaces" (numbering as recalled; 5.4.3 in the 2007
 * edition; formula FROM MEMORY):
 *   Ru = Ai/(Σ(Ae,k·Ue,k) + 0.33·n·V)
 * Ai: total area of all elements between the heated space and the unheated space, m²; Ae,k, Ue,k:
 * area and U of element k between the unheated space and the outside; n: air change rate of the
 * unheated space, h⁻¹; V: its air volume, m³; 0.33 Wh/(m³·K) the volumetric heat capacity of air.
 * The air change rate follows ISO 13789: the outside air entering the unheated space per hour over its
 * volume, given, or from the standard's conventional values by airtightness (from memory).
 * Roof spaces above an insulated ceiling take the tabulated Ru of ./ground (ROOF_SPACE_RESISTANCE)
 * instead.
 *
 * With the U of the element between the spaces, Ui, the element's U is 1/(1/Ui + Ru), and
 * ISO 13789's adjustment factor b = Hue/(Hiu + Hue) (Hiu = Ai·Ui, Hue = ΣAe·Ue + 0.33·n·V) gives
 * the same heat loss: Ai·U = b·Hiu.
 */
import { z } from 'zod';
import {
	addTo,
	ALWAYS,
	assertFinite,
	assertParsed,
	atMost,
	checkFields,
	listOf,
	nonNegative,
	num,
	oneOf,
	parseCalculation,
	positive,
	text,
	type Add,
	type Parsed
} from './calc-parse';
import { AIR_HEAT_CAPACITY_WH } from './ground-basement';
import { ROOF_SPACE_SOURCE } from './ground';
import { CAUTIONS } from './cautions';
import { fmt } from './note-format';

export const AIRTIGHTNESS_TYPES = [
	'no-openings-well-sealed',
	'well-sealed',
	'well-sealed-small-openings',
	'some-open-joints',
	'many-open-joints'
] as const;
export type AirtightnessType = (typeof AIRTIGHTNESS_TYPES)[number];

/** Where the conventional air change rates come from, as results cite them. */
export const AIR_CHANGE_SOURCE =
	'ISO 13789:2017, conventional air change rates between unheated spaces and the outside, from memory';

/** Conventional air change rate of an unheated space by its airtightness, h⁻¹ (ISO 13789, from memory). */
export const CONVENTIONAL_AIR_CHANGE: Readonly<Record<AirtightnessType, number>> = {
	'no-openings-well-sealed': 0.1, // ISO 13789 (from memory): no doors, no windows, all joints well sealed, no ventilation openings
	'well-sealed': 0.5, // ISO 13789 (from memory): all joints well sealed, no ventilation openings
	'well-sealed-small-openings': 1, // ISO 13789 (from memory): all joints well sealed, small openings for ventilation
	'some-open-joints': 3, // ISO 13789 (from memory): not airtight, some localised open joints or permanent ventilation openings
	'many-open-joints': 10 // ISO 13789 (from memory): not airtight, numerous open joints or large or numerous permanent ventilation openings
};

export const AIRTIGHTNESS_LABELS: Readonly<Record<AirtightnessType, string>> = {
	'no-openings-well-sealed': 'no doors or windows, all joints well sealed, no ventilation openings',
	'well-sealed': 'all joints well sealed, no ventilation openings',
	'well-sealed-small-openings': 'all joints well sealed, small openings for ventilation',
	'some-open-joints': 'not airtight: some open joints or permanent ventilation openings',
	'many-open-joints': 'not airtight: numerous open joints, or large or numerous ventilation openings'
};

const externalShape = z.object(
	{
		name: text().optional(),
		/** Ae,k, m² */
		areaM2: num(),
		/** Ue,k, W/(m²·K) */
		uValue: num()
	},
	{ error: () => 'must be an object with areaM2 and uValue' }
);

const shape = z.object(
	{
		/** Ai, total area of the elements between the heated and the unheated space, m² */
		internalAreaM2: num(),
		/** the elements between the unheated space and the outside */
		externalElements: listOf(externalShape, 0, 100),
		/** n, h⁻¹; or give airtightness */
		airChangeRate: num().optional(),
		airtightness: oneOf(AIRTIGHTNESS_TYPES).optional(),
		/** V, air volume of the unheated space, m³ */
		volumeM3: num(),
		/** Ui, U of the element between the spaces without the unheated space, W/(m²·K) (optional) */
		elementU: num().optional()
	},
	{ error: () => 'must be an object with internalAreaM2, externalElements and volumeM3' }
);
export type UnheatedSpaceInput = z.infer<typeof shape>;

const RULES = {
	internalAreaM2: [positive('m²'), atMost(1e6, '1 000 000 m²')],
	airChangeRate: [nonNegative('h⁻¹'), atMost(100, '100 h⁻¹')],
	volumeM3: [nonNegative('m³'), atMost(1e7, '10 000 000 m³')],
	elementU: [positive('W/(m²·K)'), atMost(10, '10 W/(m²·K)')]
};
const ELEMENT_RULES = {
	areaM2: [nonNegative('m²'), atMost(1e6, '1 000 000 m²')],
	uValue: [nonNegative('W/(m²·K)'), atMost(10, '10 W/(m²·K)')]
};

function checkSpace(s: Record<string, unknown>, add: Add): void {
	checkFields(s, RULES, [], add);
	if (Array.isArray(s.externalElements))
		s.externalElements.forEach((e, i) => checkFields(e, ELEMENT_RULES, ['externalElements', i], add));
	if (s.airChangeRate !== undefined && s.airtightness !== undefined)
		add(
			['airtightness'],
			'must not be given with airChangeRate: give the rate or the airtightness, not both'
		);
	else if (s.airChangeRate === undefined && s.airtightness === undefined)
		add(['airChangeRate'], 'must be given (h⁻¹), or the airtightness for the conventional value');
}

export const unheatedSpaceSchema = shape.superRefine((s, ctx) => {
	if (typeof s === 'object' && s !== null) checkSpace(s as Record<string, unknown>, addTo(ctx));
}, ALWAYS);

const LABELS = {
	lists: { externalElements: 'External element' },
	fields: {
		internalAreaM2: 'area Ai between the heated and the unheated space',
		externalElements: 'external elements',
		areaM2: 'area Ae',
		uValue: 'U-value Ue',
		airChangeRate: 'air change rate n',
		airtightness: 'airtightness',
		volumeM3: 'air volume V',
		elementU: 'U-value Ui of the element between the spaces'
	}
};

/** Validate a raw unheated-space input without throwing: field-named issues, or the data. */
export function parseUnheatedSpaceInput(raw: unknown): Parsed<UnheatedSpaceInput> {
	return parseCalculation(unheatedSpaceSchema, raw, LABELS, (s, add) => {
		const n = s.airChangeRate ?? CONVENTIONAL_AIR_CHANGE[s.airtightness!];
		const loss =
			s.externalElements.reduce((sum, e) => sum + e.areaM2 * e.uValue, 0) +
			AIR_HEAT_CAPACITY_WH * n * s.volumeM3;
		if (loss <= 0)
			add(
				['externalElements'],
				'and the ventilation lose no heat to the outside (ΣAe·Ue + 0.33·n·V = 0): the unheated space would be at the inside temperature; give its external elements or its ventilation'
			);
	});
}

export interface UnheatedSpaceResult {
	internalAreaM2: number;
	/** ΣAe,k·Ue,k, W/K */
	transmissionCoefficient: number;
	/** n used, h⁻¹, and where it comes from */
	airChangeRate: number;
	airChangeSource: string;
	/** 0.33·n·V, W/K */
	ventilationCoefficient: number;
	/** Hue = ΣAe·Ue + 0.33·n·V, W/K */
	heatLossToOutside: number;
	/** Ru, m²·K/W */
	ru: number;
	/** with elementU: U = 1/(1/Ui + Ru), W/(m²·K); Hiu = Ai·Ui, W/K; b = Hue/(Hiu + Hue) */
	elementU?: number;
	u?: number;
	heatTransferInternal?: number;
	adjustmentFactor?: number;
	method: string[];
	notes: string[];
	cautions: string[];
}

/** Cautions carried by every unheated-space result. */
export const UNHEATED_SPACE_CAUTIONS: readonly string[] = [
	'The unheated space is taken as one well-mixed zone at a steady temperature, heated only through the elements between it and the heated space: solar gains, internal gains and heat stored in it are ignored, and the air change rate is a convention unless measured.',
	`A roof space above an insulated ceiling takes the tabulated resistance instead (${ROOF_SPACE_SOURCE}).`,
	CAUTIONS[CAUTIONS.length - 1]
];

function withElement(r: UnheatedSpaceResult, ui: number): void {
	const hiu = r.internalAreaM2 * ui;
	r.elementU = ui;
	r.u = 1 / (1 / ui + r.ru);
	r.heatTransferInternal = hiu;
	r.adjustmentFactor = r.heatLossToOutside / (hiu + r.heatLossToOutside);
	r.method.push(
		'With the element’s own U-value Ui: U = 1/(1/Ui + Ru); the same heat loss as ISO 13789’s Hiu·b, Hiu = Ai·Ui, b = Hue/(Hiu + Hue).'
	);
}

/**
 * Ru of an unheated space by ISO 6946 (see the module's comment), m²·K/W, and with `elementU` the
 * U of the element between the spaces. Raw input is validated; throws `CalculationInputError`.
 */
export function analyseUnheatedSpace(raw: unknown): UnheatedSpaceResult {
	const s = assertParsed(parseUnheatedSpaceInput(raw));
	const n = s.airChangeRate ?? CONVENTIONAL_AIR_CHANGE[s.airtightness!];
	const transmission = s.externalElements.reduce((sum, e) => sum + e.areaM2 * e.uValue, 0);
	const ventilation = AIR_HEAT_CAPACITY_WH * n * s.volumeM3;
	const hue = transmission + ventilation;
	const result: UnheatedSpaceResult = {
		internalAreaM2: s.internalAreaM2,
		transmissionCoefficient: transmission,
		airChangeRate: n,
		airChangeSource: s.airtightness
			? `${AIR_CHANGE_SOURCE}: ${AIRTIGHTNESS_LABELS[s.airtightness]}`
			: 'given',
		ventilationCoefficient: ventilation,
		heatLossToOutside: hue,
		ru: s.internalAreaM2 / hue,
		method: [
			`ISO 6946:2017, 6.10.3, other unheated spaces (numbering and formula from memory): Ru = Ai/(Σ(Ae,k·Ue,k) + ${AIR_HEAT_CAPACITY_WH}·n·V), n in h⁻¹ and V in m³ (ISO 13789's air change of the unheated space with the outside).`
		],
		notes: s.airtightness
			? [
					`n = ${fmt(n, 2)} h⁻¹, conventional for ${AIRTIGHTNESS_LABELS[s.airtightness]} (${AIR_CHANGE_SOURCE}).`
				]
			: [],
		cautions: [...UNHEATED_SPACE_CAUTIONS]
	};
	if (s.elementU !== undefined) withElement(result, s.elementU);
	assertFinite(result, 'the unheated-space calculation');
	return result;
}
