import { test, expect } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// A suspended timber floor over a ventilated underfloor space, ISO 13370:2017, 8.2 (formulas and the
// shielding factor from memory), as an assessor enters it. Hand calculation (tests/physics/
// element-suspended.test.ts has it line by line): boards 22 mm λ 0.13 and wool 100 mm λ 0.04 give
// Rf = 2.669 m²·K/W, Uf = 1/(0.17 + 2.669 + 0.17) = 0.332; with A 100 m², P 40 m, h 300 mm,
// Uw 1.7, vents 3000 mm²/m, v 5 m/s, average shielding (fw 0.05): Ug 0.7615, Ux 0.4215,
// U = 1/(1/Uf + 1/(Ug + Ux)) = 0.2594 → 0.26 W/(m²·K). The floor is invented.

test('an assessor enters a suspended timber floor with its ventilation and sees its U', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-SF-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await waitForApp(page);
	// the new element's page has replaced the dwelling's (a client-side navigation keeps the ready mark)
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await page.getByLabel('Kind').selectOption('ground-floor');
	await expect(page.getByTestId('ground-inputs')).toBeVisible();
	await page.getByLabel('Name', { exact: true }).fill('Front room floor');
	await page.getByLabel('Area m²', { exact: true }).fill('100');
	await page.getByLabel('Exposed perimeter m').fill('40');
	await page.getByLabel('Layer 1 name').fill('Timber boards');
	await page.getByLabel('Layer 1 thickness in mm').fill('22');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('0.13');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('50');
	await page.getByRole('button', { name: 'Add layer' }).click();
	await page.getByLabel('Layer 2 name').fill('Mineral wool between joists');
	await page.getByLabel('Layer 2 thickness in mm').fill('100');
	await page.getByLabel('Layer 2 λ in W/(m·K)').fill('0.04');
	await page.getByLabel('Layer 2 vapour resistance factor μ').fill('1');

	await page.getByLabel('Floor type').selectOption('suspended');
	await page.getByLabel('Deck above ground mm').fill('300');
	await page.getByLabel('Underfloor wall U W/(m²·K)').fill('1.7');
	await page.getByLabel('Vents mm² per m of perimeter').fill('3000');
	await page.getByLabel('Wind speed m/s').fill('5');
	await page.getByLabel('Wind shielding').selectOption('average');
	await expect(page.getByTestId('live-u')).toHaveText('0.26');
	await expect(page.getByTestId('ground-row')).toContainText(
		'Suspended floor (ISO 13370:2017, 8.2 (suspended floor))'
	);
	await expect(page.getByTestId('ground-row')).toContainText('Deck Uf 0.332');
	await page.getByTestId('ground-inputs').screenshot({ path: '/tmp/suspended-floor-inputs.png' });

	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	const id = page.url().split('/elements/')[1].split('?')[0];
	const row = await db()('elements').where({ id }).first('build_up');
	expect(row.build_up.ground.suspended).toEqual({
		heightM: 0.3,
		underfloorWallU: 1.7,
		openingsPerPerimeter: 0.003,
		windSpeed: 5,
		windShielding: 'average'
	});
	// reopened, the form shows what was typed
	await page.reload();
	await waitForApp(page);
	await expect(page.getByLabel('Floor type')).toHaveValue('suspended');
	await expect(page.getByLabel('Vents mm² per m of perimeter')).toHaveValue('3000');
	await expect(page.getByLabel('Deck above ground mm')).toHaveValue('300');
	await expect(page.getByTestId('live-u')).toHaveText('0.26');
});
