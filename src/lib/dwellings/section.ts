/**
 * The section drawing of a build-up: what to draw, in millimetres and degrees, shared by the element
 * page (an SVG component, redrawn as the build-up is typed) and the PDF report (an SVG string). Pure: no
 * pixels here beyond the drawing's own proportions, no DOM.
 *
 * The drawing is a horizontal cut through the element, inside on the left: each layer a band as wide as
 * it is thick (to scale), filled by what it is made of; bridging members (studs, joists, rafters) drawn
 * across their layer at their spacing; over it the temperature through the build-up and the dew point
 * of the same month, and a mark where condensation forms that month.
 */
import { saturationTemperature, type ElementInput, type ElementResult } from '$lib/physics';

/** The fills of the drawing, one per kind of material. */
export const SECTION_FILLS = [
	'masonry',
	'concrete',
	'timber',
	'insulation',
	'membrane',
	'lining',
	'air',
	'resistance',
	'other'
] as const;
export type SectionFill = (typeof SECTION_FILLS)[number];

export const SECTION_FILL_LABELS: Readonly<Record<SectionFill, string>> = {
	masonry: 'masonry',
	concrete: 'concrete',
	timber: 'timber and boards',
	insulation: 'insulation',
	membrane: 'membrane',
	lining: 'plaster or lining',
	air: 'air layer',
	resistance: 'given resistance',
	other: 'other'
};

/** The library's category labels (lower case, as a picked layer carries them) to fills. */
const CATEGORY_FILL: Readonly<Record<string, SectionFill>> = {
	masonry: 'masonry',
	concrete: 'concrete',
	'timber and boards': 'timber',
	insulation: 'insulation',
	membranes: 'membrane',
	'plasters and linings': 'lining',
	'air layers': 'air',
	other: 'other'
};

/**
 * What a layer is drawn as: its library category when it was picked from the library, else what its
 * name and values suggest (common practice, no source: the usual words and λ of each kind).
 */
export function sectionFill(layer: ElementInput['layers'][number]): SectionFill {
	if (layer.air) return 'air';
	const category = layer.plausible?.category?.toLowerCase();
	if (category && CATEGORY_FILL[category]) return CATEGORY_FILL[category];
	const name = layer.name.toLowerCase();
	if (/\b(air|cavity|void|gap)\b/.test(name) && layer.lambda === undefined) return 'air';
	if (/membrane|vcl|vapour|breather|foil|polythene|dpm|dpc|felt|bitumen|sheet/.test(name)) return 'membrane';
	if (/wool|insulat|pir|pur|eps|xps|foam|phenolic|fibre ?board|cellulose|quilt|batt/.test(name))
		return 'insulation';
	if (/brick|block|stone|masonry/.test(name)) return 'masonry';
	if (/concrete|screed|slab/.test(name)) return 'concrete';
	if (/plaster|render|gypsum|lining|skim/.test(name)) return 'lining';
	if (/timber|wood|osb|ply|stud|joist|rafter|board|chipboard|deck/.test(name)) return 'timber';
	if (layer.lambda === undefined) return layer.resistance !== undefined ? 'resistance' : 'other';
	if (layer.thicknessMm <= 2) return 'membrane';
	if (layer.lambda <= 0.07) return 'insulation';
	return 'other';
}

/** One layer's band: from `startMm` to `endMm` from the inside surface. */
export type SectionBand = {
	index: number;
	name: string;
	thicknessMm: number;
	startMm: number;
	endMm: number;
	fill: SectionFill;
	/** left out of the calculation (outside a well-ventilated air layer) */
	disregarded: boolean;
	/** drawn wider than to scale so that it can be seen (a membrane of a fraction of a millimetre) */
	thin: boolean;
};

/** A bridging member across a layer: along the layer from `alongMm` for `widthMm`. */
export type SectionMember = {
	layerIndex: number;
	name: string;
	fill: SectionFill;
	alongMm: number;
	widthMm: number;
};

export type SectionLine = { positionMm: number; temperature: number }[];

export type SectionDrawing = {
	/** the build-up's total thickness, mm */
	totalMm: number;
	bands: SectionBand[];
	/** the length of element the drawing's height stands for, mm (the members' spacing shows in it) */
	heightMm: number;
	members: SectionMember[];
	/** the month the lines are drawn for (1–12), or null for the design temperatures */
	month: number | null;
	temperature: SectionLine;
	/** the dew point of the vapour pressure through the build-up in that month; empty without a climate */
	dewPoint: SectionLine;
	/** where condensation forms in that month: positions from the inside surface, mm */
	condensationMm: number[];
	insideTemperature: number;
	outsideTemperature: number;
};

/** Narrowest band drawn, as a share of the drawing's width (a 0.2 mm foil would not show to scale). */
export const MIN_BAND_SHARE = 0.012; // this product's choice, no source
/** Spacing assumed for drawing members given only by their fraction, mm (common practice, no source: 600 mm centres). */
export const DEFAULT_CENTRES_MM = 600;
/** How many spacings of the widest-spaced members the drawing's height shows. */
const SPACINGS_SHOWN = 2.5;
/** The drawing's height when nothing is bridged, mm of element. */
const PLAIN_HEIGHT_MM = 600;

