/**
 * The one family of expected refusals. Services throw these; `errorResponse` in `./http.ts` turns each
 * into its JSON answer, and form actions turn them into `fail()`. Anything else is unexpected and goes
 * to `handleError` (a 500 with a reference).
 */
import { CalculationInputError } from '$lib/physics/calc-parse';
import type { FieldIssue } from '$lib/validation';

export type { FieldIssue };

export type RefusalStatus = 400 | 403 | 404 | 409 | 413 | 422 | 429 | 503;

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

/** Too many requests of one kind from one member in a while: wait and try again (429, Retry-After). */
export class RateLimitedError extends AppError {
	constructor(
		message: string,
		/** seconds the client should wait before trying again */
		readonly retryAfter: number
	) {
		super(429, message);
	}
}

/** The database (or another service Envelo needs) cannot be reached: try again shortly (503, Retry-After). */
export class UnavailableError extends AppError {
	/** seconds the client should wait before trying again */
	readonly retryAfter = 5;
	constructor(message = 'Envelo cannot reach its database just now. Try again in a few seconds.') {
		super(503, message);
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

/** A unique-constraint violation as the given refusal (the name or reference is taken); any other error as it is. */
export function uniqueViolationAs(e: unknown, refusal: AppError): unknown {
	return pgCode(e) === PG_UNIQUE_VIOLATION ? refusal : e;
}

/** A save must carry the version the caller loaded; else 409 with the version now stored. */
export function assertVersion(stored: number, loaded: number): void {
	if (stored !== loaded) throw new ConflictError(STALE_MESSAGE, { currentVersion: stored });
}

/** SQLSTATEs and driver errors of a database that cannot be reached or is shutting down. */
const UNREACHABLE_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ETIMEDOUT',
	'EPIPE',
	'57P01',
	'57P02',
	'57P03',
	'08000',
	'08001',
	'08003',
	'08006'
]);
// A transaction whose connection PostgreSQL ended (a restart, a crash) fails on its ROLLBACK with the
// driver's "Client has encountered a connection error and is not queryable".
const UNREACHABLE_TEXT =
	/Connection terminated|Connection ended unexpectedly|connection error and is not queryable|Timeout acquiring a connection|connect ECONNREFUSED|the database system is (starting up|shutting down|in recovery mode)/i;

/**
 * The refusal an error stands for: an AppError as it is; bad input that only the database noticed (a
 * malformed id, a zero byte in text) as a 400 that says so; a database that cannot be reached as a 503.
 * Null for anything else, which is a fault of Envelo's own (500 with a reference).
 */
export function refusalOf(e: unknown): AppError | null {
	if (e instanceof AppError) return e;
	// a calculation core's own refusal, of input that no schema before it caught: the fields it names
	if (e instanceof CalculationInputError) return new ValidationError(e.issues);
	const code = pgCode(e);
	if (code === '22P02' && /uuid/i.test(String((e as Error).message))) {
		return new ValidationError(
			[{ path: '(id)', message: 'is not a valid id' }],
			'An id in the request is not a valid id.'
		);
	}
	if (code === '22021' || code === '22P05') {
		return new ValidationError(
			[{ path: '(text)', message: 'contains a zero byte (U+0000)' }],
			'Text in the request contains a zero byte (U+0000), which cannot be stored: remove it and try again.'
		);
	}
	if ((code && UNREACHABLE_CODES.has(code)) || UNREACHABLE_TEXT.test(String((e as Error)?.message ?? ''))) {
		return new UnavailableError();
	}
	return null;
}
