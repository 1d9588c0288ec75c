/**
 * Vector charts for the PDF: SVG strings laid out with d3-scale and drawn by pdfmake (svg-to-pdfkit),
 * text in the embedded Source Sans 3. Pure functions of the stored result, so a re-render draws the same.
 * Junctions have two pictures of one frame: the materials of the cross-section, and its temperature field.
 */
import { scaleLinear } from 'd3-scale';
import type { ElementResult } from '$lib/physics';
import { FONT } from '$lib/server/pdf';
import { fx, monthName, trim } from '$lib/format';
import type { JunctionInput } from '$lib/physics/junction-schema';
import type { JunctionField } from '$lib/physics/junction-field';
import { isotherm, isothermLevels } from '$lib/junctions/isotherms';

export const CHART_COLOURS = {
	ink: '#23211d',
	soft: '#4a463e',
	faint: '#7a7468',
	line: '#ddd5c6',
	bandA: '#f3eee4',
	bandB: '#e9e2d4',
	bridged: '#e2d6c2',
	disregarded: '#f7f4ee',
	heat: '#c2571a',
	damp: '#266a7d'
};

/** Dash pattern of the actual vapour pressure line (the saturation pressure line is solid). */
export const VAPOUR_DASH = '4 2.5';

const esc = (s: string) =>
	s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);

type Box = { width: number; height: number; left: number; right: number; top: number; bottom: number };

function text(
	x: number,
	y: number,
	s: string,
	opts: { size?: number; anchor?: string; fill?: string; weight?: string } = {}
) {
	return `<text x="${x.toFixed(2)}" y="${y.toFixed(2)}" font-family="${FONT}" font-size="${opts.size ?? 7}" text-anchor="${opts.anchor ?? 'start'}" fill="${opts.fill ?? CHART_COLOURS.soft}"${opts.weight ? ` font-weight="${opts.weight}"` : ''}>${esc(s)}</text>`;
}

function frame(
	box: Box,
	x: (v: number) => number,
	y: (v: number) => number,
	xTicks: number[],
	yTicks: number[],
	xFmt: (v: number) => string,
	yFmt: (v: number) => string,
	xLabel: string,
	yLabel: string
) {
	const parts: string[] = [];
	const x0 = box.left;
	const x1 = box.width - box.right;
	const y0 = box.height - box.bottom;
	const y1 = box.top;
	for (const t of yTicks) {
		parts.push(
			`<line x1="${x0}" x2="${x1}" y1="${y(t).toFixed(2)}" y2="${y(t).toFixed(2)}" stroke="${CHART_COLOURS.line}" stroke-width="0.4"/>`
		);
		parts.push(text(x0 - 4, y(t) + 2.4, yFmt(t), { anchor: 'end' }));
	}
	for (const t of xTicks) {
		parts.push(
			`<line x1="${x(t).toFixed(2)}" x2="${x(t).toFixed(2)}" y1="${y0}" y2="${y0 + 3}" stroke="${CHART_COLOURS.faint}" stroke-width="0.5"/>`
		);
		parts.push(text(x(t), y0 + 11, xFmt(t), { anchor: 'middle' }));
	}
	parts.push(
		`<rect x="${x0}" y="${y1}" width="${x1 - x0}" height="${y0 - y1}" fill="none" stroke="${CHART_COLOURS.faint}" stroke-width="0.5"/>`
	);
	parts.push(text((x0 + x1) / 2, box.height - 3, xLabel, { anchor: 'middle', size: 7.5 }));
	parts.push(text(x0 - 30, y1 - 10, yLabel, { size: 7.5 }));
	return parts.join('');
}

function polyline(points: [number, number][], stroke: string, width = 1.3, dash?: string) {
	const d = points.map(([a, b]) => `${a.toFixed(2)},${b.toFixed(2)}`).join(' ');
	return `<polyline points="${d}" fill="none" stroke="${stroke}" stroke-width="${width}" stroke-linejoin="round"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`;
}

/** A layer's band from xa to xb between yTop and yBottom, with its number on top when it is wide enough. */
function layerBand(xa: number, xb: number, yTop: number, yBottom: number, fill: string, n: number) {
	const band = `<rect x="${xa.toFixed(2)}" y="${yTop}" width="${Math.max(xb - xa, 0.3).toFixed(2)}" height="${yBottom - yTop}" fill="${fill}" stroke="${CHART_COLOURS.line}" stroke-width="0.4"/>`;
	if (xb - xa < 7) return band;
	return (
		band +
		text((xa + xb) / 2, yTop + 9, String(n), { anchor: 'middle', size: 6.5, fill: CHART_COLOURS.faint })
	);
}

/** The chart's SVG document. */
function svg(width: number, height: number, parts: string[]) {
	return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">${parts.join('')}</svg>`;
}

function legend(x: number, y: number, items: { label: string; colour: string; dash?: string }[]) {
	let cx = x;
	const parts: string[] = [];
	for (const it of items) {
		parts.push(
			`<line x1="${cx}" x2="${cx + 14}" y1="${y}" y2="${y}" stroke="${it.colour}" stroke-width="1.3"${it.dash ? ` stroke-dasharray="${it.dash}"` : ''}/>`
		);
		parts.push(text(cx + 18, y + 2.4, it.label));
		cx += 24 + it.label.length * 3.4;
	}
	return parts.join('');
}

