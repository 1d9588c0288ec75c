import { describe, expect, it } from 'vitest';
import { materialValuesObject } from '../../src/lib/library/schema';

// A field that is wrong is said once, for the first thing wrong (common practice, no source).
const messages = (field: 'code' | 'sourceIssued', value: unknown) =>
	(materialValuesObject.shape[field].safeParse(value).error?.issues ?? []).map((i) => i.message);

describe('material values: one message per field', () => {
	it('an empty code is only "is required"', () => {
		expect(messages('code', '')).toEqual(['is required']);
		expect(messages('code', '-x')).toEqual([
			'may hold letters, digits, . _ - / and must start with a letter or digit'
		]);
	});

	it('a date written another way is told once how to write it', () => {
		expect(messages('sourceIssued', '01/03/2024')).toEqual([
			'must be a date written YYYY-MM-DD, e.g. 2024-03-01'
		]);
		expect(messages('sourceIssued', '2024-02-30')).toEqual(['is not a real calendar date']);
		expect(messages('sourceIssued', '1850-01-01')).toEqual([
			'must be a date between the years 1900 and 2200'
		]);
		expect(messages('sourceIssued', '2024-03-01')).toEqual([]);
	});
});
