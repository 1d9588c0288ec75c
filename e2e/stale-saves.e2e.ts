import { test, expect, type Browser, type Page } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// Two people open the same climate, limit table or template and both edit it: the first save is kept,
// the second is refused with "changed by someone else" and the form keeps what the second person typed.
// Envelo's own rule, the same as for dwellings and elements (common practice, no source). Every record is
// made for the test and removed after it, so the demo data other suites read stays as seeded.

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const STALE = /changed by someone else after you opened it/;
const months = Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature: i, relativeHumidity: 80 }));
const unique = () => `${Date.now()}-${Math.random().toString(36).slice(2, 6)}`;

/** A signed-in page on `path`, hydrated, with its edit form open. */
async function openEditing(browser: Browser, email: string, path: string): Promise<Page> {
	const context = await browser.newContext();
	await signInAs(context, email);
	const page = await context.newPage();
	await page.goto(path, { waitUntil: 'networkidle' });
	await waitForApp(page);
	await page.getByRole('button', { name: 'Edit', exact: true }).click();
	return page;
}

test('two admins edit one climate: the second save is refused and keeps what was typed', async ({
	browser
}) => {
	const name = `Stale climate ${unique()}`;
	const [row] = await db()('climates')
		.insert({
			organisation_id: NORTHFIELD,
			name,
			source: 'Invented test figures',
			illustrative: true,
			months: JSON.stringify(months)
		})
		.returning('id');
	try {
		const a = await openEditing(browser, DEMO.admin, `/climates/${row.id}`);
		const b = await openEditing(browser, DEMO.admin, `/climates/${row.id}`);

		await a.getByLabel('Source of the figures').fill('Saved by the first');
		await a.getByRole('button', { name: 'Save changes' }).click();
		await expect(a.getByRole('status').filter({ hasText: 'Climate saved.' })).toBeVisible();

		await b.getByLabel('Source of the figures').fill('Typed by the second');
		await b.getByLabel('January temperature, °C').fill('-4.5');
		await b.getByRole('button', { name: 'Save changes' }).click();
		await expect(b.getByTestId('stale-save')).toContainText(STALE);
		await expect(b.getByLabel('Source of the figures')).toHaveValue('Typed by the second');
		await expect(b.getByLabel('January temperature, °C')).toHaveValue('-4.5');
		await b.screenshot({ path: '/tmp/stale-climate.png', fullPage: true });

		const stored = await db()('climates').where({ id: row.id }).first();
		expect(stored).toMatchObject({ source: 'Saved by the first', version: 2 });
		expect(stored.months[0].temperature).toBe(0);
		await a.context().close();
		await b.context().close();
	} finally {
		await db()('climates').where({ id: row.id }).delete();
	}
});

test('two admins edit one limit table: the second save is refused and keeps what was typed', async ({
	browser
}) => {
	const name = `Stale scheme ${unique()}`;
	const [row] = await db()('limit_tables')
		.insert({
			organisation_id: NORTHFIELD,
			name,
			edition: '1',
			is_default: false,
			limits: JSON.stringify({ 'external-wall': 0.3, window: 1.6 })
		})
		.returning('id');
	try {
		const path = `/organisation/limit-tables/${row.id}`;
		const a = await openEditing(browser, DEMO.admin, path);
		const b = await openEditing(browser, DEMO.admin, path);

		await a.getByLabel('Edition').fill('Saved by the first');
		await a.getByRole('button', { name: 'Save changes' }).click();
		await expect(a.getByRole('status').filter({ hasText: 'Limit table saved.' })).toBeVisible();

		await b.getByLabel('Edition').fill('Typed by the second');
		await b.getByLabel('Maximum U, External wall').fill('0.25');
		await b.getByRole('button', { name: 'Save changes' }).click();
		await expect(b.getByTestId('stale-save')).toContainText(STALE);
		await expect(b.getByLabel('Edition')).toHaveValue('Typed by the second');
		await expect(b.getByLabel('Maximum U, External wall')).toHaveValue('0.25');

		const stored = await db()('limit_tables').where({ id: row.id }).first();
		expect(stored).toMatchObject({ edition: 'Saved by the first', version: 2 });
		expect(stored.limits['external-wall']).toBe(0.3);
		await a.context().close();
		await b.context().close();
	} finally {
		await db()('limit_tables').where({ id: row.id }).delete();
	}
});

test('its author and an admin edit one template: the second save is refused and keeps what was typed', async ({
	browser
}) => {
	const author = await db()('users').where({ email: DEMO.assessor }).first('id');
	const name = `Stale template ${unique()}`;
	const [row] = await db()('templates')
		.insert({
			organisation_id: NORTHFIELD,
			name,
			kind: 'external-wall',
			description: 'As saved',
			created_by: author.id,
			// generic values (common practice, no source)
			build_up: JSON.stringify({
				layers: [
					{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
					{ name: 'Mineral wool', thicknessMm: 140, lambda: 0.035, mu: 1 }
				]
			})
		})
		.returning('id');
	try {
		const a = await openEditing(browser, DEMO.assessor, `/templates/${row.id}`);
		const b = await openEditing(browser, DEMO.admin, `/templates/${row.id}`);

		await a.getByLabel('Description').fill('Saved by the author');
		await a.getByRole('button', { name: 'Save changes' }).click();
		await expect(a.getByRole('status').filter({ hasText: 'Template saved.' })).toBeVisible();

		const typed = `${name} (renamed by the admin)`;
		await b.getByLabel('Name').fill(typed);
		await b.getByLabel('Description').fill('Typed by the admin');
		await b.getByRole('button', { name: 'Save changes' }).click();
		await expect(b.getByTestId('stale-save')).toContainText(STALE);
		await expect(b.getByLabel('Name')).toHaveValue(typed);
		await expect(b.getByLabel('Description')).toHaveValue('Typed by the admin');

		const stored = await db()('templates').where({ id: row.id }).first();
		expect(stored).toMatchObject({ name, description: 'Saved by the author', version: 2 });
		await a.context().close();
		await b.context().close();
	} finally {
		await db()('templates').where({ id: row.id }).delete();
	}
});
