/**
 * Vector charts for the PDF: SVG strings laid out with d3-scale and drawn by pdfmake (svg-to-pdfkit),
 * text in the embedded Source Sans 3. Pure functions of the stored result, so a re-render draws the same.
 */
import { scaleLinear } from 'd3-scale';
import type { ElementResult } from '$lib/physics';
import { FONT } from '$lib/server/pdf';
import { fx, monthName, trim } from '$lib/format';

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
	layers.forEach((l, i) => {
		const fill = l.disregarded
			? CHART_COLOURS.disregarded
			: l.bridgeFraction !== undefined
				? CHART_COLOURS.bridged
				: i % 2
					? CHART_COLOURS.bandB
					: CHART_COLOURS.bandA;
		parts.push(layerBand(x(l.positionStartMm), x(l.positionEndMm), yTop, yBottom, fill, i + 1));
	});
	parts.push(
		text(x(-stub / 2), yBottom - 4, 'inside', { anchor: 'middle', size: 6.5, fill: CHART_COLOURS.faint })
	);
	parts.push(
		text(x(total + stub / 2), yTop + 9, 'outside', { anchor: 'middle', size: 6.5, fill: CHART_COLOURS.faint })
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
	const labelled = result.interfaces.length <= 10;
	result.interfaces.forEach((p, i) => {
		parts.push(
			`<circle cx="${x(p.positionMm).toFixed(2)}" cy="${y(p.temperature).toFixed(2)}" r="1.6" fill="${CHART_COLOURS.heat}"/>`
		);
		if (labelled) {
			const above = i % 2 === 0;
			parts.push(
				text(x(p.positionMm) + 2, y(p.temperature) + (above ? -4 : 9), fx(p.temperature, 1), {
					size: 6.5,
					fill: CHART_COLOURS.ink
				})
			);
		}
	});
	parts.push(text(x(-stub) + 2, y(ti) + 9, `θi ${fx(ti, 1)}`, { size: 6.5, fill: CHART_COLOURS.ink }));
	parts.push(
		text(x(total + stub) - 2, y(te) + (y(te) > yBottom - 12 ? -4 : 9), `θe ${fx(te, 1)}`, {
			size: 6.5,
			anchor: 'end',
			fill: CHART_COLOURS.ink
		})
	);
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
