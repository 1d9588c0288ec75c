import { describe, expect, it } from 'vitest';
import { localPath, publicOrigin } from '../../src/lib/server/config';

// Open redirects after sign-in (OWASP Web Security Testing Guide v4.2, WSTG-CLNT-04 "Testing for
// Client-side URL Redirect"; identifier from memory). URL parsing as the WHATWG URL Standard defines it
// (backslash read as slash in http(s) URLs, tab and newline removed), which Node's URL follows.
describe('localPath: where to go after signing in', () => {
	it('keeps a path of this site, with its query and fragment', () => {
		expect(localPath('/dwellings/abc?tab=reports#top')).toBe('/dwellings/abc?tab=reports#top');
		expect(localPath('/audit')).toBe('/audit');
	});

	it('falls back for anything that leaves the site', () => {
		for (const next of [
			'//evil.example.test',
			'/\\evil.example.test',
			'/\t/evil.example.test',
			'/\n/evil.example.test',
			'https://evil.example.test/',
			'http:evil.example.test',
			'javascript:alert(1)',
			'evil.example.test',
			''
		]) {
			expect(localPath(next), JSON.stringify(next)).toBe('/dwellings');
		}
		expect(localPath(null)).toBe('/dwellings');
		expect(localPath(`${publicOrigin()}/dwellings`)).toBe('/dwellings'); // not a path: absolute
	});
});
