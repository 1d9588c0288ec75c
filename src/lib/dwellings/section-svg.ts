/**
 * The section drawing as one SVG document (a string), drawn the same on the element page and in the PDF
 * report. Every text that comes from the user is escaped. Colours are Envelo's own (warm paper, dark ink,
 * the heat and moisture accents).
 */
import { monthName } from '$lib/format';
import {
	SECTION_FILL_LABELS,
	sectionScale,
	type SectionDrawing,
	type SectionFill,
	type SectionLine
} from './section';

export const SECTION_COLOURS = {
	ink: '#23211d',
	soft: '#4a463e',
	faint: '#7a7468',
	line: '#ddd5c6',
	paper: '#fffdf9',
	heat: '#c2571a',
	damp: '#266a7d'
};

/** Base colour and pattern strokes of each fill. */
const FILL_STYLE: Readonly<Record<SectionFill, { base: string; mark: string }>> = {
	masonry: { base: '#e7cdb6', mark: '#b98b69' },
	concrete: { base: '#dedad2', mark: '#8f887b' },
	timber: { base: '#ecdab5', mark: '#b79a62' },
	insulation: { base: '#f7f0d4', mark: '#c9b46a' },
	membrane: { base: '#4a463e', mark: '#4a463e' },
	lining: { base: '#f1ebe0', mark: '#b9ae9b' },
	air: { base: '#fffdf9', mark: '#ddd5c6' },
	resistance: { base: '#efeae0', mark: '#a79d8b' },
	other: { base: '#e9e2d4', mark: '#a79d8b' }
};

