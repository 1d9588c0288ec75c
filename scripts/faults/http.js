// HTTP for the fault scenarios: requests to one Envelo process by its port, naming the public origin in
// the Host header as a load balancer in front of several processes would.
import http from 'node:http';
import { env, waitFor } from './env.js';

const agent = new http.Agent({ keepAlive: true, maxSockets: 32 });

/**
 * One request. `body` is a string or Buffer (JSON when `json` is given); resolves with the status, the
 * headers, the text and the parsed JSON (when it is JSON); rejects when no answer comes (connection
 * refused or reset, or `timeoutMs`).
 */
export function request(app, method, path, opts = {}) {
	const { cookie, json, body = json === undefined ? undefined : JSON.stringify(json) } = opts;
	const headers = {
		host: new URL(app.origin).host,
		origin: app.origin,
		accept: opts.accept ?? 'application/json',
		...(cookie ? { cookie } : {}),
		...(body !== undefined ? { 'content-type': opts.type ?? 'application/json' } : {}),
		...(body !== undefined ? { 'content-length': Buffer.byteLength(body) } : {})
	};
	const t0 = performance.now();
	return new Promise((resolve, reject) => {
		const req = http.request({ host: '127.0.0.1', port: app.port, method, path, headers, agent }, (res) => {
			const chunks = [];
			res.on('data', (c) => chunks.push(c));
			res.on('error', reject);
			res.on('end', () => {
				const text = Buffer.concat(chunks).toString('utf8');
				let parsed;
				if ((res.headers['content-type'] ?? '').includes('json')) {
					try {
						parsed = JSON.parse(text);
					} catch {
						parsed = undefined;
					}
				}
				resolve({
					status: res.statusCode,
					headers: res.headers,
					text,
					json: parsed,
					ms: performance.now() - t0
				});
			});
		});
		req.setTimeout(opts.timeoutMs ?? 60_000, () => req.destroy(new Error('no answer in time')));
		req.on('error', reject);
		if (body !== undefined) req.write(body);
		req.end();
	});
}

/** A request that must succeed (2xx); its JSON. */
export async function ok(app, method, path, opts = {}) {
	const r = await request(app, method, path, opts);
	if (r.status < 200 || r.status >= 300) {
		throw new Error(`${method} ${path} on ${app.name} answered ${r.status}: ${r.text.slice(0, 300)}`);
	}
	return r.json;
}

/** Messages the fake SMTP server received for an address. */
export async function inbox(to) {
	const r = await fetch(`${env.inboxUrl}/api/messages?to=${encodeURIComponent(to)}`);
	return r.json();
}

/**
 * Sign in as a person does: ask `asker` for a link, read it in the fake inbox, follow it on `follower`
 * (another process may redeem the link). The session cookie Auth.js sets.
 */
export async function signInByMail(asker, follower, email) {
	const since = new Date(Date.now() - 1000).toISOString();
	const form = new URLSearchParams({ email, next: '' }).toString();
	const asked = await request(asker, 'POST', '/signin', {
		body: form,
		type: 'application/x-www-form-urlencoded',
		accept: 'text/html'
	});
	if (asked.status !== 303) throw new Error(`asking for a sign-in link answered ${asked.status}`);
	const message = await waitFor(`the sign-in e-mail to ${email}`, async () =>
		(await inbox(email)).find((m) => /sign-in link/i.test(m.subject) && m.receivedAt >= since)
	);
	const link = new URL(message.text.match(/https?:\/\/\S+/)[0]);
	const followed = await request(follower, 'GET', link.pathname + link.search, { accept: 'text/html' });
	const cookie = [followed.headers['set-cookie'] ?? []]
		.flat()
		.map((c) => c.split(';')[0])
		.find((c) => c.startsWith('authjs.session-token='));
	if (!cookie) throw new Error(`following the link answered ${followed.status} without a session cookie`);
	return cookie;
}