/* ---------------------------------------------------------------- point labels */

/** An axis-aligned box in chart units (pt), y downwards. */
export type LabelBox = { x0: number; y0: number; x1: number; y1: number };

/** A label wanted beside a point: the point, the text and its size (pt). */
export type PointLabel = { x: number; y: number; text: string; size: number };

/** Where a label went: its baseline start, anchor, box and, when it sits away from its point, a leader line. */
export type PlacedLabel = {
	x: number;
	y: number;
	anchor: 'start' | 'end';
	box: LabelBox;
	leader: { x1: number; y1: number; x2: number; y2: number } | null;
};

/**
 * Width of a label in Source Sans 3, pt: advance widths of its figures and signs as fractions of the
 * em (figures about 0.5 em, "." and "," about 0.25 em; measured from the font, rounded up), so that a box
 * is never narrower than the text drawn.
 */
export function labelWidth(text: string, size: number): number {
	let em = 0;
	for (const ch of text) em += /[0-9]/.test(ch) ? 0.52 : /[.,:;]/.test(ch) ? 0.26 : ch === ' ' ? 0.22 : 0.58;
	return em * size + 0.5;
}

/** The box of a text with its baseline at (x, y): from the ascender to the descender. */
export function textBox(
	x: number,
	y: number,
	text: string,
	size: number,
	anchor: 'start' | 'end' = 'start'
): LabelBox {
	const w = labelWidth(text, size);
	const x0 = anchor === 'start' ? x : x - w;
	return { x0, y0: y - 0.78 * size, x1: x0 + w, y1: y + 0.24 * size };
}

const overlaps = (a: LabelBox, b: LabelBox, gap = 0.6) =>
	a.x0 < b.x1 + gap && b.x0 < a.x1 + gap && a.y0 < b.y1 + gap && b.y0 < a.y1 + gap;

const inside = (a: LabelBox, b: LabelBox) => a.x0 >= b.x0 && a.x1 <= b.x1 && a.y0 >= b.y0 && a.y1 <= b.y1;

/** Whether the segment from p to q crosses the box (Liang–Barsky clipping). */
function crosses(p: [number, number], q: [number, number], b: LabelBox): boolean {
	let t0 = 0;
	let t1 = 1;
	const dx = q[0] - p[0];
	const dy = q[1] - p[1];
	for (const [pe, qe] of [
		[-dx, p[0] - b.x0],
		[dx, b.x1 - p[0]],
		[-dy, p[1] - b.y0],
		[dy, b.y1 - p[1]]
	]) {
		if (pe === 0) {
			if (qe < 0) return false;
		} else {
			const t = qe / pe;
			if (pe < 0) t0 = Math.max(t0, t);
			else t1 = Math.min(t1, t);
			if (t0 > t1) return false;
		}
	}
	return true;
}

/**
 * Lays out the labels of points so that no two overlap, none covers another point or a fixed text
 * (`obstacles`), and all stay within `bounds`. Each label first tries the four places beside its point
 * (above or below, to the right or the left), preferring those clear of the plotted line (`line`); a
 * label with the same text as a placed one right next to it (two interfaces a hair apart) is dropped, the
 * one label standing for both; a label with no room beside its point is moved away from it, up or down in
 * steps of one line, with a leader line back to it. A label that finds no place at all is dropped (null) rather than
 * drawn over another. Pure; the order of `labels` is the order of preference.
 */
export function layoutPointLabels(
	labels: PointLabel[],
	bounds: LabelBox,
	obstacles: LabelBox[] = [],
	line: [number, number][] = []
): (PlacedLabel | null)[] {
	const placed: (PlacedLabel | null)[] = [];
	const taken: LabelBox[] = [...obstacles];
	const dots = labels.map((l) => ({ x0: l.x - 1.8, y0: l.y - 1.8, x1: l.x + 1.8, y1: l.y + 1.8 }));
	const clearOfLine = (b: LabelBox) => !line.some((p, i) => i > 0 && crosses(line[i - 1], p, b));
	labels.forEach((l, i) => {
		const free = (b: LabelBox) =>
			inside(b, bounds) &&
			!taken.some((t) => overlaps(b, t)) &&
			!dots.some((d, k) => k !== i && overlaps(b, d, 0.3));
		const lineH = 1.02 * l.size + 1;
		const near: { x: number; y: number; anchor: 'start' | 'end' }[] = [
			{ x: l.x + 2, y: l.y - 4, anchor: 'start' },
			{ x: l.x - 2, y: l.y + 0.78 * l.size + 3, anchor: 'end' },
			{ x: l.x + 2, y: l.y + 0.78 * l.size + 3, anchor: 'start' },
			{ x: l.x - 2, y: l.y - 4, anchor: 'end' }
		];
		const at = (c: { x: number; y: number; anchor: 'start' | 'end' }) =>
			textBox(c.x, c.y, l.text, l.size, c.anchor);
		// the same figure already stands beside a point this close (two interfaces a hair apart): it labels both
		const twin = placed.some(
			(p, k) =>
				p && labels[k].text === l.text && Math.abs(labels[k].x - l.x) < 8 && Math.abs(labels[k].y - l.y) < 4
		);
		if (twin) {
			placed.push(null);
			return;
		}
		let choice = near.find((c) => free(at(c)) && clearOfLine(at(c))) ?? near.find((c) => free(at(c))) ?? null;
		let leader: PlacedLabel['leader'] = null;
		if (!choice) {
			for (let step = 1; step <= 12 && !choice; step++) {
				const shifted = near.map((c) => ({ ...c, y: c.y + (c.y < l.y ? -1 : 1) * step * lineH }));
				choice =
					shifted.find((c) => free(at(c)) && clearOfLine(at(c))) ?? shifted.find((c) => free(at(c))) ?? null;
			}
			if (choice) {
				const b = at(choice);
				const yEnd = choice.y < l.y ? b.y1 : b.y0;
				leader = { x1: l.x, y1: l.y, x2: choice.anchor === 'start' ? b.x0 : b.x1, y2: yEnd };
			}
		}
		if (!choice) {
			placed.push(null);
			return;
		}
		const box = at(choice);
		taken.push(box);
		placed.push({ x: choice.x, y: choice.y, anchor: choice.anchor, box, leader });
	});
	return placed;
}

