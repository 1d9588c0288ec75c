import { test, expect } from '@playwright/test';
import { DEMO, signInAs, waitForApp } from './helpers';

// The dwelling's heat capacity from its elements: the assessor gives the total floor area in the
// details, and the dwelling page sums κ1·A (ISO 13790:2008, 12.3.1, from memory) from the κ1 the element
// page shows (ISO 13786, checked against numpy in the unit tests), divides by the floor area, and says
// which elements are not counted. Build-ups are generic values of the usual order (common practice,
// no source); a dwelling of its own, so no other suite is touched.
test('an assessor gives the floor area and sees the heat capacity of the elements', async ({
	page,
	context
}) => {
	test.setTimeout(90_000);
	await signInAs(context, DEMO.assessor);
	const reference = `E2E-HC-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByLabel('Total floor area m²').fill('80,5');
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await expect(page.getByText('floor area 80.5 m²')).toBeVisible();
	// the copy section's sentences keep their space between them
	await expect(page.getByText('copies of every element. As the as-built record')).toBeVisible();
	const id = page.url().split('/').pop()!;

	// a solid wall whose every layer gives ρ and c, and one without, and a window
	const layer = (
		name: string,
		thicknessMm: number,
		lambda: number,
		density?: number,
		specificHeat?: number
	) => ({
		name,
		thicknessMm,
		lambda,
		mu: 10,
		...(density ? { density, specificHeat } : {})
	});
	const post = (data: object) =>
		page.request.post(`/api/v1/dwellings/${id}/elements`, {
			data: { internal: { temperature: 20, relativeHumidity: 50 }, ...data }
		});
	const wall = await post({
		name: 'Street wall',
		kind: 'external-wall',
		area: 40,
		buildUp: {
			layers: [layer('Gypsum plaster', 13, 0.4, 1000, 1000), layer('Clay brick', 215, 0.77, 1800, 840)]
		}
	});
	expect(wall.status(), await wall.text()).toBe(201);
	const wallId = (await wall.json()).id;
	expect(
		(
			await post({
				name: 'Gable',
				kind: 'external-wall',
				area: 12,
				buildUp: { layers: [layer('Block', 100, 0.5)] }
			})
		).status()
	).toBe(201);
	expect(
		(
			await post({
				name: 'Window',
				kind: 'window',
				area: 6,
				givenU: 1.4,
				givenUSource: 'maker’s declaration (invented)'
			})
		).status()
	).toBe(201);

	// κ1 as the element page shows it
	await page.goto(`/dwellings/${id}/elements/${wallId}`);
	await waitForApp(page);
	const kappa1 = Number(
		(await page.getByTestId('heat-storage').getByTestId('kappa1').innerText()).split(' ')[0]
	);
	expect(kappa1).toBeGreaterThan(30);

	await page.goto(`/dwellings/${id}`);
	await waitForApp(page);
	const card = page.getByTestId('dwelling-heat-capacity');
	await expect(card.getByTestId('dwelling-cm')).toBeVisible();
	const cm = Number((await card.getByTestId('dwelling-cm').innerText()).split(' ')[0]);
	// Cm = κ1·A = κ1 · 40 m², in MJ/K; κ1 is shown to one decimal
	expect(cm).toBeCloseTo((kappa1 * 40) / 1000, 1);
	const perArea = Number((await card.getByTestId('dwelling-cm-per-area').innerText()).split(' ')[0]);
	expect(perArea).toBeCloseTo((kappa1 * 40) / 80.5, 0);
	// a single counted element: its effective mass area is its own area
	await expect(card.getByTestId('dwelling-am')).toHaveText('40.0 m²');
	await expect(card.getByTestId('heat-capacity-missing')).toContainText(
		'Gable: give the density and specific heat of layer 1 (layer details)'
	);
	await expect(card).toContainText('Windows and doors are taken as storing no heat.');
	await expect(card).toContainText('a licensed practitioner’s judgement');
	await card.getByRole('button', { name: 'Show each element' }).click();
	await expect(card.getByTestId('heat-capacity-elements').getByRole('row')).toHaveCount(2);
	await card.screenshot({ path: '/tmp/dwelling-heat-capacity.png' });

	// a floor area that is no number is refused beside its field, in words
	await page.getByRole('button', { name: 'Edit details' }).click();
	await page.getByLabel('Total floor area m²').fill('eighty');
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByText('Enter the floor area in m², e.g. 86.5, or leave it empty.')).toBeVisible();
});
