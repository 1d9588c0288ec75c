// Characterisation test of the monthly Glaser cycle (runGlaser, and the condensation check of
// analyseElement built on it): every case of glaser.characterisation.cases.ts — timber-frame walls
// with a vapour-tight outer layer, warm flat roofs, masonry walls, humidity classes 1–5, climates
// with a warm month in which an interface dries out part-way, condensation at several interfaces at
// once, the start-month rules, chains with zero-sd groups — is run and its whole outcome compared
// bit for bit, key order included, with the stored fixture.
//
// The fixture is the engine's own earlier output (written once by
// glaser.characterisation.generate.ts from the code before the Glaser cycle was split into
// functions): a regression guard, NOT an outside reference. The physics itself is checked against
// its sources in glaser.test.ts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CASES, FIXTURE_PATH, runCase } from './glaser.characterisation.cases';

interface StoredMonth {
	month: number;
	rate: number[];
	accumulatedAt: number[];
}
interface StoredGlaser {
	startMonth: number | null;
	condensesEveryMonth: boolean;
	months: StoredMonth[];
}
type Stored = { value: StoredGlaser | { condensation: StoredGlaser } } | { threw: unknown };

const fixture = JSON.parse(readFileSync(FIXTURE_PATH, 'utf8')) as {
	about: string;
	engineVersion: string;
	cases: Record<string, Stored>;
};

const glaserOf = (s: Stored): StoredGlaser | null =>
	'threw' in s ? null : 'condensation' in s.value ? s.value.condensation : s.value;
const stored = Object.values(fixture.cases)
	.map(glaserOf)
	.filter((g): g is StoredGlaser => g !== null);
/** The months of one result in the order of its cycle, from the start month. */
const inCycle = (g: StoredGlaser): StoredMonth[] =>
	Array.from({ length: 12 }, (_, i) => g.months[((g.startMonth ?? 1) - 1 + i) % 12]);

describe('runGlaser: characterisation against its own earlier output (regression guard)', () => {
	it('every stored case still has an input and every input a stored case', () => {
		expect(CASES.map((c) => c.name).sort()).toEqual(Object.keys(fixture.cases).sort());
	});

	// The fixture is only a guard if it holds the situations it is meant to guard.
	it('the stored cases include the situations they are meant to cover', () => {
		const starts = new Set(stored.map((g) => g.startMonth));
		expect(starts.has(null) && starts.has(1) && starts.has(12)).toBe(true);
		expect(stored.some((g) => g.condensesEveryMonth)).toBe(true);
		// some month with condensation forming at two interfaces or more at once
		expect(stored.some((g) => g.months.some((m) => m.rate.filter((r) => r > 0).length >= 2))).toBe(true);
		// some interface that dries out within a month while another one stays wet
		const driesWhileOtherWet = (g: StoredGlaser) =>
			inCycle(g).some(
				(m, i, cycle) =>
					i > 0 &&
					m.accumulatedAt.some((a, k) => a === 0 && cycle[i - 1].accumulatedAt[k] > 0) &&
					m.accumulatedAt.some((a) => a > 0)
			);
		expect(stored.some(driesWhileOtherWet)).toBe(true);
		const classes = CASES.flatMap((c) => (c.kind === 'element' ? [c.input.internal?.humidityClass] : []));
		for (const k of [1, 2, 3, 4, 5]) expect(classes).toContain(k);
		expect(Object.values(fixture.cases).some((s) => 'threw' in s)).toBe(true);
	});

	for (const c of CASES) {
		it(c.name, () => {
			const actual = runCase(c);
			const expected = fixture.cases[c.name];
			expect(actual).toStrictEqual(expected);
			// toStrictEqual ignores key order; the serialised result (API, stored reports) does not.
			expect(JSON.stringify(actual)).toBe(JSON.stringify(expected));
		});
	}
});
