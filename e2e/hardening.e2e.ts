import { test, expect, request as newRequest } from '@playwright/test';
import { DEMO, db, sessionCookie, waitForMail, INBOX } from './helpers';

// Hardening checks that stay: host-header poisoning of the sign-in link (an account-takeover hole; OWASP Web Security Testing Guide
// v4.2, WSTG-INPV-17 "Testing for Host Header Injection"). Every link Envelo e-mails must be built from
// its configured origin (ORIGIN), never from the request's Host or X-Forwarded-* headers.

const ORIGIN = `http://127.0.0.1:${process.env.APP_PORT ?? 4173}`;

const created: string[] = [];

/**
 * A fresh member of the demo organisation, so these requests never meet another test's rate limit;
 * removed again afterwards, so the organisation's member list is as the other suites expect.
 */
async function freshMember(tag: string): Promise<string> {
	const email = `host-${tag}-${Date.now()}@northfield-retrofit.example.test`;
	const [user] = await db()('users')
		.insert({ email, name: `Host check ${tag}` })
		.returning('id');
	const org = await db()('users as u')
		.join('memberships as m', 'm.user_id', 'u.id')
		.where('u.email', DEMO.admin)
		.first('m.organisation_id');
	await db()('memberships').insert({
		user_id: user.id,
		organisation_id: org.organisation_id,
		role: 'assessor'
	});
	created.push(email);
	return email;
}

/** Ask for a sign-in link as a form post, with extra headers; returns the status. */
async function askForLink(email: string, headers: Record<string, string>) {
	const api = await newRequest.newContext({ baseURL: ORIGIN });
	const res = await api.post('/signin', {
		form: { email, next: '' },
		// as a browser posts a form (SvelteKit answers other Accept values with its JSON action result)
		headers: { origin: ORIGIN, accept: 'text/html', ...headers },
		maxRedirects: 0
	});
	await api.dispose();
	return res.status();
}

