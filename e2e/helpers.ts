// Shared helpers for the end-to-end suites.
import { expect, type Page, type BrowserContext } from '@playwright/test';
import knex, { type Knex } from 'knex';
import { randomBytes } from 'node:crypto';

export const INBOX = process.env.INBOX_URL ?? 'http://127.0.0.1:8025';

/** Demo people from db/seeds/01_organisations.js. */
export const DEMO = {
	admin: 'ada.mensah@northfield-retrofit.example.test',
	assessor: 'ben.okafor@northfield-retrofit.example.test',
	assessor2: 'carla.reyes@northfield-retrofit.example.test',
	supervisor: 'dara.quinn@northfield-retrofit.example.test',
	otherAdmin: 'eli.brandt@harbourline-surveys.example.test',
	otherAssessor: 'fern.oduya@harbourline-surveys.example.test'
} as const;

let e2eDb: Knex | null = null;
/** The e2e database, for arranging data and reading ids. */
export function db(): Knex {
	e2eDb ??= knex({ client: 'pg', connection: process.env.DATABASE_URL, pool: { min: 0, max: 2 } });
	return e2eDb;
}

type Mail = {
	id: string;
	to: string[];
	subject: string;
	text: string;
	receivedAt: string;
	attachments: { index: number; filename: string }[];
};

/** Wait for the newest message to an address whose subject matches, received after `since`. */
export async function waitForMail(to: string, subject: RegExp, since: string): Promise<Mail> {
	for (let i = 0; i < 50; i++) {
		const res = await fetch(`${INBOX}/api/messages?to=${encodeURIComponent(to)}`);
		const list = (await res.json()) as Mail[];
		const hit = list.find((m) => subject.test(m.subject) && m.receivedAt >= since);
		if (hit) return hit;
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`no e-mail to ${to} matching ${subject}`);
}

/** Sign in the way a person does: ask for a link, open the message in the inbox page, follow the link. */
export async function signInViaInbox(page: Page, email: string) {
	const since = new Date(Date.now() - 1000).toISOString();
	await page.goto('/signin');
	await page.getByLabel('E-mail address').fill(email);
	await page.getByRole('button', { name: /sign-in link/i }).click();
	await expect(page.getByRole('heading', { name: 'Check your inbox' })).toBeVisible();
	const mail = await waitForMail(email, /sign-in link/i, since);
	await page.goto(`${INBOX}/messages/${mail.id}`);
	await page.locator('pre.body a').first().click();
	await page.waitForURL((u) => !u.href.startsWith(INBOX) && !u.pathname.startsWith('/auth/'));
}

/** A quick sign-in for suites that test something else: a session row, as Auth.js writes it. */
export async function signInAs(context: BrowserContext, email: string) {
	const user = await db()('users').where({ email }).first('id');
	if (!user) throw new Error(`no user ${email}`);
	const token = randomBytes(24).toString('hex');
	await db()('sessions').insert({
		userId: user.id,
		sessionToken: token,
		expires: new Date(Date.now() + 3600_000)
	});
	const url = new URL(process.env.PLAYWRIGHT_BASE_URL ?? `http://127.0.0.1:${process.env.APP_PORT ?? 4173}`);
	await context.addCookies([
		{
			name: 'authjs.session-token',
			value: token,
			domain: url.hostname,
			path: '/',
			httpOnly: true,
			sameSite: 'Lax'
		}
	]);
	return token;
}

/** Cookie header for API requests made with `request`. */
export async function sessionCookie(email: string) {
	const user = await db()('users').where({ email }).first('id');
	const token = randomBytes(24).toString('hex');
	await db()('sessions').insert({
		userId: user.id,
		sessionToken: token,
		expires: new Date(Date.now() + 3600_000)
	});
	return `authjs.session-token=${token}`;
}

/** Wait until the page has hydrated, so that what a test types is not reset by hydration. */
export async function waitForApp(page: Page) {
	await page.locator('html[data-ready="true"]').waitFor({ state: 'attached' });
}
