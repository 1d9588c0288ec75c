import { test, expect } from '@playwright/test';
import { createHash } from 'node:crypto';
import { DEMO, db, signInAs, sessionCookie, waitForMail } from './helpers';

// Issue, download, e-mail and verify a report in the built app (common practice, no source: the
// workflow is Envelo's own). The PDF's SHA-256 is checked against the stored one with Node's crypto.

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const BEN = '00000000-0000-4000-8000-000000000102';
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

async function demoDwelling() {
	// A demo dwelling of Ben's whose every element has a build-up or a given U (seed 04).
	const rows = await db()('dwellings')
		.where({ organisation_id: NORTHFIELD, assessor_id: BEN })
		.whereNotIn('status', ['archived', 'awaiting-review'])
		.orderBy('reference')
		.select('id', 'reference', 'client_email');
	for (const d of rows) {
		const bad = await db()('elements')
			.where({ dwelling_id: d.id })
			.whereNull('build_up')
			.whereNull('given_u')
			.first('id');
		const any = await db()('elements').where({ dwelling_id: d.id }).first('id');
		if (any && !bad) return d;
	}
	throw new Error('no demo dwelling with elements for Ben');
}

test('an assessor previews, issues, re-issues, downloads and e-mails a report; the client verifies it', async ({
	page,
	context,
	browser,
	request
}) => {
	test.setTimeout(120_000);
	const d = await demoDwelling();
	await signInAs(context, DEMO.assessor);
	await page.goto(`/dwellings/${d.id}/reports`);
	await expect(page.getByRole('heading', { name: /Reports and e-mail/ })).toBeVisible();
	await expect(page.getByTestId('draft-elements')).toBeVisible();
	// The summary for the client, as the report prints it first and the e-mail carries it, folded away.
	const summaryPreview = page.getByTestId('client-summary');
	await summaryPreview.locator('summary').click();
	await expect(summaryPreview).toContainText('In short');
	await expect(summaryPreview.getByRole('heading', { name: 'What to do next' })).toBeVisible();
	await expect(summaryPreview).toContainText(
		'support, and do not replace, the judgement of a qualified professional'
	);

	// Draft preview: a PDF, marked as such.
	const cookie = await sessionCookie(DEMO.assessor);
	const preview = await request.get(`/dwellings/${d.id}/reports/preview.pdf`, { headers: { cookie } });
	expect(preview.status()).toBe(200);
	expect(preview.headers()['content-type']).toBe('application/pdf');
	expect((await preview.body()).subarray(0, 5).toString()).toBe('%PDF-');

	// Issue the dwelling report (revision n), then again (revision n + 1 supersedes it).
	const before = await db()('reports')
		.where({ dwelling_id: d.id, scope: 'dwelling' })
		.count({ n: '*' })
		.first();
	const count = async () =>
		Number(
			(await db()('reports').where({ dwelling_id: d.id, scope: 'dwelling' }).count({ n: '*' }).first())?.n ??
				0
		);
	// Without JavaScript, the first press only asks: nothing is issued until the second step.
	const origin = new URL(page.url()).origin;
	const ask = await request.post(`/dwellings/${d.id}/reports?/issue`, {
		headers: { cookie, origin, accept: 'text/html' },
		form: { elementId: '' }
	});
	expect(ask.status()).toBe(200);
	expect(await ask.text()).toContain('can never be changed or withdrawn');
	expect(await count()).toBe(Number(before?.n ?? 0));

	// With JavaScript, a confirm() dialog asks; dismissing it issues nothing.
	let question = '';
	page.once('dialog', (dialog) => {
		question = dialog.message();
		void dialog.dismiss();
	});
	await page.getByRole('button', { name: 'Issue dwelling report' }).click();
	await expect.poll(() => question).toMatch(/^Issue the dwelling report for .+\? An issued report is frozen/);
	expect(await count()).toBe(Number(before?.n ?? 0));
	page.on('dialog', (dialog) => void dialog.accept());
	await page.getByRole('button', { name: 'Issue dwelling report' }).click();
	await expect.poll(count, { timeout: 30_000 }).toBe(Number(before?.n ?? 0) + 1);
	await expect(page.getByRole('status').filter({ hasText: /Issued report .+, revision \d+/ })).toBeVisible();
	await expect(page.getByRole('button', { name: 'Issue dwelling report' })).toBeEnabled();
	await page.getByRole('button', { name: 'Issue dwelling report' }).click();
	await expect.poll(count, { timeout: 30_000 }).toBe(Number(before?.n ?? 0) + 2);
	const issued = await db()('reports')
		.where({ dwelling_id: d.id, scope: 'dwelling' })
		.orderBy('revision', 'desc')
		.select('id', 'number', 'revision', 'sha256', 'verification_code', 'supersedes_id');
	expect(issued.length).toBe(Number(before?.n ?? 0) + 2);
	const [latest, previous] = issued;
	expect(latest.supersedes_id).toBe(previous.id);
	await expect(page.locator(`[data-testid=report-row][data-revision="${previous.revision}"]`)).toContainText(
		'Superseded'
	);
	await expect(page.locator(`[data-testid=report-row][data-revision="${latest.revision}"]`)).toContainText(
		'Current'
	);
	// A superseded revision is not offered for e-mail.
	const oldRow = page.locator(`[data-testid=report-row][data-revision="${previous.revision}"]`);
	await expect(oldRow.locator('xpath=following-sibling::tr[1]')).toContainText('not offered for e-mail');
	await expect(
		oldRow.locator('xpath=following-sibling::tr[1]').getByText(/E-mail .* to the client/)
	).toHaveCount(0);
	expect((await db()('dwellings').where({ id: d.id }).first('status')).status).toBe('issued');
	await page.screenshot({ path: '/tmp/reports-page.png', fullPage: true });

	// Download through the API: the stored bytes, hash as recorded.
	const pdfRes = await request.get(`/api/v1/reports/${latest.id}.pdf`, { headers: { cookie } });
	expect(pdfRes.status()).toBe(200);
	const pdf = await pdfRes.body();
	expect(sha(pdf)).toBe(latest.sha256);
	expect(pdfRes.headers()['x-content-sha256']).toBe(latest.sha256);

	// E-mail to the client: queued in the outbox, sent by the worker to the fake SMTP server.
	const to = `client-${Date.now()}@example.test`;
	const since = new Date(Date.now() - 1000).toISOString();
	const row = page.locator(`[data-testid=report-row][data-revision="${latest.revision}"]`);
	await row
		.locator('xpath=following-sibling::tr[1]')
		.getByText(/E-mail .* to the client/)
		.click();
	const mailForm = row.locator('xpath=following-sibling::tr[1]');
	await mailForm.getByLabel('To', { exact: true }).fill(to);
	await mailForm.getByRole('button', { name: 'Send with PDF' }).click();
	await expect(page.getByRole('status').filter({ hasText: `E-mail to ${to} queued` })).toBeVisible();
	// The list shows the message at once and turns it to "Sent" by itself (no reload below).
	await expect(page.locator('[data-testid=mail-row]').filter({ hasText: to })).toBeVisible();
	const mail = await waitForMail(to, new RegExp(latest.number), since);
	expect(mail.attachments).toHaveLength(1);
	expect(mail.attachments[0].filename).toMatch(/\.pdf$/);
	expect(mail.text).toContain(`/verify/${latest.verification_code}`);
	// Sent as HTML with a plain-text alternative, both with the summary for the client and its cautions.
	const html = (mail as typeof mail & { html: string }).html;
	expect(mail.text).toContain('SUMMARY FOR THE CLIENT');
	expect(mail.text).toMatch(/In short: /);
	expect(mail.text).toContain('support, and do not replace, the judgement of a qualified professional');
	expect(html).toContain('Your home in plain words');
	expect(html).toContain(`/verify/${latest.verification_code}`);
	expect(html).toContain('local building codes');
	expect(html).not.toMatch(/<script|<img|<link/i);
	// As a mail program shows it: the headings and the table read, and nothing is fetched from elsewhere.
	const view = await browser.newPage();
	const fetched: string[] = [];
	view.on('request', (r) => fetched.push(r.url()));
	await view.setContent(html);
	await expect(view.getByRole('heading', { name: 'Your home in plain words' })).toBeVisible();
	for (const h of [
		'What was assessed',
		'Heat loss',
		'Damp and mould',
		'What to do next',
		'Please keep in mind'
	])
		await expect(view.getByRole('heading', { name: h })).toBeVisible();
	await expect(view.getByRole('table')).toContainText('Heat loss figure (U-value)');
	expect(fetched).toEqual([]);
	await view.screenshot({ path: '/tmp/reports-mail.png', fullPage: true });
	await view.close();
	await expect(page.locator('[data-testid=mail-row]').filter({ hasText: to })).toContainText('Sent', {
		timeout: 15_000
	});

	// The client, signed out, verifies the code and the file.
	const anon = await browser.newContext();
	const client = await anon.newPage();
	await client.goto(`/verify/${latest.verification_code}`);
	await expect(client.getByTestId('verify-heading')).toHaveText('Report found');
	await expect(client.getByTestId('verified')).toContainText(`${latest.number}, revision ${latest.revision}`);
	await expect(client.getByTestId('superseded')).toHaveCount(0);
	await expect(client.getByTestId('verified')).toContainText(d.reference);
	await expect(client.getByTestId('verified')).toContainText('Ben Okafor');
	await expect(client.getByText(/Northfield/)).toHaveCount(0);
	await client
		.locator('input[type=file]')
		.setInputFiles({ name: 'report.pdf', mimeType: 'application/pdf', buffer: pdf });
	await client.getByRole('button', { name: 'Check the file' }).click();
	await expect(client.getByTestId('check-outcome')).toHaveAttribute('data-outcome', 'match');
	await expect(client.getByTestId('verify-heading')).toHaveText('Report found — your copy matches');
	const changed = Buffer.from(pdf);
	changed[changed.length - 20] ^= 0x20;
	await client
		.locator('input[type=file]')
		.setInputFiles({ name: 'edited.pdf', mimeType: 'application/pdf', buffer: changed });
	await client.getByRole('button', { name: 'Check the file' }).click();
	await expect(client.getByTestId('check-outcome')).toHaveAttribute('data-outcome', 'mismatch');
	await expect(client.getByTestId('verify-heading')).toHaveText('Report found — your copy does not match');
	await client.screenshot({ path: '/tmp/reports-verify.png', fullPage: true });

	// The superseded revision's code, typed in the grouped form printed on the PDF, says it was replaced.
	const grouped = previous.verification_code.replace(/^(.{4})(.{4})(.*)$/, '$1-$2-$3');
	await client.goto(`/verify/${grouped}`);
	await expect(client.getByTestId('superseded')).toContainText(
		`This code belongs to report ${previous.number} revision ${previous.revision}, issued`
	);
	await expect(client.getByTestId('superseded')).toContainText(
		`superseded by revision ${latest.revision} on`
	);
	await client.screenshot({ path: '/tmp/reports-verify-superseded.png', fullPage: true });

	// Without JavaScript the file itself is uploaded and compared on the server.
	const upload = await anon.request.post(`/verify/${latest.verification_code}?/check`, {
		headers: { origin: new URL(page.url()).origin, accept: 'text/html' },
		multipart: { pdf: { name: 'edited.pdf', mimeType: 'application/pdf', buffer: changed } }
	});
	expect(await upload.text()).toContain('Does not match');
	await anon.close();
});

