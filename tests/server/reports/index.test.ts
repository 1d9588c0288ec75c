import { describe, it, expect, afterAll, beforeAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import net from 'node:net';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';
import nodemailer from 'nodemailer';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import { groupCode } from '../../../src/lib/format';
import { ValidationError } from '../../../src/lib/server/errors';
import {
	makeClimate,
	makeDwelling,
	makeElement,
	makeLimitTable,
	makeMaterialRevision,
	cavityWall,
	leakyTimberWall,
	COLD_CLIMATE
} from '../../factories-reports';

const ORIGIN = 'http://127.0.0.1:3999';
const work = mkdtempSync(path.join(tmpdir(), 'envelo-reports-'));

/** Text of a PDF by poppler's pdftotext (Debian poppler-utils), layout kept. */
function pdfText(pdf: Buffer, name = 'r.pdf'): string {
	const file = path.join(work, name);
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}
function pdfFonts(pdf: Buffer): string {
	const file = path.join(work, 'fonts.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdffonts', [file], { encoding: 'utf8' });
}
function pdfPages(pdf: Buffer): number {
	const file = path.join(work, 'info.pdf');
	writeFileSync(file, pdf);
	const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
	return Number(/Pages:\s+(\d+)/.exec(info)?.[1]);
}

async function freePort(): Promise<number> {
	return new Promise((resolve) => {
		const s = net.createServer();
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as net.AddressInfo).port;
			s.close(() => resolve(port));
		});
	});
}

