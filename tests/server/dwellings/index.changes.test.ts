import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import { asMember } from '../../factories-dwellings';
import { makeClimate, makeDwelling, makeElement, makeLimitTable, cavityWall } from '../../factories-reports';
import { compareElements, compareRecords } from '../../../src/lib/dwellings/changes';
import { changeRefusal } from '../../../src/lib/dwellings/rules';

// The working copy against the issued record, and reopening signed-off work with a reason. Envelo's own
// rules (common practice, no source: a signed statement, or a reviewer's sign-off on it, stays true to
// the work or says that it no longer is).

describe('what differs between two states of a record', () => {
	const element = {
		id: 'e1',
		name: 'Wall',
		kind: 'external-wall' as const,
		area: 20,
		heatFlow: 'horizontal',
		buildUp: { layers: [{ name: 'Brick', thicknessMm: 100, lambda: 0.77 }] },
		internal: { temperature: 20, relativeHumidity: 50 },
		climate: null,
		u: 2.5,
		materialRevisions: [{ layerIndex: 0, revision: 1, code: 'BR-1' }]
	};
	it('lists each changed field with before and after, in the screen’s words', () => {
		const after = {
			...element,
			area: 24,
			buildUp: { layers: [{ name: 'Brick', thicknessMm: 215, lambda: 0.77, mu: 10 }] },
			u: 1.9,
			materialRevisions: [{ layerIndex: 0, revision: 2, code: 'BR-1' }]
		};
		const changes = compareElements(element, after);
		expect(changes.map((c) => [c.field, c.before, c.after])).toEqual([
			['Area (m²)', '20', '24'],
			['Layer 1, thickness (mm)', '100', '215'],
			['Layer 1, library revision', 'BR-1, revision 1', 'BR-1, revision 2'],
			['Layer 1, other properties', '—', 'μ 10'],
			['U-value (W/(m²·K))', '2.5', '1.9']
		]);
		expect(compareElements(element, { ...element })).toEqual([]);
	});
	it('names added and removed elements and a changed limit table', () => {
		const base = {
			dwelling: { address: '1 Lane' },
			limitTable: { id: 't', name: 'Table A', limits: { 'external-wall': 0.3 } },
			elements: [element]
		};
		const changes = compareRecords(base, {
			dwelling: { address: '1 Lane' },
			limitTable: { id: 't', name: 'Table A', limits: { 'external-wall': 0.26 } },
			elements: [{ ...element, id: 'e2', name: 'Roof', kind: 'flat-roof' }]
		});
		expect(changes.map((c) => `${c.element ?? 'dwelling'}: ${c.field} ${c.before} → ${c.after}`)).toEqual([
			'dwelling: Limit for external wall 0.3 → 0.26',
			'Wall: Element present → removed',
			'Roof: Element absent → added (Flat roof)'
		]);
	});
	it('asks for a reason before accepted or reviewed work changes, once per review', () => {
		expect(changeRefusal('accepted', false)?.needsReason).toBe(true);
		expect(changeRefusal('awaiting-review', false)?.needsReason).toBe(true);
		expect(changeRefusal('awaiting-review', true)).toBeNull();
		expect(changeRefusal('changed-after-acceptance', false)).toBeNull();
		expect(changeRefusal('issued', false)).toBeNull();
		expect(changeRefusal('archived', false)?.needsReason).toBe(false);
	});
});

