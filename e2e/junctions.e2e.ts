import { test, expect, type Page, type TestInfo } from '@playwright/test';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { DEMO, signInAs, waitForApp } from './helpers';

// Junctions built from a dwelling's own elements, computed live in a Web Worker and drawn: an
// assessor makes a dwelling with a wall and a ground floor (through the API, leaving the demo data
// alone), adds an external corner and a wall–ground floor junction, sees the picture and ψ, and finds
// both in the dwelling's transmission heat loss; the dwelling report, previewed and then issued, has a
// page for each junction and the heat-loss totals (its text by poppler's pdftotext, Debian
// poppler-utils; its pages rendered by pdftoppm for a look). Expected signs: an external corner of one wall has
// ψ < 0 on external dimensions (ISO 13789 dimension systems, as recalled; common practice, no source).
// Build-ups: generic, indicative values invented for this test.

const layer = (name: string, thicknessMm: number, lambda: number, mu: number) => ({
	name,
	thicknessMm,
	lambda,
	mu
});
const WALL = {
	name: 'E2E cavity wall',
	kind: 'external-wall',
	area: 60,
	buildUp: {
		layers: [
			layer('Plaster', 13, 0.5, 10),
			layer('Block', 100, 0.5, 10),
			layer('Mineral wool', 100, 0.035, 1),
			layer('Brick', 100, 0.77, 10)
		]
	},
	internal: { temperature: 20, humidityClass: 3 }
};
const FLOOR = {
	name: 'E2E ground floor',
	kind: 'ground-floor',
	area: 50,
	buildUp: {
		layers: [layer('Screed', 65, 1.15, 50), layer('PIR', 100, 0.022, 60), layer('Slab', 150, 1.35, 100)],
		ground: { perimeterM: 30 }
	},
	internal: { temperature: 20, humidityClass: 3 }
};

const work = mkdtempSync(path.join(tmpdir(), 'envelo-e2e-junctions-'));
test.afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A PDF's pages as text in the order they were written, whitespace folded. */
function pdfPages(pdf: Buffer, name: string): string[] {
	const file = path.join(work, name);
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' })
		.split('\f')
		.filter((p) => p.trim())
		.map((p) => p.replace(/\s+/g, ' '));
}

/** Where a screenshot goes: the test's output folder, or JUNCTION_SCREENSHOTS to keep them for a look. */
const shot = (info: TestInfo, name: string) =>
	process.env.JUNCTION_SCREENSHOTS
		? path.join(process.env.JUNCTION_SCREENSHOTS, name)
		: info.outputPath(name);

async function arrange(page: Page) {
	const reference = `E2E-J-${Date.now().toString(36)}`;
	const climates = await (await page.request.get('/api/v1/climates')).json();
	const climateId = climates.items?.[0]?.id ?? null;
	const d = await page.request.post('/api/v1/dwellings', {
		data: { reference, address: '1 Junction Lane', climateId }
	});
	expect(d.status()).toBe(201);
	const dwelling = await d.json();
	for (const el of [WALL, FLOOR]) {
		const r = await page.request.post(`/api/v1/dwellings/${dwelling.id}/elements`, { data: el });
		expect(r.status(), await r.text()).toBe(201);
	}
	return { id: dwelling.id as string, reference, climate: Boolean(climateId) };
}

async function newJunction(page: Page, dwellingId: string, type: string) {
	await page.goto(`/dwellings/${dwellingId}/junctions`);
	await waitForApp(page);
	await page.getByLabel('Type of the new junction').selectOption(type);
	await page.getByRole('button', { name: 'Add junction' }).click();
	await expect(page.getByRole('heading', { name: 'New junction' })).toBeVisible();
	await waitForApp(page);
}

async function psiShown(page: Page): Promise<number> {
	await expect(page.getByTestId('psi')).toHaveText(/^-?\d+\.\d{3}/, { timeout: 30_000 });
	return Number((await page.getByTestId('psi').textContent())!.trim().split(/\s/)[0]);
}

