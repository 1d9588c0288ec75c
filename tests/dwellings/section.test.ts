// The section drawing of a build-up (src/lib/dwellings/section.ts, section-svg.ts): layers to scale,
// members at their spacing, the dew-point line and where condensation forms. The dew point is checked
// against psychrolib (ASHRAE Handbook — Fundamentals 2017, chapter 1, Hyland–Wexler formulation),
// an outside library; the drawing's proportions are this product's own choices (no source). Build-ups
// and climates are constructed inputs, not real sites or products.
import { mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import psychrolib from 'psychrolib';
import { describe, expect, it } from 'vitest';
import { analyseElement, type ElementInput } from '../../src/lib/physics';
import {
	DEFAULT_CENTRES_MM,
	MIN_BAND_SHARE,
	sectionDrawing,
	sectionFill,
	sectionScale
} from '../../src/lib/dwellings/section';
import { sectionCaption, sectionSvg } from '../../src/lib/dwellings/section-svg';
import { coolClimate } from '../physics/helpers';

psychrolib.SetUnitSystem(psychrolib.SI);

const timberFrame = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 4 },
		{ name: 'Polythene vapour control', thicknessMm: 0.2, resistance: 0, sd: 50 },
		{
			name: 'Mineral wool between studs',
			thicknessMm: 140,
			lambda: 0.035,
			mu: 1,
			bridge: { lambda: 0.13, widthMm: 38, centresMm: 600, mu: 50, name: 'Softwood studs' }
		},
		{ name: 'OSB', thicknessMm: 12, lambda: 0.13, mu: 150 },
		{ name: 'Ventilated cavity', thicknessMm: 25, air: 'well-ventilated' },
		{ name: 'Facing brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
	],
	internal: { temperature: 20, humidityClass: 3 },
	climate: coolClimate()
});

/** Insulation outside-lined with a vapour-tight sheet: condensation behind the sheet in winter. */
const condensingWall = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'Dense block', thicknessMm: 100, lambda: 1.1, mu: 10 },
		{ name: 'Mineral wool batts', thicknessMm: 100, lambda: 0.035, mu: 1 },
		{ name: 'Bitumen sheet', thicknessMm: 4, lambda: 0.23, sd: 200 },
		{ name: 'Render', thicknessMm: 15, lambda: 1, mu: 15 }
	],
	internal: { temperature: 20, humidityClass: 4 },
	climate: coolClimate()
});

describe('sectionDrawing', () => {
	it('draws each layer from its position in the result, and a thin membrane wider than to scale', () => {
		const input = timberFrame();
		const result = analyseElement(input);
		const d = sectionDrawing(input, result);
		expect(d.totalMm).toBeCloseTo(12.5 + 0.2 + 140 + 12 + 25 + 102, 9);
		expect(d.bands.map((b) => [b.fill, b.thin])).toEqual([
			['lining', false],
			['membrane', true],
			['insulation', false],
			['timber', false],
			['air', false],
			['masonry', false]
		]);
		const x = sectionScale(d.bands, d.totalMm, 1000);
		expect(x(0)).toBe(0);
		expect(x(d.totalMm)).toBeCloseTo(1000, 9);
		// the membrane takes MIN_BAND_SHARE; the others share the rest in proportion to their thickness
		const rest = 1000 * (1 - MIN_BAND_SHARE);
		const thick = d.totalMm - 0.2;
		expect(x(12.5)).toBeCloseTo((12.5 / thick) * rest, 9);
		expect(x(12.7) - x(12.5)).toBeCloseTo(1000 * MIN_BAND_SHARE, 9);
		expect(x(12.7 + 140) - x(12.7)).toBeCloseTo((140 / thick) * rest, 9);
	});

	it('draws the studs at their spacing, the first half a spacing in', () => {
		const input = timberFrame();
		const d = sectionDrawing(input, analyseElement(input));
		expect(d.heightMm).toBe(2.5 * 600);
		expect(d.members.map((m) => [m.layerIndex, m.alongMm, m.widthMm, m.fill])).toEqual([
			[2, 281, 38, 'timber'],
			[2, 881, 38, 'timber'],
			[2, 1481, 19, 'timber'] // cut by the drawing's edge
		]);
		// a bridge given by its fraction alone is drawn at 600 mm centres
		const byFraction = timberFrame();
		byFraction.layers[2].bridge = { lambda: 0.13, fraction: 0.15 };
		const f = sectionDrawing(byFraction, analyseElement(byFraction));
		expect(f.members[0].widthMm).toBeCloseTo(0.15 * DEFAULT_CENTRES_MM, 9);
	});

	it('gives the dew point of the vapour pressure at every point, as psychrolib does', () => {
		const input = condensingWall();
		const result = analyseElement(input);
		const d = sectionDrawing(input, result);
		const profile = result.condensation!.vapourProfile;
		expect(d.month).toBe(profile.month);
		expect(d.dewPoint).toHaveLength(profile.points.length);
		profile.points.forEach((p, i) => {
			// Hyland–Wexler against the standard's Magnus-type formula: within 0.1 K over this range
			const ref = psychrolib.GetTDewPointFromVapPres(p.temperature, p.vapourPressure);
			expect(Math.abs(d.dewPoint[i].temperature - ref)).toBeLessThan(0.1);
		});
		// 20 °C at 50 % (1 169 Pa): dew point 9.3 °C (psychrolib; handbook tables give the same to 0.1 K)
		expect(psychrolib.GetTDewPointFromVapPres(20, 0.5 * psychrolib.GetSatVapPres(20))).toBeCloseTo(9.3, 1);
	});

	it('marks condensation where that month forms it: behind the bitumen sheet', () => {
		const input = condensingWall();
		const result = analyseElement(input);
		expect(result.condensation!.outcome).not.toBe('none');
		const d = sectionDrawing(input, result);
		// the interface between the wool and the sheet, 200 mm from the inside surface
		expect(d.condensationMm).toEqual([200]);
		// there the temperature has fallen to the dew point
		const at = d.temperature.findIndex((p) => Math.abs(p.positionMm - 200) < 1e-9);
		expect(d.temperature[at].temperature - d.dewPoint[at].temperature).toBeLessThan(0.05);
		expect(sectionCaption(d)).toMatch(/the month with the most condensation/);
	});

	it('draws the design-temperature line alone without a climate', () => {
		const input = { ...condensingWall(), climate: undefined };
		const d = sectionDrawing(input, analyseElement(input));
		expect(d.month).toBeNull();
		expect(d.dewPoint).toEqual([]);
		expect(d.insideTemperature).toBe(20);
		expect(sectionCaption(d)).toMatch(/no climate/);
	});
});

