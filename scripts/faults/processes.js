// The processes the fault scenarios start, kill and start again: Envelo (node build), PostgreSQL (through
// pg_ctl, as the postgres user when this runs as root) and the fake SMTP server. Every child this file
// starts is remembered and stopped when the run ends, and only those.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { env, sleep, waitFor } from './env.js';

const children = new Set();

/** A free TCP port on loopback. */
export function freePort() {
	return new Promise((resolve, reject) => {
		const s = net.createServer();
		s.on('error', reject);
		s.listen(0, '127.0.0.1', () => {
			const { port } = s.address();
			s.close(() => resolve(port));
		});
	});
}

function portOpen(port) {
	return new Promise((resolve) => {
		const c = net.connect(port, '127.0.0.1');
		c.on('connect', () => (c.destroy(), resolve(true)));
		c.on('error', () => resolve(false));
	});
}

function track(child) {
	children.add(child);
	child.once('exit', () => children.delete(child));
	return child;
}

/** Stop every child still running: SIGTERM, then SIGKILL after ten seconds. */
export async function stopChildren() {
	const alive = [...children];
	for (const c of alive) c.kill('SIGTERM');
	const until = Date.now() + 10_000;
	while (children.size && Date.now() < until) await sleep(100);
	for (const c of children) c.kill('SIGKILL');
}

/**
 * One Envelo process: `node build` on its own port. Every process answers as `origin` (behind a load
 * balancer all of them do), and names its database connections `appName` so that pg_stat_activity
 * tells them apart.
 */
export class App {
	constructor(name, port, origin, extraEnv = {}) {
		this.name = name;
		this.port = port;
		this.origin = origin;
		this.extraEnv = extraEnv;
		this.child = null;
		this.log = path.join(env.tmp, `app-${name}.log`);
	}

	get pid() {
		return this.child?.pid ?? null;
	}

	get alive() {
		return Boolean(this.child && this.child.exitCode === null && this.child.signalCode === null);
	}

	/** Start the process and wait until /healthz answers. */
	async start() {
		const out = fs.openSync(this.log, 'a');
		this.child = track(
			spawn(process.execPath, [env.buildDir], {
				env: { ...process.env, ...this.appEnv() },
				stdio: ['ignore', out, out]
			})
		);
		fs.closeSync(out);
		const child = this.child;
		await waitFor(
			`${this.name} to answer /healthz`,
			async () => {
				if (child.exitCode !== null) throw new Error(`${this.name} exited (${this.log})`);
				const r = await fetch(`http://127.0.0.1:${this.port}/healthz`);
				return r.ok;
			},
			60_000
		);
	}

	appEnv() {
		return {
			HOST: '127.0.0.1',
			PORT: String(this.port),
			ORIGIN: this.origin,
			DATABASE_URL: env.databaseUrl,
			AUTH_SECRET: env.authSecret,
			SMTP_HOST: '127.0.0.1',
			SMTP_PORT: env.smtpPort,
			MAIL_FROM: env.mailFrom,
			BODY_SIZE_LIMIT: '25M',
			// every request of this run comes from 127.0.0.1
			SIGN_IN_PER_CLIENT: '1000',
			SIGN_IN_PER_ADDRESS: '100',
			REPORT_MAILS_PER_HOUR: '1000',
			OUTBOX_INTERVAL_MS: '1000',
			PGAPPNAME: `envelo-${this.name}`,
			...this.extraEnv
		};
	}

	/** kill -9: no shutdown hook runs, open transactions are left to PostgreSQL. */
	async kill9() {
		const child = this.child;
		if (!child || !this.alive) return;
		const gone = new Promise((r) => child.once('exit', r));
		child.kill('SIGKILL');
		await gone;
	}

	/** SIGTERM (the graceful stop), SIGKILL after ten seconds. */
	async stop() {
		const child = this.child;
		if (!child || !this.alive) return;
		const gone = new Promise((r) => child.once('exit', r));
		child.kill('SIGTERM');
		const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
		await gone;
		clearTimeout(timer);
	}

