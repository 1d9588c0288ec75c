import { test, expect, type Page } from '@playwright/test';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { DEMO, db, sessionCookie, signInAs, waitForApp } from './helpers';

// The element editor and the calculation's trust: "thickness to meet the limit" says when the layer
// already meets it and offers a thinner one only when asked; plausibility warnings show beside their
// field, in the result and in the PDF's notes, and never stop a save; a roof's inclination decides its
// heat-flow direction; the ground's λ is chosen by kind. Expected figures are hand calculations:
//   - ISO 6946:2017 (from memory): Rsi 0.10 upward, 0.13 horizontal, Rse 0.04 m²·K/W (Table 7), the
//     horizontal values within ±30° of the horizontal plane (note to Table 7), U = 1/(Rsi + Σd/λ + Rse);
//   - ISO 13370:2017 (from memory): 8.1 slab on ground, λg clay or silt 1.5 W/(m·K) (Table 7);
//   - the product sizes, the 5–35 °C inside range and the thinnest insulation (10 mm): common practice,
//     no source. Library values: the demo library (generic, indicative).

const work = mkdtempSync(path.join(tmpdir(), 'envelo-e2e-trust-'));
test.afterAll(() => rmSync(work, { recursive: true, force: true }));

async function newElement(page: Page) {
	const reference = `E2E-T-${Date.now().toString(36)}`;
	await page.goto('/dwellings/new');
	await waitForApp(page);
	await page.getByLabel('Reference').fill(reference);
	await page.getByRole('button', { name: 'Create dwelling' }).click();
	await expect(page.getByRole('heading', { name: reference })).toBeVisible();
	await page.getByRole('button', { name: 'Add element' }).click();
	await expect(page.getByRole('heading', { name: 'New element' })).toBeVisible();
	await waitForApp(page);
}

async function fromLibrary(page: Page, layer: number, search: string, thickness: string) {
	await page.getByRole('button', { name: `Choose layer ${layer} from the library` }).click();
	await page.getByLabel('Search the library').fill(search);
	await expect(page.locator('#material-results').getByRole('option').first()).toContainText(search, {
		ignoreCase: true
	});
	await page.getByLabel('Search the library').press('Enter');
	await page.getByLabel(`Layer ${layer} thickness in mm`).fill(thickness);
}

async function save(page: Page): Promise<string> {
	await page.getByRole('button', { name: 'Save element' }).click();
	await page.waitForURL(/\/elements\/[0-9a-f-]{36}/);
	return page.url().split('/elements/')[1].split('?')[0];
}

/** The draft PDF of the element as text without whitespace (pdftotext, Debian poppler-utils). */
async function pdfText(page: Page, elementId: string): Promise<string> {
	const row = await db()('elements').where({ id: elementId }).first('dwelling_id');
	const res = await page.request.get(
		`/dwellings/${row.dwelling_id}/reports/preview.pdf?element=${elementId}`,
		{
			headers: { cookie: await sessionCookie(DEMO.assessor) }
		}
	);
	expect(res.status()).toBe(200);
	const file = path.join(work, `${elementId}.pdf`);
	writeFileSync(file, await res.body());
	return execFileSync('pdftotext', ['-nodiag', '-layout', file, '-'], { encoding: 'utf8' }).replace(
		/\s+/g,
		''
	);
}
const holds = (pdf: string, part: string) => pdf.includes(part.replace(/\s+/g, ''));

/** U of the loft: plasterboard 12.5 mm (λ 0.21) and PIR d mm (λ 0.022), upward: 1/(0.10 + ΣR + 0.04). */
const loftU = (pirMm: number) => 1 / (0.1 + 0.0125 / 0.21 + pirMm / 1000 / 0.022 + 0.04);

