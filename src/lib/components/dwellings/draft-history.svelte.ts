/**
 * Undo and redo of the element draft: a plain history of snapshots of its serialisable state.
 *
 * Every change is recorded as a whole snapshot (structuredClone), never as a diff, so undoing can only
 * ever return to a state the draft really was in. A run of changes that share a coalescing key (the
 * keystrokes typed in one field) replaces the newest step instead of adding one, so one Undo takes the
 * whole run back; a change without a key (a button: add, remove or move a layer, a library pick, a
 * template, "Use 110 mm") is always a step of its own. A new change after an undo drops the steps
 * that could have been redone. At most `cap` steps are kept; the oldest go first.
 */
export class DraftHistory<T> {
	/** states before the present one, oldest first */
	#past: T[] = [];
	/** states undone, the next to redo last */
	#future: T[] = [];
	#present: T;
	#presentText: string;
	/** the key of the change that made the present state, while further changes with it coalesce */
	#runKey: string | null = null;
	readonly cap: number;
	/** bumped on every change of the history, so that canUndo / canRedo are reactive */
	#version = $state(0);

	constructor(initial: T, cap = 100) {
		this.#present = structuredClone(initial);
		this.#presentText = JSON.stringify(initial);
		this.cap = Math.max(1, Math.floor(cap));
	}

	get canUndo(): boolean {
		void this.#version;
		return this.#past.length > 0;
	}

	get canRedo(): boolean {
		void this.#version;
		return this.#future.length > 0;
	}

	/** Counts every change of the history (a step recorded or joined, an undo, a redo). */
	get steps(): number {
		return this.#version;
	}

	/** Steps that can be undone (at most `cap`). */
	get undoDepth(): number {
		void this.#version;
		return this.#past.length;
	}

	get redoDepth(): number {
		void this.#version;
		return this.#future.length;
	}

	/** The state the history holds as current (a copy). */
	get present(): T {
		return structuredClone(this.#present);
	}

	/**
	 * The draft changed to `state`. With a `key` equal to that of the change before (and no break in
	 * between), the change joins that step; otherwise it is a new step. A state equal to the present one
	 * is ignored (this is also how the state an undo restores comes back without a new step).
	 * Returns whether anything was recorded.
	 */
	record(state: T, key: string | null = null): boolean {
		const text = JSON.stringify(state);
		if (text === this.#presentText) return false;
		const joins = key !== null && key === this.#runKey && this.#past.length > 0;
		if (!joins) {
			this.#past.push(this.#present);
			if (this.#past.length > this.cap) this.#past.splice(0, this.#past.length - this.cap);
		}
		this.#present = structuredClone(state);
		this.#presentText = text;
		this.#runKey = key;
		this.#future = [];
		this.#version++;
		return true;
	}

	/** The next change starts a step of its own even if it has the same key (focus left the field). */
	breakRun(): void {
		this.#runKey = null;
	}

	/** The state before the present one (a copy to restore), or null when there is none. */
	undo(): T | null {
		const prev = this.#past.pop();
		if (prev === undefined) return null;
		this.#future.push(this.#present);
		return this.#moveTo(prev);
	}

	/** The state last undone (a copy to restore), or null when there is none. */
	redo(): T | null {
		const next = this.#future.pop();
		if (next === undefined) return null;
		this.#past.push(this.#present);
		return this.#moveTo(next);
	}

	#moveTo(state: T): T {
		this.#present = state;
		this.#presentText = JSON.stringify(state);
		this.#runKey = null;
		this.#version++;
		return structuredClone(state);
	}
}

/** What a keydown asks of the history: Ctrl/⌘+Z undo, Ctrl/⌘+Shift+Z or Ctrl+Y redo, else null. */
export function historyKey(e: {
	key: string;
	ctrlKey: boolean;
	metaKey: boolean;
	shiftKey: boolean;
	altKey: boolean;
}): 'undo' | 'redo' | null {
	if (!(e.ctrlKey || e.metaKey) || e.altKey) return null;
	const k = e.key.toLowerCase();
	if (k === 'z') return e.shiftKey ? 'redo' : 'undo';
	if (k === 'y' && !e.shiftKey) return 'redo';
	return null;
}