describe.skipIf(!hasDatabase)('changed since issue, and reopening (PostgreSQL)', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const reports = await import('../../../src/lib/server/reports');
	const { changesSinceIssue } = await import('../../../src/lib/server/reports/changes');
	const audits = await import('../../../src/lib/server/audit');
	const climates = await import('../../../src/lib/server/climates');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	async function issued() {
		const t = await makeTeam();
		const climate = await makeClimate(t.org.id);
		const limits = await makeLimitTable(t.org.id);
		const d = await makeDwelling(t.org.id, {
			assessorId: t.assessor.id,
			climateId: climate,
			limitTableId: limits
		});
		const wall = await makeElement(t.org.id, d.id, { name: 'Front wall' });
		await reports.issueReport(
			{ userId: t.assessor.id, organisationId: t.org.id },
			{ dwellingId: d.id },
			'http://127.0.0.1'
		);
		return { ...t, climate, limits, d, wall, me: asMember(t.assessor) };
	}
	const stored = async (id: string) =>
		tdb()('dwellings').where({ id }).first('status', 'issue_changes', 'reopened_at', 'version');
	const thicker = async (orgId: string, wallId: string, mm: number) => {
		const el = (await elements.getElement(orgId, wallId))!;
		const layers = cavityWall().layers.map((l, i) => (i === 2 ? { ...l, thicknessMm: mm } : l));
		return {
			name: el.name,
			kind: el.kind,
			area: el.area,
			heatFlow: el.heatFlow,
			buildUp: { ...el.buildUp, layers },
			internal: el.internal,
			version: el.version
		};
	};

	it('an issued dwelling starts matching; a change is counted, listed with who and when, and filtered', async () => {
		const x = await issued();
		expect(await stored(x.d.id)).toMatchObject({ status: 'issued', issue_changes: 0 });
		await elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 150));
		const s = await stored(x.d.id);
		expect(s.issue_changes).toBeGreaterThanOrEqual(2); // the thickness and the U-value
		const { report, changes } = await changesSinceIssue(x.org.id, x.d.id);
		expect(report).toMatchObject({ revision: 1 });
		const thickness = changes.find((c) => c.field === 'Layer 3, thickness (mm)')!;
		expect(thickness).toMatchObject({ element: 'Front wall', before: '100', after: '150' });
		expect(thickness.by).toBeTruthy();
		expect(thickness.at).toBeTruthy();
		expect(changes.find((c) => c.field === 'U-value (W/(m²·K))')).toBeTruthy();
		expect(changes.length).toBe(s.issue_changes);
		const list = await dwellings.listDwellings(x.org.id, { changed: '1', status: 'all' });
		expect(list.items.map((i) => i.id)).toEqual([x.d.id]);
		expect(list.items[0].issueChanges).toBe(s.issue_changes);
		// the log keeps the save's own before and after
		const logged = await tdb()('activity_log')
			.where({ entity: 'element', entity_id: x.wall, action: 'update' })
			.first('details');
		expect(logged.details.changes).toContainEqual(
			expect.objectContaining({ field: 'Layer 3, thickness (mm)', before: '100', after: '150' })
		);
	});

	it('putting it back as it was matches again; re-issuing clears the mark', async () => {
		const x = await issued();
		await elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 150));
		await elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 100));
		expect((await stored(x.d.id)).issue_changes).toBe(0);
		await elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 140));
		expect((await stored(x.d.id)).issue_changes).toBeGreaterThan(0);
		await reports.issueReport(
			{ userId: x.assessor.id, organisationId: x.org.id },
			{ dwellingId: x.d.id },
			'http://127.0.0.1'
		);
		expect((await stored(x.d.id)).issue_changes).toBe(0);
		expect((await changesSinceIssue(x.org.id, x.d.id)).changes).toEqual([]);
	});

	it('a climate’s months edited after issue mark the dwellings that use it', async () => {
		const x = await issued();
		const c = (await climates.getClimate(x.org.id, x.climate))!;
		await climates.updateClimate(asMember(x.admin), c.id, {
			name: c.name,
			source: c.source,
			illustrative: c.illustrative,
			months: c.months.map((m) => ({ ...m, temperature: m.temperature - 3 })),
			version: c.version
		});
		expect((await stored(x.d.id)).issue_changes).toBeGreaterThan(0);
		const { changes } = await changesSinceIssue(x.org.id, x.d.id);
		expect(changes.map((ch) => ch.field)).toContain('Climate months');
	});

	it('an accepted dwelling refuses a change until reopened with a reason, then is “changed after acceptance”', async () => {
		const x = await issued();
		const b = await audits.createBatch(asMember(x.supervisor), {
			name: 'Check',
			source: 'references',
			references: [x.d.reference],
			sampling: { rule: 'all', includeFlagged: true }
		} as never);
		const [item] = await audits.listItems(x.org.id, b.id);
		expect((await stored(x.d.id)).status).toBe('awaiting-review');
		// awaiting review: refused without a reason
		await expect(
			elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 150))
		).rejects.toMatchObject({
			status: 409,
			extra: expect.objectContaining({ code: 'reopen-required' })
		});
		await audits.decideItem(asMember(x.supervisor), item.id, { decision: 'accepted', comment: 'Fine.' });
		expect((await stored(x.d.id)).status).toBe('accepted');
		await expect(
			elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 150))
		).rejects.toMatchObject({ status: 409 });
		expect((await stored(x.d.id)).issue_changes).toBe(0); // nothing was written
		const v = (await stored(x.d.id)).version;
		await expect(
			dwellings.reopenDwelling(x.me, x.d.id, { reason: 'short', version: v })
		).rejects.toMatchObject({ status: 400 });
		const reopened = await dwellings.reopenDwelling(x.me, x.d.id, {
			reason: 'Installed insulation was 150 mm, not 100 mm (site photo).',
			version: v
		});
		expect(reopened.status).toBe('changed-after-acceptance');
		await elements.updateElement(x.me, x.wall, await thicker(x.org.id, x.wall, 150));
		expect((await stored(x.d.id)).issue_changes).toBeGreaterThan(0);
		const log = await tdb()('activity_log')
			.where({ entity: 'dwelling', entity_id: x.d.id, action: 'reopen' })
			.first('details');
		expect(log.details).toMatchObject({
			reason: 'Installed insulation was 150 mm, not 100 mm (site photo).',
			from: 'accepted',
			to: 'changed-after-acceptance',
			decision: { itemId: item.id, decision: 'accepted', comment: 'Fine.' }
		});
		// a second reopening is refused: it changes freely now
		await expect(
			dwellings.reopenDwelling(x.me, x.d.id, {
				reason: 'Another reason, long enough.',
				version: reopened.version
			})
		).rejects.toMatchObject({ status: 409 });
	});

	it('a dwelling awaiting review, once reopened, changes until the supervisor decides', async () => {
		const x = await issued();
		await audits.createBatch(asMember(x.supervisor), {
			name: 'Check',
			source: 'references',
			references: [x.d.reference],
			sampling: { rule: 'all', includeFlagged: true }
		} as never);
		const v = (await stored(x.d.id)).version;
		const r = await dwellings.reopenDwelling(x.me, x.d.id, {
			reason: 'The area was measured again on site.',
			version: v
		});
		expect(r).toMatchObject({ status: 'awaiting-review', reopened: true });
		const el = (await elements.getElement(x.org.id, x.wall))!;
		await elements.updateElement(x.me, x.wall, {
			...(await thicker(x.org.id, x.wall, 100)),
			area: el.area + 2
		});
		expect((await changesSinceIssue(x.org.id, x.d.id)).changes.map((c) => c.field)).toEqual(['Area (m²)']);
	});

	it('a design copied as built keeps the link; the comparison lists installed thickness and a swapped product', async () => {
		const x = await issued();
		const copy = await dwellings.copyDwelling(x.me, x.d.id, {
			reference: `${x.d.reference}-AB`,
			asBuilt: true
		});
		expect(copy).toMatchObject({ stage: 'as-built', designId: x.d.id });
		const [built] = await tdb()('elements').where({ dwelling_id: copy.id }).select('id', 'design_element_id');
		expect(built.design_element_id).toBe(x.wall);
		const { compareStages } = await import('../../../src/lib/server/dwellings/compare');
		expect((await compareStages(x.org.id, copy.id))!.changed).toBe(0);
		const body = await thicker(x.org.id, built.id, 80);
		body.buildUp.layers[3] = { ...body.buildUp.layers[3], name: 'Facing brick B', lambda: 0.9 };
		await elements.updateElement(x.me, built.id, body);
		const c = (await compareStages(x.org.id, copy.id))!;
		expect(c.changed).toBe(1);
		const fields = c.pairs[0].changes.map((ch) => `${ch.field}: ${ch.before} → ${ch.after}`);
		expect(fields).toContain('Layer 3, thickness (mm): 100 → 80');
		expect(fields).toContain('Layer 4, material: ' + cavityWall().layers[3].name + ' → Facing brick B');
		expect(fields.some((f) => f.startsWith('U-value'))).toBe(true);
		// only a design-stage dwelling is copied as built
		await expect(
			dwellings.copyDwelling(x.me, copy.id, { reference: `${x.d.reference}-AB2`, asBuilt: true })
		).rejects.toMatchObject({ status: 400 });
	});
});