/**
 * Temperature through the build-up at the design temperatures: layers shaded (bridged layers darker),
 * the internal and external air to either side, the temperature at each interface.
 */
export function temperatureChart(result: ElementResult, width = 500, height = 190): string {
	const box: Box = { width, height, left: 44, right: 14, top: 26, bottom: 26 };
	const layers = result.layers;
	const total = layers.length ? layers[layers.length - 1].positionEndMm : 1;
	const stub = Math.max(total * 0.08, 10);
	const ti = result.designTemperatures.internal;
	const te = result.designTemperatures.external;
	const temps = [ti, te, ...result.profile.map((p) => p.temperature)];
	const y = scaleLinear()
		.domain([Math.min(...temps), Math.max(...temps)])
		.nice()
		.range([height - box.bottom, box.top]);
	const x = scaleLinear()
		.domain([-stub, total + stub])
		.range([box.left, width - box.right]);
	const parts: string[] = [];
	const yTop = box.top;
	const yBottom = height - box.bottom;
	/** the layer numbers and the words "inside" and "outside": labels keep clear of them */
	const layerNumberBoxes: LabelBox[] = [];
	const middle = (cx: number, cy: number, s: string, size: number) => {
		const w = labelWidth(s, size);
		return { x0: cx - w / 2, y0: cy - 0.78 * size, x1: cx + w / 2, y1: cy + 0.24 * size };
	};
	layers.forEach((l, i) => {
		const fill = l.disregarded
			? CHART_COLOURS.disregarded
			: l.bridgeFraction !== undefined
				? CHART_COLOURS.bridged
				: i % 2
					? CHART_COLOURS.bandB
					: CHART_COLOURS.bandA;
		const xa = x(l.positionStartMm);
		const xb = x(l.positionEndMm);
		parts.push(layerBand(xa, xb, yTop, yBottom, fill, i + 1));
		if (xb - xa >= 7) layerNumberBoxes.push(middle((xa + xb) / 2, yTop + 9, String(i + 1), 6.5));
	});
	parts.push(
		text(x(-stub / 2), yBottom - 4, 'inside', { anchor: 'middle', size: 6.5, fill: CHART_COLOURS.faint })
	);
	parts.push(
		text(x(total + stub / 2), yTop + 9, 'outside', { anchor: 'middle', size: 6.5, fill: CHART_COLOURS.faint })
	);
	layerNumberBoxes.push(
		middle(x(-stub / 2), yBottom - 4, 'inside', 6.5),
		middle(x(total + stub / 2), yTop + 9, 'outside', 6.5)
	);
	const xTicks = x
		.copy()
		.domain([0, total])
		.ticks(6)
		.filter((t) => t <= total);
	parts.push(
		frame(
			box,
			x,
			y,
			xTicks,
			y.ticks(6),
			(v) => trim(v, 0),
			(v) => fx(v, 0),
			'Position from the internal surface, mm',
			'Temperature, °C'
		)
	);
	const first = result.profile[0];
	const pts: [number, number][] = [
		[x(-stub), y(ti)],
		[x(0), y(ti)]
	];
	if (first) pts.push([x(first.positionMm), y(first.temperature)]);
	for (const p of result.profile) pts.push([x(p.positionMm), y(p.temperature)]);
	pts.push([x(total), y(te)], [x(total + stub), y(te)]);
	// The air to either side: a step at the surface film, as the surface resistances imply.
	parts.push(polyline(pts, CHART_COLOURS.heat, 1.4));
	for (const p of result.interfaces)
		parts.push(
			`<circle cx="${x(p.positionMm).toFixed(2)}" cy="${y(p.temperature).toFixed(2)}" r="1.6" fill="${CHART_COLOURS.heat}"/>`
		);
	// The air temperatures first, in fixed places; then the interfaces' labels around them, none overlapping.
	const LABEL = 6.5;
	const thetaI = `θi ${fx(ti, 1)}`;
	const thetaE = `θe ${fx(te, 1)}`;
	const teY = y(te) + (y(te) > yBottom - 12 ? -4 : 9);
	parts.push(text(x(-stub) + 2, y(ti) + 9, thetaI, { size: LABEL, fill: CHART_COLOURS.ink }));
	parts.push(text(x(total + stub) - 2, teY, thetaE, { size: LABEL, anchor: 'end', fill: CHART_COLOURS.ink }));
	const fixed = [
		textBox(x(-stub) + 2, y(ti) + 9, thetaI, LABEL),
		textBox(x(total + stub) - 2, teY, thetaE, LABEL, 'end'),
		...layerNumberBoxes
	];
	if (result.interfaces.length <= 10) {
		const bounds = { x0: box.left, y0: yTop, x1: width - box.right, y1: yBottom };
		const wanted = result.interfaces.map((p) => ({
			x: x(p.positionMm),
			y: y(p.temperature),
			text: fx(p.temperature, 1),
			size: LABEL
		}));
		layoutPointLabels(wanted, bounds, fixed, pts).forEach((pl, i) => {
			if (!pl) return;
			if (pl.leader)
				parts.push(
					`<line x1="${pl.leader.x1.toFixed(2)}" y1="${pl.leader.y1.toFixed(2)}" x2="${pl.leader.x2.toFixed(2)}" y2="${pl.leader.y2.toFixed(2)}" stroke="${CHART_COLOURS.faint}" stroke-width="0.4"/>`
				);
			parts.push(
				text(pl.x, pl.y, wanted[i].text, { size: LABEL, anchor: pl.anchor, fill: CHART_COLOURS.ink })
			);
		});
	}
	return svg(width, height, parts);
}

