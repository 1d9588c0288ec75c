import { test, expect, type Page } from '@playwright/test';
import sharp from 'sharp';
import { DEMO, db, sessionCookie, signInAs, waitForApp } from './helpers';

// Evidence in the browser: an assessor uploads a photo for a layer from the dwelling's evidence page;
// the supervisor sees its thumbnail; another organisation gets nothing. Needs the fake S3 (the test
// command starts scripts/fake-s3.js and sets S3_*). Envelo's own behaviour (common practice, no source).

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const BEN = '00000000-0000-4000-8000-000000000102';

/** A fresh Northfield dwelling of Ben's with one three-layer wall (values invented, plausible). */
async function arrangeDwelling() {
	const reference = `EVD-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
	const [d] = await db()('dwellings')
		.insert({
			organisation_id: NORTHFIELD,
			reference,
			address: '7 Test Row (invented)',
			assessor_id: BEN,
			status: 'draft'
		})
		.returning('id');
	await db()('elements').insert({
		organisation_id: NORTHFIELD,
		dwelling_id: d.id,
		position: 0,
		name: 'North wall',
		kind: 'external-wall',
		area: 12,
		heat_flow: 'horizontal',
		build_up: JSON.stringify({
			layers: [
				{ name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
				{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
				{ name: 'Brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
			]
		}),
		internal: JSON.stringify({ temperature: 20, humidityClass: 3 })
	});
	return { id: d.id as string, reference };
}

/** The natural width of the first thumbnail once it has loaded (0 while it has not). */
const thumbnailWidth = (page: Page) =>
	page
		.getByTestId('evidence-thumbnail')
		.first()
		.evaluate((img: HTMLImageElement) => (img.complete ? img.naturalWidth : 0));

test('an assessor uploads a photo of a layer; the supervisor sees its thumbnail; another organisation cannot', async ({
	page,
	context,
	browser,
	request
}) => {
	const d = await arrangeDwelling();
	const photo = await sharp({
		create: { width: 1600, height: 1200, channels: 3, background: { r: 200, g: 170, b: 90 } }
	})
		.jpeg()
		.toBuffer();

	await signInAs(context, DEMO.assessor);
	await page.goto(`/dwellings/${d.id}/evidence`);
	await waitForApp(page);
	await expect(page.getByTestId('no-evidence')).toBeVisible();
	await page
		.getByRole('combobox', { name: /^For\b/ })
		.selectOption({ label: 'North wall — layer 2: Mineral wool' });
	await page
		.locator('input[type="file"][name="file"]')
		.setInputFiles({ name: 'mineral wool depth.jpg', mimeType: 'image/jpeg', buffer: photo });
	await page.getByRole('button', { name: 'Upload', exact: true }).click();
	await expect(page.getByTestId('evidence-message')).toHaveText('Uploaded “mineral wool depth.jpg”.');
	const item = page.getByTestId('evidence-item');
	await expect(item).toHaveCount(1);
	await expect(item).toContainText('For North wall, layer 2 (Mineral wool)');
	await expect.poll(() => thumbnailWidth(page)).toBe(320);

	const row = await db()('evidence').where({ dwelling_id: d.id }).first('id', 'bytes');
	expect(Number(row.bytes)).toBe(photo.length);

	const supervisor = await browser.newContext();
	const review = await supervisor.newPage();
	await signInAs(supervisor, DEMO.supervisor);
	await review.goto(`/dwellings/${d.id}/evidence`);
	await expect(review.getByTestId('evidence-item')).toHaveCount(1);
	await expect.poll(() => thumbnailWidth(review)).toBe(320);
	// Supervisors read evidence and request more from the audit; they do not upload.
	await expect(review.getByTestId('evidence-upload')).toHaveCount(0);
	await supervisor.close();

	const outsider = { cookie: await sessionCookie(DEMO.otherAssessor) };
	for (const path of [`/evidence/${row.id}`, `/evidence/${row.id}/thumbnail`]) {
		const res = await request.get(path, { headers: outsider, maxRedirects: 0 });
		expect(res.status(), path).toBe(404);
	}
	const list = await request.get(`/api/v1/dwellings/${d.id}/evidence`, { headers: outsider });
	expect(list.status()).toBe(404);
});
