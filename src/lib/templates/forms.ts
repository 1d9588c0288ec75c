/**
 * The template pages' form schemas (flat, as a browser posts them) and their reading into a template
 * patch, which the template service judges with `templatePatchSchema` (the schema the JSON API uses too).
 */
import { z } from 'zod';
import { versionSchema } from '$lib/validation';
import type { TemplatePatch } from './schema';

/** The edit form: name, kind and description as typed, and the version the page was loaded with. */
export const templateFormSchema = z.object({
	name: z.string().default(''),
	kind: z.string().default(''),
	description: z.string().default(''),
	version: versionSchema
});
export type TemplateForm = z.infer<typeof templateFormSchema>;

/** A template as its edit form starts. */
export const templateFormValues = (t: {
	name: string;
	kind: string;
	description: string | null;
	version: number;
}): TemplateForm => ({ name: t.name, kind: t.kind, description: t.description ?? '', version: t.version });

/** The edit form as a template patch (the build-up is not changed here). */
export const templatePatchFromForm = (f: TemplateForm): TemplatePatch => ({
	name: f.name,
	kind: f.kind as TemplatePatch['kind'],
	description: f.description,
	version: f.version
});

const FORM_FIELDS = new Set<string>(Object.keys(templateFormSchema.shape));

/** A patch issue's path as the form's field; undefined for one the form has no field for. */
export const templateFieldOf = (path: string): keyof TemplateForm | undefined =>
	FORM_FIELDS.has(path) ? (path as keyof TemplateForm) : undefined;

/** Duplicate: a button only (the copy takes the template as stored). */
export const templateCopyFormSchema = z.object({});

/** Delete: the version the page showed (a stale one is refused). */
export const templateDeleteFormSchema = z.object({ version: versionSchema });