/**
 * Vapour pressure and saturation pressure against the cumulative sd-value from the internal surface
 * (the Glaser diagram) for the month the result stores its profile for.
 */
export function vapourChart(result: ElementResult, width = 500, height = 190): string | null {
	const c = result.condensation;
	if (!c || c.vapourProfile.points.length < 2) return null;
	const pts = c.vapourProfile.points;
	const box: Box = { width, height, left: 44, right: 14, top: 22, bottom: 26 };
	const sdTotal = Math.max(pts[pts.length - 1].sdM, 1e-6);
	const x = scaleLinear()
		.domain([0, sdTotal])
		.range([box.left, width - box.right]);
	const values = pts.flatMap((p) => [p.saturationPressure, p.vapourPressure]);
	const y = scaleLinear()
		.domain([0, Math.max(...values)])
		.nice()
		.range([height - box.bottom, box.top]);
	const parts: string[] = [];
	const yTop = box.top;
	const yBottom = height - box.bottom;
	let cum = 0;
	result.layers.forEach((l, i) => {
		if (l.disregarded) return;
		const sd = l.sd ?? 0;
		const xa = x(cum);
		const xb = x(cum + sd);
		cum += sd;
		const fill = i % 2 ? CHART_COLOURS.bandB : CHART_COLOURS.bandA;
		parts.push(layerBand(xa, xb, yTop, yBottom, fill, i + 1));
	});
	parts.push(
		frame(
			box,
			x,
			y,
			x.ticks(6),
			y.ticks(5),
			(v) => trim(v, 3),
			(v) => fx(v, 0),
			'Cumulative sd-value from the internal surface, m',
			`Pressure, Pa (${monthName(c.vapourProfile.month)})`
		)
	);
	// Same convention as the screen chart: saturation pressure solid, actual vapour pressure dashed.
	parts.push(
		polyline(
			pts.map((p) => [x(p.sdM), y(p.saturationPressure)]),
			CHART_COLOURS.heat,
			1.3
		)
	);
	parts.push(
		polyline(
			pts.map((p) => [x(p.sdM), y(p.vapourPressure)]),
			CHART_COLOURS.damp,
			1.4,
			VAPOUR_DASH
		)
	);
	for (const p of pts) {
		if (p.saturationPressure - p.vapourPressure < 0.5) {
			parts.push(
				`<circle cx="${x(p.sdM).toFixed(2)}" cy="${y(p.vapourPressure).toFixed(2)}" r="2" fill="none" stroke="${CHART_COLOURS.damp}" stroke-width="0.9"/>`
			);
		}
	}
	parts.push(
		legend(width - box.right - 250, box.top - 8, [
			{ label: 'saturation pressure', colour: CHART_COLOURS.heat },
			{ label: 'vapour pressure', colour: CHART_COLOURS.damp, dash: VAPOUR_DASH }
		])
	);
	return svg(width, height, parts);
}

/* ---------------------------------------------------------------- junctions */

/** A rectangle of a junction model, mm, y upwards. */
export type ModelBox = { x0: number; y0: number; x1: number; y1: number };

/** The temperature scale of junction pictures, cold to warm (the junction page's own). */
export const JUNCTION_PALETTE = ['#1f2b40', '#4b617c', '#8e9f9e', '#d2c7a6', '#f6ead0'];
/** Surfaces facing a warm environment, and a cold one (the junction page's colours). */
const WARM_EDGE = '#a4492a';
const COLD_EDGE = '#2c5a86';
/** Materials of λ below this are hatched as insulation, W/(m·K) (the junction page's threshold). */
export const INSULATION_LAMBDA = 0.1;
/** Height under a junction picture's drawing for its scale bar and key, pt. */
export const JUNCTION_LEGEND_HEIGHT = 46;

