import { describe, expect, it } from 'vitest';
import { securityHeaders } from '../../src/lib/server/http';

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
