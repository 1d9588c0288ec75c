import { test, expect } from '@playwright/test';
import path from 'node:path';
import { DEMO, db, signInAs } from './helpers';

// Climates, limit tables and templates as an admin, an assessor and a supervisor see them. The checks
// are Envelo's own rules (common practice, no source); the figures are the invented demo ones.

const FIXTURES = path.resolve('fixtures/climates');
const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const shot = (name: string) => `/tmp/climates-${name}.png`;

test('an admin imports a climate from CSV: line-level errors first, then the good file', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.admin);
	await page.goto('/climates', { waitUntil: 'networkidle' });
	await expect(
		page.getByTestId('climate-row').filter({ hasText: 'Demo coastal town (invented)' })
	).toContainText('Illustrative — not for design');

	const name = `Imported ${Date.now()}`;
	const form = page.locator('form[action="?/import"]');
	await form.getByLabel('Name').fill(name);
	await form.getByLabel('Source of the figures').fill('Invented test figures');
	await form.getByLabel('CSV file').setInputFiles(path.join(FIXTURES, 'bad/text-in-number.csv'));
	await form.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByTestId('csv-problems')).toContainText(
		"line 7, relative_humidity: '1O5' is not a number"
	);
	expect(await db()('climates').where({ organisation_id: NORTHFIELD, name }).first()).toBeUndefined();

	await form.getByLabel('CSV file').setInputFiles(path.join(FIXTURES, 'bad/duplicate-month.csv'));
	await form.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByTestId('csv-problems')).toContainText('month 4 appears twice');
	await page.screenshot({ path: shot('import-errors'), fullPage: true });

	await form.getByLabel('Name').fill(name);
	await form.getByLabel('Source of the figures').fill('Invented test figures');
	await form
		.getByLabel('CSV file')
		.setInputFiles(path.join(FIXTURES, 'demo-semicolon-decimal-comma-invented.csv'));
	await form.getByRole('button', { name: 'Import' }).click();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
	const months = page.getByTestId('months');
	await expect(months.locator('tbody tr')).toHaveCount(12);
	await expect(months.locator('tbody tr').first()).toContainText('January (coldest)');
	await expect(months.locator('tbody tr').first()).toContainText('−0.5'.replace('−', '-'));
	await page.screenshot({ path: shot('detail'), fullPage: true });
});

test('an admin enters a climate by hand, gets field errors, and cannot delete one in use', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.admin);
	await page.goto('/climates', { waitUntil: 'networkidle' });
	await page.getByText('New climate, by hand').click();
	const form = page.locator('form[action="?/create"]');
	const name = `Hand entered ${Date.now()}`;
	await form.getByLabel('Name').fill(name);
	await form.getByLabel('Source of the figures').fill('Invented test figures');
	// Paste twelve rows from a spreadsheet into January's temperature.
	const rows = Array.from({ length: 12 }, (_, i) => `${(i * 1.5).toFixed(1)}\t${80 + (i % 3)}`).join('\n');
	await form.getByLabel('January temperature, °C').focus();
	await page.evaluate((text) => {
		const dt = new DataTransfer();
		dt.setData('text/plain', text);
		document.activeElement?.dispatchEvent(
			new ClipboardEvent('paste', { clipboardData: dt, bubbles: true, cancelable: true })
		);
	}, rows);
	await expect(form.getByLabel('December temperature, °C')).toHaveValue('16.5');
	await expect(form.getByLabel('Name')).toHaveValue(name);
	await form.getByLabel('July relative humidity, %').fill('1O5');
	await form.getByRole('button', { name: 'Save climate' }).click();
	await expect(page.getByText('must be a finite number, got the text "1O5"')).toBeVisible();
	await page.screenshot({ path: shot('form-errors'), fullPage: true });
	await form.getByLabel('July relative humidity, %').fill('81');
	await form.getByRole('button', { name: 'Save climate' }).click();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();

	// In use by a dwelling: refused with the reason.
	const climate = await db()('climates').where({ organisation_id: NORTHFIELD, name }).first('id');
	await db()('dwellings').insert({
		organisation_id: NORTHFIELD,
		reference: `E2E-CL-${Date.now()}`,
		climate_id: climate.id
	});
	await page.reload({ waitUntil: 'networkidle' });
	page.once('dialog', (d) => d.accept());
	await page.getByRole('button', { name: 'Delete' }).click();
	await expect(page.getByRole('alert')).toContainText('is used by 1 dwelling');
	expect(await db()('climates').where({ id: climate.id }).first()).toBeDefined();
});

