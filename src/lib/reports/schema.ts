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

/** The reports page's issue buttons: the dwelling (no element) or one element; "yes" once confirmed. */
export const issueFormSchema = z.object({
	elementId: z.union([z.uuid(), z.literal('')]).default(''),
	/** "yes" once the person has confirmed; without it the action only asks for the confirmation. */
	confirmed: z.enum(['', 'yes']).default('')
});

/** The e-mail form of one issued report, as posted (the address and message are judged by `emailSchema`). */
export const emailFormSchema = z.object({
	reportId: z.uuid({ error: 'Choose a report.' }),
	to: z.string().default(''),
	message: z.string().default('')
});
export type EmailForm = z.infer<typeof emailFormSchema>;

/** The outbox's "try again" button. */
export const retryFormSchema = z.object({ mailId: z.uuid('Choose a message.') });
