/**
 * Thermal transmittance of a window or a pedestrian door from its parts, ISO 10077-1 (the
 * area-weighted method): Uw = (ΣAg·Ug + ΣAp·Up + ΣAf·Uf + Σlg·ψg + Σlp·ψp)/(ΣAg + ΣAp + ΣAf), UD
 * the same for a door, with the standard's default values for frames (Uf by material) and glazing
 * edges (ψg by spacer, frame and glazing) where no product value is known.
 * The formula and the table values are given FROM MEMORY (not checked against a copy of the
 * standard); a value not recalled with confidence is left out rather than guessed, and the input
 * must then give it.
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
	type Labels,
	type Parsed
} from './calc-parse';
import { CAUTIONS } from './cautions';
import { fmt } from './note-format';

/* ------------------------------------------------------------------ tables */

export const FRAME_MATERIALS = [
	'timber',
	'pvc-two-chambers',
	'pvc-three-chambers',
	'polyurethane-metal-core',
	'metal-thermal-break',
	'metal-no-thermal-break'
] as const;
export type FrameMaterial = (typeof FRAME_MATERIALS)[number];

export const FRAME_MATERIAL_LABELS: Readonly<Record<FrameMaterial, string>> = {
	timber: 'timber',
	'pvc-two-chambers': 'PVC hollow profile with two chambers',
	'pvc-three-chambers': 'PVC hollow profile with three chambers',
	'polyurethane-metal-core': 'polyurethane with a metal core (at least 5 mm of polyurethane)',
	'metal-thermal-break': 'metal with a thermal break',
	'metal-no-thermal-break': 'metal without a thermal break'
};

/** Where the frame values come from, as results cite them. */
export const FRAME_U_SOURCE =
	'ISO 10077-1:2006, Annex D, default thermal transmittances of frames, from memory; an informative annex of the 2017 edition';

/**
 * Default thermal transmittance Uf of frames, W/(m²·K), for the materials the standard tabulates
 * as one number (from memory). Timber frames and metal frames with a thermal break are read from
 * curves (by frame thickness, and by the distance between the metal sections): not recalled
 * reliably, so left out; their Uf must be given.
 */
export const FRAME_U_DEFAULT: Readonly<Partial<Record<FrameMaterial, number>>> = {
	'pvc-two-chambers': 2.2, // ISO 10077-1:2006, Annex D, plastic frames (from memory): PVC hollow profiles, two chambers
	'pvc-three-chambers': 2.0, // ISO 10077-1:2006, Annex D, plastic frames (from memory): PVC hollow profiles, three chambers
	'polyurethane-metal-core': 2.8, // ISO 10077-1:2006, Annex D, plastic frames (from memory): polyurethane with metal core, PUR ≥ 5 mm
	'metal-no-thermal-break': 5.9 // ISO 10077-1:2006, Annex D, metal frames (from memory): Uf0 without thermal break, before the developed-area correction
};

export const SPACERS = ['conventional', 'improved'] as const;
export type Spacer = (typeof SPACERS)[number];

export const SPACER_LABELS: Readonly<Record<Spacer, string>> = {
	conventional: 'aluminium or steel spacer',
	improved: 'spacer of improved thermal performance (Σ d·λ ≤ 0.007 W/K, from memory)'
};

export const GLAZING_TYPES = ['single', 'uncoated', 'low-e'] as const;
export type GlazingType = (typeof GLAZING_TYPES)[number];

export const GLAZING_TYPE_LABELS: Readonly<Record<GlazingType, string>> = {
	single: 'single glazing (no spacer)',
	uncoated: 'double or triple glazing, uncoated glass, air or gas filled',
	'low-e': 'double glazing with a low-emissivity coating, or triple glazing with two, air or gas filled'
};

/** The rows of the glazing-edge tables: the frame's kind. */
export type EdgeFrame = 'timber-or-pvc' | 'metal-thermal-break' | 'metal-no-thermal-break';

