import { test, expect } from '@playwright/test';
import fc from 'fast-check';
import { randomBytes } from 'node:crypto';
import { db } from './helpers';

// Every JSON write route of the API, fed generated bodies through the real HTTP stack of the built app:
// random JSON, text that is not JSON, and valid bodies with one to three mutations (wrong types, huge
// numbers, NaN-like strings, zero bytes, deep nesting, long strings, extra and missing keys). Whatever
// comes in, the answer is never a 5xx, every 4xx is JSON with a message a person can read, and no answer
// takes 5 s or more (Envelo's own rules, common practice, no source).
//
// The requests go out with Node's fetch (keep-alive, several in flight) rather than Playwright's request
// context: the same HTTP stack on the server side, at a fraction of the client's cost per request.
//
// Writes that succeed stay inside an organisation this file makes for itself (its members, climates,
// limit tables, dwellings…), so the demo organisations the other suites read are never touched. Its
// batches and e-mails are awaited before the file ends, so no background work is left to the next file.
//
//   FUZZ_RUNS=20000         bodies per route (default 2000, about four minutes for every route on two
//                           cores); a route that is slow by nature takes a share
//   FUZZ_SEED=123           repeat a run exactly (every run prints its seed)
//   FUZZ_CONCURRENCY=4      requests in flight

const ORIGIN = `http://127.0.0.1:${process.env.APP_PORT ?? 4173}`;
const RUNS = Math.max(1, Number(process.env.FUZZ_RUNS ?? 2000));
const SEED = Number(process.env.FUZZ_SEED ?? Math.floor(Math.random() * 2 ** 31));
const CONCURRENCY = Math.max(1, Number(process.env.FUZZ_CONCURRENCY ?? 4));
const SLOW_MS = 5000;
/** Bodies stay under this many characters (the server takes 25 MB; a megabyte tells as much). */
const MAX_BODY = 1_000_000;

/* ------------------------------------------------------------------ bodies as JSON text */

/** A number (or anything) written into the JSON text exactly as given: 1e400, -0, 30-digit integers. */
class Raw {
	constructor(readonly text: string) {}
}
/** The version of a record, as the route last answered it (filled in when the body is sent). */
class Version {
	constructor(readonly key: string) {}
}
type Body = null | boolean | number | string | Raw | Version | Body[] | { [key: string]: Body };
type Obj = { [key: string]: Body };
type Path = (string | number)[];

const isObj = (v: unknown): v is Obj =>
	typeof v === 'object' && v !== null && !Array.isArray(v) && !(v instanceof Raw) && !(v instanceof Version);

/** Set an own key, `__proto__` included (a plain assignment would change the prototype instead). */
function put(o: Obj, key: string, value: Body) {
	Object.defineProperty(o, key, { value, enumerable: true, writable: true, configurable: true });
}

function clone(v: Body): Body {
	if (Array.isArray(v)) return v.map(clone);
	if (isObj(v)) {
		const o: Obj = {};
		for (const k of Object.keys(v)) put(o, k, clone(v[k]));
		return o;
	}
	return v;
}

/** Punctuation on the serialiser's stack, between the values. */
class Mark {
	constructor(readonly text: string) {}
}

/** The JSON text of a body; versions come from `versions`. Iterative, so deep nesting costs no stack. */
function toJson(v: Body, versions: Map<string, number>): string {
	const out: string[] = [];
	const stack: (Body | Mark)[] = [v];
	while (stack.length) {
		const x = stack.pop()!;
		if (x instanceof Mark || x instanceof Raw) out.push(x.text);
		else if (x instanceof Version) out.push(String(versions.get(x.key) ?? 1));
		else if (Array.isArray(x)) {
			out.push('[');
			stack.push(new Mark(']'));
			for (let i = x.length - 1; i >= 0; i--) {
				stack.push(x[i]);
				if (i > 0) stack.push(new Mark(','));
			}
		} else if (isObj(x)) {
			out.push('{');
			stack.push(new Mark('}'));
			const keys = Object.keys(x);
			for (let i = keys.length - 1; i >= 0; i--) {
				stack.push(x[keys[i]]);
				stack.push(new Mark((i > 0 ? ',' : '') + JSON.stringify(keys[i]) + ':'));
			}
		} else out.push(JSON.stringify(x) ?? 'null');
	}
	return out.join('');
}

/** Paths into a body (the body itself is []), at most `depth` levels deep and `max` of them. */
function pathsOf(v: Body, depth = 6, max = 2000): Path[] {
	const out: Path[] = [];
	const queue: [Body, Path][] = [[v, []]];
	for (let i = 0; i < queue.length && out.length < max; i++) {
		const [x, at] = queue[i];
		out.push(at);
		if (at.length >= depth) continue;
		if (Array.isArray(x)) x.slice(0, max).forEach((y, j) => queue.push([y, [...at, j]]));
		else if (isObj(x)) for (const k of Object.keys(x)) queue.push([x[k], [...at, k]]);
	}
	return out;
}

function getAt(v: Body, path: Path): Body {
	let x: Body = v;
	for (const p of path) x = Array.isArray(x) ? x[p as number] : isObj(x) ? x[p as string] : null;
	return x;
}

/* ------------------------------------------------------------------ mutations */

type Mutation =
	| { op: 'replace'; value: Body }
	| { op: 'drop' }
	| { op: 'extra'; key: string; value: Body }
	| { op: 'nul'; at: number }
	| { op: 'nest'; depth: number; asArray: boolean }
	| { op: 'repeat'; times: number };

const nil = '00000000-0000-0000-0000-000000000000';

/** Values of another type than the field wants. */
const wrongType = fc.oneof(
	fc.constant(null),
	fc.boolean(),
	fc.integer(),
	fc.double({ noNaN: true, noDefaultInfinity: true }),
	fc.string({ maxLength: 20 }),
	fc.constant([]),
	fc.constant({}),
	fc.array(fc.jsonValue({ maxDepth: 2 }), { maxLength: 4 }),
	fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue({ maxDepth: 1 }), { maxKeys: 4 })
) as fc.Arbitrary<Body>;

