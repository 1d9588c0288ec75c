/**
 * U-values by element kind against their limits, as an SVG string laid out with d3-scale: one column per
 * kind, a dot per element, the limit as a line across the column. Used by the page and the PDF alike.
 */
import { scaleBand, scaleLinear } from 'd3-scale';
import { ELEMENT_KIND_LABELS, type ElementKind } from '$lib/dwellings/kinds';

export type UByKind = { kind: ElementKind; limit: number | null; values: { u: number; over: boolean }[] }[];

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

export function uChartSvg(
	data: UByKind,
	opts: { width?: number; height?: number; font?: string } = {}
): string {
	const width = opts.width ?? 520;
	const height = opts.height ?? 220;
	const font = opts.font ?? 'SourceSans3';
	const m = { top: 12, right: 10, bottom: 46, left: 44 };
	const kinds = data.map((d) => d.kind);
	const max = Math.max(0.5, ...data.flatMap((d) => [...d.values.map((v) => v.u), d.limit ?? 0])) * 1.1;
	const x = scaleBand<string>()
		.domain(kinds)
		.range([m.left, width - m.right])
		.padding(0.25);
	const y = scaleLinear()
		.domain([0, max])
		.nice()
		.range([height - m.bottom, m.top]);
	const parts: string[] = [];
	for (const t of y.ticks(5)) {
		parts.push(
			`<line x1="${m.left}" x2="${width - m.right}" y1="${y(t)}" y2="${y(t)}" stroke="#e4ddd0" stroke-width="0.6"/>`
		);
		parts.push(
			`<text x="${m.left - 4}" y="${y(t) + 3}" font-family="${font}" font-size="8" text-anchor="end" fill="#5b554c">${t.toFixed(2)}</text>`
		);
	}
	parts.push(
		`<text x="10" y="${m.top + (height - m.top - m.bottom) / 2}" font-family="${font}" font-size="8" fill="#5b554c" transform="rotate(-90 10 ${m.top + (height - m.top - m.bottom) / 2})" text-anchor="middle">U, W/(m²·K)</text>`
	);
	for (const d of data) {
		const x0 = x(d.kind)!;
		const bw = x.bandwidth();
		if (d.limit !== null) {
			parts.push(
				`<line x1="${x0}" x2="${x0 + bw}" y1="${y(d.limit)}" y2="${y(d.limit)}" stroke="#1f1b16" stroke-width="1.4" stroke-dasharray="4 2"/>`
			);
		}
		const n = d.values.length;
		d.values.forEach((v, i) => {
			const cx = x0 + bw * (n === 1 ? 0.5 : 0.1 + (0.8 * i) / (n - 1));
			parts.push(
				v.over
					? `<rect x="${cx - 2.6}" y="${y(v.u) - 2.6}" width="5.2" height="5.2" fill="#b3261e"/>`
					: `<circle cx="${cx}" cy="${y(v.u)}" r="2.4" fill="#2f6b3a" fill-opacity="0.8"/>`
			);
		});
		const label = ELEMENT_KIND_LABELS[d.kind] ?? d.kind;
		const words = label.split(/,\s*/);
		words.forEach((w, i) => {
			parts.push(
				`<text x="${x0 + bw / 2}" y="${height - m.bottom + 12 + i * 9}" font-family="${font}" font-size="7.5" text-anchor="middle" fill="#1f1b16">${esc(w)}</text>`
			);
		});
	}
	parts.push(
		`<line x1="${m.left}" x2="${width - m.right}" y1="${height - m.bottom}" y2="${height - m.bottom}" stroke="#1f1b16" stroke-width="0.8"/>`
	);
	return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">${parts.join('')}</svg>`;
}
