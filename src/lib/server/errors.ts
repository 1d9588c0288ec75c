/**
 * The one family of expected refusals. Services throw these; `errorResponse` in `./http.ts` turns each
 * into its JSON answer, and form actions turn them into `fail()`. Anything else is unexpected and goes
 * to `handleError` (a 500 with a reference).
 */
import type { FieldIssue } from '$lib/validation';

export type { FieldIssue };

export type RefusalStatus = 400 | 403 | 404 | 409 | 413 | 422;

/** An expected refusal: its HTTP status, a message for the person, and what else its answer carries. */
export class AppError extends Error {
	constructor(
		readonly status: RefusalStatus,
		message: string,
		/** Members of the JSON answer beside `message` (`issues`, `currentVersion`, `line`…). */
		readonly extra: Record<string, unknown> = {}
	) {
		super(message);
		this.name = new.target.name;
	}

	/** The fields or lines at fault, when the answer names them. */
	get issues(): FieldIssue[] {
		return Array.isArray(this.extra.issues) ? (this.extra.issues as FieldIssue[]) : [];
	}

	/** Values that are valid but unusual, which the person must confirm (422). */
	get warnings(): FieldIssue[] {
		return Array.isArray(this.extra.warnings) ? (this.extra.warnings as FieldIssue[]) : [];
	}

	/** The JSON answer. */
	body(): Record<string, unknown> {
		return { message: this.message, ...this.extra };
	}
}

/** Input that does not pass: each issue names the field (or the line) and why. 422: valid but unusual. */
export class ValidationError extends AppError {
	constructor(
		issues: FieldIssue[],
		message = 'Some fields need attention.',
		extra: Record<string, unknown> = {},
		status: 400 | 413 | 422 = 400
	) {
		super(status, message, { issues, ...extra });
	}
}

/** The caller's role or relation to the record does not allow this. */
export class ForbiddenError extends AppError {
	constructor(message: string, extra: Record<string, unknown> = {}) {
		super(403, message, extra);
	}
}

/** No such record in the caller's organisation (another organisation's ids answer the same). */
export class NotFoundError extends AppError {
	constructor(message = 'Not found.', extra: Record<string, unknown> = {}) {
		super(404, message, extra);
	}
}

/** A stale version (somebody saved in between) or a state that refuses the change. */
export class ConflictError extends AppError {
	/** The version now stored, when the conflict is a stale save. */
	readonly current?: number;
	constructor(message: string, extra: Record<string, unknown> & { currentVersion?: number | null } = {}) {
		super(409, message, extra);
		this.current = extra.currentVersion ?? undefined;
	}
}

export const STALE_MESSAGE =
	'This was changed by someone else after you opened it. Reload to see their changes; your edits have not been saved.';

/** PostgreSQL error codes that services turn into plain messages. */
export const PG_UNIQUE_VIOLATION = '23505';
export const PG_FOREIGN_KEY_VIOLATION = '23503';

/** The SQLSTATE of a database error, if it is one. */
export function pgCode(e: unknown): string | undefined {
	return typeof e === 'object' && e !== null && 'code' in e
		? String((e as { code: unknown }).code)
		: undefined;
}
