import { test, expect } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// A window's U from its parts by ISO 10077-1 (formula from memory):
//   Uw = (Ag·Ug + Af·Uf + lg·ψg)/(Ag + Af)
// with Ag 1.2 m², Ug 1.1, Af 0.4 m², Uf 1.4, lg 4.4 m, ψg 0.06 W/(m·K), a hand calculation:
//   (1.32 + 0.56 + 0.264)/1.6 = 2.144/1.6 = 1.34 W/(m²·K).
// The window's values are invented for the test (plausible, not a product).

test('an assessor works out a window U from its glazing and frame, and saves it with its parts named', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-W-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await waitForApp(page);
	// the new element's page has replaced the dwelling's (a client-side navigation keeps the ready mark)
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await page.getByLabel('Kind').selectOption('window');
	await expect(page.getByLabel('Given U W/(m²·K)')).toBeVisible();
	await page.getByLabel('Name', { exact: true }).fill('Kitchen window');
	await page.getByLabel('Area m²').fill('1.6');

	const parts = page.getByTestId('window-parts');
	// (once more if the first click came while the page was still taking the new kind)
	await expect(async () => {
		if (!(await parts.isVisible()))
			await page.getByRole('button', { name: 'Work out U from its parts (ISO 10077-1)' }).click();
		await expect(parts).toBeVisible({ timeout: 1000 });
	}).toPass();
	await parts.getByLabel('Glazing Ug W/(m²·K)').fill('1.1');
	await parts.getByLabel('Glazing area Ag m²').fill('1.2');
	await parts.getByLabel('Glazing perimeter lg m').fill('4.4');
	await parts.getByLabel('Edge ψg W/(m·K)').fill('0.06');
	await parts.getByLabel('Frame area Af m²').fill('0.4');
	// a typo names its field as the form labels it
	await parts.getByLabel('Frame Uf W/(m²·K)').fill('1,4x');
	await expect(parts.getByTestId('window-parts-issues')).toContainText('Frame Uf');
	await parts.getByLabel('Frame Uf W/(m²·K)').fill('1.4');
	await expect(parts.getByTestId('window-parts-result')).toContainText('Uw = 1.34 W/(m²·K)');
	await parts.screenshot({ path: '/tmp/window-parts.png' });
	await parts.getByRole('button', { name: 'Use as the given U' }).click();
	await expect(page.getByLabel('Given U W/(m²·K)')).toHaveValue('1.34');
	await expect(page.getByLabel('Source of the value')).toHaveValue(
		/^ISO 10077-1 from its parts: Uw = 1\.340/
	);

	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	const id = page.url().split('/elements/')[1].split('?')[0];
	const row = await db()('elements').where({ id }).first('given_u', 'given_u_source', 'window_parts');
	expect(Number(row.given_u)).toBe(1.34);
	expect(row.given_u_source).toContain('Ug 1.1 over Ag 1.2 m², ψg 0.06 W/(m·K) (given) over lg 4.4 m');
	// the parts are kept with the element, structurally
	expect(row.window_parts).toMatchObject({
		kind: 'window',
		frameMaterial: 'pvc-three-chambers',
		glazings: [{ areaM2: 1.2, uValue: 1.1, perimeterM: 4.4, psi: 0.06 }],
		frames: [{ areaM2: 0.4, uValue: 1.4 }]
	});

	// opened again: the U follows its parts, and the calculator starts from them
	await page.reload();
	await waitForApp(page);
	await expect(page.getByTestId('given-u-from-parts')).toContainText(
		'Worked out from its parts (ISO 10077-1)'
	);
	await expect(page.getByLabel('Given U W/(m²·K)')).toHaveAttribute('readonly', '');
	await page.getByRole('button', { name: 'Work out U from its parts (ISO 10077-1)' }).click();
	await expect(parts.getByLabel('Frame area Af m²')).toHaveValue('0.4');
	await expect(parts.getByTestId('window-parts-result')).toContainText('Uw = 1.34 W/(m²·K)');

	// a declared U instead: the parts go, and the figure can be typed
	await page.getByRole('button', { name: 'Remove the parts, to give a declared U' }).click();
	await page.getByLabel('Given U W/(m²·K)').fill('1.2');
	await page.getByLabel('Source of the value').fill('maker’s declaration (invented)');
	await page.getByRole('button', { name: 'Save', exact: true }).click();
	await expect
		.poll(async () => (await db()('elements').where({ id }).first('window_parts', 'given_u')).window_parts)
		.toBeNull();
});