describe('sectionFill', () => {
	it("takes the library's category first, then what the name and values say", () => {
		const l = (name: string, extra: Partial<ElementInput['layers'][number]> = {}) => ({
			name,
			thicknessMm: 50,
			lambda: 0.5,
			...extra
		});
		expect(sectionFill(l('Board X', { plausible: { category: 'insulation' } }))).toBe('insulation');
		expect(sectionFill(l('PIR board'))).toBe('insulation');
		expect(sectionFill(l('Anything', { lambda: 0.03 }))).toBe('insulation');
		expect(sectionFill(l('Clay brick'))).toBe('masonry');
		expect(sectionFill(l('Screed'))).toBe('concrete');
		expect(sectionFill(l('Cavity', { lambda: undefined, air: 'unventilated' }))).toBe('air');
		expect(sectionFill(l('Given R', { lambda: undefined, resistance: 0.2 }))).toBe('resistance');
		expect(sectionFill(l('Foil', { thicknessMm: 1 }))).toBe('membrane');
	});
});

describe('sectionSvg', () => {
	it('escapes what the user typed', () => {
		const input = timberFrame();
		input.layers[0].name = '<script>alert("x")</script> & board';
		const svg = sectionSvg(sectionDrawing(input, analyseElement(input)));
		expect(svg).not.toContain('<script>');
		expect(svg).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; board');
	});

	it('writes the three drawings of the closing note to a folder (SECTION_OUT), for looking at', () => {
		const dir = process.env.SECTION_OUT ?? path.join(tmpdir(), 'envelo-sections');
		mkdirSync(dir, { recursive: true });
		const ground: ElementInput = {
			heatFlow: 'downward',
			layers: [
				{ name: 'Screed', thicknessMm: 65, lambda: 1.15, mu: 50 },
				{ name: 'PIR board', thicknessMm: 100, lambda: 0.022, mu: 60 },
				{ name: 'Polythene DPM', thicknessMm: 0.3, resistance: 0, sd: 100 },
				{ name: 'Concrete slab', thicknessMm: 150, lambda: 1.35, mu: 80 }
			],
			ground: { perimeterM: 30, areaM2: 50 },
			internal: { temperature: 20, humidityClass: 3 }
		};
		for (const [name, input] of [
			['timber-frame', timberFrame()],
			['condensing-wall', condensingWall()],
			['ground-floor', ground]
		] as const) {
			const svg = sectionSvg(sectionDrawing(input, analyseElement(input)), { id: name });
			expect(svg.startsWith('<svg')).toBe(true);
			writeFileSync(path.join(dir, `${name}.svg`), svg);
		}
	});
});
