import { test, expect, type APIRequestContext } from '@playwright/test';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { DEMO, db, signInAs, sessionCookie, waitForApp } from './helpers';

// Who issues a report and who decides on it, in the built app: Envelo's own rules (common practice, no
// source). Each test works on its own copy of a demo dwelling (seed 04), so the demo rows stay as they are.

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';

/** Text of a PDF by poppler's pdftotext (Debian poppler-utils), whitespace folded. */
function pdfText(pdf: Buffer): string {
	const file = path.join(mkdtempSync(path.join(tmpdir(), 'envelo-duties-')), 'r.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

/** A fresh copy of a demo dwelling of Ben's, made by Ben through the API (so Ben is its assessor). */
async function copyOfDemo(request: APIRequestContext, demoReference: string, tag: string) {
	const source = await db()('dwellings')
		.where({ organisation_id: NORTHFIELD, reference: demoReference })
		.first('id');
	const cookie = await sessionCookie(DEMO.assessor);
	const res = await request.post(`/api/v1/dwellings/${source.id}/copy`, {
		headers: { cookie },
		data: { reference: `${tag}-${Date.now().toString(36).toUpperCase()}` }
	});
	expect(res.status()).toBe(201);
	return (await res.json()) as { id: string; reference: string; version: number };
}

const userId = async (email: string) => (await db()('users').where({ email }).first('id')).id as string;

test('an assessor who hands a dwelling over cannot issue it in the new assessor’s name', async ({
	page,
	context,
	browser,
	request
}) => {
	test.setTimeout(120_000);
	const d = await copyOfDemo(request, 'LT-001', 'DUTY-A');
	const [ben, carla] = [await userId(DEMO.assessor), await userId(DEMO.assessor2)];

	// Ben opens the details: the rule is stated where the assessor is chosen. He hands it to Carla.
	await signInAs(context, DEMO.assessor);
	await page.goto(`/dwellings/${d.id}`);
	await waitForApp(page);
	await page.getByRole('button', { name: 'Edit details' }).click();
	await expect(page.getByTestId('assessor-rule')).toContainText(
		'an assessor may hand a dwelling of theirs over'
	);
	await expect(page.getByTestId('assessor-rule')).toContainText(
		'Only the dwelling’s assessor issues its reports'
	);
	await page.getByLabel('Assessor').selectOption({ label: 'Carla Reyes' });
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.getByRole('status').filter({ hasText: 'Saved.' })).toBeVisible();
	await expect
		.poll(async () => (await db()('dwellings').where({ id: d.id }).first('assessor_id')).assessor_id)
		.toBe(carla);
	const log = await db()('activity_log')
		.where({ entity: 'dwelling', entity_id: d.id, action: 'reassign' })
		.first('user_id', 'details');
	expect(log.user_id).toBe(ben);
	expect(log.details.from).toEqual({ id: ben, name: 'Ben Okafor' });
	expect(log.details.to).toEqual({ id: carla, name: 'Carla Reyes' });

	// Handed over, it is not his to take back: the refusal shows at the assessor's field.
	await page.reload();
	await waitForApp(page);
	await page.getByRole('button', { name: 'Edit details' }).click();
	await page.getByLabel('Assessor').selectOption({ label: 'Ben Okafor' });
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect(page.locator('.field-error').filter({ hasText: 'another assessor’s' })).toBeVisible();

	// Nor may he issue it: the declaration would be Carla's.
	const benCookie = await sessionCookie(DEMO.assessor);
	const refused = await request.post('/api/v1/reports', {
		headers: { cookie: benCookie },
		data: { dwellingId: d.id }
	});
	expect(refused.status()).toBe(403);
	expect((await refused.json()).message).toMatch(/Only the dwelling’s assessor issues its reports/);
	expect(await db()('reports').where({ dwelling_id: d.id })).toHaveLength(0);

	// Carla issues; the declaration and the public verification name her, who issued it.
	const carlaCookie = await sessionCookie(DEMO.assessor2);
	const made = await request.post('/api/v1/reports', {
		headers: { cookie: carlaCookie },
		data: { dwellingId: d.id }
	});
	expect(made.status()).toBe(201);
	const report = await made.json();
	const pdf = await request.get(`/api/v1/reports/${report.id}.pdf`, { headers: { cookie: carlaCookie } });
	const text = pdfText(await pdf.body());
	const declaration = text.slice(text.lastIndexOf('I declare that I carried out the assessment'));
	expect(declaration).toContain('Assessor Carla Reyes');
	expect(declaration).toContain('Registration number NRP-A-0187 (demo)');
	expect(declaration).not.toContain('Ben Okafor');
	const anon = await browser.newContext();
	const client = await anon.newPage();
	await client.goto(`/verify/${report.verificationCode}`);
	await expect(client.getByTestId('verified')).toContainText('Issued by');
	await expect(client.getByTestId('verify-issuer')).toHaveText(
		'Carla Reyes, registration no. NRP-A-0187 (demo)'
	);
	await anon.close();
});

test('an admin who made herself the assessor and issued the report cannot accept it in the audit', async ({
	browser,
	request
}) => {
	test.setTimeout(120_000);
	const d = await copyOfDemo(request, 'LT-002', 'DUTY-B');
	const ada = await userId(DEMO.admin);
	const adaCookie = await sessionCookie(DEMO.admin);

	// Ada makes herself the assessor (admins may) and issues the dwelling report.
	const taken = await request.patch(`/api/v1/dwellings/${d.id}`, {
		headers: { cookie: adaCookie },
		data: { assessorId: ada, version: d.version }
	});
	expect(taken.status()).toBe(200);
	const issued = await request.post('/api/v1/reports', {
		headers: { cookie: adaCookie },
		data: { dwellingId: d.id }
	});
	expect(issued.status()).toBe(201);
	const report = await issued.json();

	// The dwelling goes into an audit batch; Ada opens its item.
	const batch = await request.post('/api/v1/audit/batches', {
		headers: { cookie: adaCookie },
		data: {
			name: `Independence ${d.reference}`,
			source: 'references',
			references: [d.reference],
			sampling: { rule: 'all', includeFlagged: false }
		}
	});
	expect(batch.status()).toBe(201);
	const batchId = (await batch.json()).id as string;
	const item = await db()('audit_items').where({ batch_id: batchId, dwelling_id: d.id }).first('id');

	const admin = await browser.newContext();
	await signInAs(admin, DEMO.admin);
	const page = await admin.newPage();
	await page.goto(`/audit/${batchId}/items/${item.id}`);
	const note = page.getByTestId('decision-refused');
	await expect(note).toContainText(
		'You cannot decide on this dwelling: you are its assessor and you issued its report'
	);
	await expect(note).toContainText(`${report.number} revision ${report.revision}`);
	await expect(note).toContainText('Nobody decides on a dwelling they assessed or whose report they issued');
	await expect(page.getByRole('button', { name: 'Record decision' })).toHaveCount(0);
	await page.screenshot({ path: '/tmp/duties-audit-refused.png', fullPage: true });

	// The API refuses her with the same reason and records nothing.
	const own = await request.post(`/api/v1/audit/items/${item.id}/decision`, {
		headers: { cookie: adaCookie },
		data: { decision: 'accepted' }
	});
	expect(own.status()).toBe(403);
	expect((await own.json()).message).toMatch(/you are its assessor/);
	expect((await db()('audit_items').where({ id: item.id }).first('decision')).decision).toBeNull();

	// The supervisor, independent of it, is offered the form and decides.
	const sup = await browser.newContext();
	await signInAs(sup, DEMO.supervisor);
	const spage = await sup.newPage();
	await spage.goto(`/audit/${batchId}/items/${item.id}`);
	await expect(spage.getByTestId('decision-refused')).toHaveCount(0);
	await expect(spage.getByRole('button', { name: 'Record decision' })).toBeVisible();
	const supCookie = await sessionCookie(DEMO.supervisor);
	const decided = await request.post(`/api/v1/audit/items/${item.id}/decision`, {
		headers: { cookie: supCookie },
		data: { decision: 'accepted' }
	});
	expect(decided.status()).toBe(200);
	await admin.close();
	await sup.close();
});