test('an admin keeps limit tables: field errors, a new table made default', async ({ page, context }) => {
	await signInAs(context, DEMO.admin);
	await page.goto('/organisation', { waitUntil: 'networkidle' });
	await page.getByRole('link', { name: 'Limit tables' }).click();
	await expect(page.getByTestId('limit-tables')).toContainText('Demo scheme fabric limits');
	await expect(page.getByTestId('limit-tables')).toContainText('Default');

	await page.getByText('New limit table').click();
	const form = page.locator('form[action="?/create"]');
	const name = `Scheme ${Date.now()}`;
	await form.getByLabel('Name').fill(name);
	await form.getByLabel('Edition').fill('Test edition');
	await form.getByLabel('Maximum U, External wall').fill('0');
	await form.getByLabel('Maximum U, Flat roof').fill('abc');
	await form.getByRole('button', { name: 'Save limit table' }).click();
	await expect(page.getByText('must be greater than 0 W/(m²·K)')).toBeVisible();
	await expect(page.getByText('must be a number in W/(m²·K)')).toBeVisible();
	await form.getByLabel('Maximum U, External wall').fill('0.28');
	await form.getByLabel('Maximum U, Flat roof').fill('0,15');
	await form.getByRole('button', { name: 'Save limit table' }).click();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
	await expect(page.getByTestId('limits')).toContainText('0.15');
	// Making a table the default asks first: it changes how every dwelling without its own table is judged.
	let asked = '';
	page.once('dialog', (d) => {
		asked = d.message();
		void d.accept();
	});
	await page.getByRole('button', { name: 'Make default' }).click();
	await expect(page.getByTestId('default-badge')).toBeVisible();
	expect(asked).toMatch(/the organisation's default\? Every dwelling without a limit table of its own/);
	await page.goto('/organisation/limit-tables', { waitUntil: 'networkidle' });
	await page.screenshot({ path: shot('limit-tables'), fullPage: true });

	// Put the demo table back as the default so other suites see the seeded state.
	const demo = await db()('limit_tables')
		.where({ organisation_id: NORTHFIELD, name: 'Demo scheme fabric limits' })
		.first('id');
	await page.goto(`/organisation/limit-tables/${demo.id}`, { waitUntil: 'networkidle' });
	page.once('dialog', (d) => void d.accept());
	await page.getByRole('button', { name: 'Make default' }).click();
	await expect(page.getByTestId('default-badge')).toBeVisible();

	// The default judges the demo dwellings: new limits are refused until the admin confirms; nothing is
	// saved here, so other suites keep the seeded limits.
	await page.getByRole('button', { name: 'Edit' }).click();
	await expect(page.getByTestId('limit-change-warning')).toContainText(/used by \d+ dwellings/);
	await expect(page.getByTestId('limit-change-warning')).toContainText(
		'Issued reports keep the limits they were issued with'
	);
	const wall = page.getByLabel('Maximum U, External wall');
	const before = await wall.inputValue();
	await wall.fill('0.27');
	await page.getByRole('button', { name: 'Save changes' }).click();
	await expect(page.getByRole('alert')).toContainText('Not saved: tick the box to confirm the new limits');
	await expect(page.getByTestId('limit-changes')).toContainText(
		`External wall: ${Number(before).toFixed(2)}`
	);
	await page.screenshot({ path: shot('limit-table-confirm'), fullPage: true });
	const stored = await db()('limit_tables').where({ id: demo.id }).first('limits');
	expect(stored.limits['external-wall']).toBe(Number(before));
});

test('an assessor reads templates with a guide U-value; a supervisor cannot change them', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	await page.goto('/templates', { waitUntil: 'networkidle' });
	const row = page.getByTestId('template-row').filter({ hasText: 'Masonry cavity wall' });
	await expect(row).toContainText('External wall');
	await expect(row.locator('td').nth(4)).toHaveText(/^0\.\d\d$/);
	await page.screenshot({ path: shot('templates'), fullPage: true });
	await row.getByRole('link').click();
	await expect(page.getByTestId('layers').locator('tbody tr')).toHaveCount(4);
	await expect(page.getByTestId('template-u')).toContainText('W/(m²·K)');
	// The seeded template was saved by the admin: the assessor may duplicate it, not change it.
	await expect(page.getByRole('button', { name: 'Edit' })).toHaveCount(0);
	await page.getByRole('button', { name: 'Duplicate' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toContainText('(copy');
	await expect(page.getByRole('button', { name: 'Edit' })).toBeVisible();
	await page.screenshot({ path: shot('template'), fullPage: true });

	await context.clearCookies();
	await signInAs(context, DEMO.supervisor);
	await page.reload({ waitUntil: 'networkidle' });
	await expect(page.getByTestId('layers')).toBeVisible();
	await expect(page.getByRole('button', { name: /Edit|Delete|Duplicate/ })).toHaveCount(0);
});
