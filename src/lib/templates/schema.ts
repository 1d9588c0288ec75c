/**
 * zod schemas for templates: reusable build-ups. A template's build-up is an element's build-up, checked
 * by the very same schema (`storedBuildUpSchema`), so a template keeps every field an element has.
 */
import { z } from 'zod';
import { ELEMENT_KINDS, GIVEN_U_KINDS, type ElementKind } from '$lib/dwellings/kinds';
import { storedBuildUpSchema, versionSchema } from '$lib/dwellings/schema';
import { optionalText, requiredText } from '$lib/validation';

/** Kinds that have a build-up (windows and doors take a given U-value instead). */
export const TEMPLATE_KINDS = ELEMENT_KINDS.filter((k) => !GIVEN_U_KINDS.includes(k)) as [
	ElementKind,
	...ElementKind[]
];

export const templateInputSchema = z.object({
	name: requiredText('name', 120),
	kind: z.enum(TEMPLATE_KINDS, {
		error: 'kind must be an element kind with a build-up (not a window or door)'
	}),
	description: optionalText('description', 2000),
	buildUp: storedBuildUpSchema
});

/** A partial update of a template: any of its fields, and the version the caller loaded (a stale one is refused). */
export const templatePatchSchema = templateInputSchema.partial().extend({ version: versionSchema });
export type TemplatePatch = z.input<typeof templatePatchSchema>;
