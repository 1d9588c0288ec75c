import { describe, expect, it } from 'vitest';
import {
	materialFieldOf,
	materialFormSchema,
	materialFormValues,
	materialInputFromForm,
	reachCodes,
	type MaterialForm
} from '../../src/lib/library/forms';
import { materialValuesSchema } from '../../src/lib/library/schema';

// Reading the material form into the library's input. The board is invented for the test; the values are
// typical of a wood-fibre board (common practice, no source).
const blank: MaterialForm = materialFormSchema.parse({});
const typed = (over: Partial<MaterialForm>): MaterialForm => ({
	...blank,
	code: ' WF-040 ',
	name: 'Wood fibre board',
	category: 'insulation',
	lambdaKind: 'declared',
	lambda: '0,040',
	muDry: '5',
	...over
});

describe('materialInputFromForm', () => {
	it('reads a decimal comma or a point, and digits grouped by spaces', () => {
		const input = materialInputFromForm(typed({ density: '1 200', specificHeat: '2 100,5' }));
		expect(input).toMatchObject({
			code: 'WF-040',
			lambda: 0.04,
			muDry: 5,
			density: 1200,
			specificHeat: 2100.5
		});
		expect(materialInputFromForm(typed({ lambda: '0.040' })).lambda).toBe(0.04);
		expect(materialInputFromForm(typed({ lambda: '−0,5' })).lambda).toBe(-0.5);
	});

	it('gives a blank field as null, a blank manufacturer as generic, and passes the check box on', () => {
		const input = materialInputFromForm(typed({ indicative: true }));
		expect(input).toMatchObject({
			manufacturer: 'generic',
			resistance: null,
			sd: null,
			source: null,
			sourceIssued: null,
			notes: null,
			indicative: true
		});
		expect(materialValuesSchema.safeParse(input).success).toBe(true);
	});

	it('passes text that is not a number on, so the library names the field and why', () => {
		const input = materialInputFromForm(typed({ lambda: 'O.035' }));
		expect(input.lambda).toBe('O.035');
		const parsed = materialValuesSchema.safeParse(input);
		expect(parsed.error?.issues.map((i) => [i.path.join('.'), i.message])).toContainEqual([
			'lambda',
			"'O.035' is not a number"
		]);
	});

	it('gives a stored material back as the form shows it, and reads it back unchanged', () => {
		const form = materialFormValues({
			code: 'WF-040',
			name: 'Wood fibre board',
			manufacturer: 'generic',
			category: 'insulation',
			lambda: 0.04,
			lambdaKind: 'declared',
			muDry: 5,
			resistance: null,
			indicative: false
		});
		expect(form).toMatchObject({ lambda: '0.04', muDry: '5', resistance: '', sd: '', notes: '' });
		expect(materialInputFromForm(form)).toMatchObject({ lambda: 0.04, muDry: 5, resistance: null });
	});
});

describe('materialFieldOf', () => {
	it("maps the library's paths to the form's fields; a whole-row issue has none", () => {
		expect(materialFieldOf('lambda')).toBe('lambda');
		expect(materialFieldOf('thicknessMaxMm')).toBe('thicknessMaxMm');
		expect(materialFieldOf('(row)')).toBeUndefined();
		expect(materialFieldOf('confirmWarnings')).toBeUndefined();
	});
});

describe('reachCodes', () => {
	it('asks about codes that are neither blank nor longer than 200 characters', () => {
		expect(reachCodes(['WF-040', '', 'x'.repeat(201)])).toEqual(['WF-040']);
	});
});
