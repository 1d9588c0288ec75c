import { test, expect } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// A save refused for a missing layer must not leave the button stuck: after the layer is added, Save
// works again (a defect reported by a new user). U of 215 mm brick, λ 0.77: R = 0.279; with
// Rsi 0.13 and Rse 0.04 (ISO 6946:2017 Table 7, from memory) RT = 0.449, U = 2.23 W/(m²·K).
test('after a refused save, adding the missing layer and saving again works', async ({ page, context }) => {
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

	await page.getByLabel('Name', { exact: true }).fill('Solid wall');
	await page.getByLabel('Area m²', { exact: true }).fill('20');
	await page.getByRole('button', { name: 'Remove layer 1' }).click();
	const errors: string[] = [];
	page.on('pageerror', (e) => errors.push(e.message));
	await page.getByRole('button', { name: 'Save element' }).click();
	await expect(page.getByTestId('save-message')).toContainText('Not saved');
	await expect(page.getByRole('button', { name: 'Save element' })).toBeEnabled();

	await page.getByRole('button', { name: 'Add layer' }).click();
	await page.getByLabel('Layer 1 name').fill('Brick');
	await page.getByLabel('Layer 1 thickness in mm').fill('215');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('0.77');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('10');
	await expect(page.getByTestId('live-u')).toHaveText('2.23');
	await expect(page.getByRole('button', { name: 'Save element' })).toBeEnabled();
	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	await expect(page.getByLabel('Layer 1 name')).toHaveValue('Brick');
	expect(errors).toEqual([]);
});
