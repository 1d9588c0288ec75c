// H_T = Σ U·A + Σ ψ·L (ISO 13789, as recalled; point bridges left out), by hand.
import { describe, expect, it } from 'vitest';
import { sumJunctions, transmissionCoefficient, type JunctionBrief } from '../../src/lib/junctions/totals';

const j = (
	psi: number | null,
	lengthM: number,
	dimensionSystem: JunctionBrief['dimensionSystem'] = 'external'
): JunctionBrief => ({
	id: String(Math.random()),
	name: 'J',
	type: 'external-corner',
	lengthM,
	source: 'calculated',
	dimensionSystem,
	psi,
	psiSource: null,
	fRsi: null,
	surfacePass: null,
	engineVersion: null,
	version: 1,
	updatedAt: ''
});

describe('transmission heat loss with junctions', () => {
	it('adds ψ·L and names those left out and the systems met', () => {
		const t = sumJunctions([j(-0.1, 10), j(0.08, 25), j(null, 3), j(0.05, 4, 'internal')]);
		expect(t.sumPsiL).toBeCloseTo(-1 + 2 + 0.2, 12);
		expect(t.withoutPsi).toBe(1);
		expect(t.systems.sort()).toEqual(['external', 'internal']);
		expect(transmissionCoefficient(100, t)).toBeCloseTo(101.2, 12);
		expect(transmissionCoefficient(null, t)).toBeNull();
	});
});