test('an assessor adds an external corner and a wall–ground floor junction from their own elements', async ({
	page,
	context,
	browser
}, info) => {
	test.setTimeout(180_000);
	const workers: string[] = [];
	page.on('worker', (w) => workers.push(w.url()));
	await signInAs(context, DEMO.assessor);
	const d = await arrange(page);

	// External corner: the wall is picked by default; the worker computes while the page stays responsive.
	await newJunction(page, d.id, 'external-corner');
	await page.getByLabel('Name', { exact: true }).fill('Corners');
	await page.getByLabel('Length in the dwelling, m').fill('10.4');
	await expect(page.getByLabel('First wall')).toHaveValue(/[0-9a-f-]{36}/);
	const corner = await psiShown(page);
	expect(corner).toBeLessThan(0);
	expect(workers.some((u) => /junction\.worker/.test(u))).toBe(true);
	await expect(page.getByTestId('psi-system')).toHaveText('on external dimensions');
	await expect(page.getByTestId('junction-picture')).toBeVisible();
	await expect(page.getByTestId('temperature-field')).toBeAttached();
	await expect(page.getByTestId('coldest-label')).toContainText(/coldest -?\d+\.\d °C \(fRsi 0\.\d{3}\)/);
	await expect(page.getByTestId('frsi-rule')).toContainText('common practice, no source');
	if (d.climate) await expect(page.getByTestId('frsi-climate')).toContainText('fRsi,min');
	await expect(page.getByTestId('junction-cautions')).toContainText('professional judgement');
	// the internal-dimension ψ is the larger one (ISO 13789 systems differ by Σ U·Δl)
	await page.getByLabel('Dimension system').selectOption('internal');
	await expect(page.getByTestId('psi-system')).toHaveText('on internal dimensions', { timeout: 30_000 });
	expect(await psiShown(page)).toBeGreaterThan(corner);
	await page.getByLabel('Dimension system').selectOption('external');
	await expect(page.getByTestId('psi-system')).toHaveText('on external dimensions', { timeout: 30_000 });
	await page.getByRole('button', { name: 'Save junction' }).click();
	await page.waitForURL(/\/junctions\/[0-9a-f-]{36}\?saved=1/);
	await expect(page.getByRole('heading', { name: 'Corners' })).toBeVisible();
	const saved = await psiShown(page);
	expect(saved).toBeCloseTo(corner, 3);
	await page.screenshot({ path: shot(info, 'junction-corner.png'), fullPage: true });

	// The same model as rectangles (free-form) gives the same ψ; not saved.
	await page.getByRole('button', { name: 'Edit this model as rectangles' }).click();
	await expect(page.getByTestId('free-form')).toBeVisible();
	await expect(page.getByLabel('Rectangle 1 λ')).toHaveValue(/\d/);
	await expect(page.getByTestId('live-status')).toContainText('Computed', { timeout: 30_000 });
	expect(await psiShown(page)).toBeCloseTo(corner, 3);

	// Wall – ground floor: the floor is the dwelling's own element.
	await newJunction(page, d.id, 'ground-floor');
	await page.getByLabel('Name', { exact: true }).fill('Ground floor edge');
	await page.getByLabel('Length in the dwelling, m').fill('30');
	await page.getByLabel('Ground floor', { exact: true }).selectOption({ label: FLOOR.name });
	const edge = await psiShown(page);
	expect(Number.isFinite(edge)).toBe(true);
	await expect(page.getByTestId('temperature-field')).toBeAttached();
	await page.screenshot({ path: shot(info, 'junction-ground-floor.png'), fullPage: true });
	await page.getByRole('button', { name: 'Save junction' }).click();
	await page.waitForURL(/\/junctions\/[0-9a-f-]{36}\?saved=1/);

	// Both in the list and in the transmission heat loss: Σ ψ·L = ψ1·L1 + ψ2·L2.
	await page.goto(`/dwellings/${d.id}/junctions`);
	await expect(page.getByTestId('junction-row')).toHaveCount(2);
	const shown = Number((await page.getByTestId('sum-psi-l').textContent())!.trim().split(/\s/)[0]);
	expect(Math.abs(shown - (corner * 10.4 + edge * 30))).toBeLessThan(0.1); // ψ shown to 3 decimals
	await page.screenshot({ path: shot(info, 'junction-list.png'), fullPage: true });

	// The dwelling report: previewed, then issued, each with a page per junction and the heat loss.
	const checkReport = (pages: string[]) => {
		// the technical summary, after the client's summary in plain words
		const summary = pages.find((p) => p.includes('DWELLING REPORT'))!;
		expect(summary).toContain('Junctions and transmission heat loss');
		expect(summary).toMatch(/Corners External corner \(walls\) 10\.40 −?\d\.\d{3}/);
		expect(summary).toMatch(/Ground floor edge Wall – ground floor 30\.00 −?\d\.\d{3}/);
		expect(summary).toMatch(/Σψ·L \(junctions\) −?\d+\.\d{2} W\/K/);
		expect(summary).toMatch(/HT = ΣU·A \+ Σψ·L −?\d+\.\d{2} W\/K/);
		const junctionPages = pages.filter((p) => /JUNCTION \d OF 2 ·/.test(p));
		expect(junctionPages).toHaveLength(2);
		expect(junctionPages[0]).toContain('JUNCTION 1 OF 2 · EXTERNAL CORNER (WALLS) Corners');
		expect(junctionPages[1]).toContain('JUNCTION 2 OF 2 · WALL – GROUND FLOOR Ground floor edge');
		for (const p of junctionPages) {
			expect(p).toContain('Cross-section and temperatures');
			expect(p).toMatch(/coldest -?\d+\.\d °C, fRsi 0\.\d{3}/);
			expect(p).toMatch(/external dimensions −?\d\.\d{3} \(used\)/);
			expect(p).toContain('Against 0.75 for dwellings (common practice, no source)');
			expect(p).toContain('Method, mesh, convergence and cautions');
			expect(p).toContain('do not replace, professional judgement');
		}
		expect(junctionPages[0]).toContain(`${corner < 0 ? '−' : ''}${Math.abs(corner).toFixed(3)}`);
		expect(pages.some((p) => p.includes('Junctions: method and cautions'))).toBe(true);
	};
	const preview = await page.request.get(`/dwellings/${d.id}/reports/preview.pdf`);
	expect(preview.status()).toBe(200);
	const draftPdf = await preview.body();
	checkReport(pdfPages(draftPdf, 'draft.pdf'));
	const made = await page.request.post('/api/v1/reports', { data: { dwellingId: d.id } });
	expect(made.status(), await made.text()).toBe(201);
	const report = await made.json();
	const issued = await page.request.get(`/api/v1/reports/${report.id}.pdf`);
	expect(issued.status()).toBe(200);
	const issuedPdf = await issued.body();
	const pages = pdfPages(issuedPdf, 'issued.pdf');
	checkReport(pages);
	// the rendered pages, for a look: the summary and the first junction page
	const first = pages.findIndex((p) => /JUNCTION 1 OF 2/.test(p)) + 1;
	for (const [n, name] of [
		[1, 'report-summary'],
		[first, 'report-junction']
	] as const)
		execFileSync('pdftoppm', [
			'-png',
			'-r',
			'60',
			'-f',
			String(n),
			'-l',
			String(n),
			'-singlefile',
			path.join(work, 'issued.pdf'),
			shot(info, name)
		]);

	// A supervisor's audit of the dwelling shows each junction issued beside its recompute.
	const sup = await browser.newContext();
	await signInAs(sup, DEMO.supervisor);
	const spage = await sup.newPage();
	const batch = await spage.request.post('/api/v1/audit/batches', {
		data: {
			name: `Check ${d.reference}`,
			source: 'references',
			references: [d.reference],
			sampling: { rule: 'all' }
		}
	});
	expect(batch.status(), await batch.text()).toBe(201);
	const { id: batchId } = await batch.json();
	await expect
		.poll(
			async () =>
				(await (await spage.request.get(`/api/v1/audit/batches/${batchId}`)).json()).progress?.state,
			{
				timeout: 60_000
			}
		)
		.toBe('done');
	const items = await (await spage.request.get(`/api/v1/audit/batches/${batchId}/items`)).json();
	const itemId = (items.items ?? items)[0].id;
	await spage.goto(`/audit/${batchId}/items/${itemId}`);
	await waitForApp(spage);
	const table = spage.getByTestId('junction-recompute');
	await expect(table.locator('tbody tr')).toHaveCount(2);
	await expect(table).toContainText('Corners');
	await spage.screenshot({ path: shot(info, 'audit-junctions.png'), fullPage: true });
	await sup.close();
});