/** Numbers at and past the edges of a double, and integers past 2⁵³, some only expressible as text. */
const extremeNumber: fc.Arbitrary<Body> = fc.oneof(
	fc.constantFrom<Body>(
		new Raw('1e400'),
		new Raw('-1e400'),
		new Raw('1e-400'),
		new Raw('-0'),
		new Raw('123456789012345678901234567890'),
		new Raw('0.000000000000000000000000000001'),
		1.7976931348623157e308,
		-1.7976931348623157e308,
		5e-324,
		Number.MAX_SAFE_INTEGER + 2,
		-(2 ** 63),
		2 ** 31,
		2 ** 32,
		1e21,
		0,
		-1
	),
	fc.double({ min: -1e308, max: 1e308, noNaN: true })
);

/** Strings that a careless Number() or parseFloat() would turn into a number, or into NaN. */
const numberLikeText = fc.constantFrom<Body>(
	'NaN',
	'Infinity',
	'-Infinity',
	'1e999',
	'0x1F',
	' 12 ',
	'1,5',
	'١٢٣',
	'+5',
	'5e',
	'',
	'   ',
	'null',
	'undefined',
	'true',
	'0.1.2',
	'--1'
);

/** Text of other kinds: lone surrogates, direction marks, byte-order marks, emoji, a spreadsheet formula. */
const oddText: fc.Arbitrary<Body> = fc.oneof(
	fc.constantFrom<Body>(
		'\ud800',
		'\udfff',
		'a\ud800b',
		'\u202eevil',
		'\ufeffname',
		'Z\u0351\u0352\u0353\u0354',
		'😀',
		'line\u2028break',
		'=1+1',
		'<script>alert(1)</script>',
		"'; drop table dwellings; --",
		'%00',
		'\\u0000'
	),
	fc.string({ unit: 'binary', maxLength: 40 })
);

/** Long text: a kilobyte to a hundred kilobytes of one unit. */
const longText: fc.Arbitrary<Body> = fc
	.tuple(fc.integer({ min: 1000, max: 100_000 }), fc.constantFrom('x', 'é', '😀', ' ', '\ud800', '9'))
	.map(([n, unit]) => unit.repeat(n));

const dateText = fc.constantFrom<Body>(
	'2026-02-30',
	'0000-00-00',
	'9999-12-31',
	'2026-13-01',
	'2026-1-1',
	'20260101',
	'2026-02-28T25:00:00Z',
	'1899-12-31'
);

/** Keys a careless merge or lookup could trip on. */
const oddKey = fc.oneof(
	fc.constantFrom(
		'__proto__',
		'constructor',
		'prototype',
		'toString',
		'hasOwnProperty',
		'id',
		'organisationId',
		'organisation_id',
		'version',
		'',
		'a\u0000b',
		'x'.repeat(5000)
	),
	fc.string({ maxLength: 12 })
);

function mutationArb(ids: fc.Arbitrary<Body>): fc.Arbitrary<Mutation> {
	const replace = (value: fc.Arbitrary<Body>) => value.map((v): Mutation => ({ op: 'replace', value: v }));
	return fc.oneof(
		{ weight: 3, arbitrary: replace(wrongType) },
		{ weight: 3, arbitrary: replace(extremeNumber) },
		{ weight: 2, arbitrary: replace(numberLikeText) },
		{ weight: 2, arbitrary: replace(oddText) },
		{ weight: 1, arbitrary: replace(longText) },
		{ weight: 2, arbitrary: replace(ids) },
		{ weight: 1, arbitrary: replace(dateText) },
		{ weight: 3, arbitrary: fc.constant<Mutation>({ op: 'drop' }) },
		{
			weight: 3,
			arbitrary: fc
				.tuple(oddKey, fc.jsonValue({ maxDepth: 2 }) as fc.Arbitrary<Body>)
				.map(([key, value]): Mutation => ({ op: 'extra', key, value }))
		},
		{ weight: 2, arbitrary: fc.nat().map((at): Mutation => ({ op: 'nul', at })) },
		{
			weight: 1,
			arbitrary: fc
				.tuple(fc.integer({ min: 20, max: 5000 }), fc.boolean())
				.map(([depth, asArray]): Mutation => ({ op: 'nest', depth, asArray }))
		},
		{
			weight: 1,
			arbitrary: fc.integer({ min: 0, max: 20_000 }).map((times): Mutation => ({ op: 'repeat', times }))
		}
	);
}

/** The value a mutation puts where `old` was (undefined: remove it). */
function mutatedValue(old: Body, m: Mutation): Body | undefined {
	switch (m.op) {
		case 'replace':
			return m.value;
		case 'drop':
			return undefined;
		case 'nul': {
			const s = typeof old === 'string' ? old : String(toJson(old, new Map()));
			const i = s.length ? m.at % (s.length + 1) : 0;
			return s.slice(0, i) + '\u0000' + s.slice(i);
		}
		case 'nest': {
			let v: Body = old;
			for (let i = 0; i < m.depth; i++) v = m.asArray ? [v] : { a: v };
			return v;
		}
		case 'repeat': {
			// a list of many copies, kept to a few megabytes of JSON
			const size = toJson(old, new Map()).length + 1;
			return Array.from({ length: Math.min(m.times, Math.floor(MAX_BODY / size)) }, () => clone(old));
		}
		case 'extra':
			return old;
	}
}

/** A copy of `base` with the mutation applied at the `pick`-th of its paths. */
function mutate(base: Body, pick: number, m: Mutation): Body | undefined {
	const body = clone(base);
	const paths = pathsOf(body);
	const path = paths[pick % paths.length];
	if (m.op === 'extra') {
		// at the nearest object on the path (the body itself when none)
		for (let n = path.length; n >= 0; n--) {
			const target = getAt(body, path.slice(0, n));
			if (isObj(target)) {
				put(target, m.key, m.value);
				return body;
			}
		}
		return body;
	}
	if (path.length === 0) return mutatedValue(body, m);
	const parent = getAt(body, path.slice(0, -1));
	const key = path[path.length - 1];
	const value = mutatedValue(getAt(body, path), m);
	if (Array.isArray(parent)) {
		if (value === undefined) parent.splice(key as number, 1);
		else parent[key as number] = value;
	} else if (isObj(parent)) {
		if (value === undefined) delete parent[key as string];
		else put(parent, key as string, value);
	}
	return body;
}

