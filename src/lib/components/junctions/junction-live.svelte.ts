/**
 * The live junction result: every change of the editor's request goes, lightly debounced, to a Web
 * Worker that builds and solves the model (the page's main thread never solves); the latest answer
 * wins. Create while the component is being set up, in the browser.
 */
import type { RunOutcome, RunRequest } from '$lib/junctions/run';
import type { WorkerAnswer, WorkerRequest } from '$lib/junctions/junction.worker';

export type LiveState =
	| { status: 'idle' }
	| { status: 'computing'; previous: RunOutcome | null }
	| { status: 'done'; outcome: RunOutcome; ms: number }
	| { status: 'failed'; message: string };

/** Wait this long after the last edit before solving again, ms (typing is faster than a solve). */
const DEBOUNCE_MS = 350;

export class JunctionLive {
	state: LiveState = $state({ status: 'idle' });
	#worker: Worker | null = null;
	#sent = 0;
	#timer: ReturnType<typeof setTimeout> | undefined;
	#last: RunOutcome | null = null;

	/** `request` is read in an effect: each change (null: nothing to compute) schedules a solve. */
	constructor(request: () => RunRequest | null) {
		$effect(() => {
			const r = request();
			const snapshot = r ? ($state.snapshot(r) as RunRequest) : null;
			clearTimeout(this.#timer);
			if (!snapshot) {
				this.state = { status: 'idle' };
				return;
			}
			this.#timer = setTimeout(() => this.#post(snapshot), this.#sent === 0 ? 0 : DEBOUNCE_MS);
		});
		$effect(() => () => {
			clearTimeout(this.#timer);
			this.#worker?.terminate();
			this.#worker = null;
		});
	}

	#post(request: RunRequest) {
		this.#worker ??= this.#start();
		const id = ++this.#sent;
		this.state = { status: 'computing', previous: this.#last };
		this.#worker.postMessage({ id, request } satisfies WorkerRequest);
	}

	#start(): Worker {
		const w = new Worker(new URL('../../junctions/junction.worker.ts', import.meta.url), { type: 'module' });
		w.onmessage = (e: MessageEvent<WorkerAnswer>) => {
			if (e.data.id !== this.#sent) return; // a newer request is on its way
			if ('failure' in e.data) this.state = { status: 'failed', message: e.data.failure };
			else {
				this.#last = e.data.outcome;
				this.state = { status: 'done', outcome: e.data.outcome, ms: e.data.ms };
			}
		};
		w.onerror = (e) => {
			this.state = { status: 'failed', message: e.message || 'The calculation stopped unexpectedly.' };
			this.#worker?.terminate();
			this.#worker = null;
		};
		return w;
	}

	/** The latest outcome, or the previous one while a new one is computed. */
	get outcome(): RunOutcome | null {
		const s = this.state;
		return s.status === 'done' ? s.outcome : s.status === 'computing' ? s.previous : null;
	}
}