const hex = (c: string) => [1, 3, 5].map((i) => parseInt(c.slice(i, i + 2), 16));
const toHex = (rgb: number[]) =>
	'#' +
	rgb
		.map((v) =>
			Math.round(Math.max(0, Math.min(255, v)))
				.toString(16)
				.padStart(2, '0')
		)
		.join('');

/** The palette's colour at t in [0, 1], interpolated in RGB. */
export function paletteColour(t: number): string {
	const u = Math.max(0, Math.min(1, Number.isFinite(t) ? t : 0)) * (JUNCTION_PALETTE.length - 1);
	const i = Math.min(Math.floor(u), JUNCTION_PALETTE.length - 2);
	const a = hex(JUNCTION_PALETTE[i]);
	const b = hex(JUNCTION_PALETTE[i + 1]);
	return toHex(a.map((v, k) => v + (b[k] - v) * (u - i)));
}

/** Relative luminance of a #rrggbb colour (sRGB weights, no gamma), 0 dark to 1 light. */
function luminance(c: string): number {
	const [r, g, b] = hex(c);
	return (0.2126 * r + 0.7152 * g + 0.0722 * b) / 255;
}

/** Grey by log λ, insulating materials light and conductive ones dark: hsl(30°, 6 %, 93 % … 43 %), as the page shades them. */
export function lambdaShade(lambda: number): string {
	const t = Math.min(1, Math.max(0, (Math.log10(lambda) + 2) / 4));
	const l = (93 - 50 * t) / 100;
	const c = (1 - Math.abs(2 * l - 1)) * 0.06;
	const m = l - c / 2;
	// hue 30°: red at full chroma, green at half, blue none
	return toHex([(c + m) * 255, (c / 2 + m) * 255, m * 255]);
}

/** Where the pictures of one junction draw: the model window, its scale and the drawing's size, pt. */
export type JunctionFrame = {
	window: ModelBox;
	/** pt per mm */
	k: number;
	/** the drawing's size and its left offset in the SVG */
	w: number;
	h: number;
	left: number;
	/** the SVG's width */
	width: number;
};

/** The frame of a junction's pictures: the window scaled to fit `width` × `maxHeight` pt, its proportions kept, centred. */
export function junctionFrame(window: ModelBox, width: number, maxHeight: number): JunctionFrame {
	const dx = Math.max(window.x1 - window.x0, 1e-6);
	const dy = Math.max(window.y1 - window.y0, 1e-6);
	const k = Math.min(width / dx, maxHeight / dy);
	return { window, k, w: dx * k, h: dy * k, left: (width - dx * k) / 2, width };
}

type JunctionModelLike = Pick<JunctionInput, 'regions' | 'boundaries' | 'environments'>;

/** Model coordinates (mm, y up) to the picture's (pt, y down). */
function mapper(f: JunctionFrame) {
	return {
		px: (x: number) => f.left + (x - f.window.x0) * f.k,
		py: (y: number) => (f.window.y1 - y) * f.k
	};
}

type PtBox = { x: number; y: number; w: number; h: number };

/** A rectangle of the model in the picture, clipped to the window; null when none of it shows. */
function shownRect(f: JunctionFrame, r: ModelBox): PtBox | null {
	const x0 = Math.max(r.x0, f.window.x0);
	const x1 = Math.min(r.x1, f.window.x1);
	const y0 = Math.max(r.y0, f.window.y0);
	const y1 = Math.min(r.y1, f.window.y1);
	if (x1 <= x0 || y1 <= y0) return null;
	const { px, py } = mapper(f);
	return { x: px(x0), y: py(y1), w: (x1 - x0) * f.k, h: (y1 - y0) * f.k };
}

const rect = (b: PtBox, attrs: string) =>
	`<rect x="${b.x.toFixed(2)}" y="${b.y.toFixed(2)}" width="${b.w.toFixed(2)}" height="${b.h.toFixed(2)}" ${attrs}/>`;

/** The clip every part of the model is drawn in: the drawing's rectangle. */
function clipDefs(f: JunctionFrame, id: string) {
	return `<defs><clipPath id="${id}">${rect({ x: f.left, y: 0, w: f.w, h: f.h }, '')}</clipPath></defs>`;
}

const warmestOf = (model: JunctionModelLike) =>
	Math.max(...Object.values(model.environments).map((e) => e.temperature));

/** The boundaries as thick lines, warm surfaces and cold ones in their colours. */
function boundaryLines(f: JunctionFrame, model: JunctionModelLike) {
	const { px, py } = mapper(f);
	const warm = warmestOf(model);
	return model.boundaries
		.map((s) => {
			const colour = model.environments[s.environment]?.temperature === warm ? WARM_EDGE : COLD_EDGE;
			return `<line x1="${px(s.from[0]).toFixed(2)}" y1="${py(s.from[1]).toFixed(2)}" x2="${px(s.to[0]).toFixed(2)}" y2="${py(s.to[1]).toFixed(2)}" stroke="${colour}" stroke-width="1.8"/>`;
		})
		.join('');
}

