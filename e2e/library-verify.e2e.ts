import { test, expect } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// A supervisor verifies several library entries at once (that the author of a revision may not verify
// it is checked in tests/server/library/verify-bulk.test.ts). Envelo's own rules (common practice, no source). The boards are invented.

test('a supervisor ticks the unverified entries shown and verifies them at once', async ({ browser }) => {
	const tag = Date.now().toString(36).toUpperCase();
	const values = (name: string, code: string) => ({
		code,
		name,
		category: 'insulation',
		lambda: 0.034,
		lambdaKind: 'declared',
		muDry: 1,
		source: 'Invented for an end-to-end test',
		confirmWarnings: true
	});
	const assessor = await browser.newContext();
	await signInAs(assessor, DEMO.assessor);
	for (const n of [1, 2, 3]) {
		const r = await assessor.request.post('/api/v1/materials', {
			data: values(`Bulk board ${n}`, `BV-${tag}-${n}`)
		});
		expect(r.status()).toBe(201);
	}
	const ctx = await browser.newContext();
	await signInAs(ctx, DEMO.supervisor);
	const page = await ctx.newPage();
	await page.goto(`/library?q=BV-${tag}`);
	await waitForApp(page);
	await expect(page.getByTestId('material-row')).toHaveCount(3);
	await page.getByRole('button', { name: 'Tick every unverified one shown (3)' }).click();
	await expect(page.getByLabel(`Tick BV-${tag}-1 for verifying`)).toBeChecked();
	await page.getByRole('button', { name: 'Verify the 3 ticked' }).click();
	const outcome = page.getByTestId('bulk-verify-outcome');
	await expect(outcome).toHaveText(`Verified 3: BV-${tag}-1, BV-${tag}-2, BV-${tag}-3.`);
	await expect(page.getByTestId('material-row').filter({ hasText: `BV-${tag}-1` })).toContainText('Verified');
	await page.screenshot({ path: '/tmp/library-bulk-verify.png' });
	await assessor.close();
	await ctx.close();
});
