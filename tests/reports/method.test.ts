// The method a report names for an element's U-value (src/lib/reports/method.ts).
// Sources of the expected numbers (hand calculations beside each):
//   - ISO 6946:2017: Rsi 0.10 (upward), 0.13 (horizontal), 0.17 (downward), Rse 0.04 m²·K/W, Table 7;
//     RT = Rsi + ΣR + Rse, 6.7.1; combined method R′T, R″T, e = (R′T − R″T)/(2·RT), 6.7.2; the
//     resistance Ru of a roof space above an insulated ceiling, 0.2 m²·K/W for tiles with felt or boards
//     under them, from the roof-space table (all from memory; the table is cited as the engine's note
//     cites it);
//   - ISO 13370:2017, 8.1 (slab on ground, from memory): B′ = A/(0.5·P), dt = w + λg·(Rsi + Rf + Rse)
//     with w 0.3 m and λg 2.0 W/(m·K) when not given; dt < B′: U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1),
//     dt ≥ B′: U = λg/(0.457·B′ + dt).
// Build-ups are constructed inputs, not real products.
import { describe, expect, it } from 'vitest';
import { analyseElement, type ElementInput } from '../../src/lib/physics';
import {
	COMBINED_METHOD,
	SERIES_METHOD,
	methodKind,
	methodParagraphs,
	roofSpaceOfResult
} from '../../src/lib/reports/method';

const DESIGN = { internal: 20, external: -5 };
const fx4 = (v: number) => v.toFixed(4);