/** The row of the ψg tables each frame material takes (none for polyurethane: not a row of them). */
export const EDGE_FRAME: Readonly<Record<FrameMaterial, EdgeFrame | null>> = {
	timber: 'timber-or-pvc',
	'pvc-two-chambers': 'timber-or-pvc',
	'pvc-three-chambers': 'timber-or-pvc',
	'polyurethane-metal-core': null,
	'metal-thermal-break': 'metal-thermal-break',
	'metal-no-thermal-break': 'metal-no-thermal-break'
};

/** Where the glazing-edge values come from, by spacer, as results cite them. */
export const PSI_SOURCE: Readonly<Record<Spacer, string>> = {
	conventional:
		'ISO 10077-1:2006, Table E.1, linear thermal transmittance for aluminium and steel spacers, from memory',
	improved:
		'ISO 10077-1:2006, Table E.2, linear thermal transmittance for spacers of improved thermal performance, from memory'
};

/**
 * Default linear thermal transmittance ψg of the glazing edge, W/(m·K), by spacer, frame row and
 * glazing column (uncoated; low-e). ISO 10077-1:2006, Tables E.1 and E.2 (from memory).
 */
export const PSI_DEFAULT: Readonly<
	Record<Spacer, Readonly<Record<EdgeFrame, { uncoated: number; 'low-e': number }>>>
> = {
	conventional: {
		'timber-or-pvc': { uncoated: 0.06, 'low-e': 0.08 }, // ISO 10077-1:2006, Table E.1 (from memory): wood or PVC frame
		'metal-thermal-break': { uncoated: 0.08, 'low-e': 0.11 }, // ISO 10077-1:2006, Table E.1 (from memory)
		'metal-no-thermal-break': { uncoated: 0.02, 'low-e': 0.05 } // ISO 10077-1:2006, Table E.1 (from memory)
	},
	improved: {
		'timber-or-pvc': { uncoated: 0.05, 'low-e': 0.06 }, // ISO 10077-1:2006, Table E.2 (from memory): wood or PVC frame
		'metal-thermal-break': { uncoated: 0.06, 'low-e': 0.08 }, // ISO 10077-1:2006, Table E.2 (from memory)
		'metal-no-thermal-break': { uncoated: 0.01, 'low-e': 0.04 } // ISO 10077-1:2006, Table E.2 (from memory)
	}
};

/** ψg of single glazing, W/(m·K): there is no spacer (ISO 10077-1, from memory). */
export const PSI_SINGLE_GLAZING = 0; // ISO 10077-1:2006, clause on the glazing's linear thermal transmittance (from memory)

/* ------------------------------------------------------------------ input */

const glazingShape = z.object(
	{
		name: text().optional(),
		/** Ag, visible glazing area, m² */
		areaM2: num(),
		/** Ug, centre-of-glazing thermal transmittance, W/(m²·K) */
		uValue: num(),
		/** lg, visible perimeter of the glazing, m */
		perimeterM: num(),
		/** ψg, W/(m·K); default from the tables with frameMaterial, spacer and glazingType */
		psi: num().optional(),
		spacer: oneOf(SPACERS).optional(),
		glazingType: oneOf(GLAZING_TYPES).optional()
	},
	{ error: () => 'must be an object with areaM2, uValue and perimeterM' }
);

const frameShape = z.object(
	{
		name: text().optional(),
		/** Af, projected frame area, m² (the larger of the two sides) */
		areaM2: num(),
		/** Uf, W/(m²·K); default from the table with frameMaterial */
		uValue: num().optional()
	},
	{ error: () => 'must be an object with areaM2 (and uValue)' }
);

const panelShape = z.object(
	{
		name: text().optional(),
		/** Ap, visible panel area, m² */
		areaM2: num(),
		/** Up, W/(m²·K) */
		uValue: num(),
		/** lp, visible perimeter of the panel, m */
		perimeterM: num(),
		/** ψp, W/(m·K) */
		psi: num()
	},
	{ error: () => 'must be an object with areaM2, uValue, perimeterM and psi' }
);

