import { test, expect } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// The section drawing on the element page: the build-up drawn to scale as it is typed, with the
// temperature line, and the dew point and condensation marks once a climate is chosen. What is drawn
// is Envelo's own choice (no source); the physics behind the lines is checked in tests/physics and
// tests/dwellings/section.test.ts. Library values: the demo library (generic, indicative).

test('the section drawing follows the build-up as it is typed', async ({ page, context }) => {
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-S-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
	await page.getByLabel('Area m²').fill('20');

	const pick = async (layer: number, search: string, mm: string) => {
		await page.getByRole('button', { name: `Choose layer ${layer} from the library` }).click();
		await page.getByLabel('Search the library').fill(search);
		await expect(page.locator('#material-results').getByRole('option').first()).toContainText(search, {
			ignoreCase: true
		});
		await page.getByLabel('Search the library').press('Enter');
		await page.getByLabel(`Layer ${layer} thickness in mm`).fill(mm);
	};
	await pick(1, 'plasterboard', '12.5');
	await page.getByRole('button', { name: 'Add layer' }).click();
	await pick(2, 'mineral wool', '100');
	await page.getByRole('button', { name: 'Add layer' }).click();
	await pick(3, 'brick', '102');

	const section = page.getByTestId('build-up-section');
	await expect(section).toBeVisible();
	await expect(section.locator('figcaption li')).toHaveCount(3);
	await expect(section.locator('figcaption li').nth(1)).toContainText('100 mm');
	const band = (i: number) =>
		section.locator('svg rect').filter({ has: page.locator(`title:text-matches("^${i}: ")`) });
	const width = async (i: number) => Number(await band(i).getAttribute('width'));
	const before = await width(2);
	// to scale: the wool's band is 100/102 of the brick's
	expect(before / (await width(3))).toBeCloseTo(100 / 102, 2);

	// typing 200 mm widens the wool's band at once
	await page.getByLabel('Layer 2 thickness in mm').fill('200');
	await expect(section.locator('figcaption li').nth(1)).toContainText('200 mm');
	await expect.poll(() => width(2)).toBeGreaterThan(before);
	await expect(section.locator('figcaption')).toContainText('Layers to scale, inside on the left.');
	await page.screenshot({ path: '/tmp/section-element-page.png', fullPage: true });
});

// ISO 13786 (formulas from memory; the engine is checked against numpy in tests/physics and
// tests/dwellings): the heat storage of a masonry wall from the library's ρ and c, as the page shows it.
test('a masonry wall shows its κ1 and decrement factor from the library values', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-K-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
	await page.getByLabel('Area m²').fill('20');
	await page.getByRole('button', { name: 'Choose layer 1 from the library' }).click();
	await page.getByLabel('Search the library').fill('dense');
	await expect(page.locator('#material-results').getByRole('option').first()).toContainText('dense', {
		ignoreCase: true
	});
	await page.getByLabel('Search the library').press('Enter');
	await page.getByLabel('Layer 1 thickness in mm').fill('215');
	const storage = page.getByTestId('heat-storage');
	await expect(storage.getByTestId('kappa1')).toContainText('kJ/(m²·K)');
	const kappa1 = Number((await storage.getByTestId('kappa1').innerText()).split(' ')[0]);
	const f = Number(await storage.getByTestId('decrement-factor').innerText());
	// a heavy wall: tens of kJ/(m²·K) inside, and a daily swing damped well below 1
	expect(kappa1).toBeGreaterThan(30);
	expect(kappa1).toBeLessThan(120);
	expect(f).toBeGreaterThan(0);
	expect(f).toBeLessThan(0.8);

	// a typed layer without ρ and c: the card says what to give
	await page.getByRole('button', { name: 'Add layer' }).click();
	await page.getByLabel('Layer 2 name').fill('Board');
	await page.getByLabel('Layer 2 thickness in mm').fill('12.5');
	await page.getByLabel('Layer 2 λ in W/(m·K)').fill('0.21');
	await page.getByLabel('Layer 2 vapour resistance factor μ').fill('10');
	await expect(storage.getByTestId('heat-storage-missing')).toHaveText(
		'Not calculated: give the density and specific heat of layer 2 (layer details).'
	);
	await page.getByRole('button', { name: 'Layer 2 corrections: air gaps and fasteners' }).click();
	await page.getByLabel('Layer 2 density in kg/m³').fill('700');
	await page.getByLabel('Layer 2 specific heat capacity in J/(kg·K)').fill('1000');
	await expect(storage.getByTestId('kappa1')).toBeVisible();
	await storage.screenshot({ path: '/tmp/heat-storage.png' });
});
