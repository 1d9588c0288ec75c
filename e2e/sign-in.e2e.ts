import { test, expect } from '@playwright/test';
import { DEMO, db, signInViaInbox, waitForMail, INBOX } from './helpers';

// Sign-in by e-mail link and what each role sees (our own rules; common practice, no source).
test.describe('sign-in by e-mail link', () => {
	for (const [role, email] of [
		['admin', DEMO.admin],
		['assessor', DEMO.assessor],
		['supervisor', DEMO.supervisor]
	] as const) {
		test(`${role} signs in from the inbox and sees the app`, async ({ page }) => {
			await signInViaInbox(page, email);
			await expect(page).toHaveURL(/\/dwellings/);
			await expect(page.getByTestId('whoami')).toContainText(new RegExp(role, 'i'));
			await expect(page.getByTestId('whoami')).toContainText('Northfield Retrofit Partnership');
			for (const section of ['Dwellings', 'Library', 'Templates', 'Climates', 'Audit', 'Organisation']) {
				await expect(
					page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: section })
				).toBeVisible();
			}
			await page.getByRole('link', { name: 'Organisation' }).click();
			// Only an admin may invite or change roles.
			await expect(page.getByRole('heading', { name: 'Invite a member' })).toHaveCount(
				role === 'admin' ? 1 : 0
			);
			await expect(page.getByRole('button', { name: 'Remove' })).toHaveCount(role === 'admin' ? 3 : 0);
			// The other organisation's people never appear.
			await expect(page.getByText('harbourline', { exact: false })).toHaveCount(0);
		});
	}

	test('an unknown address gets the same answer and no e-mail', async ({ page }) => {
		const email = `stranger-${Date.now()}@example.test`;
		await page.goto('/signin');
		await page.getByLabel('E-mail address').fill(email);
		await page.getByRole('button', { name: /sign-in link/i }).click();
		await expect(page.getByRole('heading', { name: 'Check your inbox' })).toBeVisible();
		// No link was made for the address (a sign-in link is stored before it is sent) …
		const tokens = await db()('verification_token')
			.where({ identifier: email })
			.count<{ count: string }[]>('* as count');
		expect(Number(tokens[0].count)).toBe(0);
		// … and a link asked for afterwards by a known address arrives, so the mail path was working: had
		// a message to the stranger been sent, it would have been there first.
		const since = new Date(Date.now() - 1000).toISOString();
		await page.goto('/signin');
		await page.getByLabel('E-mail address').fill(DEMO.supervisor);
		await page.getByRole('button', { name: /sign-in link/i }).click();
		await expect(page.getByRole('heading', { name: 'Check your inbox' })).toBeVisible();
		await waitForMail(DEMO.supervisor, /sign-in link/i, since);
		const list = await (await fetch(`${INBOX}/api/messages?to=${encodeURIComponent(email)}`)).json();
		expect(list).toHaveLength(0);
	});

	test('a malformed address is refused with a field message', async ({ page }) => {
		await page.goto('/signin');
		await page.getByLabel('E-mail address').fill('not-an-address');
		await page.getByRole('button', { name: /sign-in link/i }).click();
		await expect(page.getByText(/Enter an e-mail address/)).toBeVisible();
	});

	test('a forged or reused link gives a clear page', async ({ page }) => {
		await page.goto(`/auth/callback/nodemailer?token=forged&email=${encodeURIComponent(DEMO.assessor)}`);
		await expect(page.getByRole('heading', { name: 'That link did not sign you in' })).toBeVisible();
		await expect(page.getByText(/expired, been used already, or been altered/)).toBeVisible();
	});

	test('an admin invites a member, who receives a real e-mail and can sign in', async ({ page, browser }) => {
		await signInViaInbox(page, DEMO.admin);
		await page.goto('/organisation');
		const email = `new.member.${Date.now()}@northfield-retrofit.example.test`;
		const since = new Date(Date.now() - 1000).toISOString();
		const invite = page.locator('form[action="?/invite"]');
		await invite.getByLabel('E-mail address').fill(email);
		await invite.getByLabel('Role').selectOption('supervisor');
		await invite.getByRole('button', { name: 'Send invitation' }).click();
		await expect(page.getByText(`Invitation sent to ${email}`)).toBeVisible();
		const mail = await waitForMail(email, /invited/i, since);
		expect(mail.text).toContain('Northfield Retrofit Partnership');
		const ctx = await browser.newContext();
		const p2 = await ctx.newPage();
		await signInViaInbox(p2, email);
		await expect(p2.getByTestId('whoami')).toContainText(/supervisor/i);
		await ctx.close();
	});

	test('sign-in requests are rate-limited per address', async ({ page }) => {
		const email = DEMO.assessor2;
		let limited = false;
		for (let i = 0; i < 7 && !limited; i++) {
			await page.goto('/signin');
			await page.getByLabel('E-mail address').fill(email);
			await page.getByRole('button', { name: /sign-in link/i }).click();
			await page.waitForLoadState('networkidle');
			limited = await page.getByText(/Too many sign-in requests/).isVisible();
		}
		expect(limited).toBe(true);
	});
});