	/** CPU seconds the process has used so far (user + system, from /proc). */
	cpuSeconds() {
		const stat = fs.readFileSync(`/proc/${this.pid}/stat`, 'utf8');
		const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
		return (Number(fields[11]) + Number(fields[12])) / 100; // utime, stime in clock ticks (100 Hz)
	}
}

/* ------------------------------------------------------------------ PostgreSQL */

/**
 * Run a PostgreSQL program as the owner of the cluster. Its output goes to a file, never a pipe: a
 * postmaster started by pg_ctl would hold a pipe open, and the call would wait for it for ever.
 */
async function asPostgres(program, args) {
	const bin = path.join(env.pgBin, program);
	const root = process.getuid?.() === 0;
	const file = path.join(env.tmp, 'pg_ctl.out');
	const out = fs.openSync(file, 'w');
	const stdio = ['ignore', out, out];
	const child = root
		? spawn('runuser', ['-u', 'postgres', '--', bin, ...args], { stdio })
		: spawn(bin, args, { stdio });
	fs.closeSync(out);
	const status = await new Promise((resolve) => child.once('exit', (code) => resolve(code)));
	return { ok: status === 0, output: fs.readFileSync(file, 'utf8').trim() };
}

const serverLog = () => path.join(env.pgData, 'server.log');

export const pg = {
	/** pg_ctl restart -m fast: open sessions are ended, the server comes back with the same options. */
	async restart() {
		const r = await asPostgres('pg_ctl', [
			'-D',
			env.pgData,
			'-l',
			serverLog(),
			'-m',
			'fast',
			'-w',
			'-t',
			'60',
			'restart'
		]);
		if (!r.ok) throw new Error(`pg_ctl restart failed: ${r.output}`);
	},

	/** kill -9 the postmaster: what a crash of the machine's database looks like to its clients. */
	crash() {
		const pid = Number(fs.readFileSync(path.join(env.pgData, 'postmaster.pid'), 'utf8').split('\n')[0]);
		process.kill(pid, 'SIGKILL');
		return pid;
	},

	/** Start again after a crash (crash recovery replays the WAL); retried while old backends linger. */
	async start() {
		const opts = `-h 127.0.0.1 -p ${env.pgPort} -k ${env.pgData} -c fsync=on`;
		const log = serverLog();
		let last = '';
		for (let i = 0; i < 40; i++) {
			const r = await asPostgres('pg_ctl', [
				'-D',
				env.pgData,
				'-l',
				log,
				'-w',
				'-t',
				'60',
				'-o',
				opts,
				'start'
			]);
			if (r.ok) return;
			last = r.output;
			await sleep(500);
		}
		throw new Error(`PostgreSQL did not start again: ${last}`);
	}
};

/* ------------------------------------------------------------------ the fake SMTP server */

export const mail = {
	pid: env.mailPid,

	/** Stop the mail server (SMTP and inbox) and wait until its ports are closed. */
	async stop() {
		try {
			process.kill(this.pid, 'SIGTERM');
		} catch {
			// already gone
		}
		await waitFor('the mail server to stop', async () => !(await portOpen(Number(env.smtpPort))), 15_000);
	},

	/** Start it again on the same ports, keeping the same inbox folder. */
	async start() {
		const args = ['scripts/fake-smtp.js', '--smtp-port', env.smtpPort, '--inbox-port', env.inboxPort];
		const out = fs.openSync(path.join(env.tmp, 'mail-again.log'), 'a');
		const child = track(
			spawn(process.execPath, [...args, '--dir', env.mailDir], { stdio: ['ignore', out, out] })
		);
		fs.closeSync(out);
		this.pid = child.pid;
		await waitFor('the mail server to start', () => portOpen(Number(env.inboxPort)), 15_000);
	}
};
