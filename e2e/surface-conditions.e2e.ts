import { test, expect } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// Surface resistances for other conditions, ISO 6946:2017, Annex C (formulas from memory; the unit tests
// check them against Table 7 and the annex's tables): a sheltered wall with 1 m/s of wind at its outer
// face takes Rse = 1/(4 + 4·1 + 0.9·4σ(273.15 K)³) = 1/12.16 = 0.082 m²·K/W instead of 0.04. A 215 mm brick
// wall, λ 0.77 (generic values, common practice, no source): RT = 0.13 + 0.2792 + 0.0822 = 0.4914,
// U = 2.03 W/(m²·K), against 2.23 with the conventional values.
test('an assessor gives a sheltered wall its wind speed and sees Rse and U follow', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-S-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
	await page.getByLabel('Area m²').fill('20');
	await page.getByLabel('Layer 1 name').fill('Brick');
	await page.getByLabel('Layer 1 thickness in mm').fill('215');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('0.77');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('10');
	await expect(page.getByTestId('u-value')).toContainText('2.23');

	const box = page.getByTestId('surface-conditions');
	await box.getByText('Other surface conditions (ISO 6946, Annex C)').click();
	await box.getByLabel('Wind speed at the outside surface m/s').fill('1');
	await expect(page.getByTestId('u-value')).toContainText('2.03');
	// a value out of range is named beside its field, in words
	await box.getByLabel('Inside surface emissivity ε').fill('2');
	await expect(box).toContainText('at most 1');
	await box.getByLabel('Inside surface emissivity ε').fill('');
	await box.screenshot({ path: '/tmp/surface-conditions.png' });

	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	const id = page.url().split('/elements/')[1].split('?')[0];
	const row = await db()('elements').where({ id }).first('build_up', 'last_result');
	expect(row.build_up.surfaceConditions).toEqual({ windSpeed: 1 });
	expect(row.last_result.rse).toBeCloseTo(1 / (8 + 0.9 * 4 * 5.670374419e-8 * 273.15 ** 3), 9);
	expect(row.last_result.rsi).toBe(0.13);
});
