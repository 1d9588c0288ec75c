// What `./docker-free-start.sh faults` hands the fault scenarios: the throwaway database, the built app,
// PostgreSQL's controls, the mail server. Read once; a missing setting stops the run at once.

/** A setting that must be there. */
function need(name) {
	const v = process.env[name];
	if (!v) {
		console.error(`[faults] ${name} is not set: run ./docker-free-start.sh faults`);
		process.exit(2);
	}
	return v;
}

export const env = {
	databaseUrl: need('FAULTS_DATABASE_URL'),
	buildDir: need('FAULTS_BUILD_DIR'),
	tmp: need('FAULTS_TMP'),
	pgBin: need('FAULTS_PG_BIN'),
	pgData: need('FAULTS_PG_DATA'),
	pgPort: need('FAULTS_PG_PORT'),
	mailPid: Number(need('FAULTS_MAIL_PID')),
	mailDir: need('FAULTS_MAIL_DIR'),
	smtpPort: need('SMTP_PORT'),
	inboxPort: need('FAULTS_INBOX_PORT'),
	inboxUrl: need('INBOX_URL'),
	authSecret: need('AUTH_SECRET'),
	mailFrom: process.env.MAIL_FROM ?? 'Envelo <no-reply@envelo.example.test>',
	/** rows to run (FAULTS_ONLY="import smtp"); all when empty */
	only: (process.env.FAULTS_ONLY ?? '').split(/[\s,]+/).filter(Boolean)
};

export const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

/** Poll `probe` until it returns a truthy value (returned) or `ms` pass (an error naming `what`). */
export async function waitFor(what, probe, ms = 30_000, every = 200) {
	const until = Date.now() + ms;
	for (;;) {
		let v;
		try {
			v = await probe();
		} catch {
			v = undefined;
		}
		if (v) return v;
		if (Date.now() > until) throw new Error(`timed out after ${Math.round(ms / 1000)} s waiting for ${what}`);
		await sleep(every);
	}
}

/** Seconds since `t0` (performance.now()), one decimal. */
export const secondsSince = (t0) => ((performance.now() - t0) / 1000).toFixed(1);