const PART_MAX = 50; // this product's bound, no source: far beyond the panes of any window or door

const shape = z.object(
	{
		/** window (Uw) or pedestrian door (UD) */
		kind: oneOf(['window', 'door'] as const).optional(),
		frameMaterial: oneOf(FRAME_MATERIALS).optional(),
		glazings: listOf(glazingShape, 0, PART_MAX),
		frames: listOf(frameShape, 1, PART_MAX),
		panels: listOf(panelShape, 0, PART_MAX).optional()
	},
	{ error: () => 'must be an object with glazings and frames' }
);

const AREA = [positive('m²'), atMost(1000, '1000 m²')];
const U = [
	nonNegative('W/(m²·K)'),
	atMost(10, '10 W/(m²·K)', 'above single glazing (about 5.8) and bare metal (about 5.9)')
];
const LENGTH = [nonNegative('m'), atMost(10000, '10 000 m')];
const PSI = [nonNegative('W/(m·K)'), atMost(1, '1 W/(m·K)')];
const PART_RULES = { areaM2: AREA, uValue: U, perimeterM: LENGTH, psi: PSI };

export type WindowInput = z.infer<typeof shape>;
export type GlazingInput = z.infer<typeof glazingShape>;
export type FrameInput = z.infer<typeof frameShape>;
export type PanelInput = z.infer<typeof panelShape>;

/** ψg from the tables for a glazing, or the reason there is none. */
export function tabulatedPsi(
	frameMaterial: FrameMaterial | undefined,
	spacer: Spacer | undefined,
	glazingType: GlazingType | undefined
): { psi: number; source: string } | { reason: string } {
	if (glazingType === 'single')
		return {
			psi: PSI_SINGLE_GLAZING,
			source: 'single glazing has no spacer: ψg = 0 (ISO 10077-1, from memory)'
		};
	if (!glazingType)
		return { reason: 'give ψg, or glazingType (with spacer and frameMaterial) for the table value' };
	if (!spacer) return { reason: 'give ψg, or the spacer (with frameMaterial) for the table value' };
	if (!frameMaterial) return { reason: 'give ψg, or the frameMaterial (with spacer) for the table value' };
	const row = EDGE_FRAME[frameMaterial];
	if (!row)
		return {
			reason: `give ψg: the tables have no row for frames of ${FRAME_MATERIAL_LABELS[frameMaterial]}`
		};
	return { psi: PSI_DEFAULT[spacer][row][glazingType], source: PSI_SOURCE[spacer] };
}

function checkParts(input: WindowInput, add: Add): void {
	const lists = [
		['glazings', input.glazings],
		['frames', input.frames],
		['panels', input.panels]
	] as const;
	for (const [key, list] of lists)
		if (Array.isArray(list)) list.forEach((p, i) => checkFields(p, PART_RULES, [key, i], add));
	if (Array.isArray(input.frames))
		input.frames.forEach((f, i) => {
			if (typeof f !== 'object' || f === null || f.uValue !== undefined) return;
			const m = input.frameMaterial;
			if (!m) add(['frames', i, 'uValue'], 'must be given, or the frameMaterial for the table value');
			else if (FRAME_U_DEFAULT[m] === undefined)
				add(
					['frames', i, 'uValue'],
					`must be given: the table has no single value for frames of ${FRAME_MATERIAL_LABELS[m]} (it depends on the profile)`
				);
		});
	if (Array.isArray(input.glazings))
		input.glazings.forEach((g, i) => {
			if (typeof g !== 'object' || g === null || g.psi !== undefined) return;
			const t = tabulatedPsi(input.frameMaterial, g.spacer, g.glazingType);
			if ('reason' in t) add(['glazings', i, 'psi'], `is missing: ${t.reason}`);
		});
}

