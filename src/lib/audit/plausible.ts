import { type ElementKind } from '$lib/dwellings/kinds';
import { MATERIAL_CATEGORY_LABELS, type MaterialCategory } from '$lib/library/categories';
import type { Layer } from '$lib/physics';

/**
 * Plausible ranges an auditor checks entered values against. A value outside a range is not wrong by
 * itself (special products exist); it is a reason to look. Each range names where it comes from.
 */
export type Range = { min: number; max: number; source: string };

/** Thermal conductivity λ, W/(m·K), by material category. */
export const PLAUSIBLE_LAMBDA: Partial<Record<MaterialCategory, Range>> = {
	// ISO 10456:2007, Table 3 (from memory): aerated concrete ≈ 0.10–0.25, clay brick ≈ 0.3–1.0,
	// natural stone up to granite 2.8 and marble 3.5.
	masonry: {
		min: 0.08,
		max: 3.5,
		source: 'ISO 10456:2007, Table 3 (from memory): aerated block to dense stone'
	},
	// ISO 10456:2007, Table 3 (from memory): lightweight concrete from ≈ 0.1, reinforced concrete 2.3–2.5.
	concrete: {
		min: 0.1,
		max: 2.5,
		source: 'ISO 10456:2007, Table 3 (from memory): lightweight to reinforced concrete'
	},
	// ISO 10456:2007, Table 3 (from memory): softboard ≈ 0.05, softwood 0.13, hardwood 0.18, plywood to 0.24.
	'timber-boards': {
		min: 0.04,
		max: 0.3,
		source: 'ISO 10456:2007, Table 3 (from memory): fibreboard to dense plywood'
	},
	// Common practice, no source: phenolic/PIR foams ≈ 0.018–0.022 declared, wood fibre and cork ≈ 0.04–0.05,
	// expanded perlite ≈ 0.05–0.06. Vacuum panels and aerogels fall below and deserve a look anyway.
	insulation: {
		min: 0.015,
		max: 0.065,
		source: 'common practice, no source: foams, fibres, wood fibre, cork'
	},
	// ISO 10456:2007, Table 3 (from memory): PVC 0.17, bitumen 0.23, polyethylene 0.33–0.50.
	membranes: {
		min: 0.1,
		max: 0.6,
		source: 'ISO 10456:2007, Table 3 (from memory): sheet plastics, bitumen, rubber'
	},
	// ISO 10456:2007, Table 3 (from memory): gypsum board 0.21–0.25, gypsum plaster 0.4–0.57, lime and
	// cement renders ≈ 0.8–1.0; lightweight plasters from ≈ 0.1.
	'plasters-linings': {
		min: 0.1,
		max: 1.2,
		source: 'ISO 10456:2007, Table 3 (from memory): plasters, boards, renders'
	}
};

/** Total build-up thickness, mm, by element kind (common practice, no source). */
export const PLAUSIBLE_TOTAL_THICKNESS_MM: Partial<Record<ElementKind, Range>> = {
	'external-wall': {
		min: 60,
		max: 1000,
		source: 'common practice, no source: thin panels to thick solid stone walls'
	},
	'party-wall': { min: 60, max: 600, source: 'common practice, no source' },
	'pitched-roof-ceiling': {
		min: 20,
		max: 800,
		source: 'common practice, no source: ceiling board to deep loft insulation'
	},
	'pitched-roof-rafters': { min: 50, max: 600, source: 'common practice, no source' },
	'flat-roof': { min: 50, max: 800, source: 'common practice, no source' },
	'ground-floor': {
		min: 50,
		max: 1200,
		source: 'common practice, no source: suspended timber to slab, insulation and screed'
	},
	'exposed-floor': { min: 50, max: 800, source: 'common practice, no source' }
};

/**
 * The thinnest product of each category, mm: a layer thinner than this is most likely a thickness
 * typed in another unit (m, cm). Common practice, no source. Air layers and "other" have none.
 */
export const SMALLEST_PRODUCT_MM: Partial<Record<MaterialCategory, number>> = {
	masonry: 20, // common practice, no source: brick slips ≈ 20 mm; bricks and blocks far thicker
	concrete: 25, // common practice, no source: thin toppings and screeds ≈ 25 mm
	'timber-boards': 3, // common practice, no source: hardboard ≈ 3 mm
	insulation: 10, // common practice, no source: the thinnest boards ≈ 10 mm (thin blankets under it deserve a look)
	membranes: 0.05, // common practice, no source: foils and sheets ≈ 0.05–0.5 mm (a 1 mm floor would flag most vapour control layers)
	'plasters-linings': 2 // common practice, no source: a skim coat ≈ 2 mm
};

/**
 * What a layer carries from its library material for the engine's plausibility warnings
 * (`Layer['plausible']`): the category's λ range (PLAUSIBLE_LAMBDA, with its source), the material's
 * stated thicknesses and the category's thinnest product (SMALLEST_PRODUCT_MM). Undefined when
 * there is nothing to carry.
 */
export function plausibleForMaterial(m: {
	category: string;
	thicknessMinMm?: number | null;
	thicknessMaxMm?: number | null;
}): Layer['plausible'] {
	const category = m.category as MaterialCategory;
	const lambda = PLAUSIBLE_LAMBDA[category];
	const out: NonNullable<Layer['plausible']> = {};
	const label = MATERIAL_CATEGORY_LABELS[category];
	if (label) out.category = label.toLowerCase();
	if (lambda) {
		out.lambdaMin = lambda.min;
		out.lambdaMax = lambda.max;
		out.lambdaSource = lambda.source;
	}
	if (typeof m.thicknessMinMm === 'number') out.thicknessMinMm = m.thicknessMinMm;
	if (typeof m.thicknessMaxMm === 'number') out.thicknessMaxMm = m.thicknessMaxMm;
	const smallest = SMALLEST_PRODUCT_MM[category];
	if (smallest !== undefined) out.smallestMm = smallest;
	return Object.keys(out).length > (out.category ? 1 : 0) ? out : undefined;
}

/** Largest plausible single insulation layer, mm (common practice, no source). */
export const MAX_INSULATION_LAYER_MM = 600;

/** Given U-values of windows and doors, W/(m²·K) (common practice, no source: triple glazing to single glazing). */
export const PLAUSIBLE_GIVEN_U: Range = { min: 0.4, max: 6.0, source: 'common practice, no source' };

/** |ΔU| beyond which a recomputed U counts as different from the issued one, W/(m²·K). */
export const U_TOLERANCE = 0.005; // common practice, no source: half a unit in the second decimal

export function inRange(value: number, r: Range): boolean {
	return value >= r.min && value <= r.max;
}
