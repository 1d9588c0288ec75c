/** The one mapping from zod's issues to the `{ path, message }` pairs that pages, the API and forms show. */
import { z } from 'zod';

/** One field at fault: its path (`months.3.relativeHumidity`), why, and for files the line. */
export type FieldIssue = { path: string; message: string; line?: number };

/** zod issues as field issues; an issue about the whole value gets `whole` as its path. */
export function fieldIssues(error: z.ZodError, whole = '(body)'): FieldIssue[] {
	return error.issues.map((i) => ({ path: i.path.map(String).join('.') || whole, message: i.message }));
}

/**
 * zod issues as one message per form field, keyed by path (`months.3.temperature`, `limits.flat-roof`);
 * a message for the whole of an array or object is kept under its own path (`months`, `limits`), one
 * about the whole form under `_`.
 */
export function formErrors(error: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const i of fieldIssues(error, '_')) out[i.path] ??= i.message;
	return out;
}

/** Up to five issues in one sentence, for the message of a JSON answer. */
export function issuesSentence(issues: readonly FieldIssue[], what = 'input'): string {
	const shown = issues
		.slice(0, 5)
		.map((i) => `${i.path}: ${i.message}`)
		.join('; ');
	return `The ${what} has ${issues.length} problem${issues.length === 1 ? '' : 's'}: ${shown}${issues.length > 5 ? '; …' : ''}`;
}

/** Required text, trimmed, with messages that name the field (`name is required`). */
export const requiredText = (label: string, max: number) =>
	z
		.string({ error: `${label} must be text` })
		.trim()
		.min(1, `${label} is required`)
		.max(max, `${label} must be at most ${max} characters`);

/** Optional text, trimmed; blank becomes null. */
export const optionalText = (label: string, max: number) =>
	z
		.string({ error: `${label} must be text` })
		.trim()
		.max(max, `${label} must be at most ${max} characters`)
		.nullish()
		.transform((v) => (v ? v : null));

/** A calendar date written YYYY-MM-DD between 1900 and 2200; one message, for the first thing wrong. */
export const isoDate = z
	.string({ error: 'must be a date' })
	.regex(/^\d{4}-\d{2}-\d{2}$/, {
		message: 'must be a date written YYYY-MM-DD, e.g. 2024-03-01',
		abort: true
	})
	.refine(
		(s) => {
			const d = new Date(`${s}T00:00:00Z`);
			return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
		},
		{ message: 'is not a real calendar date', abort: true }
	)
	.refine((s) => {
		const year = Number(s.slice(0, 4));
		return year >= 1900 && year <= 2200;
	}, 'must be a date between the years 1900 and 2200');

/** The largest value of a PostgreSQL integer column: versions, positions and counts stay within it. */
export const PG_INT_MAX = 2_147_483_647;
/** The deepest page a list is asked for; beyond it the offset means nothing to a person. */
export const PAGE_MAX = 100_000;
/** The most elements a dwelling holds, and so the largest position one can take. */
export const ELEMENTS_MAX = 10_000;

/** The version a person loaded, sent back with a change so that a stale save is refused. */
export const versionSchema = z
	.number({ error: 'is required: the version you loaded, for the check that nobody changed it since' })
	.int('must be a whole number')
	.min(1, 'must be ≥ 1')
	.max(PG_INT_MAX, 'is not a version Envelo gave out');

/**
 * A list's page (from 1) and page size (1 to `maxSize`), as a query string gives them: the fields every
 * paged list of the API and the pages takes.
 */
export const pageQuery = (defaultSize: number, maxSize: number) => ({
	page: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be 1 or more')
		.max(PAGE_MAX, `must be at most ${PAGE_MAX}`)
		.default(1),
	pageSize: z.coerce
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(1, 'must be 1 or more')
		.max(maxSize, `must be at most ${maxSize}`)
		.default(defaultSize)
});
