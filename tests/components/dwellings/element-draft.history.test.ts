import { describe, expect, it } from 'vitest';
import { ElementDraft } from '../../../src/lib/components/dwellings/element-draft.svelte';
import { DraftHistory } from '../../../src/lib/components/dwellings/draft-history.svelte';
import { blankRow } from '../../../src/lib/dwellings/editor';

// The draft's own changes (the editor's buttons call these) go through the history as whole
// snapshots and come back exactly (common practice, no source). Invented values.
function drafted() {
	const d = new ElementDraft(null, 'external-wall');
	d.rows = [blankRow({ name: 'Brick', thickness: '102.5', lambda: '0.77', mu: '10' })];
	const h = new DraftHistory(d.snapshot());
	const step = () => h.record(d.snapshot());
	const undo = () => d.restore(h.undo()!);
	const redo = () => d.restore(h.redo()!);
	return { d, h, step, undo, redo };
}

describe('the draft through the history', () => {
	it('"Use 110 mm" is undone and redone', () => {
		const { d, step, undo, redo } = drafted();
		d.useThickness(0, 110);
		step();
		expect(d.rows[0].thickness).toBe('110');
		undo();
		expect(d.rows[0].thickness).toBe('102.5');
		redo();
		expect(d.rows[0].thickness).toBe('110');
	});

	it('"Use revision 2" (a newer library revision) is undone with every value it changed', () => {
		const { d, step, undo } = drafted();
		const before = d.snapshot();
		d.applyMaterial(0, { revisionId: '00000000-0000-4000-8000-000000000002', lambda: 0.56, muDry: 16 });
		step();
		expect(d.rows[0].lambda).toBe('0.56');
		undo();
		expect(d.snapshot()).toEqual(before);
	});

	it('a removed row comes back with its key, so the table keeps it as the same row', () => {
		const { d, step, undo } = drafted();
		d.rows.push(blankRow({ name: 'Block' }));
		step();
		const key = d.rows[0].key;
		d.rows.splice(0, 1);
		step();
		expect(d.rows.map((r) => r.name)).toEqual(['Block']);
		undo();
		expect(d.rows.map((r) => r.name)).toEqual(['Brick', 'Block']);
		expect(d.rows[0].key).toBe(key);
	});

	it('a change of kind, name and heat flow together is one step', () => {
		const { d, h, step, undo } = drafted();
		d.changeKind('flat-roof');
		step();
		expect(h.undoDepth).toBe(1);
		expect(d.name).toBe('Flat roof');
		undo();
		expect(d.kind).toBe('external-wall');
		expect(d.name).toBe('External wall');
		expect(d.heatFlow).toBe('horizontal');
	});

	it('the fields the API takes follow a restored state', () => {
		const { d, step, undo } = drafted();
		d.area = '12';
		step();
		undo();
		expect(d.fields.area).toBeUndefined();
	});
});
