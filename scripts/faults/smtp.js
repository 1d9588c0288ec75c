// The SMTP server down while reports are e-mailed, then back: the e-mails wait in the outbox, are tried
// and retried, and once the server is back each one arrives exactly once.
import { db, wallBody } from './data.js';
import { secondsSince, sleep, waitFor } from './env.js';
import { inbox, ok } from './http.js';
import { outcome } from './outcome.js';
import { mail } from './processes.js';

const MAILS = 12;

async function oneReport(app, org) {
	const d = await ok(app, 'POST', '/api/v1/dwellings', {
		cookie: org.assessor.cookie,
		json: { reference: 'MAIL-1' }
	});
	await ok(app, 'POST', `/api/v1/dwellings/${d.id}/elements`, {
		cookie: org.assessor.cookie,
		json: wallBody('Wall')
	});
	return ok(app, 'POST', '/api/v1/reports', { cookie: org.assessor.cookie, json: { dwellingId: d.id } });
}

const outboxRows = (ids) =>
	db('mail_outbox').whereIn('id', ids).select('id', 'status', 'attempts', 'last_error');

export async function smtpOutage({ app, org }) {
	const t0 = performance.now();
	const report = await oneReport(app, org);
	const tag = Date.now().toString(36);
	const to = Array.from({ length: MAILS }, (_, i) => `client-${tag}-${i}@faults.example.test`);
	await mail.stop();
	const td = performance.now();
	const ids = [];
	for (const address of to) {
		const m = await ok(app, 'POST', `/api/v1/reports/${report.id}/email`, {
			cookie: org.assessor.cookie,
			json: { to: address }
		});
		ids.push(m.id);
	}
	// Every message tried at least once while the server is away.
	await waitFor(
		'a failed attempt at every e-mail',
		async () => (await outboxRows(ids)).every((r) => r.attempts >= 1 && r.status === 'queued'),
		30_000,
		250
	);
	await sleep(2000);
	const whileDown = await outboxRows(ids);
	await mail.start();
	const downSeconds = secondsSince(td);
	const tb = performance.now();
	const sent = await waitFor(
		'every e-mail sent',
		async () => {
			const rows = await outboxRows(ids);
			return rows.every((r) => r.status === 'sent') ? rows : null;
		},
		120_000,
		250
	).catch(() => null);
	const deliveredAfter = secondsSince(tb);
	await sleep(2000); // a second delivery of one, if any, would show by now
	const received = await Promise.all(to.map(async (address) => (await inbox(address)).length));
	const attempts = (sent ?? (await outboxRows(ids))).map((r) => r.attempts);
	const figures =
		`${MAILS} report e-mails queued (202) with the SMTP server down for ${downSeconds} s; while down every one had ${Math.min(...whileDown.map((r) => r.attempts))}–${Math.max(...whileDown.map((r) => r.attempts))} failed attempt(s) (${whileDown[0]?.last_error?.slice(0, 60) ?? ''}); ` +
		`all sent ${deliveredAfter} s after it was back, after ${Math.min(...attempts)}–${Math.max(...attempts)} attempts; inbox: ${received.join(' ')} message(s) per address`;
	return outcome(
		'SMTP server down and back',
		`the fake SMTP server stopped; ${MAILS} POST /api/v1/reports/{id}/email; the server started again`,
		figures,
		[
			[
				whileDown.every((r) => r.status === 'queued' && r.attempts >= 1),
				'an e-mail was not kept queued while the server was down'
			],
			[Boolean(sent), 'not every e-mail was sent once the server was back'],
			[received.every((n) => n === 1), 'an address did not get its e-mail exactly once']
		],
		secondsSince(t0)
	);
}
