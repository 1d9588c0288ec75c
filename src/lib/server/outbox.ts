/**
 * The mail outbox: every client e-mail is a `mail_outbox` row written in the same transaction as the
 * request that caused it. A worker inside the server process sends queued rows with nodemailer,
 * retries with a growing delay when the SMTP server is unreachable, and marks them sent. The state
 * lives in PostgreSQL, so a restart loses nothing.
 */
import type { Transporter } from 'nodemailer';
import { db, type Db } from './db';
import { createTransport, mailFrom } from './mail';
import { registerWorker } from './workers';
import { setting } from './config';

/** Attempts before a message is given up as failed (about a day of retries with the backoff below). */
export const MAX_ATTEMPTS = 20;
/** Delay before the n-th retry: 5 s, 10 s, 20 s … capped at 15 minutes. */
export function retryDelayMs(attempts: number): number {
	return Math.min(5000 * 2 ** Math.max(0, attempts - 1), 15 * 60_000);
}

export type OutboxAttachment = { filename: string; reportId: string };

export type OutboxEntry = {
	organisationId: string;
	dwellingId?: string | null;
	reportId?: string | null;
	purpose: string;
	to: string;
	subject: string;
	text: string;
	html?: string | null;
	attachments?: OutboxAttachment[];
	createdBy?: string | null;
};

/** Queue one message; call inside the transaction of the change that sends it. */
export async function enqueueMail(entry: OutboxEntry, trx: Db = db): Promise<string> {
	const [row] = await trx('mail_outbox')
		.insert({
			organisation_id: entry.organisationId,
			dwelling_id: entry.dwellingId ?? null,
			report_id: entry.reportId ?? null,
			purpose: entry.purpose,
			to_address: entry.to,
			subject: entry.subject,
			body_text: entry.text,
			body_html: entry.html ?? null,
			attachments: JSON.stringify(entry.attachments ?? []),
			created_by: entry.createdBy ?? null
		})
		.returning('id');
	return row.id as string;
}

type OutboxRow = {
	id: string;
	organisation_id: string | null;
	to_address: string;
	subject: string;
	body_text: string;
	body_html: string | null;
	attachments: OutboxAttachment[];
	attempts: number;
};

/** How long a claimed message is held before another worker may pick it up again. */
const CLAIM_LEASE = "interval '2 minutes'";

/**
 * Send what is due. Rows are claimed with SKIP LOCKED (several server processes may run), sent one by
 * one, then marked sent or given a later attempt. Returns counts for logs and tests.
 */
export async function processOutbox(
	options: { limit?: number; transport?: () => Transporter } = {}
): Promise<{ sent: number; failed: number }> {
	const limit = options.limit ?? 20;
	const claimed = await db.transaction(async (trx) => {
		const rows = await trx('mail_outbox')
			.where('status', 'queued')
			.andWhere('next_attempt_at', '<=', trx.fn.now())
			.orderBy('next_attempt_at')
			.limit(limit)
			.forUpdate()
			.skipLocked()
			.select('*');
		if (!rows.length) return [] as OutboxRow[];
		await trx('mail_outbox')
			.whereIn(
				'id',
				rows.map((r) => r.id)
			)
			.update({ next_attempt_at: trx.raw(`now() + ${CLAIM_LEASE}`) });
		return rows as OutboxRow[];
	});
	if (!claimed.length) return { sent: 0, failed: 0 };
	const transport = (options.transport ?? createTransport)();
	let sent = 0;
	let failed = 0;
	try {
		for (const row of claimed) {
			try {
				const attachments = await loadAttachments(row);
				await transport.sendMail({
					from: mailFrom(),
					to: row.to_address,
					subject: row.subject,
					text: row.body_text,
					...(row.body_html ? { html: row.body_html } : {}),
					attachments
				});
				await db('mail_outbox')
					.where({ id: row.id })
					.update({
						status: 'sent',
						attempts: row.attempts + 1,
						sent_at: db.fn.now(),
						last_error: null
					});
				sent++;
			} catch (e) {
				failed++;
				const attempts = row.attempts + 1;
				const message = e instanceof Error ? e.message : String(e);
				await db('mail_outbox')
					.where({ id: row.id })
					.update({
						attempts,
						last_error: message.slice(0, 500),
						status: attempts >= MAX_ATTEMPTS ? 'failed' : 'queued',
						next_attempt_at: new Date(Date.now() + retryDelayMs(attempts))
					});
			}
		}
	} finally {
		transport.close();
	}
	return { sent, failed };
}

async function loadAttachments(row: OutboxRow) {
	const out: { filename: string; content: Buffer; contentType: string }[] = [];
	for (const a of row.attachments ?? []) {
		const report = await db('reports')
			.where({ id: a.reportId, organisation_id: row.organisation_id })
			.first('pdf');
		if (!report) throw new Error(`attachment ${a.filename}: the report is not available`);
		out.push({ filename: a.filename, content: report.pdf as Buffer, contentType: 'application/pdf' });
	}
	return out;
}

/** Put a failed message back in the queue for an immediate attempt. */
export async function requeueMail(
	organisationId: string,
	id: string,
	scope: { dwellingId?: string } = {},
	trx: Db = db
): Promise<boolean> {
	const n = await trx('mail_outbox')
		.where({ id, organisation_id: organisationId })
		.modify((q) => {
			if (scope.dwellingId) q.where('dwelling_id', scope.dwellingId);
		})
		.whereIn('status', ['failed', 'queued'])
		.update({ status: 'queued', next_attempt_at: trx.fn.now() });
	return n > 0;
}

/* ------------------------------------------------------------------ the worker */

// Process-wide worker state (one timer per server process), never data of any user.
const worker = { timer: null as ReturnType<typeof setInterval> | null, running: false, again: false };

async function tick() {
	if (worker.running) {
		worker.again = true;
		return;
	}
	worker.running = true;
	try {
		do {
			worker.again = false;
			const r = await processOutbox();
			if (r.failed) console.warn(`[envelo] mail outbox: ${r.failed} message(s) not sent, will retry`);
		} while (worker.again);
	} catch (e) {
		console.error('[envelo] mail outbox:', e);
	} finally {
		worker.running = false;
	}
}

/** Ask the worker to look at the outbox now (after a commit that queued mail). No-op when not started. */
export function kickOutbox(): void {
	if (worker.timer) setImmediate(() => void tick());
}

export function startOutboxWorker(): void {
	if (worker.timer) return;
	const every = Number(setting('OUTBOX_INTERVAL_MS') ?? 3000);
	worker.timer = setInterval(() => void tick(), every);
	worker.timer.unref?.();
	void tick();
}

/** Stop the timer; on shutdown, wait (briefly) for a pass that is sending to finish. */
export async function stopOutboxWorker(): Promise<void> {
	if (worker.timer) clearInterval(worker.timer);
	worker.timer = null;
	worker.again = false;
	const until = Date.now() + 3000;
	while (worker.running && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
}

registerWorker('mail-outbox', startOutboxWorker, stopOutboxWorker);