/** Request texts that are not JSON, or JSON of the wrong shape altogether. */
const notJson = fc.oneof(
	fc.constantFrom(
		'{',
		'{"a":',
		'[1,2',
		"{'a':1}",
		'{"a":1,}',
		'NaN',
		'undefined',
		'\ufeff{}',
		'{"a":1}{"b":2}',
		'\u0000',
		'  ',
		'{"a":"\\ud800"}',
		'{"a":"\\u0000"}',
		'{"__proto__":{"polluted":true}}',
		'{"constructor":{"prototype":{"polluted":true}}}',
		'{"a":1e999999}',
		'['.repeat(100_000),
		'['.repeat(20_000) + ']'.repeat(20_000),
		'{"a":'.repeat(20_000) + '1' + '}'.repeat(20_000)
	),
	fc.string({ maxLength: 200 })
);

type Payload = { text: string } | { body: Body | undefined };

/** What one route is sent: random JSON (a fifth), text that is not JSON (a tenth), mutated valid bodies. */
function payloadArb(bases: fc.Arbitrary<Body>, ids: fc.Arbitrary<Body>): fc.Arbitrary<Payload> {
	const mutated = fc
		.tuple(bases, fc.array(fc.tuple(fc.nat(), mutationArb(ids)), { minLength: 1, maxLength: 3 }))
		.map(([base, ms]): Payload => {
			// Deep nesting last, and once: the mutations walk the body recursively.
			const ordered = [
				...ms.filter(([, m]) => m.op !== 'nest'),
				...ms.filter(([, m]) => m.op === 'nest').slice(0, 1)
			];
			let body: Body | undefined = base;
			for (const [pick, m] of ordered) body = body === undefined ? undefined : mutate(body, pick, m);
			return { body };
		});
	return fc.oneof(
		{ weight: 14, arbitrary: mutated },
		{ weight: 2, arbitrary: bases.map((b): Payload => ({ body: clone(b) })) },
		{ weight: 3, arbitrary: (fc.jsonValue({ maxDepth: 5 }) as fc.Arbitrary<Body>).map((body) => ({ body })) },
		{ weight: 2, arbitrary: notJson.map((text): Payload => ({ text })) }
	);
}

/* ------------------------------------------------------------------ the fuzz organisation */

type Role = 'admin' | 'assessor' | 'supervisor';
type Member = { id: string; email: string; cookie: string };

/** A member of the fuzz organisation, signed in the way Auth.js records it (a session row). */
async function addMember(orgId: string, tag: string, role: Role, name: string): Promise<Member> {
	const email = `fuzz-${tag}-${role}-${randomBytes(3).toString('hex')}@fuzz.example.test`;
	const [user] = await db()('users')
		.insert({ email, name, registration_number: `FZ-${tag}` })
		.returning('id');
	await db()('memberships').insert({ organisation_id: orgId, user_id: user.id, role });
	const token = randomBytes(24).toString('hex');
	await db()('sessions').insert({
		userId: user.id,
		sessionToken: token,
		expires: new Date(Date.now() + 4 * 3600_000)
	});
	return { id: user.id, email, cookie: `authjs.session-token=${token}` };
}

type Answer = { status: number; ms: number; type: string; text: string; json: unknown };

async function send(member: Member, method: string, path: string, text: string | undefined): Promise<Answer> {
	const t0 = performance.now();
	const res = await fetch(ORIGIN + path, {
		method,
		headers: { cookie: member.cookie, origin: ORIGIN, 'content-type': 'application/json' },
		body: text,
		signal: AbortSignal.timeout(60_000)
	});
	const body = await res.text();
	const ms = performance.now() - t0;
	const type = res.headers.get('content-type') ?? '';
	let json: unknown = undefined;
	if (type.includes('json')) {
		try {
			json = JSON.parse(body);
		} catch {
			json = undefined;
		}
	}
	return { status: res.status, ms, type, text: body, json };
}

/** What the fixtures read of a record the API made. */
type Made = { id: string; version: number; revisionId?: string };

/** A request that must succeed while the fixtures are made. */
async function made(member: Member, method: string, path: string, body: unknown): Promise<Made> {
	const a = await send(member, method, path, JSON.stringify(body));
	if (a.status >= 300) throw new Error(`${method} ${path} answered ${a.status}: ${a.text.slice(0, 500)}`);
	return a.json as Made;
}

const months = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
})); // invented, for the fuzz organisation only