describe('the method section names the method actually used', () => {
	it('plain layers: RT = Rsi + ΣR + Rse and U = 1/RT, word for word as before', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			designTemperatures: DESIGN,
			layers: [{ name: 'Brick', thicknessMm: 215, lambda: 0.77, mu: 10 }]
		});
		expect(methodKind(r)).toBe('series');
		expect(methodParagraphs(r)).toEqual([SERIES_METHOD]);
	});

	it('a slab on the ground with dt < B′: B′, dt, the branch, and the build-up’s own RT beside the floor’s U', () => {
		const input: ElementInput = {
			heatFlow: 'downward',
			designTemperatures: DESIGN,
			ground: { perimeterM: 40, areaM2: 100 },
			layers: [{ name: 'Concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 }]
		};
		const r = analyseElement(input);
		// Build-up: RT = 0.17 + 0.150/1.5 + 0.04 = 0.310 m²·K/W, Rf = 0.100.
		// B′ = 100/(0.5·40) = 5.00 m; dt = 0.3 + 2.0·(0.17 + 0.100 + 0.04) = 0.920 m < B′;
		// U = 4/(π·5 + 0.92)·ln(π·5/0.92 + 1) = 0.6963 W/(m²·K); 1/U = 1.436 m²·K/W.
		const u = ((2 * 2) / (Math.PI * 5 + 0.92)) * Math.log((Math.PI * 5) / 0.92 + 1);
		expect(r.uValue).toBeCloseTo(u, 10);
		expect(methodKind(r)).toBe('ground');
		const text = methodParagraphs(r).join('\n');
		expect(text).toContain('RT = Rsi + ΣR + Rse = 0.310 m²·K/W');
		expect(text).toContain('Rf = ΣR = 0.100 m²·K/W');
		expect(text).toContain('ISO 13370:2017, 8.1');
		expect(text).toContain('B′ = A/(0.5·P) = 100/(0.5·40) = 5.00 m');
		expect(text).toContain('dt = w + λg·(Rsi + Rf + Rse) = 0.30 + 2.00·(0.17 + 0.100 + 0.04) = 0.920 m');
		expect(text).toContain(`As dt < B′`);
		expect(text).toContain(`U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = ${fx4(u)} W/(m²·K)`);
		expect(text).toContain(`1/U = ${(1 / u).toFixed(3)} m²·K/W`);
		// The plain-layer statement would be wrong here: U is not 1/RT of the build-up.
		expect(text).not.toContain(SERIES_METHOD);
		expect(text).not.toContain('U = 1/RT');
	});

	it('a well-insulated slab, dt ≥ B′: the other branch', () => {
		const r = analyseElement({
			heatFlow: 'downward',
			designTemperatures: DESIGN,
			ground: { perimeterM: 20, areaM2: 20 },
			layers: [{ name: 'XPS', thicknessMm: 100, lambda: 0.034, mu: 150 }]
		});
		// Rf = 0.100/0.034 = 2.941; B′ = 20/(0.5·20) = 2.00 m; dt = 0.3 + 2.0·(0.17 + 2.941 + 0.04) = 6.602 m
		// ≥ B′; U = 2.0/(0.457·2 + 6.602) = 0.2661 W/(m²·K).
		const dt = 0.3 + 2 * (0.17 + 0.1 / 0.034 + 0.04);
		const u = 2 / (0.457 * 2 + dt);
		const text = methodParagraphs(r).join('\n');
		expect(text).toContain('B′ = A/(0.5·P) = 20/(0.5·20) = 2.00 m');
		expect(text).toContain(`= ${dt.toFixed(3)} m. As dt ≥ B′`);
		expect(text).toContain(`U = λg/(0.457·B′ + dt) = ${fx4(u)} W/(m²·K)`);
		expect(text).toContain(`RT = Rsi + ΣR + Rse = ${(0.17 + 0.1 / 0.034 + 0.04).toFixed(3)} m²·K/W`);
	});

	it('a ceiling under a roof space: Ru with the table the engine cites, and RT including it', () => {
		const r = analyseElement({
			heatFlow: 'upward',
			designTemperatures: DESIGN,
			roofSpace: 'tiles-with-felt-or-boards',
			layers: [
				{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 8 },
				{ name: 'Mineral wool', thicknessMm: 200, lambda: 0.04, mu: 1 }
			]
		});
		// RT = 0.10 + 0.0125/0.25 + 0.200/0.04 + 0.2 + 0.04 = 5.390 m²·K/W.
		expect(r.rTotal).toBeCloseTo(5.39, 10);
		const note = r.notes.find((n) => n.startsWith('Roof space above the ceiling'))!;
		const cited = /Ru = [^(]*\(([^)]*)\)/.exec(note)![1];
		expect(cited).toMatch(/^ISO 6946:2017/);
		expect(roofSpaceOfResult(r)!.source).toBe(cited);
		const text = methodParagraphs(r).join('\n');
		expect(methodKind(r)).toBe('roof-space');
		expect(text).toContain('RT = Rsi + ΣR + Ru + Rse');
		expect(text).toContain(`Ru = 0.20 m²·K/W is the thermal resistance of the roof space`);
		expect(text).toContain(`from ${cited}`);
		expect(text).toContain('tiles with felt or boards under them');
		expect(text).toContain('RT = 5.390 m²·K/W');
		expect(text).not.toContain(SERIES_METHOD);
	});

	it('a bridged layer: the combined method with its upper and lower limits and relative error', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			designTemperatures: DESIGN,
			layers: [
				{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
				{
					name: 'Mineral wool between studs',
					thicknessMm: 140,
					lambda: 0.04,
					mu: 1,
					bridge: { lambda: 0.13, fraction: 38 / 600 }
				},
				{ name: 'Sheathing', thicknessMm: 10, lambda: 0.2, sd: 50 },
				{ name: 'Render on board', thicknessMm: 20, lambda: 0.5, mu: 20 }
			]
		});
		// R′T = 3.430, R″T = 3.373 (see tests/reports/wording.test.ts for the hand calculation),
		// RT = 3.402, e = (3.4304 − 3.3735)/(2·3.4019) = 0.8 %.
		const text = methodParagraphs(r).join('\n');
		expect(methodKind(r)).toBe('combined');
		expect(text).toContain(COMBINED_METHOD);
		expect(text).toContain('R′T = 3.430 m²·K/W and R″T = 3.373 m²·K/W, so RT = 3.402 m²·K/W');
		expect(text).toContain('e = 0.8 %');
	});

	it('a bridged ceiling under a roof space: both, Ru in every section', () => {
		const r = analyseElement({
			heatFlow: 'upward',
			designTemperatures: DESIGN,
			roofSpace: 'tiles-no-felt',
			layers: [
				{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 8 },
				{
					name: 'Wool between joists',
					thicknessMm: 100,
					lambda: 0.04,
					mu: 1,
					bridge: { lambda: 0.13, fraction: 47 / 600 }
				}
			]
		});
		const text = methodParagraphs(r).join('\n');
		expect(methodKind(r)).toBe('combined-roof-space');
		expect(text).toContain(COMBINED_METHOD);
		expect(text).toContain('Ru = 0.06 m²·K/W');
		expect(text).toContain('to every section');
	});
});
