import { test, expect, type Page } from '@playwright/test';
import { randomBytes } from 'node:crypto';
import { DEMO, signInAs, waitForApp } from './helpers';

// Undo and redo of the element draft, a removed layer brought back without a confirm box, the
// bridging material from the library, and messages that name fields as the screen does. The values are
// the demo library's (invented for the demo); no U-value is asserted here beyond there being one.

async function newElement(page: Page) {
	const reference = `E2E-H-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
}

test('undo and redo by keyboard and button, a removed layer undone, the bridging from the library', async ({
	page,
	context
}) => {
	const dialogs: string[] = [];
	page.on('dialog', (d) => {
		dialogs.push(d.message());
		void d.dismiss();
	});
	const errors: string[] = [];
	page.on('pageerror', (e) => errors.push(e.message));
	await signInAs(context, DEMO.assessor);
	await newElement(page);

	const undo = page.getByRole('button', { name: 'Undo', exact: true });
	const redo = page.getByRole('button', { name: 'Redo', exact: true });
	const rows = page.getByTestId('layer-row');
	await expect(undo).toBeDisabled();
	await expect(redo).toBeDisabled();

	await page.getByLabel('Area m²', { exact: true }).fill('20');
	await page.getByLabel('Layer 1 name').fill('Plasterboard');
	// a run of keystrokes in one field is one step: Ctrl+Z in the field takes the whole run back
	const t1 = page.getByLabel('Layer 1 thickness in mm');
	await t1.click();
	await t1.pressSequentially('12.5');
	await expect(undo).toBeEnabled();
	await t1.press('Control+z');
	await expect(t1).toHaveValue('');
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Plasterboard');
	await expect(redo).toBeEnabled();
	await t1.press('Control+Shift+z');
	await expect(t1).toHaveValue('12.5');
	await expect(redo).toBeDisabled();
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('0.21');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('10');

	// a button change: Add layer, undone by the Undo button, redone by Ctrl+Y
	await page.getByRole('button', { name: 'Add layer' }).click();
	await expect(rows).toHaveCount(2);
	await undo.click();
	await expect(rows).toHaveCount(1);
	await page.keyboard.press('Control+y');
	await expect(rows).toHaveCount(2);
	await page.screenshot({ path: 'test-results/editor-history-1-layers.png', fullPage: true });

	// Layer 2: mineral wool between studs, the studs from the library
	await page.getByLabel('Layer 2 name').fill('Mineral wool between studs');
	await page.getByLabel('Layer 2 thickness in mm').fill('140');
	await page.getByLabel('Layer 2 λ in W/(m·K)').fill('0.035');
	await page.getByLabel('Layer 2 vapour resistance factor μ').fill('1');
	await page.getByLabel('Layer 2 is bridged').check();
	await page.getByRole('button', { name: 'Choose layer 2 bridging material from the library' }).click();
	await page.getByLabel('Search the library').fill('softwood');
	await expect(page.locator('#material-results').getByRole('option').first()).toContainText('Softwood');
	await expect(page.getByTestId('material-picker')).toContainText('copied into the bridging');
	await page.screenshot({ path: 'test-results/editor-history-2-bridge-picker.png', fullPage: true });
	await page.getByLabel('Search the library').press('Enter');
	await expect(page.getByLabel('Layer 2 bridging material', { exact: true })).toHaveValue('Softwood');
	await expect(page.getByLabel('Layer 2 bridging λ in W/(m·K)')).toHaveValue('0.13');
	await expect(page.getByLabel('Layer 2 bridging μ')).toHaveValue('50');
	await expect(page.getByTestId('bridge-library-link')).toContainText('G-TIM-SOFT-500');
	// the pick is one step of its own
	await undo.click();
	await expect(page.getByLabel('Layer 2 bridging λ in W/(m·K)')).toHaveValue('');
	await expect(page.getByTestId('bridge-library-link')).toHaveCount(0);
	await redo.click();
	await expect(page.getByLabel('Layer 2 bridging λ in W/(m·K)')).toHaveValue('0.13');

	// a bad stud width: the message names the field as the screen does, and says what to do
	await page.getByLabel('Layer 2 bridging given as').selectOption('geometry');
	await page.getByLabel('Layer 2 member width in mm').fill('abc');
	await page.getByLabel('Layer 2 member centres in mm').fill('600');
	const message = page.getByText('Layer 2, member width: enter a number in mm, e.g. 38');
	await expect(message).toBeVisible();
	await page.screenshot({ path: 'test-results/editor-history-3-labelled-message.png', fullPage: true });
	const text = (await page.locator('main').innerText()).replace(/e\.g\./g, '');
	expect(text).not.toMatch(/bridgeGeometry|widthMm|buildUp|layers\.\d|bridge\.fraction/);
	await page.getByLabel('Layer 2 member width in mm').fill('38');
	await expect(message).toHaveCount(0);
	await expect(page.getByTestId('live-u')).toBeVisible();

	// moving a layer is a step: undone, the order is back
	await page.getByRole('button', { name: 'Move layer 2 up' }).click();
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Mineral wool between studs');
	await page.keyboard.press('Control+z');
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Plasterboard');

	// "Use N mm" (the thickness that meets the limit) is a step: undone by keyboard, redone by button
	const t2 = page.getByLabel('Layer 2 thickness in mm');
	await t2.fill('60');
	const useMm = page.getByTestId('thickness-solver').getByRole('button', { name: /^Use \d+ mm$/ });
	await expect(useMm).toBeVisible();
	const mm = (await useMm.textContent())!.match(/\d+/)![0];
	await useMm.click();
	await expect(t2).toHaveValue(mm);
	await page.keyboard.press('Control+z');
	await expect(t2).toHaveValue('60');
	await redo.click();
	await expect(t2).toHaveValue(mm);
	await t2.fill('140');

	// removing a layer asks nothing; a notice offers Undo, which brings it back with its values
	await page.waitForTimeout(300); // the live result follows typing after a short debounce
	const u = await page.getByTestId('live-u').textContent();
	await page.getByRole('button', { name: 'Remove layer 1' }).click();
	await expect(rows).toHaveCount(1);
	const notice = page.getByTestId('layer-removed');
	await expect(notice).toContainText('Layer 1 “Plasterboard” removed');
	await page.screenshot({ path: 'test-results/editor-history-4-removed.png', fullPage: true });
	await notice.getByRole('button', { name: 'Undo' }).click();
	await expect(rows).toHaveCount(2);
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Plasterboard');
	await expect(page.getByLabel('Layer 1 thickness in mm')).toHaveValue('12.5');
	await expect(notice).toHaveCount(0);
	await expect(page.getByTestId('live-u')).toHaveText(u!);
	expect(dialogs).toEqual([]);

	// saved, the bridging keeps its library link
	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	await expect(page.getByTestId('bridge-library-link')).toContainText('G-TIM-SOFT-500');
	await expect(page.getByLabel('Layer 2 bridging λ in W/(m·K)')).toHaveValue('0.13');
	// a freshly loaded element has nothing to undo
	await expect(page.getByRole('button', { name: 'Undo', exact: true })).toBeDisabled();
	await page.screenshot({ path: 'test-results/editor-history-5-saved.png', fullPage: true });
	expect(errors).toEqual([]);
});

test('Ctrl+Z in the library search keeps the browser’s own undo and leaves the draft alone', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	await newElement(page);
	await page.getByLabel('Layer 1 name').fill('Brick');
	await page.getByRole('button', { name: 'Choose layer 1 from the library' }).click();
	const search = page.getByLabel('Search the library');
	await search.pressSequentially('dense');
	await search.press('Control+z');
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Brick');
});

test('"Use revision 2" is undone like any change, and the offer comes back', async ({ page, context }) => {
	await signInAs(context, DEMO.assessor);
	const tag = randomBytes(3).toString('hex').toUpperCase();
	// a material of its own, used by an element of its own (invented values, common practice, no source)
	const values = {
		code: `E2E-HIST-${tag}`,
		name: `History test board ${tag}`,
		category: 'insulation',
		lambda: 0.033,
		lambdaKind: 'declared',
		muDry: 1,
		density: 30,
		specificHeat: 1030,
		source: 'Invented for an end-to-end test'
	};
	const created = await page.request.post('/api/v1/materials', {
		data: { ...values, confirmWarnings: true }
	});
	expect(created.status()).toBe(201);
	const material = await created.json();
	const d = await page.request.post('/api/v1/dwellings', {
		data: { reference: `E2E-HIST-${tag}`, address: '1 History Row, Testville', stage: 'design' }
	});
	const dwelling = await d.json();
	const el = await page.request.post(`/api/v1/dwellings/${dwelling.id}/elements`, {
		data: {
			name: 'Wall',
			kind: 'external-wall',
			area: 20,
			buildUp: {
				layers: [
					{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
					{
						name: values.name,
						thicknessMm: 100,
						lambda: 0.033,
						mu: 1,
						materialId: material.id,
						materialRevisionId: material.revisionId,
						materialCode: values.code
					}
				]
			},
			internal: { temperature: 20, relativeHumidity: 50 }
		}
	});
	expect(el.status()).toBe(201);
	const element = await el.json();
	// the material's λ is corrected: revision 2
	const revised = await page.request.put(`/api/v1/materials/${material.id}`, {
		data: { ...values, lambda: 0.04, confirmWarnings: true }
	});
	expect(revised.ok()).toBe(true);

	await page.goto(`/dwellings/${dwelling.id}/elements/${element.id}`);
	await waitForApp(page);
	const offer = page.getByTestId('newer-revisions');
	const lambda = page.getByLabel('Layer 2 λ in W/(m·K)');
	await expect(lambda).toHaveValue('0.033');
	await offer.getByRole('button', { name: 'Use revision 2' }).click();
	await expect(lambda).toHaveValue('0.04');
	await expect(offer).toHaveCount(0);
	await page.getByRole('button', { name: 'Undo', exact: true }).click();
	await expect(lambda).toHaveValue('0.033');
	await expect(offer.getByRole('button', { name: 'Use revision 2' })).toBeVisible();
	await page.screenshot({ path: 'test-results/editor-history-6-revision-undone.png', fullPage: true });
	await page.keyboard.press('Control+Shift+Z');
	await expect(lambda).toHaveValue('0.04');
	await expect(offer).toHaveCount(0);
});