test('a loft that already meets its limit: said so, a thinner layer only on request; warnings never block', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	await newElement(page);
	await page.getByLabel('Kind').selectOption('pitched-roof-ceiling');
	await page.getByLabel('Area m²').fill('40');
	await fromLibrary(page, 1, 'plasterboard', '12.5');
	await page.getByRole('button', { name: 'Add layer' }).click();

	// 0.17 typed for 170 mm (a thickness in m): a plausibility warning beside the field, a result still.
	await fromLibrary(page, 2, 'polyisocyanurate', '0.17');
	const thicknessCell = page.getByTestId('layer-row').nth(1);
	await expect(thicknessCell.getByTestId('plausibility-notice')).toHaveText(
		'Thinner than any product of its kind: is the thickness in mm?'
	);
	await expect(page.getByTestId('plausibility')).toContainText(
		'is 0.17 mm thick, thinner than the thinnest insulation (about 10 mm): check that the thickness is in mm.'
	);
	await expect(page.getByTestId('live-u')).toBeVisible();
	await thicknessCell.screenshot({ path: '/tmp/element-trust-thin-layer.png' });

	// 170 mm: U = 0.126 → 0.13 against the demo limit 0.16 (pitched roof, insulated at ceiling).
	await page.getByLabel('Layer 2 thickness in mm').fill('170');
	await expect(thicknessCell.getByTestId('plausibility-notice')).toHaveCount(0);
	expect(loftU(170)).toBeCloseTo(0.126, 3);
	await expect(page.getByTestId('live-u')).toHaveText('0.13');
	const solver = page.getByTestId('thickness-solver');
	await expect(solver.getByTestId('thickness-answer')).toHaveText(
		'Already meets the limit of 0.16 W/(m²·K) with 170 mm; U = 0.13.'
	);
	await expect(solver.getByRole('button', { name: /^Use \d+ mm$/ })).toHaveCount(0);

	// An inside temperature of 40 °C: a warning beside the field; the screenshot shows both.
	await page.getByLabel('Inside temperature °C').fill('40');
	await expect(page.getByTestId('plausibility-notice')).toHaveText('Outside the usual 5–35 °C: check it.');
	await expect(page.getByTestId('plausibility')).toContainText(
		'The inside temperature of 40 °C is outside the usual 5–35 °C of heated buildings: check it.'
	);
	await page.screenshot({ path: '/tmp/element-trust-editor.png', fullPage: true });

	// Asked for the thinnest: the smallest product size whose 1/ΣR meets 0.16 — 140 mm (U 0.152; 130 mm gives 0.164).
	await solver.getByTestId('thinnest-choice').check();
	expect(loftU(140)).toBeLessThanOrEqual(0.16);
	expect(loftU(130)).toBeGreaterThan(0.16);
	await expect(solver.getByTestId('thickness-answer')).toContainText(
		'The thinnest product size that still meets it is 140 mm (U = 0.152)'
	);
	await expect(solver.getByRole('button', { name: 'Use 140 mm' })).toBeVisible();
	await solver.screenshot({ path: '/tmp/element-trust-thinnest.png' });
	await solver.getByTestId('thinnest-choice').uncheck();
	await expect(solver.getByRole('button', { name: /^Use \d+ mm$/ })).toHaveCount(0);

	// The warning does not block the save; the stored result keeps it; the PDF's notes print it.
	const id = await save(page);
	await expect(page.getByTestId('saved-u')).toHaveText('0.13');
	const row = await db()('elements').where({ id }).first('last_result');
	expect(
		(row.last_result.plausibility as { check: string; path: string }[]).map((w) => [w.check, w.path])
	).toEqual([['inside-temperature', 'internal.temperature']]);
	const pdf = await pdfText(page, id);
	expect(holds(pdf, 'Plausibility: The inside temperature of 40 °C is outside the usual 5–35 °C')).toBe(true);
});

test("a rafter roof's inclination decides its heat flow: 20° upward, 60° horizontal", async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	await newElement(page);
	await page.getByLabel('Kind').selectOption('pitched-roof-rafters');
	await page.getByLabel('Area m²').fill('30');
	await page.getByLabel('Layer 1 name').fill('Plasterboard');
	await page.getByLabel('Layer 1 thickness in mm').fill('12.5');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('0.21');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('8');
	await page.getByRole('button', { name: 'Add layer' }).click();
	await page.getByLabel('Layer 2 name').fill('Mineral wool');
	await page.getByLabel('Layer 2 thickness in mm').fill('150');
	await page.getByLabel('Layer 2 λ in W/(m·K)').fill('0.035');
	await page.getByLabel('Layer 2 vapour resistance factor μ').fill('1');

	const results = page.getByTestId('results');
	await page.getByLabel('Inclination °').fill('20');
	await expect(page.getByLabel('Heat flow')).toHaveValue('upward');
	await expect(page.getByLabel('Heat flow')).toBeDisabled();
	await expect(page.getByTestId('inclination-rule')).toContainText(
		'Heat flow taken as upward: Rsi 0.1 m²·K/W'
	);
	await expect(results).toContainText('Rsi 0.10 · Rse 0.04');

	await page.getByLabel('Inclination °').fill('60');
	await expect(page.getByLabel('Heat flow')).toHaveValue('horizontal');
	await expect(results).toContainText('Rsi 0.13 · Rse 0.04');
	// U = 1/(0.13 + 0.0125/0.21 + 0.15/0.035 + 0.04) = 0.2215 W/(m²·K)
	await expect(page.getByTestId('u-unrounded')).toHaveText('0.2215');

	// Saved with the heat flow the inclination gives: the server computes the same U.
	const id = await save(page);
	await expect(page.getByTestId('saved-u')).toHaveText('0.22');
	expect((await db()('elements').where({ id }).first('heat_flow')).heat_flow).toBe('horizontal');
});

