/**
 * The limit-table pages' forms, as a browser posts them (text; the limits as one text per element kind,
 * in the order of `LIMIT_KINDS`), and their reading into the shared schema's input
 * (`limitTableInputSchema`, the one the JSON API uses).
 */
import { z } from 'zod';
import { formNumber } from '$lib/forms';
import { versionSchema } from '$lib/validation';
import { LIMIT_KINDS } from './schema';

/** A new limit table: name, edition, dated, source, isDefault, and a maximum U per element kind. */
export const limitTableFormSchema = z.object({
	name: z.string(),
	edition: z.string(),
	dated: z.string(),
	source: z.string(),
	isDefault: z.boolean(),
	/** one per kind of `LIMIT_KINDS`, in its order; blank where the table sets no limit */
	limit: z.array(z.string())
});
export type LimitTableForm = z.infer<typeof limitTableFormSchema>;

/**
 * The edit form: the same fields but the default (a button of its own), the version the page loaded (a
 * hidden field) and the confirmation that new limits re-judge the dwellings using the table.
 */
export const limitTableEditFormSchema = limitTableFormSchema
	.omit({ isDefault: true })
	.extend({ version: versionSchema, confirm: z.boolean() });
export type LimitTableEditForm = z.infer<typeof limitTableEditFormSchema>;

/** The delete button: the version shown. */
export const limitTableDeleteFormSchema = z.object({ version: versionSchema });

/** The make-default button: it posts nothing but itself. */
export const makeDefaultFormSchema = z.object({});

/** The empty form of a new limit table. */
export const blankLimitTableForm = (): LimitTableForm => ({
	name: '',
	edition: '',
	dated: '',
	source: '',
	isDefault: false,
	limit: LIMIT_KINDS.map(() => '')
});

type StoredLimitTable = {
	name: string;
	edition: string;
	dated: string | null;
	source: string | null;
	version: number;
	limits: Partial<Record<string, number>>;
};

/** A stored limit table as its edit form starts. */
export function limitTableFormOf(t: StoredLimitTable): LimitTableEditForm {
	return {
		name: t.name,
		edition: t.edition,
		dated: t.dated ?? '',
		source: t.source ?? '',
		limit: LIMIT_KINDS.map((kind) => (t.limits[kind] === undefined ? '' : String(t.limits[kind]))),
		version: t.version,
		confirm: false
	};
}

/**
 * The form's values as the table's input: each typed maximum U read (a decimal comma too; text is kept
 * for the schema to name), a blank kind left out, a blank date as none.
 */
export function limitTableInputFromForm(f: Omit<LimitTableForm, 'isDefault'> & { isDefault?: boolean }) {
	const limits: Record<string, number | string> = {};
	LIMIT_KINDS.forEach((kind, i) => {
		const v = formNumber(f.limit[i]);
		if (v !== undefined) limits[kind] = v;
	});
	const dated = f.dated.trim();
	return {
		name: f.name,
		edition: f.edition,
		dated: dated === '' ? null : dated,
		source: f.source,
		...(f.isDefault === undefined ? {} : { isDefault: f.isDefault }),
		limits
	};
}

/** The edit form's values as the table's replacement (`limitTableUpdateSchema`'s input). */
export function limitTableUpdateFromForm(f: LimitTableEditForm) {
	return { ...limitTableInputFromForm(f), version: f.version };
}

/**
 * The form field a path of the table's schema names (`limits.flat-roof` → `limit[2]`, `limits` → the
 * limits as a whole), or undefined for a path no field holds (it is shown as the form's message).
 */
export function limitTableFieldOf(path: string): string | undefined {
	if (['name', 'edition', 'dated', 'source', 'isDefault', 'version', 'confirm'].includes(path)) return path;
	if (path === 'limits') return 'limit._errors';
	const kind = /^limits\.(.+)$/.exec(path)?.[1];
	const i = kind === undefined ? -1 : LIMIT_KINDS.indexOf(kind as (typeof LIMIT_KINDS)[number]);
	return i >= 0 ? `limit[${i}]` : undefined;
}