const wallLayers = [
	{ name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
	{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
	{ name: 'Brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
]; // invented values of the usual order, no source

/** A junction whose ψ comes from elsewhere (no solve). */
const enteredJunction = {
	name: 'Fuzz corner',
	type: 'external-corner',
	lengthM: 5,
	source: 'entered',
	dimensionSystem: 'external',
	psiEntered: 0.05,
	psiSource: 'Invented table'
};

/** An external corner as a free-form two-dimensional model: 300 mm masonry, 100 mm insulation outside. */
const P = (x: number, y: number) => [x, y];
const cornerModel = {
	regions: [
		{ name: 'masonry along x', x0: 0, y0: 0, x1: 1000, y1: 300, lambda: 0.9 },
		{ name: 'masonry along y', x0: 0, y0: 0, x1: 300, y1: 1000, lambda: 0.9 },
		{ name: 'insulation along x', x0: 0, y0: 0, x1: 1000, y1: 100, lambda: 0.04 },
		{ name: 'insulation along y', x0: 0, y0: 0, x1: 100, y1: 1000, lambda: 0.04 }
	],
	boundaries: [
		{ from: P(0, 0), to: P(1000, 0), environment: 'out' },
		{ from: P(0, 0), to: P(0, 1000), environment: 'out' },
		{ from: P(300, 300), to: P(1000, 300), environment: 'in' },
		{ from: P(300, 300), to: P(300, 1000), environment: 'in' }
	],
	environments: { in: { temperature: 20, rs: 0.13 }, out: { temperature: 0, rs: 0.04 } }
}; // invented demo geometry

type Fixtures = Awaited<ReturnType<typeof makeFixtures>>;

/** The organisation, its members, and one record of each kind for the routes that change one. */
async function makeFixtures() {
	const tag = Date.now().toString(36);
	const [org] = await db()('organisations')
		.insert({ name: `Fuzz Test Organisation ${tag}`, slug: `fuzz-${tag}-${randomBytes(3).toString('hex')}` })
		.returning('id');
	const admin = await addMember(org.id, tag, 'admin', 'Fuzz Admin');
	const assessor = await addMember(org.id, tag, 'assessor', 'Fuzz Assessor');
	const supervisor = await addMember(org.id, tag, 'supervisor', 'Fuzz Supervisor');
	// The calculation routes allow each member 240 a minute: each route spreads its bodies over twelve of its own.
	const calculators: Member[][] = [];
	for (let r = 0; r < 3; r++) {
		const pool: Member[] = [];
		for (let i = 0; i < 12; i++)
			pool.push(await addMember(org.id, `${tag}c${r}-${i}`, 'assessor', `Fuzz Calc ${r}-${i}`));
		calculators.push(pool);
	}

	const climate = (n: string) =>
		made(admin, 'POST', '/api/v1/climates', {
			name: n,
			source: 'Invented for the fuzz test',
			illustrative: true,
			months
		});
	const climateA = await climate('Fuzz climate A');
	const climatePut = await climate('Fuzz climate B');
	const limitBody = (n: string) => ({
		name: n,
		edition: '1',
		source: 'Invented',
		limits: { 'external-wall': 0.3, 'flat-roof': 0.2 }
	});
	const limitA = await made(admin, 'POST', '/api/v1/limit-tables', {
		...limitBody('Fuzz limits A'),
		isDefault: true
	});
	const limitPut = await made(admin, 'POST', '/api/v1/limit-tables', limitBody('Fuzz limits B'));
	const template = await made(assessor, 'POST', '/api/v1/templates', {
		name: 'Fuzz wall',
		kind: 'external-wall',
		buildUp: { layers: wallLayers }
	});
	const materialBody = {
		code: 'FZ-BOARD-1',
		name: 'Fuzz board',
		category: 'insulation',
		lambda: 0.035,
		lambdaKind: 'declared',
		muDry: 50,
		source: 'Invented for the fuzz test'
	};
	const material = await made(assessor, 'POST', '/api/v1/materials', materialBody);
	// Bulk verification takes revisions a supervisor did not write: one of the assessor's of its own.
	const toVerify = await made(assessor, 'POST', '/api/v1/materials', {
		...materialBody,
		code: 'FZ-BOARD-V',
		name: 'Fuzz board to verify'
	});
	// A correction's reach: a board in a wall on its first revision, then corrected (revision 2 current).
	const reachBody = { ...materialBody, code: 'FZ-BOARD-R', name: 'Fuzz board corrected' };
	const reachFirst = await made(assessor, 'POST', '/api/v1/materials', reachBody);
	const dwelling = (reference: string) =>
		made(assessor, 'POST', '/api/v1/dwellings', {
			reference,
			address: '1 Fuzz Row',
			climateId: climateA.id,
			limitTableId: limitA.id
		});
	const element = (dwellingId: unknown, name: string) =>
		made(assessor, 'POST', `/api/v1/dwellings/${dwellingId}/elements`, {
			name,
			kind: 'external-wall',
			area: 12,
			buildUp: { layers: wallLayers },
			internal: { temperature: 20, humidityClass: 3 }
		});
	const d = {
		issued: await dwelling('FZ-ISSUED'),
		empty: await dwelling('FZ-EMPTY'),
		patch: await dwelling('FZ-PATCH'),
		archive: await dwelling('FZ-ARCHIVE'),
		reopen: await dwelling('FZ-REOPEN'),
		copy: await dwelling('FZ-COPY-SOURCE'),
		elements: await dwelling('FZ-ELEMENTS'),
		order: await dwelling('FZ-ORDER'),
		put: await dwelling('FZ-ELEMENT-PUT'),
		archived: await dwelling('FZ-ARCHIVED'),
		junctions: await dwelling('FZ-JUNCTIONS'),
		reach: await dwelling('FZ-REACH')
	};
	const issuedElement = await element(d.issued.id, 'Issued wall');
	await element(d.copy.id, 'Copied wall');
	const orderIds = [(await element(d.order.id, 'First')).id, (await element(d.order.id, 'Second')).id];
	const putElement = await element(d.put.id, 'Changed wall');
	const junctionWall = await element(d.junctions.id, 'Junction wall');
	const reachElement = await made(assessor, 'POST', `/api/v1/dwellings/${d.reach.id}/elements`, {
		name: 'Wall with the corrected board',
		kind: 'external-wall',
		area: 12,
		buildUp: {
			layers: [
				wallLayers[0],
				{ ...wallLayers[1], materialId: reachFirst.id, materialRevisionId: reachFirst.revisionId },
				wallLayers[2]
			]
		},
		internal: { temperature: 20, humidityClass: 3 }
	});
	const corrected = (await made(assessor, 'PUT', `/api/v1/materials/${reachFirst.id}`, {
		...reachBody,
		lambda: 0.037,
		expectedRevisionId: reachFirst.revisionId
	})) as unknown as { material: Made };
	const reach = corrected.material;
	const junction = await made(
		assessor,
		'POST',
		`/api/v1/dwellings/${d.junctions.id}/junctions`,
		enteredJunction
	);
	await made(assessor, 'POST', `/api/v1/dwellings/${d.archived.id}/archive`, {
		archived: true,
		version: d.archived.version
	});
	const report = await made(assessor, 'POST', '/api/v1/reports', { dwellingId: d.issued.id });
	const batch = await made(supervisor, 'POST', '/api/v1/audit/batches', {
		name: 'Fuzz batch',
		source: 'references',
		references: ['FZ-ISSUED'],
		sampling: { rule: 'all', includeFlagged: false }
	});
	const item = await db()('audit_items').where({ batch_id: batch.id }).first('id');
	const evidenceRequest = await made(supervisor, 'POST', `/api/v1/audit/items/${item.id}/evidence-requests`, {
		note: 'A photograph of the insulation before it is covered.',
		dueDate: '2099-12-31'
	});
	// Reopening needs a dwelling that awaits review or was accepted.
	await db()('dwellings').where({ id: d.reopen.id }).update({ status: 'accepted' });

	const foreign = await db()('dwellings').whereNot({ organisation_id: org.id }).first('id');
	const foreignClimate = await db()('climates').whereNot({ organisation_id: org.id }).first('id');
	const ownIds = [
		climateA.id,
		limitA.id,
		template.id,
		material.id,
		d.issued.id,
		issuedElement.id,
		report.id,
		item.id
	];
	const ids: fc.Arbitrary<Body> = fc.oneof(
		fc.uuid() as fc.Arbitrary<Body>,
		fc.constantFrom<Body>(
			nil,
			'not-a-uuid',
			'00000000-0000-0000-0000-00000000000g',
			`${d.issued.id}\u0000`,
			String(d.issued.id).toUpperCase(),
			` ${d.issued.id} `,
			...[foreign?.id, foreignClimate?.id].filter(Boolean),
			...ownIds
		)
	);
	return {
		orgId: org.id as string,
		admin,
		assessor,
		supervisor,
		calculators,
		ids,
		climateA,
		climatePut,
		limitPut,
		template,
		material,
		materialBody,
		d,
		orderIds,
		putElement,
		issuedElement,
		report,
		latestReport: report.id,
		junctionWall,
		junction,
		toVerify,
		reach,
		reachElement,
		evidenceRequest,
		item: item.id as string
	};
}

/* ------------------------------------------------------------------ the routes */

type Route = {
	method: 'POST' | 'PUT' | 'PATCH';
	/** the path, or a function of the fixtures as they are once `before` has run */
	path: string | (() => string);
	/** requests in flight (CONCURRENCY unless the route serialises them anyway) */
	concurrency?: number;
	/** who sends it; several members take turns */
	members: Member[];
	bases: fc.Arbitrary<Body>;
	/** the record whose version the route answers with */
	versionKey?: string;
	/** share of FUZZ_RUNS, for routes that are slow by nature */
	share?: number;
	/** run before the route's bodies are sent */
	before?: () => Promise<void>;
};

const one = (...bodies: Body[]) => fc.constantFrom(...bodies);
const V = (key: string) => new Version(key);

function routes(f: Fixtures): Record<string, Route> {
	const wall: Obj = { heatFlow: 'horizontal', layers: wallLayers };
	const elementBody = (extra: Obj = {}): Body => ({
		name: 'Fuzz wall',
		kind: 'external-wall',
		area: 12.5,
		buildUp: { layers: wallLayers },
		internal: { temperature: 20, relativeHumidity: 50 },
		climateId: f.climateA.id,
		...extra
	});
	const windowBody: Body = {
		name: 'Fuzz window',
		kind: 'window',
		area: 1.8,
		givenU: 1.4,
		givenUSource: 'Invented certificate'
	};
	const floorBody: Body = {
		name: 'Fuzz floor',
		kind: 'ground-floor',
		area: 40,
		buildUp: {
			layers: [
				{ name: 'Screed', thicknessMm: 65, lambda: 1.15 },
				{ name: 'Board', thicknessMm: 100, lambda: 0.022 }
			],
			ground: { perimeterM: 26 }
		}
	};
	const climate: Obj = {
		name: 'Fuzz climate',
		source: 'Invented',
		illustrative: true,
		months: months as Body
	};
	const limits: Obj = {
		name: 'Fuzz limits',
		edition: '2',
		dated: '2026-01-31',
		source: 'Invented',
		limits: { 'external-wall': 0.28, window: 1.6 }
	};
	const material = f.materialBody as Obj;
	const [calc, calcThickness, calcJunction] = f.calculators;
	return {
		'POST /api/v1/calculate': {
			method: 'POST',
			path: '/api/v1/calculate?detail=summary',
			members: calc,
			bases: one(
				wall,
				{ ...wall, internal: { temperature: 20, humidityClass: 3 }, climate: months as Body },
				{
					heatFlow: 'downward',
					layers: [{ name: 'Slab', thicknessMm: 150, lambda: 2 }],
					ground: { perimeterM: 30, areaM2: 50 }
				}
			)
		},
		'POST /api/v1/calculate/thickness': {
			method: 'POST',
			path: '/api/v1/calculate/thickness',
			members: calcThickness,
			bases: one(
				{ input: wall, layerIndex: 1, targetU: 0.18 },
				{ input: wall, layerIndex: 1, targetU: 0.5, mode: 'thinnest', productThicknessesMm: [50, 100, 150] }
			)
		},
		'POST /api/v1/climates': {
			method: 'POST',
			path: '/api/v1/climates',
			members: [f.admin],
			bases: one(climate)
		},
		'PUT /api/v1/climates/[id]': {
			method: 'PUT',
			path: `/api/v1/climates/${f.climatePut.id}`,
			members: [f.admin],
			bases: one({ ...climate, name: 'Fuzz climate B', version: V('climate') }),
			versionKey: 'climate'
		},
		'POST /api/v1/limit-tables': {
			method: 'POST',
			path: '/api/v1/limit-tables',
			members: [f.admin],
			bases: one(limits, { ...limits, isDefault: false, dated: null })
		},
		'PUT /api/v1/limit-tables/[id]': {
			method: 'PUT',
			path: `/api/v1/limit-tables/${f.limitPut.id}`,
			members: [f.admin],
			bases: one({ ...limits, name: 'Fuzz limits B', version: V('limits'), confirm: true }),
			versionKey: 'limits'
		},
		'POST /api/v1/templates': {
			method: 'POST',
			path: '/api/v1/templates',
			members: [f.assessor],
			bases: one({
				name: 'Fuzz template',
				kind: 'external-wall',
				description: 'Invented',
				buildUp: { layers: wallLayers, rsi: 0.13 }
			})
		},
		'PATCH /api/v1/templates/[id]': {
			method: 'PATCH',
			path: `/api/v1/templates/${f.template.id}`,
			members: [f.assessor],
			bases: one(
				{ description: 'Changed', version: V('template') },
				{ name: 'Fuzz wall', buildUp: { layers: wallLayers }, version: V('template') }
			),
			versionKey: 'template'
		},
		'PUT /api/v1/templates/[id]': {
			method: 'PUT',
			path: `/api/v1/templates/${f.template.id}`,
			members: [f.assessor],
			bases: one({
				name: 'Fuzz wall',
				kind: 'external-wall',
				buildUp: { layers: wallLayers },
				version: V('template')
			}),
			versionKey: 'template'
		},
		'POST /api/v1/dwellings': {
			method: 'POST',
			path: '/api/v1/dwellings',
			members: [f.assessor],
			bases: one(
				{ reference: 'FZ-NEW', address: '2 Fuzz Row' },
				{
					reference: 'FZ-NEW-2',
					programme: 'Fuzz',
					clientName: 'A. Client',
					clientEmail: 'client@fuzz.example.test',
					stage: 'as-built',
					climateId: f.climateA.id
				}
			)
		},
		'PATCH /api/v1/dwellings/[id]': {
			method: 'PATCH',
			path: `/api/v1/dwellings/${f.d.patch.id}`,
			members: [f.assessor],
			bases: one(
				{ address: '3 Fuzz Row', version: V('patch') },
				{ programme: 'Fuzz', stage: 'design', assessorId: f.assessor.id, version: V('patch') }
			),
			versionKey: 'patch'
		},
		'POST /api/v1/dwellings/[id]/archive': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.archive.id}/archive`,
			members: [f.assessor],
			bases: one({ archived: true, version: V('archive') }, { archived: false, version: V('archive') }),
			versionKey: 'archive'
		},
		'POST /api/v1/dwellings/[id]/copy': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.copy.id}/copy`,
			members: [f.assessor],
			bases: one({ reference: 'FZ-COPY' }, { reference: 'FZ-COPY-2', address: '4 Fuzz Row' })
		},
		'POST /api/v1/dwellings/[id]/reopen': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.reopen.id}/reopen`,
			members: [f.assessor],
			bases: one({ reason: 'The supervisor asked for a thicker board.', version: V('reopen') }),
			versionKey: 'reopen'
		},
		'POST /api/v1/dwellings/[id]/elements': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.elements.id}/elements`,
			members: [f.assessor],
			bases: one(elementBody(), windowBody, floorBody, elementBody({ heatFlow: 'horizontal', position: 3 }))
		},
		'POST /api/v1/dwellings/[id]/elements/order': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.order.id}/elements/order`,
			members: [f.assessor],
			bases: one(
				{ ids: [f.orderIds[1], f.orderIds[0]], version: V('order') },
				{ ids: [...f.orderIds], version: V('order') }
			),
			versionKey: 'order'
		},
		'PUT /api/v1/elements/[id]': {
			method: 'PUT',
			path: `/api/v1/elements/${f.putElement.id}`,
			members: [f.assessor],
			bases: one(
				{ ...(elementBody() as Obj), version: V('element') },
				{ ...(windowBody as Obj), version: V('element') }
			),
			versionKey: 'element'
		},
		'POST /api/v1/materials': {
			method: 'POST',
			path: '/api/v1/materials',
			members: [f.assessor],
			bases: one(material, {
				...material,
				code: 'FZ-BOARD-2',
				lambda: 0.5,
				confirmWarnings: true,
				sourceIssued: '2025-01-01',
				sourceExpires: '2030-01-01'
			})
		},
		'PUT /api/v1/materials/[id]': {
			method: 'PUT',
			path: `/api/v1/materials/${f.material.id}`,
			members: [f.assessor],
			bases: one(
				{ ...material, lambda: 0.036 },
				{
					...material,
					notes: 'Changed',
					confirmWarnings: true,
					expectedRevisionId: f.material.revisionId ?? nil
				}
			)
		},
		'POST /api/v1/materials/[id]/status': {
			method: 'POST',
			path: `/api/v1/materials/${f.material.id}/status`,
			members: [f.supervisor],
			bases: one(
				{ action: 'verify' },
				{ action: 'supersede', expectedRevisionId: f.material.revisionId ?? nil }
			)
		},
		'POST /api/v1/materials/verify': {
			method: 'POST',
			path: '/api/v1/materials/verify',
			members: [f.supervisor],
			// the first valid body verifies it; the rest are answered with the revision skipped
			bases: one(
				{ revisionIds: [f.toVerify.revisionId ?? nil] },
				{ revisionIds: [f.toVerify.revisionId ?? nil, nil] }
			)
		},
		'POST /api/v1/materials/[id]/reach/move': {
			method: 'POST',
			path: `/api/v1/materials/${f.reach.id}/reach/move`,
			members: [f.assessor],
			// the first valid body moves the wall to revision 2; the rest find it there already
			bases: one(
				{ elementIds: [f.reachElement.id], toRevisionId: f.reach.revisionId ?? nil },
				{ elementIds: [f.reachElement.id, f.issuedElement.id], toRevisionId: f.reach.revisionId ?? nil }
			)
		},
		'POST /api/v1/materials/revision-check': {
			method: 'POST',
			path: '/api/v1/materials/revision-check',
			members: [f.assessor],
			bases: one({
				buildUp: {
					layers: [
						{ ...wallLayers[1], materialId: f.material.id, materialRevisionId: f.material.revisionId ?? nil }
					]
				}
			})
		},
		'POST /api/v1/audit/batches': {
			method: 'POST',
			path: '/api/v1/audit/batches',
			members: [f.supervisor],
			// Mostly bodies that the service refuses after its queries (no such dwelling, none matching),
			// now and then one that makes a batch: each batch is a recompute in the background.
			bases: fc.oneof(
				{
					weight: 8,
					arbitrary: one({
						name: 'Fuzz audit',
						source: 'references',
						references: ['FZ-NONE'],
						sampling: { rule: 'all' }
					})
				},
				{
					weight: 8,
					arbitrary: one({
						name: 'Fuzz audit',
						filter: {
							programme: 'No such programme',
							issuedFrom: '2026-01-01',
							issuedTo: '2026-12-31',
							statuses: ['issued']
						},
						sampling: { rule: 'random', percent: 10, minimumPerAssessor: 1 },
						seed: 'fz-1'
					})
				},
				{
					weight: 1,
					arbitrary: one({
						name: 'Fuzz audit',
						source: 'references',
						references: ['FZ-ISSUED'],
						sampling: { rule: 'all', includeFlagged: false }
					})
				}
			)
		},
		'POST /api/v1/audit/items/[id]/decision': {
			method: 'POST',
			path: `/api/v1/audit/items/${f.item}/decision`,
			members: [f.supervisor],
			// never "returned": each return e-mails the assessor
			bases: one(
				{ decision: 'accepted' },
				{ decision: 'accepted-with-advice', comment: 'Check the board’s λ next time.' }
			)
		},
		'POST /api/v1/audit/items/[id]/resubmit': {
			method: 'POST',
			path: `/api/v1/audit/items/${f.item}/resubmit`,
			members: [f.assessor],
			bases: one({ comment: 'Corrected the board thickness.' }),
			// returned before its report was issued, as if the report had been issued again since
			before: async () => {
				const r = await db()('reports').where({ id: f.report.id }).first('issued_at');
				await db()('audit_items')
					.where({ id: f.item })
					.update({
						decision: 'returned',
						comment: 'Fix it',
						decided_by: f.supervisor.id,
						decided_at: new Date(new Date(r.issued_at).getTime() - 60_000)
					});
			}
		},
		'POST /api/v1/junctions/calculate': {
			method: 'POST',
			path: '/api/v1/junctions/calculate',
			members: calcJunction,
			bases: one(cornerModel as Body, { ...(cornerModel as Obj), probes: [P(300, 300), P(100, 700)] as Body })
		},
		'POST /api/v1/dwellings/[id]/junctions': {
			method: 'POST',
			path: `/api/v1/dwellings/${f.d.junctions.id}/junctions`,
			members: [f.assessor],
			bases: one(enteredJunction as Body, {
				name: 'Fuzz built corner',
				type: 'external-corner',
				lengthM: 4.2,
				source: 'calculated',
				dimensionSystem: 'internal',
				details: { mode: 'builder', elements: { a: f.junctionWall.id } }
			})
		},
		'PUT /api/v1/junctions/[id]': {
			method: 'PUT',
			path: `/api/v1/junctions/${f.junction.id}`,
			members: [f.assessor],
			bases: one(
				{ ...(enteredJunction as Obj), psiEntered: 0.08, version: V('junction') },
				{
					...(enteredJunction as Obj),
					source: 'calculated',
					dimensionSystem: 'overall-internal',
					model: cornerModel as Body,
					details: { mode: 'free-form' },
					version: V('junction')
				}
			),
			versionKey: 'junction'
		},
		'POST /api/v1/audit/items/[id]/evidence-requests': {
			method: 'POST',
			path: `/api/v1/audit/items/${f.item}/evidence-requests`,
			members: [f.supervisor],
			bases: one({ note: 'The invoice for the insulation boards.', dueDate: '2099-01-31' })
		},
		'POST /api/v1/audit/items/[id]/evidence-requests/[id]/answer': {
			method: 'POST',
			path: `/api/v1/audit/items/${f.item}/evidence-requests/${f.evidenceRequest.id}/answer`,
			members: [f.assessor],
			bases: one({}, { evidenceId: null })
		},
		'POST /api/v1/reports': {
			method: 'POST',
			path: '/api/v1/reports',
			members: [f.assessor],
			// An issue renders a PDF: mostly bodies refused after the dwelling is read (no elements, archived).
			bases: fc.oneof(
				{
					weight: 10,
					arbitrary: one({ dwellingId: f.d.empty.id }, { dwellingId: f.d.archived.id, elementId: null })
				},
				{ weight: 1, arbitrary: one({ dwellingId: f.d.issued.id, elementId: f.issuedElement.id }) }
			),
			share: 0.5,
			// issues wait for each other (one issuer per organisation at a time): one in flight
			concurrency: 1
		},
		'POST /api/v1/reports/[id]/email': {
			method: 'POST',
			// the revision in force (a fuzzed issue may have replaced the fixture's)
			path: () => `/api/v1/reports/${f.latestReport}/email`,
			before: async () => {
				const r = await db()('reports')
					.where({ dwelling_id: f.d.issued.id, scope: 'dwelling' })
					.orderBy('revision', 'desc')
					.first('id');
				f.latestReport = r.id;
			},
			members: [f.assessor],
			// 20 a member an hour: the rest are answered 429, which is as much a 4xx as any
			bases: one(
				{ to: 'client@fuzz.example.test', message: 'Your report, invented for a test.' },
				{ to: 'Client@Fuzz.Example.Test' }
			)
		}
	};
}

/* ------------------------------------------------------------------ running one route */

type Failure = { why: string; status: number; ms: number; body: string; answer: string };

const excerpt = (s: string, n = 240) => (s.length > n ? `${s.slice(0, n)}… (${s.length} characters)` : s);
const NOT_HUMAN =
	/Something went wrong|\[object Object\]|Cannot read propert|is not a function|TypeError|ReferenceError/;

/** What is wrong with an answer, or null when it is as it should be. */
function fault(a: Answer): string | null {
	if (a.status >= 500) return `answered ${a.status}`;
	if (a.ms >= SLOW_MS) return `took ${Math.round(a.ms)} ms`;
	if (a.status >= 400) {
		if (!a.type.includes('application/json'))
			return `a ${a.status} that is not JSON (${a.type || 'no type'})`;
		const message = (a.json as { message?: unknown } | undefined)?.message;
		if (typeof message !== 'string' || message.trim().length < 3) return `a ${a.status} without a message`;
		if (NOT_HUMAN.test(message)) return `a ${a.status} whose message is not for people`;
	}
	return null;
}

type Tally = {
	path: string;
	statuses: Map<number, number>;
	times: number[];
	bytes: number;
	failures: Failure[];
	versions: Map<string, number>;
};

/** Send one payload and judge its answer; the route's version is kept from its last success. */
async function sendOne(route: Route, i: number, p: Payload, tally: Tally) {
	const text = 'text' in p ? p.text : p.body === undefined ? '' : toJson(p.body, tally.versions);
	tally.bytes += text.length;
	let a: Answer;
	try {
		a = await send(route.members[i % route.members.length], route.method, tally.path, text);
	} catch (e) {
		const cause = (e as { cause?: { code?: string; message?: string } }).cause;
		const why = `no answer: ${(e as Error).message}${cause ? ` (${cause.code ?? cause.message})` : ''}`;
		tally.failures.push({ why, status: 0, ms: 0, body: excerpt(text), answer: '' });
		return;
	}
	tally.statuses.set(a.status, (tally.statuses.get(a.status) ?? 0) + 1);
	tally.times.push(a.ms);
	const why = fault(a);
	if (why) {
		const answer = excerpt(a.text, 400);
		tally.failures.push({ why, status: a.status, ms: Math.round(a.ms), body: excerpt(text), answer });
	}
	const version = (a.json as { version?: unknown } | undefined)?.version;
	if (route.versionKey && a.status < 300 && typeof version === 'number')
		tally.versions.set(route.versionKey, version);
}

/** Generate the route's bodies, send them CONCURRENCY at a time, print the figures; the failures. */
async function fuzzRoute(name: string, route: Route, ids: fc.Arbitrary<Body>): Promise<Failure[]> {
	const runs = Math.max(20, Math.round(RUNS * (route.share ?? 1)));
	const g0 = performance.now();
	const payloads = fc.sample(payloadArb(route.bases, ids), { numRuns: runs, seed: SEED });
	const generated = performance.now() - g0;
	await route.before?.();
	const path = typeof route.path === 'string' ? route.path : route.path();
	const tally: Tally = { path, statuses: new Map(), times: [], bytes: 0, failures: [], versions: new Map() };
	const t0 = performance.now();
	let next = 0;
	const worker = async () => {
		while (next < payloads.length) {
			const i = next++;
			await sendOne(route, i, payloads[i], tally);
		}
	};
	await Promise.all(Array.from({ length: route.concurrency ?? CONCURRENCY }, worker));
	const seconds = (performance.now() - t0) / 1000;
	const times = [...tally.times].sort((a, b) => a - b);
	const at = (q: number) => Math.round(times[Math.min(times.length - 1, Math.floor(q * times.length))] ?? 0);
	const histogram = [...tally.statuses]
		.sort((a, b) => a[0] - b[0])
		.map(([s, n]) => `${s}×${n}`)
		.join(' ');
	console.log(
		`[fuzz] ${name}: ${runs} bodies (${(tally.bytes / 1e6).toFixed(1)} MB, made in ${(generated / 1000).toFixed(1)} s) sent in ${seconds.toFixed(1)} s; median ${at(0.5)} ms, p99 ${at(0.99)} ms, slowest ${at(1)} ms; ${histogram}`
	);
	return tally.failures;
}

/* ------------------------------------------------------------------ the tests */

let fixtures: Fixtures | null = null;

test.describe('fuzzed bodies on every JSON write route', () => {
	test.beforeAll(async () => {
		test.setTimeout(120_000);
		// every version the routes answer starts at the fixture's own
		fixtures = await makeFixtures();
		console.log(
			`[fuzz] seed ${SEED}, ${RUNS} bodies per route, ${CONCURRENCY} in flight (FUZZ_SEED=${SEED} repeats this run)`
		);
	});

	test.afterAll(async () => {
		test.setTimeout(120_000);
		if (!fixtures) return;
		// Leave no background work to the next file: the batches finished, the e-mails sent.
		const orgId = fixtures.orgId;
		const until = Date.now() + 90_000;
		for (;;) {
			const busy = await db()('audit_batches')
				.where({ organisation_id: orgId })
				.whereRaw(`coalesce(progress->>'state', '') in ('queued', 'running')`)
				.count<{ n: number }[]>('* as n');
			const queued = await db()('mail_outbox')
				.where({ organisation_id: orgId, status: 'queued' })
				.count<{ n: number }[]>('* as n');
			if ((Number(busy[0].n) === 0 && Number(queued[0].n) === 0) || Date.now() > until) {
				console.log(
					`[fuzz] left behind: ${busy[0].n} batch(es) still recomputing, ${queued[0].n} e-mail(s) queued`
				);
				break;
			}
			await new Promise((r) => setTimeout(r, 500));
		}
	});

	const names = [
		'POST /api/v1/calculate',
		'POST /api/v1/calculate/thickness',
		'POST /api/v1/climates',
		'PUT /api/v1/climates/[id]',
		'POST /api/v1/limit-tables',
		'PUT /api/v1/limit-tables/[id]',
		'POST /api/v1/templates',
		'PATCH /api/v1/templates/[id]',
		'PUT /api/v1/templates/[id]',
		'POST /api/v1/dwellings',
		'PATCH /api/v1/dwellings/[id]',
		'POST /api/v1/dwellings/[id]/archive',
		'POST /api/v1/dwellings/[id]/copy',
		'POST /api/v1/dwellings/[id]/reopen',
		'POST /api/v1/dwellings/[id]/elements',
		'POST /api/v1/dwellings/[id]/elements/order',
		'PUT /api/v1/elements/[id]',
		'POST /api/v1/materials',
		'PUT /api/v1/materials/[id]',
		'POST /api/v1/materials/[id]/status',
		'POST /api/v1/materials/verify',
		'POST /api/v1/materials/[id]/reach/move',
		'POST /api/v1/materials/revision-check',
		'POST /api/v1/audit/batches',
		'POST /api/v1/audit/items/[id]/decision',
		'POST /api/v1/audit/items/[id]/resubmit',
		'POST /api/v1/junctions/calculate',
		'POST /api/v1/dwellings/[id]/junctions',
		'PUT /api/v1/junctions/[id]',
		'POST /api/v1/audit/items/[id]/evidence-requests',
		'POST /api/v1/audit/items/[id]/evidence-requests/[id]/answer',
		'POST /api/v1/reports',
		'POST /api/v1/reports/[id]/email'
	];
	for (const name of names) {
		test(name, async () => {
			test.setTimeout(Math.max(60_000, RUNS * 60));
			const f = fixtures!;
			const route = routes(f)[name];
			const failures = await fuzzRoute(name, route, f.ids);
			const shown = failures.slice(0, 5).map((x) => `${x.why}\n  body: ${x.body}\n  answer: ${x.answer}`);
			expect(failures.length, `${name} (FUZZ_SEED=${SEED}):\n${shown.join('\n')}`).toBe(0);
		});
	}

	test('every JSON write route of the API is fuzzed here', async () => {
		// The routes are found in the source tree: a new one that reads a JSON body must be added above.
		const { readFileSync, readdirSync } = await import('node:fs');
		const { join } = await import('node:path');
		const found: string[] = [];
		const walk = (dir: string) => {
			for (const e of readdirSync(dir, { withFileTypes: true })) {
				const p = join(dir, e.name);
				if (e.isDirectory()) walk(p);
				else if (e.name === '+server.ts') {
					const src = readFileSync(p, 'utf8');
					if (!/readJson|request\.json\(\)/.test(src)) continue;
					const route = p
						.replace(/^src\/routes/, '')
						.replace(/\/\+server\.ts$/, '')
						.replace(/\[(\w+)=uuid\]/g, '[id]');
					for (const m of src.matchAll(
						/export const (POST|PUT|PATCH)\b|export async function (POST|PUT|PATCH)\b/g
					)) {
						found.push(`${m[1] ?? m[2]} ${route}`);
					}
				}
			}
		};
		walk('src/routes/api/v1');
		expect(found.length).toBeGreaterThanOrEqual(names.length);
		const missing = [...new Set(found)].filter((r) => !names.includes(r));
		expect(missing).toEqual([]);
	});
});
