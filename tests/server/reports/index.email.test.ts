// The client's e-mail of a report: HTML with a plain-text alternative, both carrying the summary for
// the client and the cautions, the PDF attached, every name escaped in the HTML, sent once through the
// outbox. Read back by mailparser from a local SMTP server (smtp-server), as a mail program would read
// it (common practice, no source: multipart/alternative is RFC 2046's, from memory).
import { describe, it, expect, afterAll, beforeAll } from 'vitest';
import net from 'node:net';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type ParsedMail } from 'mailparser';
import nodemailer from 'nodemailer';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import {
	makeClimate,
	makeDwelling,
	makeElement,
	makeLimitTable,
	leakyTimberWall,
	COLD_CLIMATE
} from '../../factories-reports';
import { CAVITY_WALL, DOOR, SOLID_WALL, clientSnapshot } from './client-snapshot';

const ORIGIN = 'http://127.0.0.1:3999';
const NASTY = '<script>alert("x")</script>';

async function freePort(): Promise<number> {
	return new Promise((resolve) => {
		const s = net.createServer();
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as net.AddressInfo).port;
			s.close(() => resolve(port));
		});
	});
}

describe.skipIf(!hasDatabase)('the e-mail of a report', async () => {
	const reports = await import('../../../src/lib/server/reports');
	const outbox = await import('../../../src/lib/server/outbox');
	const { smtpSettings, escapeHtml } = await import('../../../src/lib/server/mail');
	const { clientSummary } = await import('../../../src/lib/reports/client-summary');

	let port: number;
	let server: SMTPServer | null = null;
	const received: ParsedMail[] = [];
	const transport = () =>
		nodemailer.createTransport({ ...smtpSettings(), port, connectionTimeout: 1500, greetingTimeout: 1500 });

	beforeAll(async () => {
		port = await freePort();
		await new Promise<void>((resolve) => {
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
	});
	afterAll(async () => {
		if (server) await new Promise<void>((r) => server!.close(() => r()));
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const mailOf = (snapshot: ReturnType<typeof clientSnapshot>, message: string | null = null) =>
		reports.reportMail({
			snapshot,
			number: 'TO-2026-0001',
			revision: 1,
			issuedAt: snapshot.issuedAt,
			verificationCode: 'ABCD2345EF',
			sender: 'Test Assessor',
			message
		});

	it('escapes every name in the HTML: a dwelling called <script> comes out as text', () => {
		const snapshot = clientSnapshot([{ ...CAVITY_WALL(), name: `Wall ${NASTY}` }], {
			reference: `CS-${NASTY}`,
			clientName: 'O’Brien & <b>Sons</b>'
		});
		const mail = mailOf(snapshot, `See <img src="http://tracker.example/x.png"> & call me`);
		expect(mail.html).not.toMatch(/<script/i);
		expect(mail.html).not.toMatch(/<img/i);
		expect(mail.html).not.toContain('<b>Sons</b>');
		expect(mail.html).toContain(escapeHtml(`CS-${NASTY}`));
		expect(mail.html).toContain('CS-&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
		expect(mail.html).toContain('Dear O’Brien &amp; &lt;b&gt;Sons&lt;/b&gt;,');
		expect(mail.html).toContain(escapeHtml(`Wall ${NASTY}`));
		// no remote images, no style sheets, nothing fetched: inline styles only
		expect(mail.html).not.toMatch(/<link\b|<style\b|\ssrc="|url\(/i);
		// the plain text carries the names as they are
		expect(mail.text).toContain(`dwelling CS-${NASTY}`);
		expect(mail.subject).toBe(`Report TO-2026-0001 revision 1 — CS-${NASTY}`);
	});

	it('carries the same summary and cautions in both parts', () => {
		const snapshot = clientSnapshot([CAVITY_WALL(), SOLID_WALL(), DOOR()]);
		const c = clientSummary(snapshot);
		const mail = mailOf(snapshot, 'As discussed.');
		for (const part of [mail.text, mail.html]) {
			const body = part === mail.html ? part : escapeHtml(part);
			expect(body).toContain(escapeHtml(c.headline.text));
			for (const f of [...c.heatLoss.paragraphs, ...c.moisture.paragraphs])
				expect(body).toContain(escapeHtml(f.text));
			for (const x of c.cautions.items) expect(body).toContain(escapeHtml(x));
			expect(body).toContain('As discussed.');
			expect(body).toContain(`${ORIGIN}/verify/ABCD2345EF`);
			expect(body).toContain('ABCD-2345-EF');
		}
		// each element with its figure, its limit and the verdict in words
		expect(mail.text).toContain(
			`- Solid brick wall (outside wall): U-value ${c.table.rows[1].u} W/(m²·K), limit 0.30 W/(m²·K), does not meet its limit;`
		);
		expect(mail.text).toContain('- Front door (door): U-value 1.80 W/(m²·K), limit none set, no limit set;');
		expect(mail.html).toContain('does not meet its limit');
		// a table of data, read as one by screen readers (no presentation role)
		expect(mail.html).toMatch(/<table[^>]*>\s*<thead><tr><th/);
		expect(mail.html).not.toContain('role="presentation"');
		// the verification line once in each part
		expect(mail.text.match(/verify\/ABCD2345EF/g)).toHaveLength(1);
	});

	it('queues and sends the message once: HTML and plain text, the summary in both, the PDF attached', async () => {
		const team = await makeTeam();
		const limitTableId = await makeLimitTable(team.org.id);
		const climateId = await makeClimate(team.org.id, COLD_CLIMATE);
		const d = await makeDwelling(team.org.id, { assessorId: team.assessor.id, climateId, limitTableId });
		const reference = `T-${NASTY}-${d.reference.slice(2)}`;
		await tdb()('dwellings').where({ id: d.id }).update({ reference });
		await makeElement(team.org.id, d.id, {
			name: 'Timber wall',
			buildUp: leakyTimberWall(),
			internal: { temperature: 20, relativeHumidity: 60 },
			position: 0
		});
		await makeElement(team.org.id, d.id, { name: 'Cavity wall', position: 1 });
		const caller = { userId: team.assessor.id, organisationId: team.org.id };
		const issued = await reports.issueReport(caller, { dwellingId: d.id }, ORIGIN);
		const to = `client-${Date.now()}@example.test`;
		const queued = await reports.emailReport(caller, issued.id, { to, message: 'Line one\nLine <two>' });

		// what the outbox keeps: both bodies, the summary and the cautions in each, the HTML escaped
		const row = await tdb()('mail_outbox').where({ id: queued.id }).first();
		const snapshot = (await reports.getReport(team.org.id, issued.id))!.snapshot;
		const c = clientSummary(snapshot);
		expect(row.body_text).toContain(`In short: ${c.headline.text}`);
		expect(row.body_html).toContain(`In short: ${escapeHtml(c.headline.text)}`);
		for (const x of c.cautions.items) {
			expect(row.body_text).toContain(x);
			expect(row.body_html).toContain(escapeHtml(x));
		}
		expect(row.body_html).not.toMatch(/<script/i);
		expect(row.body_html).toContain('Line one<br>Line &lt;two&gt;');
		expect(row.attachments).toEqual([{ filename: expect.stringMatching(/\.pdf$/), reportId: issued.id }]);

		const first = await outbox.processOutbox({ transport });
		expect(first.sent).toBeGreaterThanOrEqual(1);
		// sent once: a second pass finds nothing of it to send
		await outbox.processOutbox({ transport });
		const mails = received.filter((m) => JSON.stringify(m.to).includes(to));
		expect(mails).toHaveLength(1);
		const mail = mails[0];
		expect(mail.subject).toBe(`Report ${issued.number} revision 1 — ${reference}`);
		expect(typeof mail.html).toBe('string');
		expect(mail.html as string).toContain(escapeHtml(c.headline.text));
		expect(mail.html as string).not.toMatch(/<script/i);
		expect(mail.html as string).toContain(escapeHtml(reference));
		expect(mail.text).toContain(c.headline.text);
		expect(mail.text).toContain(reference);
		expect(mail.attachments).toHaveLength(1);
		expect(mail.attachments[0].contentType).toBe('application/pdf');
		expect(reports.sha256(mail.attachments[0].content)).toBe(issued.sha256);
		expect((await reports.getMail(team.org.id, queued.id))!.status).toBe('sent');
	});
});
