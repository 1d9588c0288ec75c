/** A change the data refuses (a name already taken, a record still in use): shown to the user as is. */
export class ConflictError extends Error {
	readonly status = 409;
	constructor(message: string) {
		super(message);
		this.name = 'ConflictError';
	}
}

/** PostgreSQL error codes the modules turn into plain messages. */
export const PG_UNIQUE_VIOLATION = '23505';
export const PG_FOREIGN_KEY_VIOLATION = '23503';

export function pgCode(e: unknown): string | undefined {
	return typeof e === 'object' && e !== null && 'code' in e
		? String((e as { code: unknown }).code)
		: undefined;
}
