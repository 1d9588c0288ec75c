// Characterisation test of analyseElement and buildThermalModel (and the inverse solve built on
// them): every case of element.characterisation.cases.ts — each element kind and heat-flow
// direction, air layers of each kind, bridged layers, roof spaces, floors on the ground, ΔU
// corrections, rounding, with and without climate and internal conditions, failing inputs — is run
// and its whole outcome (results, notes, warnings, error messages) compared bit for bit, key order
// included, with the stored fixture.
//
// The fixture is the engine's own earlier output (written once by
// element.characterisation.generate.ts from the code before a refactoring): a regression guard,
// NOT an outside reference. The physics itself is checked against its sources in the other files
// of tests/physics.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CASES, FIXTURE_PATH, runCase, SAME_AS_RAW } from './element.characterisation.cases';

const fixture = JSON.parse(readFileSync(FIXTURE_PATH, 'utf8')) as {
	about: string;
	engineVersion: string;
	cases: Record<string, Record<string, unknown>>;
};

describe('analyseElement: characterisation against its own earlier output (regression guard)', () => {
	it('every stored case still has an input and every input a stored case', () => {
		expect(CASES.map((c) => c.name).sort()).toEqual(Object.keys(fixture.cases).sort());
	});

	it('the parsed input (as the API and reports pass it) gives the same result as the raw input', () => {
		for (const c of CASES)
			if ('analyseParsed' in fixture.cases[c.name])
				expect(fixture.cases[c.name].analyseParsed, c.name).toStrictEqual(SAME_AS_RAW);
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