describe.skipIf(!hasDatabase)('reports', async () => {
	const reports = await import('../../../src/lib/server/reports');
	const outbox = await import('../../../src/lib/server/outbox');
	const { smtpSettings } = await import('../../../src/lib/server/mail');
	const { analyseElement } = await import('../../../src/lib/physics');

	afterAll(async () => {
		rmSync(work, { recursive: true, force: true });
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	/** A team with a default limit table, a climate, a dwelling with an assessor. */
	async function setup(opts: { climate?: typeof COLD_CLIMATE } = {}) {
		const team = await makeTeam();
		await tdb()('users').where({ id: team.assessor.id }).update({ registration_number: 'REG-T-0001' });
		const limitTableId = await makeLimitTable(team.org.id);
		const climateId = await makeClimate(team.org.id, opts.climate);
		const dwelling = await makeDwelling(team.org.id, { assessorId: team.assessor.id, climateId });
		const caller = { userId: team.assessor.id, organisationId: team.org.id };
		return { team, limitTableId, climateId, dwelling, caller };
	}

	it('issues an element report whose text carries the U-value, the limit, the moisture outcome and the cautions', async () => {
		const s = await setup();
		const plaster = await makeMaterialRevision(s.team.org.id, {
			name: 'Gypsum plaster',
			lambda: 0.57,
			mu: 10,
			lambdaKind: 'design',
			revision: 3
		});
		const elementId = await makeElement(s.team.org.id, s.dwelling.id, {
			name: 'Cavity wall, front',
			buildUp: cavityWall(plaster),
			area: 38.5,
			internal: { temperature: 20, relativeHumidity: 40 }
		});
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		expect(issued.revision).toBe(1);
		expect(issued.scope).toBe('element');
		expect(issued.number).toMatch(/^[A-Z0-9]+-\d{4}-0001$/);
		expect(issued.verificationCode).toMatch(/^[0-9A-Z]{10}$/);

		const stored = await reports.getReportPdf(s.team.org.id, issued.id);
		expect(stored).not.toBeNull();
		expect(reports.sha256(stored!.pdf)).toBe(issued.sha256);
		const text = pdfText(stored!.pdf);
		// RT = 0.13 + 0.015/0.57 + 0.100/1.13 + 0.100/0.035 + 0.1025/0.77 + 0.04 = 3.275 m²K/W, U = 0.305
		// → 0.31 W/(m²K) to two decimals. Rsi 0.13, Rse 0.04 horizontal: ISO 6946:2017 Table 7.
		expect(text).toMatch(/U-value\s+0\.31 W\/\(m²·K\)/);
		expect(text).toContain('3.275 m²·K/W');
		// Limit 0.30 from the limit table; 0.31 > 0.30 → exceeds.
		expect(text).toMatch(/0\.30 W\/\(m²·K\) — Limits \w+, 2026 test edition/);
		expect(text).toContain('Exceeds the limit');
		// No condensation, by hand (Glaser, ISO 13788:2012 clause 6; psat by its Annex E formula, from
		// memory): in January θe 4.5 °C, pe = 0.87 · 843 = 733 Pa, pi = 0.40 · 2337 = 935 Pa. The
		// wool/brick interface lies near 4.9 °C (psat ≈ 866 Pa); the straight vapour line gives there
		// 733 + (935 − 733) · 1.025 / 2.775 ≈ 808 Pa < 866 Pa.
		expect(text).toContain('No interstitial condensation in any month');
		expect(text).toMatch(/fRsi,min/);
		// Cautions (common practice, no source: wording from the calculation core).
		expect(text).toContain('steady-state');
		expect(text).toMatch(/do not replace,\s+professional judgement/);
		expect(text).toMatch(/local building codes/);
		expect(text).toContain('valid only for the construction described');
		// Identity, the library revision and the verification line on every page.
		expect(text).toContain('REG-T-0001');
		expect(text).toMatch(/library M-\w+ rev\. 3/);
		const pages = pdfPages(stored!.pdf);
		expect(pages).toBeGreaterThanOrEqual(2);
		const pageTexts = text.split('\f').filter((p) => p.trim());
		expect(pageTexts.length).toBe(pages);
		pageTexts.forEach((p, i) => {
			expect(p).toContain(`Page ${i + 1} of ${pages}`);
			expect(p).toContain(issued.number);
			expect(p).toContain(s.dwelling.reference);
			expect(p).toContain(`${ORIGIN}/verify/${issued.verificationCode}`);
			// The code itself in the grouped form the screens show (the verify page takes both forms).
			expect(p).toContain(`code ${groupCode(issued.verificationCode)}`);
		});
		// The declaration, on the last page: the assessor, the registration number, the date of issue,
		// the statement, an empty signature line and, beside them, the validity statement (common
		// practice, no source).
		const full = await reports.getReport(s.team.org.id, issued.id);
		const last = pageTexts[pageTexts.length - 1].replace(/\s+/g, ' ');
		expect(last).toMatch(/10 Declaration I declare that I carried out the assessment in this report/);
		expect(last).toContain(`Assessor ${full!.snapshot.dwelling.assessor!.name}`);
		expect(last).toContain('Registration number REG-T-0001');
		expect(last).toMatch(/Date of issue \d{1,2} [A-Z][a-z]+ \d{4}/);
		expect(last).toContain('Signature of the assessor');
		expect(last.indexOf('valid only for the construction described')).toBeGreaterThan(
			last.indexOf('Signature of the assessor')
		);
		// Fonts embedded (pdffonts: "emb yes"), Source Sans 3 only.
		const fonts = pdfFonts(stored!.pdf)
			.split('\n')
			.slice(2)
			.filter((l) => l.trim());
		expect(fonts.length).toBeGreaterThan(0);
		for (const f of fonts) {
			expect(f).toMatch(/SourceSans3/);
			expect(f).toMatch(/\byes\s+yes\s+yes\b/);
		}
	});

	it('re-renders a stored snapshot to the same numbers and the same bytes; the engine repeats the result', async () => {
		const s = await setup();
		const elementId = await makeElement(s.team.org.id, s.dwelling.id, { buildUp: leakyTimberWall() });
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		const again = await reports.rerenderReport(s.team.org.id, issued.id);
		expect(reports.sha256(again!)).toBe(issued.sha256);
		const full = await reports.getReport(s.team.org.id, issued.id);
		const el = full!.snapshot.elements[0];
		expect(analyseElement(el.input!)).toEqual(el.result);
		expect(full!.snapshot.engineVersion).toBe(issued.engineVersion);
	});

	it('prints the monthly condensation table and the outcome when condensation forms', async () => {
		// January: the interface behind 140 mm of insulation sits near θe (−8 °C), psat ≈ 310 Pa, while
		// the vapour pressure there stays near pi = 0.6 · 2337 ≈ 1400 Pa because the sheathing outside
		// (sd 50 m) is far tighter than the lining (sd ≈ 0.3 m): condensation must form. psat from the
		// Magnus-type formula of ISO 13788:2012, Annex E (values from memory).
		const s = await setup({ climate: COLD_CLIMATE });
		const elementId = await makeElement(s.team.org.id, s.dwelling.id, {
			buildUp: leakyTimberWall(),
			internal: { temperature: 20, relativeHumidity: 60 }
		});
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		const full = await reports.getReport(s.team.org.id, issued.id);
		const c = full!.snapshot.elements[0].result!.condensation!;
		expect(c.outcome).not.toBe('none');
		expect(c.condensationMonths).toContain(1);
		const text = pdfText((await reports.getReportPdf(s.team.org.id, issued.id))!.pdf);
		expect(text).toMatch(/at \d+(\.\d)? mm/); // a column per condensation interface
		expect(text).toContain('Mineral wool between studs / Vapour-tight sheathing');
		expect(text).toMatch(/Peak amount\s+\d+\.\d g\/m²/);
		expect(text).toMatch(/Dries out within the year\s+(yes|no)/);
		expect(text).toContain(
			c.outcome === 'dries'
				? 'Condensation forms and evaporates fully within the year'
				: 'Condensation accumulates'
		);
		// Bridged layer: the combined method's limits are printed (ISO 6946:2017, 6.7.2).
		expect(text).toContain('Upper limit R′T');
		expect(text).toContain('Lower limit R″T');
		expect(text).toMatch(/38 mm wide at\s+600 mm\s+centres/);
	});

	it('words the moisture findings as they are: condensing elements in caution, the criteria named, no fRsi,min where no risk arises', async () => {
		const { moistureSummary } = await import('../../../src/lib/server/reports/document');
		const s = await setup({ climate: COLD_CLIMATE });
		await makeElement(s.team.org.id, s.dwelling.id, {
			name: 'Timber wall',
			buildUp: leakyTimberWall(),
			internal: { temperature: 20, relativeHumidity: 60 },
			position: 0
		});
		await makeElement(s.team.org.id, s.dwelling.id, { name: 'Cavity wall', position: 1 });
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN);
		const full = (await reports.getReport(s.team.org.id, issued.id))!;
		const [timber, cavity] = full.snapshot.elements;
		const outcome = timber.result!.condensation!.outcome;
		expect(outcome).not.toBe('none');
		const text = pdfText((await reports.getReportPdf(s.team.org.id, issued.id))!.pdf);
		const pages = text.split('\f').map((p) => p.replace(/\s+/g, ' '));
		// The client's summary comes first; the technical summary follows it, on the first page that
		// carries the report's own heading.
		const clientPage = pages[0];
		const page1 = pages.find((p) => p.includes('DWELLING REPORT'))!;
		expect(pages.indexOf(page1)).toBeGreaterThan(0);
		// Neither summary claims that nothing condenses when an element condenses.
		expect(page1).not.toContain('no element accumulates');
		expect(clientPage).toContain('SUMMARY FOR THE CLIENT');
		expect(pages.slice(0, pages.indexOf(page1)).join(' ')).not.toContain('No water is expected to form');
		const line = moistureSummary(full.snapshot) as { text: { text: string; color?: string }[] };
		const parts = line.text.slice(1);
		if (outcome === 'dries') {
			expect(page1).toContain(
				'1 element condenses in the colder months and dries out within the year (Timber wall); none accumulates.'
			);
			// Caution colour, not the pass colour, for the condensing element (common practice, no source).
			expect(parts.find((p) => p.text.includes('condenses'))!.color).toBe('#7a5400');
		} else {
			expect(page1).toContain('1 element accumulates interstitial condensate over the year (Timber wall).');
			expect(parts.find((p) => p.text.includes('accumulates'))!.color).toBe('#8e1e18');
		}
		// The criteria are named with their clauses (ISO 13788:2012: clause 5 surface humidity with the
		// 80 % criterion; clause 6 interstitial condensation, evaporation within the year — from memory).
		const flat = text.replace(/\s+/g, ' ');
		expect(flat).toContain('no surface mould risk: fRsi > fRsi,min in every month');
		expect(flat).toContain('no net annual accumulation of interstitial condensate');
		expect(flat).not.toContain('Passes the moisture criteria applied');

		// fRsi,min where θe ≥ θsi,min: "—" with a note. Cavity wall, 20 °C and 50 % inside: pi = 0.5 · 2337 =
		// 1169 Pa, psat,min = pi / 0.8 = 1461 Pa, θsi,min = 12.6 °C (ISO 13788:2012 clause 5; psat and its
		// inverse by the Magnus-type formula of Annex E, from memory). COLD_CLIMATE (invented) has θe ≥ 12.6
		// °C in June (16), July (18) and August (17): no value; May (12 °C) and September (12 °C) keep one.
		const rows = text.split('\n').filter((l) => /^\s*fRsi,min(\s+(—|−?\d\.\d{3})){12}\s*$/.test(l));
		expect(rows).toHaveLength(2);
		const cavityRow = rows[rows.length - 1].trim().split(/\s+/).slice(1);
		expect(cavityRow).toHaveLength(12);
		expect(cavityRow.slice(5, 8)).toEqual(['—', '—', '—']);
		for (const v of [...cavityRow.slice(0, 5), ...cavityRow.slice(8)]) expect(v).toMatch(/^\d\.\d{3}$/);
		const may = cavity.result!.surface!.months.find((m) => m.month === 5)!;
		expect(may.minSurfaceTemperature!).toBeCloseTo(12.6, 1);
		expect(flat).toContain('fRsi,min “—”: no surface mould risk arises in that month');

		// No section heading is the last thing on a page (common practice, no source).
		for (const page of text.split('\f').filter((p) => p.trim())) {
			const lines = page.split('\n').filter((l) => l.trim() && !/Verify this report|Page \d+ of/.test(l));
			expect(lines[lines.length - 1]).not.toMatch(/^\s*\d{1,2}\s{1,3}[A-Z][^.\d]*$/);
		}
	});

	it('refuses UPDATE and DELETE of an issued report in the database itself', async () => {
		const s = await setup();
		const elementId = await makeElement(s.team.org.id, s.dwelling.id);
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		await expect(tdb()('reports').where({ id: issued.id }).update({ sha256: 'x' })).rejects.toThrow(
			/append-only: UPDATE refused|permission denied for table reports/
		);
		await expect(tdb()('reports').where({ id: issued.id }).delete()).rejects.toThrow(
			/DELETE refused|permission denied for table reports/
		);
		expect((await tdb()('reports').where({ id: issued.id }).first('sha256')).sha256).toBe(issued.sha256);
	});

	it('issues a dwelling report with a summary, ΣU·A and the mean U; re-issue supersedes; the dwelling becomes issued', async () => {
		const s = await setup();
		await makeElement(s.team.org.id, s.dwelling.id, { name: 'Walls', area: 50, position: 0 });
		await makeElement(s.team.org.id, s.dwelling.id, {
			name: 'Windows',
			kind: 'window',
			area: 10,
			position: 1,
			givenU: 1.4,
			givenUSource: 'Manufacturer declaration (test)'
		});
		const first = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN);
		expect(first.scope).toBe('dwelling');
		const text = pdfText((await reports.getReportPdf(s.team.org.id, first.id))!.pdf);
		// ΣU·A = 50 · 0.30534 + 10 · 1.4 = 29.27 W/K; mean = 29.27 / 60 = 0.488 W/(m²K) (arithmetic on the
		// hand-calculated U of the cavity wall above).
		expect(text).toContain('29.27 W/K');
		expect(text).toContain('0.488 W/(m²·K)');
		expect(text).toContain('Manufacturer declaration (test)');
		expect(text).toMatch(/Windows\s+Window\s+10\.00\s+1\.40\s+1\.60/);
		// A dwelling report closes with the declaration on a page of its own.
		const lastPage = text
			.split('\f')
			.filter((p) => p.trim())
			.pop()!
			.replace(/\s+/g, ' ');
		expect(lastPage).toContain('Declaration');
		expect(lastPage).toContain(
			`I declare that I carried out the assessment in this report of dwelling ${s.dwelling.reference}`
		);
		expect(lastPage).toContain('Registration number REG-T-0001');
		expect(lastPage).toContain('Signature of the assessor');
		expect(lastPage).toContain('valid only for the construction described');
		const dwelling = await tdb()('dwellings').where({ id: s.dwelling.id }).first('status');
		expect(dwelling.status).toBe('issued');
		const log = await tdb()('activity_log')
			.where({ organisation_id: s.team.org.id, entity: 'dwelling' })
			.first();
		expect(log.details).toMatchObject({ from: 'draft', to: 'issued' });

		const second = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN);
		expect(second.number).toBe(first.number);
		expect(second.revision).toBe(2);
		expect(second.supersedesId).toBe(first.id);
		const list = await reports.listReportsForDwelling(s.team.org.id, s.dwelling.id);
		const old = list.find((r) => r.id === first.id)!;
		expect(old.supersededById).toBe(second.id);
		expect((await reports.getReportPdf(s.team.org.id, first.id))!.sha256).toBe(first.sha256);
		const latest = await reports.getLatestReportForDwelling(s.team.org.id, s.dwelling.id);
		expect(latest!.id).toBe(second.id);
		const text2 = pdfText((await reports.getReportPdf(s.team.org.id, second.id))!.pdf);
		expect(text2).toMatch(/revision 2 \(supersedes revision 1 of/);
	});

	it('names the element, the field and the reason when a build-up cannot be reported, and writes nothing', async () => {
		const s = await setup();
		await makeElement(s.team.org.id, s.dwelling.id, {
			name: 'Broken wall',
			buildUp: { layers: [{ name: 'Mystery', thicknessMm: 100 }] }
		});
		const err = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN).catch((e) => e);
		expect(err).toBeInstanceOf(ValidationError);
		expect(err.issues.map((i: { message: string }) => i.message).join('\n')).toMatch(
			/Element "Broken wall": layers\.0\.lambda: give λ or the thermal resistance/
		);
		expect(await tdb()('reports').where({ dwelling_id: s.dwelling.id }).first()).toBeUndefined();
		expect((await tdb()('dwellings').where({ id: s.dwelling.id }).first('status')).status).toBe('draft');
	});

	it("keeps another organisation's dwellings and reports out of reach", async () => {
		const s = await setup();
		const other = await makeTeam();
		const elementId = await makeElement(s.team.org.id, s.dwelling.id);
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		const stranger = { userId: other.assessor.id, organisationId: other.org.id };
		await expect(reports.issueReport(stranger, { dwellingId: s.dwelling.id }, ORIGIN)).rejects.toMatchObject({
			status: 404
		});
		expect(await reports.getReportPdf(other.org.id, issued.id)).toBeNull();
		await expect(reports.emailReport(stranger, issued.id, { to: 'x@example.test' })).rejects.toMatchObject({
			status: 404
		});
		await expect(reports.listReportsForDwelling(other.org.id, s.dwelling.id)).rejects.toMatchObject({
			status: 404
		});
	});

	it('verifies a code with four facts only, accepts the genuine PDF and rejects a modified one', async () => {
		const s = await setup();
		const elementId = await makeElement(s.team.org.id, s.dwelling.id);
		const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
		const v = await reports.verifyCode(groupCode(issued.verificationCode).toLowerCase());
		expect(v).not.toBeNull();
		// Four facts about the dwelling and its report, plus whether a later revision replaced it.
		expect(Object.keys(v!).sort()).toEqual([
			'dwellingReference',
			'issuedAt',
			'issuedBy',
			'number',
			'revision',
			'supersededBy'
		]);
		expect(v!.supersededBy).toBeNull();
		expect(v!.dwellingReference).toBe(s.dwelling.reference);
		expect(v!.issuedBy).toContain('REG-T-0001');
		expect(await reports.verifyCode('ZZZZZZZZZZ')).toBeNull();
		const pdf = (await reports.getReportPdf(s.team.org.id, issued.id))!.pdf;
		expect(await reports.checkPdfAgainstCode(issued.verificationCode, pdf)).toBe('match');
		const changed = Buffer.from(pdf);
		changed[Math.floor(changed.length / 2)] ^= 0x01;
		expect(await reports.checkPdfAgainstCode(issued.verificationCode, changed)).toBe('mismatch');
	});

	it('tells that a code belongs to a superseded revision, with the date of the one that replaced it', async () => {
		// Common practice, no source: a superseded report stays verifiable but must say it was replaced.
		const s = await setup();
		await makeElement(s.team.org.id, s.dwelling.id);
		const first = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN);
		const second = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id }, ORIGIN);
		const old = await reports.verifyCode(first.verificationCode);
		expect(old!.revision).toBe(1);
		expect(old!.supersededBy).toEqual({ revision: 2, issuedAt: second.issuedAt });
		expect((await reports.verifyCode(second.verificationCode))!.supersededBy).toBeNull();
		// Only the revision in force is e-mailed to the client (common practice, no source).
		await expect(
			reports.emailReport(s.caller, first.id, { to: 'client@example.test' })
		).rejects.toMatchObject({
			status: 409,
			message: expect.stringMatching(/revision 1 was replaced by revision 2; send revision 2 instead/)
		});

		// The public page: its load gives the same facts for the grouped and the plain form of the code.
		const page = await import('../../../src/routes/(public)/verify/[code]/+page.server');
		const load = page.load as unknown as (e: { params: { code: string } }) => Promise<{
			report: Awaited<ReturnType<typeof reports.verifyCode>>;
			code: string;
		}>;
		const grouped = await load({ params: { code: groupCode(first.verificationCode) } });
		const plain = await load({ params: { code: first.verificationCode.toLowerCase() } });
		expect(grouped.code).toBe(first.verificationCode);
		expect(plain).toEqual(grouped);
		expect(grouped.report!.supersededBy!.revision).toBe(2);
		// Nothing of the dwelling beyond its reference reaches the public page.
		expect(JSON.stringify(grouped)).not.toContain('Test Lane');
		expect(JSON.stringify(grouped)).not.toContain('Test Client');
	});

	describe('e-mail through the outbox', () => {
		let port: number;
		let server: SMTPServer | null = null;
		const received: ParsedMail[] = [];
		const transport = () =>
			nodemailer.createTransport({ ...smtpSettings(), port, connectionTimeout: 1500, greetingTimeout: 1500 });
		const startSmtp = () =>
			new Promise<void>((resolve) => {
				server = new SMTPServer({
					authOptional: true,
					disabledCommands: ['STARTTLS'],
					onData(stream, _session, cb) {
						simpleParser(stream).then((m) => {
							received.push(m);
							cb();
						}, cb);
					}
				});
				server.listen(port, '127.0.0.1', () => resolve());
			});
		beforeAll(async () => {
			port = await freePort();
		});
		afterAll(async () => {
			if (server) await new Promise<void>((r) => server!.close(() => r()));
		});

		it('waits queued while the SMTP server is down, then delivers the PDF when it is back', async () => {
			const s = await setup();
			const elementId = await makeElement(s.team.org.id, s.dwelling.id);
			const issued = await reports.issueReport(s.caller, { dwellingId: s.dwelling.id, elementId }, ORIGIN);
			const to = `client-${Date.now()}@example.test`;
			const queued = await reports.emailReport(s.caller, issued.id, { to, message: 'As discussed.' });
			expect(queued.status).toBe('queued');

			// Nothing listens on the port yet.
			const r1 = await outbox.processOutbox({ transport });
			expect(r1.failed).toBeGreaterThanOrEqual(1);
			const after1 = await reports.getMail(s.team.org.id, queued.id);
			expect(after1!.status).toBe('queued');
			expect(after1!.attempts).toBe(1);
			expect(after1!.lastError).toBeTruthy();
			expect(new Date(after1!.nextAttemptAt).getTime()).toBeGreaterThan(Date.now());

			await startSmtp();
			// The retry is due (backoff elapsed): bring the scheduled time forward instead of waiting.
			await tdb()('mail_outbox').where({ id: queued.id }).update({ next_attempt_at: new Date() });
			const r2 = await outbox.processOutbox({ transport });
			expect(r2.sent).toBeGreaterThanOrEqual(1);
			const after2 = await reports.getMail(s.team.org.id, queued.id);
			expect(after2!.status).toBe('sent');
			expect(after2!.attempts).toBe(2);
			expect(after2!.sentAt).not.toBeNull();

			const mail = received.find(
				(m) => m.subject?.includes(issued.number) && JSON.stringify(m.to).includes(to)
			);
			expect(mail).toBeTruthy();
			expect(mail!.text).toContain('As discussed.');
			expect(mail!.text).toContain(`/verify/${issued.verificationCode}`);
			expect(mail!.attachments).toHaveLength(1);
			expect(mail!.attachments[0].contentType).toBe('application/pdf');
			expect(reports.sha256(mail!.attachments[0].content)).toBe(issued.sha256);

			const history = await reports.listMailForDwelling(s.team.org.id, s.dwelling.id);
			expect(history.map((h) => [h.to, h.status])).toEqual([[to, 'sent']]);
		});
	});

	it('backs off between attempts', () => {
		expect(outbox.retryDelayMs(1)).toBe(5000);
		expect(outbox.retryDelayMs(2)).toBe(10000);
		expect(outbox.retryDelayMs(30)).toBe(15 * 60_000);
	});
});
