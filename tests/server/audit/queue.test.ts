import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, fakeEvent } from '../../factories';
import { asMember } from '../../factories-dwellings';
import { makeDwelling, makeElement } from '../../factories-reports';

// The review queue keeps its order while decisions are made (a defect a new user reported: "2 of 11"
// before a decision, "11 of 11" right after it, "9 of 11" on reload). Envelo's own rule, no source.
describe.skipIf(!hasDatabase)('the audit item’s place in the queue (PostgreSQL)', async () => {
	const audits = await import('../../../src/lib/server/audit');
	const page =
		await import('../../../src/routes/(app)/audit/[batchId=uuid]/items/[itemId=uuid]/+page.server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('an item keeps its position and its next item when it is decided', async () => {
		const t = await makeTeam();
		const refs: string[] = [];
		for (let i = 0; i < 4; i++) {
			const d = await makeDwelling(t.org.id, { assessorId: t.assessor.id, status: 'issued' });
			await makeElement(t.org.id, d.id);
			refs.push(d.reference);
		}
		const b = await audits.createBatch(asMember(t.supervisor), {
			name: 'Queue',
			source: 'references',
			references: refs,
			sampling: { rule: 'all', includeFlagged: true }
		} as never);
		const items = await audits.listItems(t.org.id, b.id);
		const load = async (itemId: string) =>
			(await page.load({
				...fakeEvent(t.supervisor, `/audit/${b.id}/items/${itemId}`),
				params: { batchId: b.id, itemId }
			} as never)) as { position: number; total: number; nextId: string | null; nextOpenId: string | null };
		const second = (await Promise.all(items.map(async (i) => ({ i, at: (await load(i.id)).position })))).find(
			(x) => x.at === 2
		)!.i;
		const before = await load(second.id);
		await audits.decideItem(asMember(t.supervisor), second.id, { decision: 'accepted', comment: '' });
		const after = await load(second.id);
		expect(after.position).toBe(2);
		expect(after.total).toBe(4);
		expect(after.nextId).toBe(before.nextId);
		expect(after.nextOpenId).toBe(before.nextId); // the next one is still open
		expect((await load(second.id)).position).toBe(2); // and on reload
	});
});
