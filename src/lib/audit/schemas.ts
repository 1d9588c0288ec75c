import { z } from 'zod';
import { DECISIONS } from './flags';
import { DWELLING_STATUSES } from '$lib/dwellings/kinds';
import { isoDate } from '$lib/validation';

export const batchFilterSchema = z
	.object({
		assessorId: z.uuid('must be a member of the organisation').optional(),
		issuedFrom: isoDate.optional(),
		issuedTo: isoDate.optional(),
		statuses: z.array(z.enum(DWELLING_STATUSES, { error: 'is not a dwelling status' })).optional(),
		programme: z.string().trim().max(200, 'must be at most 200 characters').optional()
	})
	.refine((f) => !f.issuedFrom || !f.issuedTo || f.issuedFrom <= f.issuedTo, {
		path: ['issuedTo'],
		message: 'must be on or after the start date'
	});
export type BatchFilter = z.infer<typeof batchFilterSchema>;

export const samplingSchema = z.discriminatedUnion(
	'rule',
	[
		z.object({ rule: z.literal('all'), includeFlagged: z.boolean().default(true) }),
		z.object({
			rule: z.literal('random'),
			percent: z
				.number({ error: 'must be a number' })
				.gt(0, 'must be over 0 %')
				.lte(100, 'must be at most 100 %'),
			minimumPerAssessor: z
				.number({ error: 'must be a whole number' })
				.int('must be a whole number')
				.gte(0, 'must be 0 or more')
				.lte(1000, 'must be at most 1000')
				.default(0),
			includeFlagged: z.boolean().default(true)
		})
	],
	{ error: 'must be all or random' }
);

/** A new batch, from a filter or from a list of dwelling references (CSV). */
export const newBatchSchema = z
	.object({
		name: z.string().trim().min(1, 'give the batch a name').max(200, 'must be at most 200 characters'),
		source: z.enum(['filter', 'references'], { error: 'must be filter or references' }).default('filter'),
		filter: batchFilterSchema.default({}),
		references: z.array(z.string()).max(20000, 'at most 20 000 references').optional(),
		sampling: samplingSchema,
		seed: z
			.string()
			.trim()
			.max(64, 'must be at most 64 characters')
			.regex(/^[A-Za-z0-9._-]*$/, 'use letters, digits, dot, dash or underscore')
			.optional()
	})
	.refine((b) => b.source !== 'references' || (b.references && b.references.length > 0), {
		path: ['references'],
		message: 'give at least one dwelling reference'
	});
export type NewBatch = z.infer<typeof newBatchSchema>;

export const decisionSchema = z
	.object({
		decision: z.enum(DECISIONS, {
			error: 'choose Accepted, Accepted with advice or Returned for correction'
		}),
		comment: z.string().trim().max(5000, 'must be at most 5000 characters').default('')
	})
	.refine((d) => d.decision === 'accepted' || d.comment.length > 0, {
		path: ['comment'],
		message: 'say what the assessor should know or correct'
	});
export type DecisionInput = z.infer<typeof decisionSchema>;

export const resubmitSchema = z.object({
	comment: z.string().trim().min(1, 'say what you corrected').max(5000, 'must be at most 5000 characters')
});