async function linksIn(email: string, since: string): Promise<string[]> {
	const mail = await waitForMail(email, /sign-in link/i, since);
	return [...mail.text.matchAll(/https?:\/\/[^\s<>"]+/g)].map((m) => m[0]);
}

test.describe('the sign-in link names Envelo\u2019s own origin', () => {
	test.afterAll(async () => {
		if (created.length) await db()('users').whereIn('email', created).del();
	});

	const forged: [string, Record<string, string>][] = [
		['x-forwarded-host', { 'x-forwarded-host': 'evil.example.test' }],
		['x-forwarded-host-and-proto', { 'x-forwarded-host': 'evil.example.test', 'x-forwarded-proto': 'https' }],
		['forwarded', { forwarded: 'host=evil.example.test;proto=https' }]
	];
	for (const [tag, headers] of forged) {
		test(`a ${tag} header does not change the link`, async () => {
			const email = await freshMember(tag);
			const since = new Date(Date.now() - 1000).toISOString();
			const status = await askForLink(email, headers);
			expect(status).toBeLessThan(400);
			const links = await linksIn(email, since);
			expect(links.length).toBeGreaterThan(0);
			for (const link of links) {
				expect(new URL(link).origin).toBe(ORIGIN);
				expect(link).not.toContain('evil.example.test');
			}
		});
	}

	test('a request naming another Host is refused, and no e-mail goes out', async () => {
		const email = await freshMember('host');
		const status = await askForLink(email, { host: 'evil.example.test' });
		expect(status).toBe(421);
		// No link was made (it is stored before it is sent) and nothing was recorded: the refusal came
		// before the sign-in route, so there is no e-mail to wait for.
		const tokens = await db()('verification_token')
			.where({ identifier: email })
			.count<{ count: string }[]>('* as count');
		expect(Number(tokens[0].count)).toBe(0);
		const list = await (await fetch(`${INBOX}/api/messages?to=${encodeURIComponent(email)}`)).json();
		expect(list).toHaveLength(0);
		const attempts = await db()('sign_in_attempts').where({ email }).count<{ count: string }[]>('* as count');
		expect(Number(attempts[0].count)).toBe(0);
	});

	test('a page asked for under another host name is sent to the configured origin', async () => {
		const api = await newRequest.newContext({ baseURL: ORIGIN });
		const res = await api.get('/signin?next=%2Fdwellings', {
			headers: { host: 'evil.example.test' },
			maxRedirects: 0
		});
		expect(res.status()).toBe(308);
		expect(res.headers()['location']).toBe(`${ORIGIN}/signin?next=%2Fdwellings`);
		await api.dispose();
	});
});

// Open redirect after sign-in (OWASP WSTG v4.2, WSTG-CLNT-04; identifier from memory): a signed-in
// person sent to /signin?next=… must stay on Envelo whatever `next` says.
test.describe('after sign-in, next never leaves the site', () => {
	for (const next of ['/\\evil.example.test', '/\t/evil.example.test', '//evil.example.test']) {
		test(`next=${JSON.stringify(next)} goes to the dwellings`, async () => {
			const api = await newRequest.newContext({
				baseURL: ORIGIN,
				extraHTTPHeaders: { cookie: await sessionCookie(DEMO.assessor) }
			});
			const res = await api.get(`/signin?next=${encodeURIComponent(next)}`, { maxRedirects: 0 });
			expect(res.status()).toBe(303);
			expect(res.headers()['location']).toBe('/dwellings');
			await api.dispose();
		});
	}
	test('a path of the site is kept', async () => {
		const api = await newRequest.newContext({
			baseURL: ORIGIN,
			extraHTTPHeaders: { cookie: await sessionCookie(DEMO.assessor) }
		});
		const res = await api.get(`/signin?next=${encodeURIComponent('/library?q=wool')}`, { maxRedirects: 0 });
		expect(res.headers()['location']).toBe('/library?q=wool');
		await api.dispose();
	});
});

test('signed-in pages and API answers are never cached; public pages may be', async () => {
	const api = await newRequest.newContext({
		baseURL: ORIGIN,
		extraHTTPHeaders: { cookie: await sessionCookie(DEMO.assessor) }
	});
	for (const path of ['/dwellings', '/api/v1/me', '/api/v1/dwellings']) {
		const res = await api.get(path, { maxRedirects: 0 });
		expect(res.status(), path).toBe(200);
		expect(res.headers()['cache-control'], path).toMatch(/no-store/);
	}
	const pub = await api.get('/healthz');
	expect(pub.headers()['cache-control'] ?? '').not.toMatch(/no-store/);
	await api.dispose();
});

// Bad input gets a 4xx that says what is wrong, never "Something went wrong on our side" (a 500).
test.describe('bad input is refused with a 4xx, not a server error', () => {
	async function signedIn() {
		return newRequest.newContext({
			baseURL: ORIGIN,
			extraHTTPHeaders: { cookie: await sessionCookie(DEMO.assessor), origin: ORIGIN }
		});
	}
	async function demoDwellingId(): Promise<string> {
		const row = await db()('dwellings as d')
			.join('memberships as m', 'm.organisation_id', 'd.organisation_id')
			.join('users as u', 'u.id', 'm.user_id')
			.where('u.email', DEMO.assessor)
			.first('d.id');
		return row.id;
	}

	test('a zero byte in a search', async () => {
		const api = await signedIn();
		// The list page shows the search's problem beside the search box (the page itself loads).
		const page = await api.get('/dwellings?q=%00');
		expect(page.status()).toBeLessThan(500);
		expect(await page.text()).toMatch(/zero byte/);
		const res = await api.get('/api/v1/dwellings?q=%00');
		expect(res.status()).toBe(400);
		expect(JSON.stringify((await res.json()).issues)).toMatch(/zero byte/);
		await api.dispose();
	});

	test('an id that is not an id in a form action', async () => {
		const api = await signedIn();
		const id = await demoDwellingId();
		for (const action of ['duplicateElement', 'deleteElement']) {
			// A browser's own form post (no script) asks for the page back: the page, with the refusal on it.
			const page = await api.post(`/dwellings/${id}?/${action}`, {
				form: { elementId: 'not-a-uuid', version: '1' },
				headers: { accept: 'text/html' },
				maxRedirects: 0
			});
			expect(page.status(), action).toBeLessThan(500);
			const html = await page.text();
			expect(html, action).not.toMatch(/Something went wrong/);
			expect(html, action).toMatch(/is not an element of this dwelling/);
			// The page's enhanced post asks for JSON: SvelteKit answers 200 with the failure and its status
			// inside (its documented action protocol), which the page shows beside the button.
			const json = await api.post(`/dwellings/${id}?/${action}`, {
				form: { elementId: 'not-a-uuid', version: '1' },
				headers: { accept: 'application/json', 'x-sveltekit-action': 'true' },
				maxRedirects: 0
			});
			const answer = await json.json();
			expect(answer.type, action).toBe('failure');
			expect(answer.status, action).toBe(400);
			expect(answer.data, action).toMatch(/is not an element of this dwelling/);
		}
		await api.dispose();
	});

	test('a JSON body sent to a form action, and a body over the size limit', async () => {
		const api = await signedIn();
		const id = await demoDwellingId();
		const json = await api.post(`/dwellings/${id}?/duplicateElement`, { data: { elementId: 'x' } });
		expect(json.status()).toBe(415);
		expect(await json.text()).not.toMatch(/Something went wrong/);
		const big = await api.post('/api/v1/dwellings', {
			headers: { 'content-type': 'application/json' },
			data: '"' + 'x'.repeat(30 * 1024 * 1024) + '"'
		});
		expect(big.status()).toBe(413);
		expect(await big.text()).not.toMatch(/Something went wrong/);
		await api.dispose();
	});
});

test.afterAll(async () => {
	if (created.length) await db()('users').whereIn('email', created).del();
});

test('the sign-in limit answers 429', async () => {
	const email = await freshMember('limit');
	const statuses: number[] = [];
	for (let i = 0; i < 6; i++) statuses.push(await askForLink(email, {}));
	expect(statuses.slice(0, 5).every((s) => s < 400)).toBe(true);
	expect(statuses[5]).toBe(429);
});

test('the calculation API has a per-member limit (429 with Retry-After)', async () => {
	const api = await newRequest.newContext({
		baseURL: ORIGIN,
		extraHTTPHeaders: { cookie: await sessionCookie(DEMO.assessor2), origin: ORIGIN }
	});
	const body = {
		heatFlow: 'horizontal',
		layers: [{ name: 'Brick', thicknessMm: 215, lambda: 0.77 }]
	};
	let last = 0;
	let retryAfter: string | undefined;
	for (let i = 0; i < 400 && last !== 429; i++) {
		const res = await api.post('/api/v1/calculate?detail=summary', { data: body });
		last = res.status();
		retryAfter = res.headers()['retry-after'];
	}
	expect(last).toBe(429);
	expect(Number(retryAfter)).toBeGreaterThan(0);
	await api.dispose();
});

// Account enumeration (OWASP WSTG v4.2, WSTG-IDNT-04 "Testing for Account Enumeration"; identifier from
// memory): a known and an unknown address get the same status, headers and cookies, and the known one
// is not slower by the time it takes to make and send a link (the link is sent after the answer).
test('the sign-in answer does not tell whether an address has an account', async () => {
	async function ask(email: string) {
		const api = await newRequest.newContext({ baseURL: ORIGIN });
		const t0 = performance.now();
		const res = await api.post('/signin', {
			form: { email, next: '' },
			headers: { origin: ORIGIN, accept: 'text/html' },
			maxRedirects: 0
		});
		const ms = performance.now() - t0;
		const headers = res.headers();
		await api.dispose();
		return { status: res.status(), location: headers['location'], cookie: 'set-cookie' in headers, ms };
	}
	const known: Awaited<ReturnType<typeof ask>>[] = [];
	const unknown: Awaited<ReturnType<typeof ask>>[] = [];
	const since = new Date(Date.now() - 1000).toISOString();
	const emails: string[] = [];
	for (let i = 0; i < 4; i++) {
		const email = await freshMember(`enum${i}`);
		emails.push(email);
		known.push(await ask(email));
		unknown.push(await ask(`nobody-${Date.now()}-${i}@example.test`));
	}
	for (const r of [...known, ...unknown]) {
		expect(r).toMatchObject({ status: 303, location: '/signin/check-email', cookie: false });
	}
	const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
	// A generous margin: making and e-mailing a link took about 170 ms more before.
	expect(median(known.map((r) => r.ms)) - median(unknown.map((r) => r.ms))).toBeLessThan(100);
	// The known addresses still get their link.
	for (const email of emails) await waitForMail(email, /sign-in link/i, since);
});

test("Auth.js's own routes answer on the configured origin whatever host headers they are sent", async () => {
	const api = await newRequest.newContext({ baseURL: ORIGIN });
	const res = await api.get(
		`/auth/callback/nodemailer?token=forged&email=${encodeURIComponent(DEMO.assessor)}`,
		{
			headers: {
				'x-forwarded-host': 'evil.example.test',
				'x-forwarded-proto': 'https',
				forwarded: 'host=evil.example.test'
			},
			maxRedirects: 0
		}
	);
	expect(res.status()).toBeGreaterThanOrEqual(300);
	expect(res.status()).toBeLessThan(400);
	const location = new URL(res.headers()['location'], ORIGIN);
	expect(location.origin).toBe(ORIGIN);
	await api.dispose();
});
