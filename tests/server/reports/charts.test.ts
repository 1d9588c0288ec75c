// The temperature labels of the report's profile chart: laid out so that none overlaps another, a
// point or a fixed text, and all stay inside the plot. Geometry only (common practice, no source); the
// build-ups are invented, their temperatures the engine's own.
import { describe, expect, it } from 'vitest';
import {
	labelWidth,
	layoutPointLabels,
	temperatureChart,
	textBox,
	type LabelBox
} from '../../../src/lib/server/reports/charts';
import { built } from './client-snapshot';

const overlap = (a: LabelBox, b: LabelBox) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
const within = (a: LabelBox, b: LabelBox) => a.x0 >= b.x0 && a.x1 <= b.x1 && a.y0 >= b.y0 && a.y1 <= b.y1;

function noneOverlap(boxes: LabelBox[]) {
	for (let i = 0; i < boxes.length; i++)
		for (let k = i + 1; k < boxes.length; k++)
			expect(overlap(boxes[i], boxes[k]), `labels ${i} and ${k}`).toBe(false);
}

const BOUNDS: LabelBox = { x0: 44, y0: 26, x1: 480, y1: 164 };

describe('the layout of point labels', () => {
	it('leaves a label that has room where it always was: above and to the right of its point', () => {
		const [a] = layoutPointLabels([{ x: 200, y: 100, text: '17.5', size: 6.5 }], BOUNDS);
		expect(a).toMatchObject({ x: 202, y: 96, anchor: 'start', leader: null });
	});

	it('keeps three interfaces a hair apart readable: "19.4 19.1 / 19.1" no longer overlap', () => {
		// three points 1.5 pt apart, two of them with the same figure
		const labels = [
			{ x: 100, y: 40, text: '19.4', size: 6.5 },
			{ x: 101.5, y: 41.2, text: '19.1', size: 6.5 },
			{ x: 103, y: 41.3, text: '19.1', size: 6.5 }
		];
		const placed = layoutPointLabels(labels, BOUNDS);
		const shown = placed.filter((p) => p !== null);
		// the repeated figure right beside the first is drawn once: it stands for both points
		expect(placed[2]).toBeNull();
		expect(shown).toHaveLength(2);
		noneOverlap(shown.map((p) => p!.box));
		for (const p of shown) expect(within(p!.box, BOUNDS)).toBe(true);
		// no label covers another point
		for (const p of shown)
			for (const l of labels)
				expect(overlap(p!.box, { x0: l.x - 1.6, y0: l.y - 1.6, x1: l.x + 1.6, y1: l.y + 1.6 })).toBe(false);
	});

	it('moves a crowded label away with a leader line back to its point, never over another text', () => {
		const fixed = [textBox(60, 60, 'θi 20.0', 6.5)];
		const labels = Array.from({ length: 8 }, (_, i) => ({
			x: 100 + i * 2,
			y: 60 + i * 0.5,
			text: (19 - i * 0.3).toFixed(1),
			size: 6.5
		}));
		const placed = layoutPointLabels(labels, BOUNDS, fixed);
		const shown = placed.filter((p) => p !== null).map((p) => p!);
		expect(shown.length).toBe(8); // every figure differs: none is dropped
		noneOverlap([...fixed, ...shown.map((p) => p.box)]);
		const moved = shown.filter((p) => p.leader);
		expect(moved.length).toBeGreaterThan(0);
		for (const p of moved) {
			const i = shown.indexOf(p);
			expect(p.leader!.x1).toBe(labels[i].x);
			expect(p.leader!.y1).toBe(labels[i].y);
		}
	});

	it('keeps labels inside the plot, and drops one that finds no room rather than overlap', () => {
		const tiny: LabelBox = { x0: 0, y0: 0, x1: 30, y1: 12 };
		const placed = layoutPointLabels(
			[
				{ x: 5, y: 8, text: '10.0', size: 6.5 },
				{ x: 6, y: 8, text: '11.0', size: 6.5 },
				{ x: 7, y: 8, text: '12.0', size: 6.5 }
			],
			tiny
		);
		const shown = placed.filter((p) => p !== null).map((p) => p!.box);
		noneOverlap(shown);
		for (const b of shown) expect(within(b, tiny)).toBe(true);
		expect(placed.some((p) => p === null)).toBe(true);
	});

	it('measures a label no narrower than Source Sans 3 draws it (figures 0.5 em or less, from the font)', () => {
		// Source Sans 3's figures advance about 500 units of 1000 (hmtx, from memory)
		expect(labelWidth('19.1', 10)).toBeGreaterThanOrEqual(3 * 5 + 2.5);
	});
});

describe('the temperature chart', () => {
	it('draws no two temperature labels over each other for a build-up of thin layers', () => {
		const layer = (name: string, thicknessMm: number, lambda: number, mu: number) => ({
			name,
			thicknessMm,
			lambda,
			mu
		});
		// a skim, a board and a foil a fraction of a millimetre thick: interfaces nearly on top of each other
		const el = built(90, 'Dry-lined wall', 'external-wall', 20, {
			layers: [
				layer('Skim', 3, 0.5, 10),
				layer('Plasterboard', 12.5, 0.25, 10),
				{ name: 'Foil', thicknessMm: 0.2, lambda: 0.2, sd: 100 },
				layer('PIR', 50, 0.022, 60),
				layer('Brick', 215, 0.77, 10),
				layer('Render', 2, 1, 10)
			]
		} as never);
		const svg = temperatureChart(el.result!, 495, 190);
		const texts = [
			...svg.matchAll(
				/<text x="([\d.-]+)" y="([\d.-]+)"[^>]*font-size="([\d.]+)" text-anchor="(\w+)"[^>]*>([^<]*)<\/text>/g
			)
		].map((m) => ({ x: Number(m[1]), y: Number(m[2]), size: Number(m[3]), anchor: m[4], text: m[5] }));
		// the labels of the points and of the air: figures, "θi …" and "θe …"
		const figures = texts.filter((t) => t.size === 6.5 && /^(θ[ie] )?−?\d+\.\d$/.test(t.text));
		expect(figures.length).toBeGreaterThanOrEqual(5);
		const boxes = figures.map((t) => textBox(t.x, t.y, t.text, t.size, t.anchor === 'end' ? 'end' : 'start'));
		noneOverlap(boxes);
		// each interface temperature is still readable: every distinct figure is drawn once at least
		const wanted = new Set(
			el.result!.interfaces.map((p) => (p.temperature < 0 ? '−' : '') + Math.abs(p.temperature).toFixed(1))
		);
		for (const w of wanted) expect(figures.map((f) => f.text)).toContain(w);
	});
});