/** The region that holds a point (the last, as later regions override earlier ones), or −1. */
function regionAt(model: JunctionModelLike, x: number, y: number): number {
	for (let i = model.regions.length - 1; i >= 0; i--) {
		const r = model.regions[i];
		if (x > r.x0 && x < r.x1 && y > r.y0 && y < r.y1) return i;
	}
	return -1;
}

/** A text's width at a size of Source Sans 3, roughly (for keeping labels inside the drawing). */
const textWidth = (s: string, size: number) => s.length * size * 0.48;

/** Each environment named once, beside the longest stretch of its boundaries in view, on the side without material. */
function environmentLabels(f: JunctionFrame, model: JunctionModelLike) {
	const { px, py } = mapper(f);
	const w = f.window;
	const warm = warmestOf(model);
	const best = new Map<string, { a: [number, number]; b: [number, number]; len: number }>();
	for (const s of model.boundaries) {
		const clamp = (v: number, lo: number, hi: number) => Math.max(lo, Math.min(v, hi));
		const a: [number, number] = [clamp(s.from[0], w.x0, w.x1), clamp(s.from[1], w.y0, w.y1)];
		const b: [number, number] = [clamp(s.to[0], w.x0, w.x1), clamp(s.to[1], w.y0, w.y1)];
		const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
		const known = best.get(s.environment);
		if (len > 0 && (!known || len > known.len)) best.set(s.environment, { a, b, len });
	}
	const parts: string[] = [];
	const size = 6.5;
	const off = 7 / f.k; // 7 pt off the surface, in mm
	const probe = 1 / f.k;
	for (const [name, s] of best) {
		const mx = (s.a[0] + s.b[0]) / 2;
		const my = (s.a[1] + s.b[1]) / 2;
		const vertical = Math.abs(s.b[0] - s.a[0]) < 1e-6;
		const side = vertical
			? regionAt(model, mx + probe, my) >= 0
				? -1
				: 1
			: regionAt(model, mx, my + probe) >= 0
				? -1
				: 1;
		const anchor = vertical ? (side < 0 ? 'end' : 'start') : 'middle';
		const est = textWidth(name, size);
		const before = anchor === 'end' ? est : anchor === 'middle' ? est / 2 : 0;
		const x = Math.max(
			f.left + 2 + before,
			Math.min(px(vertical ? mx + side * off : mx), f.left + f.w - 2 - (est - before))
		);
		const y = Math.max(8, Math.min(py(vertical ? my : my + side * off) + 2.2, f.h - 3));
		// a label that only fits on the material (its surface at the drawing's edge) is left to the key
		const mx0 = f.window.x0 + (x - before + est / 2 - f.left) / f.k;
		const my0 = f.window.y1 - (y - 2.2) / f.k;
		if (regionAt(model, mx0, my0) >= 0) continue;
		const colour = model.environments[name]?.temperature === warm ? '#7c3118' : '#1f4468';
		parts.push(text(x, y, name, { size, anchor, fill: colour, weight: 'bold' }));
	}
	return parts.join('');
}

/** A scale bar of a round length about a fifth of the window's width, at height y under the drawing. */
function scaleBar(f: JunctionFrame, y: number) {
	const target = (f.window.x1 - f.window.x0) / 5;
	const mm = [10, 20, 50, 100, 200, 500, 1000, 2000, 5000].find((v) => v >= target) ?? 10000;
	const x0 = f.left;
	const x1 = f.left + mm * f.k;
	const tick = (x: number) =>
		`<line x1="${x.toFixed(2)}" x2="${x.toFixed(2)}" y1="${y - 2}" y2="${y + 2}" stroke="${CHART_COLOURS.ink}" stroke-width="0.6"/>`;
	return (
		`<line x1="${x0.toFixed(2)}" x2="${x1.toFixed(2)}" y1="${y}" y2="${y}" stroke="${CHART_COLOURS.ink}" stroke-width="1.2"/>` +
		tick(x0) +
		tick(x1) +
		text(x1 + 3, y + 2.4, `${mm} mm`, { size: 6.5 })
	);
}

/** The drawing's frame line. */
const outline = (f: JunctionFrame) =>
	rect({ x: f.left, y: 0, w: f.w, h: f.h }, `fill="none" stroke="${CHART_COLOURS.faint}" stroke-width="0.5"`);

/**
 * A junction's cross-section to scale: materials shaded by λ (insulation, λ below 0.1 W/(m·K), hatched),
 * each material named once where there is room, the surfaces coloured by the environment they face and
 * each environment named; a scale bar and a key under it.
 */
