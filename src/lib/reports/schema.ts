/** Request bodies of the report operations (forms and JSON API). */
import { z } from 'zod';

const uuid = (what: string) =>
	z.uuid({ error: (iss) => (iss.input === undefined ? 'is required' : `must be the id of ${what}`) });

export const issueSchema = z.object({
	dwellingId: uuid('a dwelling'),
	elementId: uuid('an element of the dwelling').nullish()
});

export const emailSchema = z.object({
	to: z
		.string({ error: 'is required' })
		.trim()
		.min(1, 'is required')
		.max(254, 'is too long')
		.pipe(z.email({ error: 'must be an e-mail address, e.g. client@example.com' })),
	message: z.string({ error: 'must be text' }).max(2000, 'must be at most 2000 characters').optional()
});
