/**
 * What is usual for each category. A value outside these ranges is not refused (a product may really
 * be unusual) but is a warning a person must confirm before it lands in the library.
 */
import { type MaterialCategory } from '$lib/library/categories';
import type { MaterialValues } from './schema';

type Range = readonly [min: number, max: number];

export type PlausibleRanges = { lambda?: Range; resistance?: Range; density?: Range };

// Ranges span the design values of ISO 10456:2007 Table 3 and the ISO 6946:2017 air-layer table for
// each group, with some room either side (from memory; common practice, no source for the margins).
export const PLAUSIBLE: Record<MaterialCategory, PlausibleRanges> = {
	masonry: { lambda: [0.07, 3.5], density: [300, 3000] }, // aerated blocks ~0.09 … granite, marble 2.8–3.5
	concrete: { lambda: [0.1, 2.5], density: [300, 2600] }, // lightweight ~0.1 … reinforced 2 % steel 2.5
	'timber-boards': { lambda: [0.035, 0.3], density: [100, 1200] }, // soft fibreboard ~0.04 … hardwood 0.18, plywood 0.24
	insulation: { lambda: [0.015, 0.08], density: [5, 300] }, // PIR ~0.022 … cork, wood-fibre ~0.05
	membranes: { lambda: [0.1, 0.5], resistance: [0, 0.1], density: [50, 1600] }, // PE 0.33, bitumen 0.23
	'plasters-linings': { lambda: [0.08, 1.5], density: [400, 2200] }, // gypsum board 0.25 … cement render 1.0
	'air-layers': { resistance: [0, 0.25] }, // unventilated air layers, ISO 6946:2017 Table 8: at most ~0.23
	other: { lambda: [0.01, 400], density: [1, 9000] } // aerogel ~0.015 … copper 380
};

const SPECIFIC_HEAT: Range = [100, 2600]; // steel ~450 … timber 1600, water-rich materials up to ~2500 (ISO 10456 Table 3, from memory)
const MU_MAX_USUAL = 100_000; // above this a membrane is better described by its sd-value (common practice, no source)
const SD_MAX_USUAL = 1500; // strong vapour barriers are given as sd ≈ 1500 m (common practice, no source)

export type Warning = { field: string; message: string };

const fmt = (n: number) => String(+n.toPrecision(6));

/** Warnings for values that are physically possible but unusual for the category. */
export function plausibilityWarnings(
	m: MaterialValues,
	today: string = new Date().toISOString().slice(0, 10)
): Warning[] {
	const out: Warning[] = [];
	const r = PLAUSIBLE[m.category];
	const check = (field: 'lambda' | 'resistance' | 'density', v: number | null | undefined, unit: string) => {
		const range = r[field];
		if (v === null || v === undefined || !range) return;
		if (v < range[0] || v > range[1]) {
			out.push({
				field,
				message: `${fmt(v)} ${unit} is outside the usual ${fmt(range[0])}–${fmt(range[1])} for ${m.category}; confirm it is right`
			});
		}
	};
	check('lambda', m.lambda, 'W/(m·K)');
	check('resistance', m.resistance, 'm²·K/W');
	check('density', m.density, 'kg/m³');
	if (m.specificHeat != null && (m.specificHeat < SPECIFIC_HEAT[0] || m.specificHeat > SPECIFIC_HEAT[1])) {
		out.push({
			field: 'specificHeat',
			message: `${fmt(m.specificHeat)} J/(kg·K) is outside the usual ${SPECIFIC_HEAT[0]}–${SPECIFIC_HEAT[1]}; confirm it is right`
		});
	}
	if (m.muDry != null && m.muDry > MU_MAX_USUAL) {
		out.push({
			field: 'muDry',
			message: `μ ${fmt(m.muDry)} is unusually high; a membrane is better given by its sd-value`
		});
	}
	if (m.muDry != null && m.muWet != null && m.muWet > m.muDry) {
		out.push({
			field: 'muWet',
			message: `μ wet (${fmt(m.muWet)}) is above μ dry (${fmt(m.muDry)}); usually it is lower or equal`
		});
	}
	if (m.sd != null && m.sd > SD_MAX_USUAL) {
		out.push({
			field: 'sd',
			message: `sd ${fmt(m.sd)} m is above the usual ${SD_MAX_USUAL} m for a vapour barrier`
		});
	}
	if (m.category !== 'air-layers' && m.category !== 'membranes' && m.lambda == null && m.resistance != null) {
		out.push({
			field: 'resistance',
			message: 'a fixed resistance for a solid material ignores its thickness; give λ if you can'
		});
	}
	if (m.sourceExpires && m.sourceExpires < today) {
		out.push({ field: 'sourceExpires', message: `the source document expired on ${m.sourceExpires}` });
	}
	if (!m.source) out.push({ field: 'source', message: 'no source is named, so the values cannot be traced' });
	return out;
}