export function junctionMaterialsPicture(model: JunctionModelLike, f: JunctionFrame): string {
	const hatch = `<defs><pattern id="jm-hatch" patternUnits="userSpaceOnUse" width="3.5" height="3.5" patternTransform="rotate(45)"><line x1="0" y1="0" x2="0" y2="3.5" stroke="#7d7468" stroke-width="0.45"/></pattern></defs>`;
	const body: string[] = [];
	for (const r of model.regions) {
		const b = shownRect(f, r);
		if (!b) continue;
		body.push(rect(b, `fill="${lambdaShade(r.lambda)}" stroke="none"`));
		if (r.lambda < INSULATION_LAMBDA) body.push(rect(b, `fill="url(#jm-hatch)" stroke="none"`));
	}
	for (const r of model.regions) {
		const b = shownRect(f, r);
		if (b) body.push(rect(b, `fill="none" stroke="${CHART_COLOURS.faint}" stroke-width="0.35"`));
	}
	body.push(boundaryLines(f, model));
	const parts = [clipDefs(f, 'jm-clip'), hatch, `<g clip-path="url(#jm-clip)">${body.join('')}</g>`];
	// each material named once, in the largest piece of it in view that is its own and has room
	const size = 6;
	const spots = new Map<string, { x: number; y: number; area: number }>();
	model.regions.forEach((r, i) => {
		const b = shownRect(f, r);
		const name = r.name?.trim();
		if (!b || !name || b.w < textWidth(name, size) + 4 || b.h < size + 3) return;
		const cx = b.x + b.w / 2;
		const cy = b.y + b.h / 2;
		if (regionAt(model, f.window.x0 + (cx - f.left) / f.k, f.window.y1 - cy / f.k) !== i) return;
		const known = spots.get(name);
		if (!known || b.w * b.h > known.area) spots.set(name, { x: cx, y: cy + 2, area: b.w * b.h });
	});
	for (const [name, s] of spots)
		parts.push(text(s.x, s.y, name, { size, anchor: 'middle', fill: CHART_COLOURS.ink }));
	parts.push(environmentLabels(f, model), outline(f));
	const y1 = f.h + 11;
	const y2 = f.h + 24;
	const y3 = f.h + 37;
	parts.push(scaleBar(f, y1));
	const edgeKey = (x: number, colour: string, label: string) =>
		`<line x1="${x}" x2="${x + 12}" y1="${y2}" y2="${y2}" stroke="${colour}" stroke-width="1.8"/>` +
		text(x + 15, y2 + 2.4, label, { size: 6.5 });
	parts.push(edgeKey(f.left, WARM_EDGE, 'warm side'), edgeKey(f.left + 52, COLD_EDGE, 'cold side'));
	const swatch = { x: f.left, y: y3 - 3.5, w: 12, h: 7 };
	parts.push(rect(swatch, `fill="${lambdaShade(0.035)}" stroke="none"`));
	parts.push(rect(swatch, `fill="url(#jm-hatch)" stroke="${CHART_COLOURS.faint}" stroke-width="0.35"`));
	parts.push(
		text(f.left + 15, y3 + 2.4, 'λ < 0.1 W/(m·K)', { size: 6.5 }),
		text(f.left + 72, y3 + 2.4, 'no line: adiabatic', { size: 6.5, fill: CHART_COLOURS.faint })
	);
	return svg(f.width, f.h + JUNCTION_LEGEND_HEIGHT, parts);
}

/** The band of a field cell by the mean of its corners, or −1 outside the material or without values. */
function cellBand(field: JunctionField, i: number, j: number, bandOf: (t: number) => number): number {
	const nx = field.xs.length;
	if (field.cells[j * (nx - 1) + i] < 0) return -1;
	const c = [
		field.values[j * nx + i],
		field.values[j * nx + i + 1],
		field.values[(j + 1) * nx + i],
		field.values[(j + 1) * nx + i + 1]
	];
	if (c.some((t) => t === null)) return -1;
	return bandOf((c as number[]).reduce((s, t) => s + t, 0) / 4);
}

/** What the temperature picture drew: its SVG and the isotherm levels and range of its colour scale, °C. */
export type TemperaturePicture = { svg: string; levels: number[]; min: number; max: number };

/**
 * A junction's temperature field as colour bands between round isotherm levels (each band in the
 * palette's colour at its middle), the isotherms as lines (light on the dark bands), the outlines of the
 * materials, the surfaces, and the coldest checked surface point with its temperature; a scale bar and
 * the colour scale with its levels under it. Null without a field.
 */
