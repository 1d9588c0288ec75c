/**
 * The junction editor's calculation, off the page's main thread: each message is a run request
 * (./run), each answer the outcome with the temperature field for the picture. The solve takes tens
 * to hundreds of milliseconds, which would freeze typing if it ran on the page.
 */
import { runJunction, type RunOutcome, type RunRequest } from './run';

export type WorkerRequest = { id: number; request: RunRequest };
export type WorkerAnswer =
	{ id: number; outcome: RunOutcome; ms: number } | { id: number; failure: string; ms: number };

self.onmessage = (event: MessageEvent<WorkerRequest>) => {
	const { id, request } = event.data;
	const start = performance.now();
	let answer: WorkerAnswer;
	try {
		answer = { id, outcome: runJunction(request), ms: performance.now() - start };
	} catch (e) {
		answer = { id, failure: e instanceof Error ? e.message : String(e), ms: performance.now() - start };
	}
	self.postMessage(answer);
};
