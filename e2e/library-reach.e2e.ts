import { test, expect } from '@playwright/test';
import { randomBytes } from 'node:crypto';
import { DEMO, signInAs, waitForApp } from './helpers';

// A library correction shows its reach and is carried through (Envelo's own workflow; common practice, no
// source): a material of its own is used by two dwellings of their own (the seeded demo data is left
// alone), its λ is corrected by a CSV import, whose summary counts the work on the older revision; the
// material's page lists both dwellings with the effect of the new revision, and one step moves both
// elements to it. Values are generic (common practice, no source).
test('revise a material used by two dwellings, see both in its reach, move both to the new revision', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const tag = randomBytes(3).toString('hex').toUpperCase();
	const ben = await browser.newContext();
	await signInAs(ben, DEMO.assessor);
	const page = await ben.newPage();
	const values = {
		code: `E2E-REACH-${tag}`,
		name: `Reach test board ${tag}`,
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

	const references: string[] = [];
	const dwellingIds: string[] = [];
	for (const n of [1, 2]) {
		const reference = `E2E-REACH-${tag}-${n}`;
		const d = await page.request.post('/api/v1/dwellings', {
			data: { reference, address: `${n} Reach Row, Testville`, stage: 'design' }
		});
		expect(d.status()).toBe(201);
		const dwelling = await d.json();
		const el = await page.request.post(`/api/v1/dwellings/${dwelling.id}/elements`, {
			data: {
				name: `Wall ${n}`,
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
						},
						{ name: 'Brick', thicknessMm: 100, lambda: 0.5, mu: 10 }
					]
				},
				internal: { temperature: 20, relativeHumidity: 50 }
			}
		});
		expect(el.status()).toBe(201);
		references.push(reference);
		dwellingIds.push(dwelling.id);
	}
	// the first dwelling's report is issued before the correction: the client holds the old figures
	const issued = await page.request.post('/api/v1/reports', { data: { dwellingId: dwellingIds[0] } });
	expect(issued.status()).toBe(201);

	// the correction, by a CSV import: λ 0.033 → 0.040 (decimal comma), revision 2
	const csv =
		'code;name;category;lambda;lambda_kind;mu_dry;density;specific_heat;source\n' +
		`${values.code};${values.name};insulation;0,040;declared;1;30;1030;${values.source}\n`;
	await page.goto('/library/import');
	await waitForApp(page);
	await page
		.getByTestId('csv-file')
		.setInputFiles({ name: 'correction.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
	await page.getByRole('button', { name: 'Preview' }).click();
	await expect(page.getByTestId('import-preview')).toContainText('Changed');
	await expect(page.getByTestId('preview-row')).toHaveCount(1);
	await expect(page.getByTestId('preview-row')).not.toContainText('Specific heat');
	await page.getByRole('button', { name: 'Confirm and import 1 row' }).click();
	await expect(page.getByTestId('import-summary')).toContainText('0 added, 1 changed (new revisions)');
	const row = page.getByTestId('import-reach-row');
	await expect(row).toContainText(values.code);
	await expect(row).toContainText('2 elements in 2 dwellings');
	await row.getByRole('link', { name: values.code }).click();
	await page.waitForURL(`**/library/${material.id}*`);
	await waitForApp(page);

	const reach = page.getByTestId('reach');
	await expect(reach).toContainText('2 elements in 2 dwellings use revision 1; revision 2 is current');
	await expect(reach.getByTestId('reach-dwelling')).toHaveCount(2);
	for (const r of references) await expect(reach.locator(`[data-reference="${r}"]`)).toBeVisible();
	// the imported revision is not verified yet, and the issued report is named on its dwelling
	await expect(reach.getByTestId('reach-unverified')).toContainText('Revision 2 is unverified');
	await expect(
		reach.locator(`[data-reference="${references[0]}"]`).getByTestId('reach-issued')
	).toContainText('1 issued report');
	await expect(reach.locator(`[data-reference="${references[1]}"]`).getByTestId('reach-issued')).toHaveCount(
		0
	);
	// U now and with revision 2 (higher λ: a higher U)
	await expect(reach.getByTestId('reach-element').first()).toContainText('0.29');
	await expect(reach.getByTestId('reach-element').first()).toContainText('0.34');
	await reach.scrollIntoViewIfNeeded();
	await page.screenshot({ path: '/tmp/library-reach.png', fullPage: true });

	await reach.getByTestId('reach-tick-page').check();
	await reach.getByTestId('reach-move').click();
	await expect(page.getByTestId('move-result')).toContainText(
		'2 moved, 0 already on it, 0 skipped, 0 refused'
	);
	await expect(page.getByTestId('move-next')).toContainText('issue a new revision of the report');
	await expect(page.getByTestId('reach-none')).toBeVisible();
	const uses = page.locator('section', { hasText: 'Elements that use it' });
	await expect(uses.getByText('revision 2', { exact: true })).toHaveCount(2);
	await page.screenshot({ path: '/tmp/library-reach-moved.png', fullPage: true });
	await ben.close();
});

