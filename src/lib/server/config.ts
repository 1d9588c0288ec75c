import { env } from '$env/dynamic/private';

/**
 * A setting from the environment. SvelteKit's dynamic env is the source in the running app; tests that
 * import server modules directly fall back to process.env.
 */
export function setting(name: string): string | undefined {
	return env[name] ?? process.env[name];
}
