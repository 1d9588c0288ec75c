import { test, expect } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { DEMO, signInAs } from './helpers';

// The library in the browser: upload a CSV, read the preview, confirm, find the new materials in the
// table; a bad file gets its message; a supervisor verifies. (Our own workflow: common practice, no source.)

const HEAD = 'code;name;category;lambda;lambda_kind;mu_dry;density;source\n';

test('upload a CSV, read the preview, confirm, and find the new materials in the table', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const tag = randomBytes(3).toString('hex').toUpperCase();
	const csv =
		'\uFEFF' +
		HEAD +
		`E2E-${tag}-1;"Wood fibre board; flexible";insulation;0,038;declared;2;55;Declaration of performance E2E-1\n` +
		`E2E-${tag}-2;Hemp batt;insulation;0,040;declared;1;40;Declaration of performance E2E-2\n` +
		`E2E-${tag}-3;Odd board;insulation;O.035;declared;1;40;Declaration of performance E2E-3\n` +
		`E2E-${tag}-4;Short row;insulation\n`;

	await page.goto('/library');
	await expect(page.getByTestId('material-row').first()).toBeVisible();
	await page.getByRole('link', { name: 'Import CSV' }).click();
	await page
		.getByTestId('csv-file')
		.setInputFiles({ name: 'e2e-materials.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
	await page.getByRole('button', { name: 'Preview' }).click();
	const preview = page.getByTestId('import-preview');
	await expect(preview).toContainText('separated by semicolons');
	await expect(preview).toContainText('decimal comma');
	await expect(preview).toContainText('byte-order mark');
	// The rows that need a look come first; "All" shows every row.
	await expect(page.getByRole('button', { name: 'Needs a look 2' })).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('preview-row')).toHaveCount(2);
	await page.getByRole('button', { name: 'All 4' }).click();
	await expect(page.getByTestId('preview-row')).toHaveCount(4);
	await expect(preview).toContainText("line 4, lambda: 'O.035' is not a number");
	// a row whose cells cannot be placed: no column name, the code it seems to carry
	await expect(preview).toContainText(
		`line 5: the row for 'E2E-${tag}-4' has 3 cells but the header has 8 columns`
	);
	await expect(preview).not.toContainText('(line)');
	await page.screenshot({ path: '/tmp/library-import-preview.png', fullPage: true });
	await page.getByRole('button', { name: 'Confirm and import 2 rows' }).click();
	await expect(page.getByTestId('import-summary')).toContainText(
		'2 added, 0 changed (new revisions), 0 unchanged, 2 rejected'
	);

	await page.getByRole('link', { name: 'Open the library' }).click();
	await page.getByRole('searchbox').fill(`E2E-${tag}`);
	await expect(page.getByTestId('material-row')).toHaveCount(2);
	await expect(page.getByTestId('library-table')).toContainText('Wood fibre board; flexible');
	await expect(page.getByTestId('library-table')).toContainText('0.038');
	// λ to three decimals: 0,040 shows as 0.040, not 0.04
	await expect(page.getByTestId('material-row').filter({ hasText: 'Hemp batt' })).toContainText('0.040');
	await page.screenshot({ path: '/tmp/library-list.png', fullPage: true });
});

test('a bad file gets its own message', async ({ page, context }) => {
	await signInAs(context, DEMO.assessor);
	await page.goto('/library/import');
	await page.getByTestId('csv-file').setInputFiles({
		name: 'latin1.csv',
		mimeType: 'text/csv',
		buffer: readFileSync('fixtures/bad-csv/latin1.csv')
	});
	await page.getByRole('button', { name: 'Preview' }).click();
	await expect(page.getByTestId('import-error')).toContainText('The file is not UTF-8 text: line 2');
});

test('a supervisor verifies a material; its page shows the history', async ({ page, context }) => {
	await signInAs(context, DEMO.supervisor);
	await page.goto('/library?q=G-INS-CORK-040');
	await page.getByRole('link', { name: 'G-INS-CORK-040' }).click();
	await expect(page.getByRole('heading', { name: 'Expanded cork board' })).toBeVisible();
	await expect(page.getByTestId('revision-history')).toContainText('First revision');
	const verify = page.getByRole('button', { name: /Verify revision/ });
	if (await verify.isVisible()) {
		await verify.click();
		await expect(page.getByRole('status')).toContainText('Revision verified.');
	}
	await expect(page.getByTestId('revision-history')).toContainText(/Verified\s*by Dara Quinn/);
	await page.screenshot({ path: '/tmp/library-material.png', fullPage: true });
});
