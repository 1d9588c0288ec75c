// A local stand-in for an SMTP provider: accepts every message on 127.0.0.1, keeps it on disk, and
// shows an inbox page plus a small JSON API for tests. Never listens beyond loopback.
//   node scripts/fake-smtp.js --smtp-port 2525 --inbox-port 8025 --dir .data/mail
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';

const args = Object.fromEntries(
	process.argv
		.slice(2)
		.reduce((pairs, a, i, all) => (a.startsWith('--') ? [...pairs, [a.slice(2), all[i + 1]]] : pairs), [])
);
const smtpPort = Number(args['smtp-port'] ?? 2525);
const inboxPort = Number(args['inbox-port'] ?? 8025);
const dir = path.resolve(args.dir ?? '.data/mail');
fs.mkdirSync(dir, { recursive: true });

const esc = (s) =>
	String(s ?? '').replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]
	);

function listMessages() {
	return fs
		.readdirSync(dir)
		.filter((f) => f.endsWith('.json'))
		.map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), 'utf8')))
		.sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id));
}

const smtp = new SMTPServer({
	authOptional: true,
	disabledCommands: ['STARTTLS'],
	size: 25 * 1024 * 1024,
	onData(stream, session, callback) {
		const chunks = [];
		stream.on('data', (c) => chunks.push(c));
		stream.on('end', async () => {
			try {
				const raw = Buffer.concat(chunks);
				const parsed = await simpleParser(raw);
				const id = `${Date.now().toString(36)}-${crypto.randomBytes(4).toString('hex')}`;
				const record = {
					id,
					receivedAt: new Date().toISOString(),
					from: parsed.from?.text ?? '',
					to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
					subject: parsed.subject ?? '',
					text: parsed.text ?? '',
					html: typeof parsed.html === 'string' ? parsed.html : '',
					attachments: parsed.attachments.map((a, i) => ({
						index: i,
						filename: a.filename ?? `attachment-${i}`,
						contentType: a.contentType,
						size: a.size
					}))
				};
				fs.writeFileSync(path.join(dir, `${id}.eml`), raw);
				parsed.attachments.forEach((a, i) => fs.writeFileSync(path.join(dir, `${id}.att${i}`), a.content));
				fs.writeFileSync(path.join(dir, `${id}.json`), JSON.stringify(record));
				callback();
			} catch (e) {
				callback(e);
			}
		});
	}
});
smtp.on('error', (e) => console.error('[fake-smtp]', e.message));
smtp.listen(smtpPort, '127.0.0.1');

const page = (
	title,
	body
) => `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${esc(title)}</title>
<style>body{font:15px/1.45 system-ui,sans-serif;margin:2rem auto;max-width:60rem;color:#222;background:#faf8f3;padding:0 1rem}
table{border-collapse:collapse;width:100%}td,th{border-bottom:1px solid #ddd;padding:.35rem .5rem;text-align:left}
pre{white-space:pre-wrap;background:#fff;border:1px solid #ddd;padding:1rem}a{color:#7a3b12}</style></head>
<body><p><a href="/">Local mail inbox</a> — messages sent by Envelo in development and tests; nothing leaves this machine.</p>${body}</body></html>`;

const linkify = (text) => esc(text).replace(/https?:\/\/[^\s<>"']+/g, (u) => `<a href="${u}">${u}</a>`);

http
	.createServer((req, res) => {
		const url = new URL(req.url ?? '/', 'http://localhost');
		const send = (status, type, body) => {
			res.writeHead(status, { 'content-type': type });
			res.end(body);
		};
		const messages = listMessages();
		if (url.pathname === '/api/messages') {
			const to = url.searchParams.get('to')?.toLowerCase();
			return send(
				200,
				'application/json',
				JSON.stringify(to ? messages.filter((m) => m.to.includes(to)) : messages)
			);
		}
		if (url.pathname === '/api/messages' && req.method === 'DELETE') return send(405, 'text/plain', 'no');
		const m = url.pathname.match(/^\/messages\/([\w-]+)(?:\/(raw|attachments\/(\d+)))?$/);
		if (m) {
			const msg = messages.find((x) => x.id === m[1]);
			if (!msg) return send(404, 'text/plain', 'no such message');
			if (m[2] === 'raw')
				return send(200, 'message/rfc822', fs.readFileSync(path.join(dir, `${msg.id}.eml`)));
			if (m[3] !== undefined) {
				const att = msg.attachments[Number(m[3])];
				if (!att) return send(404, 'text/plain', 'no such attachment');
				res.writeHead(200, {
					'content-type': att.contentType,
					'content-disposition': `attachment; filename="${att.filename}"`
				});
				return res.end(fs.readFileSync(path.join(dir, `${msg.id}.att${m[3]}`)));
			}
			return send(
				200,
				'text/html; charset=utf-8',
				page(
					msg.subject,
					`<h1>${esc(msg.subject)}</h1><p>From ${esc(msg.from)}<br>To ${esc(msg.to.join(', '))}<br>${esc(msg.receivedAt)}</p>
<pre class="body">${linkify(msg.text)}</pre>
${msg.attachments.map((a) => `<p>Attachment: <a href="/messages/${msg.id}/attachments/${a.index}">${esc(a.filename)}</a> (${a.size} bytes)</p>`).join('')}`
				)
			);
		}
		if (url.pathname === '/') {
			return send(
				200,
				'text/html; charset=utf-8',
				page(
					'Inbox',
					`<h1>Inbox (${messages.length})</h1><table><tr><th>Received</th><th>To</th><th>Subject</th></tr>
${messages.map((x) => `<tr><td>${esc(x.receivedAt.replace('T', ' ').slice(0, 19))}</td><td>${esc(x.to.join(', '))}</td><td><a href="/messages/${x.id}">${esc(x.subject)}</a></td></tr>`).join('')}</table>`
				)
			);
		}
		send(404, 'text/plain', 'not found');
	})
	.listen(inboxPort, '127.0.0.1');

console.log(
	`[fake-smtp] SMTP on 127.0.0.1:${smtpPort}, inbox on http://127.0.0.1:${inboxPort}, storing in ${dir}`
);
const stop = () => {
	smtp.close(() => process.exit(0));
	setTimeout(() => process.exit(0), 500).unref();
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
