import { describe, it, expect, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { hasDatabase, makeMember, makeTeam, tdb, callHandler } from '../../factories';
import { makeClimate, makeDwelling, makeElement, makeLimitTable } from '../../factories-reports';

// Who issues, and whom the declaration names: Envelo's own rules (common practice, no source: the
// person who declares "I carried out the assessment … myself" is the one who issues the report, and the
// public verification names that same person).

const ORIGIN = 'http://127.0.0.1:3999';
const work = mkdtempSync(path.join(tmpdir(), 'envelo-duties-'));

/** Text of a PDF's last page by poppler's pdftotext (Debian poppler-utils), whitespace folded. */
function lastPage(pdf: Buffer): string {
	const file = path.join(work, `p-${Math.random().toString(36).slice(2)}.pdf`);
	writeFileSync(file, pdf);
	const pages = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
		.split('\f')
		.filter((p) => p.trim());
	return pages[pages.length - 1].replace(/\s+/g, ' ');
}

describe.skipIf(!hasDatabase)('who issues a report, and whom its declaration names', async () => {
	const reports = await import('../../../src/lib/server/reports');
	const reportsApi = await import('../../../src/routes/api/v1/reports/+server');
	const dwellingApi = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/+server');

	afterAll(async () => {
		rmSync(work, { recursive: true, force: true });
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	/** Ben and Carla, assessors with registration numbers (invented), and a dwelling of Ben's. */
	async function setup() {
		const team = await makeTeam();
		const ben = team.assessor;
		const carla = await makeMember(team.org.id, 'assessor', 'Carla Test');
		await tdb()('users').where({ id: ben.id }).update({ name: 'Ben Test', registration_number: 'REG-BEN-1' });
		await tdb()('users').where({ id: carla.id }).update({ registration_number: 'REG-CARLA-2' });
		await tdb()('users').where({ id: team.admin.id }).update({ name: 'Ada Test', registration_number: null });
		await makeLimitTable(team.org.id);
		const climateId = await makeClimate(team.org.id);
		const dwelling = await makeDwelling(team.org.id, { assessorId: ben.id, climateId });
		await makeElement(team.org.id, dwelling.id);
		return { team, ben, carla, dwelling };
	}
	const version = async (id: string) =>
		Number((await tdb()('dwellings').where({ id }).first('version')).version);
	const setAssessor = (
		who: Parameters<typeof callHandler>[1],
		dwellingId: string,
		assessorId: string,
		v: number
	) =>
		callHandler(dwellingApi.PATCH, who, 'PATCH', `/api/v1/dwellings/${dwellingId}`, {
			params: { dwellingId },
			body: { assessorId, version: v }
		});
	const issue = (who: Parameters<typeof callHandler>[1], dwellingId: string) =>
		callHandler(reportsApi.POST, who, 'POST', '/api/v1/reports', { body: { dwellingId } });

	it('an assessor who hands a dwelling over cannot then issue it in the new assessor’s name', async () => {
		const s = await setup();
		// Ben names Carla as the assessor (allowed: the dwelling is his to hand over) …
		const handed = await setAssessor(s.ben, s.dwelling.id, s.carla.id, await version(s.dwelling.id));
		expect(handed.status).toBe(200);
		// … and then tries to issue: refused, nothing is stored under Carla's name.
		const res = await issue(s.ben, s.dwelling.id);
		expect(res.status).toBe(403);
		expect(res.json.message).toMatch(/Only the dwelling’s assessor issues its reports/);
		expect(await tdb()('reports').where({ dwelling_id: s.dwelling.id })).toHaveLength(0);
		// Carla, now the assessor, issues; the declaration and the verification are hers.
		const mine = await issue(s.carla, s.dwelling.id);
		expect(mine.status).toBe(201);
		const pdf = (await reports.getReportPdf(s.team.org.id, mine.json.id))!.pdf;
		const text = lastPage(pdf);
		expect(text).toMatch(/I declare that I carried out the assessment in this report/);
		expect(text).toContain('Assessor Carla Test');
		expect(text).toContain('Registration number REG-CARLA-2');
		expect(text).not.toContain('Ben Test');
		const v = await reports.verifyCode(mine.json.verificationCode);
		expect(v!.issuedBy).toBe('Carla Test, registration no. REG-CARLA-2');
	});

	it('an admin who is not the dwelling’s assessor takes it over (logged) before issuing', async () => {
		const s = await setup();
		const refused = await issue(s.team.admin, s.dwelling.id);
		expect(refused.status).toBe(403);
		expect(refused.json.message).toMatch(/become its assessor first/);
		const taken = await setAssessor(
			s.team.admin,
			s.dwelling.id,
			s.team.admin.id,
			await version(s.dwelling.id)
		);
		expect(taken.status).toBe(200);
		const log = await tdb()('activity_log')
			.where({ entity: 'dwelling', entity_id: s.dwelling.id, action: 'reassign' })
			.first();
		expect(log.details.from).toEqual({ id: s.ben.id, name: 'Ben Test' });
		expect(log.details.to).toEqual({ id: s.team.admin.id, name: 'Ada Test' });
		const issued = await issue(s.team.admin, s.dwelling.id);
		expect(issued.status).toBe(201);
		const text = lastPage((await reports.getReportPdf(s.team.org.id, issued.json.id))!.pdf);
		expect(text).toContain('Assessor Ada Test');
		expect(text).toContain('Registration number not recorded');
	});

	it('the service itself refuses an issuer who is not the assessor, a supervisor, and an unassigned dwelling', async () => {
		const s = await setup();
		const as = (m: { id: string }) => ({ userId: m.id, organisationId: s.team.org.id });
		await expect(
			reports.issueReport(as(s.carla), { dwellingId: s.dwelling.id }, ORIGIN)
		).rejects.toMatchObject({ status: 403 });
		await expect(
			reports.issueReport(as(s.team.supervisor), { dwellingId: s.dwelling.id }, ORIGIN)
		).rejects.toMatchObject({ status: 403, message: 'Only assessors and admins issue reports.' });
		const nobody = await makeDwelling(s.team.org.id, { assessorId: null });
		await makeElement(s.team.org.id, nobody.id);
		await expect(reports.issueReport(as(s.ben), { dwellingId: nobody.id }, ORIGIN)).rejects.toMatchObject({
			status: 403,
			message: expect.stringMatching(/no assessor/)
		});
		expect(await tdb()('reports').whereIn('dwelling_id', [s.dwelling.id, nobody.id])).toHaveLength(0);
	});

	it('freezes the issuer’s name and registration number, and the declaration prints them, not the assessor field', async () => {
		const s = await setup();
		const issued = await reports.issueReport(
			{ userId: s.ben.id, organisationId: s.team.org.id },
			{ dwellingId: s.dwelling.id },
			ORIGIN
		);
		const full = await reports.getReport(s.team.org.id, issued.id);
		expect(full!.snapshot.document.issuedBy).toEqual({
			id: s.ben.id,
			name: 'Ben Test',
			registrationNumber: 'REG-BEN-1'
		});
		// A later change of the person's record does not change what was issued.
		await tdb()('users').where({ id: s.ben.id }).update({ registration_number: 'REG-BEN-9' });
		expect((await reports.verifyCode(issued.verificationCode))!.issuedBy).toBe(
			'Ben Test, registration no. REG-BEN-1'
		);
		// The declarant is the issuer of the snapshot: a snapshot whose assessor field names someone else
		// still prints the issuer in the declaration.
		const snapshot = structuredClone(full!.snapshot);
		snapshot.dwelling.assessor = {
			id: s.carla.id,
			name: 'Carla Test',
			email: s.carla.email,
			registrationNumber: 'REG-CARLA-2'
		};
		const text = lastPage(await reports.renderSnapshot(snapshot));
		expect(text).toContain('Assessor Ben Test');
		expect(text).toContain('Registration number REG-BEN-1');
		expect(text).not.toContain('REG-CARLA-2');
	});

	it('a snapshot frozen before the issuer was recorded renders byte for byte as issued', async () => {
		// When the issuer is the assessor (every demo report), the old and the new snapshot print the same
		// declaration, so the PDF bytes are the same.
		const s = await setup();
		const issued = await reports.issueReport(
			{ userId: s.ben.id, organisationId: s.team.org.id },
			{ dwellingId: s.dwelling.id },
			ORIGIN
		);
		const full = await reports.getReport(s.team.org.id, issued.id);
		const stored = (await reports.getReportPdf(s.team.org.id, issued.id))!.pdf;
		const older = structuredClone(full!.snapshot);
		older.document.issuedBy = { id: s.ben.id, name: 'Ben Test' };
		expect(reports.sha256(await reports.renderSnapshot(older))).toBe(reports.sha256(stored));
	});
});
