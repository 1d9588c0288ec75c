import { describe, expect, it } from 'vitest';
import { MAX_JSON_DEPTH, readJson, securityHeaders } from '../../src/lib/server/http';
import { ValidationError } from '../../src/lib/server/errors';

// Caching of private answers (RFC 9111, HTTP Caching, §5.2.2.5 no-store and §5.2.2.7 private) and
// Strict-Transport-Security (RFC 6797 §6.1); section numbers from memory.
describe('securityHeaders', () => {
	it('marks the signed-in area and the API no-store, unless the route chose its own caching', () => {
		expect(securityHeaders('http://127.0.0.1:3000', true, new Headers())['cache-control']).toBe(
			'private, no-store'
		);
		const own = new Headers({ 'cache-control': 'private, max-age=60' });
		expect(securityHeaders('http://127.0.0.1:3000', true, own)['cache-control']).toBeUndefined();
		expect(securityHeaders('http://127.0.0.1:3000', false, new Headers())['cache-control']).toBeUndefined();
	});

	it('sends HSTS only when Envelo is served over HTTPS', () => {
		expect(securityHeaders('https://envelo.example.test', false, new Headers())).toMatchObject({
			'strict-transport-security': 'max-age=31536000; includeSubDomains'
		});
		expect(securityHeaders('http://127.0.0.1:3000', true, new Headers())).not.toHaveProperty(
			'strict-transport-security'
		);
	});
});

// JSON text (RFC 8259, §2 and §8.2, from memory): a string of half a surrogate pair is allowed by
// the grammar but is no Unicode text; PostgreSQL's jsonb refuses \u0000 and lone surrogates (common
// practice, no source). Nesting has no limit in the grammar: Envelo sets its own.
describe('readJson', () => {
	const req = (body: string) => new Request('http://127.0.0.1/x', { method: 'POST', body });
	const refusal = async (body: string) => {
		try {
			await readJson(req(body));
		} catch (e) {
			return e as ValidationError;
		}
		throw new Error('accepted');
	};

	it('refuses nesting deeper than MAX_JSON_DEPTH with a 400, not a stack overflow', async () => {
		const deep = '['.repeat(100_000) + ']'.repeat(100_000);
		const e = await refusal(deep);
		expect(e).toBeInstanceOf(ValidationError);
		expect(e.issues[0]).toEqual({
			path: '(body)',
			message: `is nested more than ${MAX_JSON_DEPTH} levels deep`
		});
		// brackets inside strings do not count
		await expect(readJson(req(JSON.stringify({ a: '['.repeat(1000) })))).resolves.toEqual({
			a: '['.repeat(1000)
		});
		const ok = '['.repeat(MAX_JSON_DEPTH) + ']'.repeat(MAX_JSON_DEPTH);
		await expect(readJson(req(ok))).resolves.toBeInstanceOf(Array);
	});

	it('names the field that holds half a surrogate pair', async () => {
		const e = await refusal('{"name":"ok","layers":[{"name":"bad \\ud800 text"}]}');
		expect(e.issues[0].path).toBe('layers.0.name');
		expect(e.issues[0].message).toMatch(/half a surrogate pair/);
		// a whole pair (an emoji) is text
		await expect(readJson(req('{"name":"\\ud83d\\ude00"}'))).resolves.toEqual({ name: '😀' });
	});
});
