import { building } from '$app/environment';
import { db, authPool } from './db';

/**
 * Background work that runs inside the server process (mail outbox, audit recomputes). Each area exports a
 * start function (and, when it holds timers or connections, a stop function) and registers it here;
 * hooks.server.ts calls startWorkers() once at start-up. Workers keep their state in PostgreSQL, so a
 * restart loses nothing.
 *
 * On SIGINT/SIGTERM adapter-node closes the HTTP server, then emits `sveltekit:shutdown` on `process`:
 * every worker is stopped there and the database pools are closed, so nothing keeps the process alive.
 */
type Worker = {
	name: string;
	start: () => Promise<void> | void;
	stop?: () => Promise<void> | void;
};
const workers: Worker[] = [];

export function registerWorker(
	name: string,
	start: () => Promise<void> | void,
	stop?: () => Promise<void> | void
) {
	workers.push({ name, start, stop });
}

/** How long the shutdown may take before the pools are closed regardless. */
const STOP_TIMEOUT_MS = 5000;

// Process-wide flag (one shutdown per process), never data of any user.
const lifecycle = { hooked: false, stopping: null as Promise<void> | null };

/** Stop every worker, then close the Knex and the Auth.js pools. Safe to call more than once. */
export function stopWorkers(): Promise<void> {
	lifecycle.stopping ??= (async () => {
		const stops = workers
			.filter((w) => w.stop)
			.map(async (w) => {
				try {
					await w.stop!();
				} catch (e) {
					console.error(`[envelo] worker ${w.name} did not stop cleanly:`, e);
				}
			});
		let timer: ReturnType<typeof setTimeout> | undefined;
		await Promise.race([
			Promise.all(stops),
			new Promise<void>((resolve) => {
				timer = setTimeout(resolve, STOP_TIMEOUT_MS);
				timer.unref?.();
			})
		]);
		clearTimeout(timer);
		await Promise.allSettled([db.destroy(), authPool.end()]);
	})();
	return lifecycle.stopping;
}

function hookShutdown() {
	if (lifecycle.hooked) return;
	lifecycle.hooked = true;
	process.once('sveltekit:shutdown', () => {
		void stopWorkers().catch((e) => console.error('[envelo] shutdown:', e));
	});
}

export async function startWorkers() {
	if (building) return;
	hookShutdown();
	if (process.env.ENVELO_NO_WORKERS === '1') return;
	for (const w of workers) {
		try {
			await w.start();
		} catch (e) {
			console.error(`[envelo] worker ${w.name} did not start:`, e);
		}
	}
}
