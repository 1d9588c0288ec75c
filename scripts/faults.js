// ./docker-free-start.sh faults: Envelo against PostgreSQL, the SMTP server and itself failing on
// purpose, one row of a table per scenario (what was done, the figures, ok or FAILED). The start script
// provides a throwaway PostgreSQL (fsync on), the fake SMTP server and a build; this script starts
// Envelo itself, so it can kill it and start it again. Exits 1 when a row failed.
//   FAULTS_ONLY="db import report recompute smtp two"  runs the rows named (all by default)
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { db, makeOrganisation } from './faults/data.js';
import { env, secondsSince } from './faults/env.js';
import { dbOutage } from './faults/db-outage.js';
import { importCrash } from './faults/import-crash.js';
import { reportCrash } from './faults/report-crash.js';
import { recomputeCrash } from './faults/recompute-crash.js';
import { smtpOutage } from './faults/smtp.js';
import { twoApps } from './faults/two-apps.js';
import { table } from './faults/outcome.js';
import { App, freePort, stopChildren } from './faults/processes.js';

const SCENARIOS = [
	['db', 'PostgreSQL restart and crash under write load', dbOutage],
	['import', 'Envelo killed during a CSV import commit', importCrash],
	['report', 'Envelo killed during report issue', reportCrash],
	['recompute', 'Envelo killed during a batch recompute', recomputeCrash],
	['smtp', 'SMTP server down and back', smtpOutage],
	['two', 'Two Envelo processes, one database', twoApps]
];

/** Copy Envelo's logs out of the run's folder (the start script removes it): where they went. */
function keepLogs() {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'envelo-faults-logs-'));
	for (const f of fs.readdirSync(env.tmp).filter((n) => n.endsWith('.log') && n !== 'build.log'))
		fs.copyFileSync(path.join(env.tmp, f), path.join(dir, f));
	return dir;
}

async function main() {
	const t0 = performance.now();
	const port = await freePort();
	const app = new App('a', port, `http://127.0.0.1:${port}`);
	await app.start();
	const rows = [];
	for (const [key, title, run] of SCENARIOS) {
		if (env.only.length && !env.only.includes(key)) continue;
		console.log(`[faults] ${title} …`);
		const ts = performance.now();
		try {
			// Each scenario in an organisation of its own: report numbers, codes and batches never meet.
			const org = await makeOrganisation(`${key}${Date.now().toString(36)}`);
			rows.push(await run({ app, org }));
		} catch (e) {
			const why = e instanceof Error ? e.message : String(e);
			rows.push({
				scenario: title,
				done: '(stopped early)',
				figures: why,
				ok: false,
				seconds: secondsSince(ts)
			});
		}
		console.log(`[faults]   ${rows.at(-1).ok ? 'ok' : 'FAILED'} in ${rows.at(-1).seconds} s`);
		if (!app.alive) await app.start();
	}
	console.log(`\n${table(rows)}\n`);
	const failed = rows.filter((r) => !r.ok).length;
	// The start script removes the run's folder when it ends: a failed run keeps Envelo's logs elsewhere.
	const logs = failed ? ` (logs of Envelo kept in ${keepLogs()})` : '';
	console.log(`[faults] ${rows.length - failed} ok, ${failed} failed, in ${secondsSince(t0)} s${logs}`);
	return failed;
}

let code = 1;
process.once('SIGINT', () => void stopChildren().then(() => process.exit(130)));
process.once('SIGTERM', () => void stopChildren().then(() => process.exit(143)));
try {
	code = (await main()) ? 1 : 0;
} catch (e) {
	console.error('[faults]', e);
} finally {
	await stopChildren();
	await db.destroy();
}
process.exit(code);