export const windowInputSchema = shape.superRefine((input, ctx) => {
	if (typeof input === 'object' && input !== null) checkParts(input, addTo(ctx));
}, ALWAYS);

const LABELS: Labels = {
	lists: { glazings: 'Glazing', frames: 'Frame', panels: 'Panel' },
	fields: {
		areaM2: 'area',
		uValue: 'U-value',
		perimeterM: 'visible perimeter',
		psi: 'ψ',
		spacer: 'spacer',
		glazingType: 'glazing type',
		kind: 'kind',
		frameMaterial: 'frame material',
		glazings: 'glazings',
		frames: 'frames',
		panels: 'panels'
	}
};

/** Validate a raw window or door input without throwing: field-named issues, or the data. */
export function parseWindowInput(raw: unknown): Parsed<WindowInput> {
	return parseCalculation(windowInputSchema, raw, LABELS);
}

/* ------------------------------------------------------------------ result */

export interface WindowPart {
	index: number;
	name: string;
	areaM2: number;
	uValue: number;
	/** where U comes from: "given" or the table */
	uSource: string;
}
export interface WindowEdgePart extends WindowPart {
	perimeterM: number;
	psi: number;
	/** where ψ comes from: "given" or the table */
	psiSource: string;
}

export interface WindowResult {
	/** Uw for a window, UD for a door */
	symbol: 'Uw' | 'UD';
	/** thermal transmittance of the whole window or door, W/(m²·K) */
	uValue: number;
	/** Aw (or AD) = ΣAg + ΣAp + ΣAf, m² */
	areaM2: number;
	glazingAreaM2: number;
	frameAreaM2: number;
	panelAreaM2: number;
	/** the terms of the numerator, W/K */
	terms: { glazing: number; frames: number; panels: number; glazingEdges: number; panelEdges: number };
	glazings: WindowEdgePart[];
	frames: WindowPart[];
	panels: WindowEdgePart[];
	method: string[];
	notes: string[];
	cautions: string[];
}

const sum = (xs: readonly number[]) => xs.reduce((s, x) => s + x, 0);

function glazingParts(input: WindowInput): WindowEdgePart[] {
	return input.glazings.map((g, index) => {
		const t = g.psi === undefined ? tabulatedPsi(input.frameMaterial, g.spacer, g.glazingType) : null;
		const fromTable = t && 'psi' in t ? t : null;
		return {
			index,
			name: g.name ?? `Glazing ${index + 1}`,
			areaM2: g.areaM2,
			uValue: g.uValue,
			uSource: 'given',
			perimeterM: g.perimeterM,
			psi: g.psi ?? fromTable!.psi,
			psiSource: fromTable ? fromTable.source : 'given'
		};
	});
}

function frameParts(input: WindowInput): WindowPart[] {
	return input.frames.map((f, index) => ({
		index,
		name: f.name ?? `Frame ${index + 1}`,
		areaM2: f.areaM2,
		uValue: f.uValue ?? FRAME_U_DEFAULT[input.frameMaterial!]!,
		uSource:
			f.uValue === undefined ? `${FRAME_U_SOURCE}: ${FRAME_MATERIAL_LABELS[input.frameMaterial!]}` : 'given'
	}));
}

function panelParts(input: WindowInput): WindowEdgePart[] {
	return (input.panels ?? []).map((p, index) => ({
		index,
		name: p.name ?? `Panel ${index + 1}`,
		areaM2: p.areaM2,
		uValue: p.uValue,
		uSource: 'given',
		perimeterM: p.perimeterM,
		psi: p.psi,
		psiSource: 'given'
	}));
}

