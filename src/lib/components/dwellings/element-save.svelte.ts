/**
 * Saving an element (POST for a new one, PUT with its version for a saved one), what the server
 * answered, and the guard against leaving with unsaved edits.
 */
import { beforeNavigate, goto } from '$app/navigation';
import type { ElementResult } from '$lib/physics';
import type { ElementFieldValues, SavedElement } from './element-draft.svelte';
import { issuesSummary, type Issue } from './element-issues';

export type SaveMessage = { tone: 'pass' | 'fail'; text: string };

export class ElementSave {
	/** a save was tried: errors of fields nobody has typed in yet show from then on */
	triedSave = $state(false);
	version = $state(0);
	savedResult: ElementResult | null = $state(null);
	saving = $state(false);
	message: SaveMessage | null = $state(null);
	/** the server's message when someone else saved a newer version first */
	conflict: string | null = $state(null);
	/** the server's field issues from the last save, until the next edit */
	serverIssues: Issue[] = $state([]);
	/** edited since loading or saving */
	dirty = $state(false);

	#dwellingId: string;
	#elementId: string | null;
	/** set while going to the new element's page after its first save */
	#leaving = false;

	constructor(dwellingId: string, element: SavedElement | null) {
		this.#dwellingId = dwellingId;
		this.#elementId = element?.id ?? null;
		this.version = element?.version ?? 0;
		this.savedResult = element?.lastResult ?? null;
	}

	/** Something was edited: the last save's field issues no longer apply. */
	edited() {
		this.dirty = true;
		this.serverIssues = [];
	}

	async save(fields: ElementFieldValues) {
		const id = this.#elementId;
		this.triedSave = true;
		this.saving = true;
		this.message = null;
		this.conflict = null;
		try {
			const body = JSON.stringify(id ? { ...fields, version: this.version } : fields);
			const res = await fetch(
				id ? `/api/v1/elements/${id}` : `/api/v1/dwellings/${this.#dwellingId}/elements`,
				{
					method: id ? 'PUT' : 'POST',
					headers: { 'content-type': 'application/json' },
					body
				}
			);
			const out = await res.json().catch(() => ({}));
			if (res.status === 409) {
				this.conflict = out.message ?? 'Changed by someone else.';
			} else if (res.status === 400) {
				this.serverIssues = out.issues ?? [];
				// the answer's message names fields by their paths; the page says it in the screen's words
				this.message = { tone: 'fail', text: `Not saved: ${issuesSummary(this.serverIssues)}` };
			} else if (!res.ok) {
				this.message = {
					tone: 'fail',
					text: `Not saved: ${out.message ?? `the server answered ${res.status}`}`
				};
			} else if (!id) {
				this.dirty = false;
				this.#leaving = true;
				await goto(`/dwellings/${this.#dwellingId}/elements/${out.id}?saved=1`, { invalidateAll: true });
			} else {
				this.version = out.version;
				this.savedResult = out.lastResult;
				this.dirty = false;
				this.message = {
					tone: 'pass',
					text: `Saved (version ${out.version}). The server recomputed U = ${out.lastResult ? out.lastResult.uValueRounded.toFixed(2) : out.givenU} W/(m²·K).`
				};
			}
		} catch {
			this.message = { tone: 'fail', text: 'Not saved: the server could not be reached.' };
		} finally {
			this.saving = false;
		}
	}

	/** Drop the edits and load the saved version again (after a conflict). */
	reload() {
		this.dirty = false;
		location.reload();
	}

	/**
	 * Unsaved edits: ask before leaving the page or closing the tab. Call while the component is
	 * being set up (it registers a navigation hook and an effect).
	 */
	guardUnsavedEdits(isReadonly: () => boolean) {
		beforeNavigate((nav) => {
			if (this.#leaving || !this.dirty || isReadonly()) return;
			if (nav.type === 'leave') {
				nav.cancel(); // the browser asks through beforeunload
				return;
			}
			if (!confirm('This element has unsaved changes. Leave without saving them?')) nav.cancel();
		});
		$effect(() => {
			if (!this.dirty || isReadonly()) return;
			const warn = (e: BeforeUnloadEvent) => {
				e.preventDefault();
				e.returnValue = '';
			};
			window.addEventListener('beforeunload', warn);
			return () => window.removeEventListener('beforeunload', warn);
		});
	}
}
