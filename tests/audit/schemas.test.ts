import { describe, expect, it } from 'vitest';
import { batchFilterSchema } from '$lib/audit/schemas';

// A batch filter's dates reach PostgreSQL as DATE comparisons; a day that does not exist must be
// refused here with the field named, not by the database as a server error. The calendar facts
// (February 2026 has 28 days; 2028 is a leap year) are common practice, no source.
describe('batch filter dates', () => {
	it('refuses a day that does not exist, naming the field', () => {
		const r = batchFilterSchema.safeParse({ issuedFrom: '2026-02-30' });
		expect(r.success).toBe(false);
		expect(r.error!.issues[0].path).toEqual(['issuedFrom']);
		expect(r.error!.issues[0].message).toBe('is not a real calendar date');
	});

	it('refuses a month 13 and a day 00 with one message each', () => {
		for (const issuedTo of ['2026-13-01', '2026-04-00', '2026-04-31']) {
			const r = batchFilterSchema.safeParse({ issuedTo });
			expect(r.success, issuedTo).toBe(false);
			expect(r.error!.issues, issuedTo).toHaveLength(1);
			expect(r.error!.issues[0].path).toEqual(['issuedTo']);
		}
	});

	it('accepts real days, including 29 February of a leap year', () => {
		expect(batchFilterSchema.safeParse({ issuedFrom: '2028-02-29', issuedTo: '2028-12-31' }).success).toBe(
			true
		);
	});

	it('still refuses an end before the start', () => {
		const r = batchFilterSchema.safeParse({ issuedFrom: '2026-05-02', issuedTo: '2026-05-01' });
		expect(r.success).toBe(false);
		expect(r.error!.issues[0].path).toEqual(['issuedTo']);
	});
});
