import { describe, expect, it } from 'vitest';
import { DraftHistory, historyKey } from '../../../src/lib/components/dwellings/draft-history.svelte';

// The behaviour of undo and redo is the usual one of editors (common practice, no source): a run of
// typing in one field is one step, a new change after an undo drops what could have been redone.

type S = { name: string; rows: { key: number; thickness: string }[] };
const s = (name: string, ...thickness: string[]): S => ({
	name,
	rows: thickness.map((t, i) => ({ key: i + 1, thickness: t }))
});

describe('draft history', () => {
	it('starts with nothing to undo or redo, and ignores a state equal to the present one', () => {
		const h = new DraftHistory(s('Wall', '100'));
		expect(h.canUndo).toBe(false);
		expect(h.canRedo).toBe(false);
		expect(h.record(s('Wall', '100'))).toBe(false);
		expect(h.canUndo).toBe(false);
		expect(h.undo()).toBeNull();
		expect(h.redo()).toBeNull();
	});

	it('undoes and redoes button changes one step at a time', () => {
		const h = new DraftHistory(s('Wall', '100'));
		h.record(s('Wall', '100', '')); // add a layer
		h.record(s('Wall', '', '100')); // move it
		expect(h.undoDepth).toBe(2);
		expect(h.undo()).toEqual(s('Wall', '100', ''));
		expect(h.undo()).toEqual(s('Wall', '100'));
		expect(h.canUndo).toBe(false);
		expect(h.redo()).toEqual(s('Wall', '100', ''));
		expect(h.redo()).toEqual(s('Wall', '', '100'));
		expect(h.canRedo).toBe(false);
	});

	it('coalesces a run of keystrokes in one field into one step', () => {
		const h = new DraftHistory(s('Wall', ''));
		for (const t of ['1', '11', '110']) h.record(s('Wall', t), 'field-7');
		expect(h.undoDepth).toBe(1);
		expect(h.undo()).toEqual(s('Wall', ''));
		expect(h.redo()).toEqual(s('Wall', '110'));
	});

	it('starts a new step when the typing moves to another field, or focus left the field', () => {
		const h = new DraftHistory(s('Wall', ''));
		h.record(s('Wall', '1'), 'field-1');
		h.record(s('Wall', '10'), 'field-1');
		h.record(s('Wall x', '10'), 'field-2');
		expect(h.undoDepth).toBe(2);
		h.breakRun();
		h.record(s('Wall xy', '10'), 'field-2');
		expect(h.undoDepth).toBe(3);
		expect(h.undo()).toEqual(s('Wall x', '10'));
		expect(h.undo()).toEqual(s('Wall', '10'));
		expect(h.undo()).toEqual(s('Wall', ''));
	});

	it('never joins a keyless change (a button) to the typing before it', () => {
		const h = new DraftHistory(s('Wall', ''));
		h.record(s('Wall', '10'), 'field-1');
		h.record(s('Wall', '110')); // "Use 110 mm"
		h.record(s('Wall', '1105'), 'field-1');
		expect(h.undoDepth).toBe(3);
	});

	it('clears redo after a new change', () => {
		const h = new DraftHistory(s('Wall', '100'));
		h.record(s('Wall', '100', '50'));
		h.undo();
		expect(h.canRedo).toBe(true);
		h.record(s('Roof', '100'));
		expect(h.canRedo).toBe(false);
		expect(h.redo()).toBeNull();
		expect(h.undo()).toEqual(s('Wall', '100'));
	});

	it('a state restored by undo does not come back as a new step', () => {
		const h = new DraftHistory(s('Wall', '100'));
		h.record(s('Wall', '200'));
		const back = h.undo()!;
		// the editor restores it and its effect records the draft again
		expect(h.record(back)).toBe(false);
		expect(h.canRedo).toBe(true);
	});

	it('typing right after an undo starts a new step', () => {
		const h = new DraftHistory(s('Wall', ''));
		h.record(s('Wall', '1'), 'field-1');
		h.undo();
		h.record(s('Wall', '2'), 'field-1');
		expect(h.undoDepth).toBe(1);
		expect(h.undo()).toEqual(s('Wall', ''));
	});

	it('keeps at most the cap of steps, dropping the oldest', () => {
		const h = new DraftHistory(s('Wall', '0'), 100);
		for (let i = 1; i <= 150; i++) h.record(s('Wall', String(i)));
		expect(h.undoDepth).toBe(100);
		let last: S | null = null;
		while (h.canUndo) last = h.undo();
		expect(last).toEqual(s('Wall', '50'));
		expect(h.redoDepth).toBe(100);
	});

	it('keeps copies: changing a recorded or returned state changes nothing in the history', () => {
		const a = s('Wall', '100');
		const h = new DraftHistory(a);
		a.rows[0].thickness = '999';
		const b = s('Wall', '200');
		h.record(b);
		b.rows[0].thickness = '888';
		const back = h.undo()!;
		expect(back).toEqual(s('Wall', '100'));
		back.name = 'changed';
		expect(h.redo()).toEqual(s('Wall', '200'));
		expect(h.present).toEqual(s('Wall', '200'));
	});

	it('counts every change, so a notice can tell whether its step is still the newest', () => {
		const h = new DraftHistory(s('Wall', '1'));
		const at = h.steps;
		h.record(s('Wall'));
		expect(h.steps).toBe(at + 1);
		h.undo();
		expect(h.steps).toBe(at + 2);
	});
});

describe('history keys', () => {
	const k = (key: string, o: Partial<Record<'ctrlKey' | 'metaKey' | 'shiftKey' | 'altKey', boolean>> = {}) =>
		historyKey({ key, ctrlKey: false, metaKey: false, shiftKey: false, altKey: false, ...o });
	it('Ctrl+Z undoes; Ctrl+Shift+Z and Ctrl+Y redo; ⌘ counts as Ctrl', () => {
		expect(k('z', { ctrlKey: true })).toBe('undo');
		expect(k('Z', { ctrlKey: true, shiftKey: true })).toBe('redo');
		expect(k('y', { ctrlKey: true })).toBe('redo');
		expect(k('z', { metaKey: true })).toBe('undo');
	});
	it('other keys, and Z without Ctrl or with Alt, are not for the history', () => {
		expect(k('z')).toBeNull();
		expect(k('s', { ctrlKey: true })).toBeNull();
		expect(k('z', { ctrlKey: true, altKey: true })).toBeNull();
		expect(k('Y', { ctrlKey: true, shiftKey: true })).toBeNull();
	});
});