test('a supervisor starts an audit batch of the affected dwellings from the material page', async ({
	browser
}) => {
	const tag = randomBytes(3).toString('hex').toUpperCase();
	const ben = await browser.newContext();
	await signInAs(ben, DEMO.assessor);
	const api = (await ben.newPage()).request;
	const values = {
		code: `E2E-REACHA-${tag}`,
		name: `Audit reach board ${tag}`,
		category: 'insulation',
		lambda: 0.035,
		lambdaKind: 'declared',
		muDry: 1,
		density: 30,
		specificHeat: 1030,
		source: 'Invented for an end-to-end test'
	};
	const material = await (
		await api.post('/api/v1/materials', { data: { ...values, confirmWarnings: true } })
	).json();
	const reference = `E2E-REACHA-${tag}`;
	const dwelling = await (
		await api.post('/api/v1/dwellings', { data: { reference, address: '9 Audit Row', stage: 'design' } })
	).json();
	const el = await api.post(`/api/v1/dwellings/${dwelling.id}/elements`, {
		data: {
			name: 'Wall',
			kind: 'external-wall',
			area: 20,
			buildUp: {
				layers: [
					{
						name: values.name,
						thicknessMm: 120,
						lambda: 0.035,
						mu: 1,
						materialId: material.id,
						materialRevisionId: material.revisionId,
						materialCode: values.code
					},
					{ name: 'Brick', thicknessMm: 100, lambda: 0.5, mu: 10 }
				]
			},
			internal: { temperature: 20, relativeHumidity: 50 }
		}
	});
	expect(el.status()).toBe(201);
	expect(
		(await api.put(`/api/v1/materials/${material.id}`, { data: { ...values, lambda: 0.038 } })).status()
	).toBe(200);
	await ben.close();

	const dara = await browser.newContext();
	await signInAs(dara, DEMO.supervisor);
	const page = await dara.newPage();
	await page.goto(`/library/${material.id}`);
	await waitForApp(page);
	// a supervisor reads the reach but does not move elements
	await expect(page.getByTestId('reach-move')).toHaveCount(0);
	await page.getByTestId('reach-audit').click();
	await page.waitForURL(/\/audit\/new\?name=.*&references=/);
	await waitForApp(page);
	// the list handed over is audited whole, under a name that says why
	await expect(page.locator('textarea[name="references"]')).toHaveValue(reference);
	await expect(page.getByLabel('Batch name')).toHaveValue(`Correction of ${values.code} (revision 2)`);
	await expect(page.getByLabel('All dwellings')).toBeChecked();
	await page.getByRole('button', { name: 'Create batch and recompute' }).click();
	await page.waitForURL(/\/audit\/[0-9a-f-]{36}$/);

	// back on the material, the dwelling is named as waiting for an audit decision
	await page.goto(`/library/${material.id}`);
	await waitForApp(page);
	const row = page.locator(`[data-reference="${reference}"]`);
	await expect(row.getByTestId('reach-audit-open')).toContainText(
		`in audit batch “Correction of ${values.code} (revision 2)”, not decided yet`
	);
	await expect(page.getByTestId('reach')).toContainText('1 dwelling waits for an audit decision');
	await page.getByTestId('reach').scrollIntoViewIfNeeded();
	await page.screenshot({ path: '/tmp/library-reach-supervisor.png', fullPage: true });
	await dara.close();
});
