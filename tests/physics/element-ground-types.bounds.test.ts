// Every basement, edge-insulated slab and unheated space the element's schema accepts is calculated
// without a refusal from the ISO 13370 and ISO 6946 modules underneath (whose ranges the schema
// repeats), and gives a finite U above zero. Values are picked from each field's range ends and
// beyond (a fixed pseudo-random sequence, so a failure repeats). Common practice, no source.
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput } from '../../src/lib/physics';

let seed = 12345;
const rnd = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];

const R = [0, 0.001, 0.5, 3, 49.9, 50, 51];
const LEN = [0, 1e-6, 0.05, 1, 2, 9.99, 10, 11, 50, 51];
const U = [0, 0.1, 1.5, 10, 10.1];

function candidate(): Record<string, unknown> {
	const layers = [
		{ name: 'L', thicknessMm: pick([1, 20, 100, 400]), lambda: pick([0.01, 0.04, 1, 2.5]), mu: 10 }
	];
	const ground = {
		perimeterM: pick([0.5, 4, 40, 400]),
		areaM2: pick([1, 100, 5000]),
		...(rnd() < 0.5 ? { groundLambda: pick([0.1, 1.5, 3.5, 10]) } : {}),
		...(rnd() < 0.5 ? { wallThicknessM: pick([0, 0.3, 3]) } : {})
	};
	const kind = pick(['heated', 'unheated', 'edge', 'space']);
	if (kind === 'space')
		return {
			heatFlow: pick(['horizontal', 'upward', 'downward']),
			rsi: pick([undefined, 0, 0.13]),
			layers,
			unheatedSpace: {
				internalAreaM2: pick([0, 0.01, 20, 1e6]),
				externalElements: Array.from({ length: pick([0, 1, 3]) }, () => ({
					areaM2: pick([0, 5, 1e6]),
					uValue: pick(U)
				})),
				...(rnd() < 0.5 ? { airChangeRate: pick([0, 0.5, 100]) } : { airtightness: 'well-sealed' }),
				volumeM3: pick([0, 60, 1e7])
			}
		};
	if (kind === 'edge')
		return {
			heatFlow: 'downward',
			layers,
			ground: {
				...ground,
				edge: {
					orientation: pick(['horizontal', 'vertical']),
					widthM: pick(LEN),
					insulationThicknessM: pick([0, 0.05, 2]),
					...(rnd() < 0.5 ? { insulationR: pick(R) } : { insulationLambda: pick([0.001, 0.03, 10]) })
				}
			}
		};
	return {
		heatFlow: 'downward',
		rsi: pick([undefined, 0, 0.01, 0.17]),
		layers,
		ground: {
			...ground,
			basement: {
				kind,
				depthM: pick(LEN),
				wallR: pick(R),
				...(kind === 'unheated'
					? {
							floorR: pick(R),
							wallAboveGroundHeightM: pick(LEN),
							wallAboveGroundU: pick(U),
							airChangeRate: pick([0, 0.3, 100]),
							volumeM3: pick([0, 250, 1e7])
						}
					: {})
			}
		}
	};
}

describe('the new ground types and unheated spaces within the schema’s bounds', () => {
	it('an accepted input is always calculated, to a finite U above zero', () => {
		let accepted = 0;
		for (let i = 0; i < 3000; i++) {
			const raw = candidate();
			const p = parseElementInput(raw);
			if (!p.ok) continue;
			accepted++;
			const r = analyseElement(p.data);
			expect(Number.isFinite(r.uValue) && r.uValue > 0, JSON.stringify(raw)).toBe(true);
		}
		expect(accepted).toBeGreaterThan(300);
	});
});
