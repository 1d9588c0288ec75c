import knex, { type Knex } from 'knex';
import pg from 'pg';
import { building } from '$app/environment';
import { setting } from './config';
import type { ReferenceRows } from './tables';

// double precision and bigint counts come back as JS numbers, not strings.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));

function connectionString(): string {
	const url = setting('DATABASE_URL');
	if (!url && !building) {
		throw new Error('DATABASE_URL is not set: start Envelo with ./docker-free-start.sh');
	}
	return url ?? 'postgres://unused@127.0.0.1:1/unused';
}

/** The one Knex instance of the server. */
export const db: Knex = knex({
	client: 'pg',
	connection: connectionString(),
	pool: { min: 0, max: Number(setting('DB_POOL_MAX') ?? 10) }
});

/** A pg pool for Auth.js's adapter, which speaks SQL itself. */
export const authPool = new pg.Pool({ connectionString: connectionString(), max: 4 });

/** Knex or a transaction; functions that write accept either so callers can compose them. */
export type Db = Knex | Knex.Transaction;

/** An ILIKE pattern that finds `text` anywhere, its own %, _ and backslash matched as themselves. */
export const containsPattern = (text: string) => `%${text.replace(/[\\%_]/g, (c) => '\\' + c)}%`;

/**
 * The organisation's climate, limit table or template, locked until the transaction ends (so nobody
 * changes it meanwhile), or undefined when it has none by that id; the caller checks the version.
 */
export function lockRecord<T extends keyof ReferenceRows>(
	t: Db,
	table: T,
	organisationId: string,
	id: string
): Promise<ReferenceRows[T] | undefined> {
	return t(table).where({ organisation_id: organisationId, id }).forUpdate().first();
}
