import { test, expect } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// The new-batch form counts the matching dwellings and the sample before the batch is created, and
// keeps what was typed; nothing is created until asked. Envelo's own behaviour (common practice, no source).

test('a supervisor counts the dwellings of a new batch before creating it', async ({ page, context }) => {
	await signInAs(context, DEMO.supervisor);
	await page.goto('/audit/new');
	await waitForApp(page);
	await page.getByLabel('Batch name').fill('Counted first');
	// drafts too: the demo's dwellings are not all issued
	await page.getByLabel('Draft').check();
	await page.getByRole('button', { name: 'Count the dwellings first' }).click();
	const preview = page.getByTestId('batch-preview');
	await expect(preview).toContainText(/\d+ dwellings? match; the sample will hold \d+/);
	const text = await preview.locator('p').first().innerText();
	const [population, sample] = [...text.matchAll(/\d+/g)].map((m) => Number(m[0]));
	expect(sample).toBeLessThanOrEqual(population);
	// the table adds up to the population
	const matching = await preview.locator('tbody tr td:nth-child(2)').allInnerTexts();
	expect(matching.map(Number).reduce((a, b) => a + b, 0)).toBe(population);
	await expect(page.getByLabel('Batch name')).toHaveValue('Counted first');
	await expect(page.getByLabel('Draft')).toBeChecked();
	await expect(page).toHaveURL(/\/audit\/new/);
	await page.screenshot({ path: '/tmp/audit-preview.png', fullPage: true });
});
