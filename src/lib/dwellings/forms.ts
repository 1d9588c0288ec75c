/** Form schemas (plain strings, as a browser posts them) for the dwelling pages; the server module re-validates. */
import { z } from 'zod';
import { STAGES } from './schema';

export const dwellingFormSchema = z.object({
	reference: z
		.string()
		.trim()
		.min(1, 'Give the dwelling a reference, e.g. NF-014.')
		.max(60, 'At most 60 characters.'),
	address: z.string().trim().max(300, 'At most 300 characters.').default(''),
	programme: z.string().trim().max(120, 'At most 120 characters.').default(''),
	clientName: z.string().trim().max(160, 'At most 160 characters.').default(''),
	clientEmail: z
		.union([z.email('Enter an e-mail address such as name@example.test.'), z.literal('')])
		.default(''),
	assessorId: z.string().default(''),
	stage: z.enum(STAGES, { message: 'Choose design or as built.' }).default('design'),
	limitTableId: z.string().default(''),
	climateId: z.string().default(''),
	version: z.number().int().default(0)
});
export type DwellingForm = z.infer<typeof dwellingFormSchema>;

export const copyFormSchema = z.object({
	reference: z.string().trim().min(1, 'Give the copy its own reference.').max(60, 'At most 60 characters.'),
	address: z.string().trim().max(300, 'At most 300 characters.').default(''),
	/** "as-built" copies a design-stage dwelling as its as-built record */
	kind: z.enum(['copy', 'as-built']).default('copy')
});
