/** zod schemas for limit tables (maximum U by element kind), shared by the pages, the JSON API and the server. */
import { z } from 'zod';
import { ELEMENT_KINDS, type ElementKind } from '$lib/dwellings/kinds';
import { optionalText, requiredText } from '$lib/validation';
import { versionSchema } from '$lib/dwellings/schema';

/** The kinds a limit table may name (all of them, windows and doors included). */
export const LIMIT_KINDS: readonly ElementKind[] = ELEMENT_KINDS;

const maxU = z
	.number({ error: 'must be a number in W/(m²·K)' })
	.gt(0, 'must be greater than 0 W/(m²·K)')
	.lte(10, 'must be at most 10 W/(m²·K)');

export const limitValuesSchema = z
	.partialRecord(z.enum(ELEMENT_KINDS, { error: 'is not an element kind' }), maxU, {
		error: 'must be an object of element kind → maximum U'
	})
	.refine((v) => Object.values(v).some((x) => x !== undefined), {
		message: 'give a maximum U for at least one element kind'
	});

export const limitTableInputSchema = z.object({
	name: requiredText('name', 120),
	edition: requiredText('edition', 60),
	dated: z.iso
		.date({ error: 'dated must be a date written YYYY-MM-DD' })
		.nullish()
		.transform((v) => v ?? null),
	source: optionalText('source', 500),
	isDefault: z.boolean({ error: 'isDefault must be true or false' }).optional(),
	limits: limitValuesSchema
});
export type LimitTableInput = z.input<typeof limitTableInputSchema>;

/** A replacement of a limit table: every field, and the version the caller loaded (a stale one is refused). */
export const limitTableUpdateSchema = limitTableInputSchema.extend({ version: versionSchema });
export type LimitTableUpdate = z.input<typeof limitTableUpdateSchema>;