const esc = (s: string) =>
	s
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/"/g, '&quot;')
		.replace(/'/g, '&#39;');
const n = (v: number) => (Math.round(v * 10) / 10).toString();

/** The patterns: each fill's own marks, in user space so that they line up across the drawing. */
function patterns(id: string): string {
	const p = (name: SectionFill, w: number, h: number, marks: string) =>
		`<pattern id="${id}-${name}" patternUnits="userSpaceOnUse" width="${w}" height="${h}"><rect width="${w}" height="${h}" fill="${FILL_STYLE[name].base}"/>${marks}</pattern>`;
	const m = (name: SectionFill) => FILL_STYLE[name].mark;
	return [
		// brick courses, joints staggered
		p(
			'masonry',
			24,
			12,
			`<path d="M0 0.5H24M0 6.5H24M0.5 0V6M12.5 6V12" stroke="${m('masonry')}" stroke-width="0.8" fill="none"/>`
		),
		// aggregate
		p(
			'concrete',
			10,
			10,
			`<circle cx="2" cy="3" r="0.9" fill="${m('concrete')}"/><circle cx="7" cy="7.5" r="1.2" fill="${m('concrete')}"/><circle cx="8" cy="2" r="0.5" fill="${m('concrete')}"/>`
		),
		// grain
		p(
			'timber',
			8,
			8,
			`<path d="M-2 10L10 -2M-2 2L2 -2M6 10L10 6" stroke="${m('timber')}" stroke-width="0.7"/>`
		),
		// a soft zigzag
		p(
			'insulation',
			12,
			8,
			`<path d="M0 4L3 1L6 4L9 7L12 4" stroke="${m('insulation')}" stroke-width="0.9" fill="none"/>`
		),
		p('membrane', 4, 4, ''),
		p(
			'lining',
			6,
			6,
			`<circle cx="1.5" cy="1.5" r="0.5" fill="${m('lining')}"/><circle cx="4.5" cy="4.5" r="0.5" fill="${m('lining')}"/>`
		),
		p('air', 4, 4, ''),
		p('resistance', 8, 8, `<path d="M0 0L8 8M8 0L0 8" stroke="${m('resistance')}" stroke-width="0.6"/>`),
		p('other', 4, 4, '')
	].join('');
}

export type SectionSvgOptions = {
	width?: number;
	/** height of the drawing itself (without labels and legend) */
	height?: number;
	/** a prefix for the pattern ids, unique on the page */
	id?: string;
	/** write the key (fills used, lines) below the drawing */
	legend?: boolean;
	/** the font family the text is set in (the PDF names its embedded font) */
	fontFamily?: string;
};

/** The SVG document of a section drawing. */
export function sectionSvg(d: SectionDrawing, opts: SectionSvgOptions = {}): string {
	const width = opts.width ?? 640;
	const plotH = opts.height ?? 170;
	const id = (opts.id ?? 'section').replace(/[^a-zA-Z0-9_-]/g, '');
	const left = 42;
	const right = 16;
	const top = 34;
	const plotW = width - left - right;
	const xOf = sectionScale(d.bands, d.totalMm, plotW);
	const x = (mm: number) => left + xOf(mm);

	// temperature axis over both lines and both boundary temperatures
	const temps = [
		...d.temperature.map((p) => p.temperature),
		...d.dewPoint.map((p) => p.temperature),
		d.insideTemperature,
		d.outsideTemperature
	].filter(Number.isFinite);
	let lo = Math.floor(Math.min(...temps) / 5) * 5;
	let hi = Math.ceil(Math.max(...temps) / 5) * 5;
	if (hi - lo < 10) hi = lo + 10;
	if (!temps.length) [lo, hi] = [0, 20];
	const y = (t: number) => top + plotH - ((t - lo) / (hi - lo)) * plotH;

	const out: string[] = [];
	const fillsUsed = new Set<SectionFill>();

	// bands
	for (const b of d.bands) {
		const x0 = x(b.startMm);
		const x1 = x(b.endMm);
		fillsUsed.add(b.fill);
		out.push(
			`<rect x="${n(x0)}" y="${top}" width="${n(Math.max(0.8, x1 - x0))}" height="${plotH}" fill="url(#${id}-${b.fill})" stroke="${SECTION_COLOURS.soft}" stroke-width="0.5"${b.disregarded ? ' opacity="0.35"' : ''}><title>${esc(`${b.index + 1}: ${b.name}, ${n(b.thicknessMm)} mm (${SECTION_FILL_LABELS[b.fill]})`)}</title></rect>`
		);
		// the layer's number above it, where there is room
		if (x1 - x0 >= 9)
			out.push(
				`<text x="${n((x0 + x1) / 2)}" y="${top - 6}" text-anchor="middle" font-size="9" fill="${SECTION_COLOURS.soft}">${b.index + 1}</text>`
			);
	}
	// members across their layers, at their spacing (the drawing's height stands for d.heightMm)
	for (const m of d.members) {
		const b = d.bands[m.layerIndex];
		if (!b) continue;
		fillsUsed.add(m.fill);
		const y0 = top + (m.alongMm / d.heightMm) * plotH;
		const h = (m.widthMm / d.heightMm) * plotH;
		out.push(
			`<rect x="${n(x(b.startMm))}" y="${n(y0)}" width="${n(Math.max(0.8, x(b.endMm) - x(b.startMm)))}" height="${n(Math.max(0.8, h))}" fill="url(#${id}-${m.fill})" stroke="${SECTION_COLOURS.ink}" stroke-width="0.8"><title>${esc(m.name)}</title></rect>`
		);
	}
	// surfaces
	out.push(
		`<line x1="${left}" y1="${top}" x2="${left}" y2="${top + plotH}" stroke="${SECTION_COLOURS.ink}" stroke-width="1.2"/>`,
		`<line x1="${left + plotW}" y1="${top}" x2="${left + plotW}" y2="${top + plotH}" stroke="${SECTION_COLOURS.ink}" stroke-width="1.2"/>`
	);
	// temperature axis: ticks every 5 °C
	for (let t = lo; t <= hi + 1e-9; t += hi - lo > 30 ? 10 : 5) {
		out.push(
			`<line x1="${left - 4}" y1="${n(y(t))}" x2="${left}" y2="${n(y(t))}" stroke="${SECTION_COLOURS.faint}" stroke-width="0.6"/>`,
			`<text x="${left - 6}" y="${n(y(t) + 3)}" text-anchor="end" font-size="8.5" fill="${SECTION_COLOURS.faint}">${t}</text>`
		);
	}
	out.push(
		`<text x="${left - 6}" y="${top - 6}" text-anchor="end" font-size="8.5" fill="${SECTION_COLOURS.faint}">°C</text>`
	);

	// condensation: a damp band at each interface where it forms that month, and a drop above it
	for (const mm of d.condensationMm) {
		const cx = x(mm);
		const t = top - 21;
		out.push(
			`<rect x="${n(cx - 4)}" y="${top}" width="8" height="${plotH}" fill="${SECTION_COLOURS.damp}" opacity="0.3"/>`,
			`<path d="M${n(cx)} ${t}C${n(cx - 5)} ${t + 8} ${n(cx - 5)} ${t + 13} ${n(cx)} ${t + 13}C${n(cx + 5)} ${t + 13} ${n(cx + 5)} ${t + 8} ${n(cx)} ${t}Z" fill="${SECTION_COLOURS.damp}"><title>Condensation forms here</title></path>`
		);
	}
	// the lines: a pale casing under each, so that they read over every fill
	const path = (line: SectionLine) =>
		line.map((p, i) => `${i ? 'L' : 'M'}${n(x(p.positionMm))} ${n(y(p.temperature))}`).join('');
	const drawLine = (line: SectionLine, colour: string, dash: string) => {
		if (line.length < 2) return;
		out.push(
			`<path d="${path(line)}" fill="none" stroke="${SECTION_COLOURS.paper}" stroke-width="4" stroke-linejoin="round" opacity="0.85"/>`,
			`<path d="${path(line)}" fill="none" stroke="${colour}" stroke-width="2" stroke-linejoin="round"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`
		);
	};
	drawLine(d.dewPoint, SECTION_COLOURS.damp, '5 3');
	drawLine(d.temperature, SECTION_COLOURS.heat, '');

	// inside and outside
	out.push(
		`<text x="${left + 3}" y="${top + plotH + 13}" font-size="9" fill="${SECTION_COLOURS.ink}" font-weight="600">Inside ${n(d.insideTemperature)} °C</text>`,
		`<text x="${left + plotW - 3}" y="${top + plotH + 13}" text-anchor="end" font-size="9" fill="${SECTION_COLOURS.ink}" font-weight="600">Outside ${n(d.outsideTemperature)} °C</text>`
	);

	let height = top + plotH + 20;
	if (opts.legend ?? true) {
		const items: string[] = [];
		let lx = left;
		const key = (swatch: string, label: string) => {
			const w = 16 + label.length * 4.6 + 14;
			if (lx + w > width - right) {
				lx = left;
				height += 14;
			}
			items.push(
				`<g transform="translate(${n(lx)} ${n(height + 6)})">${swatch}<text x="16" y="8" font-size="8.5" fill="${SECTION_COLOURS.soft}">${esc(label)}</text></g>`
			);
			lx += w;
		};
		key(`<path d="M0 5H12" stroke="${SECTION_COLOURS.heat}" stroke-width="2"/>`, 'temperature');
		if (d.dewPoint.length)
			key(
				`<path d="M0 5H12" stroke="${SECTION_COLOURS.damp}" stroke-width="2" stroke-dasharray="5 3"/>`,
				'dew point'
			);
		if (d.condensationMm.length)
			key(
				`<rect x="3" y="0" width="6" height="10" fill="${SECTION_COLOURS.damp}" opacity="0.35"/>`,
				'condensation forms'
			);
		for (const f of [...fillsUsed].sort())
			key(
				`<rect x="0" y="0" width="12" height="10" fill="url(#${id}-${f})" stroke="${SECTION_COLOURS.soft}" stroke-width="0.5"/>`,
				SECTION_FILL_LABELS[f]
			);
		out.push(...items);
		height += 22;
	}
	const alt = `Section through the build-up, inside on the left: ${d.bands.map((b) => `${b.index + 1} ${b.name} ${n(b.thicknessMm)} mm`).join(', ')}. ${sectionCaption(d)}`;
	return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${n(height)}" width="${width}" height="${n(height)}" font-family="${esc(opts.fontFamily ?? 'Source Sans 3, sans-serif')}" role="img" aria-label="${esc(alt)}"><title>${esc(alt)}</title><defs>${patterns(id)}</defs>${out.join('')}</svg>`;
}

/** The words under the drawing: the month its lines are for, and how it is drawn. */
export function sectionCaption(d: SectionDrawing): string {
	const lines =
		d.month === null
			? 'Temperature at the design temperatures (no climate: the dew point is not drawn).'
			: `Temperature and dew point in ${monthName(d.month)}, ${d.condensationMm.length ? 'the month with the most condensation' : 'the coldest month (no condensation forms)'}.`;
	const thin = d.bands.some((b) => b.thin) ? ' Thin layers are drawn wider than to scale.' : '';
	const members = d.members.length
		? ` Bridging members at their spacing; the height shows ${Math.round(d.heightMm)} mm of the element.`
		: '';
	return `Layers to scale, inside on the left.${thin}${members} ${lines}`;
}