test('the API issues and e-mails with clear errors, and keeps other organisations out', async ({
	request
}) => {
	const d = await demoDwelling();
	const cookie = await sessionCookie(DEMO.assessor);
	const bad = await request.post('/api/v1/reports', { headers: { cookie }, data: { dwellingId: 'nope' } });
	expect(bad.status()).toBe(400);
	expect(JSON.stringify(await bad.json())).toContain('dwellingId');

	const el = await db()('elements').where({ dwelling_id: d.id }).whereNotNull('build_up').first('id');
	const made = await request.post('/api/v1/reports', {
		headers: { cookie },
		data: { dwellingId: d.id, elementId: el.id }
	});
	expect(made.status()).toBe(201);
	const report = await made.json();
	expect(report.scope).toBe('element');

	const badMail = await request.post(`/api/v1/reports/${report.id}/email`, {
		headers: { cookie },
		data: { to: 'not-an-address' }
	});
	expect(badMail.status()).toBe(400);
	expect(JSON.stringify(await badMail.json())).toMatch(/to.*e-mail address/);
	const mail = await request.post(`/api/v1/reports/${report.id}/email`, {
		headers: { cookie },
		data: { to: 'api-client@example.test' }
	});
	expect(mail.status()).toBe(202);
	expect((await mail.json()).status).toMatch(/queued|sent/);

	const other = await sessionCookie(DEMO.otherAdmin);
	for (const res of [
		await request.get(`/api/v1/reports/${report.id}.pdf`, { headers: { cookie: other } }),
		await request.get(`/api/v1/reports/${report.id}`, { headers: { cookie: other } }),
		await request.post(`/api/v1/reports/${report.id}/email`, {
			headers: { cookie: other },
			data: { to: 'x@example.test' }
		}),
		await request.post('/api/v1/reports', { headers: { cookie: other }, data: { dwellingId: d.id } })
	]) {
		expect(res.status()).toBe(404);
		expect(await res.text()).not.toContain(report.id);
	}
	const supervisor = await sessionCookie(DEMO.supervisor);
	const refused = await request.post('/api/v1/reports', {
		headers: { cookie: supervisor },
		data: { dwellingId: d.id }
	});
	expect(refused.status()).toBe(403);
});