export function junctionTemperaturePicture(
	model: JunctionModelLike,
	field: JunctionField | null,
	f: JunctionFrame,
	coldest: { x: number; y: number; temperature: number } | null,
	fRsi: number | null
): TemperaturePicture | null {
	if (!field || field.xs.length < 2 || field.ys.length < 2) return null;
	const known = field.values.filter((v): v is number => v !== null);
	if (!known.length) return null;
	const min = Math.min(...known);
	const max = Math.max(...known);
	const span = max - min || 1;
	const levels = isothermLevels(min, max, 12);
	const edges = [min, ...levels, max];
	const bandColour = edges.slice(0, -1).map((lo, i) => paletteColour(((lo + edges[i + 1]) / 2 - min) / span));
	const bandOf = (t: number) => {
		let i = 0;
		while (i < levels.length && t >= levels[i]) i++;
		return i;
	};
	const { px, py } = mapper(f);
	const body: string[] = [];
	// the material first, so that a cell without values shows as material, not as a void
	for (const r of model.regions) {
		const b = shownRect(f, r);
		if (b) body.push(rect(b, `fill="${CHART_COLOURS.bandA}" stroke="none"`));
	}
	// the bands row by row, neighbouring cells of one band as one rectangle
	const nx = field.xs.length;
	for (let j = 0; j + 1 < field.ys.length; j++) {
		let i = 0;
		while (i + 1 < nx) {
			const band = cellBand(field, i, j, bandOf);
			let k = i + 1;
			while (band >= 0 && k + 1 < nx && cellBand(field, k, j, bandOf) === band) k++;
			const b =
				band >= 0 && shownRect(f, { x0: field.xs[i], x1: field.xs[k], y0: field.ys[j], y1: field.ys[j + 1] });
			// a hairline of the band's own colour closes the seams between neighbours
			if (b) body.push(rect(b, `fill="${bandColour[band]}" stroke="${bandColour[band]}" stroke-width="0.3"`));
			i = k;
		}
	}
	for (const r of model.regions) {
		const b = shownRect(f, r);
		if (b)
			body.push(rect(b, `fill="none" stroke="${CHART_COLOURS.ink}" stroke-opacity="0.3" stroke-width="0.3"`));
	}
	for (const level of levels) {
		const segments = isotherm(field, level);
		if (!segments.length) continue;
		const d = segments
			.map(
				([a, b, c, e]) => `M${px(a).toFixed(2)} ${py(b).toFixed(2)}L${px(c).toFixed(2)} ${py(e).toFixed(2)}`
			)
			.join('');
		const dark = luminance(paletteColour((level - min) / span)) < 0.45;
		body.push(
			`<path d="${d}" fill="none" stroke="${dark ? '#ffffff' : CHART_COLOURS.ink}" stroke-opacity="0.8" stroke-width="0.55"/>`
		);
	}
	body.push(boundaryLines(f, model));
	const parts = [clipDefs(f, 'jt-clip'), `<g clip-path="url(#jt-clip)">${body.join('')}</g>`];
	parts.push(environmentLabels(f, model));
	if (coldest) parts.push(coldestMark(f, model, coldest, fRsi));
	parts.push(outline(f));
	// under the drawing: the scale bar, then the colour scale with its levels
	const y1 = f.h + 11;
	const y2 = f.h + 23;
	parts.push(scaleBar(f, y1));
	const bx = f.left + 32;
	const barW = Math.max(f.w - 64, 40);
	const tx = (t: number) => bx + ((t - min) / span) * barW;
	edges.slice(0, -1).forEach((lo, i) => {
		parts.push(
			rect(
				{ x: tx(lo), y: y2 - 3.5, w: Math.max(tx(edges[i + 1]) - tx(lo), 0.3), h: 7 },
				`fill="${bandColour[i]}" stroke="${bandColour[i]}" stroke-width="0.2"`
			)
		);
	});
	parts.push(
		rect(
			{ x: bx, y: y2 - 3.5, w: barW, h: 7 },
			`fill="none" stroke="${CHART_COLOURS.faint}" stroke-width="0.4"`
		)
	);
	const every = Math.max(1, Math.ceil((levels.length * 18) / barW));
	levels.forEach((l, i) => {
		if (i % every === 0) parts.push(text(tx(l), y2 + 11, trim(l, 2), { size: 6, anchor: 'middle' }));
	});
	parts.push(text(bx - 3, y2 + 2.4, `${fx(min, 1)} °C`, { size: 6.5, anchor: 'end' }));
	parts.push(text(bx + barW + 3, y2 + 2.4, `${fx(max, 1)} °C`, { size: 6.5 }));
	return { svg: svg(f.width, f.h + JUNCTION_LEGEND_HEIGHT, parts), levels, min, max };
}

/** The coldest point as a ring, its temperature and fRsi beside it on the side of the material. */
function coldestMark(
	f: JunctionFrame,
	model: JunctionModelLike,
	c: { x: number; y: number; temperature: number },
	fRsi: number | null
): string {
	const { px, py } = mapper(f);
	const cx = px(c.x);
	const cy = py(c.y);
	if (cx < f.left - 0.5 || cx > f.left + f.w + 0.5 || cy < -0.5 || cy > f.h + 0.5) return '';
	const label = `coldest ${fx(c.temperature, 1)} °C${fRsi !== null ? `, fRsi ${fx(fRsi, 3)}` : ''}`;
	const est = textWidth(label, 6.5);
	const probe = 10 / f.k;
	const o = [
		{ dx: 1, dy: -1 },
		{ dx: -1, dy: -1 },
		{ dx: 1, dy: 1 },
		{ dx: -1, dy: 1 }
	].find((q) => regionAt(model, c.x + q.dx * probe, c.y + q.dy * probe) >= 0) ?? { dx: 1, dy: -1 };
	const lx = Math.max(f.left + 2, Math.min(o.dx > 0 ? cx + 5 : cx - 5 - est, f.left + f.w - est - 2));
	const ly = Math.max(9, Math.min(o.dy > 0 ? cy - 6 : cy + 11, f.h - 3));
	return (
		`<circle cx="${cx.toFixed(2)}" cy="${cy.toFixed(2)}" r="2.6" fill="#ffffff" stroke="${CHART_COLOURS.ink}" stroke-width="1"/>` +
		rect({ x: lx - 1.5, y: ly - 7, w: est + 3, h: 9.5 }, `fill="#ffffff" fill-opacity="0.85" stroke="none"`) +
		text(lx, ly, label, { size: 6.5, fill: CHART_COLOURS.ink, weight: 'bold' })
	);
}
