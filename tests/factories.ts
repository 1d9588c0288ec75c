// Typed factories for server tests: each call makes fresh rows with unique names, so no test depends
// on another's leftovers.
import { randomUUID, randomBytes } from 'node:crypto';
import knex, { type Knex } from 'knex';
import type { Role } from '../src/lib/members/roles';

export const hasDatabase = Boolean(process.env.TEST_DATABASE_URL);

let testDb: Knex | null = null;
/** A Knex instance on the test database, for arranging and asserting. */
export function tdb(): Knex {
	testDb ??= knex({ client: 'pg', connection: process.env.TEST_DATABASE_URL, pool: { min: 0, max: 4 } });
	return testDb;
}

export async function makeOrganisation(name = `Test org ${randomBytes(3).toString('hex')}`) {
	const id = randomUUID();
	await tdb()('organisations').insert({ id, name, slug: `t-${id}` });
	return { id, name };
}

export async function makeMember(organisationId: string, role: Role = 'assessor', name?: string) {
	const id = randomUUID();
	const email = `${role}-${id.slice(0, 8)}@example.test`;
	await tdb()('users').insert({
		id,
		email,
		name: name ?? `${role} ${id.slice(0, 4)}`,
		emailVerified: new Date()
	});
	await tdb()('memberships').insert({ organisation_id: organisationId, user_id: id, role });
	return { id, email, role, organisationId };
}

/** A signed-in session row, as Auth.js would write it; returns the cookie value. */
export async function makeSession(userId: string) {
	const token = randomBytes(24).toString('hex');
	await tdb()('sessions').insert({ userId, sessionToken: token, expires: new Date(Date.now() + 3600_000) });
	return token;
}

/** An organisation with one member of each role. */
export async function makeTeam() {
	const org = await makeOrganisation();
	const [admin, assessor, supervisor] = await Promise.all([
		makeMember(org.id, 'admin'),
		makeMember(org.id, 'assessor'),
		makeMember(org.id, 'supervisor')
	]);
	return { org, admin, assessor, supervisor };
}

/** The shape requireRole() reads, for calling server modules and route handlers directly. */
export function fakeEvent(
	member: { id: string; email: string; role: Role; organisationId: string } | null,
	path = '/dwellings'
) {
	return {
		url: new URL(`http://127.0.0.1${path}`),
		locals: {
			user: member ? { id: member.id, email: member.email, name: null } : null,
			membership: member
				? { organisationId: member.organisationId, organisationName: 'Test', role: member.role }
				: null
		}
	};
}

type TestMember = { id: string; email: string; role: Role; organisationId: string };
/** The Member shape server modules take, from a test member. */
export const asMember = (m: TestMember) => ({
	user: { id: m.id, email: m.email, name: null },
	organisationId: m.organisationId,
	organisationName: 'Test',
	role: m.role
});

/** Calls a +server.ts handler as SvelteKit would; thrown `error()`s come back as their status and body. */
export async function callHandler(
	handler: (e: any) => Promise<Response> | Response,
	member: TestMember | null,
	method: string,
	url: string,
	opts: { params?: Record<string, string>; body?: unknown; csv?: string } = {}
) {
	const full = new URL(`http://127.0.0.1${url}`);
	const headers: Record<string, string> = {};
	let body: string | undefined;
	if (opts.csv !== undefined) {
		headers['content-type'] = 'text/csv';
		body = opts.csv;
	} else if (opts.body !== undefined) {
		headers['content-type'] = 'application/json';
		body = JSON.stringify(opts.body);
	}
	const event = {
		...fakeEvent(member, full.pathname),
		url: full,
		params: opts.params ?? {},
		request: new Request(full, { method, headers, body })
	};
	try {
		const res = await handler(event);
		const text = await res.text();
		return { status: res.status, text, json: text ? JSON.parse(text) : null };
	} catch (e: any) {
		if (typeof e?.status === 'number') {
			const text = JSON.stringify(e.body ?? {});
			return { status: e.status as number, text, json: e.body };
		}
		throw e;
	}
}
