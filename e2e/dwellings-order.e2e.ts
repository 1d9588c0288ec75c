import { test, expect } from '@playwright/test';
import { DEMO, db, signInAs } from './helpers';

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const BEN = '00000000-0000-4000-8000-000000000102';
const DARA = '00000000-0000-4000-8000-000000000104';

/** A fresh Northfield dwelling of Ben's with three doors (given U, so nothing to compute). */
async function arrangeDwelling(status = 'draft') {
	const reference = `ORD-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
	const [d] = await db()('dwellings')
		.insert({
			organisation_id: NORTHFIELD,
			reference,
			address: '4 Test Row (invented)',
			assessor_id: BEN,
			status
		})
		.returning('id');
	const names = ['Alpha door', 'Bravo door', 'Charlie door'];
	await db()('elements').insert(
		names.map((name, position) => ({
			organisation_id: NORTHFIELD,
			dwelling_id: d.id,
			position,
			name,
			kind: 'door',
			area: 2,
			heat_flow: 'horizontal',
			given_u: 1.8,
			given_u_source: 'declared (test)'
		}))
	);
	return { id: d.id as string, reference };
}

// Element order with the keyboard only: the focus stays on the moved element's arrow.
test('an assessor moves elements up and down with the keyboard; the order is kept', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const d = await arrangeDwelling();
	await page.goto(`/dwellings/${d.id}`);
	const names = () => page.getByTestId('element-row').locator('td:first-child').allInnerTexts();
	await expect.poll(names).toEqual(['Alpha door', 'Bravo door', 'Charlie door']);
	await expect(page.getByRole('button', { name: 'Move “Alpha door” up' })).toBeDisabled();

	await page.getByRole('button', { name: 'Move “Alpha door” down' }).focus();
	await page.keyboard.press('Enter');
	await expect.poll(names).toEqual(['Bravo door', 'Alpha door', 'Charlie door']);
	await expect(page.getByRole('status')).toContainText('Moved “Alpha door” down to place 2 of 3');
	await expect(page.getByRole('button', { name: 'Move “Alpha door” down' })).toBeFocused();

	await page.keyboard.press('Space');
	await expect.poll(names).toEqual(['Bravo door', 'Charlie door', 'Alpha door']);
	// At the bottom its down arrow is disabled, so the focus goes to its up arrow.
	await expect(page.getByRole('button', { name: 'Move “Alpha door” down' })).toBeDisabled();
	await expect(page.getByRole('button', { name: 'Move “Alpha door” up' })).toBeFocused();

	// The details form took the new dwelling version: saving details after a move is not refused as stale.
	await page.getByRole('button', { name: 'Edit details' }).click();
	await page.getByLabel('Address', { exact: true }).fill('5 Test Row (invented)');
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();

	await page.screenshot({ path: '/tmp/polish-dwelling-order.png', fullPage: true });
	await page.reload();
	await expect.poll(names).toEqual(['Bravo door', 'Charlie door', 'Alpha door']);
	const rows = await db()('elements').where({ dwelling_id: d.id }).orderBy('position').select('name');
	expect(rows.map((r) => r.name)).toEqual(['Bravo door', 'Charlie door', 'Alpha door']);
});

test('a returned dwelling shows the supervisor’s comment and leads to Returned to me', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const d = await arrangeDwelling('returned');
	const [batch] = await db()('audit_batches')
		.insert({
			organisation_id: NORTHFIELD,
			name: `Order test batch ${d.reference}`,
			sampling: JSON.stringify({ rule: 'all', includeFlagged: true }),
			seed: 'e2e',
			created_by: DARA
		})
		.returning('id');
	await db()('audit_items').insert({
		organisation_id: NORTHFIELD,
		batch_id: batch.id,
		dwelling_id: d.id,
		picked_because: 'all dwellings of the batch',
		decision: 'returned',
		comment: 'The front door U-value needs its source document.',
		decided_by: DARA,
		decided_at: new Date()
	});
	await page.goto(`/dwellings/${d.id}`);
	const note = page.getByTestId('returned-note');
	await expect(note.getByRole('heading', { name: 'Returned for correction' })).toBeVisible();
	await expect(note).toContainText('The front door U-value needs its source document.');
	await expect(note).toContainText('Dara Quinn');
	await page.screenshot({ path: '/tmp/polish-dwelling-returned.png', fullPage: true });
	await note.getByRole('link', { name: 'Returned to me' }).click();
	await expect(page.getByRole('heading', { name: 'Returned to me' })).toBeVisible();
	await expect(page.getByTestId('returned-item').filter({ hasText: d.reference })).toBeVisible();
});
