// Envelo killed while it issues reports: an issue (number, PDF, hash, the dwelling marked issued, the
// log row) is one transaction, so afterwards no report is half there, every number is whole (its PDF
// matches its hash) and the numbers run without a gap, also once the rest are issued after the restart.
import { createHash } from 'node:crypto';
import { db, sessionsGone, wallBody } from './data.js';
import { secondsSince, waitFor } from './env.js';
import { ok, request } from './http.js';
import { outcome } from './outcome.js';

const DWELLINGS = 10;

/** Dwellings of the assessor's with one calculated wall each, through the API. */
async function dwellingsToIssue(app, org) {
	const ids = [];
	for (let i = 0; i < DWELLINGS; i++) {
		const d = await ok(app, 'POST', '/api/v1/dwellings', {
			cookie: org.assessor.cookie,
			json: { reference: `ISSUE-${i}` }
		});
		await ok(app, 'POST', `/api/v1/dwellings/${d.id}/elements`, {
			cookie: org.assessor.cookie,
			json: wallBody('Wall')
		});
		ids.push(d.id);
	}
	return ids;
}

const issue = (app, org, dwellingId) =>
	request(app, 'POST', '/api/v1/reports', {
		cookie: org.assessor.cookie,
		json: { dwellingId },
		timeoutMs: 120_000
	});

/** What the database holds of the organisation's reports, and what is wrong with it. */
async function audit(orgId, dwellingIds) {
	const reports = await db('reports')
		.where({ organisation_id: orgId })
		.whereIn('dwelling_id', dwellingIds)
		.select('id', 'number', 'revision', 'dwelling_id', 'sha256', 'pdf');
	const problems = [];
	for (const r of reports) {
		const pdf = Buffer.from(r.pdf);
		if (pdf.subarray(0, 5).toString() !== '%PDF-') problems.push(`${r.number}: no PDF`);
		if (createHash('sha256').update(pdf).digest('hex') !== r.sha256)
			problems.push(`${r.number}: the PDF does not match its hash`);
		if (r.revision !== 1) problems.push(`${r.number}: revision ${r.revision}`);
	}
	const seq = reports.map((r) => Number(r.number.split('-').pop())).sort((a, b) => a - b);
	if (seq.some((n, i) => n !== i + 1)) problems.push(`numbers ${seq.join(', ')} have a gap`);
	const dwellings = await db('dwellings').whereIn('id', dwellingIds).select('id', 'status');
	const withReport = new Set(reports.map((r) => r.dwelling_id));
	for (const d of dwellings)
		if ((d.status === 'issued') !== withReport.has(d.id))
			problems.push(`a dwelling ${d.status} ${withReport.has(d.id) ? 'with' : 'without'} a report`);
	const logged = await db('activity_log')
		.where({ organisation_id: orgId, action: 'issue', entity: 'report' })
		.select('entity_id');
	const ids = new Set(reports.map((r) => r.id));
	if (logged.length !== reports.length || logged.some((l) => !ids.has(l.entity_id)))
		problems.push(`${logged.length} issue log rows for ${reports.length} reports`);
	return { reports, seq, problems };
}

export async function reportCrash({ app, org }) {
	const t0 = performance.now();
	const ids = await dwellingsToIssue(app, org);
	// Every issue at once: they wait for each other (one issuer per organisation at a time).
	const acked = [];
	const sent = ids.map((id) =>
		issue(app, org, id).then(
			(r) => r.status === 201 && acked.push(r.json),
			() => null
		)
	);
	await waitFor('three issued reports', () => acked.length >= 3, 120_000, 20);
	await app.kill9();
	await Promise.all(sent);
	const ackedBefore = [...acked];
	await sessionsGone(app);
	await app.start();
	const afterKill = await audit(org.orgId, ids);
	const lost = ackedBefore.filter(
		(a) => !afterKill.reports.some((r) => r.id === a.id && r.number === a.number)
	);
	// The rest, issued by the restarted process, continue the numbers.
	const issued = new Set(afterKill.reports.map((r) => r.dwelling_id));
	const rest = [];
	for (const id of ids.filter((id) => !issued.has(id))) rest.push((await issue(app, org, id)).status);
	const final = await audit(org.orgId, ids);
	const figures =
		`${DWELLINGS} issues sent at once; ${ackedBefore.length} acknowledged before kill -9, ${afterKill.reports.length} in the database after it (numbers ${afterKill.seq.join(', ')}); ` +
		`every PDF matches its SHA-256, dwellings issued exactly where a report is; after the restart the other ${rest.length} answered ${[...new Set(rest)].join('/') || '-'}, numbers now ${final.seq[0]}–${final.seq[final.seq.length - 1]} (${final.seq.length})`;
	return outcome(
		'Envelo killed during report issue',
		`${DWELLINGS} POST /api/v1/reports in flight, kill -9 of Envelo after the third answer; start again; issue the rest`,
		figures,
		[
			[lost.length === 0, `${lost.length} acknowledged report(s) missing`],
			[afterKill.problems.length === 0, afterKill.problems.join('; ')],
			[
				afterKill.reports.length < DWELLINGS,
				'every issue finished before the kill (nothing was interrupted)'
			],
			[rest.every((s) => s === 201), 'an issue after the restart failed'],
			[
				final.problems.length === 0 && final.seq.length === DWELLINGS,
				final.problems.join('; ') || 'not every dwelling was issued'
			]
		],
		secondsSince(t0)
	);
}
