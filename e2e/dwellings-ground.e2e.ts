import { test, expect, type Page } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// The element editor for a ground floor (ISO 13370:2017 8.1 slab on ground, formulas from memory) and a
// loft ceiling (ISO 6946:2017 roof-space table, from memory), the per-layer corrections, the unsaved-edits
// guard, the library picker outside the table's scroll box, and errors only once a row is touched.

async function newElement(page: Page) {
	const reference = `E2E-G-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
	return reference;
}

test('a ground floor is calculated by ISO 13370 and a loft ceiling with its roof space', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const reference = await newElement(page);

	// A fresh blank row shows no errors before anything is typed.
	await expect(page.getByTestId('build-up').locator('.field-error')).toHaveCount(0);

	// The library picker opens fully visible, outside the table's scroll box; Escape closes it.
	await page.getByRole('button', { name: 'Choose layer 1 from the library' }).click();
	await expect(page.getByTestId('material-picker')).toBeInViewport({ ratio: 1 });
	await page.getByLabel('Search the library').press('Escape');
	await expect(page.getByTestId('material-picker')).toHaveCount(0);

	await expect(page.getByLabel('Rse override m²·K/W')).toBeVisible();
	await page.getByLabel('Kind').selectOption('ground-floor');
	// A floor on the ground has no outside surface to override (the ground takes its place).
	await expect(page.getByLabel('Rse override m²·K/W')).toHaveCount(0);
	await page.getByLabel('Area m²', { exact: true }).fill('100');
	await page.getByLabel('Exposed perimeter m').fill('40');
	await page.getByLabel('Layer 1 name').fill('Concrete slab');
	await page.getByLabel('Layer 1 thickness in mm').fill('150');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('1.5');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('100');
	// B′ = 100/(0.5·40) = 5 m; dt = 0.3 + 2.0·(0.17 + 0.1 + 0.04) = 0.92 m < B′
	// U = 4/(π·5 + 0.92)·ln(π·5/0.92 + 1) = 0.696 → 0.70 (the build-up alone would give 3.23)
	await expect(page.getByTestId('live-u')).toHaveText('0.70');
	await expect(page.getByTestId('ground-row')).toContainText('ISO 13370');
	await expect(page.getByTestId('results')).toContainText(
		'Not assessed for a floor in contact with the ground'
	);
	await expect(page.getByTestId('corrections-text')).toHaveText('no air-gap level or fasteners entered');

	// Per-layer corrections: an air-gap level only.
	await page.getByRole('button', { name: 'Layer 1 corrections: air gaps and fasteners' }).click();
	await page.getByLabel('Layer 1 air-gap level').selectOption('2');
	await expect(page.getByTestId('corrections-text')).toContainText('no fasteners entered');
	await expect(page.getByTestId('corrections-text')).toContainText('air gaps');
	await page.screenshot({ path: '/tmp/fix-physics-ground.png', fullPage: true });

	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	await expect(page.getByLabel('Exposed perimeter m')).toHaveValue('40');
	await expect(page.getByLabel('Floor area m²')).toHaveValue('100');

	// Unsaved edits: leaving asks first; "stay" keeps the page and the edit.
	await page.getByLabel('Exposed perimeter m').fill('44');
	let asked = '';
	page.once('dialog', (d) => {
		asked = d.message();
		void d.dismiss();
	});
	await page.getByRole('link', { name: reference }).click();
	await expect.poll(() => asked).toContain('unsaved changes');
	await expect(page.getByLabel('Exposed perimeter m')).toHaveValue('44');
	page.once('dialog', (d) => void d.accept());
	await page.getByRole('link', { name: reference }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();

	// A loft: pasted rows replace the untouched blank row; the roof space adds Ru.
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
	await page.getByLabel('Kind').selectOption('pitched-roof-ceiling');
	await expect(page.getByLabel('Roof space above the ceiling')).toBeVisible();
	await page.getByLabel('Area m²', { exact: true }).fill('40');
	await page.getByRole('button', { name: 'Paste rows…' }).click();
	await page.getByLabel('Pasted rows').fill('Plasterboard\t12.5\t0.25\t8\nMineral wool\t200\t0.04\t1');
	await page.getByRole('button', { name: 'Add these rows' }).click();
	await expect(page.getByTestId('layer-row')).toHaveCount(2);
	// RT = 0.10 + 0.05 + 5.0 + 0.04 = 5.19 → U 0.193; with felt under the tiles + 0.2 = 5.39 → 0.186
	await expect(page.getByTestId('live-u')).toHaveText('0.19');
	await page.getByLabel('Roof space above the ceiling').selectOption('tiles-with-felt-or-boards');
	await expect(page.getByTestId('u-unrounded')).toHaveText((1 / 5.39).toFixed(4));
	await expect(page.getByTestId('results')).toContainText('roof space Ru 0.20');
	await page.screenshot({ path: '/tmp/fix-physics-loft.png', fullPage: true });
});