/**
 * Everything the drawing shows, from the element's input and its result (the same result as the page's
 * figures). Bands follow the result's layer positions; a band narrower than MIN_BAND_SHARE of the whole is
 * marked `thin` (the drawing widens it and says so).
 */
export function sectionDrawing(input: ElementInput, result: ElementResult): SectionDrawing {
	const totalMm = result.layers.length ? result.layers[result.layers.length - 1].positionEndMm : 0;
	const bands: SectionBand[] = result.layers.map((l) => ({
		index: l.index,
		name: l.name,
		thicknessMm: l.thicknessMm,
		startMm: l.positionStartMm,
		endMm: l.positionEndMm,
		fill: input.layers[l.index] ? sectionFill(input.layers[l.index]) : 'other',
		disregarded: l.disregarded,
		thin: totalMm > 0 && l.thicknessMm / totalMm < MIN_BAND_SHARE
	}));

	// Members at their spacing: each bridged layer's width and centres (or its fraction of 600 mm).
	const bridged = input.layers
		.map((l, i) => ({ l, i }))
		.filter(({ l }) => l.bridge)
		.map(({ l, i }) => {
			const b = l.bridge!;
			const centres = b.centresMm ?? DEFAULT_CENTRES_MM;
			const width = b.widthMm ?? (b.fraction ?? 0) * centres;
			return { i, centres, width, name: b.name ?? 'bridging member', lambda: b.lambda };
		})
		.filter((b) => b.width > 0 && b.centres > b.width);
	const heightMm = bridged.length
		? SPACINGS_SHOWN * Math.max(...bridged.map((b) => b.centres))
		: PLAIN_HEIGHT_MM;
	const members: SectionMember[] = [];
	for (const b of bridged) {
		const fill = sectionFill({ name: b.name, thicknessMm: input.layers[b.i].thicknessMm, lambda: b.lambda });
		// the first member half a spacing in, so that the drawing starts between two
		for (let at = b.centres / 2 - b.width / 2; at < heightMm; at += b.centres) {
			members.push({
				layerIndex: b.i,
				name: b.name,
				fill: fill === 'other' ? 'timber' : fill,
				alongMm: at,
				widthMm: Math.min(b.width, heightMm - at)
			});
		}
	}

	// The lines: the month with the most condensation (or the coldest), as the vapour chart shows it;
	// without a climate, the temperature at the design temperatures alone.
	const c = result.condensation;
	const profile = c?.vapourProfile;
	if (c && profile && profile.points.length) {
		const month = c.months.find((m) => m.month === profile.month);
		const condensationMm: number[] = [];
		if (month) {
			c.nodes.forEach((n, j) => {
				if ((month.rate[j] ?? 0) > 0 || (month.accumulatedAt[j] ?? 0) > 0) condensationMm.push(n.positionMm);
			});
		}
		return {
			totalMm,
			bands,
			heightMm,
			members,
			month: profile.month,
			temperature: profile.points.map((p) => ({ positionMm: p.positionMm, temperature: p.temperature })),
			dewPoint: profile.points.map((p) => ({
				positionMm: p.positionMm,
				temperature: saturationTemperature(p.vapourPressure)
			})),
			condensationMm,
			insideTemperature: month?.internalTemperature ?? result.designTemperatures.internal,
			outsideTemperature: month?.externalTemperature ?? result.designTemperatures.external
		};
	}
	return {
		totalMm,
		bands,
		heightMm,
		members,
		month: null,
		temperature: result.profile.map((p) => ({ positionMm: p.positionMm, temperature: p.temperature })),
		dewPoint: [],
		condensationMm: [],
		insideTemperature: result.designTemperatures.internal,
		outsideTemperature: result.designTemperatures.external
	};
}

/**
 * Positions from the inside surface (mm) to the drawing's x (0 … width): to scale, except that each thin
 * band gets MIN_BAND_SHARE of the width, taken evenly from the others. A position inside a band maps
 * proportionally within it, so the lines stay on their layers.
 */
export function sectionScale(bands: SectionBand[], totalMm: number, width: number): (mm: number) => number {
	if (!bands.length || totalMm <= 0) return () => 0;
	const thinCount = bands.filter((b) => b.thin).length;
	const thinWidth = MIN_BAND_SHARE * width;
	const thickMm = bands.filter((b) => !b.thin).reduce((s, b) => s + b.thicknessMm, 0);
	const rest = Math.max(0, width - thinCount * thinWidth);
	const widths = bands.map((b) => (b.thin ? thinWidth : thickMm > 0 ? (b.thicknessMm / thickMm) * rest : 0));
	const starts: number[] = [];
	widths.reduce((x, w, i) => ((starts[i] = x), x + w), 0);
	return (mm: number) => {
		if (mm <= bands[0].startMm) return 0;
		for (let i = 0; i < bands.length; i++) {
			const b = bands[i];
			if (mm <= b.endMm + 1e-9) {
				const share = b.thicknessMm > 0 ? (mm - b.startMm) / b.thicknessMm : 0;
				return starts[i] + share * widths[i];
			}
		}
		return width;
	};
}
