import { building } from '$app/environment';

/**
 * Background work that runs inside the server process (mail outbox, audit recomputes). Each area exports a
 * start function and registers it here; hooks.server.ts calls startWorkers() once at start-up.
 * Workers keep their state in PostgreSQL, so a restart loses nothing.
 */
const starters: { name: string; start: () => Promise<void> | void }[] = [];

export function registerWorker(name: string, start: () => Promise<void> | void) {
	starters.push({ name, start });
}

export async function startWorkers() {
	if (building || process.env.ENVELO_NO_WORKERS === '1') return;
	for (const w of starters) {
		try {
			await w.start();
		} catch (e) {
			console.error(`[envelo] worker ${w.name} did not start:`, e);
		}
	}
}
