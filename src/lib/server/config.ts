import { env } from '$env/dynamic/private';

/**
 * A setting from the environment. SvelteKit's dynamic env is the source in the running app; tests that
 * import server modules directly fall back to process.env.
 */
export function setting(name: string): string | undefined {
	return env[name] ?? process.env[name];
}

/** Where Envelo answers when nothing is configured: the start script's default, for tests and `vite dev`. */
const FALLBACK_ORIGIN = 'http://127.0.0.1:3000';

/** The configured public origin (`ORIGIN`), or null when none is set. */
export function configuredOrigin(): string | null {
	const raw = setting('ORIGIN') ?? setting('PUBLIC_ORIGIN');
	if (!raw) return null;
	try {
		return new URL(raw).origin;
	} catch {
		throw new Error(`ORIGIN must be an absolute URL such as https://envelo.example.test, not "${raw}".`);
	}
}

/**
 * The one origin every absolute URL Envelo makes is built from: sign-in and invitation links, report
 * verification links, links in e-mails. Never the request's Host or X-Forwarded-* headers, which anyone
 * can set.
 */
export function publicOrigin(): string {
	return configuredOrigin() ?? FALLBACK_ORIGIN;
}

/** An absolute URL on the public origin. */
export function appUrl(path: string): string {
	return new URL(path, publicOrigin()).toString();
}

/**
 * Whether the deployment says it sits behind a reverse proxy (`BEHIND_PROXY=true`). Only then is
 * X-Forwarded-Host read, and even then it must name the configured origin's host.
 */
export function behindProxy(): boolean {
	return /^(1|true|yes)$/i.test(setting('BEHIND_PROXY') ?? '');
}

/**
 * A path to go to after signing in, taken from a `next` parameter: resolved against the public origin
 * and kept only when it stays there (so `//host`, `/\\host`, `/%09/host` and absolute URLs elsewhere
 * all fall back). Returns the path with its query and fragment.
 */
export function localPath(next: string | null | undefined, fallback = '/dwellings'): string {
	if (!next || !next.startsWith('/')) return fallback;
	const origin = publicOrigin();
	let url: URL;
	try {
		url = new URL(next, origin);
	} catch {
		return fallback;
	}
	return url.origin === origin ? url.pathname + url.search + url.hash : fallback;
}
