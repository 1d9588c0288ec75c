/** Expected failures of the dwellings and elements modules; routes turn them into 400/404/409. */
export type FieldIssue = { path: string; message: string };

/** Input that does not pass validation: each issue names the field and why. */
export class ValidationError extends Error {
	readonly status = 400;
	readonly issues: FieldIssue[];
	constructor(issues: FieldIssue[], message = 'Some fields need attention.') {
		super(message);
		this.name = 'ValidationError';
		this.issues = issues;
	}
}

/** The record does not exist in the caller's organisation (another organisation's ids look the same). */
export class NotFoundError extends Error {
	readonly status = 404;
	constructor(what = 'Not found') {
		super(what);
		this.name = 'NotFoundError';
	}
}

/** A stale version (somebody saved in between) or a state that refuses the change. */
export class ConflictError extends Error {
	readonly status = 409;
	readonly current?: number;
	constructor(message: string, current?: number) {
		super(message);
		this.name = 'ConflictError';
		this.current = current;
	}
}

export const STALE_MESSAGE =
	'This was changed by someone else after you opened it. Reload to see their changes; your edits have not been saved.';

export function pgCode(e: unknown): string | undefined {
	return typeof e === 'object' && e !== null && 'code' in e
		? String((e as { code: unknown }).code)
		: undefined;
}
export const PG_UNIQUE_VIOLATION = '23505';
export const PG_FOREIGN_KEY_VIOLATION = '23503';
