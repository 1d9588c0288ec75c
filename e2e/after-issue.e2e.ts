import { test, expect } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// Issued and accepted work never changes silently (Envelo's own workflow; common practice, no source):
// issue, accept, then change a wall with a reason; the dwelling is marked, the report no longer matches,
// and the supervisor sees the change in the queue. A dwelling of its own, so no other suite is touched.
test('issue, accept, reopen with a reason and change: marked everywhere, in the supervisor’s queue', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const ben = await browser.newContext();
	await signInAs(ben, DEMO.assessor);
	const apage = await ben.newPage();
	apage.on('dialog', (d) => void d.accept());
	const reference = `E2E-R-${Date.now().toString(36)}`;
	const created = await apage.request.post('/api/v1/dwellings', {
		data: { reference, address: '4 Reopen Row, Testville', stage: 'design' }
	});
	expect(created.status()).toBe(201);
	const dwelling = await created.json();
	// 215 mm brick, λ 0.77, μ 10: a plain solid wall (generic values, common practice, no source)
	const el = await apage.request.post(`/api/v1/dwellings/${dwelling.id}/elements`, {
		data: {
			name: 'Street wall',
			kind: 'external-wall',
			area: 18,
			buildUp: { layers: [{ name: 'Brick', thicknessMm: 215, lambda: 0.77, mu: 10 }] },
			internal: { temperature: 20, relativeHumidity: 50 }
		}
	});
	expect(el.status()).toBe(201);
	const element = await el.json();
	await apage.goto(`/dwellings/${dwelling.id}/reports`);
	await waitForApp(apage);
	await apage.getByRole('button', { name: 'Issue dwelling report' }).click();
	await expect(apage.getByTestId('report-row')).toHaveCount(1, { timeout: 30_000 });

	// the supervisor accepts it
	const sup = await browser.newContext();
	await signInAs(sup, DEMO.supervisor);
	const spage = await sup.newPage();
	const batch = await spage.request.post('/api/v1/audit/batches', {
		data: {
			name: `Check ${reference}`,
			source: 'references',
			references: [reference],
			sampling: { rule: 'all' }
		}
	});
	expect(batch.status()).toBe(201);
	const { id: batchId } = await batch.json();
	const item = await db()('audit_items').where({ batch_id: batchId }).first('id');
	await spage.goto(`/audit/${batchId}/items/${item.id}`);
	await waitForApp(spage);
	await spage.locator('input[name="decision"][value="accepted"]').check();
	await spage.getByRole('button', { name: 'Record decision' }).click();
	await expect(spage.getByTestId('item-state')).toHaveText(/^Accepted/);
	await expect(spage.getByTestId('standing')).toContainText('Still matches what was decided');

	// the assessor opens the wall: it asks for a reason first
	await apage.goto(`/dwellings/${dwelling.id}/elements/${element.id}`);
	await waitForApp(apage);
	const reopen = apage.getByTestId('reopen');
	await expect(reopen).toContainText('Accepted: reopen before changing');
	const refused = await apage.request.put(`/api/v1/elements/${element.id}`, {
		data: { ...element, version: element.version }
	});
	expect(refused.status()).toBe(409);
	expect((await refused.json()).code).toBe('reopen-required');
	await reopen
		.getByLabel('Why does it change?')
		.fill('The wall was measured again on site: 300 mm of brick.');
	await reopen.getByRole('button', { name: 'Reopen for changes' }).click();
	await expect(apage.getByTestId('reopen')).toHaveCount(0);
	await apage.getByLabel('Layer 1 thickness in mm').fill('300');
	await apage.getByRole('button', { name: 'Save', exact: true }).click();
	await expect(apage.getByTestId('save-message')).toContainText(/Saved/i);

	// the dwelling says so, with the change list; the report no longer matches
	await apage.goto(`/dwellings/${dwelling.id}`);
	await expect(apage.getByRole('heading', { name: reference })).toContainText('Changed after acceptance');
	const changed = apage.getByTestId('changed-since-issue');
	await expect(changed).toBeVisible();
	await expect(changed.getByTestId('change-list')).toContainText('Layer 1, thickness (mm)');
	await expect(changed.getByTestId('change-list')).toContainText('215');
	await expect(changed.getByTestId('change-list')).toContainText('300');
	await apage.screenshot({ path: '/tmp/after-issue-dwelling.png', fullPage: true });
	await apage.goto(`/dwellings/${dwelling.id}/reports`);
	await expect(apage.getByTestId('no-longer-matches')).toBeVisible();
	await apage.goto(`/dwellings?changed=1&status=all&q=${reference}`);
	await expect(apage.getByTestId('changed-mark')).toHaveCount(1);

	// someone who is not the dwelling's assessor is told why instead of being offered Issue
	await spage.goto(`/dwellings/${dwelling.id}/reports`);
	await expect(spage.getByTestId('issue-refusal')).toContainText('Only assessors and admins issue reports');
	await expect(spage.getByRole('button', { name: 'Issue dwelling report' })).toHaveCount(0);
	await expect(spage.getByRole('navigation', { name: 'Breadcrumb' })).toHaveText(
		/Dwellings\s*\/\s*E2E-R-\S+\s*\/\s*Reports$/
	);

	// the supervisor's queue and the audit item
	await spage.goto('/audit');
	const queue = spage.getByTestId('changed-queue');
	await expect(queue).toContainText(reference);
	await expect(queue).toContainText('measured again on site');
	await spage.screenshot({ path: '/tmp/after-issue-queue.png', fullPage: true });
	await spage.goto(`/audit/${batchId}/items/${item.id}`);
	const standing = spage.getByTestId('standing');
	await expect(standing).toContainText('Changed after the decision');
	await expect(standing.getByTestId('standing-changes')).toContainText('Layer 1, thickness (mm) 215 → 300');
	await spage.screenshot({ path: '/tmp/after-issue-item.png', fullPage: true });
	await ben.close();
	await sup.close();
});
