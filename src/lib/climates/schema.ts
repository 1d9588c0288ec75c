/**
 * zod schemas for climates, shared by the pages, the JSON API, the CSV import and the server. Messages
 * read on their own ("must be 0–100 %") and after a field path.
 */
import { z } from 'zod';
import { climateMonthSchema } from '$lib/physics';
import { requiredText } from '$lib/validation';
import { versionSchema } from '$lib/dwellings/schema';

/** Twelve months, each of 1–12 exactly once, returned in calendar order. */
export const climateMonthsSchema = z
	.array(climateMonthSchema, { error: 'must be a list of 12 months' })
	.superRefine((months, ctx) => {
		const seen = new Map<number, number>();
		months.forEach((m, i) => {
			const first = seen.get(m.month);
			if (first !== undefined) {
				ctx.addIssue({
					code: 'custom',
					path: [i, 'month'],
					message: `month ${m.month} appears twice`
				});
			} else seen.set(m.month, i);
		});
		if (months.length !== 12) {
			ctx.addIssue({
				code: 'custom',
				path: [],
				message: `${months.length} month${months.length === 1 ? '' : 's'} given, 12 needed`
			});
		}
	})
	.transform((months) => [...months].sort((a, b) => a.month - b.month));

export const climateInputSchema = z.object({
	name: requiredText('name', 120),
	source: requiredText('source', 500),
	illustrative: z.boolean({ error: 'illustrative must be true or false' }).default(false),
	months: climateMonthsSchema
});
export type ClimateInput = z.input<typeof climateInputSchema>;

/** A replacement of a climate: every field, and the version the caller loaded (a stale one is refused). */
export const climateUpdateSchema = climateInputSchema.extend({ version: versionSchema });
export type ClimateUpdate = z.input<typeof climateUpdateSchema>;
