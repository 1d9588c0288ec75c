import { test, expect } from '@playwright/test';
import { writeFileSync } from 'node:fs';
import { DEMO, db, signInAs, waitForMail } from './helpers';

// The supervisor audit end to end on the demo programme (our own workflow: common practice, no source).
test('a supervisor audits the demo programme; the assessor answers a return; the supervisor accepts', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const since = new Date(Date.now() - 1000).toISOString();
	const sup = await browser.newContext();
	await signInAs(sup, DEMO.supervisor);
	const page = await sup.newPage();

	await page.goto('/audit/new');
	await page.getByLabel('Batch name').fill('Demo programme check');
	const programme = page.getByLabel('Programme');
	const option = await programme
		.locator('option')
		.filter({ hasText: /Larkfield/ })
		.first()
		.getAttribute('value');
	await programme.selectOption(option!);
	await page.getByLabel('Draft').check();
	await page.getByLabel('All dwellings').check();
	await page.getByRole('button', { name: 'Create batch and recompute' }).click();
	await page.waitForURL(/\/audit\/[0-9a-f-]{36}$/);
	const batchId = page.url().split('/').pop()!;
	await expect(page.getByTestId('progress')).toHaveAttribute('data-state', 'done', { timeout: 60_000 });
	await expect(page.getByRole('progressbar')).toBeVisible();
	// the audit state and the dwelling's own status are two separate columns
	await expect(page.getByTestId('dwelling-status').first()).toHaveText('Draft');
	await page.screenshot({ path: '/tmp/audit-batch.png', fullPage: true });
	// the flags by kind: choosing one flag leaves the dwellings that have it, and back
	const [{ n: notIssued }] = await db()('audit_items')
		.where({ batch_id: batchId })
		.whereRaw(`exists (select 1 from jsonb_array_elements(flags) f where f->>'code' = 'not-issued')`)
		.count<{ n: string }[]>('* as n');
	const allRows = await page.getByTestId('items').locator('tbody tr').count();
	await page.getByTestId('flag-kind-filter').selectOption('code:not-issued');
	await expect(page.getByTestId('items').locator('tbody tr')).toHaveCount(Number(notIssued));
	await page.getByTestId('flag-kind-filter').selectOption('');
	await expect(page.getByTestId('items').locator('tbody tr')).toHaveCount(allRows);

	// a flagged dwelling of Ben Okafor that can be issued
	const ben = await db()('users').where({ email: DEMO.assessor }).first('id');
	const candidates = await db()('audit_items as i')
		.join('dwellings as d', 'd.id', 'i.dwelling_id')
		.where({ 'i.batch_id': batchId, 'd.assessor_id': ben.id })
		.whereRaw('jsonb_array_length(i.flags) > 0')
		.orderBy('d.reference')
		.select('i.id', 'd.id as dwelling_id', 'd.reference');
	expect(candidates.length).toBeGreaterThan(0);
	const assessor = await browser.newContext();
	await signInAs(assessor, DEMO.assessor);
	const apage = await assessor.newPage();
	// Issuing asks for confirmation; accept it as the assessor would.
	apage.on('dialog', (d) => void d.accept());
	let chosen: (typeof candidates)[number] | null = null;
	for (const c of candidates) {
		await apage.goto(`/dwellings/${c.dwelling_id}/reports`);
		if (await apage.getByRole('button', { name: 'Issue dwelling report' }).isEnabled()) {
			chosen = c;
			break;
		}
	}
	expect(chosen, 'a dwelling of the demo assessor that can be issued').not.toBeNull();

	await page.goto(`/audit/${batchId}/items/${chosen!.id}`);
	await expect(page.getByTestId('flags')).toBeVisible();
	await page.screenshot({ path: '/tmp/audit-review.png', fullPage: true });
	// one kind of flag at a time: only its heading is left, then every kind again
	const kind = page.getByTestId('flag-filter').getByLabel('Kind');
	await kind.selectOption('record');
	await expect(page.getByTestId('flags').getByRole('heading')).toHaveText(['Issued record and recompute']);
	await expect(page.getByTestId('flags')).toContainText('No issued report');
	await kind.selectOption('');
	// keyboard: 3 chooses "Returned for correction"; c focuses the comment without typing a "c"; once in the
	// comment every key types (digits and shortcut letters too) and Ctrl+Enter records
	await page.locator('body').press('3');
	await expect(page.getByLabel('Returned for correction')).toBeChecked();
	await page.locator('body').press('c');
	const commentBox = page.getByLabel(/^Comment/);
	await expect(commentBox).toBeFocused();
	await expect(commentBox).toHaveValue('');
	const typed =
		'Issue the dwelling report before the audit; check the loft insulation thickness (1 2 3, j k n b c).';
	await page.keyboard.type(typed);
	await expect(commentBox).toHaveValue(typed);
	await expect(page.getByLabel('Returned for correction')).toBeChecked();
	await page.keyboard.press('Control+Enter');
	await expect(page.getByTestId('item-state')).toHaveText(/Returned/);
	const stored = await db()('audit_items').where({ id: chosen!.id }).first('comment');
	expect(stored.comment).toBe(typed);
	await expect(page.locator('[aria-label="History"]')).toContainText('Decision: Returned for correction by');

	// the assessor: e-mail, "Returned to me", re-issue, resubmit
	const mail = await waitForMail(
		DEMO.assessor,
		new RegExp(`Returned for correction: ${chosen!.reference}`),
		since
	);
	expect(mail.text).toContain('check the loft insulation thickness');
	await apage.goto('/audit/returned');
	const card = apage.getByTestId('returned-item').filter({ hasText: chosen!.reference });
	await expect(card).toContainText('check the loft insulation thickness');
	await expect(card.getByRole('button', { name: 'Resubmit for review' })).toBeDisabled();
	await apage.goto(`/dwellings/${chosen!.dwelling_id}/reports`);
	await apage.getByRole('button', { name: 'Issue dwelling report' }).click();
	await expect
		.poll(
			async () =>
				(await db()('reports').where({ dwelling_id: chosen!.dwelling_id, scope: 'dwelling' })).length,
			{ timeout: 30_000 }
		)
		.toBeGreaterThan(0);
	await apage.goto('/audit/returned');
	await card
		.getByLabel('What you corrected')
		.fill('Issued the dwelling report; loft insulation checked on site.');
	await card.getByRole('button', { name: 'Resubmit for review' }).click();
	await expect(apage.getByRole('status')).toContainText('back with the supervisor');
	await apage.screenshot({ path: '/tmp/audit-returned.png', fullPage: true });

	// the supervisor sees the resubmission and accepts; both decisions stay in the history
	await page.goto(`/audit/${batchId}/items/${chosen!.id}`);
	await expect(page.getByTestId('item-state')).toHaveText(/Resubmitted/);
	await page.locator('body').press('1');
	await expect(page.locator('input[name="decision"][value="accepted"]')).toBeChecked();
	await page.getByRole('button', { name: 'Record decision' }).click();
	await expect(page.getByTestId('item-state')).toHaveText(/^Accepted/);
	const history = page.locator('[aria-label="History"]');
	await expect(history).toContainText('Returned for correction');
	await expect(history).toContainText('Resubmitted by Ben Okafor');
	await expect(history).not.toContainText('Decision :');
	await page.screenshot({ path: '/tmp/audit-accepted.png', fullPage: true });

	// exports
	const csv = await page.request.get(`/audit/${batchId}/summary.csv`);
	expect(csv.headers()['content-type']).toContain('text/csv');
	expect(await csv.text()).toContain(chosen!.reference);
	const pdf = await page.request.get(`/audit/${batchId}/report.pdf`);
	expect(pdf.headers()['content-type']).toBe('application/pdf');
	writeFileSync('/tmp/audit-report.pdf', await pdf.body());
	await sup.close();
	await assessor.close();
});
