import { describe, expect, it, afterAll } from 'vitest';
import knex from 'knex';
import { hasDatabase, tdb } from '../factories';
import { refusalOf, ValidationError, UnavailableError } from '../../src/lib/server/errors';

// What PostgreSQL refuses (SQLSTATE 22P02 invalid_text_representation, 22021 character_not_in_repertoire
// for a zero byte in text; PostgreSQL 15 documentation, Appendix A "PostgreSQL Error Codes") and what a
// closed port answers (ECONNREFUSED) are turned into refusals, not 500s. The errors below are real ones,
// made against the test database and a port nothing listens on.
describe.skipIf(!hasDatabase)('refusalOf', () => {
	afterAll(async () => {
		await tdb().destroy();
	});

	it('a malformed id the database saw is a 400 that says so', async () => {
		const e = await tdb()('dwellings')
			.where({ id: 'not-a-uuid' })
			.first()
			.catch((x) => x);
		const r = refusalOf(e);
		expect(r).toBeInstanceOf(ValidationError);
		expect(r?.status).toBe(400);
		expect(r?.message).toMatch(/not a valid id/);
	});

	it('a zero byte in text is a 400 that names it', async () => {
		const e = await tdb()('dwellings')
			.where({ reference: 'a\u0000b' })
			.first()
			.catch((x) => x);
		const r = refusalOf(e);
		expect(r?.status).toBe(400);
		expect(r?.message).toMatch(/zero byte/);
	});

	it('a database that cannot be reached is a 503 with a wait', async () => {
		const dead = knex({
			client: 'pg',
			connection: { host: '127.0.0.1', port: 9, user: 'x', password: 'x', database: 'x' },
			pool: { min: 0, max: 1 },
			acquireConnectionTimeout: 2000
		});
		const e = await dead.raw('select 1').catch((x) => x);
		await dead.destroy();
		const r = refusalOf(e);
		expect(r).toBeInstanceOf(UnavailableError);
		expect(r?.status).toBe(503);
	});

	it('a transaction whose connection the server ended is a 503, not a 500', async () => {
		// What a PostgreSQL restart does to a write in flight (found by `./docker-free-start.sh faults`):
		// the backend is terminated, the transaction's next query fails and knex reports the failed
		// ROLLBACK ("Client has encountered a connection error and is not queryable").
		const own = knex({ client: 'pg', connection: process.env.TEST_DATABASE_URL, pool: { min: 0, max: 2 } });
		const e = await own
			.transaction(async (trx) => {
				const [{ pid }] = (await trx.raw('select pg_backend_pid() as pid')).rows;
				await own.raw('select pg_terminate_backend(?)', [pid]);
				await new Promise((r) => setTimeout(r, 100));
				await trx.raw('select 1');
			})
			.catch((x) => x);
		await own.destroy();
		expect(String(e?.message)).toMatch(/connection|terminat/i);
		const r = refusalOf(e);
		expect(r).toBeInstanceOf(UnavailableError);
		expect(r?.status).toBe(503);
	});

	it('anything else stays a fault of Envelo (null: 500 with a reference)', () => {
		expect(refusalOf(new TypeError('x is undefined'))).toBeNull();
	});
});

describe('refusalOf a calculation core’s own refusal', async () => {
	const { CalculationInputError } = await import('../../src/lib/physics/calc-parse');
	const { analyseWindow } = await import('../../src/lib/physics/window');
	it('answers 400 with the fields the core names, not a 500', () => {
		// a frame of negative area: the window calculation (ISO 10077-1) refuses it by path
		let thrown: unknown;
		try {
			analyseWindow({ glazings: [], frames: [{ areaM2: -1, uValue: 1.4 }] });
		} catch (e) {
			thrown = e;
		}
		expect(thrown).toBeInstanceOf(CalculationInputError);
		const r = refusalOf(thrown);
		expect(r).toBeInstanceOf(ValidationError);
		expect(r!.status).toBe(400);
		expect((r as InstanceType<typeof ValidationError>).issues.map((i) => i.path)).toContain(
			'frames.0.areaM2'
		);
	});
});