test('a ground floor on clay: λ 1.5 chosen by kind, stated with its source in the notes and the PDF', async ({
	page,
	context
}) => {
	await signInAs(context, DEMO.assessor);
	await newElement(page);
	await page.getByLabel('Kind').selectOption('ground-floor');
	await page.getByLabel('Area m²', { exact: true }).fill('100');
	await page.getByLabel('Exposed perimeter m').fill('40');
	await page.getByLabel('Layer 1 name').fill('Concrete slab');
	await page.getByLabel('Layer 1 thickness in mm').fill('150');
	await page.getByLabel('Layer 1 λ in W/(m·K)').fill('1.5');
	await page.getByLabel('Layer 1 vapour resistance factor μ').fill('100');
	// not known: λg 2.0; B′ = 5 m, dt = 0.3 + 2.0·0.31 = 0.92 m, U = 4/(5π + 0.92)·ln(5π/0.92 + 1) = 0.696
	await expect(page.getByTestId('live-u')).toHaveText('0.70');
	await expect(page.getByTestId('ground-row')).toContainText('λ ground 2.00 W/(m·K)');

	// clay or silt: λg 1.5; dt = 0.3 + 1.5·0.31 = 0.765 m, U = 3/(5π + 0.765)·ln(5π/0.765 + 1) = 0.559
	await page.getByLabel('Ground type').selectOption('clay-or-silt');
	await expect(page.getByTestId('live-u')).toHaveText('0.56');
	await expect(page.getByTestId('ground-row')).toContainText('λ ground 1.50 W/(m·K)');
	await expect(page.getByTestId('results')).toContainText(
		'Ground thermal conductivity λg = 1.5 W/(m·K), as given: the value for clay or silt (ISO 13370:2017, Table 7, from memory'
	);

	// Another value: typed, as given.
	await page.getByLabel('Ground type').selectOption('value');
	await page.getByLabel('Ground λ W/(m·K)').fill('1.8');
	await expect(page.getByTestId('ground-row')).toContainText('λ ground 1.80 W/(m·K)');
	await page.getByLabel('Ground type').selectOption('clay-or-silt');

	const id = await save(page);
	await page.reload();
	await waitForApp(page);
	await expect(page.getByLabel('Ground type')).toHaveValue('clay-or-silt');
	await expect(page.getByTestId('saved-u')).toHaveText('0.56');
	const pdf = await pdfText(page, id);
	expect(holds(pdf, 'λg = 1.5 W/(m·K), as given: the value for clay or silt (ISO 13370:2017, Table 7')).toBe(
		true
	);
});

test('the thickness API: "meets" proposes nothing; mode thinnest asks for the thinnest that still meets', async ({
	request
}) => {
	const origin = `http://127.0.0.1:${process.env.APP_PORT ?? 4173}`;
	const headers = { cookie: await sessionCookie(DEMO.assessor), origin, 'content-type': 'application/json' };
	const input = {
		heatFlow: 'upward',
		layers: [
			{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21 },
			{ name: 'PIR', thicknessMm: 170, lambda: 0.022 }
		]
	};
	const ask = (extra: Record<string, unknown>) =>
		request.post('/api/v1/calculate/thickness', {
			headers,
			data: { input, layerIndex: 1, targetU: 0.16, ...extra }
		});
	const meets = await ask({});
	expect(meets.status()).toBe(200);
	expect(await meets.json()).toMatchObject({
		outcome: 'meets',
		currentMm: 170,
		uCurrentRounded: 0.13,
		roundedMm: null
	});
	const thinnest = await (await ask({ mode: 'thinnest' })).json();
	expect(thinnest).toMatchObject({ outcome: 'thinner', roundedMm: 140 });
	expect(thinnest.uAtRounded).toBeCloseTo(loftU(140), 12);
	const bad = await ask({ mode: 'thinner' });
	expect(bad.status()).toBe(400);
	expect((await bad.json()).issues[0].path).toBe('mode');
});