function methodText(symbol: 'Uw' | 'UD'): string[] {
	return [
		`ISO 10077-1 (from memory): ${symbol} = (ΣAg·Ug + ΣAp·Up + ΣAf·Uf + Σlg·ψg + Σlp·ψp)/(ΣAg + ΣAp + ΣAf), the area-weighted thermal transmittances of the glazing, the opaque panels and the frame, with the linear thermal transmittances of the glazing and panel edges along their visible perimeters.`,
		'As the standard measures them (as recalled): Ag and Ap the visible areas (the smaller of the two sides), Af the projected frame area (the larger of the two sides), lg and lp the visible perimeters (the larger of the two sides).',
		'Where a value is taken from the standard’s tables it is named beside the part; product values (ISO 10077-2 calculation, hot-box measurement, EN 673 for the glazing) take precedence over them.'
	];
}

/** Cautions carried by every window and door result. */
export const WINDOW_CAUTIONS: readonly string[] = [
	'The thermal transmittance of a window or door by ISO 10077-1 excludes the junction with the wall (its installation ψ), solar gains, air leakage and the effect of shutters or blinds; it is a steady-state value for the size given.',
	'Default table values describe typical products and may be far from a particular one; use declared product values where they exist.',
	CAUTIONS[CAUTIONS.length - 1]
];

function notesFor(input: WindowInput, frames: WindowPart[], glazings: WindowEdgePart[]): string[] {
	const notes: string[] = [];
	const tabulatedFrames = frames.filter((f) => f.uSource !== 'given').length;
	if (tabulatedFrames)
		notes.push(
			`Uf of ${tabulatedFrames} frame part(s) from the table, frames of ${FRAME_MATERIAL_LABELS[input.frameMaterial!]}: ${fmt(frames.find((f) => f.uSource !== 'given')!.uValue, 2)} W/(m²·K).`
		);
	if (input.frameMaterial === 'metal-no-thermal-break' && tabulatedFrames)
		notes.push(
			'For metal frames without a thermal break the table gives Uf0; the standard corrects it for the ratio of projected to developed frame areas, which raises Uf. That correction is not applied here: give Uf where the developed areas are known.'
		);
	const tabulatedEdges = glazings.filter((g) => g.psiSource !== 'given').length;
	if (tabulatedEdges)
		notes.push(`ψg of ${tabulatedEdges} glazing edge(s) from the tables (named beside each glazing).`);
	return notes;
}

/**
 * Uw (or UD) of a window (or door) from its parts by ISO 10077-1 (see the module's comment), W/(m²·K).
 * Raw input is validated; throws `CalculationInputError` naming every bad field.
 */
export function analyseWindow(raw: unknown): WindowResult {
	const input = assertParsed(parseWindowInput(raw));
	const symbol = input.kind === 'door' ? 'UD' : 'Uw';
	const [glazings, frames, panels] = [glazingParts(input), frameParts(input), panelParts(input)];
	const terms = {
		glazing: sum(glazings.map((g) => g.areaM2 * g.uValue)),
		frames: sum(frames.map((f) => f.areaM2 * f.uValue)),
		panels: sum(panels.map((p) => p.areaM2 * p.uValue)),
		glazingEdges: sum(glazings.map((g) => g.perimeterM * g.psi)),
		panelEdges: sum(panels.map((p) => p.perimeterM * p.psi))
	};
	const [glazingAreaM2, frameAreaM2, panelAreaM2] = [glazings, frames, panels].map((l) =>
		sum(l.map((p) => p.areaM2))
	);
	const areaM2 = glazingAreaM2 + frameAreaM2 + panelAreaM2;
	const result: WindowResult = {
		symbol,
		uValue: (terms.glazing + terms.frames + terms.panels + terms.glazingEdges + terms.panelEdges) / areaM2,
		areaM2,
		glazingAreaM2,
		frameAreaM2,
		panelAreaM2,
		terms,
		glazings,
		frames,
		panels,
		method: methodText(symbol),
		notes: notesFor(input, frames, glazings),
		cautions: [...WINDOW_CAUTIONS]
	};
	assertFinite(result, 'the ISO 10077-1 calculation');
	return result;
}
